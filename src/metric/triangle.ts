/**
 * Triangle quantities from side lengths alone.
 *
 * Area by Kahan's needle-safe formula (W. Kahan, "Miscalculating area and
 * angles of a needle-like triangle", 2000/2014): with a ≥ b ≥ c,
 *   A = ¼ √((a + (b + c))(c − (a − b))(c + (a − b))(a + (b − c))).
 * Angles by the same paper's formula: for the angle C opposite side c, with
 * the other two sides a ≥ b,
 *   μ = c − (a − b) if b ≥ c, else b − (a − c);
 *   C = 2·atan √(((a − b) + c)·μ / ((a + (b + c))·((a − c) + b))),
 * parentheses as written. Every angle of a needle or a cap keeps its relative
 * accuracy, so the three sum to π within a few ulps (the cosine rule
 * b² + c² − a² loses all digits of the angles next to a needle's short side,
 * and a flat vertex ringed by needles then showed a false angle defect).
 *
 * Degenerate triangles, chosen so that the angles always sum to π (which is
 * what makes discrete Gauss–Bonnet exact on every mesh):
 * - collinear (c = a + b): angles {π, 0, 0}; lengths that break the triangle
 *   inequality are treated the same (area 0, never NaN);
 * - one side zero, the other two equal (two corners coincide): {π/2, π/2, 0},
 *   the limit of an isosceles triangle whose base shrinks;
 * - all sides zero (three coincident corners): {π/3, π/3, π/3} by convention.
 * Side lengths far from 1 (beyond 2^±300) are scaled by an exact power of two
 * first, so products neither overflow nor underflow.
 *
 * Cotangents, one rule for the whole library (every cotangent, cotangent
 * weight, Laplacian entry and Delaunay test is computed by {@link cotOpposite}
 * or {@link faceCotans}):
 *   cot = (b² + c² − a²) / (4A), A by Kahan's formula above;
 *   a triangle whose area A is 0 (collinear, a spike, coincident corners,
 *   lengths that break the triangle inequality) has cotangent 0 at all three
 *   corners: it adds nothing to any cotangent weight, and it is never the
 *   reason an edge is flipped (a flip next to it is impossible anyway: the
 *   unfolding below needs area on both sides).
 * So no cotangent is ever NaN. Operators that assemble weights into a matrix
 * ({@link halfedgeCotans}, the cotangent Laplacian) also bound each one to
 * ±{@link COT_LIMIT}, which only angles within 1e-8 rad of 0 or π reach; the
 * Delaunay test reads the unbounded value. Mass is one third of the area per
 * corner (vertex-areas.ts's `barycentricVertexAreas`), so a zero-area face adds no mass.
 *
 * Laying a triangle out from its lengths, one home ({@link placeThirdCorner}):
 * side AB of length l on the +x axis from the origin, C above it at
 *   cx = (l² + |CA|² − |BC|²) / (2l),  cy = 2A / l,
 * so a needle keeps its small height; a zero-length AB puts C at (0, |CA|).
 *
 * Conventions for half-edge arrays: `angle[h]` is the interior angle at the
 * tail of half-edge h, so the angle opposite h is `angle[prev(h)]`.
 */
import type { IntrinsicMesh } from './intrinsic.js';

/** Kahan's stable triangle area from three side lengths (0 when they do not form a triangle). */
export function triangleArea(a: number, b: number, c: number): number {
  // sort so that a >= b >= c
  if (a < b) { const t = a; a = b; b = t; }
  if (b < c) { const t = b; b = c; c = t; }
  if (a < b) { const t = a; a = b; b = t; }
  const p = (a + (b + c)) * (c - (a - b)) * (c + (a - b)) * (a + (b - c));
  return p > 0 ? 0.25 * Math.sqrt(p) : 0;
}

/**
 * Radius ratio R/(2r) of the triangle with sides a, b, c (circumradius R =
 * abc/4A, inradius r = A/s, s the half perimeter): abc·(a + b + c) / (16 A²),
 * 1 for an equilateral triangle, growing without bound as it flattens
 * (Shewchuk, "What is a good linear finite element?", 2002). Infinity
 * without area; never under 1 (rounding can put an equilateral a few ulps below).
 */
export function radiusRatio(a: number, b: number, c: number): number {
  const A = triangleArea(a, b, c);
  if (!(A > 0)) return Infinity;
  const r = (a * b * c * (a + b + c)) / (16 * A * A);
  return r < 1 ? 1 : r;
}

