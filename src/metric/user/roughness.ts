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
 *    follows the direction of heat flow over a time t = h². On a smooth
 *    metric it keeps its usual accuracy and improves under refinement
 *    (measured: conformal:1/y 1.6 → 1.1 → 0.9% mean at 24, 48, 96 cells; a
 *    smooth bog of cost up to 8, 3.0 → 1.9 → 1.2% at 16, 32, 64). A cost
 *    that jumps between neighbouring vertices makes the surface a field of
 *    cone points (angle defects of ±2 rad): 14.7% at 30 × 30, still 8.9%
 *    after splitting every face into 64 (the same polyhedral metric,
 *    intrinsically refined: it converges, slowly), and 29–52% on 60–240
 *    cell grids carrying the same cost interpolated, where the exact method
 *    converges (10% → 1.7% from the finest). Even a smooth metric that
 *    varies strongly over a short distance is hard for it (a conformal factor
 *    4.5 + 3.5 sin sin with a period of 32 edges: 11%), so no local figure
 *    proves heat accurate under a varying metric.
 *
 * 3. **Lengths that break the triangle inequality at every scale.** Walking
 *    times by Tobler's hiking function (Tobler 1993), the mean of the two
 *    directions, fed as `lengths:` (issue 14; test/metric/user-walking.test.ts):
 *    on ground steeper than a grade of 1/3.5 a zigzag beats the straight
 *    climb, so the cost is not a metric there and refining the mesh does not
 *    help. On a 1 km² terrain of hills and fractal noise, 44% of 3200 faces
 *    failed (47% of 178,802); the repair added 36.6 min to every edge, 24×
 *    the mean edge's 1.55 min (67× at 178,802 faces), so distances became
 *    mostly a count of the edges crossed (1133 min where the user's own times
 *    along edges give 23), and the heat method was 4.1% mean, 16%
 *    worst from the exact method on the repaired lengths (4.3%, 17% at
 *    178,802 faces), 2.5× its usual error on the same terrain measured in
 *    its embedding (1.6%, 7.9%): the repaired polyhedron is near equilateral,
 *    with cones of ±2π/3 at the grid's vertices of valence 4 and 8, and heat
 *    (a diffusion) overestimates there (the same with every edge set to 1:
 *    3.6%; splitting each face into 4, 16, 64: 6.5, 6.7, 5.0%). On gentle
 *    ground (grades up to 0.3) the same times need no repair and heat kept
 *    its usual error (1.45% mean, 8.3% worst). Hence repair `auto`
 *    (repair.ts) refuses such a mollification. The decrease-only repair
 *    (`shorten`: edges to the shortest path along edges) gives walking
 *    times again (far corner 16.0, 15.8, 15.3 min at 3200, 12,800 and
 *    178,802 faces, against `travel`'s 15.7, 15.9, 16.0 and 24–25 along the
 *    user's own edges), but leaves a third of the faces flat (a shortened
 *    edge equals the sum of the other two: 35% at 3200 and 12,800 faces),
 *    and heat was 4.6, 7.8, 10% mean and 26, 20, 43% worst from exact,
 *    worse under refinement (test/bench/metric-accuracy.bench.ts). The flat
 *    faces are not the cause: the heat method's intrinsic Delaunay flips
 *    remove them (an angle near π makes the edge opposite it non-Delaunay;
 *    at 3200 faces 1114 were within 0.01 rad of flat before the flips, 38
 *    after, 25 of those against the boundary; 3310 flips, 6 skipped). The
 *    cause is the curvature the shortened lengths put at the vertices: a
 *    mean |angle defect| of 0.70 rad at interior vertices (0.75 at 12,800
 *    faces; the terrain's own geometry 0.0099, gentle walking times 0.057),
 *    cones at every vertex at every resolution, as in point 2 above; heat
 *    smooths over √t = h, the spacing of the cones. Refining that same
 *    polyhedron's triangulation (to a quarter of the mean edge, 11× the
 *    faces, time scale 0.25) brings heat to 1.2% mean at 3200 faces but
 *    2.6% at 12,800, worst 19–32%: it converges, slowly and at many times
 *    the cost, and refining the input does not help (test/metric/user-repair.test.ts).
 *
 * Hence two levels of caution for the heat method. A metric that is not
 * constant gets the general one (its accuracy table is for lengths of the
 * mesh; check with the exact method). A metric whose speed changes by more
 * than {@link ROUGH_SPEED_RATIO}× along more than {@link ROUGH_EDGE_SHARE}
 * of the edges (the speed ratio: largest / smallest speed the quadrature met
 * along one edge), or that needed a large repair, gets the strong one. The
 * thresholds are this project's choice from the cases above: the random
 * costs on their own 30 × 30 grid (1 or 8; 1 or 2) had 39–48% of their edges
 * over 1.5×, interpolated to finer grids 4–41% (1 or 8) but 0% for 1 or 2 at
 * 120 cells, still 10% off (it gets the general caution only); the smooth
 * cases that kept heat's accuracy had 0–2% (a bog on 16 cells, 3.0% error,
 * 6.5%: borderline).
 * Lengths given directly carry no speed: only the repair tells.
 */
