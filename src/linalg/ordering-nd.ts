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
import { extractPart, extractScratch, globalId, plainAlloc, rootSubgraph } from './ordering-subgraph.js';
import type { ExtractScratch, Int32Alloc, Subgraph } from './ordering-subgraph.js';

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
 * Slots of the four bisection keys in NdWorkspace.keys, in the order they are
 * preferred on ties: the level d(v, x); d(u, x) − d(v, x); d(u, x) − d(w, x);
 * d(v, x) − d(w, x) (the differences shifted to ≥ 0).
 */
const KEY_LEVEL = 0;
const KEY_UV = 1;
const KEY_UW = 2;
const KEY_VW = 3;

/**
 * Everything one nested dissection works in: typed arrays sized for the
 * largest subgraph (local ids), reused by every subgraph.
 */
export interface NdWorkspace {
  /** The subgraph being split (its xadj/adj are also in `sep`). */
  xadj: Int32Array;
  adj: Int32Array;
  deg: Int32Array | null;
  /** BFS: level of each reached vertex, the queue in level order, level offsets into it. */
  readonly level: Int32Array;
  readonly queue: Int32Array;
  readonly levelPtr: Int32Array;
  /** BFS visit stamps; `bfsStamp` is the next free one. */
  readonly visit: Int32Array;
  bfsStamp: number;
  readonly tmp: Int32Array;
  /** The split of the current subgraph: A, B, S in local ids. */
  readonly order: Int32Array;
  /** One record per bisection key (slots KEY_LEVEL … KEY_VW). */
  readonly keys: readonly [KeyedCut, KeyedCut, KeyedCut, KeyedCut];
  readonly sep: SeparatorContext;
  readonly extract: ExtractScratch;
}

/** Allocates an {@link NdWorkspace} for subgraphs of up to n vertices and nnz adjacency entries. */
export function ndWorkspace(n: number, nnz: number): NdWorkspace {
  const tmp = new Int32Array(n);
  const empty = new Int32Array(1);
  return {
    xadj: empty,
    adj: empty,
    deg: null,
    level: new Int32Array(n),
    queue: new Int32Array(n),
    levelPtr: new Int32Array(n + 2),
    visit: new Int32Array(n).fill(-1),
    bfsStamp: 0,
    tmp,
    order: new Int32Array(n),
    keys: [keyedCut(n), keyedCut(n), keyedCut(n), keyedCut(n)],
    sep: separatorContext(empty, empty, n, tmp),
    extract: extractScratch(n, nnz),
  };
}

/** The checked options of {@link nestedDissection}. */
export interface NdSettings {
  readonly leafSize: number;
  readonly leafAmd: boolean;
}

/** Options → settings (defaults filled in). */
export function ndSettings(opts: NestedDissectionOptions): NdSettings {
  return { leafSize: Math.max(2, opts.leafSize ?? 512), leafAmd: (opts.leafOrder ?? 'amd') === 'amd' };
}

/** Returns perm with perm[k] = the vertex eliminated k-th. */
export function nestedDissection(g: AdjacencyGraph, opts: NestedDissectionOptions = {}): Int32Array {
  const out = new Int32Array(g.n);
  const ws = ndWorkspace(g.n, g.adj.length);
  orderSubgraph(ws, ndSettings(opts), rootSubgraph(g), out, 0, plainAlloc);
  return out;
}

/**
 * How {@link splitSubgraph} split a subgraph: into parts A = order[0..na) and
 * B = order[na..na+nb), separator S = order[na+nb..n) (local ids; ws.sep.side
 * marks them 0, 1, 2), or not at all (a leaf, or too shallow to split).
 */
export type NdSplit = { readonly na: number; readonly nb: number } | null;

/**
 * Orders the subgraph `sub` into out[lo .. lo + sub.n) (whole-graph ids):
 * every part is split again until it is a leaf, the parts first, then the
 * separator. Parts are copied out with `alloc`. `beat[0]`, when given, counts
 * the subgraphs done (the heartbeat of a worker thread, ordering-executor.ts).
 */
