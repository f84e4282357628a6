/**
 * Isolines: level sets of a per-vertex field on a triangle mesh, chained into
 * continuous polylines.
 *
 * Method: marching triangles, the two-dimensional case of marching cubes
 * (Lorensen & Cline, "Marching cubes", SIGGRAPH 1987): with the field linear
 * in each face, a level crosses a face in at most one straight segment,
 * between the crossings on the two edges whose ends lie on different sides
 * (crossings.ts: the perturbation rule f ≥ L is "above", and where on the
 * edge the crossing lies). A face whose three corners are on one side holds
 * none. So a saddle needs no special case: each face holds one segment per
 * level, and the curves through a saddle region are told apart by the faces.
 *
 * Chaining. Each face's segment is oriented with the lower values on its
 * left (seen from the side the face normal points to): it enters through
 * one half-edge and leaves through another, and the next segment is the one
 * that enters through the twin of that half-edge. Orientation being global,
 * a curve round a minimum (the source of a distance field) runs
 * counter-clockwise. A curve is open when it reaches a boundary edge, an
 * edge the build cut (non-manifold edges and orientation seams are split
 * into boundary, so curves end there), or a face skipped for a non-finite
 * corner; otherwise it returns to its first face and is closed. Split
 * (pinch) vertices have separate fans, and a curve passes through a vertex
 * only when that vertex lies exactly on the level.
 *
 * A distance field known at every point (`at`, the exact method) goes to
 * exact-level.ts instead: several crossings per edge, curves bent inside
 * faces, loops inside one face.
 *
 * Degenerate pieces: consecutive points at one position (crossings at a
 * vertex lying exactly on the level) are merged, and a curve of zero length
 * (the perturbed level set round a single vertex or edge lying exactly on
 * the level, with its neighbours all below) is dropped.
 */
import type { Topology } from '../mesh/topology.js';
import { faceOf } from '../mesh/topology.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { limitError, usageError } from '../errors.js';
import { EdgeCrossings, type ScalarField } from './crossings.js';
import { exactLevelCurves } from './exact-level.js';

export type { ScalarField } from './crossings.js';

/** A polyline on the surface: an isoline, or an offset curve. */
export interface SurfaceCurve {
  /** The field's value along the curve (the offset distance for offsets). */
  level: number;
  /** True when the curve closes on itself: then its last point repeats its first (as a GeoJSON ring does). */
  closed: boolean;
  /** Length in mesh units. */
  length: number;
  /** Positions [x, y, z] in mesh units, in order. */
  points: [number, number, number][];
  /** Where each point lies on the surface (edge points; a vertex when a crossing lies at a vertex). */
  surfacePoints: SurfacePoint[];
}

/** How levels are chosen: every multiple of `every`, or the listed `levels`. */
export interface LevelOptions {
  /** Spacing: every multiple k·every inside the field's range. */
  every?: number;
  /** Explicit levels (sorted and de-duplicated). */
  levels?: number[];
  /** Most levels allowed (default {@link DEFAULT_MAX_LEVELS}); more is a `LIMIT` error. */
  maxLevels?: number;
}

/** Default cap on the number of levels of one extraction. */
export const DEFAULT_MAX_LEVELS = 10_000;

/** Min and max of the finite values (0, 0 when there are none). */
export function finiteRange(values: Float64Array): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const x = values[i]!;
    if (!Number.isFinite(x)) continue;
    if (x < lo) lo = x;
    if (x > hi) hi = x;
  }
  return lo <= hi ? [lo, hi] : [0, 0];
}

/**
 * The levels asked for: with `every`, the multiples k·every with
 * min < k·every ≤ max over the finite values (a level at the minimum has
 * nothing below it, so no curve); with `levels`, those, sorted, without
 * repeats. Throws `USAGE` for a spacing that is not a positive finite
 * number or a level that is not finite, and `LIMIT` past `maxLevels`.
 */
export function chooseLevels(values: Float64Array, o: LevelOptions): number[] {
  const max = o.maxLevels ?? DEFAULT_MAX_LEVELS;
  if ((o.every === undefined) === (o.levels === undefined)) throw usageError('give either a level spacing (every) or a list of levels');
  if (o.levels) {
    for (const x of o.levels) if (!Number.isFinite(x)) throw usageError(`a level must be a finite number, got ${x}`);
    const out = [...new Set(o.levels)].sort((a, b) => a - b);
    if (out.length > max) throw limitError(`${out.length} levels asked for, more than the ${max} allowed; raise maxLevels (--max-levels)`);
    return out;
  }
  const D = o.every!;
  if (!(D > 0 && D < Infinity)) throw usageError(`the level spacing must be a positive number, got ${D}`);
  const [lo, hi] = finiteRange(values);
  const k0 = Math.floor(lo / D) + 1, k1 = Math.floor(hi / D);
  const n = k1 - k0 + 1;
  if (n > max) {
    throw limitError(`a spacing of ${D} gives ${n} levels over the field's range [${lo}, ${hi}], more than the ${max} allowed; raise maxLevels (--max-levels) or choose a wider spacing`);
  }
  const out: number[] = [];
  for (let k = k0; k <= k1; k++) out.push(k * D);
  return out;
}

/**
 * Level sets of `field` at each of `levels`, chained into polylines (see the
 * module comment), in level order. `positions` are x, y, z per topology
 * vertex. With a field known at every point, a level whose curve lies wholly
 * inside one face round several sources there is not traced: that face and
 * level are pushed to `untraced` (exact-level.ts).
 */
