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
 * both windows (the tolerances are explained below).
 */
import { planarLength } from '../../metric/layout.js';

/** Relative slack: N must be worse by more than this fraction of its distance. */
const SLACK = 1e-10;

// Why these tolerances (all relative, so the trim behaves the same at any mesh scale):
// - SLACK 1e-10: two windows whose distances agree within 1e-10 of their size are a near-tie and
//   both are kept (keeping too much costs only time; a cut decided by rounding could drop the true
//   minimum). It sits far above the rounding a window accumulates (a few ulps, ~2e-16 each, per
//   unfolding: ~1e-12 after thousands of faces) and far below any accuracy a user reads.
// - DELTA_ZERO 1e-15 in `pieces`: Δ = σ_O − σ_N counts as 0 when it is within about 5 ulps of the
//   distances involved; with Δ = 0 the squared equation loses its quadratic and constant terms and
//   the zero is the root of the linear αx + β = 0.
// - LINEAR 1e-14: the quadratic coefficient q2 = α² − 4Δ² is a difference of squares, so it carries
//   a rounding error of ~1e-16 of each square; when its term over the whole piece is below 1e-14 of
//   the others (about 50 ulps) it is rounding, and dividing by it would throw a root anywhere:
//   solve the linear equation instead.
// - TANGENT 1e-12: a double root (the curves touch) gives a discriminant q1² − 4·q2·q0 that is 0
//   exactly but rounds to either sign; q1, q2, q0 are already uncertain by ~1e-14 relative, so a
//   negative value within 1e-12 of q1² is taken as 0 (one tangent root) instead of "no root".
const DELTA_ZERO = 1e-15, LINEAR = 1e-14, TANGENT = 1e-12;

const norm = planarLength;

/**
 * Working space of {@link trimBoth}: the break points of the overlap and the
 * side of each piece. One per run (ExactState.scratch), so trimming is
 * re-entrant.
 */
export class TrimWork {
  /** Break points of [p, q]: p, up to two zeros of D, q. */
  readonly breaks = new Float64Array(4);
  /** Sign of D on each piece between them: 1 = N worse, 2 = O worse, 0 = near tie. */
  readonly sides = new Uint8Array(3);
}

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
  const pair = new Float64Array(4);
  const r = trimBoth(lo, hi, a, b, sN, oLo, oHi, c, d, sO, false, pair, new TrimWork());
  out[0] = pair[0]!; out[1] = pair[1]!;
  return (r & 1) === 0;
}

/**
 * Trims N and O against each other in one pass over their overlap (one
 * solve of D's zeros): N loses a prefix/suffix where it is worse than O, and
 * O (when `trimO`) a prefix/suffix where it is worse than N. Writes N's
 * interval to out[0], out[1] and O's to out[2], out[3]; returns a bit set:
 * 1 when N is worse on all of its interval, 2 when O is. `work` is scratch
 * (a fresh one when omitted; the solver passes its run's).
 */
export function trimBoth(
  lo: number, hi: number, a: number, b: number, sN: number,
  oLo: number, oHi: number, c: number, d: number, sO: number,
  trimO: boolean, out: Float64Array, work = new TrimWork(),
): number {
  out[0] = lo; out[1] = hi; out[2] = oLo; out[3] = oHi;
  const p = lo > oLo ? lo : oLo, q = hi < oHi ? hi : oHi;
  if (!(q > p)) return 0;
  const fNp = sN + norm(p - a, b), fNq = sN + norm(q - a, b);
  const fOp = sO + norm(p - c, d), fOq = sO + norm(q - c, d);
  const dp = fNp - fOp, dq = fNq - fOq;
  // which prefix/suffix cuts are possible at all (see trimInterval)
  const nPre = p <= lo && dp > -SLACK * fNp, nSuf = q >= hi && dq > -SLACK * fNq;
  const oPre = trimO && p <= oLo && -dp > -SLACK * fOp, oSuf = trimO && q >= oHi && -dq > -SLACK * fOq;
  if (!nPre && !nSuf && !oPre && !oSuf) return 0;
  const n = pieces(p, q, a, b, sN, c, d, sO, work);
  let res = 0;
  if (nPre || nSuf) res |= cut(n, 1, lo, hi, p, q, out, 0, work);
  if (oPre || oSuf) res |= cut(n, 2, oLo, oHi, p, q, out, 2, work) << 1;
  return res;
}

/** Splits [p, q] at the zeros of D = f_N − f_O and classifies the pieces (into `work`); returns the piece count. */
function pieces(p: number, q: number, a: number, b: number, sN: number, c: number, d: number, sO: number, work: TrimWork): number {
  const bp = work.breaks, side = work.sides;
  const A = a - p, C = c - p;
  const dl = sO - sN;
  const al = 2 * (C - A);
  const be = A * A - C * C + b * b - d * d - dl * dl;
  const q2 = al * al - 4 * dl * dl, q1 = 2 * al * be + 8 * dl * dl * C, q0 = be * be - 4 * dl * dl * (C * C + d * d);
  const span = q - p;
  let r1 = NaN, r2 = NaN;
  if (Math.abs(dl) <= DELTA_ZERO * (sN + sO + span)) {
    if (al !== 0) r1 = -be / al;
  } else if (Math.abs(q2) * span * span <= LINEAR * (Math.abs(q1) * span + Math.abs(q0))) {
    if (q1 !== 0) r1 = -q0 / q1;
  } else {
    let disc = q1 * q1 - 4 * q2 * q0;
    if (disc < 0 && disc > -TANGENT * q1 * q1) disc = 0;
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
    const fN = sN + norm(m - a, b), fO = sO + norm(m - c, d);
    const e0 = sN + norm(x0 - a, b) - sO - norm(x0 - c, d);
    const e1 = sN + norm(x1 - a, b) - sO - norm(x1 - c, d);
    const tN = SLACK * fN, tO = SLACK * fO;
    side[i] = fN - fO > tN && e0 > -tN && e1 > -tN ? 1 : fO - fN > tO && -e0 > -tO && -e1 > -tO ? 2 : 0;
  }
  return n - 1;
}

/** Cuts the prefix/suffix of [lo, hi] lying in pieces of side `who`; writes out[o], out[o+1]; returns 1 if nothing is left. */
function cut(np: number, who: number, lo: number, hi: number, p: number, q: number, out: Float64Array, o: number, work: TrimWork): number {
  const bp = work.breaks, side = work.sides;
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
