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
import { bestCuts, keyedCut, refineSeparator, separatorContext, splitByCut, thinSeparator } from './separator.js';
import type { KeyedCut, SeparatorContext } from './separator.js';

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

/**
 * Slots of the four bisection keys in NdState.keys, in the order they are
 * preferred on ties: the level d(v, x); d(u, x) − d(v, x); d(u, x) − d(w, x);
 * d(v, x) − d(w, x) (the differences shifted to ≥ 0).
 */
const KEY_LEVEL = 0;
const KEY_UV = 1;
const KEY_UW = 2;
const KEY_VW = 3;

/** Everything one nested dissection works in: n-length typed arrays, reused by every subgraph. */
interface NdState {
  readonly xadj: Int32Array;
  readonly adj: Int32Array;
  /** The permutation being built: ranges of it are rearranged in place. */
  readonly verts: Int32Array;
  /** label[v] = id of the subgraph being split that holds v, else −1. */
  readonly label: Int32Array;
  /** BFS: level of each reached vertex, the queue in level order, level offsets into it. */
  readonly level: Int32Array;
  readonly queue: Int32Array;
  readonly levelPtr: Int32Array;
  /** BFS visit stamps; `bfsStamp` is the next free one. */
  readonly visit: Int32Array;
  bfsStamp: number;
  readonly tmp: Int32Array;
  /** Leaf-local vertex numbers. */
  readonly local: Int32Array;
  /** One record per bisection key (slots KEY_LEVEL … KEY_VW). */
  readonly keys: readonly [KeyedCut, KeyedCut, KeyedCut, KeyedCut];
  readonly sep: SeparatorContext;
  /** Pending subgraphs as lo, hi pairs of `verts` ranges. */
  readonly ranges: number[];
}

/** Returns perm with perm[k] = the vertex eliminated k-th. */
export function nestedDissection(g: AdjacencyGraph, opts: NestedDissectionOptions = {}): Int32Array {
  const { n, xadj, adj } = g;
  const leafSize = Math.max(2, opts.leafSize ?? 512);
  const leafAmd = (opts.leafOrder ?? 'amd') === 'amd';
  const verts = new Int32Array(n);
  for (let v = 0; v < n; v++) verts[v] = v;
  const label = new Int32Array(n).fill(-1);
  const tmp = new Int32Array(n);
  const s: NdState = {
    xadj,
    adj,
    verts,
    label,
    level: new Int32Array(n),
    queue: new Int32Array(n),
    levelPtr: new Int32Array(n + 2),
    visit: new Int32Array(n).fill(-1),
    bfsStamp: 0,
    tmp,
    local: new Int32Array(n),
    keys: [keyedCut(n), keyedCut(n), keyedCut(n), keyedCut(n)],
    sep: separatorContext(xadj, adj, label, tmp),
    ranges: [0, n],
  };
  let id = 0;
  while (s.ranges.length > 0) {
    const hi = s.ranges.pop()!;
    const lo = s.ranges.pop()!;
    const lab = id++;
    for (let k = lo; k < hi; k++) label[verts[k]!] = lab;
    if (hi - lo <= leafSize) {
      if (leafAmd && hi - lo > 2) orderLeaf(s, lo, hi, lab);
      continue;
    }
    splitRange(s, lo, hi, lab);
  }
  return verts;
}

/** Orders verts[lo..hi) (all labelled `lab`) by AMD on their induced subgraph. */
function orderLeaf(s: NdState, lo: number, hi: number, lab: number): void {
  const { verts, local, xadj, adj, label, tmp } = s;
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
}

/**
 * BFS from `root` over vertices labelled `lab`; fills queue[0..count) in
 * level order, level[], levelPtr[0..nlev]; returns the number of levels
 * (the count reached is levelPtr[nlev]).
 */
function bfs(s: NdState, root: number, lab: number): number {
  const { queue, visit, levelPtr, level, xadj, adj, label } = s;
  const st = s.bfsStamp++;
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
}

/**
 * Splits the subgraph verts[lo..hi) (labelled `lab`) and queues its parts:
 * by component when it is disconnected, else by a vertex separator (A, B
 * queued, S kept last). A subgraph too shallow to split stays as it is.
 */
