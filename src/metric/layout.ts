/**
 * Planar layouts of single faces from edge lengths, and the plane geometry
 * done in them (lengths of vectors, distances to segments). Shared by every
 * solver, the path code and the CLI (face-points.ts places surface points in
 * these layouts).
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
 * needles keep their small height. A zero-length h puts C at (0, |CA|)
 * (triangle.ts's `placeThirdCorner`, the one layout from lengths).
 */
import type { IntrinsicMesh } from './intrinsic.js';
import { next, prev } from '../mesh/topology.js';
import { placeThirdCorner, triangleArea } from './triangle.js';

/**
 * Euclidean length √(x² + y²) of a plane vector. Math.hypot guards against
 * overflow and costs several times more in V8; lengths on a mesh are far from
 * 1e±154, where the plain form would overflow or underflow.
 */
export function planarLength(x: number, y: number): number {
  return Math.sqrt(x * x + y * y);
}

/**
 * Third corner of the face of half-edge h with h on the +x axis from the
 * origin; writes (cx, cy) to out[o], out[o+1] and returns |h|.
 */
export function layoutAlong(m: IntrinsicMesh, h: number, out: Float64Array, o = 0): number {
  const { edgeOf } = m.topology;
  const L = m.edgeLength;
  const l = L[edgeOf[h]!]!, ln = L[edgeOf[next(h)]!]!, lp = L[edgeOf[prev(h)]!]!;
  placeThirdCorner(l, ln, lp, l > 0 ? triangleArea(l, ln, lp) : 0, out, o);
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

/** Distance from (px, py) to the segment (ax, ay)–(bx, by). */
export function pointSegmentDistance(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax, dy = by - ay;
  const ll = dx * dx + dy * dy;
  let s = ll > 0 ? ((px - ax) * dx + (py - ay) * dy) / ll : 0;
  s = s < 0 ? 0 : s > 1 ? 1 : s;
  return Math.hypot(px - ax - s * dx, py - ay - s * dy);
}
