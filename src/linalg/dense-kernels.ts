/**
 * Dense kernels of the multifrontal factorization, on a row-major frontal
 * matrix F of order nr (stride nr) whose first nc columns are eliminated:
 *
 * ```
 *        nc     m = nr − nc
 *   [ F₁₁  ·  ]      F₁₁ = L₁₁ L₁₁ᵀ
 *   [ F₂₁  F₂₂ ]     L₂₁ = F₂₁ L₁₁⁻ᵀ
 *                    U   = F₂₂ − L₂₁ L₂₁ᵀ        (left in place for the parent)
 * ```
 *
 * Blocked right-looking order: columns are taken NB at a time; a block is
 * factored by Crout inner products over its own columns only (earlier
 * columns were already subtracted), then the whole trailing lower triangle,
 * Schur part included, is updated with that block:
 *
 *   F(i, j) −= Σ_{k ∈ block} L(i, k) L(j, k),   j ≥ block end, i ≥ j.
 *
 * Every inner product runs over NB contiguous doubles of two rows, so the rows
 * being combined stay in cache; the update works on 4×2 tiles to reuse loaded
 * values. Kernels never throw.
 */

import type { SimdFront } from './wasm-update.js';

/** Columns per block of the right-looking loop. */
const NB = 64;

/**
 * Columns per sub-block inside a block: Crout runs over NS columns at a
 * time, and the rest of the block's columns (all rows below) take the
 * sub-block's update in tiles, so scalar inner products stay ≤ NS long.
 */
const NS = 8;

/**
 * Factors the first nc columns of the nr × nr row-major F (lower triangle)
 * and leaves the Schur complement in the trailing block. Returns −1, or the
 * local column whose pivot is not a finite number above its floor (0, or
 * minPivot[col0 + j] when given; then F(j,j) holds that value).
 */
export function factorFront(
  F: Float64Array,
  nr: number,
  nc: number,
  simd: SimdFront | null = null,
  minPivot: Float64Array | null = null,
  col0 = 0,
): number {
  for (let jb = 0; jb < nc; jb += NB) {
    const je = Math.min(jb + NB, nc);
    // block jb..je−1 as sub-blocks: Crout on sb..se−1, then the panel
    // columns se..je−1 (rows ≥ se) take the update from sb..se−1
    for (let sb = jb; sb < je; sb += NS) {
      const se = Math.min(sb + NS, je);
      const bad = factorBlock(F, nr, sb, se, minPivot, col0);
      if (bad >= 0) return bad;
      if (se < je) trailingUpdate(F, nr, se, sb, se, simd, je);
    }
    if (je < nr) trailingUpdate(F, nr, je, jb, je, simd);
  }
  return -1;
}

/**
 * Crout on columns jb..je−1 for all rows below, with inner products over
 * k ∈ [jb, j) only:
 *   L(j,j) = sqrt(F(j,j) − Σ L(j,k)²),  L(i,j) = (F(i,j) − Σ L(i,k) L(j,k)) / L(j,j).
 */
function factorBlock(F: Float64Array, nr: number, jb: number, je: number, minPivot: Float64Array | null, col0: number): number {
  for (let j = jb; j < je; j++) {
    const rj = j * nr;
    let d = F[rj + j]!;
    for (let k = jb; k < j; k++) {
      const v = F[rj + k]!;
      d -= v * v;
    }
    const floor = minPivot === null ? 0 : minPivot[col0 + j]!;
    if (!(d > floor && d < Infinity)) {
      F[rj + j] = d;
      return j;
    }
    const ljj = Math.sqrt(d);
    F[rj + j] = ljj;
    const inv = 1 / ljj;
    let i = j + 1;
    for (; i + 1 < nr; i += 2) {
      const ri = i * nr, ri1 = ri + nr;
      let s0 = F[ri + j]!, s1 = F[ri1 + j]!;
      for (let k = jb; k < j; k++) {
        const b = F[rj + k]!;
        s0 -= F[ri + k]! * b;
        s1 -= F[ri1 + k]! * b;
      }
      F[ri + j] = s0 * inv;
      F[ri1 + j] = s1 * inv;
    }
    if (i < nr) {
      const ri = i * nr;
      let s0 = F[ri + j]!;
      for (let k = jb; k < j; k++) s0 -= F[ri + k]! * F[rj + k]!;
      F[ri + j] = s0 * inv;
    }
  }
  return -1;
}

