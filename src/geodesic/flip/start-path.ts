/**
 * The starting path of the flip method: a shortest path along mesh edges
 * from one vertex to another (Dijkstra, Numer. Math. 1, 1959), stopping as
 * soon as the target is settled. Sharp & Crane 2020 (§5, "initial path")
 * start FlipOut from such a path; its homotopy class is the one of the
 * edge-graph shortest route, and FlipOut returns the shortest geodesic in it.
 *
 * The queue is the project's typed-array binary heap with decrease-key
 * ({@link IndexedMinHeap}); nothing is allocated per step.
 */
import type { IntrinsicMesh } from '../../metric/intrinsic.js';
import { next } from '../../mesh/topology.js';
import { IndexedMinHeap, runEdgeDijkstra } from '../shared/edge-dijkstra.js';

/** An edge path: vertices in order and the edge id between each consecutive pair. */
export interface EdgePath {
  /** Vertex ids, `from` first, `to` last. */
  vertices: number[];
  /** Edge ids, one fewer than vertices. */
  edges: number[];
  /** Sum of the edge lengths, mesh units. */
  length: number;
}

/**
 * Shortest edge path from vertex `from` to vertex `to`, or null when `to`
 * is not reachable (another component).
 */
export function shortestEdgePath(mesh: IntrinsicMesh, from: number, to: number): EdgePath | null {
  const t = mesh.topology;
  const { tri } = t;
  const dist = new Float64Array(t.nv).fill(Infinity);
  const via = new Int32Array(t.nv).fill(-1); // edge id that settled each vertex
  const done = new Uint8Array(t.nv);
  const heap = new IndexedMinHeap(t.nv, dist);
  dist[from] = 0;
  heap.push(from);
  runEdgeDijkstra(mesh, dist, heap, done, Infinity, to, via);
  if (!Number.isFinite(dist[to]!)) return null;
  const vertices = [to], edges: number[] = [];
  for (let v = to; v !== from;) {
    const e = via[v]!;
    const h = t.edgeHalfedge[e]!;
    const u = tri[h] === v ? tri[next(h)]! : tri[h]!;
    edges.push(e);
    vertices.push(u);
    v = u;
  }
  vertices.reverse();
  edges.reverse();
  return { vertices, edges, length: dist[to]! };
}