function splitRange(s: NdState, lo: number, hi: number, lab: number): void {
  const { verts, label, levelPtr } = s;
  const m = hi - lo;
  const sep = s.sep;
  sep.lab = lab;
  let nlev = bfs(s, verts[lo]!, lab);
  if (levelPtr[nlev]! < m) {
    splitByComponent(s, lo, hi);
    return;
  }
  const peripheral = pseudoPeripheral(s, lab, m, nlev);
  nlev = peripheral.nlev;
  if (nlev < 3) return; // too shallow to split (nearly complete graph): keep as a leaf
  const cut = chooseCut(s, lab, m, nlev, peripheral.nlevU);
  const part = verts.subarray(lo, hi);
  const [na0, nb0] = splitByCut(s.queue, m, cut, s.tmp);
  const [na1, nb1] = thinSeparator(sep, s.tmp, m, na0, nb0, part);
  const [na, nb] = refineSeparator(sep, part, m, na1, nb1, REFINE_PASSES, REFINE_SHARE);
  for (let k = lo; k < hi; k++) label[verts[k]!] = -1;
  s.ranges.push(lo, lo + na, lo + na, lo + na + nb);
}

/** Disconnected subgraph: the component the last BFS reached first, the rest after, no separator. */
function splitByComponent(s: NdState, lo: number, hi: number): void {
  const { verts, visit, tmp, label } = s;
  const reached = s.bfsStamp - 1;
  let a = lo, b = 0;
  for (let k = lo; k < hi; k++) {
    const v = verts[k]!;
    if (visit[v] === reached) verts[a++] = v;
    else tmp[b++] = v;
  }
  verts.set(tmp.subarray(0, b), a);
  for (let k = lo; k < hi; k++) label[verts[k]!] = -1;
  s.ranges.push(lo, a, a, hi);
}

/**
 * Pseudo-peripheral pair: restarts the BFS from a minimum-degree vertex of the
 * last level while that deepens the structure. On return the UV key holds
 * d(u, ·) of the previous root u (nlevU levels) and `level` holds d(v, ·) of
 * the final root v (nlev levels).
 */
function pseudoPeripheral(s: NdState, lab: number, m: number, nlev: number): { nlev: number; nlevU: number } {
  const { queue, levelPtr, level, xadj } = s;
  const du = s.keys[KEY_UV].key;
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
    for (let k = 0; k < m; k++) du[queue[k]!] = level[queue[k]!]!;
    nlevU = nlev;
    const nl = bfs(s, best, lab);
    const deeper = nl > nlev;
    nlev = nl;
    if (!deeper) break;
  }
  return { nlev, nlevU };
}

/**
 * Fills the four keys and returns the one whose best balanced cut has the
 * smallest separator (ties to the earlier key); without any balanced cut (e.g.
 * a star), the "up" separator of the level key at its median level. Leaves
 * `queue` in the order of the last BFS (from w), which splitByCut follows.
 */
function chooseCut(s: NdState, lab: number, m: number, nlevV: number, nlevU: number): KeyedCut {
  const { queue, level, levelPtr } = s;
  const keys = s.keys;
  const lv = keys[KEY_LEVEL], uv = keys[KEY_UV], uw = keys[KEY_UW], vw = keys[KEY_VW];
  const dv = lv.key, duv = uv.key, duw = uw.key, dvw = vw.key;
  // level: d(v, x); UV: d(u, x) − d(v, x) shifted to ≥ 0; UW keeps d(u, x) for now
  for (let k = 0; k < m; k++) {
    const x = queue[k]!;
    dv[x] = level[x]!;
    duw[x] = duv[x]!;
    duv[x] = duv[x]! - level[x]! + nlevV;
  }
  lv.range = nlevV;
  uv.range = nlevV + nlevU + 1;
  bestCuts(s.sep, queue, m, lv, uv, BALANCE);
  let fallbackT = 1;
  while (fallbackT < nlevV - 2 && levelPtr[fallbackT + 1]! < m / 2) fallbackT++;
  let best = lv.cut.size <= uv.cut.size ? lv : uv;
  // u and v are far apart, and so is the pair (u, w) and (v, w) for w
  // far from both: on a grid-like patch u, v are opposite corners, whose
  // bisector is diagonal, and w is a third corner; the bisectors
  // d(u,·) − d(w,·) and d(v,·) − d(w,·) cut straight across, shorter
  let w = queue[0]!, far = -1;
  for (let k = 0; k < m; k++) {
    const x = queue[k]!, d = dv[x]! + duw[x]!;
    if (d > far) {
      far = d;
      w = x;
    }
  }
  const nlevW = bfs(s, w, lab);
  for (let k = 0; k < m; k++) {
    const x = queue[k]!;
    duw[x] = duw[x]! - level[x]! + nlevW;
    dvw[x] = dv[x]! - level[x]! + nlevW;
  }
  uw.range = nlevU + nlevW + 1;
  vw.range = nlevV + nlevW + 1;
  bestCuts(s.sep, queue, m, uw, vw, BALANCE);
  if (uw.cut.size < best.cut.size) best = uw;
  if (vw.cut.size < best.cut.size) best = vw;
  if (best.cut.size === Infinity) {
    best = lv;
    best.cut.t = fallbackT;
    best.cut.down = false;
  }
  return best;
}
