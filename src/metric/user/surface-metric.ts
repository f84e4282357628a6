/**
 * A user metric on a surface: its edge lengths (quadrature of the metric,
 * or given), checked and repaired, and the record of which metric a
 * surface is measured in.
 *
 * Lengths from a metric need not satisfy the triangle inequality on every
 * face (a metric that changes fast across a face, or lengths given
 * directly). Such faces are counted, and the lengths are repaired
 * (`repair.ts`): by intrinsic mollification (Sharp & Crane, "A Laplacian
 * for Nonmanifold Triangle Meshes", CGF 39(5), 2020, §4.5;
 * `metric/mollify.ts`: one constant ε added to every edge, the smallest
 * that leaves every face a margin δ), or first by shortening edges to the
 * shortest path along edges (Gilbert & Jain 2017; `shorten.ts`); a large
 * mollification is refused unless asked for. The heat and exact methods
 * then both see the repaired lengths.
 *
 * "The metric is the interface": {@link attachMetric} records the repaired
 * intrinsic mesh beside the surface object (a WeakMap), and everything that
 * makes a surface's intrinsic mesh asks {@link surfaceIntrinsic} first, so
 * every command measures in the user's metric. Positions still place points
 * (`p:X,Y,Z` snapping) and map results back to 3D.
 */
import type { Topology } from '../../mesh/topology.js';
import type { PropertyColumn } from '../../io/mesh-data.js';
import type { SurfacePoint } from '../../mesh/surface-point.js';
import { chainLength } from '../face-points.js';
import { intrinsicFromPositions, meanEdgeLength, type IntrinsicMesh } from '../intrinsic.js';
import { DEFAULT_MOLLIFY_DELTA } from '../mollify.js';
import { usageError } from '../../errors.js';
import type { UserMetric } from './spec.js';
import { expressionSpeed } from './speed.js';
import { fieldSpeed } from './field.js';
import { lengthsFromCsv } from './lengths-file.js';
import { quadratureEdgeLengths, DEFAULT_LENGTH_TOLERANCE } from './edge-lengths.js';
import { repairLengths, METRIC_REPAIRS, type MetricRepair } from './repair.js';

/** What a surface needs to take a user metric (a whole `Surface` will do). */
export interface MetricTarget {
  topology: Topology;
  positions: Float64Array;
  data: { name: string; vertexProps: PropertyColumn[] };
  report: { orientationSeams: Int32Array };
}

/** Options of {@link metricLengths}. */
export interface MetricLengthOptions {
  /** Relative tolerance of each edge length's quadrature (default 1e-10). */
  tolerance?: number;
  /** Mollification margin δ as a fraction of the mean edge length (default 1e-5). */
  mollifyDelta?: number;
  /**
   * How faces that break the triangle inequality are repaired (`repair.ts`):
   * `auto` (default: mollify, but refuse with `INPUT` when ε would exceed
   * 5% of the mean edge), `mollify` (always), `shorten` (edges to the
   * shortest path along edges, then a margin).
   */
  repair?: MetricRepair;
}

/** What applying a user metric found and did. Every length measured in it should carry `metric`. */
export interface MetricReport {
  /** The metric as given (e.g. `conformal:1/y`). */
  metric: string;
  /** Its kind. */
  kind: UserMetric['kind'];
  /** Edges measured. */
  edges: number;
  /** Relative tolerance asked of each edge length (null: lengths given directly). */
  toleranceAsked: number | null;
  /** Largest estimated relative error of an edge length (0: exact; null: lengths given). */
  toleranceReached: number | null;
  /** Edges whose quadrature stayed above the tolerance. */
  edgesAboveTolerance: number;
  /** Metric evaluations made by the quadrature. */
  evaluations: number;
  /**
   * Largest ratio between the metric's speeds at two points of one edge
   * (largest / smallest met by the quadrature; 1: constant along every edge;
   * null: lengths given). Far above 1, the metric changes at the scale of
   * the edges and the heat method is inaccurate (`roughness.ts`).
   */
  largestSpeedRatio: number | null;
  /** Share of the edges along which the speed changes by more than `ROUGH_SPEED_RATIO` (1.5×); null: lengths given. */
  roughEdgeShare: number | null;
  /** Faces failing the triangle inequality under the metric, before repair. */
  triangleInequalityViolations: number;
  /** Length added to every edge by mollification, mesh units (0: none needed). */
  mollifyEpsilon: number;
  /** The margin δ every face keeps after repair, mesh units. */
  mollifyDelta: number;
  /** The largest relative change of an edge length by the repair (mollification alone: ε over the shortest edge). */
  largestRelativeChange: number;
  /** Mean edge length under the metric (after repair), mesh units. */
  meanEdgeLength: number;
  /** The repair asked for: `auto`, `mollify` or `shorten`. */
  repair: MetricRepair;
  /** Edges shortened to the shortest path along edges (`shorten`; 0 otherwise). */
  edgesShortened: number;
  /** Largest relative shortening of an edge, (given − repaired) / given (0: none). */
  largestShortening: number;
  /** Mean edge length before repair, mesh units (ε relative to it: about the relative growth of a distance). */
  meanEdgeLengthBeforeRepair: number;
}

