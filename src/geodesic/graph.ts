/**
 * Edge-graph distance: Dijkstra over the mesh edges, weighted by edge length.
 *
 * The baseline every other solver is measured against, and an upper bound
 * on the exact polyhedral distance: every value is the length of a real path
 * on the surface (seed segments inside one face, then whole edges).
 *
 * Sources off the vertices seed the corners of their faces with the straight
 * in-face distance, computed in a planar layout of the face from its lengths:
 * a point on an edge seeds the corners of both adjacent faces, a point in a
 * face its three corners, and a curve segment the corners of its face(s)
 * with the point-to-segment distance.
 *
 * At a point off the vertices ({@link graphValueAt}) the value is the best
 * corner plus the straight segment inside a face holding the point (or the
 * straight segment from a source on that face), again the length of a real
 * path. Blending the corner values linearly would not be: where two routes
 * tie it undershoots the true distance.
 *
 * The queue and the main loop live in shared/edge-dijkstra.ts (the flip
 * method's start path runs the same loop).
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import type { DistanceField } from './shared/field.js';
import type { SourceSet } from './shared/sources.js';
import { IndexedMinHeap, runEdgeDijkstra } from './shared/edge-dijkstra.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { checkSurfacePoint } from '../mesh/surface-point.js';
import { usageError } from '../errors.js';
import { layoutFace, pointSegmentDistance } from '../metric/layout.js';
import { pointInLayout, facesOfPoint, commonFaces } from '../metric/face-points.js';

/** Options of {@link graphDistance}. */
export interface GraphOptions {
  /** Stop expanding beyond this distance (mesh units); farther vertices stay Infinity. */
  maxDistance?: number;
}

/**
 * Seeds `dist` with the straight in-face distance from every source to the
 * corners of the faces holding it (minimum over sources). Shared with the
 * exact solver, which uses the same values as its initial upper bounds.
 */
export function seedSourceDistances(m: IntrinsicMesh, sources: SourceSet, dist: Float64Array): void {
  const t = m.topology;
  const lay = new Float64Array(6), p = new Float64Array(2), q = new Float64Array(2);
  const relax = (v: number, d: number) => {
    if (d < dist[v]!) dist[v] = d;
  };
  const seedPoint = (s: SurfacePoint) => {
    if (s.kind === 'vertex') return relax(s.vertex, 0);
    for (const f of facesOfPoint(t, s)) {
      layoutFace(m, f, lay);
      pointInLayout(t, f, s, lay, p);
      for (let k = 0; k < 3; k++) relax(t.tri[3 * f + k]!, Math.hypot(lay[2 * k]! - p[0]!, lay[2 * k + 1]! - p[1]!));
    }
  };
  for (const s of sources.points) seedPoint(checkSurfacePoint(s, t, 'source'));
  sources.curves.forEach((curve, ci) => {
    for (let i = 0; i < curve.length; i++) {
      const a = checkSurfacePoint(curve[i]!, t, `curve ${ci}`);
      seedPoint(a);
      if (i === 0) continue;
      const b = curve[i - 1]!;
      const fs = commonFaces(t, a, b);
      if (fs.length === 0) throw usageError(`points ${i - 1} and ${i} share no face`, `curve ${ci}`);
      for (const f of fs) {
        layoutFace(m, f, lay);
        pointInLayout(t, f, a, lay, p);
        pointInLayout(t, f, b, lay, q);
        for (let k = 0; k < 3; k++) {
          relax(t.tri[3 * f + k]!, pointSegmentDistance(lay[2 * k]!, lay[2 * k + 1]!, p[0]!, p[1]!, q[0]!, q[1]!));
        }
      }
    }
  });
}

/**
 * Graph distance at a surface point: the minimum over the faces whose
 * closure holds p of (corner value + straight in-face distance from that
 * corner to p), and of the straight in-face distance from any point source
 * or curve segment lying on such a face. Each candidate is the length of a
 * path on the surface, so the value stays an upper bound on the geodesic
 * distance. `dist` is the field from {@link graphDistance} for `sources`.
 */
export function graphValueAt(m: IntrinsicMesh, sources: SourceSet, dist: Float64Array, p0: SurfacePoint): number {
  const t = m.topology;
  const p = checkSurfacePoint(p0, t, 'point');
  if (p.kind === 'vertex') return dist[p.vertex]!;
  const lay = new Float64Array(6), q = new Float64Array(2), a = new Float64Array(2), b = new Float64Array(2);
  let best = Infinity;
  const faces = facesOfPoint(t, p);
  for (const f of faces) {
    layoutFace(m, f, lay);
    pointInLayout(t, f, p, lay, q);
    for (let k = 0; k < 3; k++) {
      const d = dist[t.tri[3 * f + k]!]! + Math.hypot(lay[2 * k]! - q[0]!, lay[2 * k + 1]! - q[1]!);
      if (d < best) best = d;
    }
    for (const s of sources.points) {
      if (pointInLayout(t, f, checkSurfacePoint(s, t, 'source'), lay, a)) best = Math.min(best, Math.hypot(a[0]! - q[0]!, a[1]! - q[1]!));
    }
    for (const c of sources.curves) {
      for (let i = 1; i < c.length; i++) {
        const ca = checkSurfacePoint(c[i - 1]!, t, 'curve'), cb = checkSurfacePoint(c[i]!, t, 'curve');
        if (pointInLayout(t, f, ca, lay, a) && pointInLayout(t, f, cb, lay, b)) {
          best = Math.min(best, pointSegmentDistance(q[0]!, q[1]!, a[0]!, a[1]!, b[0]!, b[1]!));
        }
      }
    }
  }
  return best;
}

/**
 * Dijkstra over the edge graph from a source set (method `'graph'`).
 * Unreachable vertices get Infinity; with `maxDistance`, vertices farther
 * than it are left at Infinity too.
 */
export function graphDistance(mesh: IntrinsicMesh, sources: SourceSet, opts: GraphOptions = {}): DistanceField {
  const t = mesh.topology;
  const maxD = opts.maxDistance ?? Infinity;
  const dist = new Float64Array(t.nv).fill(Infinity);
  seedSourceDistances(mesh, sources, dist);
  const heap = new IndexedMinHeap(t.nv, dist);
  for (let v = 0; v < t.nv; v++) if (dist[v]! <= maxD) heap.push(v);
  runEdgeDijkstra(mesh, dist, heap, new Uint8Array(t.nv), maxD);
  for (let v = 0; v < t.nv; v++) if (dist[v]! > maxD) dist[v] = Infinity;
  return { method: 'graph', distance: dist, sources: [...sources.points, ...sources.curves.flat()] };
}
