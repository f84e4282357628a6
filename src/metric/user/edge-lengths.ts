/**
 * Edge lengths under a metric: L(e) = ∫₀¹ √(γ′ᵀ g(γ(t)) γ′) dt along the
 * straight edge, by adaptive Gauss–Legendre quadrature (Abramowitz & Stegun
 * 25.4.29; nodes from `gauss-legendre.ts`).
 *
 * On each interval the 5-point rule (exact to degree 9) over the whole interval is compared
 * with the sum over its two halves; when they differ by more than the
 * interval's share of the target, both halves are refined the same way
 * (recursive bisection, e.g. Davis & Rabinowitz, Methods of Numerical
 * Integration, 1984, §6.1 — from memory). The halves' sum is kept, and the
 * difference is the error estimate (conservative: for a smooth integrand the
 * halves are accurate to O(h¹⁰)). Each edge's estimate relative to its
 * length is the tolerance reached; the largest over the mesh is reported.
 *
 * The same evaluations say how fast the metric changes at the scale of the
 * mesh: per edge, the ratio of the largest to the smallest speed met along
 * it (1 for a metric constant along the edge, → 1 as a smooth metric is
 * sampled by finer edges); the largest and the count of rough edges are
 * reported, and judged in `roughness.ts`.
 */
import type { Topology } from '../../mesh/topology.js';
import { next } from '../../mesh/topology.js';
import { gaussLegendre } from './gauss-legendre.js';
import type { EdgeSpeed } from './speed.js';

/** Speed ratio along one edge above which the edge counts as rough (`MetricReport.roughEdgeShare`; judged in roughness.ts). */
export const ROUGH_SPEED_RATIO = 1.5;

/** Default relative tolerance of each edge length. */
export const DEFAULT_LENGTH_TOLERANCE = 1e-10;

/** Deepest bisection of one edge (2^20 pieces): beyond it the estimate is reported as reached. */
const MAX_DEPTH = 20;
const RULE_POINTS = 5;

/** Edge lengths and how well they were computed. */
export interface QuadratureResult {
  /** One length per topology edge, mesh units. */
  lengths: Float64Array;
  /** Relative tolerance asked for each edge. */
  toleranceAsked: number;
  /** Largest estimated relative error over the edges (0 for a constant metric: one evaluation is exact). */
  toleranceReached: number;
  /** Edges whose estimate stayed above the tolerance at the deepest bisection. */
  edgesAboveTolerance: number;
  /** Metric evaluations made. */
  evaluations: number;
  /** Largest ratio, over the edges, of the largest to the smallest speed evaluated along one edge (1: constant along every edge). */
  largestSpeedRatio: number;
  /** Edges along which that ratio exceeds {@link ROUGH_SPEED_RATIO}. */
  roughEdges: number;
}

/** The length of every edge of `t` under `speed`, each to relative tolerance `tol`. */
export function quadratureEdgeLengths(t: Topology, speed: EdgeSpeed, tol = DEFAULT_LENGTH_TOLERANCE): QuadratureResult {
  const { nodes, weights } = gaussLegendre(RULE_POINTS);
  const lengths = new Float64Array(t.ne);
  let evaluations = 0, worst = 0, above = 0, largestRatio = 1, rough = 0;
  let lowest = Infinity, highest = 0; // speeds met along the current edge
  const rule = (lo: number, hi: number): number => {
    const w = hi - lo;
    let s = 0;
    for (let i = 0; i < RULE_POINTS; i++) {
      const v = speed.at(lo + w * nodes[i]!);
      if (v < lowest) lowest = v;
      if (v > highest) highest = v;
      s += weights[i]! * v;
    }
    evaluations += RULE_POINTS;
    return s * w;
  };
  // returns [value, error estimate]; `whole` is the rule over [lo, hi] already computed
  let err = 0;
  const refine = (lo: number, hi: number, whole: number, target: number, depth: number): number => {
    const mid = 0.5 * (lo + hi);
    const left = rule(lo, mid), right = rule(mid, hi);
    const halves = left + right, diff = Math.abs(halves - whole);
    if (diff <= target || depth >= MAX_DEPTH || !Number.isFinite(diff)) {
      err += diff;
      return halves;
    }
    return refine(lo, mid, left, target / 2, depth + 1) + refine(mid, hi, right, target / 2, depth + 1);
  };
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!;
    speed.edge(t.tri[h]!, t.tri[next(h)]!);
    if (speed.constant) {
      lengths[e] = speed.at(0.5);
      evaluations++;
      continue;
    }
    lowest = Infinity;
    highest = 0;
    const whole = rule(0, 1);
    err = 0;
    // the target is relative to the length; a tiny absolute floor keeps zero-length edges from refining forever
    const value = refine(0, 1, whole, tol * Math.abs(whole) + 1e-300, 0);
    lengths[e] = value;
    const rel = value > 0 ? err / value : 0;
    if (rel > worst) worst = rel;
    if (rel > tol) above++;
    const ratio = lowest > 0 ? highest / lowest : 1;
    if (ratio > largestRatio) largestRatio = ratio;
    if (ratio > ROUGH_SPEED_RATIO) rough++;
  }
  return { lengths, toleranceAsked: tol, toleranceReached: worst, edgesAboveTolerance: above, evaluations, largestSpeedRatio: largestRatio, roughEdges: rough };
}
