/**
 * An a-posteriori check of a distance field, for the heat method's results:
 * figures that a true distance field satisfies, measured on the field as
 * returned, so that a field the heat method got badly wrong (a mesh it
 * handles badly: long fans, a rough metric) is never returned without a
 * word. The check does not correct anything; it grades.
 *
 * Two kinds of figures, on the mesh the field is given on (its edge lengths:
 * the metric's under `--metric`):
 *
 * - Hard checks, which a true distance field passes exactly, so a violation
 *   beyond a small tolerance proves an error:
 *   - 1-Lipschitz along edges. Geodesic distance d from a source set obeys
 *     |d(i) − d(j)| ≤ dist(i, j) ≤ ℓ_ij for the two ends of every edge (the
 *     triangle inequality of a metric space: the edge is one path from i to
 *     j). Counted per edge with the ratio |φ(i) − φ(j)| / ℓ_ij; the worst
 *     ratio is reported.
 *   - φ ≥ 0, and φ ≈ 0 at vertex sources.
 *   - The straight-line bound (when the caller gives positions: lengths of the
 *     embedding, point sources). Every path on the surface from a source to
 *     x is at least as long as the straight segment between them, so
 *     d(x) ≥ min over the sources s of |x − s| (the chord). Counted at the
 *     vertices at least {@link CHORD_MIN_EDGES} mean edges from every source,
 *     where φ falls below (1 − `chordSlack`) × the chord; the smallest φ /
 *     chord is reported. It sees a field that stops growing even where
 *     its gradient looks right across needles (the blind spot below).
 * - The eikonal residual. A distance function solves |∇d| = 1 away from the
 *   sources and the cut locus (the eikonal equation; e.g. Evans, "Partial
 *   Differential Equations", 2nd ed., AMS 2010, §3.2 and §10.1). With φ
 *   linear per face, the shortfall max(0, 1 − |∇φ|) per face: its
 *   area-weighted mean and 95th percentile. Using the residual as a check of
 *   a computed field is common practice. Only the shortfall is graded: the
 *   excess |∇φ| − 1 of the true distance sampled at the vertices is large on
 *   long thin faces (linear interpolation across a fan: mean 9.5 for the
 *   exact field on the fan strip below), while a field that is too flat (the
 *   heat method's failure on such meshes: values far below the distance) is
 *   what the shortfall sees; the excess along edges is the Lipschitz count's.
 *
 * Thresholds (measured, calibration in the report of this change): on the
 * README's heat-accuracy cases at both resolutions, time scale 1 and 100,
 * the 95th percentile stays ≤ 0.48 (terrain with long-edged sides; 0.52 for
 * the exact field there) and no edge passes 1.25× its length at time scale
 * 1; a flat 40 × 1 strip in two fans (heat 47–75% off) gave 0.67 and 0.91
 * (since the refinement splits boundary edges opposite obtuse corners it is
 * 2–3% off and passes; with `refine: false`, 69% off from its end, 0.78),
 * and a walking-time metric rough for its mesh (heat 14% off) 0.70 with 91
 * edges over 1.25× and a worst ratio of 1.57. Blind spot: on a fan of
 * needles a field flat along the long side can still show |∇φ| ≥ 1 across
 * the needles (the strip with `refine: false` from its middle: 90% off, P95
 * 0.02); the straight-line bound catches it (every checked vertex below
 * 0.75× its chord, down to φ / chord = 0.05), while the heat fields of the
 * accuracy table's kinds of mesh stay far from it (worst φ / chord 0.89–0.97
 * on a sphere, a bumpy sphere, the flat square, the holed plate and a
 * jittered terrain, four sources each: measured; the chord is at most the
 * distance, and heat's errors there are mostly overestimates).
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import { layoutFace } from '../metric/layout.js';
import { triangleArea } from '../metric/triangle.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { tip } from '../mesh/topology.js';

/** The figures of {@link checkDistanceField}. */
export interface HeatCheck {
  /** Edges where |φ(i) − φ(j)| exceeds ℓ_ij by more than the slack (proof of error). */
  lipschitzViolations: number;
  /** Edges with both ends finite (the count the violations are out of). */
  edgesChecked: number;
  /** max |φ(i) − φ(j)| / ℓ_ij over the edges (1 or less for a true distance field). */
  worstLipschitzRatio: number;
  /** Area-weighted mean of the shortfall max(0, 1 − |∇φ|) over the faces with three finite values. */
  eikonalMean: number;
  /** Area-weighted 95th percentile of the shortfall max(0, 1 − |∇φ|) (resolution 0.001). */
  eikonalP95: number;
  /** Vertices with φ below zero by more than the tolerance. */
  negativeValues: number;
  /** Largest φ at a vertex source, in mesh units (0 without vertex sources). */
  worstSourceValue: number;
  /** Vertices where φ falls below (1 − chordSlack) × the straight-line distance to the nearest source (proof of error). */
  chordViolations: number;
  /** Vertices the straight-line bound was checked at (0: not checked — no positions, a metric of one's own, curve sources). */
  chordChecked: number;
  /** Smallest φ / straight-line distance over the checked vertices (1 or more for a true distance field); null when none was checked. */
  worstChordRatio: number | null;
  /** `ok`, or `suspect` when a threshold is passed (see {@link HEAT_CHECK_LIMITS}); `reasons` says which. */
  verdict: 'ok' | 'suspect';
  /** The thresholds passed, in words (empty when ok). */
  reasons: string[];
}

