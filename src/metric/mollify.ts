/**
 * Intrinsic mollification (Sharp & Crane, "A Laplacian for nonmanifold
 * triangle meshes", CGF 39(5), 2020).
 *
 * Adding one constant ε to every edge length changes each triangle-inequality
 * margin l_j + l_k − l_i by +ε (two lengths gain ε, one loses ε), so
 *   ε = max(0, max over faces and corners of δ − (l_j + l_k − l_i))
 * is the smallest uniform addition that makes every face satisfy
 * l_j + l_k − l_i ≥ δ strictly. Relative changes are ε / l, tiny when δ is a
 * small fraction of the mean edge length h.
 */
import type { IntrinsicMesh } from './intrinsic.js';
import { meanEdgeLength } from './intrinsic.js';

/** Result of {@link mollify}. */
export interface Mollified {
  /** The mesh with lengths ℓ + ε (the input object itself when ε = 0). */
  mesh: IntrinsicMesh;
  /** The uniform length added to every edge, in mesh units. */
  epsilon: number;
  /** The margin δ that was asked for, in mesh units. */
  delta: number;
}

/** Default δ as a fraction of the mean edge length. */
export const DEFAULT_MOLLIFY_DELTA = 1e-5;

/**
 * Makes every face satisfy the strict triangle inequality by at least
 * δ = `relativeDelta` · h (h = mean edge length). Never modifies the input;
 * returns it unchanged when no face needs help.
 */
export function mollify(m: IntrinsicMesh, relativeDelta = DEFAULT_MOLLIFY_DELTA): Mollified {
  const { topology: t, edgeLength: L } = m;
  const delta = Math.max(0, relativeDelta) * meanEdgeLength(m);
  let eps = 0;
  for (let f = 0; f < t.nf; f++) {
    const a = L[t.edgeOf[3 * f]!]!, b = L[t.edgeOf[3 * f + 1]!]!, c = L[t.edgeOf[3 * f + 2]!]!;
    const need = Math.max(delta - (b + c - a), delta - (a + c - b), delta - (a + b - c));
    if (need > eps) eps = need;
  }
  if (!(eps > 0)) return { mesh: m, epsilon: 0, delta };
  const out = new Float64Array(L.length);
  for (let e = 0; e < L.length; e++) out[e] = L[e]! + eps;
  return { mesh: { topology: t, edgeLength: out }, epsilon: eps, delta };
}
