/**
 * Polygon faces to triangles. (Fan triangulation for now; see issue notes.)
 */
import type { MeshData } from '../io/mesh-data.js';

/** Triangles of a polygon mesh and the input face each came from. */
export interface Triangulation {
  /** Three vertex indices per triangle. */
  triangles: Uint32Array;
  /** Input polygon index of each triangle. */
  source: Uint32Array;
}

/** Triangulates every polygon of `m` (triangles pass through unchanged). */
export function triangulate(m: MeshData): Triangulation {
  const nf = m.faceOffsets.length - 1;
  let nt = 0;
  for (let f = 0; f < nf; f++) nt += Math.max(0, m.faceOffsets[f + 1]! - m.faceOffsets[f]! - 2);
  const triangles = new Uint32Array(3 * nt);
  const source = new Uint32Array(nt);
  let t = 0;
  for (let f = 0; f < nf; f++) {
    const s = m.faceOffsets[f]!, e = m.faceOffsets[f + 1]!;
    for (let k = s + 1; k + 1 < e; k++) {
      triangles[3 * t] = m.faceIndices[s]!;
      triangles[3 * t + 1] = m.faceIndices[k]!;
      triangles[3 * t + 2] = m.faceIndices[k + 1]!;
      source[t++] = f;
    }
  }
  return { triangles, source };
}
