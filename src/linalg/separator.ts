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

/** Scratch arrays for {@link bestCut}; n = graph size, R = key range bound. */
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
 * Finds the smallest one-sided separator among cuts that leave both parts
 * non-empty and at least `balance` × (m − |S|) vertices each. Vertices are
 * verts[0..m), all labelled `lab`, with keys in [0, R). Fills w.maxKey and
 * w.minKey for those vertices (used by {@link splitByCut}).
 */
export function bestCut(
  verts: Int32Array,
  m: number,
  key: Int32Array,
  R: number,
  xadj: Int32Array,
  adj: Int32Array,
  label: Int32Array,
  lab: number,
  balance: number,
  w: CutWork,
  out: Cut,
): Cut {
  const { maxKey, minKey, up, down, count } = w;
  up.fill(0, 0, R + 1);
  down.fill(0, 0, R + 1);
  count.fill(0, 0, R + 1);
  for (let q = 0; q < m; q++) {
    const x = verts[q]!, kx = key[x]!;
    let mx = kx, mn = kx;
    for (let p = xadj[x]!; p < xadj[x + 1]!; p++) {
      const y = adj[p]!;
      if (label[y] !== lab) continue;
      const ky = key[y]!;
      if (ky > mx) mx = ky;
      if (ky < mn) mn = ky;
    }
    maxKey[x] = mx;
    minKey[x] = mn;
    count[kx]!++;
    if (mx > kx) {
      up[kx]!++;
      up[mx]!--;
    }
    if (mn < kx) {
      down[mn]!++;
      down[kx]!--;
    }
  }
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
  return out;
}

/**
 * Writes A, then B, then S of the cut (as found by the last {@link bestCut}
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
