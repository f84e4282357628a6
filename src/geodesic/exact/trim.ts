/**
 * Trimming overlapping windows on one edge (as in Surazhsky et al. 2005).
 *
 * On the common line of an edge, window N gives f_N(x) = σ_N + √((x−a)² + b²)
 * and window O gives f_O(x) = σ_O + √((x−c)² + d²). Where f_N > f_O, every
 * path through N at x is beaten by the real path through O to x, so N is
 * useless there (on either side of the edge). D = f_N − f_O vanishes where
 *
 *   √((x−a)² + b²) = Δ + √((x−c)² + d²),            Δ = σ_O − σ_N;
 *   αx + β = 2Δ·√((x−c)² + d²),   α = 2(c − a),  β = a² − c² + b² − d² − Δ²;
 *   (α² − 4Δ²)x² + (2αβ + 8Δ²c)x + β² − 4Δ²(c² + d²) = 0,
 *
 * so at most two zeros. The overlap is cut at those zeros; the sign of D at
 * the middle of each piece says where N is worse. Only a worse prefix or
 * suffix of N's interval is cut (a worse middle is kept: keeping too much is
 * always safe), and only where D exceeds a relative slack, so near-ties keep
 * both windows.
 */

/** √(x² + y²) without Math.hypot's overflow guard, which costs several times more in V8 (lengths here are far from 1e±154). Local to each hot module so it inlines. */
function len2(x: number, y: number): number {
  return Math.sqrt(x * x + y * y);
}


/** Relative slack: N must be worse by more than this fraction of its distance. */
const SLACK = 1e-10;

const bp = new Float64Array(4);

/**
 * Shrinks N's interval [lo, hi] to exclude a prefix/suffix where it is worse
 * than O (interval [oLo, oHi], same frame). Writes the new interval to
 * out[0], out[1]; returns false when N is worse on all of [lo, hi].
 */
export function trimInterval(
  lo: number, hi: number, a: number, b: number, sN: number,
  oLo: number, oHi: number, c: number, d: number, sO: number,
  out: Float64Array,
): boolean {
  const r = trimBoth(lo, hi, a, b, sN, oLo, oHi, c, d, sO, false, PAIR);
  out[0] = PAIR[0]!; out[1] = PAIR[1]!;
  return (r & 1) === 0;
}

const PAIR = new Float64Array(4);

/**
 * Trims N and O against each other in one pass over their overlap (one
 * solve of D's zeros): N loses a prefix/suffix where it is worse than O, and
 * O (when `trimO`) a prefix/suffix where it is worse than N. Writes N's
 * interval to out[0], out[1] and O's to out[2], out[3]; returns a bit set:
 * 1 when N is worse on all of its interval, 2 when O is.
 */
export function trimBoth(
  lo: number, hi: number, a: number, b: number, sN: number,
  oLo: number, oHi: number, c: number, d: number, sO: number,
  trimO: boolean, out: Float64Array,
): number {
  out[0] = lo; out[1] = hi; out[2] = oLo; out[3] = oHi;
  const p = lo > oLo ? lo : oLo, q = hi < oHi ? hi : oHi;
  if (!(q > p)) return 0;
  const fNp = sN + len2(p - a, b), fNq = sN + len2(q - a, b);
  const fOp = sO + len2(p - c, d), fOq = sO + len2(q - c, d);
  const dp = fNp - fOp, dq = fNq - fOq;
  // which prefix/suffix cuts are possible at all (see trimInterval)
  const nPre = p <= lo && dp > -SLACK * fNp, nSuf = q >= hi && dq > -SLACK * fNq;
  const oPre = trimO && p <= oLo && -dp > -SLACK * fOp, oSuf = trimO && q >= oHi && -dq > -SLACK * fOq;
  if (!nPre && !nSuf && !oPre && !oSuf) return 0;
  const n = pieces(p, q, a, b, sN, c, d, sO);
  let res = 0;
  if (nPre || nSuf) res |= cut(n, 1, lo, hi, p, q, out, 0);
  if (oPre || oSuf) res |= cut(n, 2, oLo, oHi, p, q, out, 2) << 1;
  return res;
}

/** Sign of D on each piece between the zeros: 1 = N worse, 2 = O worse, 0 = near tie. */
const side = new Uint8Array(3);

/** Splits [p, q] at the zeros of D = f_N − f_O and classifies the pieces; returns the piece count. */
function pieces(p: number, q: number, a: number, b: number, sN: number, c: number, d: number, sO: number): number {
  const A = a - p, C = c - p;
  const dl = sO - sN;
  const al = 2 * (C - A);
  const be = A * A - C * C + b * b - d * d - dl * dl;
  const q2 = al * al - 4 * dl * dl, q1 = 2 * al * be + 8 * dl * dl * C, q0 = be * be - 4 * dl * dl * (C * C + d * d);
  const span = q - p;
  let r1 = NaN, r2 = NaN;
  if (Math.abs(dl) <= 1e-15 * (sN + sO + span)) {
    if (al !== 0) r1 = -be / al;
  } else if (Math.abs(q2) * span * span <= 1e-14 * (Math.abs(q1) * span + Math.abs(q0))) {
    if (q1 !== 0) r1 = -q0 / q1;
  } else {
    let disc = q1 * q1 - 4 * q2 * q0;
    if (disc < 0 && disc > -1e-12 * q1 * q1) disc = 0;
    if (disc >= 0) {
      const qq = -0.5 * (q1 + (q1 >= 0 ? 1 : -1) * Math.sqrt(disc));
      if (qq !== 0) {
        r1 = qq / q2; r2 = q0 / qq;
        if (r2 < r1) { const x = r1; r1 = r2; r2 = x; }
      } else r1 = 0;
    }
  }
  let n = 0;
  bp[n++] = p;
  if (r1 > 0 && r1 < span) bp[n++] = r1 + p;
  if (r2 > 0 && r2 < span && r2 > r1) bp[n++] = r2 + p;
  bp[n++] = q;
  for (let i = 0; i + 1 < n; i++) {
    const x0 = bp[i]!, x1 = bp[i + 1]!, m = 0.5 * (x0 + x1);
    const fN = sN + len2(m - a, b), fO = sO + len2(m - c, d);
    const e0 = sN + len2(x0 - a, b) - sO - len2(x0 - c, d);
    const e1 = sN + len2(x1 - a, b) - sO - len2(x1 - c, d);
    const tN = SLACK * fN, tO = SLACK * fO;
    side[i] = fN - fO > tN && e0 > -tN && e1 > -tN ? 1 : fO - fN > tO && -e0 > -tO && -e1 > -tO ? 2 : 0;
  }
  return n - 1;
}

/** Cuts the prefix/suffix of [lo, hi] lying in pieces of side `who`; writes out[o], out[o+1]; returns 1 if nothing is left. */
function cut(np: number, who: number, lo: number, hi: number, p: number, q: number, out: Float64Array, o: number): number {
  let k = 0;
  while (k < np && side[k] === who) k++;
  if (k === np) {
    if (p <= lo && q >= hi) return 1;
    if (p <= lo) out[o] = q;
    else if (q >= hi) out[o + 1] = p;
  } else {
    let j = np - 1;
    while (j >= 0 && side[j] === who) j--;
    if (p <= lo && k > 0) out[o] = bp[k]!;
    if (q >= hi && j < np - 1) out[o + 1] = bp[j + 1]!;
  }
  return out[o + 1]! > out[o]! ? 0 : 1;
}
