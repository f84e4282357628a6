/**
 * Discrete curvature from the intrinsic metric (and, for mean curvature, the
 * embedding).
 *
 * - Angle defect at an interior vertex: δ_v = 2π − Σ θ (corner angles at v).
 * - Boundary turning at a boundary vertex: τ_v = π − Σ θ.
 * - Discrete Gauss–Bonnet (exact for polyhedra; Descartes' theorem for closed
 *   ones): Σ_interior δ_v + Σ_boundary τ_v = 2π·χ.
 * - Gaussian curvature K_v = δ_v / A_v with A_v the mixed-Voronoi area (Meyer,
 *   Desbrun, Schröder, Barr 2003).
 * - Mean curvature from the cotangent Laplacian of positions (same source):
 *   Δx_v = (1 / 2A_v) Σ_j (cot α_vj + cot β_vj)(x_v − x_j) = 2 H_v n_v, so
 *   H_v = (Δx_v · n_v) / 2, positive where the surface bends away from the
 *   normal (a sphere with outward normals has H = 1/R).
 * Boundary vertices get K = H = 0 and are flagged: neither is defined there by
 * these formulas.
 *
 * Robustness (what degenerate and sliver triangles do):
 * - corner angles come from Kahan's formula (`triangle.ts`), which keeps
 *   needles and caps accurate and makes every triangle's angles sum to π,
 *   zero-area ones included, so Gauss–Bonnet stays exact on any mesh;
 * - the angles of a thin triangle are ill-conditioned in its side lengths
 *   (from a² = b² + c² − 2bc·cos θ_a, dθ_a/da = a / 2A, and alike for b and
 *   c), so side lengths rounded to a relative ε = 2⁻⁵² leave each corner of
 *   face f uncertain by up to τ_f = 4ε·(a² + b² + c²) / 2A_f + 8επ (at most
 *   π; π for zero-area faces). A vertex's defect is known only to within
 *   Σ τ_f over its corners plus 2πε per corner for the sum; within that
 *   bound K is reported as exactly 0, and so is the per-vertex defect: a flat
 *   vertex ringed by slivers or caps must not turn rounding noise over a tiny
 *   area into a huge K. The totals use the unrounded defects, so discrete
 *   Gauss–Bonnet stays exact;
 * - an interior vertex whose area is 0 (all its triangles have zero area)
 *   gets K = 0 and is counted in `zeroAreaVertices`: K is not defined there;
 * - given the orientation seams of a non-orientable surface, the copies of
 *   a vertex made by the cut share one angle sum, one defect and one area,
 *   so the defects are those of the surface as given.
 */
import { hypot3, type IntrinsicMesh } from './intrinsic.js';
import type { Topology } from '../mesh/topology.js';
import { next } from '../mesh/topology.js';
import { cornerAngles, halfedgeCotans, triangleArea, type FaceArrays } from './triangle.js';
import { mixedVoronoiVertexAreas } from './vertex-areas.js';
import { boundaryVertexMask } from '../mesh/boundary.js';
import { glueSeams } from '../mesh/seams.js';

/** Per-vertex curvature quantities and their totals. */
export interface Curvature {
  /** 1 for boundary vertices. */
  boundary: Uint8Array;
  /** Angle defect (interior) or boundary turning (boundary), radians. */
  angleDefect: Float64Array;
  /** Mixed-Voronoi vertex area, mesh units². */
  vertexArea: Float64Array;
  /** Gaussian curvature δ/A at interior vertices (1/units²); 0 on the boundary. */
  gaussian: Float64Array;
  /** Σ of interior angle defects, radians. */
  totalInteriorDefect: number;
  /** Σ of boundary turning, radians. */
  totalBoundaryTurning: number;
  /** Interior vertices (counted once per seam class) whose area is 0: K is set to 0 there, not defined. */
  zeroAreaVertices: number;
}

/**
 * Rounding bound of each corner angle of a triangle with sides a, b, c and
 * area A, given side lengths accurate to a relative ε (see the module comment).
 */
export function cornerAngleUncertainty(a: number, b: number, c: number, area: number): number {
  const eps = Number.EPSILON;
  const u = area > 0 ? (4 * eps * (a * a + b * b + c * c)) / (2 * area) + 8 * eps * Math.PI : Math.PI;
  return u < Math.PI ? u : Math.PI;
}

/**
 * Angle defects, boundary turning and Gaussian curvature from edge lengths alone.
 *
 * @param seams - `BuildReport.orientationSeams` of a non-orientable surface
 *   (optional): the seam copies of a vertex are then counted as one vertex
 * @param given - the angles, cotangents and areas of `m` when the caller has them
 */
