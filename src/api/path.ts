/**
 * The shortest path on a surface through waypoints: the facade over
 * `geodesic/waypoints.ts` (window propagation or edge flips per leg) and
 * `geodesic/cover.ts` (a non-orientable surface is traced on its double
 * cover), with the path's 3D polyline.
 */
import type { SurfacePoint } from '../mesh/surface-point.js';
import { shortestPathThrough, type PathMethod, type WaypointPath } from '../geodesic/waypoints.js';
import { coverPathThrough } from '../geodesic/cover.js';
import { pathPolyline } from '../geodesic/path.js';
import { coverOf, groupsOf, intrinsicOf, type SolvableSurface } from './parts.js';
import { attachedMetric } from '../metric/user/surface-metric.js';

/** Options of {@link shortestPath}. */
export interface PathOptions {
  /** Memory budget of each exact run, bytes (default 2 GiB): a run over it is a `LIMIT` error. */
  memoryBudget?: number;
  /**
   * `windows` (window propagation: proven shortest), `flip` (edge flips from the edge-graph
   * route: a geodesic, much faster on large meshes) or `auto` (default: flips on large
   * meshes, each leg then proven shortest or replaced when the region a shorter path could use
   * has at most `verifyFaces` faces, else returned with its certified `excessBound`). A
   * non-orientable surface always uses windows.
   */
  method?: PathMethod;
  /** Largest region (faces) on which a flip leg is proven shortest; 0 skips the proof (see `WaypointOptions.verifyFaces`). */
  verifyFaces?: number;
}

/** A path on the surface: the waypoint path and its points in 3D. */
export interface SurfaceRoute extends WaypointPath {
  /** x, y, z of each point of `path`, flat. */
  polyline: Float64Array;
}

/**
 * The shortest path on `s` through `stops` in order (a stop given as several
 * points, e.g. every copy of a split vertex, is reached at the nearest).
 * Its `length` is Infinity, and `path` empty, when a leg has no path (points
 * on different components).
 */
export function shortestPath(s: SolvableSurface, stops: (SurfacePoint | SurfacePoint[])[], opts: PathOptions = {}): SurfaceRoute {
  const cover = coverOf(s);
  const memoryBudget = opts.memoryBudget !== undefined ? { memoryBudget: opts.memoryBudget } : {};
  const route = cover
    ? coverPathThrough(cover, stops, memoryBudget)
    : shortestPathThrough(intrinsicOf(s), stops, {
        ...memoryBudget,
        pinches: groupsOf(s),
        method: opts.method ?? 'auto',
        // the flip legs' proof (verify.ts) holds for lengths of the positions only: not under a user metric
        ...(attachedMetric(s) ? {} : { positions: s.positions }),
        ...(opts.verifyFaces !== undefined ? { verifyFaces: opts.verifyFaces } : {}),
      });
  return { ...route, polyline: pathPolyline(route.path, s.topology, s.positions) };
}