export function orderSubgraph(
  ws: NdWorkspace, st: NdSettings, sub: Subgraph, out: Int32Array, lo: number, alloc: Int32Alloc, beat: Int32Array | null = null,
): void {
  const pending: [Subgraph, number][] = [[sub, lo]];
  while (pending.length > 0) {
    const [s, at] = pending.pop()!;
    const split = splitSubgraph(ws, st, s, out, at);
    if (beat !== null) Atomics.add(beat, 0, 1);
    if (split === null) continue;
    const [a, b] = extractParts(ws, s, split, alloc);
    pending.push([a, at], [b, at + split.na]);
  }
}

/**
 * One step of the dissection of `s` (to be placed at out[at ..]): a leaf is
 * ordered into out and null returned; a subgraph too shallow to split keeps
 * its order (null); otherwise the separator is written at its place in out
 * and the split returned, for {@link extractParts}.
 */
export function splitSubgraph(ws: NdWorkspace, st: NdSettings, s: Subgraph, out: Int32Array, at: number): NdSplit {
  const m = s.n;
  if (m <= st.leafSize) {
    orderLeaf(s, st.leafAmd, out, at);
    return null;
  }
  ws.xadj = ws.sep.xadj = s.xadj;
  ws.adj = ws.sep.adj = s.adj;
  ws.deg = s.deg;
  const split = splitRange(ws, m);
  if (split === null) {
    for (let k = 0; k < m; k++) out[at + k] = globalId(s, k);
    return null;
  }
  const { order } = ws;
  for (let k = split.na + split.nb; k < m; k++) out[at + k] = globalId(s, order[k]!);
  return split;
}

/** The two parts of a split as subgraphs of their own (A, B). */
export function extractParts(ws: NdWorkspace, s: Subgraph, split: { na: number; nb: number }, alloc: Int32Alloc): [Subgraph, Subgraph] {
  const { order, extract } = ws, side = ws.sep.side;
  const { na, nb } = split;
  return [extractPart(s, order, 0, na, side, 0, extract, alloc), extractPart(s, order, na, na + nb, side, 1, extract, alloc)];
}

/** Orders a leaf into out[at ..): approximate minimum degree on it, or its own order. */
function orderLeaf(s: Subgraph, amd: boolean, out: Int32Array, at: number): void {
  const m = s.n;
  if (!amd || m <= 2) {
    for (let k = 0; k < m; k++) out[at + k] = globalId(s, k);
    return;
  }
  const lp = approximateMinimumDegree({ n: m, xadj: s.xadj, adj: s.adj });
  for (let k = 0; k < m; k++) out[at + k] = globalId(s, lp[k]!);
}

/**
 * BFS from `root` over the current subgraph; fills queue[0..count) in
 * level order, level[], levelPtr[0..nlev]; returns the number of levels
 * (the count reached is levelPtr[nlev]).
 */
