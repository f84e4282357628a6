/**
 * The Poisson step of the heat method: L φ = b on each connected component.
 *
 * L is only semi-definite (constants are in its kernel on every component).
 * One vertex per component is pinned (identity row and column, φ = 0 there)
 * instead of adding εM: b sums to zero over each component (Σ_i ∇φ_i = 0 in
 * every face), so the pinned system has the same solution up to a constant,
 * with no ε to trade between bias and conditioning, and the pattern (hence
 * the shared symbolic analysis) is unchanged. If a component is only held
 * together by faces without area (possible with mollification off) the pinned
 * matrix is singular; then L + εM with ε = 1e-8/h² is factored instead.
 */
import type { CholeskySymbolic } from '../linalg/index.js';
import { CholeskyFactor } from '../linalg/index.js';
import { combine, constrainRows, patternMatrix, type EdgePattern } from '../metric/laplacian.js';
import { isOrthodromeError } from '../errors.js';

/**
 * Factors the Poisson matrix: L with one pinned vertex per component (the
 * vertex of largest mass), falling back to L + εM when that is singular.
 * Returns the factor, the rows whose right-hand side must be zeroed
 * (`blocked`: pinned and inactive vertices) and whether the fallback was used.
 */
export function factorPoisson(
  p: EdgePattern, sym: CholeskySymbolic, Lv: Float64Array, Mv: Float64Array, inactive: Uint8Array,
  vertexComponent: Int32Array, count: number, h: number,
): { factor: CholeskyFactor; blocked: Uint8Array; shifted: boolean } {
  const nv = p.n;
  const blocked = inactive.slice();
  // pin the vertex of largest mass in each component (best-conditioned row)
  const best = new Int32Array(count).fill(-1);
  for (let v = 0; v < nv; v++) {
    const c = vertexComponent[v]!;
    if (c < 0 || inactive[v]) continue;
    if (best[c]! < 0 || Mv[v]! > Mv[best[c]!]!) best[c] = v;
  }
  for (let c = 0; c < count; c++) if (best[c]! >= 0) blocked[best[c]!] = 1;
  const P = Lv.slice();
  constrainRows(p, P, blocked);
  try {
    return { factor: CholeskyFactor.factor(patternMatrix(p, P), sym), blocked, shifted: false };
  } catch (e) {
    if (!isOrthodromeError(e) || e.code !== 'NUMERIC') throw e;
  }
  const S = combine(p, 1, Lv, 1e-8 / (h * h), Mv);
  constrainRows(p, S, inactive);
  return { factor: CholeskyFactor.factor(patternMatrix(p, S), sym), blocked: inactive.slice(), shifted: true };
}
