/**
 * Distances on a surface, by any method, through one call: the facade over
 * `geodesic/solver.ts` (one front for every method). It adds what a surface
 * as loaded needs and a bare metric does not: a non-orientable surface is
 * solved on its orientation double cover (paths cross the seams it was cut
 * along), and distances pass through split vertices (pinch points where
 * sheets meet) as on the surface as given.
 *
 * Every result carries its own figures (`solveMs`, `details`): nothing is
 * read back from the solver afterwards.
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import { surfacePointPosition, type SurfacePoint } from '../mesh/surface-point.js';
import { boundaryCurves, type SourceSet } from '../geodesic/shared/sources.js';
import type { DistanceMethod } from '../geodesic/shared/field.js';
import { prepareDistance, type DistanceOptions, type DistanceResult, type DistanceSolver, type SolveOptions } from '../geodesic/solver.js';
import { prepareCoverDistance } from '../geodesic/cover.js';
import { throughPinches } from '../geodesic/pinch.js';
import { coverOf, groupsOf, intrinsicOf, type SolvableSurface } from './parts.js';
import { checkDistanceField, CHORD_MAX_SOURCES, type ChordBound, type HeatCheck } from '../geodesic/heat-check.js';
import { attachedMetric } from '../metric/user/surface-metric.js';

export type { SolvableSurface, HeatCheck };

/** Options of {@link prepareDistances}: the solver's options, and an intrinsic mesh already made. */
export interface PrepareOptions extends DistanceOptions {
  /** The surface's intrinsic mesh, when already made (e.g. on shared memory in a worker thread); made from the positions otherwise. */
  mesh?: IntrinsicMesh;
}

/** Options of {@link measureDistances}: {@link PrepareOptions} and one solve's options, with the method. */
export interface MeasureOptions extends PrepareOptions, SolveOptions {
  /** `exact` (window propagation; default), `heat` (heat method) or `graph` (along edges, an upper bound). */
  method?: DistanceMethod;
}

/** A {@link DistanceResult} with its preparation's figures. */
export interface Measurement extends DistanceResult {
  /** The method. */
  method: DistanceMethod;
  /** Wall time of preparation, ms. */
  prepareMs: number;
  /** Method-specific preparation figures. */
  prepareDetails: Record<string, number | boolean | string>;
  /** Heat method, complete field: the a-posteriori check of {@link checkHeatField} (a `suspect` verdict: the field may be far off). */
  heatCheck?: HeatCheck;
}

/**
 * An a-posteriori check of a distance field `distance` (one value per vertex
 * of `s`) measured from `sources`: edges where it changes by more than their
 * length (proof of error), how far its gradient falls short of 1 (the
 * eikonal equation), negative values, and a verdict (geodesic/heat-check.ts).
 * For heat results, which can be far off on meshes the method handles badly
 * with nothing else to show it; null when the field's length is not the
 * vertex count.
 */
export function checkHeatField(s: SolvableSurface, distance: Float64Array, sources: SourceSet, mesh?: IntrinsicMesh): HeatCheck | null {
  const m = intrinsicOf(s, mesh);
  if (distance.length !== m.topology.nv) return null;
  return checkDistanceField(m, distance, [...sources.points, ...sources.curves.flat()], chordBound(s, sources, mesh));
}

/**
 * The straight-line bound's data (geodesic/heat-check.ts) when it holds: the
 * field measures the embedding's lengths (no user metric, no lengths given)
 * and the sources are points, not too many of them; else undefined.
 */
function chordBound(s: SolvableSurface, sources: SourceSet, mesh?: IntrinsicMesh): ChordBound | undefined {
  if (mesh !== undefined || attachedMetric(s) !== undefined) return undefined;
  const pts = sources.points;
  if (sources.curves.length > 0 || pts.length === 0 || pts.length > CHORD_MAX_SOURCES) return undefined;
  const at = new Float64Array(3 * pts.length), xyz = new Float64Array(3);
  pts.forEach((p, k) => at.set(surfacePointPosition(p, s.topology, s.positions, xyz), 3 * k));
  return { positions: s.positions, sources: at };
}

/**
 * Every boundary loop of `s` as a source curve (on a non-orientable surface,
 * the loops of its double cover, which is what its solver runs on). Empty
 * for a closed surface.
 */
export function boundarySources(s: SolvableSurface): SurfacePoint[][] {
  const cover = coverOf(s);
  return cover ? cover.boundaryCurves() : boundaryCurves(s.topology);
}

/**
 * Prepares a distance solver of `method` on `s`, to solve for any number of
 * source sets; each `solve` returns its own result and figures. Bad edge
 * lengths are an `INPUT` error, bad points `USAGE`, a NaN `NUMERIC`, a run
 * over the memory budget `LIMIT` (see `prepareDistance` of `orthodrome/geodesic`).
 */
export function prepareDistances(s: SolvableSurface, method: DistanceMethod, opts: PrepareOptions = {}): DistanceSolver {
  const { mesh, ...o } = opts;
  const cover = coverOf(s, mesh);
  const inner = cover ? prepareCoverDistance(cover, method, o) : prepareDistance(intrinsicOf(s, mesh), method, o);
  return throughPinches(inner, groupsOf(s), o.maxDistance !== undefined ? { maxDistance: o.maxDistance } : {});
}

/**
 * Distances on `s` from `sources` (points and curves) to every vertex, and
 * at any surface point through `at`: prepare and solve in one call
 * ({@link prepareDistances} to reuse a preparation).
 */
export function measureDistances(s: SolvableSurface, sources: SourceSet, opts: MeasureOptions = {}): Measurement {
  const { method = 'exact', targets, fieldNeeded, ...prep } = opts;
  const solver = prepareDistances(s, method, prep);
  const r = solver.solve(sources, { ...(targets ? { targets } : {}), ...(fieldNeeded !== undefined ? { fieldNeeded } : {}) });
  const check = method === 'heat' && r.complete ? checkHeatField(s, r.field.distance, sources, prep.mesh) : null;
  return { ...r, method, prepareMs: solver.prepareMs, prepareDetails: solver.prepareDetails, ...(check ? { heatCheck: check } : {}) };
}