export function gaussianCurvature(m: IntrinsicMesh, seams?: Int32Array, given: FaceArrays = {}): Curvature {
  const t = m.topology;
  const ang = given.angles ?? cornerAngles(m);
  const glued = seams && seams.length > 0 ? glueSeams(t, seams) : null;
  const rep = glued ? glued.rep : null;
  const boundary = glued ? glued.boundary : boundaryVertexMask(t);
  const sum = new Float64Array(t.nv);
  const tol = new Float64Array(t.nv); // rounding bound of each angle sum
  const L = m.edgeLength;
  for (let f = 0; f < t.nf; f++) {
    const a = L[t.edgeOf[3 * f]!]!, b = L[t.edgeOf[3 * f + 1]!]!, c = L[t.edgeOf[3 * f + 2]!]!;
    const u = cornerAngleUncertainty(a, b, c, triangleArea(a, b, c)) + 2 * Math.PI * Number.EPSILON;
    for (let k = 0; k < 3; k++) {
      const h = 3 * f + k;
      const v = rep ? rep[t.tri[h]!]! : t.tri[h]!;
      sum[v]! += ang[h]!;
      tol[v]! += u;
    }
  }
  const vertexArea = mixedVoronoiVertexAreas(m, undefined, given);
  if (rep) {
    for (let v = 0; v < t.nv; v++) if (rep[v] !== v) vertexArea[rep[v]!]! += vertexArea[v]!;
  }
  const angleDefect = new Float64Array(t.nv);
  const gaussian = new Float64Array(t.nv);
  let totalInteriorDefect = 0, totalBoundaryTurning = 0, zeroAreaVertices = 0;
  for (let v = 0; v < t.nv; v++) {
    if (t.vertexHalfedge[v]! < 0 || (rep && rep[v] !== v)) continue; // isolated, or a seam copy
    const raw = (boundary[v] ? Math.PI : 2 * Math.PI) - sum[v]!;
    const d = Math.abs(raw) <= tol[v]! ? 0 : raw;
    angleDefect[v] = d;
    const a = vertexArea[v]!;
    if (boundary[v]) {
      totalBoundaryTurning += raw;
    } else {
      totalInteriorDefect += raw;
      if (a > 0) gaussian[v] = d / a;
      else zeroAreaVertices++;
    }
  }
  if (rep) {
    for (let v = 0; v < t.nv; v++) {
      const r = rep[v]!;
      if (r === v) continue;
      angleDefect[v] = angleDefect[r]!;
      gaussian[v] = gaussian[r]!;
      vertexArea[v] = vertexArea[r]!;
    }
  }
  return { boundary, angleDefect, vertexArea, gaussian, totalInteriorDefect, totalBoundaryTurning, zeroAreaVertices };
}

/**
 * Mean curvature per vertex from the cotangent Laplacian of positions (needs
 * the embedding). Normals are area-weighted face normals; boundary and
 * zero-area vertices get 0.
 *
 * Rounding: the normal of a sliver comes from a cross product that cancels,
 * so on a flat mesh of slivers the in-plane Laplacian picks up a normal part
 * that is pure noise (a tilted flat strip of height 2e-9 gave |H| ≈ 2e8).
 * Each face adds at most 4ε·(M·(|u| + |v|) + |u||v|) to the error of the
 * summed normal N (u, v its edge vectors, M the largest coordinate
 * magnitude), and rounded positions move the Laplacian by at most
 * 2ε·M·Σ|w|; when |Δx·N/|N|| lies within 4·(|Δx|·δN/|N| + 2ε·M·Σ|w|), H is 0.
 *
 * @param positions - x, y, z per topology vertex
 * @param vertexArea - mixed-Voronoi areas (from {@link gaussianCurvature})
 * @param boundary - boundary mask (from {@link gaussianCurvature})
 * @param seams - orientation seams, as for {@link gaussianCurvature}: the
 *   copies of a vertex pool their Laplacian and normal (the normal of a copy
 *   across a seam is turned to agree with its class's), so every copy gets the
 *   value of the whole vertex; its sign is only local on such a surface
 * @param cotans - {@link halfedgeCotans} of `m` when the caller has them
 */
