/**
 * On-surface offsets: the curve at geodesic distance D from a source set
 * (a boundary loop, points, a polyline on the surface) — a trim line at D
 * from a part's edge, a margin round a hazard on terrain.
 *
 * The offset is the level set {x : d(x) = D} of the distance field d from
 * the sources (the classical definition of a parallel curve, here with the
 * intrinsic distance), extracted by isolines.ts. With the exact method the
 * crossing on each edge is a root of the exact polyhedral distance along
 * the edge (the field is not linear along an edge: crossings.ts), evaluated
 * from the windows of the edge's faces; with the heat and graph methods the
 * field is taken linear along edges.
 *
 * Only what is near D is computed where the method allows: the exact and
 * graph runs stop at D + the longest edge (every corner of a face the level
 * crosses lies within that distance, by the triangle inequality along the
 * face's edges), so vertices beyond read Infinity and no face the curve
 * crosses is skipped.
 */
import type { DistanceResult } from '../geodesic/solver.js';
import { measureDistances, type MeasureOptions, type Measurement, type SolvableSurface } from '../api/distance.js';
import { intrinsicOf } from '../api/parts.js';
import { measureCurvesInMetric } from '../metric/user/surface-metric.js';
import { usageError } from '../errors.js';
import { isolines, type ScalarField, type SurfaceCurve } from './isolines.js';

/** Options of {@link surfaceOffset}: those of a distance measurement (method, default `exact`; heat options; memory budget), without a distance cap. */
export type OffsetOptions = Omit<MeasureOptions, 'maxDistance' | 'targets' | 'fieldNeeded'>;

/** Points and curves to measure from (the source set of `measureDistances`). */
type SourceSet = Parameters<typeof measureDistances>[1];

/** Result of {@link surfaceOffset}. */
export interface OffsetResult {
  /** The offset curves (each with `level` = the distance). */
  curves: SurfaceCurve[];
  /** The distance measurement they came from. */
  measurement: Measurement;
  /** Wall times, ms: the solver's preparation, its solve, and the curve extraction. */
  timings: { prepare: number; solve: number; curves: number };
}

/**
 * The field of a distance solve for isolines: per-vertex distances, and with
 * the exact method the exact distance along each edge (from the solve's
 * windows), so crossings are exact roots rather than linear guesses.
 */
export function distanceScalarField(r: DistanceResult): ScalarField {
  const values = r.field.distance;
  if (r.field.method !== 'exact') return { values };
  return { values, alongEdge: (edge, s) => r.at({ kind: 'edge', edge, t: s }) };
}

/**
 * The curves at on-surface distance `distance` (mesh units, > 0) from
 * `sources` on surface `s` (a non-orientable surface is measured on its
 * double cover and through split vertices, as `measureDistances` does; the
 * curves end where the build cut the surface). Throws `USAGE` for a
 * distance that is not a positive finite number, and whatever the
 * measurement throws (`USAGE` for bad sources, `LIMIT` past the memory
 * budget).
 */
export function surfaceOffset(s: SolvableSurface, sources: SourceSet, distance: number, opts: OffsetOptions = {}): OffsetResult {
  if (!(distance > 0 && distance < Infinity)) throw usageError(`the offset distance must be a positive number, got ${distance}`);
  const method = opts.method ?? 'exact';
  const mesh = intrinsicOf(s, opts.mesh);
  let longest = 0;
  for (let e = 0; e < mesh.edgeLength.length; e++) if (mesh.edgeLength[e]! > longest) longest = mesh.edgeLength[e]!;
  const m = measureDistances(s, sources, { ...opts, mesh, method, ...(method !== 'heat' ? { maxDistance: (distance + longest) * (1 + 1e-9) } : {}) });
  const c0 = performance.now();
  const curves = measureCurvesInMetric(s, isolines(s.topology, s.positions, distanceScalarField(m), [distance])); // a user metric's lengths, if one is attached
  return { curves, measurement: m, timings: { prepare: m.prepareMs, solve: m.solveMs, curves: performance.now() - c0 } };
}
