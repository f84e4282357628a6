/**
 * Nested dissection ordering (George, SIAM J. Numer. Anal. 10, 1973) with
 * bisection by breadth-first level structures.
 *
 * A subgraph G is split by a vertex separator S into parts A and B with no
 * edge between them; A is numbered first, then B, then S last:
 *
 * ```
 *   [ A  .  x ]      eliminating A and B creates fill only inside A, B
 *   [ .  B  x ]      and S, never between A and B
 *   [ x  x  S ]
 * ```
 *
 * S is the smallest balanced one-sided cut boundary (see separator.ts) for
 * four vertex keys: the BFS level from a pseudo-peripheral vertex v, and the
 * bisector keys d(u, x) − d(v, x), d(u, x) − d(w, x), d(v, x) − d(w, x) with
 * u at the far end of v's level structure and w far from both u and v. S is
 * then thinned (vertices with a neighbour on one side only leave it) and
 * refined by greedy node moves (see separator.ts).
 * Measured on the heat benchmark's 1M-vertex flipped terrain: nnz(L) 55.9M →
 * 52.2M, dense flops 23.6G → 20.0G, against the level and u–v keys alone with
 * balance 0.3 (test/bench/linalg.bench.ts and heat.bench.ts). Disconnected
 * subgraphs are split by component with an empty separator. Subgraphs below
 * `leafSize` vertices are ordered by approximate minimum degree on their own
 * subgraph (a hybrid common in practice), or keep their BFS order.
 * Everything lives in a few n-length typed arrays; ranges of one permutation
 * array are rearranged in place.
 */
import type { AdjacencyGraph } from './graph.js';
import { approximateMinimumDegree } from './ordering-amd.js';
import { bestCuts, cutWork, refineSeparator, splitByCut, thinSeparator } from './separator.js';
import type { Cut } from './separator.js';

/**
 * Each part keeps at least this share of the vertices outside the separator
 * (0.4 measured better than 0.3 and 0.45 on 1M-vertex terrain and sphere).
 */
const BALANCE = 0.4;

/** Restarts of the pseudo-peripheral search (each is one BFS). */
const PERIPHERAL_ROUNDS = 2;

/**
 * Passes of separator refinement (see refineSeparator) and the least part
 * share it keeps; measured on the 1M flipped terrain: 0 → 2 → 4 → 10 passes
 * give 20.0 → 18.9 → 18.7 → 18.9 G dense flops.
 */
const REFINE_PASSES = 4;
const REFINE_SHARE = 0.35;

/** Options of {@link nestedDissection}. */
export interface NestedDissectionOptions {
  /** Subgraphs with at most this many vertices are not split further (default 512). */
  leafSize?: number;
  /** How leaves are ordered: approximate minimum degree on the leaf's subgraph (default) or BFS order. */
  leafOrder?: 'amd' | 'bfs';
}

