/**
 * The adjacency graph of a symmetric sparse matrix: vertex j is joined to i
 * when A(i, j) ≠ 0, i ≠ j. Stored as compressed rows (xadj, adj), both
 * directions, no self-loops. Orderings work on this graph only.
 */
import type { CscMatrix } from './csc.js';

/** Symmetric adjacency in compressed form: neighbours of v are adj[xadj[v] .. xadj[v+1]-1]. */
export interface AdjacencyGraph {
  /** Number of vertices. */
  readonly n: number;
  /** Offsets, length n + 1. */
  readonly xadj: Int32Array;
  /** Neighbour lists. */
  readonly adj: Int32Array;
}

/** The graph of a symmetric matrix given by its lower triangle (entries i > j give edges). */
export function adjacencyFromLower(L: CscMatrix): AdjacencyGraph {
  const { n, colPtr, rowIdx } = L;
  const xadj = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]!; p < colPtr[j + 1]!; p++) {
      const i = rowIdx[p]!;
      if (i === j) continue;
      xadj[i + 1]!++;
      xadj[j + 1]!++;
    }
  }
  for (let v = 0; v < n; v++) xadj[v + 1]! += xadj[v]!;
  const adj = new Int32Array(xadj[n]!);
  const fill = xadj.slice(0, n);
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]!; p < colPtr[j + 1]!; p++) {
      const i = rowIdx[p]!;
      if (i === j) continue;
      adj[fill[i]!++] = j;
      adj[fill[j]!++] = i;
    }
  }
  return { n, xadj, adj };
}