/**
 * F(i, j) −= Σ_{k0 ≤ k < k1} F(i, k) F(j, k) for c0 ≤ j ≤ i < nr, j < cEnd
 * (lower triangle of the trailing block, or of its first cEnd − c0 columns
 * for a panel). Rows go four at a time against pairs of columns (4×2 tiles:
 * 6 loads feed 8 multiply-adds), in WebAssembly SIMD when `simd` is given
 * (F must then be `simd.front`). The tiles of a group of four rows include
 * its whole 4×4 diagonal block, so they also write F's upper triangle there:
 * no kernel reads above the diagonal (the caller copies L's diagonal block
 * as a lower triangle). The last (nr − c0) mod 4 rows and an odd last column
 * use single inner products.
 */
export function trailingUpdate(
  F: Float64Array, nr: number, c0: number, k0: number, k1: number, simd: SimdFront | null = null, cEnd = nr,
): void {
  const groupsEnd = c0 + 4 * Math.floor((nr - c0) / 4);
  // tiles cover j < min(start of the row's group + 4, cEven)
  const cEven = c0 + ((cEnd - c0) & ~1);
  if (simd !== null && k1 - k0 >= 2) {
    simd.tiles(nr, c0, k0, (k1 - k0) >> 1, cEven);
    if ((k1 - k0) & 1) {
      // the odd last k as a rank-1 update of the same tiles
      const k = k1 - 1;
      for (let i = c0; i < groupsEnd; i += 4) {
        const jl = i + 4 < cEven ? i + 4 : cEven;
        for (let a = i; a < i + 4; a++) {
          const ra = a * nr, la = F[ra + k]!;
          for (let j = c0; j < jl; j++) F[ra + j]! -= la * F[j * nr + k]!;
        }
      }
    }
  } else {
    for (let i = c0; i < groupsEnd; i += 4) tiles4x2(F, nr, c0, i, i + 4 < cEven ? i + 4 : cEven, k0, k1);
  }
  for (let a = c0; a < nr; a++) {
    const g4 = c0 + ((a - c0) & ~3) + 4;
    const b0 = a < groupsEnd ? (g4 < cEven ? g4 : cEven) : c0;
    const b1 = a < cEnd - 1 ? a : cEnd - 1;
    for (let b = b0; b <= b1; b++) dotUpdate(F, nr, a, b, k0, k1);
  }
}

/** Rows i..i+3 against columns c0..jl−1 in 4×2 tiles (jl − c0 even; jl ≤ i + 4). */
function tiles4x2(F: Float64Array, nr: number, c0: number, i: number, jl: number, k0: number, k1: number): void {
  const r0 = i * nr, r1 = r0 + nr, r2 = r1 + nr, r3 = r2 + nr;
  for (let j = c0; j < jl; j += 2) {
    const q0 = j * nr, q1 = q0 + nr;
    let s00 = 0, s01 = 0, s10 = 0, s11 = 0, s20 = 0, s21 = 0, s30 = 0, s31 = 0;
    for (let k = k0; k < k1; k++) {
      const b0 = F[q0 + k]!, b1 = F[q1 + k]!;
      const a0 = F[r0 + k]!, a1 = F[r1 + k]!, a2 = F[r2 + k]!, a3 = F[r3 + k]!;
      s00 += a0 * b0;
      s01 += a0 * b1;
      s10 += a1 * b0;
      s11 += a1 * b1;
      s20 += a2 * b0;
      s21 += a2 * b1;
      s30 += a3 * b0;
      s31 += a3 * b1;
    }
    F[r0 + j]! -= s00;
    F[r0 + j + 1]! -= s01;
    F[r1 + j]! -= s10;
    F[r1 + j + 1]! -= s11;
    F[r2 + j]! -= s20;
    F[r2 + j + 1]! -= s21;
    F[r3 + j]! -= s30;
    F[r3 + j + 1]! -= s31;
  }
}

/** F(i, j) −= Σ_{k0 ≤ k < k1} F(i, k) F(j, k). */
function dotUpdate(F: Float64Array, nr: number, i: number, j: number, k0: number, k1: number): void {
  const ri = i * nr, rj = j * nr;
  let s = 0;
  for (let k = k0; k < k1; k++) s += F[ri + k]! * F[rj + k]!;
  F[ri + j]! -= s;
}