/** Returns perm with perm[k] = the vertex eliminated k-th. */
export function nestedDissection(g: AdjacencyGraph, opts: NestedDissectionOptions = {}): Int32Array {
  const { n, xadj, adj } = g;
  const leafSize = Math.max(2, opts.leafSize ?? 512);
  const verts = new Int32Array(n);
  for (let v = 0; v < n; v++) verts[v] = v;
  const label = new Int32Array(n).fill(-1);
  const level = new Int32Array(n);
  const queue = new Int32Array(n);
  const tmp = new Int32Array(n);
  const levelPtr = new Int32Array(n + 2);
  const ranges: number[] = [0, n];
  const leafAmd = (opts.leafOrder ?? 'amd') === 'amd';
  const local = new Int32Array(n);

  /** Orders verts[lo..hi) (all labelled `lab`) by AMD on their induced subgraph. */
  const orderLeaf = (lo: number, hi: number, lab: number): void => {
    const m = hi - lo;
    for (let k = lo; k < hi; k++) local[verts[k]!] = k - lo;
    const lx = new Int32Array(m + 1);
    for (let k = lo; k < hi; k++) {
      const v = verts[k]!;
      let d = 0;
      for (let p = xadj[v]!; p < xadj[v + 1]!; p++) if (label[adj[p]!] === lab) d++;
      lx[k - lo + 1] = lx[k - lo]! + d;
    }
    const la = new Int32Array(lx[m]!);
    for (let k = lo, q = 0; k < hi; k++) {
      const v = verts[k]!;
      for (let p = xadj[v]!; p < xadj[v + 1]!; p++) if (label[adj[p]!] === lab) la[q++] = local[adj[p]!]!;
    }
    const lp = approximateMinimumDegree({ n: m, xadj: lx, adj: la });
    for (let k = 0; k < m; k++) tmp[k] = verts[lo + lp[k]!]!;
    verts.set(tmp.subarray(0, m), lo);
  };
  let id = 0;

  const visit = new Int32Array(n).fill(-1);
  const keyA = new Int32Array(n);
  const keyB = new Int32Array(n);
  const workA = cutWork(n);
  const workB = cutWork(n);
  const cutBufA: Cut = { size: 0, t: 0, down: false };
  const cutBufB: Cut = { size: 0, t: 0, down: false };
  const keyC = new Int32Array(n);
  const keyD = new Int32Array(n);
  const workC = cutWork(n);
  const workD = cutWork(n);
  const cutBufC: Cut = { size: 0, t: 0, down: false };
  const cutBufD: Cut = { size: 0, t: 0, down: false };
  let stamp = 0;
  const side = new Uint8Array(n);
  const moved = new Int32Array(n);
  const refineOut = new Int32Array(3);
  let moveStamp = 0;

  /**
   * BFS from `root` over vertices labelled `lab`; fills queue[0..count) in
   * level order, level[], levelPtr[0..nlev]; returns the number of levels
   * (the count reached is levelPtr[nlev]).
   */
  const bfs = (root: number, lab: number): number => {
    const st = stamp++;
    let head = 0, tail = 0, nlev = 0;
    queue[tail++] = root;
    visit[root] = st;
    while (head < tail) {
      const levelEnd = tail;
      levelPtr[nlev] = head;
      for (; head < levelEnd; head++) {
        const v = queue[head]!;
        level[v] = nlev;
        for (let p = xadj[v]!; p < xadj[v + 1]!; p++) {
          const w = adj[p]!;
          if (label[w] !== lab || visit[w] === st) continue;
          visit[w] = st;
          queue[tail++] = w;
        }
      }
      nlev++;
    }
    levelPtr[nlev] = tail;
    return nlev;
  };

  while (ranges.length > 0) {
    const hi = ranges.pop()!;
    const lo = ranges.pop()!;
    const m = hi - lo;
    const lab = id++;
    for (let k = lo; k < hi; k++) label[verts[k]!] = lab;
    if (m <= leafSize) {
      if (leafAmd && m > 2) orderLeaf(lo, hi, lab);
      continue;
    }

    let root = verts[lo]!;
    let nlev = bfs(root, lab);
    if (levelPtr[nlev]! < m) {
      // disconnected: reached component first, the rest after, no separator
      let a = lo, b = 0;
      for (let k = lo; k < hi; k++) {
        const v = verts[k]!;
        if (visit[v] === stamp - 1) verts[a++] = v;
        else tmp[b++] = v;
      }
      verts.set(tmp.subarray(0, b), a);
      for (let k = lo; k < hi; k++) label[verts[k]!] = -1;
      ranges.push(lo, a, a, hi);
      continue;
    }
    // pseudo-peripheral pair: restart from a minimum-degree vertex of the
    // last level while that deepens the structure; keyB keeps d(u, ·) of the
    // previous root u, `level` ends as d(v, ·) of the final root v
    let nlevU = 0;
    for (let it = 0; it < PERIPHERAL_ROUNDS; it++) {
      let best = -1, bestDeg = Infinity;
      for (let k = levelPtr[nlev - 1]!; k < levelPtr[nlev]!; k++) {
        const v = queue[k]!;
        const d = xadj[v + 1]! - xadj[v]!;
        if (d < bestDeg) {
          bestDeg = d;
          best = v;
        }
      }
      for (let k = 0; k < m; k++) keyB[queue[k]!] = level[queue[k]!]!;
      nlevU = nlev;
      const nl = bfs(best, lab);
      const deeper = nl > nlev;
      nlev = nl;
      if (!deeper) break;
    }
    if (nlev < 3) continue; // too shallow to split (nearly complete graph): keep as a leaf
    // key A: d(v, x); key B: d(u, x) − d(v, x) shifted to ≥ 0; keyC keeps d(u, x)
    for (let k = 0; k < m; k++) {
      const x = queue[k]!;
      keyA[x] = level[x]!;
      keyC[x] = keyB[x]!;
      keyB[x] = keyB[x]! - level[x]! + nlev;
    }
    const nlevA = nlev, nlevB = nlevU;
    bestCuts(queue, m, keyA, nlevA, keyB, nlevA + nlevB + 1, xadj, adj, label, lab, BALANCE, workA, workB, cutBufA, cutBufB);
    // no balanced cut (e.g. a star): the "up" separator at the median level of key A
    let fallbackT = 1;
    while (fallbackT < nlevA - 2 && levelPtr[fallbackT + 1]! < m / 2) fallbackT++;
    let key = keyB, cut = cutBufB, work = workB;
    if (cutBufA.size <= cutBufB.size) {
      key = keyA;
      cut = cutBufA;
      work = workA;
    }
    {
      // u and v are far apart, and so is the pair (u, w) and (v, w) for w
      // far from both: on a grid-like patch u, v are opposite corners, whose
      // bisector is diagonal, and w is a third corner; the bisectors
      // d(u,·) − d(w,·) and d(v,·) − d(w,·) cut straight across, shorter
      let w = queue[0]!, far = -1;
      for (let k = 0; k < m; k++) {
        const x = queue[k]!, d = keyA[x]! + keyC[x]!;
        if (d > far) {
          far = d;
          w = x;
        }
      }
      const nlevW = bfs(w, lab);
      for (let k = 0; k < m; k++) {
        const x = queue[k]!;
        keyC[x] = keyC[x]! - level[x]! + nlevW;
        keyD[x] = keyA[x]! - level[x]! + nlevW;
      }
      bestCuts(queue, m, keyC, nlevB + nlevW + 1, keyD, nlevA + nlevW + 1, xadj, adj, label, lab, BALANCE, workC, workD, cutBufC, cutBufD);
      if (cutBufC.size < cut.size) {
        key = keyC;
        cut = cutBufC;
        work = workC;
      }
      if (cutBufD.size < cut.size) {
        key = keyD;
        cut = cutBufD;
        work = workD;
      }
    }
    if (cut.size === Infinity) {
      key = keyA;
      cut = cutBufA;
      work = workA;
      cut.t = fallbackT;
      cut.down = false;
    }
    const [na0, nb0] = splitByCut(queue, m, key, cut, work, tmp);
    let [na, nb] = thinSeparator(tmp, m, na0, nb0, xadj, adj, label, lab, side, verts.subarray(lo, hi));
    refineSeparator(verts.subarray(lo, hi), m, na, nb, xadj, adj, label, lab, side, tmp, moved, moveStamp, REFINE_PASSES, REFINE_SHARE, refineOut);
    na = refineOut[0]!;
    nb = refineOut[1]!;
    moveStamp = refineOut[2]!;
    for (let k = lo; k < hi; k++) label[verts[k]!] = -1;
    ranges.push(lo, lo + na, lo + na, lo + na + nb);
  }
  return verts;
}
