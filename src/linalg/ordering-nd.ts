/**
 * Nested dissection ordering (George, SIAM J. Numer. Anal. 10, 1973): the
 * recursion. A subgraph G is split by a vertex separator S into parts A and
 * B with no edge between them; A is numbered first, then B, then S last:
 *
 * ```
 *   [ A  .  x ]      eliminating A and B creates fill only inside A, B
 *   [ .  B  x ]      and S, never between A and B
 *   [ x  x  S ]
 * ```
 *
 * How S is found is ordering-nd-split.ts (bisection by breadth-first level
 * structures and bisector keys, thinned and refined). Each part is copied out
 * as a subgraph of its own with local numbering (ordering-subgraph.ts), so the
 * deeper levels read small contiguous arrays, and a part is a job another
 * thread can order (ordering-executor.ts): the permutation does not depend on
 * which thread orders which part. Subgraphs below `leafSize` vertices are
 * ordered by approximate minimum degree on their own subgraph (a hybrid
 * common in practice), or keep their order.
 */
import type { AdjacencyGraph } from './graph.js';
import { approximateMinimumDegree } from './ordering-amd.js';
import { extractPart, globalId, plainAlloc, rootSubgraph } from './ordering-subgraph.js';
import type { Int32Alloc, Subgraph } from './ordering-subgraph.js';
import { ndWorkspace, splitRange } from './ordering-nd-split.js';
import type { NdSplit, NdWorkspace } from './ordering-nd-split.js';

export { ndWorkspace } from './ordering-nd-split.js';
export type { NdSplit, NdWorkspace } from './ordering-nd-split.js';

/** Options of {@link nestedDissection}. */
export interface NestedDissectionOptions {
  /** Subgraphs with at most this many vertices are not split further (default 512). */
  leafSize?: number;
  /** How leaves are ordered: approximate minimum degree on the leaf's subgraph (default) or BFS order. */
  leafOrder?: 'amd' | 'bfs';
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
