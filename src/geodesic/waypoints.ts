/**
 * Shortest paths through waypoints: each consecutive pair of stops is joined
 * by an exact shortest path (a two-point query that stops as soon as the
 * next stop is settled), and the legs are concatenated.
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import type { SurfacePoint } from '../query/surface-point.js';
import { checkSurfacePoint, formatSurfacePoint } from '../query/surface-point.js';
import { usageError } from '../errors.js';
import { checkEdgeLengths } from './solver.js';
import type { SurfacePath } from './field.js';
import { exactDistance } from './exact/index.js';
import { prepareExactGeometry } from './exact/geometry.js';
import { commonFaces, layoutFace, pointInLayout } from './exact/layout.js';

/** A path through waypoints with per-point bookkeeping. */
export interface WaypointPath {
  /** The whole path (legs joined; the shared stop appears once); empty when some leg is unreachable. */
  path: SurfacePath;
  /** Total length, mesh units (Infinity when some leg has no path). */
  length: number;
  /** Each leg and its length. */
  legs: { path: SurfacePath; length: number }[];
  /** Cumulative intrinsic length at each point of `path`. */
  cumulative: Float64Array;
  /** A face containing the segment from each point to the next (the last point: from the previous). */
  faces: Int32Array;
}

/**
 * Exact shortest path visiting `stops` in order. The metric is checked
 * (`checkEdgeLengths`) and every stop is validated
 * (`USAGE` error naming it, see `checkSurfacePoint`). When some leg has no
 * path (its stops lie on different components) the result is "unreachable":
 * `length` is Infinity, `path` is empty (legs are never joined across a
 * gap), and `legs` tells which leg failed (its length is Infinity).
 * `opts.memoryBudget` bounds each leg's exact run (bytes; see ExactOptions).
 *
 * A stop may be given as several points that are one point of the surface
 * as given (the copies of a vertex split while building, see
 * `PointResolver.copies`): each leg leaves from all of them and arrives at
 * the one it reaches first. Where the path passes from one copy to another
 * it lists both (same position, no face between them: `faces` is −1 there
 * and `cumulative` does not grow).
 */
export function shortestPathThrough(mesh: IntrinsicMesh, stops0: (SurfacePoint | SurfacePoint[])[], opts: { memoryBudget?: number } = {}): WaypointPath {
  checkEdgeLengths(mesh, 'path');
  const stops = stops0.map((p, i) => (Array.isArray(p) ? p : [p]).map((q) => checkSurfacePoint(q, mesh.topology, `stop ${i}`)));
  if (stops.some((s) => s.length === 0)) throw usageError('a stop needs at least one point', 'path');
  const legs: { path: SurfacePath; length: number }[] = [];
  const points: SurfacePoint[] = [];
  let length = 0;
  const geometry = stops.length > 1 ? prepareExactGeometry(mesh) : undefined;
  for (let i = 0; i + 1 < stops.length; i++) {
    const as = stops[i]!, bs = stops[i + 1]!;
    const r = exactDistance(mesh, { points: as, curves: [] }, { targets: bs, geometry, ...(opts.memoryBudget !== undefined ? { memoryBudget: opts.memoryBudget } : {}) });
    // the nearest spelling of the next stop (copies of a split vertex: the one this leg reaches first)
    let b = bs[0]!, db = r.distanceAt(b);
    for (const q of bs.slice(1)) { const d = r.distanceAt(q); if (d < db) { db = d; b = q; } }
    const p: SurfacePath = Number.isFinite(db) ? r.pathTo(b) : { points: [], length: Infinity };
    legs.push({ path: p, length: p.length });
    length += p.length;
    if (!Number.isFinite(p.length)) continue;
    // legs share their stop; a leg may leave from another copy of it (same position), kept then
    const last = points[points.length - 1];
    points.push(...(last && p.points[0] && formatSurfacePoint(last) === formatSurfacePoint(p.points[0]) ? p.points.slice(1) : p.points));
  }
  if (!Number.isFinite(length)) {
    return { path: { points: [], length: Infinity }, length: Infinity, legs, cumulative: new Float64Array(0), faces: new Int32Array(0) };
  }
  const t = mesh.topology;
  const n = points.length;
  const cumulative = new Float64Array(n);
  const faces = new Int32Array(n).fill(-1);
  const lay = new Float64Array(6), pa = new Float64Array(2), pb = new Float64Array(2);
  for (let i = 1; i < n; i++) {
    const fs = commonFaces(t, points[i - 1]!, points[i]!);
    let best = Infinity, bestFace = -1;
    for (const f of fs) {
      layoutFace(mesh, f, lay);
      pointInLayout(t, f, points[i - 1]!, lay, pa);
      pointInLayout(t, f, points[i]!, lay, pb);
      const d = Math.hypot(pa[0]! - pb[0]!, pa[1]! - pb[1]!);
      if (d < best) { best = d; bestFace = f; }
    }
    cumulative[i] = cumulative[i - 1]! + (Number.isFinite(best) ? best : 0);
    faces[i - 1] = bestFace;
  }
  if (n > 1) faces[n - 1] = faces[n - 2]!;
  else if (n === 1) faces[0] = commonFaces(t, points[0]!, points[0]!)[0] ?? -1;
  return { path: { points, length }, length, legs, cumulative, faces };
}
