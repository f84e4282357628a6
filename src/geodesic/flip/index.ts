/**
 * Exact geodesic paths by edge flips (Sharp & Crane, "You Can Find Geodesic
 * Paths in Triangle Meshes by Just Flipping Edges", ACM TOG 39(6), 2020).
 *
 * Design:
 * - triangulation.ts: a copy of the mesh's connectivity and lengths that can
 *   flip edges, with a direction per half-edge (signposts, Sharp, Soliman &
 *   Crane 2019) so every intrinsic edge can be found on the input surface;
 * - insert.ts: an end on an edge or in a face becomes a vertex first;
 * - start-path.ts: the edge-graph shortest path between the two ends
 *   (Dijkstra with a target stop);
 * - flipout.ts: FlipOut until every bend is at least π on both sides;
 * - trace.ts: the final intrinsic edges traced across the input faces;
 * - verify.ts: the check of a flip path, used by waypoints.ts: proven when
 *   as long as the straight 3D chord (a lower bound on the distance); else
 *   proven (or corrected) by window propagation in the ellipsoid that holds
 *   every shorter path, when that region is small enough; else a certified
 *   bound on its excess over the shortest, L/chord − 1.
 *
 * Only the lengths are read (the metric is the interface); coordinates come
 * in later, when the caller turns surface points into a polyline.
 *
 * Which geodesic: FlipOut shortens within the homotopy class of the start
 * path (relative to the vertices), so the result is the shortest path in the
 * class of the edge-graph shortest route, which need not be the shortest
 * path: round a hole, a cube corner or a bump on rough terrain another class
 * can be shorter (measured on a noisy 200k-face terrain: up to 3.6e-4
 * relative; 0.14% corner to corner on a 1M-face one). waypoints.ts proves
 * each flip leg, or replaces it, with verify.ts when the region to search is
 * small enough, and otherwise says so with the certified bound.
 *
 * Why not a tighter certified bound at terrain scale (measured, issue 9): a
 * lower bound d(a, b) ≥ ψ(b) − ψ(a) from any function ψ that is linear on
 * each face with slope ≤ 1 would do, but ψ must then follow the distance from
 * a closely over the whole region a shorter path could use. The linear
 * interpolant of a fast-marching field (Kimmel & Sethian 1998; within 0.05% of
 * the distance at b on the 1M-face terrain) has slopes up to 1.084 near the
 * cone points the front bends round, and lowering the values to slope 1 in
 * marching order locks rows of edges at slope 1 and collapses ψ towards the
 * L∞ distance (ψ(b) 27% low). Both cost more than the flips besides.
 */
import type { IntrinsicMesh } from '../../metric/intrinsic.js';
import type { SurfacePath } from '../shared/field.js';
import type { SurfacePoint } from '../../mesh/surface-point.js';
import { FlipTriangulation } from './triangulation.js';
import { shortestEdgePath } from './start-path.js';
import { shortenPath } from './flipout.js';
import { tracePath } from './trace.js';
import { insertPoint } from './insert.js';
import { commonFaces } from '../../metric/face-points.js';

export { BEND_TOLERANCE } from './flipout.js';

/** Result of {@link flipGeodesicPath}. */
export interface FlipPathResult {
  /**
   * `ok`: a geodesic was found and traced; `unreachable`: the vertices lie on
   * different components; `failed`: FlipOut did not converge or a traced
   * edge did not end where it should (rounding on a degenerate mesh); the
   * caller should use another method.
   */
  status: 'ok' | 'unreachable' | 'failed';
  /** The path on the input surface (empty unless `ok`). */
  path: SurfacePath;
  /** Length of the edge-graph start path, mesh units. */
  startLength: number;
  /** Edge flips made. */
  flips: number;
  /** FlipOut sweeps over the path. */
  sweeps: number;
}

/**
 * A geodesic path (locally shortest, every bend ≥ π on both sides up to
 * {@link BEND_TOLERANCE}) from `from` to `to` (vertex ids, or canonical
 * surface points: edge and face points are inserted as vertices first, see
 * insert.ts), shortened by intrinsic edge flips from the edge-graph shortest
 * path. The path's length is the sum of its intrinsic edge lengths; its
 * points are the two ends, the input-edge crossings and the input vertices it
 * passes through. Two points off the vertices that share a face are not
 * handled (status `failed`: the caller's other method is quick there).
 * The mesh is not modified.
 */
export function flipGeodesicPath(mesh: IntrinsicMesh, from: number | SurfacePoint, to: number | SurfacePoint): FlipPathResult {
  const none = (status: FlipPathResult['status'], startLength = Infinity): FlipPathResult => ({
    status, path: { points: [], length: Infinity }, startLength, flips: 0, sweeps: 0,
  });
  const A: SurfacePoint = typeof from === 'number' ? { kind: 'vertex', vertex: from } : from;
  const B: SurfacePoint = typeof to === 'number' ? { kind: 'vertex', vertex: to } : to;
  if (A.kind === 'vertex' && B.kind === 'vertex' && A.vertex === B.vertex) {
    return { status: 'ok', path: { points: [A], length: 0 }, startLength: 0, flips: 0, sweeps: 0 };
  }
  const inserts = (A.kind === 'vertex' ? 0 : 1) + (B.kind === 'vertex' ? 0 : 1);
  if (inserts === 2 && commonFaces(mesh.topology, A, B).length > 0) return none('failed');
  const tri = new FlipTriangulation(mesh, inserts);
  const a = insertPoint(tri, A), b = insertPoint(tri, B);
  const start = shortestEdgePath(inserts ? tri.view() : mesh, a, b);
  if (!start) return none('unreachable');
  const r = shortenPath(tri, start);
  if (!r.converged) return none('failed', start.length);
  const points: SurfacePoint[] = [];
  if (!tracePath(tri, r.vertices, r.edges, points)) return none('failed', start.length);
  return { status: 'ok', path: { points, length: r.length }, startLength: start.length, flips: tri.flips, sweeps: r.sweeps };
}
