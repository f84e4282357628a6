/**
 * Triangle quantities from side lengths alone.
 *
 * Area by Kahan's needle-safe formula (W. Kahan, "Miscalculating area and
 * angles of a needle-like triangle", 2000/2014): with a ≥ b ≥ c,
 *   A = ¼ √((a + (b + c))(c − (a − b))(c + (a − b))(a + (b − c))).
 * Angles as θ_a = atan2(4A, b² + c² − a²), which stays accurate for needles
 * and caps (the area carries the small quantity). Lengths that break the
 * triangle inequality give A = 0 and angles {π, 0, 0}: never NaN.
 *
 * Conventions for half-edge arrays: `angle[h]` is the interior angle at the
 * tail of half-edge h, so the angle opposite h is `angle[prev(h)]`.
 */
import type { IntrinsicMesh } from './intrinsic.js';
import { prev } from '../mesh/topology.js';

/** Kahan's stable triangle area from three side lengths (0 when they do not form a triangle). */
export function triangleArea(a: number, b: number, c: number): number {
  // sort so that a >= b >= c
  if (a < b) { const t = a; a = b; b = t; }
  if (b < c) { const t = b; b = c; c = t; }
  if (a < b) { const t = a; a = b; b = t; }
  const p = (a + (b + c)) * (c - (a - b)) * (c + (a - b)) * (a + (b - c));
  return p > 0 ? 0.25 * Math.sqrt(p) : 0;
}

/** Angle opposite side `a` in the triangle with sides a, b, c (radians, in [0, π]). */
export function angleOpposite(a: number, b: number, c: number): number {
  return Math.atan2(4 * triangleArea(a, b, c), b * b + c * c - a * a);
}

/**
 * Cotangent of the angle opposite side `a`. Finite always: a triangle of zero
 * area gets cot clamped to ±`COT_LIMIT` (or 0 when the numerator vanishes).
 */
export function cotOpposite(a: number, b: number, c: number): number {
  const d = b * b + c * c - a * a;
  const s = 4 * triangleArea(a, b, c);
  return safeCot(d, s);
}

/** Bound on |cot θ| for zero-area triangles, so nothing downstream sees Infinity. */
export const COT_LIMIT = 1e8;

function safeCot(d: number, s: number): number {
  if (s > 0) {
    const c = d / s;
    return c > COT_LIMIT ? COT_LIMIT : c < -COT_LIMIT ? -COT_LIMIT : c;
  }
  return d > 0 ? COT_LIMIT : d < 0 ? -COT_LIMIT : 0;
}

/** Side lengths of face f in half-edge order: l[k] = length of half-edge 3f+k. */
function sides(m: IntrinsicMesh, f: number): [number, number, number] {
  const { edgeOf } = m.topology;
  const L = m.edgeLength;
  return [L[edgeOf[3 * f]!]!, L[edgeOf[3 * f + 1]!]!, L[edgeOf[3 * f + 2]!]!];
}

/** Area of every face. */
export function faceAreas(m: IntrinsicMesh, out = new Float64Array(m.topology.nf)): Float64Array {
  for (let f = 0; f < m.topology.nf; f++) {
    const [a, b, c] = sides(m, f);
    out[f] = triangleArea(a, b, c);
  }
  return out;
}

/** Interior angle at the tail vertex of every half-edge. */
export function cornerAngles(m: IntrinsicMesh, out = new Float64Array(3 * m.topology.nf)): Float64Array {
  for (let f = 0; f < m.topology.nf; f++) {
    const l = sides(m, f);
    const s = 4 * triangleArea(l[0], l[1], l[2]);
    for (let k = 0; k < 3; k++) {
      // angle at tail(3f+k) lies between half-edges 3f+k and prev(3f+k) = 3f+(k+2)%3;
      // the side opposite it is next(3f+k) = 3f+(k+1)%3
      const a = l[(k + 1) % 3]!, b = l[k]!, c = l[(k + 2) % 3]!;
      out[3 * f + k] = Math.atan2(s, b * b + c * c - a * a);
    }
  }
  return out;
}

/** Cotangent of the angle opposite every half-edge (finite; see {@link COT_LIMIT}). */
export function halfedgeCotans(m: IntrinsicMesh, out = new Float64Array(3 * m.topology.nf)): Float64Array {
  for (let f = 0; f < m.topology.nf; f++) {
    const l = sides(m, f);
    const s = 4 * triangleArea(l[0], l[1], l[2]);
    for (let k = 0; k < 3; k++) {
      const a = l[k]!, b = l[(k + 1) % 3]!, c = l[(k + 2) % 3]!;
      out[3 * f + k] = safeCot(b * b + c * c - a * a, s);
    }
  }
  return out;
}

/** Cotangent edge weights w_e = (cot α + cot β) / 2 (one term on boundary edges). */
export function edgeCotanWeights(m: IntrinsicMesh, out = new Float64Array(m.topology.ne)): Float64Array {
  const cot = halfedgeCotans(m);
  out.fill(0);
  const { edgeOf } = m.topology;
  for (let h = 0; h < cot.length; h++) out[edgeOf[h]!]! += 0.5 * cot[h]!;
  return out;
}

/** Vertex area: one third of the area of each incident face. */
export function barycentricVertexAreas(m: IntrinsicMesh, out = new Float64Array(m.topology.nv)): Float64Array {
  const t = m.topology;
  const A = faceAreas(m);
  out.fill(0);
  for (let f = 0; f < t.nf; f++) {
    const a3 = A[f]! / 3;
    out[t.tri[3 * f]!]! += a3;
    out[t.tri[3 * f + 1]!]! += a3;
    out[t.tri[3 * f + 2]!]! += a3;
  }
  return out;
}

/**
 * Mixed Voronoi vertex areas (Meyer, Desbrun, Schröder, Barr 2003): the
 * Voronoi share in non-obtuse triangles, A/2 at an obtuse corner and A/4 at the
 * other two corners of an obtuse triangle. They sum to the total area.
 */
export function mixedVoronoiVertexAreas(m: IntrinsicMesh, out = new Float64Array(m.topology.nv)): Float64Array {
  const t = m.topology;
  const ang = cornerAngles(m);
  const cot = halfedgeCotans(m);
  const L = m.edgeLength;
  out.fill(0);
  const half = Math.PI / 2;
  for (let f = 0; f < t.nf; f++) {
    const h0 = 3 * f;
    const [a, b, c] = sides(m, f);
    const area = triangleArea(a, b, c);
    let obtuse = -1;
    for (let k = 0; k < 3; k++) if (ang[h0 + k]! > half) obtuse = k;
    for (let k = 0; k < 3; k++) {
      const h = h0 + k;
      const v = t.tri[h]!;
      if (obtuse < 0) {
        // ⅛ (|h|² cot(opposite h) + |prev h|² cot(opposite prev h))
        const hp = prev(h);
        const lh = L[t.edgeOf[h]!]!, lp = L[t.edgeOf[hp]!]!;
        out[v]! += 0.125 * (lh * lh * cot[h]! + lp * lp * cot[hp]!);
      } else {
        out[v]! += obtuse === k ? area / 2 : area / 4;
      }
    }
  }
  return out;
}
