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

/**
 * The subgraph being split (ordering-subgraph.ts: every neighbour listed in
 * adj belongs to it) and the scratch the separator routines share, n-length
 * arrays for the largest subgraph. One context serves a whole nested
 * dissection; `xadj` and `adj` are set to each subgraph in turn.
 */
export interface SeparatorContext {
  xadj: Int32Array;
  adj: Int32Array;
  /** Part of each listed vertex: 0 = A, 1 = B, 2 = S (set by {@link thinSeparator}). */
  readonly side: Uint8Array;
  /** Scratch list for {@link refineSeparator}. */
  readonly list: Int32Array;
  /** Pass stamps of {@link refineSeparator}: moved[x] === a pass's stamp when x moved in it. */
  readonly moved: Int32Array;
  /** Next free stamp for `moved` (every entry of `moved` is below it). */
  moveStamp: number;
}

/** Allocates a {@link SeparatorContext} for subgraphs of up to n vertices, with a scratch list (n-length). */
export function separatorContext(xadj: Int32Array, adj: Int32Array, n: number, list: Int32Array): SeparatorContext {
  return { xadj, adj, side: new Uint8Array(n), list, moved: new Int32Array(n), moveStamp: 0 };
}

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

/** The chosen cut: separator size, threshold t and side; size = Infinity if none is balanced. */
export interface Cut {
  size: number;
  t: number;
  down: boolean;
}

/** One vertex key (values in [0, range)), its scratch, and the best cut {@link bestCuts} found for it. */
export interface KeyedCut {
  readonly key: Int32Array;
  range: number;
  readonly work: CutWork;
  readonly cut: Cut;
}

/** Allocates a {@link KeyedCut} for a graph of n vertices (keys < 2n + 2). */
export function keyedCut(n: number): KeyedCut {
  const r = 2 * n + 4;
  const work = { maxKey: new Int32Array(n), minKey: new Int32Array(n), up: new Int32Array(r), down: new Int32Array(r), count: new Int32Array(r) };
  return { key: new Int32Array(n), range: 0, work, cut: { size: 0, t: 0, down: false } };
}

/**
 * For four keys at once (one pass over the edges), finds the smallest
 * one-sided separator among the cuts that leave both parts non-empty and at
 * least `balance` × (m − |S|) vertices each, into each key's cut, for the
 * subgraph's vertices 0..m−1 (in that order: sequential memory; the sizes do
 * not depend on the order). Fills the min/max neighbour keys of each work (used by {@link splitByCut}); a cut has size Infinity
 * when none is balanced.
 */
export function bestCuts(
  ctx: SeparatorContext, m: number, kc: readonly [KeyedCut, KeyedCut, KeyedCut, KeyedCut], balance: number,
): void {
  const { xadj, adj } = ctx;
  const [a, b, c, d] = kc;
  const keyA = a.key, keyB = b.key, keyC = c.key, keyD = d.key;
  for (const k of kc) clear(k.work, k.range);
  for (let x = 0; x < m; x++) {
    const ka = keyA[x]!, kb = keyB[x]!, kcx = keyC[x]!, kd = keyD[x]!;
    let mxa = ka, mna = ka, mxb = kb, mnb = kb, mxc = kcx, mnc = kcx, mxd = kd, mnd = kd;
    for (let p = xadj[x]!, p1 = xadj[x + 1]!; p < p1; p++) {
      const y = adj[p]!;
      const ya = keyA[y]!, yb = keyB[y]!, yc = keyC[y]!, yd = keyD[y]!;
      if (ya > mxa) mxa = ya;
      if (ya < mna) mna = ya;
      if (yb > mxb) mxb = yb;
      if (yb < mnb) mnb = yb;
      if (yc > mxc) mxc = yc;
      if (yc < mnc) mnc = yc;
      if (yd > mxd) mxd = yd;
      if (yd < mnd) mnd = yd;
    }
    record(a.work, x, ka, mxa, mna);
    record(b.work, x, kb, mxb, mnb);
    record(c.work, x, kcx, mxc, mnc);
    record(d.work, x, kd, mxd, mnd);
  }
  for (const k of kc) scan(k.work, k.range, m, balance, k.cut);
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
 * Writes A, then B, then S of kc.cut (as found by the last {@link bestCuts}
 * call with kc) into out[0..m); returns [|A|, |B|].
 */
export function splitByCut(verts: Int32Array, m: number, kc: KeyedCut, out: Int32Array): [number, number] {
  const { key, cut } = kc;
  const { maxKey, minKey } = kc.work;
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
 * vertices are common there. Leaves ctx.side as 0 = A, 1 = B, 2 = S for the
 * listed vertices. Writes the new A, B, S
 * into dest[0..m) and returns [|A|, |B|].
 */
export function thinSeparator(ctx: SeparatorContext, out: Int32Array, m: number, na: number, nb: number, dest: Int32Array): [number, number] {
  const { xadj, adj, side } = ctx;
  for (let q = 0; q < m; q++) side[out[q]!] = q < na ? 0 : q < na + nb ? 1 : 2;
  let a = na, b = nb;
  for (let q = na + nb; q < m; q++) {
    const x = out[q]!;
    let hasA = false, hasB = false;
    for (let p = xadj[x]!, p1 = xadj[x + 1]!; p < p1; p++) {
      const y = adj[p]!;
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
 * A, B, S with sizes na, nb (e.g. from {@link thinSeparator}); ctx.side as left
 * by it. Uses ctx.list and ctx.moved as scratch and advances ctx.moveStamp.
 * Rewrites dest and returns [|A|, |B|].
 */
export function refineSeparator(
  ctx: SeparatorContext, dest: Int32Array, m: number, na: number, nb: number, passes: number, minShare: number,
): [number, number] {
  const { xadj, adj, side, list, moved } = ctx;
  const size = [na, nb];
  let stamp = ctx.moveStamp;
  for (let pass = 0; pass < passes; pass++) {
    const st = ++stamp;
    let top = 0;
    for (let q = 0; q < m; q++) if (side[dest[q]!] === 2) list[top++] = dest[q]!;
    let changed = false;
    for (let h = 0; h < top; h++) {
      const x = list[h]!;
      if (side[x] !== 2 || moved[x] === st) continue;
      let cA = 0, cB = 0, lockA = false, lockB = false;
      for (let p = xadj[x]!, p1 = xadj[x + 1]!; p < p1; p++) {
        const y = adj[p]!;
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
      for (let p = xadj[x]!, p1 = xadj[x + 1]!; p < p1; p++) {
        const y = adj[p]!;
        if (side[y] === Q) {
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
  ctx.moveStamp = stamp + 1;
  return [size[0]!, size[1]!];
}
