/**
 * The blocked front kernel against the textbook Cholesky recurrence
 * (Golub & Van Loan, Matrix Computations, 4th ed., Alg. 4.2.1, outer-product
 * form, here stopped after nc columns so the trailing block holds the Schur
 * complement), for front sizes that cross the block (64) and sub-block (8)
 * widths, odd widths and rows left over from the groups of four, with the
 * plain kernels and with the WebAssembly SIMD one (fused multiply-adds where
 * the engine has relaxed SIMD, as Node 20 has behind a V8 flag the module sets).
 */
import { describe, expect, it } from 'vitest';
import { factorFront } from '../../src/linalg/dense-kernels.js';
import { createSimdFront, simdFused } from '../../src/linalg/wasm-update.js';

/** Row-major SPD matrix B·Bᵀ + nr·I from a fixed pseudo-random B. */
function spd(nr: number, seed: number): Float64Array {
  let s = seed >>> 0;
  const rnd = () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32) - 0.5;
  const B = Float64Array.from({ length: nr * nr }, rnd);
  const A = new Float64Array(nr * nr);
  for (let i = 0; i < nr; i++) {
    for (let j = 0; j <= i; j++) {
      let v = i === j ? nr : 0;
      for (let k = 0; k < nr; k++) v += B[i * nr + k]! * B[j * nr + k]!;
      A[i * nr + j] = A[j * nr + i] = v;
    }
  }
  return A;
}

/** Outer-product Cholesky on the first nc columns, lower triangle, in place. */
function reference(A: Float64Array, nr: number, nc: number): void {
  for (let k = 0; k < nc; k++) {
    const d = Math.sqrt(A[k * nr + k]!);
    A[k * nr + k] = d;
    for (let i = k + 1; i < nr; i++) A[i * nr + k]! /= d;
    for (let j = k + 1; j < nr; j++) for (let i = j; i < nr; i++) A[i * nr + j]! -= A[i * nr + k]! * A[j * nr + k]!;
  }
}

describe('factorFront', () => {
  const cases: [number, number][] = [[1, 1], [5, 3], [9, 9], [23, 17], [40, 13], [70, 64], [71, 65], [150, 73], [161, 130]];
  for (const useSimd of [false, true]) {
    it(`matches the textbook recurrence on the lower triangle (${useSimd ? 'SIMD' : 'plain'} kernels)`, () => {
      for (const [nr, nc] of cases) {
        const A = spd(nr, nr * 31 + nc);
        const R = A.slice();
        reference(R, nr, nc);
        const simd = useSimd ? createSimdFront(nr * nr) : null;
        if (useSimd) expect(simd).not.toBeNull(); // Node 20 has WebAssembly SIMD
        const F = simd ? simd.front : new Float64Array(nr * nr);
        F.set(A);
        expect(factorFront(F, nr, nc, simd)).toBe(-1);
        let maxDiff = 0, maxAbs = 0;
        for (let i = 0; i < nr; i++) {
          for (let j = 0; j <= i; j++) {
            maxDiff = Math.max(maxDiff, Math.abs(F[i * nr + j]! - R[i * nr + j]!));
            maxAbs = Math.max(maxAbs, Math.abs(R[i * nr + j]!));
          }
        }
        // different summation order only: rounding of order nr·eps relative (common practice)
        expect(maxDiff, `nr=${nr} nc=${nc}`).toBeLessThanOrEqual(nr * 1e-14 * maxAbs);
      }
    });
  }
  it('has the fused tile kernel on Node 20 (relaxed SIMD turned on through node:v8)', () => {
    // the benchmark's factorization figures are for the fused kernel; the check above runs it
    expect(simdFused()).toBe(true);
  });
  it('reports the first non-positive pivot', () => {
    const nr = 20;
    const A = spd(nr, 3);
    A[11 * nr + 11] = -1;
    expect(factorFront(A, nr, 15)).toBe(11);
  });
});
