/**
 * The facade of isolines and bands on a surface, in one call: the levels
 * from a spacing or a list, the chained isolines (isolines.ts) and, when
 * asked, the bands between the levels (bands.ts), for any per-vertex field
 * — a distance measurement (exact crossings along edges with the exact
 * method: see {@link distanceScalarField}) or values from a file.
 */
import type { Topology } from '../mesh/topology.js';
import { usageError } from '../errors.js';
import { chooseLevels, isolines, DEFAULT_MAX_LEVELS, type LevelOptions, type ScalarField, type SurfaceCurve } from './isolines.js';
import { bands, bandLevels, type Band } from './bands.js';
import { measureCurvesInMetric } from '../metric/user/surface-metric.js';

/** Options of {@link surfaceIsolines}: the levels, and whether bands are wanted. */
export interface IsolineOptions extends LevelOptions {
  /** Also the bands between consecutive levels (with `every`: bands covering the whole field). */
  bands?: boolean;
  /** Bands: build their polygons (default true); false gives the areas only. */
  rings?: boolean;
}

/** Result of {@link surfaceIsolines}. */
export interface IsolineResult {
  /** The isoline levels. */
  levels: number[];
  /** The isolines, in level order. */
  curves: SurfaceCurve[];
  /** The bands, when asked for (else null). */
  bands: Band[] | null;
  /** Wall time of the extraction, ms. */
  ms: number;
  /** Levels whose curve lies wholly inside a face round several sources there, not traced (exact distance only; see exact-level.ts). */
  untraced: { level: number; face: number }[];
}

/**
 * Isolines of `field` on the surface (`topology` and x, y, z `positions` per
 * topology vertex; a `Surface` has both) at every multiple of `every` or at
 * the listed `levels`, and optionally the bands between them. With `every`
 * the bands run from the multiple at or below the field's minimum to the
 * first above its maximum (so their areas add up to the surface with finite
 * values); with `levels`, between consecutive listed levels (at least two).
 * Throws `USAGE` for bad levels and `LIMIT` past `maxLevels`.
 */
export function surfaceIsolines(s: { topology: Topology; positions: Float64Array }, field: ScalarField, opts: IsolineOptions): IsolineResult {
  const t0 = performance.now();
  const levels = chooseLevels(field.values, opts);
  const untraced: { level: number; face: number }[] = [];
  const curves = measureCurvesInMetric(s, isolines(s.topology, s.positions, field, levels, untraced)); // a user metric's lengths, if one is attached
  let b: Band[] | null = null;
  if (opts.bands) {
    const edges = opts.every !== undefined ? bandLevels(field.values, opts.every, opts.maxLevels ?? DEFAULT_MAX_LEVELS) : levels;
    if (edges.length < 2) throw usageError('bands need at least two levels');
    b = bands(s.topology, s.positions, field, edges, opts.rings === false ? { rings: false } : {});
  }
  return { levels, curves, bands: b, ms: performance.now() - t0, untraced };
}
