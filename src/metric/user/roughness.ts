/**
 * When a user metric is too rough for the mesh: what the numbers of a
 * {@link MetricReport} say about trusting the results, as cautions a
 * command prints beside them.
 *
 * Two things go wrong when a metric changes at the scale of the edges:
 *
 * 1. **The repair changes the metric.** Lengths measured along straight
 *    edges then break the triangle inequality, and mollification (Sharp &
 *    Crane 2020, §4.5) adds one ε to every edge. Every method then measures
 *    the repaired lengths, not the metric: with a per-vertex cost of 1 or 8
 *    at random on a 30 × 30 grid, ε was 2.3 times the shortest edge and the
 *    exact distances came out about 2.5 times those of the same cost
 *    (interpolated) on a 240 × 240 grid (measured; see
 *    `test/metric/user-roughness.test.ts`).
 * 2. **The heat method loses its accuracy.** The heat method (Crane,
 *    Weischedel & Wardetzky, "Geodesics in heat", ACM TOG 32(5), 2013)
 *    recovers distance from the direction of heat flow over a time
 *    t = h²; its error shrinks with h when the metric is smooth at the scale
 *    √t (in the tests 1–2% on the hyperbolic half-plane and on a smooth
 *    cost bump, falling under refinement), but a metric whose speed jumps by
 *    a large factor between neighbouring vertices turns the surface into a
 *    field of cone points, where heat's direction field is poor. Measured on
 *    the cost of 1 or 8: 14.7% mean difference from the exact method at
 *    30 × 30, still 8.9% after splitting every face into 64 (the same
 *    polyhedral metric, intrinsically refined), and 29–52% on 60–240 × 240
 *    grids carrying the same cost interpolated (the exact method converges
 *    there: 10% → 1.7% from the finest).
 *
 * The speed ratio (largest / smallest speed met along one edge, from the
 * quadrature's own evaluations) measures (2) for metrics given by a formula
 * or a field; lengths given directly carry no speed, and only the repair
 * tells. The thresholds are this project's choice, set between the cases
 * measured (half-plane, smooth bump ≤ 1.4 per edge: accurate; rough costs
 * ≥ 1.9: 10–50%).
 */
import type { MetricReport } from './surface-metric.js';

/** Speed ratio along one edge above which the edge counts as rough (`MetricReport.roughEdgeShare`). */
export const ROUGH_SPEED_RATIO = 1.5;

/** Share of rough edges above which the metric is too rough for the mesh for the heat method. */
export const ROUGH_EDGE_SHARE = 0.01;

/** Largest relative change of an edge length by the repair above which results are no longer those of the metric. */
export const LARGE_REPAIR = 0.01;

/** A caution about results measured in a user metric. */
export interface MetricCaution {
  /**
   * `repair`: every method measures repaired lengths far from the metric's;
   * `rough`: the metric is too rough for the mesh and the heat method is far off;
   * `heat`: the metric varies, and the heat method's accuracy figures (made on
   * the lengths of embeddings) do not carry over.
   */
  kind: 'repair' | 'rough' | 'heat';
  /** One line, for a person. */
  message: string;
}

const pct = (x: number) => (x >= 10 ? x.toFixed(0) : x >= 1 ? x.toFixed(1) : x.toPrecision(2));

/** True when `r`'s lengths come from a metric constant everywhere (one evaluation per edge, exact): a linear image of the mesh. */
export function isConstantMetric(r: MetricReport): boolean {
  return r.toleranceReached === 0 && r.evaluations === r.edges;
}

/**
 * The cautions `r` calls for (empty when none). `repair` (every method) when
 * mollification changed some edge length by more than {@link LARGE_REPAIR}
 * of it. For the heat method (`method` = 'heat'), one more: `rough` when the
 * repair was large or more than {@link ROUGH_EDGE_SHARE} of the edges see
 * the speed change by more than {@link ROUGH_SPEED_RATIO}×; otherwise `heat`
 * for any metric that is not constant (a constant one is a linear image of
 * the mesh, where the heat method keeps its accuracy).
 */
export function metricCautions(r: MetricReport, method?: string): MetricCaution[] {
  const out: MetricCaution[] = [];
  const repaired = r.largestRelativeChange > LARGE_REPAIR;
  if (repaired) {
    out.push({
      kind: 'repair',
      message: `the repair of the metric ${r.metric} changed edge lengths by up to ${pct(100 * r.largestRelativeChange)}%: results are those of the repaired lengths, not of the metric; refine the mesh or smooth the metric`,
    });
  }
  if (method !== 'heat' || isConstantMetric(r)) return out;
  const share = r.roughEdgeShare ?? 0;
  if (repaired || share > ROUGH_EDGE_SHARE) {
    const why = share > ROUGH_EDGE_SHARE
      ? `changes by more than ${ROUGH_SPEED_RATIO}× along ${pct(100 * share)}% of the edges (up to ${r.largestSpeedRatio!.toPrecision(3)}×)`
      : 'needed a large repair';
    out.push({
      kind: 'rough',
      message: `the metric ${r.metric} ${why}: too rough for the heat method on this mesh (10–50% from the exact method in tests); use --method exact, or refine the mesh until the metric changes little along an edge`,
    });
  } else {
    out.push({
      kind: 'heat',
      message: `the heat method's accuracy figures are for the lengths of the mesh; under the varying metric ${r.metric} it was 1–11% from the exact method in tests, more where the metric changes fast or over a wide range; check with --method exact`,
    });
  }
  return out;
}
