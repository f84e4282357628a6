/**
 * Source sets as initial heat for the heat method, and the source values used
 * to shift the recovered field to zero.
 *
 * Every surface point is a convex combination of the ORIGINAL mesh vertices:
 * a vertex is itself, a point on an edge is (1−t)·tail + t·tip, a point in a
 * face is Σ b_k·corner_k. Intrinsic flips keep the vertex set, so these
 * weights stay valid on the flipped triangulation even though the original
 * face may no longer be one of its faces.
 *
 * Heat (the right-hand side δ of (M + tL) u = δ):
 * - a point carries unit heat, spread by its vertex weights;
 * - a curve segment p→q of length ℓ carries ℓ / h (h = mean edge length, so a
 *   segment as long as one edge weighs like one point), spread by
 *   ∫ φ_i ds = ℓ (λ_i(p) + λ_i(q)) / 2, the hat functions being linear along
 *   the segment inside one face.
 *
 * Dirichlet data of the Poisson step ({@link sourceDirichlet}): the vertices
 * carrying a source's weight are held at their straight in-face distance to
 * it (0 on a source vertex), so every source point and curve is the zero
 * level of the recovered field, not only the lowest one.
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import type { Topology } from '../mesh/topology.js';
import type { SourceSet } from './shared/sources.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { checkSurfacePoint } from '../mesh/surface-point.js';
import { next } from '../mesh/topology.js';
import { usageError } from '../errors.js';
import { layoutFace, pointSegmentDistance } from '../metric/layout.js';
import { pointInLayout, commonFaces } from '../metric/face-points.js';

/**
 * Calls visit(v, λ_v) for every original vertex carrying weight in p
 * (weights sum to one). Throws `USAGE` for out-of-range indices, edge
 * parameters outside [0, 1] and negative or vanishing barycentric coordinates.
 */
export function forEachPointWeight(t: Topology, p: SurfacePoint, visit: (v: number, w: number) => void, label = 'source'): void {
  checkSurfacePoint(p, t, label);
  if (p.kind === 'vertex') {
    visit(p.vertex, 1);
  } else if (p.kind === 'edge') {
    if (!(p.t >= 0 && p.t <= 1)) throw usageError(`edge parameter ${p.t} must lie in [0, 1]`, label);
    const h = t.edgeHalfedge[p.edge]!;
    if (p.t < 1) visit(t.tri[h]!, 1 - p.t);
    if (p.t > 0) visit(t.tri[next(h)]!, p.t);
  } else {
    const [b0, b1, b2] = p.bary;
    const s = b0 + b1 + b2;
    if (!(b0 >= 0 && b1 >= 0 && b2 >= 0 && s > 0 && Number.isFinite(s))) {
      throw usageError(`barycentric coordinates ${b0}, ${b1}, ${b2} must be non-negative and not all zero`, label);
    }
    const f = 3 * p.face;
    if (b0 > 0) visit(t.tri[f]!, b0 / s);
    if (b1 > 0) visit(t.tri[f + 1]!, b1 / s);
    if (b2 > 0) visit(t.tri[f + 2]!, b2 / s);
  }
}

/** Value of a per-vertex field at a surface point, by its vertex weights (linear interpolation). */
export function valueAtPoint(t: Topology, p: SurfacePoint, field: Float64Array): number {
  let s = 0;
  forEachPointWeight(t, p, (v, w) => { s += w * field[v]!; });
  return s;
}

/**
 * Estimate of a distance field's value at surface point p from the corners
 * carrying p's weight: Σ_k λ_k (d_k − r_k), with r_k the straight in-face
 * distance from p to corner k. Plain interpolation Σ λ_k d_k would read the
 * cone d(x) = |x − p| around a source as Σ λ_k r_k > 0 at p itself; this
 * form is exact for d = |x − p| and equals d_v at a vertex.
 */
export function sourceValue(m: IntrinsicMesh, p: SurfacePoint, field: Float64Array, lay: Float64Array, xy: Float64Array): number {
  const t = m.topology;
  if (p.kind === 'vertex') return field[p.vertex]!;
  let s = 0;
  if (p.kind === 'edge') {
    const h = t.edgeHalfedge[p.edge]!, l = m.edgeLength[p.edge]!;
    s += (1 - p.t) * (field[t.tri[h]!]! - p.t * l) + p.t * (field[t.tri[next(h)]!]! - (1 - p.t) * l);
    return s;
  }
  layoutFace(m, p.face, lay);
  pointInLayout(t, p.face, p, lay, xy);
  const sum = p.bary[0] + p.bary[1] + p.bary[2];
  for (let k = 0; k < 3; k++) {
    const r = Math.hypot(lay[2 * k]! - xy[0]!, lay[2 * k + 1]! - xy[1]!);
    s += (p.bary[k]! / sum) * (field[t.tri[3 * p.face + k]!]! - r);
  }
  return s;
}

/** Straight in-face length of the segment between two points sharing a face of `m`. */
export function segmentLength(m: IntrinsicMesh, a: SurfacePoint, b: SurfacePoint, label: string): number {
  const fs = commonFaces(m.topology, a, b);
  if (fs.length === 0) throw usageError('consecutive curve points share no face', label);
  const lay = new Float64Array(6), p = new Float64Array(2), q = new Float64Array(2);
  layoutFace(m, fs[0]!, lay);
  pointInLayout(m.topology, fs[0]!, a, lay, p);
  pointInLayout(m.topology, fs[0]!, b, lay, q);
  return Math.hypot(p[0]! - q[0]!, p[1]! - q[1]!);
}