/**
 * Third corner C of a triangle laid out with side AB (length `l`) on the +x
 * axis from the origin and C above it (see the module comment), given
 * |BC| = `ln`, |CA| = `lp` and the triangle's `area` (Kahan's, from
 * {@link triangleArea}); writes (cx, cy) to out[o], out[o+1]. A zero-length
 * AB puts C at (0, |CA|); a zero area puts C on the axis.
 */
export function placeThirdCorner(l: number, ln: number, lp: number, area: number, out: Float64Array | number[], o: number): void {
  if (l > 0) {
    out[o] = (l * l + lp * lp - ln * ln) / (2 * l);
    out[o + 1] = (2 * area) / l;
  } else {
    out[o] = 0;
    out[o + 1] = lp;
  }
}

/**
 * Unfolds the two triangles (a, b, c) and (b, a, d) that share side ab into the
 * plane and returns the length of the other diagonal cd (the edge a flip of ab
 * would make):
 *
 * ```
 *        c
 *       / \
 *      a---b      a = (0, 0), b = (lab, 0), c above the axis, d below it
 *       \ /
 *        d
 * ```
 *
 * Returns NaN, leaving `out` untouched, when either triangle has no area (or
 * lab is not positive). `out`, when given, receives xc, yc, xd, yd.
 */
export function unfoldedDiagonal(lab: number, lbc: number, lca: number, lad: number, ldb: number, out?: Float64Array | number[]): number {
  const A0 = triangleArea(lab, lbc, lca), A1 = triangleArea(lab, lad, ldb);
  if (!(A0 > 0 && A1 > 0 && lab > 0)) return NaN;
  const q = out ?? [0, 0, 0, 0];
  placeThirdCorner(lab, lbc, lca, A0, q, 0);
  placeThirdCorner(lab, ldb, lad, A1, q, 2); // d mirrored: laid out above, then read below the axis
  return Math.hypot(q[0]! - q[2]!, q[1]! + q[3]!);
}

/** Angle opposite side `a` in the triangle with sides a, b, c (radians, in [0, π]; see the module comment). */
export function angleOpposite(a: number, b: number, c: number): number {
  anglesOfSides(a, b, c, scratch, 0);
  return scratch[0]!;
}

/** Written and read within one call of {@link angleOpposite} (no callback in between, so re-entrant). */
const scratch = new Float64Array(3);
const HUGE = 2 ** 300, TINY = 2 ** -300;

/**
 * Kahan's angle opposite side `c` of a triangle whose other sides are
 * `a ≥ b`, for lengths that satisfy the triangle inequality. 0/0 happens
 * only for b = 0, c = a (two coincident corners): π/2.
 */
function kahanAngle(a: number, b: number, c: number): number {
  const mu = b >= c ? c - (a - b) : b - (a - c);
  const num = (a - b + c) * mu;
  const den = (a + (b + c)) * (a - c + b);
  const r = num / den;
  return r === r ? 2 * Math.atan(Math.sqrt(r)) : Math.PI / 2; // r > 0 / 0 = ∞ gives π
}

/**
 * Writes the angles opposite sides l0, l1, l2 to `out[o]`, `out[o+1]`,
 * `out[o+2]`. They sum to π for every input (see the module comment).
 */
export function anglesOfSides(l0: number, l1: number, l2: number, out: Float64Array | number[], o: number): void {
  let x = l0, y = l1, z = l2; // sort a copy: x ≥ y ≥ z
  if (x < y) { const t = x; x = y; y = t; }
  if (y < z) { const t = y; y = z; z = t; }
  if (x < y) { const t = x; x = y; y = t; }
  if (!(x > 0)) {
    out[o] = out[o + 1] = out[o + 2] = Math.PI / 3;
    return;
  }
  if (x > HUGE || x < TINY) {
    const s = 2 ** -Math.round(Math.log2(x)); // exact scaling
    l0 *= s; l1 *= s; l2 *= s; z *= s; y *= s; x *= s;
  }
  if (z - (x - y) <= 0) {
    // collinear or not a triangle: π opposite the longest side (the first one if tied)
    if (z - (x - y) === 0 && z === 0) {
      // spike: z = 0, x = y
      const iz = l2 === 0 ? 2 : l1 === 0 ? 1 : 0;
      out[o] = out[o + 1] = out[o + 2] = Math.PI / 2;
      out[o + iz] = 0;
      return;
    }
    const ix = l0 === x ? 0 : l1 === x ? 1 : 2;
    out[o] = out[o + 1] = out[o + 2] = 0;
    out[o + ix] = Math.PI;
    return;
  }
  out[o] = kahanAngle(l1 > l2 ? l1 : l2, l1 > l2 ? l2 : l1, l0);
  out[o + 1] = kahanAngle(l0 > l2 ? l0 : l2, l0 > l2 ? l2 : l0, l1);
  out[o + 2] = kahanAngle(l0 > l1 ? l0 : l1, l0 > l1 ? l1 : l0, l2);
}

