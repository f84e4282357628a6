/**
 * Walking time on terrain, the facade: a pace model (pace.ts), the Steiner
 * graph of the surface (steiner-graph.ts, Lanthier, Maheshwari & Sack 2001;
 * Aleksandrov, Maheshwari & Sack 2005), travel-time fields from sources
 * (travel-time.ts) and fastest routes through waypoints (route.ts).
 * Browser-safe; files (DEM GeoTIFF, GPX) are in io/geotiff.ts and io/gpx.ts.
 *
 * Lengths of the mesh are taken as metres times `metersPerUnit`; heights
 * are measured along the up axis; times are seconds.
 */
import type { Surface } from '../mesh/surface.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { checkSurfacePoint } from '../mesh/surface-point.js';
import { next } from '../mesh/topology.js';
import { formatBytes, inputError, limitError, usageError } from '../errors.js';
import { paceModel, type PaceModel, type PaceRow } from './pace.js';
import { SteinerGraph, type SteinerSpacing } from './steiner-graph.js';
import { pointSeeds, runTravelSearch, travelState } from './travel-time.js';
import { fastestRoute, type TravelRoute } from './route.js';

export { paceModel, parsePaceTable, parseUpAxis, toblerKmh, naismithSecondsPerMeter, PACE_MODELS, type PaceModel, type PaceModelName, type PaceRow, type PaceOptions } from './pace.js';
export { SteinerGraph, steinerParams, MAX_STEINER_K, type SteinerSpacing, type SteinerOptions } from './steiner-graph.js';
export { SUSTAINED_METERS, type TravelRoute, type SteepestStretch } from './route.js';

/** Options of {@link travelField} and {@link travelRoute}. */
export interface TravelOptions {
  /** Speed model: `tobler` (default), `naismith` or `table`. */
  model?: string;
  /** The speed table of model `table` (see `parsePaceTable`). */
  table?: PaceRow[];
  /** Steepest passable slope, degrees (default 90: no limit). */
  maxSlopeDeg?: number;
  /** Steiner points per edge (default 3). */
  k?: number;
  /** Spacing of the Steiner points (default `uniform`). */
  spacing?: SteinerSpacing;
  /** Metres per mesh unit (default 1). */
  metersPerUnit?: number;
  /** Up direction (default +z). */
  up?: [number, number, number];
  /** Per-face time multipliers: the name of a face property of the mesh file (PLY), or values per file face; 0 = impassable. */
  faceMultipliers?: string | Float64Array;
  /** Bytes the graph and the search may use (default unlimited); more is a `LIMIT` error before anything is allocated. */
  memoryBudget?: number;
}

/**
 * Bytes per graph node, at most: time (8), predecessor (4), settled flag (1), queue position (4), queue
 * entry (12, when the whole graph is queued at once), target step (8, routes) and A* key (8, routes).
 * Coordinates are stored per mesh vertex only: {@link BYTES_PER_VERTEX}.
 */
export const BYTES_PER_NODE = 45;

/** Bytes per mesh vertex besides its node: horizontal coordinates and height (24). */
export const BYTES_PER_VERTEX = 24;

/** Bytes per mesh edge: its record in the graph (ends, and per side the corner and the two other edges). */
export const BYTES_PER_EDGE = 32;

/** The discretisation used: what bounds the approximation. */
export interface TravelApproximation {
  /** Steiner points per edge. */
  k: number;
  /** Their spacing. */
  spacing: SteinerSpacing;
  /** Largest gap between consecutive points of an edge, as a fraction of the edge (the approximation parameter of the fixed scheme). */
  relativeGap: number;
  /** Largest gap between consecutive points of any edge, metres on the ground. */
  maxGapMeters: number;
  /** Graph nodes (vertices + Steiner points). */
  nodes: number;
}

