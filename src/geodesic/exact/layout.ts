/**
 * Planar layouts of single faces from edge lengths, and surface points in
 * those layouts. Shared by the edge-graph baseline and the exact solver.
 *
 * A face laid out along half-edge h (tail A, tip B, third corner C):
 *
 * ```
 *                C = (cx, cy), cy ≥ 0
 *               / \
 *     prev(h)  /   \  next(h)
 *             /     \
 *    A=(0,0) /_______\ B=(L,0)
 *                h
 * ```
 *
 * cx = (L² + |CA|² − |BC|²) / (2L), cy = 2·Area / L with Kahan's area, so
 * needles keep their small height. A zero-length h puts C at (0, |CA|).
 */
import type { IntrinsicMesh } from '../../metric/intrinsic.js';
import type { Topology } from '../../mesh/topology.js';
import { next, prev, forEachOutgoing, faceOf } from '../../mesh/topology.js';
import { triangleArea } from '../../metric/triangle.js';
import type { SurfacePoint } from '../../query/surface-point.js';

/**
 * Third corner of the face of half-edge h with h on the +x axis from the
 * origin; writes (cx, cy) to out[o], out[o+1] and returns |h|.
 */
export function layoutAlong(m: IntrinsicMesh, h: number, out: Float64Array, o = 0): number {
  const { edgeOf } = m.topology;
  const L = m.edgeLength;
  const l = L[edgeOf[h]!]!, ln = L[edgeOf[next(h)]!]!, lp = L[edgeOf[prev(h)]!]!;
  if (l > 0) {
    out[o] = (l * l + lp * lp - ln * ln) / (2 * l);
    out[o + 1] = (2 * triangleArea(l, ln, lp)) / l;
  } else {
    out[o] = 0;
    out[o + 1] = lp;
  }
  return l;
}

/**
 * Lays out face f: corner k (vertex tri[3f+k]) at (out[2k], out[2k+1]);
 * corner 0 at the origin, corner 1 on +x, corner 2 above the x axis.
 */
export function layoutFace(m: IntrinsicMesh, f: number, out: Float64Array): Float64Array {
  const l = layoutAlong(m, 3 * f, out, 4);
  out[0] = 0; out[1] = 0; out[2] = l; out[3] = 0;
  return out;
}

/**
 * Position of surface point p in the layout `lay` of face f (from
 * {@link layoutFace}); writes out[0], out[1]. Returns false when p does not
 * lie on f's closure.
 */
export function pointInLayout(t: Topology, f: number, p: SurfacePoint, lay: Float64Array, out: Float64Array): boolean {
  if (p.kind === 'face') {
    if (p.face !== f) return false;
    const [b0, b1, b2] = p.bary;
    out[0] = b0 * lay[0]! + b1 * lay[2]! + b2 * lay[4]!;
    out[1] = b0 * lay[1]! + b1 * lay[3]! + b2 * lay[5]!;
    return true;
  }
  if (p.kind === 'vertex') {
    for (let k = 0; k < 3; k++) {
      if (t.tri[3 * f + k] === p.vertex) {
        out[0] = lay[2 * k]!; out[1] = lay[2 * k + 1]!;
        return true;
      }
    }
    return false;
  }
  for (let k = 0; k < 3; k++) {
    const h = 3 * f + k;
    if (t.edgeOf[h] !== p.edge) continue;
    // edgeHalfedge runs tail → tip; if it is the twin of h, swap the ends
    const k1 = (k + 1) % 3;
    const fromK = t.edgeHalfedge[p.edge] === h;
    const a = fromK ? k : k1, b = fromK ? k1 : k;
    out[0] = (1 - p.t) * lay[2 * a]! + p.t * lay[2 * b]!;
    out[1] = (1 - p.t) * lay[2 * a + 1]! + p.t * lay[2 * b + 1]!;
    return true;
  }
  return false;
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

/** Distance from (px, py) to the segment (ax, ay)–(bx, by). */
export function pointSegmentDistance(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax, dy = by - ay;
  const ll = dx * dx + dy * dy;
  let s = ll > 0 ? ((px - ax) * dx + (py - ay) * dy) / ll : 0;
  s = s < 0 ? 0 : s > 1 ? 1 : s;
  return Math.hypot(px - ax - s * dx, py - ay - s * dy);
}
