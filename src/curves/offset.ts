/**
 * On-surface offsets: the curve at geodesic distance D from a source set
 * (a boundary loop, points, a polyline on the surface) — a trim line at D
 * from a part's edge, a margin round a hazard on terrain.
 *
 * The offset is the level set {x : d(x) = D} of the distance field d from
 * the sources (the classical definition of a parallel curve, here with the
 * intrinsic distance), extracted by isolines.ts. With the exact method the
 * field is known at every surface point, so every crossing of D on an edge
 * is found (an edge near a source can hold two, with both ends farther than
 * D), curves bend inside faces, and a loop round a point source inside one
 * face is closed (exact-level.ts); with the heat and graph methods the
 * field is taken linear along edges and in faces, and a level below the
 * field's resolution near a source (closer than its nearest vertex) gives
 * no curve there: {@link OffsetResult.belowResolution} says so.
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
import { next } from '../mesh/topology.js';
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
  /**
   * Heat and graph methods only (fields linear in each face): when the distance is smaller than
   * the distance from some source point to the nearest vertex of its face or edge, the level
   * lies below the field's resolution there and no curve is drawn round that source; this is
   * the largest such nearest-vertex distance (mesh units). Null otherwise (always with exact).
   */
  belowResolution: number | null;
  /**
   * Exact method: faces in which the offset is a loop lying wholly inside the face round several
   * sources there (or a curve source inside it), not traced (exact-level.ts); empty otherwise.
   */
  untracedFaces: number[];
}

/**
 * The field of a distance solve for isolines: per-vertex distances, and with
 * the exact method the exact distance along each edge (from the solve's
 * windows), so crossings are exact roots rather than linear guesses.
 */
export function distanceScalarField(r: DistanceResult, s?: SolvableSurface, sources?: SourceSet): ScalarField {
  const values = r.field.distance;
  if (r.field.method !== 'exact') return { values };
  const alongEdge = (edge: number, t: number) => r.at({ kind: 'edge', edge, t });
  if (!s) return { values, alongEdge };
  // with the surface: every crossing, curves bent inside faces, loops round point sources (exact-level.ts)
  return { values, alongEdge, at: (p) => r.at(p), edgeLength: intrinsicOf(s).edgeLength, ...(sources ? { pointSources: sources.points, curveSources: sources.curves } : {}) };
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
  const untraced: { level: number; face: number }[] = [];
  const curves = measureCurvesInMetric(s, isolines(s.topology, s.positions, { ...distanceScalarField(m, s, sources), edgeLength: mesh.edgeLength }, [distance], untraced)); // a user metric's lengths, if one is attached
  const belowResolution = method === 'exact' ? null : resolutionGap(s, sources, m.field.distance, distance);
  return { curves, measurement: m, timings: { prepare: m.prepareMs, solve: m.solveMs, curves: performance.now() - c0 }, belowResolution, untracedFaces: untraced.map((u) => u.face) };
}

/** The largest nearest-vertex distance of a source point that exceeds D (see {@link OffsetResult.belowResolution}), or null. */
function resolutionGap(s: SolvableSurface, sources: SourceSet, d: Float64Array, D: number): number | null {
  const t = s.topology;
  let worst: number | null = null;
  for (const p of [...sources.points, ...sources.curves.flat()]) {
    let near = 0;
    if (p.kind === 'face') near = Math.min(d[t.tri[3 * p.face]!]!, d[t.tri[3 * p.face + 1]!]!, d[t.tri[3 * p.face + 2]!]!);
    else if (p.kind === 'edge') { const h = t.edgeHalfedge[p.edge]!; near = Math.min(d[t.tri[h]!]!, d[t.tri[next(h)]!]!); }
    if (near > D && (worst === null || near > worst)) worst = near;
  }
  return worst;
}