/** A surface's lengths under a user metric and their report. */
export interface AppliedMetric {
  /** The repaired intrinsic mesh. */
  mesh: IntrinsicMesh;
  /** What was found and done. */
  report: MetricReport;
}

/**
 * The edge lengths of `s` under `metric`, checked (positive definiteness where
 * evaluated: `INPUT` naming the point and edge) and repaired (triangle
 * inequality: `opts.repair`; under `auto`, a repair that would add more than
 * 5% of the mean edge is an `INPUT` error naming the lengths file, or the mesh
 * and the metric's spec).
 * Does not attach them to `s` ({@link attachMetric}).
 */
export function metricLengths(s: MetricTarget, metric: UserMetric, opts: MetricLengthOptions = {}): AppliedMetric {
  const t = s.topology;
  const ms = { positions: s.positions, vertexOrigin: t.vertexOrigin, name: s.data.name };
  const tol = opts.tolerance ?? DEFAULT_LENGTH_TOLERANCE;
  if (!(tol > 0 && tol < 1)) throw usageError(`the metric tolerance must lie in (0, 1), got ${tol}`);
  const mode = opts.repair ?? 'auto';
  if (!(METRIC_REPAIRS as readonly string[]).includes(mode)) throw usageError(`the metric repair must be ${METRIC_REPAIRS.join(', ')}, got '${String(mode)}'`);
  let lengths: Float64Array;
  let quad: { toleranceAsked: number | null; toleranceReached: number | null; edgesAboveTolerance: number; evaluations: number; largestSpeedRatio: number | null; roughEdgeShare: number | null };
  if (metric.kind === 'lengths') {
    lengths = lengthsFromCsv(t, metric.text, metric.file);
    quad = { toleranceAsked: null, toleranceReached: null, edgesAboveTolerance: 0, evaluations: 0, largestSpeedRatio: null, roughEdgeShare: null };
  } else {
    const speed = metric.kind === 'field' ? fieldSpeed(ms, s.data.vertexProps, metric.name, metric.label) : expressionSpeed(ms, metric);
    const { lengths: l, roughEdges, ...q } = quadratureEdgeLengths(t, speed, tol);
    lengths = l;
    quad = { ...q, roughEdgeShare: t.ne ? roughEdges / t.ne : 0 };
  }
  const raw: IntrinsicMesh = { topology: t, edgeLength: lengths };
  const m = metric.kind === 'lengths'
    ? repairLengths(raw, mode, opts.mollifyDelta ?? DEFAULT_MOLLIFY_DELTA, metric.file)
    : repairLengths(raw, mode, opts.mollifyDelta ?? DEFAULT_MOLLIFY_DELTA, s.data.name, metric.label);
  const report: MetricReport = {
    metric: metric.label,
    kind: metric.kind,
    edges: t.ne,
    ...quad,
    triangleInequalityViolations: m.violations,
    mollifyEpsilon: m.epsilon,
    mollifyDelta: m.delta,
    largestRelativeChange: m.largestRelativeChange,
    meanEdgeLength: meanEdgeLength(m.mesh),
    repair: mode,
    edgesShortened: m.edgesShortened,
    largestShortening: m.largestShortening,
    meanEdgeLengthBeforeRepair: m.meanBefore,
  };
  return { mesh: m.mesh, report };
}

const attached = new WeakMap<object, AppliedMetric>();

/**
 * Measures `s` in `metric` from now on: computes {@link metricLengths} and
 * records them beside `s`, so every solver and report on `s` uses them.
 * Call it right after loading, before anything is measured (a non-orientable
 * surface's double cover takes these lengths too). Attaching a second metric
 * is a `USAGE` error.
 */
export function attachMetric(s: MetricTarget, metric: UserMetric, opts: MetricLengthOptions = {}): MetricReport {
  if (attached.has(s)) throw usageError(`the surface already has the metric ${attached.get(s)!.report.metric}`);
  const applied = metricLengths(s, metric, opts);
  attached.set(s, applied);
  return applied.report;
}

/** The metric attached to `s` by {@link attachMetric}, or undefined (measured from positions). */
export function attachedMetric(s: object): AppliedMetric | undefined {
  return attached.get(s);
}

/** The intrinsic mesh of `s`: its attached user metric's, else the Euclidean lengths of its positions. */
export function surfaceIntrinsic(s: { topology: Topology; positions: Float64Array }): IntrinsicMesh {
  const a = attached.get(s);
  return a && a.mesh.topology === s.topology ? a.mesh : intrinsicFromPositions(s.topology, s.positions);
}

/** The name of the metric `s` is measured in: the user's spec, or `euclidean` (lengths of the embedding). */
export function metricName(s: object): string {
  return attached.get(s)?.report.metric ?? 'euclidean';
}

/**
 * Under an attached user metric, sets each curve's `length` to its length in
 * the metric (the sum of its straight pieces over the faces they cross, laid
 * out from the metric's edge lengths: `chainLength`); without one, leaves the
 * curves as they are (lengths of the embedding). Returns `curves`.
 */
export function measureCurvesInMetric<C extends { length: number; surfacePoints: SurfacePoint[] }>(s: object, curves: C[]): C[] {
  const a = attached.get(s);
  if (a) for (const c of curves) c.length = chainLength(a.mesh, c.surfacePoints);
  return curves;
}
