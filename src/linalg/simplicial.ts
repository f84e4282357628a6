/**
 * Numeric Cholesky factorization P·A·Pᵀ = L·Lᵀ, up-looking (Davis 2006, §4.7):
 * row k of L is found by a sparse triangular solve with the rows above it,
 *
 * ```
 *   [ L₁₁  0  ] [ L₁₁ᵀ l₁₂ ]   [ C₁₁ c₁₂ ]      L₁₁ l₁₂ = c₁₂        (sparse solve)
 *   [ l₁₂ᵀ λ  ] [  0   λ   ] = [ c₁₂ᵀ γ  ]      λ = sqrt(γ − l₁₂ᵀl₁₂)
 * ```
 *
 * The pattern of l₁₂ is the set of nodes reached from the entries of c₁₂
 * climbing the elimination tree (the row subtree), visited so that each
 * L(k, i) is final before it is used. Columns of L are appended to in
 * increasing row order, so rows come out sorted with the diagonal first.
 * Never allocates: all workspaces are passed in.
 */
import type { CholeskySymbolic } from './symbolic.js';

/**
 * Up-looking factorization kernel. Returns −1 on success, or the pivot column
 * k where γ − l₁₂ᵀl₁₂ was not a finite number above its floor (0, or minPivot[k]) (then `Lx[Lp[k]]` holds
 * that value and the factor is incomplete). Never throws.
 */
export function upLookingFactor(
  sym: CholeskySymbolic,
  Cx: Float64Array,
  Li: Int32Array,
  Lx: Float64Array,
  x: Float64Array,
  next: Int32Array,
  stack: Int32Array,
  mark: Int32Array,
  minPivot: Float64Array | null = null,
): number {
  const { n, parent, cColPtr: Cp, cRowIdx: Ci, lColPtr: Lp } = sym;
  mark.fill(-1);
  for (let k = 0; k < n; k++) {
    // pattern of row k: nodes on etree paths from each C(i,k), i < k, up to k,
    // stored in topological order in stack[top..n)
    let top = n;
    mark[k] = k;
    x[k] = 0;
    const p1 = Cp[k + 1]!;
    for (let p = Cp[k]!; p < p1; p++) {
      let i = Ci[p]!;
      x[i] = Cx[p]!; // scatter column k of the upper triangle
      let len = 0;
      while (mark[i] !== k) {
        stack[len++] = i;
        mark[i] = k;
        i = parent[i]!;
      }
      while (len > 0) stack[--top] = stack[--len]!;
    }
    let d = x[k]!;
    x[k] = 0;
    for (; top < n; top++) {
      const i = stack[top]!;
      const pd = Lp[i]!;
      const lki = x[i]! / Lx[pd]!; // L(k,i) = x(i) / L(i,i)
      x[i] = 0;
      const pe = next[i]!;
      for (let p = pd + 1; p < pe; p++) x[Li[p]!]! -= Lx[p]! * lki;
      d -= lki * lki;
      Li[pe] = k;
      Lx[pe] = lki;
      next[i] = pe + 1;
    }
    const pk = Lp[k]!;
    Li[pk] = k;
    if (!(d > (minPivot === null ? 0 : minPivot[k]!) && d < Infinity)) {
      Lx[pk] = d;
      return k;
    }
    Lx[pk] = Math.sqrt(d);
    next[k] = pk + 1;
  }
  return -1;
}

