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
 *
 * Curve sources ({@link SourcePoisson}): pinning one vertex leaves the value
 * on each source curve free, and with two or more loops (an annulus from its
 * boundary) the least-squares φ differs between them by O(h)·(loop length),
 * which one shift per component cannot undo. There the source vertices are
 * held at their Dirichlet data instead (heat-sources.ts, sourceDirichlet):
 * L_FF φ_F = b_F − L_FD g_D, the standard elimination of known values in
 * the finite-element Poisson problem. L_FF depends on the source set, so it
 * is factored per source set (one numeric factorization on the shared
 * symbolic analysis, about the cost of one factorization in prepare) and
 * kept for the next call with the same fixed vertices.
 */
import type { CholeskySymbolic } from '../linalg/index.js';
import { CholeskyFactor } from '../linalg/index.js';
import { combine, constrainRows, liftDirichlet, patternMatrix, type EdgePattern } from '../metric/laplacian.js';

/**
 * The Poisson matrix: L with one pinned vertex per component (the vertex of
 * largest mass, the best-conditioned row). Returns its values on the shared
 * pattern and the rows whose right-hand side must be zeroed (`blocked`:
 * pinned and inactive vertices). When its factorization fails (singular),
 * use {@link factorShiftedPoisson}.
 */
export function pinnedPoisson(
  p: EdgePattern, Lv: Float64Array, Mv: Float64Array, inactive: Uint8Array, vertexComponent: Int32Array, count: number,
): { values: Float64Array; blocked: Uint8Array } {
  const nv = p.n;
  const blocked = inactive.slice();
  const best = new Int32Array(count).fill(-1);
  for (let v = 0; v < nv; v++) {
    const c = vertexComponent[v]!;
    if (c < 0 || inactive[v]) continue;
    if (best[c]! < 0 || Mv[v]! > Mv[best[c]!]!) best[c] = v;
  }
  for (let c = 0; c < count; c++) if (best[c]! >= 0) blocked[best[c]!] = 1;
  const values = Lv.slice();
  constrainRows(p, values, blocked);
  return { values, blocked };
}

/**
 * The fallback of {@link pinnedPoisson}: factors L + εM (ε = 1e-8/h²) with
 * the inactive rows fixed; its blocked rows are the inactive ones.
 */
export function factorShiftedPoisson(
  p: EdgePattern, sym: CholeskySymbolic, Lv: Float64Array, Mv: Float64Array, inactive: Uint8Array, h: number,
): { factor: CholeskyFactor; blocked: Uint8Array } {
  const S = combine(p, 1, Lv, 1e-8 / (h * h), Mv);
  constrainRows(p, S, inactive);
  return { factor: CholeskyFactor.factor(patternMatrix(p, S), sym), blocked: inactive.slice() };
}

/**
 * Poisson solves with Dirichlet data on a source set's vertices (see the
 * module comment). Components without a fixed vertex get one pinned vertex
 * (their values are meaningless; the caller marks them unreachable).
 */
export class SourcePoisson {
  private key: Uint8Array | null = null;
  private factor: CholeskyFactor | null = null;
  private readonly blocked: Uint8Array;
  private readonly rhs: Float64Array;
  private readonly gb: Float64Array;

  constructor(
    private readonly p: EdgePattern, private readonly sym: CholeskySymbolic, private readonly Lv: Float64Array,
    private readonly inactive: Uint8Array, private readonly comp: Int32Array, private readonly count: number,
  ) {
    this.blocked = new Uint8Array(p.n);
    this.rhs = new Float64Array(p.n);
    this.gb = new Float64Array(p.n);
  }

  /**
   * φ with φ_v = g_v where fixed[v] and L φ = b on the other active rows.
   * Throws `NUMERIC` when L_FF cannot be factored. Returns the time this call
   * spent factoring, ms (0 when the cached factor was reused).
   */
  solve(fixed: Uint8Array, g: Float64Array, b: Float64Array, phi: Float64Array): number {
    const { p, blocked, rhs, inactive, comp } = this;
    let factorMs = 0;
    if (!this.factor || !sameMask(this.key!, fixed)) {
      const t0 = performance.now();
      this.factor = null;
      const has = new Uint8Array(this.count);
      for (let v = 0; v < p.n; v++) {
        blocked[v] = inactive[v]! | fixed[v]!;
        if (fixed[v] && comp[v]! >= 0) has[comp[v]!] = 1;
      }
      for (let v = 0; v < p.n; v++) {
        const c = comp[v]!;
        if (c >= 0 && !has[c] && !inactive[v]) { has[c] = 1; blocked[v] = 1; }
      }
      const P = this.Lv.slice();
      constrainRows(p, P, blocked);
      this.factor = CholeskyFactor.factor(patternMatrix(p, P), this.sym);
      this.key = fixed.slice();
      factorMs = performance.now() - t0;
    }
    rhs.set(b);
    const gb = this.gb.fill(0);
    for (let v = 0; v < p.n; v++) if (fixed[v] && !inactive[v]) gb[v] = g[v]!;
    liftDirichlet(p, this.Lv, 1, blocked, gb, rhs);
    this.factor.solve(rhs, phi);
    return factorMs;
  }
}

function sameMask(a: Uint8Array, b: Uint8Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}
