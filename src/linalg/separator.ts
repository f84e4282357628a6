/**
 * Vertex separators from a vertex key (used by nested dissection).
 *
 * Any integer key on the vertices of a connected subgraph defines cuts
 * {key ≤ t} | {key > t}. Each cut has two one-sided vertex separators:
 *
 * ```
 *   "up":   S = { x : key(x) ≤ t, some neighbour has key > t }   A = {key ≤ t} \ S, B = {key > t}
 *   "down": S = { x : key(x) > t, some neighbour has key ≤ t }   A = {key ≤ t},     B = {key > t} \ S
 * ```
 *
 * x lies on the "up" separator of every t in [key(x), max neighbour key) and
 * on the "down" separator of every t in [min neighbour key, key(x)), so one
 * pass over the edges with difference arrays sizes all of them. The BFS level
 * (distance from a pseudo-peripheral vertex u) gives the classic level-set
 * separators; d(u, x) − d(v, x) for the far end v gives cuts across the
 * "middle" between u and v, which are straighter on grid-like meshes.
 */

/** Scratch arrays for {@link bestCuts}; n = graph size, R = key range bound. */
export interface CutWork {
  /** Largest neighbour key per vertex. */
  readonly maxKey: Int32Array;
  /** Smallest neighbour key per vertex. */
  readonly minKey: Int32Array;
  /** Difference array of "up" separator sizes, then their values. */
  readonly up: Int32Array;
  /** Difference array of "down" separator sizes, then their values. */
  readonly down: Int32Array;
  /** Vertices per key value. */
  readonly count: Int32Array;
}

/** Allocates {@link CutWork} for a graph of n vertices (keys < 2n + 2). */
export function cutWork(n: number): CutWork {
  const r = 2 * n + 4;
  return { maxKey: new Int32Array(n), minKey: new Int32Array(n), up: new Int32Array(r), down: new Int32Array(r), count: new Int32Array(r) };
}

/** The chosen cut: separator size, threshold t and side; size = Infinity if none is balanced. */
export interface Cut {
  size: number;
  t: number;
  down: boolean;
}

/**
 * For two keys at once (one pass over the edges), finds the smallest
 * one-sided separator among the cuts that leave both parts non-empty and at
 * least `balance` × (m − |S|) vertices each. Vertices are verts[0..m), all
 * labelled `lab`; keyA < RA, keyB < RB. Fills the min/max neighbour keys of
 * wA and wB (used by {@link splitByCut}); a result has size Infinity when no
 * cut is balanced.
 */
export function bestCuts(
  verts: Int32Array,
  m: number,
  keyA: Int32Array,
  RA: number,
  keyB: Int32Array,
  RB: number,
  xadj: Int32Array,
  adj: Int32Array,
  label: Int32Array,
  lab: number,
  balance: number,
  wA: CutWork,
  wB: CutWork,
  outA: Cut,
  outB: Cut,
): void {
  clear(wA, RA);
  clear(wB, RB);
  for (let q = 0; q < m; q++) {
    const x = verts[q]!, ka = keyA[x]!, kb = keyB[x]!;
    let mxa = ka, mna = ka, mxb = kb, mnb = kb;
    for (let p = xadj[x]!; p < xadj[x + 1]!; p++) {
      const y = adj[p]!;
      if (label[y] !== lab) continue;
      const ya = keyA[y]!, yb = keyB[y]!;
      if (ya > mxa) mxa = ya;
      if (ya < mna) mna = ya;
      if (yb > mxb) mxb = yb;
      if (yb < mnb) mnb = yb;
    }
    record(wA, x, ka, mxa, mna);
    record(wB, x, kb, mxb, mnb);
  }
  scan(wA, RA, m, balance, outA);
  scan(wB, RB, m, balance, outB);
}

function clear(w: CutWork, R: number): void {
  w.up.fill(0, 0, R + 1);
  w.down.fill(0, 0, R + 1);
  w.count.fill(0, 0, R + 1);
}

