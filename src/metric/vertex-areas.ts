/**
 * Vertex areas: each face's area shared out among its corners, the diagonal
 * mass of the P1 finite elements and the area curvature is averaged over.
 * Built on triangle.ts's per-face areas, angles and cotangents (Kahan's
 * formulas and the library's one cotangent rule), so a face without area
 * adds no area to any vertex.
 *
 * Barycentric: one third of each incident face (the lumped mass matrix).
 * Mixed Voronoi (Meyer, Desbrun, Schröder & Barr, "Discrete
 * Differential-Geometry Operators for Triangulated 2-Manifolds", 2003): the
 * Voronoi share of a non-obtuse triangle, A/2 at an obtuse corner and A/4 at
 * the other two. Both sum to the total area.
 */
import type { IntrinsicMesh } from './intrinsic.js';
import { prev } from '../mesh/topology.js';
import { faceAreas, cornerAngles, halfedgeCotans, type FaceArrays } from './triangle.js';

/**
 * Vertex area: one third of the area of each incident face (the lumped,
 * barycentric mass matrix of the P1 finite elements; the library's one
 * lumped mass, also exported as `lumpedMass` from laplacian.ts).
 */
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
 * `given`: the angles, cotangents and areas of `m` when the caller has them.
 */
export function mixedVoronoiVertexAreas(m: IntrinsicMesh, out = new Float64Array(m.topology.nv), given: FaceArrays = {}): Float64Array {
  const t = m.topology;
  const ang = given.angles ?? cornerAngles(m);
  const cot = given.cotans ?? halfedgeCotans(m);
  const A = given.areas ?? faceAreas(m);
  const L = m.edgeLength;
  out.fill(0);
  const half = Math.PI / 2;
  for (let f = 0; f < t.nf; f++) {
    const h0 = 3 * f;
    const area = A[f]!;
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