/** A travel-time field from sources. */
export interface TravelField {
  /** Seconds from the nearest source (in time) per topology vertex; Infinity where unreachable. */
  seconds: Float64Array;
  /**
   * The field at parameter s along edge e (from the tail of `edgeHalfedge[e]`):
   * linear between the edge's nodes (vertices and Steiner points), for isolines.
   */
  alongEdge: (edge: number, s: number) => number;
  /** The model's name and flat speed (km/h). */
  model: { name: string; flatKmh: number; maxSlopeDeg: number };
  /** The discretisation. */
  approximation: TravelApproximation;
  /** Arcs relaxed and nodes settled. */
  work: { relaxed: number; settled: number };
  /** Wall times, ms: graph build and search. */
  timings: { graph: number; search: number };
}

/** A route with its model and discretisation. */
export interface TravelRouteResult extends TravelRoute {
  /** See {@link TravelField.model}. */
  model: TravelField['model'];
  /** See {@link TravelField.approximation}. */
  approximation: TravelApproximation;
  /** Wall times, ms: graph build and search. */
  timings: { graph: number; search: number };
}

/** Per topology face multipliers from the option (a face property name or per-file-face values); null when none. */
export function faceMultipliersOf(s: Surface, spec: string | Float64Array | undefined): Float64Array | null {
  if (spec === undefined) return null;
  let perPolygon: Float64Array;
  if (typeof spec === 'string') {
    const col = s.data.faceProps.find((c) => c.name === spec);
    if (!col) {
      const names = s.data.faceProps.map((c) => c.name);
      throw usageError(`the mesh has no face property '${spec}' (${names.length ? `it has ${names.join(', ')}` : 'it has no face properties'})`, s.data.name);
    }
    perPolygon = col.values;
  } else perPolygon = spec;
  const polygons = s.data.faceOffsets.length - 1;
  if (perPolygon.length !== polygons) throw usageError(`face multipliers: ${perPolygon.length} values for ${polygons} faces`, s.data.name);
  for (let f = 0; f < perPolygon.length; f++) {
    const m = perPolygon[f]!;
    if (!(m >= 0 && Number.isFinite(m))) throw inputError(`face multiplier ${m} must be a finite number ≥ 0 (0 = impassable)`, `${s.data.name}: face ${f}`);
  }
  const out = new Float64Array(s.topology.nf);
  for (let f = 0; f < out.length; f++) out[f] = perPolygon[s.facePolygon[f]!]!;
  return out;
}

function setup(s: Surface, opts: TravelOptions): { g: SteinerGraph; pace: PaceModel; ms: number } {
  const t0 = performance.now();
  const k = opts.k ?? 3, t = s.topology;
  const need = (t.nv + t.ne * (Number.isInteger(k) && k >= 0 ? k : 0)) * BYTES_PER_NODE + BYTES_PER_VERTEX * t.nv + BYTES_PER_EDGE * t.ne + 8 * t.nf;
  if (opts.memoryBudget !== undefined && need > opts.memoryBudget) {
    throw limitError(
      `the Steiner graph needs about ${formatBytes(need)} (${t.nv + t.ne * k} nodes: ${k} per edge), over the memory budget of ${formatBytes(opts.memoryBudget)}; raise --memory-budget or lower --steiner`,
      s.data.name,
    );
  }
  const pace = paceModel(opts.model ?? 'tobler', {
    ...(opts.maxSlopeDeg !== undefined ? { maxSlopeDeg: opts.maxSlopeDeg } : {}),
    ...(opts.table ? { table: opts.table } : {}),
  });
  const g = new SteinerGraph(s.topology, s.positions, {
    ...(opts.k !== undefined ? { k: opts.k } : {}),
    ...(opts.spacing ? { spacing: opts.spacing } : {}),
    ...(opts.metersPerUnit !== undefined ? { metersPerUnit: opts.metersPerUnit } : {}),
    ...(opts.up ? { up: opts.up } : {}),
    faceMultipliers: faceMultipliersOf(s, opts.faceMultipliers),
  });
  return { g, pace, ms: performance.now() - t0 };
}

