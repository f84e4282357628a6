/**
 * Surface points in the faces that hold them: which faces those are, a
 * point's barycentric coordinates in each, its position in a face laid out
 * from edge lengths (layout.ts), and the straight distance between two points
 * over the faces they share. The one home of these for every solver, the path
 * code and the CLI.
 *
 * A face point is in its own face; an edge point is in the one or two faces
 * of its edge, with `t` measured from the tail of `edgeHalfedge[edge]`; a
 * vertex is in every face of its fan. Barycentric coordinates follow the
 * face's corners `tri[3f], tri[3f+1], tri[3f+2]`.
 */
import type { IntrinsicMesh } from './intrinsic.js';
import type { Topology } from '../mesh/topology.js';
import { forEachOutgoing, faceOf } from '../mesh/topology.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { layoutFace } from './layout.js';

/** Barycentric coordinates of p in face f, written to out (false, with zeros, when p is not on f's closure). */
export function baryInFace(t: Topology, f: number, p: SurfacePoint, out: number[] | Float64Array): boolean {
  out[0] = out[1] = out[2] = 0;
  if (p.kind === 'face') {
    if (p.face !== f) return false;
    out[0] = p.bary[0]; out[1] = p.bary[1]; out[2] = p.bary[2];
    return true;
  }
  for (let k = 0; k < 3; k++) {
    const h = 3 * f + k;
    if (p.kind === 'vertex') {
      if (t.tri[h] === p.vertex) { out[k] = 1; return true; }
    } else if (t.edgeOf[h] === p.edge) {
      const k1 = (k + 1) % 3;
      const fwd = t.edgeHalfedge[p.edge] === h; // edgeHalfedge runs corner k → k+1
      out[fwd ? k : k1] = 1 - p.t;
      out[fwd ? k1 : k] = p.t;
      return true;
    }
  }
  return false;
}

/**
 * Position of surface point p in the layout `lay` of face f (from
 * {@link layoutFace}); writes out[0], out[1]. Returns false when p does not
 * lie on f's closure.
 */
export function pointInLayout(t: Topology, f: number, p: SurfacePoint, lay: Float64Array, out: Float64Array): boolean {
  const b = [0, 0, 0];
  if (!baryInFace(t, f, p, b)) return false;
  out[0] = b[0]! * lay[0]! + b[1]! * lay[2]! + b[2]! * lay[4]!;
  out[1] = b[0]! * lay[1]! + b[1]! * lay[3]! + b[2]! * lay[5]!;
  return true;
}

/** Faces whose closure holds p: the fan of a vertex, the one or two faces of an edge, or the face. */
export function facesOfPoint(t: Topology, p: SurfacePoint): number[] {
  if (p.kind === 'face') return [p.face];
  if (p.kind === 'edge') {
    const h = t.edgeHalfedge[p.edge]!;
    const o = t.twin[h]!;
    return o >= 0 ? [faceOf(h), faceOf(o)] : [faceOf(h)];
  }
  const fs: number[] = [];
  forEachOutgoing(t, p.vertex, (h) => fs.push(faceOf(h)));
  return fs;
}

/** Faces whose closure holds both a and b (empty when they share none). */
export function commonFaces(t: Topology, a: SurfacePoint, b: SurfacePoint): number[] {
  const fb = facesOfPoint(t, b);
  return facesOfPoint(t, a).filter((f) => fb.includes(f));
}

/** Result of {@link inFaceDistance}. */
export interface InFaceDistance {
  /** The shortest straight distance between the points inside a face they share; Infinity when they share none. */
  distance: number;
  /** The face it was measured in (the first of equals), −1 when none. */
  face: number;
}

/**
 * Straight distance between surface points a and b over the faces they
 * share: each shared face is laid out from its lengths and the points placed
 * in it; the shortest wins (two faces give two values when a and b lie on
 * one edge's faces, e.g. both on the edge, and the layouts agree up to
 * rounding). Infinity and face −1 when they share no face.
 */
export function inFaceDistance(mesh: IntrinsicMesh, a: SurfacePoint, b: SurfacePoint): InFaceDistance {
  const t = mesh.topology;
  const lay = new Float64Array(6), pa = new Float64Array(2), pb = new Float64Array(2);
  let distance = Infinity, face = -1;
  for (const f of commonFaces(t, a, b)) {
    layoutFace(mesh, f, lay);
    pointInLayout(t, f, a, lay, pa);
    pointInLayout(t, f, b, lay, pb);
    const d = Math.hypot(pa[0]! - pb[0]!, pa[1]! - pb[1]!);
    if (d < distance) { distance = d; face = f; }
  }
  return { distance, face };
}

/**
 * Intrinsic length of a chain of surface points: the sum of
 * {@link inFaceDistance} over consecutive pairs. Infinity when a pair shares
 * no face (the chain is not a surface path).
 */
export function chainLength(mesh: IntrinsicMesh, points: readonly SurfacePoint[]): number {
  let sum = 0;
  for (let i = 1; i < points.length; i++) sum += inFaceDistance(mesh, points[i - 1]!, points[i]!).distance;
  return sum;
}
