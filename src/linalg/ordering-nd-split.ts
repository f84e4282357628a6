/**
 * One step of nested dissection (ordering-nd.ts): a vertex separator of a
 * connected subgraph from breadth-first level structures.
 *
 * S is the smallest balanced one-sided cut boundary (see separator.ts) for
 * four vertex keys: the BFS level from a pseudo-peripheral vertex v, and the
 * bisector keys d(u, x) − d(v, x), d(u, x) − d(w, x), d(v, x) − d(w, x) with
 * u at the far end of v's level structure and w far from both u and v. S is
 * then thinned (vertices with a neighbour on one side only leave it) and
 * refined by greedy node moves (see separator.ts).
 * Measured on the heat benchmark's 1M-vertex flipped terrain: nnz(L) 55.9M →
 * 52.2M, dense flops 23.6G → 20.0G, against the level and u–v keys alone with
 * balance 0.3 (test/bench/linalg.bench.ts and heat.bench.ts). Straight cuts
 * from the vertex positions (four directions, as extra candidates or alone)
 * measured no better there (nnz(L) 50.5M against 50.3M): the flipped
 * terrain's larger fill than the unflipped grid's (50M against 35M) is the
 * irregular graph's, not jagged level sets'. Disconnected subgraphs are split
 * by component with an empty separator.
 * Everything lives in a few typed arrays sized for the largest subgraph
 * (NdWorkspace), reused by every subgraph.
 */
import { bestCuts, keyedCut, refineSeparator, separatorContext, splitByCut, thinSeparator } from './separator.js';
import type { KeyedCut, SeparatorContext } from './separator.js';
import { extractScratch } from './ordering-subgraph.js';
import type { ExtractScratch } from './ordering-subgraph.js';

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

/**
 * How a subgraph was split (ordering-nd.ts, splitSubgraph): into parts
 * A = order[0..na) and B = order[na..na+nb), separator S = order[na+nb..n)
 * (local ids; ws.sep.side marks them 0, 1, 2), or not at all (a leaf, or
 * too shallow to split).
 */
export type NdSplit = { readonly na: number; readonly nb: number } | null;

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
      for (let p = xadj[v]!, p1 = xadj[v + 1]!; p < p1; p++) {
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
export function splitRange(s: NdWorkspace, m: number): NdSplit {
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
