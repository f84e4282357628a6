/**
 * Source sets shared by every distance method.
 *
 * A source set is any mix of surface points and curves. A curve is a list of
 * surface points in which each consecutive pair lies on a common face (so the
 * straight segment between them lies in that face, or along an edge); a
 * boundary loop is such a curve through boundary vertices.
 */
import type { SurfacePoint } from '../../mesh/surface-point.js';
import type { Topology } from '../../mesh/topology.js';
import { boundaryLoops } from '../../mesh/boundary.js';

/** Points and curves from which distance is measured. */
export interface SourceSet {
  /** Point sources. */
  points: SurfacePoint[];
  /** Curve sources; each consecutive pair of points shares a face. */
  curves: SurfacePoint[][];
}

/** A source set of point sources only. */
export function pointSources(points: SurfacePoint[]): SourceSet {
  return { points, curves: [] };
}

/** Every boundary loop of `t` as a closed curve of vertices (first vertex repeated at the end). */
export function boundaryCurves(t: Topology): SurfacePoint[][] {
  return boundaryLoops(t).map((loop) => {
    const pts: SurfacePoint[] = [];
    for (let i = 0; i < loop.length; i++) pts.push({ kind: 'vertex', vertex: t.tri[loop[i]!]! });
    if (pts.length) pts.push(pts[0]!);
    return pts;
  });
}