/**
 * Cotangent of the angle opposite side `a` in the triangle with sides a, b, c:
 * (b² + c² − a²) / (4A), and 0 when the area A is 0 (the library's one rule
 * for degenerate triangles: see the module comment). Never NaN; not bounded
 * (see {@link COT_LIMIT}).
 */
export function cotOpposite(a: number, b: number, c: number): number {
  return cotOf(b * b + c * c - a * a, 4 * triangleArea(a, b, c));
}

/**
 * Writes the cotangents of the angles opposite sides l0, l1, l2 to `out[o]`,
 * `out[o+1]`, `out[o+2]` (one area for the three; same rule and values as
 * {@link cotOpposite}); returns the triangle's area.
 */
export function faceCotans(l0: number, l1: number, l2: number, out: Float64Array | number[], o: number): number {
  const A = triangleArea(l0, l1, l2), A4 = 4 * A;
  out[o] = cotOf(l1 * l1 + l2 * l2 - l0 * l0, A4);
  out[o + 1] = cotOf(l2 * l2 + l0 * l0 - l1 * l1, A4);
  out[o + 2] = cotOf(l0 * l0 + l1 * l1 - l2 * l2, A4);
  return A;
}

/** The rule itself: numerator b² + c² − a² over 4A, 0 without area. */
function cotOf(num: number, area4: number): number {
  return area4 > 0 ? num / area4 : 0;
}

/**
 * Bound on |cot θ| in assembled weights ({@link halfedgeCotans}, the
 * cotangent Laplacian): reached only by angles within 1e-8 rad of 0 or π,
 * it keeps the weights of a needle finite and within a range the Cholesky
 * factorization handles.
 */
export const COT_LIMIT = 1e8;

/** cot clamped to ±{@link COT_LIMIT}. */
export function boundedCot(cot: number): number {
  return cot > COT_LIMIT ? COT_LIMIT : cot < -COT_LIMIT ? -COT_LIMIT : cot;
}

/** Area of every face (sides in half-edge order: side k is the length of half-edge 3f+k). */
export function faceAreas(m: IntrinsicMesh, out = new Float64Array(m.topology.nf)): Float64Array {
  const { edgeOf } = m.topology;
  const L = m.edgeLength;
  for (let f = 0; f < m.topology.nf; f++) out[f] = triangleArea(L[edgeOf[3 * f]!]!, L[edgeOf[3 * f + 1]!]!, L[edgeOf[3 * f + 2]!]!);
  return out;
}

/** Interior angle at the tail vertex of every half-edge (Kahan's formula; see the module comment). */
export function cornerAngles(m: IntrinsicMesh, out = new Float64Array(3 * m.topology.nf)): Float64Array {
  const { edgeOf } = m.topology;
  const L = m.edgeLength;
  for (let f = 0; f < m.topology.nf; f++) {
    // the angle at tail(3f+k) lies between half-edges 3f+k and prev(3f+k); the side
    // opposite it is next(3f+k) = 3f+(k+1)%3. So pass the sides rotated by one.
    const l0 = L[edgeOf[3 * f]!]!, l1 = L[edgeOf[3 * f + 1]!]!, l2 = L[edgeOf[3 * f + 2]!]!;
    anglesOfSides(l1, l2, l0, out, 3 * f);
  }
  return out;
}

/**
 * Per-face arrays of one intrinsic mesh that a caller has already made
 * ({@link cornerAngles}, {@link halfedgeCotans}, {@link faceAreas} of that
 * same mesh), handed on so that the functions taking them do not make them
 * again. Read only.
 */
export interface FaceArrays {
  angles?: Float64Array;
  cotans?: Float64Array;
  areas?: Float64Array;
}

/** Cotangent of the angle opposite every half-edge ({@link faceCotans}, bounded by {@link COT_LIMIT}). */
export function halfedgeCotans(m: IntrinsicMesh, out = new Float64Array(3 * m.topology.nf)): Float64Array {
  const { edgeOf } = m.topology;
  const L = m.edgeLength;
  for (let f = 0; f < m.topology.nf; f++) {
    const h = 3 * f;
    faceCotans(L[edgeOf[h]!]!, L[edgeOf[h + 1]!]!, L[edgeOf[h + 2]!]!, out, h);
    for (let k = h; k < h + 3; k++) out[k] = boundedCot(out[k]!);
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