/** x (key k, neighbour keys in [mn, mx]) is on the up separators of t ∈ [k, mx), down ones of t ∈ [mn, k). */
function record(w: CutWork, x: number, k: number, mx: number, mn: number): void {
  w.maxKey[x] = mx;
  w.minKey[x] = mn;
  w.count[k]!++;
  if (mx > k) {
    w.up[k]!++;
    w.up[mx]!--;
  }
  if (mn < k) {
    w.down[mn]!++;
    w.down[k]!--;
  }
}

/** Prefix sums of the difference arrays give every cut's separator sizes; keeps the best balanced one. */
function scan(w: CutWork, R: number, m: number, balance: number, out: Cut): void {
  const { up, down, count } = w;
  out.size = Infinity;
  let su = 0, sd = 0, below = 0;
  for (let t = 0; t + 1 < R; t++) {
    su += up[t]!;
    sd += down[t]!;
    below += count[t]!;
    const above = m - below;
    const au = below - su, bd = above - sd;
    if (su < out.size && au > 0 && above > 0 && Math.min(au, above) >= balance * (m - su)) {
      out.size = su;
      out.t = t;
      out.down = false;
    }
    if (sd < out.size && below > 0 && bd > 0 && Math.min(below, bd) >= balance * (m - sd)) {
      out.size = sd;
      out.t = t;
      out.down = true;
    }
  }
}

/**
 * Writes A, then B, then S of the cut (as found by the last {@link bestCuts}
 * call with the same key) into out[0..m); returns [|A|, |B|].
 */
export function splitByCut(verts: Int32Array, m: number, key: Int32Array, cut: Cut, w: CutWork, out: Int32Array): [number, number] {
  const { maxKey, minKey } = w;
  const t = cut.t;
  let na = 0;
  for (let q = 0; q < m; q++) {
    const x = verts[q]!;
    if (key[x]! <= t && (cut.down || maxKey[x]! <= t)) out[na++] = x;
  }
  let nb = 0;
  for (let q = 0; q < m; q++) {
    const x = verts[q]!;
    if (key[x]! > t && (!cut.down || minKey[x]! > t)) out[na + nb++] = x;
  }
  let ns = na + nb;
  for (let q = 0; q < m; q++) {
    const x = verts[q]!;
    const inS = cut.down ? key[x]! > t && minKey[x]! <= t : key[x]! <= t && maxKey[x]! > t;
    if (inS) out[ns++] = x;
  }
  return [na, nb];
}

/**
 * Thins the separator written by {@link splitByCut}: out[0..na) = A,
 * out[na..na+nb) = B, out[na+nb..m) = S. A separator vertex with no
 * neighbour in B moves to A, one with no neighbour in A moves to B (to the
 * smaller part when it has neither), one at a time, so A and B never become
 * adjacent. Level-set separators on irregular meshes are jagged, and such
 * vertices are common there. `side` is an n-length scratch array (0 = A,
 * 1 = B, 2 = S on exit for the listed vertices). Writes the new A, B, S
 * into dest[0..m) and returns [|A|, |B|].
 */
export function thinSeparator(
  out: Int32Array, m: number, na: number, nb: number, xadj: Int32Array, adj: Int32Array,
  label: Int32Array, lab: number, side: Uint8Array, dest: Int32Array,
): [number, number] {
  for (let q = 0; q < m; q++) side[out[q]!] = q < na ? 0 : q < na + nb ? 1 : 2;
  let a = na, b = nb;
  for (let q = na + nb; q < m; q++) {
    const x = out[q]!;
    let hasA = false, hasB = false;
    for (let p = xadj[x]!; p < xadj[x + 1]!; p++) {
      const y = adj[p]!;
      if (label[y] !== lab) continue;
      const sy = side[y]!;
      if (sy === 0) hasA = true;
      else if (sy === 1) hasB = true;
    }
    if (hasA && hasB) continue;
    const toA = !hasB && (hasA || a <= b);
    side[x] = toA ? 0 : 1;
    if (toA) a++;
    else b++;
  }
  let ia = 0, ib = a, is = a + b;
  for (let q = 0; q < m; q++) {
    const x = out[q]!, sx = side[x]!;
    dest[sx === 0 ? ia++ : sx === 1 ? ib++ : is++] = x;
  }
  return [a, b];
}

