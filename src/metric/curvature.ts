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
 */
import type { IntrinsicMesh } from './intrinsic.js';
import type { Topology } from '../mesh/topology.js';
import { next } from '../mesh/topology.js';
import { cornerAngles, halfedgeCotans, mixedVoronoiVertexAreas } from './triangle.js';
import { boundaryVertexMask } from '../mesh/boundary.js';

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
}

/** Angle defects, boundary turning and Gaussian curvature from edge lengths alone. */
export function gaussianCurvature(m: IntrinsicMesh): Curvature {
  const t = m.topology;
  const ang = cornerAngles(m);
  const boundary = boundaryVertexMask(t);
  const sum = new Float64Array(t.nv);
  for (let h = 0; h < ang.length; h++) sum[t.tri[h]!]! += ang[h]!;
  const angleDefect = new Float64Array(t.nv);
  const vertexArea = mixedVoronoiVertexAreas(m);
  const gaussian = new Float64Array(t.nv);
  let totalInteriorDefect = 0, totalBoundaryTurning = 0;
  for (let v = 0; v < t.nv; v++) {
    if (t.vertexHalfedge[v]! < 0) continue; // isolated
    if (boundary[v]) {
      angleDefect[v] = Math.PI - sum[v]!;
      totalBoundaryTurning += angleDefect[v]!;
    } else {
      angleDefect[v] = 2 * Math.PI - sum[v]!;
      totalInteriorDefect += angleDefect[v]!;
      const a = vertexArea[v]!;
      gaussian[v] = a > 0 ? angleDefect[v]! / a : 0;
    }
  }
  return { boundary, angleDefect, vertexArea, gaussian, totalInteriorDefect, totalBoundaryTurning };
}

/**
 * Mean curvature per vertex from the cotangent Laplacian of positions (needs
 * the embedding). Normals are area-weighted face normals; boundary and
 * zero-area vertices get 0.
 *
 * @param positions - x, y, z per topology vertex
 * @param vertexArea - mixed-Voronoi areas (from {@link gaussianCurvature})
 * @param boundary - boundary mask (from {@link gaussianCurvature})
 */
export function meanCurvature(
  m: IntrinsicMesh,
  positions: Float64Array,
  vertexArea: Float64Array,
  boundary: Uint8Array,
): Float64Array {
  const t: Topology = m.topology;
  const cot = halfedgeCotans(m);
  const lap = new Float64Array(3 * t.nv); // Σ (cot α + cot β)(x_v − x_j)
  const nrm = new Float64Array(3 * t.nv); // Σ face normal × 2·area
  for (let h = 0; h < cot.length; h++) {
    // half-edge h = (i → j) contributes cot(opposite h)·(x_i − x_j) to i and the reverse to j
    const i = t.tri[h]!, j = t.tri[next(h)]!;
    const w = cot[h]!;
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
    for (const v of [a, b, c]) {
      nrm[v]! += nx;
      nrm[v + 1]! += ny;
      nrm[v + 2]! += nz;
    }
  }
  const H = new Float64Array(t.nv);
  for (let v = 0; v < t.nv; v++) {
    const A = vertexArea[v]!;
    if (boundary[v] || !(A > 0)) continue;
    const nl = Math.hypot(nrm[3 * v]!, nrm[3 * v + 1]!, nrm[3 * v + 2]!);
    if (!(nl > 0)) continue;
    let dot = 0;
    for (let d = 0; d < 3; d++) dot += lap[3 * v + d]! * nrm[3 * v + d]!;
    // Δx·n = dot / (2A·|n|) = 2H
    const h = dot / (4 * A * nl);
    H[v] = Number.isFinite(h) ? h : 0;
  }
  return H;
}

/**
 * Gauss–Bonnet residual: Σ interior defects + Σ boundary turning − 2π·χ,
 * with χ summed over components. Zero up to rounding on any valid mesh.
 */
export function gaussBonnetResidual(c: Curvature, eulerCharacteristic: number): number {
  return c.totalInteriorDefect + c.totalBoundaryTurning - 2 * Math.PI * eulerCharacteristic;
}