import type { MetricReport } from './surface-metric.js';
import { ROUGH_SPEED_RATIO } from './edge-lengths.js';

export { ROUGH_SPEED_RATIO };


/** Share of rough edges above which the metric is too rough for the mesh for the heat method. */
export const ROUGH_EDGE_SHARE = 0.01;

/** Largest relative change of an edge length by the repair above which results are no longer those of the metric. */
export const LARGE_REPAIR = 0.01;

/**
 * The repair's ε as a multiple of the mean edge length before it (the mean
 * after, less ε: every edge gained ε); 0 without a repair.
 */
export function repairToMeanEdge(r: MetricReport): number {
  const before = r.meanEdgeLengthBeforeRepair;
  return r.mollifyEpsilon > 0 ? (before > 0 ? r.mollifyEpsilon / before : Infinity) : 0;
}

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
const num = (x: number) => (x >= 1000 ? x.toFixed(0) : x.toPrecision(3));

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
    // ε beyond the mean edge: every crossing of an edge costs more than the metric's own length of it
    const k = repairToMeanEdge(r);
    const most = k > 1 ? ` (it added ${num(r.mollifyEpsilon)} to every edge, ${num(k)}× the mean edge length: distances are mostly a count of the edges crossed)` : '';
    out.push({
      kind: 'repair',
      message: r.edgesShortened > 0
        // shorten: lengths only came down to the shortest path along edges, then a margin ε
        ? `the repair of the metric ${r.metric} shortened ${r.edgesShortened} of ${r.edges} edges to the shortest path along edges (by up to ${pct(100 * r.largestShortening)}%) and added ${r.mollifyEpsilon < 1e-3 ? r.mollifyEpsilon.toExponential(2) : num(r.mollifyEpsilon)} to every edge: results are those of the repaired lengths, at most the metric's cost along any chain of edges (plus that margin per edge)`
        : `the repair of the metric ${r.metric} changed edge lengths by up to ${pct(100 * r.largestRelativeChange)}%${most}: results are those of the repaired lengths, not of the metric; smooth the metric or refine the mesh (lengths that break the inequality at every scale, such as walking times on steep ground, do not improve: --metric-repair shorten)`,
    });
  }
  if (method !== 'heat' || isConstantMetric(r)) return out;
  const share = r.roughEdgeShare ?? 0;
  if (repaired || share > ROUGH_EDGE_SHARE) {
    const why = share > ROUGH_EDGE_SHARE
      ? `changes by more than ${ROUGH_SPEED_RATIO}× along ${pct(100 * share)}% of the edges (up to ${r.largestSpeedRatio!.toPrecision(3)}×)`
      : 'needed a large repair';
    // shortened lengths put cones at the vertices at every resolution (point 3 above): refining the mesh does not help
    const advice = share <= ROUGH_EDGE_SHARE && r.edgesShortened > 0
      ? 'use --method exact (refining the mesh does not help: the shortened lengths put cone points at the vertices at every resolution)'
      : 'use --method exact, or refine the mesh until the metric changes little along an edge';
    out.push({
      kind: 'rough',
      message: `the metric ${r.metric} ${why}: too rough for the heat method on this mesh (4–50% mean error against the exact method in tests); ${advice}`,
    });
  } else {
    out.push({
      kind: 'heat',
      message: `the heat method's accuracy figures are for the lengths of the mesh; under the varying metric ${r.metric} it was 1–11% from the exact method in tests, more where the metric changes fast or over a wide range; check with --method exact`,
    });
  }
  return out;
}
