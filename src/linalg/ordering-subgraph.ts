/**
 * Induced subgraphs for nested dissection (ordering-nd.ts), each numbered
 * locally 0..n−1 in its own compressed adjacency.
 *
 * A part left by a separator is copied out of its parent once, so the deeper
 * levels read small contiguous arrays (cache-resident from a few ten thousand
 * vertices down) instead of scattered entries of the whole graph behind a
 * membership test, and a part is a self-contained job that another thread can
 * order (ordering-executor.ts). The copy keeps every order the dissection
 * depends on: local ids follow the order in which the part lists its
 * vertices, and each adjacency list keeps the relative order of the whole
 * graph's list, so a part ordered from its copy gets the same permutation
 * as the same part ordered in place.
 */
import type { AdjacencyGraph } from './graph.js';

/** An induced subgraph with local numbering. */
export interface Subgraph {
  /** Number of vertices. */
  readonly n: number;
  /** Offsets into `adj`, length n + 1. */
  readonly xadj: Int32Array;
  /** Local neighbour ids, each list in the whole graph's order. */
  readonly adj: Int32Array;
  /** Degree of each vertex in the whole graph (the peripheral search's tie-break); null: the degree in xadj. */
  readonly deg: Int32Array | null;
  /** Whole-graph id of each vertex; null: the identity (the whole graph itself). */
  readonly gid: Int32Array | null;
}

/** Allocates the typed arrays of a new subgraph: plain memory, or memory another thread can read. */
export type Int32Alloc = (length: number) => Int32Array;

/** Plain Int32Array allocation. */
export const plainAlloc: Int32Alloc = (length) => new Int32Array(length);

/** The whole graph as the root subgraph (no copy). */
export function rootSubgraph(g: AdjacencyGraph): Subgraph {
  return { n: g.n, xadj: g.xadj, adj: g.adj, deg: null, gid: null };
}

/** Whole-graph id of local vertex x. */
export function globalId(s: Subgraph, x: number): number {
  return s.gid === null ? x : s.gid[x]!;
}

/** Scratch for {@link extractPart}, sized for a parent of n vertices and nnz adjacency entries. */
export interface ExtractScratch {
  /** New local id of each parent vertex in the part being extracted. */
  readonly newId: Int32Array;
  /** Adjacency staging buffer (copied out at the exact length). */
  readonly adjBuf: Int32Array;
}

/** Allocates {@link ExtractScratch} for parents of up to n vertices and nnz adjacency entries. */
export function extractScratch(n: number, nnz: number): ExtractScratch {
  return { newId: new Int32Array(n), adjBuf: new Int32Array(nnz) };
}

/**
 * The part of `s` made of the vertices list[from..to) with mark[x] === tag
 * (every listed vertex must carry the tag, and no other vertex may): local
 * ids in list order, neighbours with the same tag kept in their order.
 */
export function extractPart(
  s: Subgraph, list: Int32Array, from: number, to: number, mark: Uint8Array, tag: number, sc: ExtractScratch, alloc: Int32Alloc,
): Subgraph {
  const { xadj, adj } = s;
  const { newId, adjBuf } = sc;
  const m = to - from;
  for (let k = 0; k < m; k++) newId[list[from + k]!] = k;
  const cx = alloc(m + 1), gid = alloc(m), deg = alloc(m);
  let q = 0;
  for (let k = 0; k < m; k++) {
    const x = list[from + k]!;
    const p0 = xadj[x]!, p1 = xadj[x + 1]!;
    for (let p = p0; p < p1; p++) {
      const y = adj[p]!;
      if (mark[y] === tag) adjBuf[q++] = newId[y]!;
    }
    cx[k + 1] = q;
    gid[k] = s.gid === null ? x : s.gid[x]!;
    deg[k] = s.deg === null ? p1 - p0 : s.deg[x]!;
  }
  const cadj = alloc(q);
  cadj.set(adjBuf.subarray(0, q));
  return { n: m, xadj: cx, adj: cadj, deg, gid };
}
