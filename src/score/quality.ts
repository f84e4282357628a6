/**
 * Triangle quality of a mesh, from edge lengths alone: aspect-ratio
 * quantiles and the share of non-Delaunay edges.
 *
 * Aspect ratio: the radius ratio R / (2r) of circumradius R to inradius r,
 * 1 for an equilateral triangle and growing without bound as a triangle
 * flattens (Shewchuk, "What is a good linear finite element?", 2002, lists it
 * among the standard quality measures). From the sides a, b, c and area A
 * (R = abc / 4A, r = A / s with s the half perimeter):
 *   R / (2r) = abc·(a + b + c) / (16 A²)
 * (metric/triangle.ts's `radiusRatio`, the one home of the formula).
 * Triangles without area have no finite ratio; they are left out of the
 * quantiles (the health group counts them as zero-area triangles). Quantiles
 * are nearest-rank: the value at 1-based rank ⌈p·n⌉ of the sorted ratios
 * (Hyndman & Fan 1996, definition 1), found by selection (select.ts), not a
 * full sort: the same values, in linear time.
 *
 * An interior edge is Delaunay when the two angles opposite it sum to at
 * most π, i.e. cot α + cot β ≥ 0 (Bobenko & Springborn 2007); the test is
 * metric/delaunay.ts's `edgeCotanSum`, with its default tolerance 1e-9.
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import { radiusRatio } from '../metric/triangle.js';
import { edgeCotanSum } from '../metric/delaunay.js';
import { selectInPlace } from './select.js';

/** Tolerance of the Delaunay test (the same as `intrinsicDelaunay`'s default). */
export const DELAUNAY_TOLERANCE = 1e-9;

/** Triangle quality figures (see the module comment). */
export interface TriangleQuality {
  aspectRatioP50: number | null;
  aspectRatioP90: number | null;
  aspectRatioP99: number | null;
  aspectRatioMax: number | null;
  nonDelaunayEdges: number;
  /** Non-Delaunay share of interior edges (0 when there are none). */
  nonDelaunayFraction: number;
}

/** The 1-based nearest rank ⌈p·n⌉ of quantile p among n values (clamped to 1…n). */
const rankOf = (p: number, n: number): number => Math.min(n, Math.max(1, Math.ceil(p * n)));

/** Nearest-rank quantile of sorted values (null for none). */
export function nearestRank(sorted: Float64Array, p: number): number | null {
  const n = sorted.length;
  if (n === 0) return null;
  return sorted[rankOf(p, n) - 1]!;
}

/** Aspect-ratio quantiles and non-Delaunay edges of `m`. */
export function triangleQuality(m: IntrinsicMesh): TriangleQuality {
  const t = m.topology, L = m.edgeLength, eo = t.edgeOf;
  const ratios = new Float64Array(t.nf);
  let n = 0;
  for (let f = 0; f < t.nf; f++) {
    const r = radiusRatio(L[eo[3 * f]!]!, L[eo[3 * f + 1]!]!, L[eo[3 * f + 2]!]!);
    if (Number.isFinite(r)) ratios[n++] = r;
  }
  // the quantiles by selection, highest rank first: each later rank lies among the values left before it
  const vals = ratios.subarray(0, n);
  let max = -Infinity;
  for (let i = 0; i < n; i++) if (vals[i]! > max) max = vals[i]!;
  const k99 = rankOf(0.99, n) - 1, k90 = rankOf(0.9, n) - 1, k50 = rankOf(0.5, n) - 1;
  const p99 = n ? selectInPlace(vals, k99, 0, n - 1) : null;
  const p90 = n ? selectInPlace(vals, k90, 0, k99) : null;
  const p50 = n ? selectInPlace(vals, k50, 0, k90) : null;
  let interior = 0, bad = 0;
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!;
    if (t.twin[h]! < 0) continue;
    interior++;
    if (edgeCotanSum(t, L, h) < -DELAUNAY_TOLERANCE) bad++;
  }
  return {
    aspectRatioP50: p50,
    aspectRatioP90: p90,
    aspectRatioP99: p99,
    aspectRatioMax: n ? max : null,
    nonDelaunayEdges: bad,
    nonDelaunayFraction: interior ? bad / interior : 0,
  };
}
