/**
 * Dense kernels of the multifrontal factorization, on a row-major frontal
 * matrix F of order nr (stride nr) whose first nc columns are being
 * eliminated:
 *
 * ```
 *        nc     m = nr − nc
 *   [ F₁₁  ·  ]      F₁₁ = L₁₁ L₁₁ᵀ                 (panel: Cholesky–Crout)
 *   [ F₂₁  F₂₂ ]     L₂₁ = F₂₁ L₁₁⁻ᵀ                (panel, same loop)
 *                    U   = F₂₂ − L₂₁ L₂₁ᵀ           (Schur complement)
 * ```
 *
 * Row-major storage makes every inner product run over contiguous memory:
 * F(i, j) −= Σ_k L(i, k) L(j, k) reads rows i and j from column 0 up. The
 * Schur update works on 2×2 tiles to reuse each loaded value twice.
 * Kernels never throw; the panel returns the failing local column or −1.
 */

/**
 * Factors the first nc columns of F in place (lower triangle, Crout order):
 *   L(j,j) = sqrt(F(j,j) − Σ_{k<j} L(j,k)²),  L(i,j) = (F(i,j) − Σ_{k<j} L(i,k) L(j,k)) / L(j,j).
 * Returns −1, or the local column whose pivot is not a positive finite
 * number (then F(j,j) holds that value).
 */
export function factorPanel(F: Float64Array, off: number, nr: number, nc: number): number {
  for (let j = 0; j < nc; j++) {
    const rj = off + j * nr;
    let d = F[rj + j]!;
    for (let k = 0; k < j; k++) {
      const v = F[rj + k]!;
      d -= v * v;
    }
    if (!(d > 0 && d < Infinity)) {
      F[rj + j] = d;
      return j;
    }
    const ljj = Math.sqrt(d);
    F[rj + j] = ljj;
    const inv = 1 / ljj;
    let i = j + 1;
    for (; i + 1 < nr; i += 2) {
      const ri = off + i * nr, ri1 = ri + nr;
      let s0 = F[ri + j]!, s1 = F[ri1 + j]!;
      for (let k = 0; k < j; k++) {
        const b = F[rj + k]!;
        s0 -= F[ri + k]! * b;
        s1 -= F[ri1 + k]! * b;
      }
      F[ri + j] = s0 * inv;
      F[ri1 + j] = s1 * inv;
    }
    if (i < nr) {
      const ri = off + i * nr;
      let s0 = F[ri + j]!;
      for (let k = 0; k < j; k++) s0 -= F[ri + k]! * F[rj + k]!;
      F[ri + j] = s0 * inv;
    }
  }
  return -1;
}

/**
 * Schur complement on the lower triangle of the trailing block:
 * F(i, j) −= Σ_{k<nc} F(i, k) F(j, k) for nc ≤ j ≤ i < nr.
 */
export function schurUpdate(F: Float64Array, off: number, nr: number, nc: number): void {
  let i = nc;
  for (; i + 1 < nr; i += 2) {
    const ri = off + i * nr, ri1 = ri + nr;
    let j = nc;
    for (; j < i; j += 2) {
      // full 2×2 tile: rows i, i+1 × columns j, j+1 (j + 1 < i + 1)
      const rj = off + j * nr, rj1 = rj + nr;
      let s00 = 0, s01 = 0, s10 = 0, s11 = 0;
      for (let k = 0; k < nc; k++) {
        const a0 = F[ri + k]!, a1 = F[ri1 + k]!, b0 = F[rj + k]!, b1 = F[rj1 + k]!;
        s00 += a0 * b0;
        s01 += a0 * b1;
        s10 += a1 * b0;
        s11 += a1 * b1;
      }
      F[ri + j]! -= s00;
      F[ri + j + 1]! -= s01;
      F[ri1 + j]! -= s10;
      F[ri1 + j + 1]! -= s11;
    }
    // diagonal tile j = i: entries (i,i), (i+1,i), (i+1,i+1)
    let s00 = 0, s10 = 0, s11 = 0;
    for (let k = 0; k < nc; k++) {
      const a0 = F[ri + k]!, a1 = F[ri1 + k]!;
      s00 += a0 * a0;
      s10 += a1 * a0;
      s11 += a1 * a1;
    }
    F[ri + i]! -= s00;
    F[ri1 + i]! -= s10;
    F[ri1 + i + 1]! -= s11;
  }
  if (i < nr) {
    // last row alone
    const ri = off + i * nr;
    for (let j = nc; j <= i; j++) {
      const rj = off + j * nr;
      let s = 0;
      for (let k = 0; k < nc; k++) s += F[ri + k]! * F[rj + k]!;
      F[ri + j]! -= s;
    }
  }
}