/**
 * Greedy refinement of a vertex separator in the manner of Fiduccia–
 * Mattheyses (node version, as in multilevel partitioners): a separator
 * vertex x moved into part P pulls its neighbours in the other part Q into
 * S, so |S| changes by |N(x) ∩ Q| − 1. Moves that shrink S are made, and
 * moves that keep its size when P is the smaller part (such moves let a
 * jagged separator slide into a position where later moves shrink it, and
 * only improve the balance); each vertex moves at most once per pass and a
 * move never pulls a vertex that already moved in that pass, so a pass
 * ends. Parts keep at least `minShare` of the vertices outside S. Input: dest[0..m) as
 * A, B, S with sizes na, nb (e.g. from {@link thinSeparator}); `side` as left
 * by it. Rewrites dest and returns [|A|, |B|]. `list` and `moved` are
 * n-length scratch arrays (`moved` all ≤ `stamp0` on entry). Writes |A|,
 * |B| and the next free stamp to out[0..2].
 */
export function refineSeparator(
  dest: Int32Array, m: number, na: number, nb: number, xadj: Int32Array, adj: Int32Array,
  label: Int32Array, lab: number, side: Uint8Array, list: Int32Array, moved: Int32Array, stamp0: number,
  passes: number, minShare: number, out: Int32Array,
): void {
  const size = [na, nb];
  let stamp = stamp0;
  for (let pass = 0; pass < passes; pass++) {
    const st = ++stamp;
    let top = 0;
    for (let q = 0; q < m; q++) if (side[dest[q]!] === 2) list[top++] = dest[q]!;
    let changed = false;
    for (let h = 0; h < top; h++) {
      const x = list[h]!;
      if (side[x] !== 2 || moved[x] === st) continue;
      let cA = 0, cB = 0, lockA = false, lockB = false;
      for (let p = xadj[x]!; p < xadj[x + 1]!; p++) {
        const y = adj[p]!;
        if (label[y] !== lab) continue;
        const sy = side[y]!;
        if (sy === 0) {
          cA++;
          if (moved[y] === st) lockA = true;
        } else if (sy === 1) {
          cB++;
          if (moved[y] === st) lockB = true;
        }
      }
      const sCount = m - size[0]! - size[1]!;
      // candidate target part P (0 = A, 1 = B); Q = 1 − P loses cQ vertices to S
      let best = -1, bestGain = -1;
      for (let P = 0; P < 2; P++) {
        const cQ = P === 0 ? cB : cA;
        if ((P === 0 ? lockB : lockA) || cQ > 1) continue;
        const gain = 1 - cQ;
        const newS = sCount - 1 + cQ;
        const qSize = size[1 - P]! - cQ;
        if (qSize < minShare * (m - newS)) continue;
        if (gain === 0 && size[P]! >= size[1 - P]!) continue;
        // ties go to the smaller part (the separator moves towards the larger)
        if (gain > bestGain || (gain === bestGain && size[P]! < size[best]!)) {
          best = P;
          bestGain = gain;
        }
      }
      if (best < 0) continue;
      const Q = 1 - best;
      side[x] = best;
      moved[x] = st;
      size[best]!++;
      for (let p = xadj[x]!; p < xadj[x + 1]!; p++) {
        const y = adj[p]!;
        if (label[y] === lab && side[y] === Q) {
          side[y] = 2;
          size[Q]!--;
          list[top++] = y;
        }
      }
      changed = true;
    }
    if (!changed) break;
  }
  // dest ← A, B, S (list as scratch for the copy)
  let ia = 0, ib = size[0]!, is = size[0]! + size[1]!;
  for (let q = 0; q < m; q++) {
    const x = dest[q]!, sx = side[x]!;
    list[sx === 0 ? ia++ : sx === 1 ? ib++ : is++] = x;
  }
  dest.set(list.subarray(0, m));
  out[0] = size[0]!;
  out[1] = size[1]!;
  out[2] = stamp + 1;
}
