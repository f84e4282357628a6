/**
 * Nearest surface point to a position in space (`p:X,Y,Z` specs), and the
 * surface point on a vertical line (`p:X,Y` specs: a drop along z for map
 * coordinates).
 *
 * three-mesh-bvh finds the candidate triangle quickly in float32 on
 * coordinates centred at the bounding-box centre (scanned terrain at map
 * coordinates would otherwise lose decimetres in float32). The answer is then
 * refined in float64 over the candidate and every face around its corners,
 * with the closest-point-on-triangle test of Ericson, Real-Time Collision
 * Detection (2005), §5.1.5, which returns barycentric coordinates directly.
 *
 * The vertical drop casts a ray along −z from above the mesh with the BVH,
 * then decides in float64 with planar barycentric coordinates (x, y only)
 * over the faces hit and every face around their corners; of several
 * crossings (overhangs, folds) the highest wins.
 */
import { BufferAttribute, BufferGeometry, DoubleSide, Ray, Vector3 } from 'three';
import { MeshBVH } from 'three-mesh-bvh';
import type { Topology } from '../mesh/topology.js';
import { forEachOutgoing } from '../mesh/topology.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { usageError } from '../errors.js';

/** A snapped point: the surface point, its position and its distance from the query (for a vertical drop: horizontal distance, 0 up to rounding). */
export interface SnapResult {
  point: SurfacePoint;
  position: [number, number, number];
  distance: number;
}

/** Closest point on triangle abc to p; returns barycentric weights (u, v, w) of a, b, c. */
export function closestOnTriangle(
  p: ArrayLike<number>,
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  c: ArrayLike<number>,
): [number, number, number] {
  const ab = [b[0]! - a[0]!, b[1]! - a[1]!, b[2]! - a[2]!];
  const ac = [c[0]! - a[0]!, c[1]! - a[1]!, c[2]! - a[2]!];
  const ap = [p[0]! - a[0]!, p[1]! - a[1]!, p[2]! - a[2]!];
  const dot = (x: number[], y: number[]) => x[0]! * y[0]! + x[1]! * y[1]! + x[2]! * y[2]!;
  const d1 = dot(ab, ap), d2 = dot(ac, ap);
  if (d1 <= 0 && d2 <= 0) return [1, 0, 0];
  const bp = [p[0]! - b[0]!, p[1]! - b[1]!, p[2]! - b[2]!];
  const d3 = dot(ab, bp), d4 = dot(ac, bp);
  if (d3 >= 0 && d4 <= d3) return [0, 1, 0];
  const vc = d1 * d4 - d3 * d2;
  if (vc <= 0 && d1 >= 0 && d3 <= 0) {
    const v = d1 / (d1 - d3);
    return [1 - v, v, 0];
  }
  const cp = [p[0]! - c[0]!, p[1]! - c[1]!, p[2]! - c[2]!];
  const d5 = dot(ab, cp), d6 = dot(ac, cp);
  if (d6 >= 0 && d5 <= d6) return [0, 0, 1];
  const vb = d5 * d2 - d1 * d6;
  if (vb <= 0 && d2 >= 0 && d6 <= 0) {
    const w = d2 / (d2 - d6);
    return [1 - w, 0, w];
  }
  const va = d3 * d6 - d5 * d4;
  if (va <= 0 && d4 - d3 >= 0 && d5 - d6 >= 0) {
    const w = (d4 - d3) / (d4 - d3 + (d5 - d6));
    return [0, 1 - w, w];
  }
  const denom = va + vb + vc;
  if (!(Math.abs(denom) > 0)) return [1, 0, 0]; // zero-area triangle: its first corner
  const v = vb / denom, w = vc / denom;
  return clampRounding(1 - v - w, v, w);
}

/**
 * Barycentric coordinates of a point inside its face, as computed: a
 * coordinate that came out negative by rounding alone (within 8 machine
 * epsilons, e.g. 1 − v − w = −1.1e−16 for a point on the edge opposite)
 * becomes 0 and the rest are rescaled to sum to 1. Larger negatives are
 * left for checkSurfacePoint to refuse.
 */
function clampRounding(a: number, b: number, c: number): [number, number, number] {
  const tol = -8 * Number.EPSILON;
  if (!(a < 0 || b < 0 || c < 0) || a < tol || b < tol || c < tol) return [a, b, c];
  a = Math.max(a, 0); b = Math.max(b, 0); c = Math.max(c, 0);
  const s = a + b + c;
  return [a / s, b / s, c / s];
}

/** Finds nearest surface points; build once per mesh, query many times. */
export class SurfaceLocator {
  private readonly bvh: MeshBVH;
  private readonly center: [number, number, number];
  private readonly index: Uint32Array;
  private readonly zTop: number;