/**
 * The thresholds of the verdict. Lipschitz: an edge counts when its ratio
 * exceeds 1 + `lipschitzSlack` (absolute slack: 1e-9 of the mean edge
 * length); the field is suspect when more than `lipschitzShare` of its edges
 * count or one passes `lipschitzWorst`. Eikonal: suspect when the 95th
 * percentile of the gradient's shortfall passes `eikonalP95`. Sources: suspect when a vertex source's value passes
 * `sourceValue` × the mean edge length.
 */
export const HEAT_CHECK_LIMITS = {
  lipschitzSlack: 0.25,
  lipschitzWorst: 1.5,
  lipschitzShare: 0.01,
  eikonalP95: 0.6,
  sourceValue: 0.5,
  negative: 1e-6,
  chordSlack: 0.25,
  chordShare: 0.01,
  chordWorst: 0.5,
} as const;

/** The straight-line bound is checked at vertices at least this many mean edge lengths from every source. */
export const CHORD_MIN_EDGES = 3;

/** Most point sources the straight-line bound is checked for (it costs one distance per vertex and source). */
export const CHORD_MAX_SOURCES = 64;

/**
 * What the straight-line bound needs: x, y, z per vertex of the mesh the
 * field is on, and of each point source (`sources`, three numbers each).
 * Only valid when the field measures the embedding's lengths.
 */
export interface ChordBound {
  positions: Float64Array;
  sources: Float64Array;
}

const BIN = 0.001;
const BINS = 4000;

/**
 * Checks the per-vertex field `d` on `m` (one value per vertex; `Infinity`
 * where unreachable, skipped). `sources` are the points the field was
 * measured from (vertex points are checked for φ ≈ 0; others are not).
 * With `chord` (the embedding's positions and the point sources'), also the
 * straight-line bound. O(edges + faces), plus vertices × chord sources.
 */
