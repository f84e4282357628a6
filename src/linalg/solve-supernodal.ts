/**
 * Triangular solves with the supernodal factor: supernode s stores its nr × nc
 * block of L by rows (rows R_s: own columns first, then the rows below),
 *
 * ```
 *   [ L₁₁ ]  nc × nc lower triangle, packed: row j holds j + 1 values
 *   [ L₂₁ ]  (nr − nc) × nc, row r belongs to global row R_s[r]
 * ```
 *
 * so both passes read every block row by row, contiguously, and only touch
 * x through one index per block row. In place, no allocation.
 *
 * The forward pass skips a supernode whose part of x is all zero: its y_s is
 * then zero and it updates nothing. Zeros of x stay zero unless a
 * descendant updates them, so with a sparse right-hand side (a point heat
 * source) only the supernodes on the paths from the nonzeros to the roots of
 * the supernodal elimination tree are read: the structure of the solution
 * of L y = b is the set of ancestors of b's nonzeros (Gilbert & Peierls,
 * "Sparse partial pivoting in time proportional to arithmetic operations",
 * SIAM J. Sci. Stat. Comput. 9(5), 1988; Gilbert, "Predicting structure in
 * sparse matrix computations", SIAM J. Matrix Anal. Appl. 15(1), 1994). The
 * skipped work would only add exact zeros, so the result is the same to the
 * bit.
 *
 * A factor that shares blocks with another (multifrontal-pair.ts) passes
 * `own` and `base`: block s is then at own[s] in Lx, or, where own[s] < 0,
 * at valPtr[s] in base.
 */
import { belowBase, type SupernodalStructure } from './supernodes.js';


/**
 * Forward solve L y = x in place with the supernodal factor:
 * per supernode, y_s = L₁₁⁻¹ x_s, then x(R₂) −= L₂₁ y_s.
 */
export function supernodalLowerSolve(
  sn: SupernodalStructure, LxOwn: Float64Array, x: Float64Array, own: Int32Array | null = null, base: Float64Array | null = null,
): void {
  const { nsuper, superStart, rowPtr, rows, valPtr } = sn;
  for (let s = 0; s < nsuper; s++) {
    const f = superStart[s]!, nc = superStart[s + 1]! - f;
    const r0 = rowPtr[s]!, nr = rowPtr[s + 1]! - r0;
    // a zero block of x gives y_s = 0 and no update (module comment)
    let k0 = 0;
    while (k0 < nc && x[f + k0] === 0) k0++;
    if (k0 === nc) continue;
    let Lx = LxOwn, v0 = valPtr[s]!;
    if (own !== null) {
      if (own[s]! >= 0) v0 = own[s]!;
      else Lx = base!;
    }
    const w0 = belowBase(v0, nc);
    for (let j = k0; j < nc; j++) {
      const rj = v0 + ((j * (j + 1)) >> 1);
      let t = x[f + j]!;
      for (let k = 0; k < j; k++) t -= Lx[rj + k]! * x[f + k]!;
      x[f + j] = t / Lx[rj + j]!;
    }
    // x(R₂) −= L₂₁ y_s: four (then two) rows per pass over y_s
    let r = nc;
    for (; r + 3 < nr; r += 4) {
      const q0 = w0 + r * nc, q1 = q0 + nc, q2 = q1 + nc, q3 = q2 + nc;
      let t0 = 0, t1 = 0, t2 = 0, t3 = 0;
      for (let k = 0; k < nc; k++) {
        const y = x[f + k]!;
        t0 += Lx[q0 + k]! * y;
        t1 += Lx[q1 + k]! * y;
        t2 += Lx[q2 + k]! * y;
        t3 += Lx[q3 + k]! * y;
      }
      x[rows[r0 + r]!]! -= t0;
      x[rows[r0 + r + 1]!]! -= t1;
      x[rows[r0 + r + 2]!]! -= t2;
      x[rows[r0 + r + 3]!]! -= t3;
    }
    for (; r + 1 < nr; r += 2) {
      const q0 = w0 + r * nc, q1 = q0 + nc;
      let t0 = 0, t1 = 0;
      for (let k = 0; k < nc; k++) {
        const y = x[f + k]!;
        t0 += Lx[q0 + k]! * y;
        t1 += Lx[q1 + k]! * y;
      }
      x[rows[r0 + r]!]! -= t0;
      x[rows[r0 + r + 1]!]! -= t1;
    }
    if (r < nr) {
      const q0 = w0 + r * nc;
      let t0 = 0;
      for (let k = 0; k < nc; k++) t0 += Lx[q0 + k]! * x[f + k]!;
      x[rows[r0 + r]!]! -= t0;
    }
  }
}