  /**
   * @param topology - the mesh connectivity
   * @param positions - x, y, z per topology vertex
   */
  constructor(
    private readonly topology: Topology,
    private readonly positions: Float64Array,
  ) {
    const n = positions.length / 3;
    const lo = [Infinity, Infinity, Infinity], hi = [-Infinity, -Infinity, -Infinity];
    for (let i = 0; i < positions.length; i++) {
      const d = i % 3;
      if (positions[i]! < lo[d]!) lo[d] = positions[i]!;
      if (positions[i]! > hi[d]!) hi[d] = positions[i]!;
    }
    this.center = [0, 1, 2].map((d) => (n ? 0.5 * (lo[d]! + hi[d]!) : 0)) as [number, number, number];
    this.zTop = n ? hi[2]! - this.center[2] : 0;
    const p32 = new Float32Array(positions.length);
    for (let i = 0; i < positions.length; i++) p32[i] = positions[i]! - this.center[i % 3]!;
    const geom = new BufferGeometry();
    geom.setAttribute('position', new BufferAttribute(p32, 3));
    this.index = topology.tri.slice();
    geom.setIndex(new BufferAttribute(this.index, 1));
    this.bvh = new MeshBVH(geom);
  }

  /** The nearest point of the surface to `xyz`. */
  closest(xyz: [number, number, number]): SnapResult {
    const q = new Vector3(xyz[0] - this.center[0], xyz[1] - this.center[1], xyz[2] - this.center[2]);
    const hit = this.bvh.closestPointToPoint(q);
    const t = this.topology;
    // candidate face: the BVH may have reordered its index buffer, so read the corners back
    const candidates = new Set<number>();
    if (hit) {
      const fi = hit.faceIndex;
      for (let k = 0; k < 3; k++) {
        const v = this.index[3 * fi + k]!;
        forEachOutgoing(t, v, (h) => candidates.add((h / 3) | 0));
      }
    }
    if (candidates.size === 0) for (let f = 0; f < t.nf; f++) candidates.add(f);
    let best: SnapResult | null = null;
    const P = this.positions;
    const corner = (f: number, k: number) => P.subarray(3 * t.tri[3 * f + k]!, 3 * t.tri[3 * f + k]! + 3);
    for (const f of candidates) {
      const bary = closestOnTriangle(xyz, corner(f, 0), corner(f, 1), corner(f, 2));
      const pos: [number, number, number] = [0, 0, 0];
      for (let d = 0; d < 3; d++) pos[d] = bary[0] * corner(f, 0)[d]! + bary[1] * corner(f, 1)[d]! + bary[2] * corner(f, 2)[d]!;
      const dist = Math.hypot(pos[0] - xyz[0], pos[1] - xyz[1], pos[2] - xyz[2]);
      if (!best || dist < best.distance) best = { point: { kind: 'face', face: f, bary }, position: pos, distance: dist };
    }
    return best!;
  }

  /**
   * The highest surface point on the vertical line through (x, y): what lies
   * straight below (or above) a map position, with +z up. Throws a `USAGE`
   * error naming `spec` (and `label`) when the line misses the surface.
   */
  dropVertical(xy: [number, number], spec = `p:${xy[0]},${xy[1]}`, label = 'point'): SnapResult {
    const t = this.topology, P = this.positions;
    const cx = xy[0] - this.center[0], cy = xy[1] - this.center[1];
    const top = this.zTop + 1 + Math.abs(this.zTop);
    const hits = this.bvh.raycast(new Ray(new Vector3(cx, cy, top), new Vector3(0, 0, -1)), DoubleSide);
    const candidates = new Set<number>();
    for (const hit of hits) {
      for (let k = 0; k < 3; k++) forEachOutgoing(t, this.index[3 * hit.faceIndex! + k]!, (h) => candidates.add((h / 3) | 0));
    }
    let best: SnapResult | null = null;
    for (const f of candidates) {
      const a = 3 * t.tri[3 * f]!, b = 3 * t.tri[3 * f + 1]!, c = 3 * t.tri[3 * f + 2]!;
      // planar barycentrics of (x, y) in the face's shadow on the xy plane
      const x0 = P[a]!, y0 = P[a + 1]!, e1x = P[b]! - x0, e1y = P[b + 1]! - y0, e2x = P[c]! - x0, e2y = P[c + 1]! - y0;
      const det = e1x * e2y - e1y * e2x;
      const scale = Math.max(Math.abs(e1x), Math.abs(e1y), Math.abs(e2x), Math.abs(e2y));
      if (!(Math.abs(det) > 1e-14 * scale * scale)) continue; // a vertical face: no single point under (x, y)
      const px = xy[0] - x0, py = xy[1] - y0;
      let u = (px * e2y - py * e2x) / det, v = (e1x * py - e1y * px) / det, w = 1 - u - v;
      const tol = -1e-12;
      if (!(u >= tol && v >= tol && w >= tol)) continue;
      u = Math.max(u, 0); v = Math.max(v, 0); w = Math.max(w, 0);
      const sum = u + v + w;
      const bary: [number, number, number] = [w / sum, u / sum, v / sum];
      const pos: [number, number, number] = [0, 0, 0];
      for (let d = 0; d < 3; d++) pos[d] = bary[0] * P[a + d]! + bary[1] * P[b + d]! + bary[2] * P[c + d]!;
      if (!best || pos[2] > best.position[2]) {
        best = { point: { kind: 'face', face: f, bary }, position: pos, distance: Math.hypot(pos[0] - xy[0], pos[1] - xy[1]) };
      }
    }
    if (!best) throw usageError(`the vertical line through x=${xy[0]}, y=${xy[1]} misses the surface in point '${spec}'`, label);
    return best;
  }
}
