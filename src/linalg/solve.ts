/**
 * Triangular solves with a CSC lower-triangular factor whose diagonal entry
 * is stored first in each column (Lp[j] holds L(j, j)). In place, no
 * allocation.
 *
 *   forward  (L y = b, by columns):  y_j = b_j / L(j,j);  b_i −= L(i,j)·y_j for i > j
 *   backward (Lᵀ x = y, by columns): x_j = (y_j − Σ_{i>j} L(i,j)·x_i) / L(j,j)
 */

/** Solves L·x = b in place (x holds b on entry). */
export function lowerSolve(n: number, Lp: Int32Array, Li: Int32Array, Lx: Float64Array, x: Float64Array): void {
  for (let j = 0; j < n; j++) {
    const p0 = Lp[j]!, p1 = Lp[j + 1]!;
    const xj = x[j]! / Lx[p0]!;
    x[j] = xj;
    if (xj === 0) continue;
    for (let p = p0 + 1; p < p1; p++) x[Li[p]!]! -= Lx[p]! * xj;
  }
}

/** Solves Lᵀ·x = b in place (x holds b on entry). */
export function lowerTransposeSolve(n: number, Lp: Int32Array, Li: Int32Array, Lx: Float64Array, x: Float64Array): void {
  for (let j = n - 1; j >= 0; j--) {
    const p0 = Lp[j]!, p1 = Lp[j + 1]!;
    let s = x[j]!;
    for (let p = p0 + 1; p < p1; p++) s -= Lx[p]! * x[Li[p]!]!;
    x[j] = s / Lx[p0]!;
  }
}
