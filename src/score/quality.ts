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
 * (Hyndman & Fan 1996, definition 1).
 *
 * An interior edge is Delaunay when the two angles opposite it sum to at
 * most π, i.e. cot α + cot β ≥ 0 (Bobenko & Springborn 2007); the test is
 * metric/delaunay.ts's `edgeCotanSum`, with its default tolerance 1e-9.
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import { radiusRatio } from '../metric/triangle.js';
import { edgeCotanSum } from '../metric/delaunay.js';

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

/** Nearest-rank quantile of sorted values (null for none). */
export function nearestRank(sorted: Float64Array, p: number): number | null {
  const n = sorted.length;
  if (n === 0) return null;
  const k = Math.min(n, Math.max(1, Math.ceil(p * n)));
  return sorted[k - 1]!;
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
  const sorted = ratios.subarray(0, n).sort();
  let interior = 0, bad = 0;
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!;
    if (t.twin[h]! < 0) continue;
    interior++;
    if (edgeCotanSum(t, L, h) < -DELAUNAY_TOLERANCE) bad++;
  }
  return {
    aspectRatioP50: nearestRank(sorted, 0.5),
    aspectRatioP90: nearestRank(sorted, 0.9),
    aspectRatioP99: nearestRank(sorted, 0.99),
    aspectRatioMax: n ? sorted[n - 1]! : null,
    nonDelaunayEdges: bad,
    nonDelaunayFraction: interior ? bad / interior : 0,
  };
}