function bfs(s: NdWorkspace, root: number): number {
  const { queue, visit, levelPtr, level, xadj, adj } = s;
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
        if (visit[w] === st) continue;
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
 * Splits the current subgraph (local ids 0..m): by component when it is
 * disconnected, else by a vertex separator; leaves A, B, S in ws.order and
 * ws.sep.side. Returns null for a subgraph too shallow to split.
 */
function splitRange(s: NdWorkspace, m: number): NdSplit {
  const { levelPtr, order } = s;
  const sep = s.sep;
  let nlev = bfs(s, 0);
  if (levelPtr[nlev]! < m) return splitByComponent(s, m);
  const peripheral = pseudoPeripheral(s, m, nlev);
  nlev = peripheral.nlev;
  if (nlev < 3) return null; // too shallow to split (nearly complete graph): keep as a leaf
  const cut = chooseCut(s, m, nlev, peripheral.nlevU);
  const [na0, nb0] = splitByCut(s.queue, m, cut, s.tmp);
  const [na1, nb1] = thinSeparator(sep, s.tmp, m, na0, nb0, order);
  const [na, nb] = refineSeparator(sep, order, m, na1, nb1, REFINE_PASSES, REFINE_SHARE);
  return { na, nb };
}

/** Disconnected subgraph: the component the last BFS reached first, the rest after, no separator. */
function splitByComponent(s: NdWorkspace, m: number): NdSplit {
  const { visit, tmp, order } = s;
  const side = s.sep.side;
  const reached = s.bfsStamp - 1;
  let a = 0, b = 0;
  for (let x = 0; x < m; x++) {
    if (visit[x] === reached) {
      order[a++] = x;
      side[x] = 0;
    } else {
      tmp[b++] = x;
      side[x] = 1;
    }
  }
  order.set(tmp.subarray(0, b), a);
  return { na: a, nb: b };
}

/**
 * Pseudo-peripheral pair: restarts the BFS from a minimum-degree vertex of the
 * last level while that deepens the structure. On return the UV key holds
 * d(u, ·) of the previous root u (nlevU levels) and `level` holds d(v, ·) of
 * the final root v (nlev levels).
 */
function pseudoPeripheral(s: NdWorkspace, m: number, nlev: number): { nlev: number; nlevU: number } {
  const { queue, levelPtr, level, xadj, deg } = s;
  const du = s.keys[KEY_UV].key;
  let nlevU = 0;
  for (let it = 0; it < PERIPHERAL_ROUNDS; it++) {
    let best = -1, bestDeg = Infinity;
    for (let k = levelPtr[nlev - 1]!; k < levelPtr[nlev]!; k++) {
      const v = queue[k]!;
      const d = deg === null ? xadj[v + 1]! - xadj[v]! : deg[v]!;
      if (d < bestDeg) {
        bestDeg = d;
        best = v;
      }
    }
    du.set(level.subarray(0, m)); // connected: every vertex was reached
    nlevU = nlev;
    const nl = bfs(s, best);
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
function chooseCut(s: NdWorkspace, m: number, nlevV: number, nlevU: number): KeyedCut {
  const { queue, level, levelPtr } = s;
  const keys = s.keys;
  const lv = keys[KEY_LEVEL], uv = keys[KEY_UV], uw = keys[KEY_UW], vw = keys[KEY_VW];
  const dv = lv.key, duv = uv.key, duw = uw.key, dvw = vw.key;
  // level: d(v, x); UV: d(u, x) − d(v, x) shifted to ≥ 0; UW keeps d(u, x) for now
  // element-wise loops run over local ids (sequential memory); only the choice of w follows the queue
  for (let x = 0; x < m; x++) {
    dv[x] = level[x]!;
    duw[x] = duv[x]!;
    duv[x] = duv[x]! - level[x]! + nlevV;
  }
  lv.range = nlevV;
  uv.range = nlevV + nlevU + 1;
  let fallbackT = 1;
  while (fallbackT < nlevV - 2 && levelPtr[fallbackT + 1]! < m / 2) fallbackT++;
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
  const nlevW = bfs(s, w);
  for (let x = 0; x < m; x++) {
    duw[x] = duw[x]! - level[x]! + nlevW;
    dvw[x] = dv[x]! - level[x]! + nlevW;
  }
  uw.range = nlevU + nlevW + 1;
  vw.range = nlevV + nlevW + 1;
  bestCuts(s.sep, m, keys, BALANCE);
  let best = lv.cut.size <= uv.cut.size ? lv : uv;
  if (uw.cut.size < best.cut.size) best = uw;
  if (vw.cut.size < best.cut.size) best = vw;
  if (best.cut.size === Infinity) {
    best = lv;
    best.cut.t = fallbackT;
    best.cut.down = false;
  }
  return best;
}