/** The discretisation of `g`. */
export function approximationOf(g: SteinerGraph, spacing: SteinerSpacing): TravelApproximation {
  const ends = [0, ...g.params, 1];
  let rel = 0;
  for (let i = 1; i < ends.length; i++) rel = Math.max(rel, ends[i]! - ends[i - 1]!);
  let maxLen = 0;
  const t = g.t;
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!, u = t.tri[h]!, w = t.tri[next(h)]!;
    const F = g.vertexFrame, a = F[3 * w]! - F[3 * u]!, b = F[3 * w + 1]! - F[3 * u + 1]!, c = F[3 * w + 2]! - F[3 * u + 2]!;
    const sq = a * a + b * b + c * c; // squares: Math.hypot is slow over millions of edges
    if (sq > maxLen) maxLen = sq;
  }
  return { k: g.k, spacing, relativeGap: rel, maxGapMeters: rel * Math.sqrt(maxLen), nodes: g.nodeCount };
}

/**
 * Walking times from `sources` (the earliest over them) to every vertex of
 * the surface. Points are checked (`USAGE` naming them); `maxSeconds` caps
 * the search (vertices beyond it are Infinity).
 */
export function travelField(s: Surface, sources: readonly SurfacePoint[], opts: TravelOptions & { maxSeconds?: number } = {}): TravelField {
  if (sources.length === 0) throw usageError('travel times need at least one source point');
  const { g, pace, ms } = setup(s, opts);
  const t1 = performance.now();
  const state = travelState(g);
  const seeds = sources.flatMap((p, i) => pointSeeds(g, pace, checkSurfacePoint(p, s.topology, `source ${i}`), true));
  runTravelSearch(g, pace, state, seeds, null, opts.maxSeconds ?? Infinity);
  const dist = state.dist;
  const seconds = dist.slice(0, g.nv);
  const k = g.k, nv = g.nv, params = g.params, tri = s.topology.tri, eh = s.topology.edgeHalfedge;
  const alongEdge = (e: number, x: number): number => {
    const h = eh[e]!;
    let lo = 0, vlo = dist[tri[h]!]!;
    for (let j = 0; j <= k; j++) {
      const hi = j < k ? params[j]! : 1, vhi = j < k ? dist[nv + e * k + j]! : dist[tri[next(h)]!]!;
      if (x <= hi) {
        if (!Number.isFinite(vlo) || !Number.isFinite(vhi)) return x - lo < hi - x ? vlo : vhi;
        return hi > lo ? vlo + ((x - lo) / (hi - lo)) * (vhi - vlo) : vlo;
      }
      lo = hi; vlo = vhi;
    }
    return vlo;
  };
  return {
    seconds, alongEdge,
    model: { name: pace.name, flatKmh: pace.flatKmh, maxSlopeDeg: pace.maxSlopeDeg },
    approximation: approximationOf(g, opts.spacing ?? 'uniform'),
    work: { relaxed: state.relaxed, settled: state.settled },
    timings: { graph: ms, search: performance.now() - t1 },
  };
}

/**
 * The fastest walking route through `stops` in order (from, waypoints…,
 * to). Points are checked (`USAGE` naming them); an unreachable stop is a
 * `USAGE` error naming the leg.
 */
export function travelRoute(s: Surface, stops: readonly SurfacePoint[], opts: TravelOptions = {}): TravelRouteResult {
  const checked = stops.map((p, i) => checkSurfacePoint(p, s.topology, `stop ${i}`));
  const { g, pace, ms } = setup(s, opts);
  const t1 = performance.now();
  const r = fastestRoute(g, pace, travelState(g), checked);
  return {
    ...r,
    model: { name: pace.name, flatKmh: pace.flatKmh, maxSlopeDeg: pace.maxSlopeDeg },
    approximation: approximationOf(g, opts.spacing ?? 'uniform'),
    timings: { graph: ms, search: performance.now() - t1 },
  };
}

/**
 * How the route time settles as the Steiner density grows: the route's
 * seconds at each k of `ks` (default k, 2k+1, 4k+3: each step halves the
 * uniform gap). The graph's times only fall as points are added when the
 * new points include the old ones (uniform spacing with k → 2k+1).
 */
export function routeConvergence(s: Surface, stops: readonly SurfacePoint[], opts: TravelOptions = {}, ks?: number[]): { k: number; seconds: number }[] {
  const k0 = opts.k ?? 3;
  return (ks ?? [k0, 2 * k0 + 1, 4 * k0 + 3]).map((k) => ({ k, seconds: travelRoute(s, stops, { ...opts, k }).seconds }));
}