export function meanCurvature(
  m: IntrinsicMesh,
  positions: Float64Array,
  vertexArea: Float64Array,
  boundary: Uint8Array,
  seams?: Int32Array,
  cotans?: Float64Array,
): Float64Array {
  const t: Topology = m.topology;
  const cot = cotans ?? halfedgeCotans(m);
  const lap = new Float64Array(3 * t.nv); // Σ (cot α + cot β)(x_v − x_j)
  const nrm = new Float64Array(3 * t.nv); // Σ face normal × 2·area
  const wsum = new Float64Array(t.nv); // Σ |w| (rounding bound of the Laplacian)
  const nerr = new Float64Array(t.nv); // rounding bound of |nrm|
  let M = 0;
  for (let k = 0; k < positions.length; k++) M = Math.max(M, Math.abs(positions[k]!));
  const eps = Number.EPSILON;
  for (let h = 0; h < cot.length; h++) {
    // half-edge h = (i → j) contributes cot(opposite h)·(x_i − x_j) to i and the reverse to j
    const i = t.tri[h]!, j = t.tri[next(h)]!;
    const w = cot[h]!;
    wsum[i]! += Math.abs(w);
    wsum[j]! += Math.abs(w);
    for (let d = 0; d < 3; d++) {
      const diff = positions[3 * i + d]! - positions[3 * j + d]!;
      lap[3 * i + d]! += w * diff;
      lap[3 * j + d]! -= w * diff;
    }
  }
  for (let f = 0; f < t.nf; f++) {
    const a = 3 * t.tri[3 * f]!, b = 3 * t.tri[3 * f + 1]!, c = 3 * t.tri[3 * f + 2]!;
    const ux = positions[b]! - positions[a]!, uy = positions[b + 1]! - positions[a + 1]!, uz = positions[b + 2]! - positions[a + 2]!;
    const vx = positions[c]! - positions[a]!, vy = positions[c + 1]! - positions[a + 1]!, vz = positions[c + 2]! - positions[a + 2]!;
    const nx = uy * vz - uz * vy, ny = uz * vx - ux * vz, nz = ux * vy - uy * vx;
    const ul = hypot3(ux, uy, uz), vl = hypot3(vx, vy, vz);
    const err = 4 * eps * (M * (ul + vl) + ul * vl);
    // a, b, c in turn (written out: an array literal here was one allocation per face)
    nrm[a]! += nx; nrm[a + 1]! += ny; nrm[a + 2]! += nz; nerr[a / 3]! += err;
    nrm[b]! += nx; nrm[b + 1]! += ny; nrm[b + 2]! += nz; nerr[b / 3]! += err;
    nrm[c]! += nx; nrm[c + 1]! += ny; nrm[c + 2]! += nz; nerr[c / 3]! += err;
  }
  const rep = seams && seams.length > 0 ? glueSeams(t, seams).rep : null;
  if (rep) {
    for (let v = 0; v < t.nv; v++) {
      const r = rep[v]!;
      if (r === v) continue;
      let dot = 0;
      for (let d = 0; d < 3; d++) dot += nrm[3 * r + d]! * nrm[3 * v + d]!;
      const sign = dot < 0 ? -1 : 1;
      for (let d = 0; d < 3; d++) {
        lap[3 * r + d]! += lap[3 * v + d]!;
        nrm[3 * r + d]! += sign * nrm[3 * v + d]!;
      }
      wsum[r]! += wsum[v]!;
      nerr[r]! += nerr[v]!;
    }
  }
  const H = new Float64Array(t.nv);
  for (let v = 0; v < t.nv; v++) {
    if (rep && rep[v] !== v) continue;
    const A = vertexArea[v]!;
    if (boundary[v] || !(A > 0)) continue;
    const nl = hypot3(nrm[3 * v]!, nrm[3 * v + 1]!, nrm[3 * v + 2]!);
    if (!(nl > 0)) continue;
    let dot = 0;
    for (let d = 0; d < 3; d++) dot += lap[3 * v + d]! * nrm[3 * v + d]!;
    const lapLen = hypot3(lap[3 * v]!, lap[3 * v + 1]!, lap[3 * v + 2]!);
    if (Math.abs(dot / nl) <= 4 * (lapLen * (nerr[v]! / nl) + 2 * eps * M * wsum[v]!)) continue; // noise: H = 0
    // Δx·n = dot / (2A·|n|) = 2H
    const h = dot / (4 * A * nl);
    H[v] = Number.isFinite(h) ? h : 0;
  }
  if (rep) for (let v = 0; v < t.nv; v++) H[v] = H[rep[v]!]!;
  return H;
}

/**
 * Gauss–Bonnet residual: Σ interior defects + Σ boundary turning − 2π·χ,
 * with χ summed over components. Zero up to rounding on any valid mesh.
 */
export function gaussBonnetResidual(c: Pick<Curvature, 'totalInteriorDefect' | 'totalBoundaryTurning'>, eulerCharacteristic: number): number {
  return c.totalInteriorDefect + c.totalBoundaryTurning - 2 * Math.PI * eulerCharacteristic;
}