export function checkDistanceField(m: IntrinsicMesh, d: Float64Array, sources: readonly SurfacePoint[] = [], chord?: ChordBound): HeatCheck {
  const t = m.topology, L = m.edgeLength;
  let lenSum = 0;
  for (let e = 0; e < t.ne; e++) lenSum += L[e]!;
  const meanLen = t.ne ? lenSum / t.ne : 0;
  const absSlack = 1e-9 * meanLen;

  let violations = 0, checked = 0, worst = 0;
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!;
    const a = d[t.tri[h]!]!, b = d[tip(t, h)]!;
    if (!Number.isFinite(a) || !Number.isFinite(b)) continue;
    checked++;
    const l = L[e]!, diff = Math.abs(a - b);
    if (l > 0) { const r = diff / l; if (r > worst) worst = r; }
    if (diff > l * (1 + HEAT_CHECK_LIMITS.lipschitzSlack) + absSlack) violations++;
  }

  const hist = new Float64Array(BINS + 1);
  const xy = new Float64Array(6);
  let areaSum = 0, resSum = 0;
  for (let f = 0; f < t.nf; f++) {
    const f0 = d[t.tri[3 * f]!]!, f1 = d[t.tri[3 * f + 1]!]!, f2 = d[t.tri[3 * f + 2]!]!;
    if (!Number.isFinite(f0) || !Number.isFinite(f1) || !Number.isFinite(f2)) continue;
    const l0 = L[t.edgeOf[3 * f]!]!, l1 = L[t.edgeOf[3 * f + 1]!]!, l2 = L[t.edgeOf[3 * f + 2]!]!;
    const area = triangleArea(l0, l1, l2);
    const big = Math.max(l0, l1, l2);
    if (!(area > 1e-12 * big * big)) continue; // degenerate: no gradient
    layoutFace(m, f, xy); // corner 0 at the origin, corner 1 at (l0, 0), corner 2 at (cx, cy), cy > 0
    const gx = (f1 - f0) / xy[2]!;
    const gy = (f2 - f0 - gx * xy[4]!) / xy[5]!;
    const res = Math.max(0, 1 - Math.sqrt(gx * gx + gy * gy));
    if (!Number.isFinite(res)) continue;
    areaSum += area;
    resSum += area * res;
    hist[Math.min(BINS, Math.floor(res / BIN))]! += area;
  }
  let p95 = 0;
  if (areaSum > 0) {
    let acc = 0, k = 0;
    for (; k <= BINS; k++) { acc += hist[k]!; if (acc >= 0.95 * areaSum) break; }
    p95 = Math.min(1, Math.min(k, BINS) * BIN + BIN / 2); // a bin's middle; the shortfall max(0, 1 − |∇φ|) never exceeds 1
  }
  const eikonalMean = areaSum > 0 ? resSum / areaSum : 0;

  let negative = 0;
  const negTol = HEAT_CHECK_LIMITS.negative * meanLen;
  for (let v = 0; v < d.length; v++) if (d[v]! < -negTol) negative++;
  let worstSource = 0;
  for (const p of sources) if (p.kind === 'vertex' && p.vertex < d.length) worstSource = Math.max(worstSource, Math.abs(d[p.vertex]!));

  // the straight-line bound: d(x) ≥ |x − nearest source| (a path on the surface is no shorter than the segment)
  let chordViolations = 0, chordChecked = 0, worstChord = Infinity;
  const ns = chord ? chord.sources.length / 3 : 0;
  if (chord && ns >= 1 && ns <= CHORD_MAX_SOURCES && chord.positions.length === 3 * d.length) {
    const P = chord.positions, S = chord.sources, near = CHORD_MIN_EDGES * meanLen;
    for (let v = 0; v < d.length; v++) {
      const phi = d[v]!;
      if (!Number.isFinite(phi)) continue;
      let c = Infinity;
      for (let k = 0; k < ns; k++) {
        const dx = P[3 * v]! - S[3 * k]!, dy = P[3 * v + 1]! - S[3 * k + 1]!, dz = P[3 * v + 2]! - S[3 * k + 2]!;
        c = Math.min(c, Math.sqrt(dx * dx + dy * dy + dz * dz));
      }
      if (!(c >= near) || !(c > 0)) continue;
      chordChecked++;
      const r = phi / c;
      if (r < worstChord) worstChord = r;
      if (phi < (1 - HEAT_CHECK_LIMITS.chordSlack) * c - absSlack) chordViolations++;
    }
  }

  const reasons: string[] = [];
  if (violations > HEAT_CHECK_LIMITS.lipschitzShare * checked || worst > HEAT_CHECK_LIMITS.lipschitzWorst) {
    reasons.push(`${violations} of ${checked} edges change by more than 1.25× their length (worst ${worst.toFixed(2)}×; a distance changes by at most 1×)`);
  }
  if (p95 > HEAT_CHECK_LIMITS.eikonalP95) reasons.push(`on 5% of the area its gradient is under ${(1 - p95).toFixed(2)}, where a distance's is 1`);
  if (negative > 0) reasons.push(`${negative} negative value(s)`);
  if (worstSource > HEAT_CHECK_LIMITS.sourceValue * meanLen) reasons.push(`a source vertex at ${worstSource.toPrecision(3)} (not 0)`);
  if (chordChecked > 0 && (chordViolations > HEAT_CHECK_LIMITS.chordShare * chordChecked || worstChord < HEAT_CHECK_LIMITS.chordWorst)) {
    reasons.push(`${chordViolations} of ${chordChecked} vertices lie closer than 0.75× their straight-line distance from the sources (down to ${worstChord.toFixed(2)}×; a distance is never shorter than the straight line)`);
  }
  return {
    lipschitzViolations: violations, edgesChecked: checked, worstLipschitzRatio: worst,
    eikonalMean, eikonalP95: p95, negativeValues: negative, worstSourceValue: worstSource,
    chordViolations, chordChecked, worstChordRatio: chordChecked > 0 ? worstChord : null,
    verdict: reasons.length ? 'suspect' : 'ok', reasons,
  };
}