export function isolines(t: Topology, positions: Float64Array, field: ScalarField, levels: readonly number[], untraced?: { level: number; face: number }[]): SurfaceCurve[] {
  if (field.values.length !== t.nv) throw usageError(`the field has ${field.values.length} values for ${t.nv} vertices`);
  const out: SurfaceCurve[] = [];
  if (field.at && field.edgeLength) {
    const pf = { values: field.values, at: field.at, edgeLength: field.edgeLength, ...(field.pointSources ? { pointSources: field.pointSources } : {}), ...(field.curveSources ? { curveSources: field.curveSources } : {}) };
    for (const level of levels) {
      const faces: number[] = [];
      for (const c of exactLevelCurves(t, positions, pf, level, faces)) {
        const length = polylineLength(c.points);
        if (length > 0 && !(c.closed && c.points.length < 4)) out.push({ level, closed: c.closed, length, points: c.points, surfacePoints: c.surfacePoints });
      }
      for (const face of faces) untraced?.push({ level, face });
    }
    return out;
  }
  const cross = new EdgeCrossings(t, field, levels);
  for (let i = 0; i < levels.length; i++) out.push(...levelCurves(cross, positions, i));
  return out;
}

/** Entry and exit half-edge of the segment of level index i in each face (−1 when none). */
function faceSegments(c: EdgeCrossings, i: number): { entry: Int32Array; exit: Int32Array; faces: number[] } {
  const t = c.t;
  const entry = new Int32Array(t.nf).fill(-1), exit = new Int32Array(t.nf).fill(-1);
  const faces: number[] = [];
  for (let f = 0; f < t.nf; f++) {
    const a0 = c.above(t.tri[3 * f]!, i), a1 = c.above(t.tri[3 * f + 1]!, i), a2 = c.above(t.tri[3 * f + 2]!, i);
    if (a0 === a1 && a1 === a2) continue;
    if (!c.faceUsable(f)) continue;
    // the lone corner k, on its own side; the segment crosses the two edges at k
    const k = a1 === a2 ? 0 : a0 === a2 ? 1 : 2;
    const lone = k === 0 ? a0 : k === 1 ? a1 : a2;
    const out = 3 * f + k, inc = 3 * f + ((k + 2) % 3);
    // lower values on the left: from the edge leaving a lone low corner to the edge entering it
    entry[f] = lone ? inc : out;
    exit[f] = lone ? out : inc;
    faces.push(f);
  }
  return { entry, exit, faces };
}

function levelCurves(c: EdgeCrossings, positions: Float64Array, i: number): SurfaceCurve[] {
  const t = c.t, level = c.levels[i]!;
  const { entry, exit, faces } = faceSegments(c, i);
  const seen = new Uint8Array(t.nf);
  const following = (f: number): number => {
    const o = t.twin[exit[f]!]!;
    return o >= 0 && entry[faceOf(o)] === o ? faceOf(o) : -1;
  };
  const hasPrevious = (f: number): boolean => {
    const o = t.twin[entry[f]!]!;
    return o >= 0 && exit[faceOf(o)] === o;
  };
  const curves: SurfaceCurve[] = [];
  const walk = (start: number): void => {
    const edges: number[] = [t.edgeOf[entry[start]!]!];
    let f = start, closed = false;
    for (;;) {
      seen[f] = 1;
      edges.push(t.edgeOf[exit[f]!]!);
      const g = following(f);
      if (g < 0) break;
      if (g === start) { closed = true; edges.pop(); break; }
      if (seen[g]) break; // cannot happen on a consistent topology; never loop
      f = g;
    }
    const curve = makeCurve(c, positions, edges, i, level, closed);
    if (curve) curves.push(curve);
  };
  for (const f of faces) if (!seen[f] && !hasPrevious(f)) walk(f); // open curves, from their first end
  for (const f of faces) if (!seen[f]) walk(f); // what is left is closed
  return curves;
}

/** The curve through the crossings of level index i on `edges` (closed: the last joins the first), or null when of zero length (or a closed curve of fewer than three distinct points). */
function makeCurve(c: EdgeCrossings, positions: Float64Array, edges: number[], i: number, level: number, closed: boolean): SurfaceCurve | null {
  const points: [number, number, number][] = [];
  const surfacePoints: SurfacePoint[] = [];
  const p: [number, number, number] = [0, 0, 0];
  for (const e of edges) {
    c.position(positions, e, i, p);
    const last = points[points.length - 1];
    if (last && last[0] === p[0] && last[1] === p[1] && last[2] === p[2]) continue;
    points.push([p[0], p[1], p[2]]);
    surfacePoints.push(c.surfacePoint(e, i));
  }
  if (closed && points.length > 1) {
    const a = points[0]!, b = points[points.length - 1]!;
    if (a[0] === b[0] && a[1] === b[1] && a[2] === b[2]) { points.pop(); surfacePoints.pop(); }
    points.push([a[0], a[1], a[2]]); // the closing point
    surfacePoints.push(surfacePoints[0]!);
  }
  const length = polylineLength(points);
  if (!(length > 0) || (closed && points.length < 4)) return null;
  return { level, closed, length, points, surfacePoints };
}

/** Length of a polyline of 3D points. */
export function polylineLength(points: readonly (readonly number[])[]): number {
  let L = 0;
  for (let k = 1; k < points.length; k++) {
    const a = points[k - 1]!, b = points[k]!;
    L += Math.hypot(b[0]! - a[0]!, b[1]! - a[1]!, b[2]! - a[2]!);
  }
  return L;
}
