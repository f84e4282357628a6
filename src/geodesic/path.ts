/**
 * Surface paths: their 3D polyline and their intrinsic length.
 */
import type { Topology } from '../mesh/topology.js';
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import type { SurfacePath } from './shared/field.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { surfacePointPosition } from '../mesh/surface-point.js';
import { commonFaces, chainLength } from '../metric/face-points.js';

/** The 3D polyline of a path: x, y, z per point, from positions per topology vertex. */
export function pathPolyline(path: SurfacePath, t: Topology, positions: Float64Array): Float64Array {
  const out = new Float64Array(3 * path.points.length);
  const p = new Float64Array(3);
  path.points.forEach((pt, i) => {
    surfacePointPosition(pt, t, positions, p);
    out.set(p, 3 * i);
  });
  return out;
}

/**
 * Intrinsic length of a chain of surface points: the sum of straight
 * in-face distances between consecutive points, each measured in a planar
 * layout of a face they share (the shortest if they share two). Returns
 * Infinity when a consecutive pair shares no face (not a surface path).
 * (metric/face-points.ts's `chainLength`, the one home.)
 */
export function pathLength(mesh: IntrinsicMesh, points: SurfacePoint[]): number {
  return chainLength(mesh, points);
}

/** True when every consecutive pair of points shares a face (the path stays on the surface). */
export function isSurfacePath(t: Topology, points: SurfacePoint[]): boolean {
  for (let i = 1; i < points.length; i++) if (commonFaces(t, points[i - 1]!, points[i]!).length === 0) return false;
  return true;
}