/**
 * Backward solve Lᵀ x = y in place: per supernode in reverse,
 * y_s −= L₂₁ᵀ x(R₂), then x_s = L₁₁⁻ᵀ y_s.
 */
export function supernodalLowerTransposeSolve(
  sn: SupernodalStructure, LxOwn: Float64Array, x: Float64Array, own: Int32Array | null = null, base: Float64Array | null = null,
): void {
  // Every loop runs downwards, so the whole pass reads Lx as one descending
  // stream (hardware prefetchers lose an ascending stream that restarts at
  // every block of a descending sweep).
  for (let s = sn.nsuper - 1; s >= 0; s--) {
    if (own !== null && own[s]! < 0) backwardBlock(sn, s, base!, sn.valPtr[s]!, x);
    else backwardBlock(sn, s, LxOwn, own !== null ? own[s]! : sn.valPtr[s]!, x);
  }
}

/** Supernode s's step of the backward solve, its block at v0 in Lx. */
export function backwardBlock(sn: SupernodalStructure, s: number, Lx: Float64Array, v0: number, x: Float64Array): void {
  const { superStart, rowPtr, rows } = sn;
  const f = superStart[s]!, nc = superStart[s + 1]! - f;
  const r0 = rowPtr[s]!, nr = rowPtr[s + 1]! - r0;
  const w0 = belowBase(v0, nc);
  // y_s −= L₂₁ᵀ x(R₂): eight (then four) rows of L₂₁ per pass over y_s, so
  // y_s is read and written once per eight rows (terrain 100k: ~20% faster
  // than four; the sums are grouped by four)
  let r = nr - 1;
  for (; r - 7 >= nc; r -= 8) {
    const x0 = x[rows[r0 + r]!]!, x1 = x[rows[r0 + r - 1]!]!, x2 = x[rows[r0 + r - 2]!]!, x3 = x[rows[r0 + r - 3]!]!;
    const x4 = x[rows[r0 + r - 4]!]!, x5 = x[rows[r0 + r - 5]!]!, x6 = x[rows[r0 + r - 6]!]!, x7 = x[rows[r0 + r - 7]!]!;
    const q0 = w0 + r * nc, q1 = q0 - nc, q2 = q1 - nc, q3 = q2 - nc, q4 = q3 - nc, q5 = q4 - nc, q6 = q5 - nc, q7 = q6 - nc;
    for (let k = nc - 1; k >= 0; k--) {
      x[f + k]! -= (Lx[q0 + k]! * x0 + Lx[q1 + k]! * x1 + Lx[q2 + k]! * x2 + Lx[q3 + k]! * x3)
        + (Lx[q4 + k]! * x4 + Lx[q5 + k]! * x5 + Lx[q6 + k]! * x6 + Lx[q7 + k]! * x7);
    }
  }
  for (; r - 3 >= nc; r -= 4) {
    const x0 = x[rows[r0 + r]!]!, x1 = x[rows[r0 + r - 1]!]!, x2 = x[rows[r0 + r - 2]!]!, x3 = x[rows[r0 + r - 3]!]!;
    const q0 = w0 + r * nc, q1 = q0 - nc, q2 = q1 - nc, q3 = q2 - nc;
    for (let k = nc - 1; k >= 0; k--) {
      x[f + k]! -= Lx[q0 + k]! * x0 + Lx[q1 + k]! * x1 + Lx[q2 + k]! * x2 + Lx[q3 + k]! * x3;
    }
  }
  for (; r >= nc; r--) {
    const xr = x[rows[r0 + r]!]!;
    const q0 = w0 + r * nc;
    for (let k = nc - 1; k >= 0; k--) x[f + k]! -= Lx[q0 + k]! * xr;
  }
  diagonalBackward(Lx, v0, f, nc, x);
}

/**
 * L₁₁ᵀ x_s = y_s for the diagonal block at v0 (columns f … f + nc − 1), by
 * rows of L₁₁: x_j = y_j / L(j,j), then y_k −= L(j,k) x_j for k < j.
 */
export function diagonalBackward(Lx: Float64Array, v0: number, f: number, nc: number, x: Float64Array): void {
  for (let j = nc - 1; j >= 0; j--) {
    const rj = v0 + ((j * (j + 1)) >> 1);
    const xj = x[f + j]! / Lx[rj + j]!;
    x[f + j] = xj;
    if (xj === 0) continue;
    for (let k = j - 1; k >= 0; k--) x[f + k]! -= Lx[rj + k]! * xj;
  }
}