/**
 * Adds the initial heat of `sources` to `out` (per original vertex; see the
 * module comment) and returns the total heat. `m` is the mesh the source
 * indices refer to, `h` its mean edge length.
 */
export function addSourceHeat(m: IntrinsicMesh, sources: SourceSet, h: number, out: Float64Array): number {
  const t = m.topology;
  let total = 0;
  const add = (scale: number) => (v: number, w: number): void => {
    out[v]! += scale * w;
    total += scale * w;
  };
  sources.points.forEach((p, i) => forEachPointWeight(t, p, add(1), `source ${i}`));
  sources.curves.forEach((curve, ci) => {
    const label = `curve ${ci}`;
    if (curve.length === 1) forEachPointWeight(t, curve[0]!, add(1), label);
    let length = 0;
    for (let i = 1; i < curve.length; i++) {
      const a = curve[i - 1]!, b = curve[i]!;
      checkSurfacePoint(a, t, label);
      checkSurfacePoint(b, t, label);
      const l = segmentLength(m, a, b, `${label}, points ${i - 1}-${i}`);
      length += l;
      const s = (0.5 * l) / (h > 0 ? h : 1);
      forEachPointWeight(t, a, add(s), label);
      forEachPointWeight(t, b, add(s), label);
    }
    // a curve whose points all coincide still marks a source
    if (curve.length > 1 && !(length > 0)) forEachPointWeight(t, curve[0]!, add(1), label);
  });
  return total;
}

/**
 * Dirichlet data for the Poisson step (see the module comment): sets
 * fixed[v] = 1 and g[v] = the straight in-face distance from v to the nearest
 * source element touching it, for
 * - a source point: the vertices carrying its weight (0 at a vertex source,
 *   the distance along the edge for an edge point, to the corner for a face point);
 * - a curve segment along an edge (or at a vertex): the vertices carrying its
 *   end points' weight;
 * - a curve segment across a face: all three corners of that face.
 * Flat in-face distances are exact within one face of a flat region and an
 * upper bound elsewhere. Returns the number of fixed vertices. Indices refer
 * to `m`, whose vertex ids the intrinsic triangulation keeps.
 */
export function sourceDirichlet(m: IntrinsicMesh, sources: SourceSet, fixed: Uint8Array, g: Float64Array): number {
  const t = m.topology;
  fixed.fill(0);
  g.fill(0);
  let count = 0;
  const set = (v: number, d: number): void => {
    if (!fixed[v]) { fixed[v] = 1; g[v] = d; count++; } else if (d < g[v]!) g[v] = d;
  };
  const lay = new Float64Array(6), a = new Float64Array(2), b = new Float64Array(2);
  const point = (p: SurfacePoint): void => {
    if (p.kind === 'vertex') { set(p.vertex, 0); return; }
    if (p.kind === 'edge') {
      const h = t.edgeHalfedge[p.edge]!, l = m.edgeLength[p.edge]!;
      if (p.t < 1) set(t.tri[h]!, p.t * l);
      if (p.t > 0) set(t.tri[next(h)]!, (1 - p.t) * l);
      return;
    }
    layoutFace(m, p.face, lay);
    const s = p.bary[0] + p.bary[1] + p.bary[2];
    const x = (p.bary[0] * lay[0]! + p.bary[1] * lay[2]! + p.bary[2] * lay[4]!) / s;
    const y = (p.bary[0] * lay[1]! + p.bary[1] * lay[3]! + p.bary[2] * lay[5]!) / s;
    for (let k = 0; k < 3; k++) if (p.bary[k]! > 0) set(t.tri[3 * p.face + k]!, Math.hypot(lay[2 * k]! - x, lay[2 * k + 1]! - y));
  };
  const carriers: number[] = [];
  const carry = (v: number): void => { if (!carriers.includes(v)) carriers.push(v); };
  sources.points.forEach((p, i) => forEachPointWeight(t, p, () => {}, `source ${i}`));
  sources.points.forEach(point);
  sources.curves.forEach((curve, ci) => {
    curve.forEach((p) => { forEachPointWeight(t, p, () => {}, `curve ${ci}`); point(p); });
    for (let i = 1; i < curve.length; i++) {
      const p = curve[i - 1]!, q = curve[i]!;
      const f = commonFaces(t, p, q)[0];
      if (f === undefined) throw usageError('consecutive curve points share no face', `curve ${ci}, points ${i - 1}-${i}`);
      carriers.length = 0;
      forEachPointWeight(t, p, carry);
      forEachPointWeight(t, q, carry);
      layoutFace(m, f, lay);
      pointInLayout(t, f, p, lay, a);
      pointInLayout(t, f, q, lay, b);
      if (p.kind === 'face') { const s = p.bary[0] + p.bary[1] + p.bary[2]; a[0]! /= s; a[1]! /= s; }
      if (q.kind === 'face') { const s = q.bary[0] + q.bary[1] + q.bary[2]; b[0]! /= s; b[1]! /= s; }
      for (let k = 0; k < 3; k++) {
        const v = t.tri[3 * f + k]!;
        if (carriers.length <= 2 && !carriers.includes(v)) continue;
        set(v, pointSegmentDistance(lay[2 * k]!, lay[2 * k + 1]!, a[0]!, a[1]!, b[0]!, b[1]!));
      }
    }
  });
  return count;
}
