/**
 * The factorization's exponent shift (src/linalg/exponent-shift.ts): the
 * multifrontal factorization works on 4^k·A and stores 2^−k times its
 * result. Scaling by a power of two is exact in IEEE 754 arithmetic when
 * nothing over- or underflows, and every operation of a Cholesky
 * factorization (+, −, ×, 1/x, √) commutes with it (IEEE 754-2008 §5.4:
 * each result is the correctly rounded exact one; common practice), so:
 * the factor of 4^j·A must be 2^j times the factor of A, bit for bit, for
 * every j where the latter is a normal number, including the j where an
 * unshifted factorization would meet subnormal products (its entries near
 * 1e-300). Without the shift this test fails at j = −500 (checked by hand:
 * the fill entries of the small-valued matrix then differ).
 */
import { describe, expect, it } from 'vitest';
import { analyzeCholesky, CholeskyFactor } from '../../src/linalg/index.js';
import type { CscMatrix } from '../../src/linalg/index.js';
import { exponentShift, pow2, SHIFT_TARGET_EXPONENT } from '../../src/linalg/exponent-shift.js';
import { gridLaplacianLower, withIdentityRows } from './helpers.js';

const nx = 40;
// a heat-like matrix: M + tL with a mass term that makes the inverse (and the fill) decay fast
const A = gridLaplacianLower(nx, nx, 3, true, 7);
const onRim = (v: number) => v % nx === 0 || v % nx === nx - 1 || v < nx || v >= nx * (nx - 1);
const B = withIdentityRows(A, onRim);
const sym = analyzeCholesky(A);

const scaled = (M: CscMatrix, e: number): CscMatrix => ({ ...M, values: M.values.map((v) => v * pow2(e)) });

/** True when every entry of `got` is `want` times 2^e exactly (and that product is a normal number or 0). */
function scaledBits(got: Float64Array, want: Float64Array, e: number): boolean {
  if (got.length !== want.length) return false;
  const s = pow2(e);
  for (let i = 0; i < got.length; i++) {
    const w = want[i]! * s;
    if (w !== 0 && Math.abs(w) < 2 ** -1022) throw new Error(`test set-up: entry ${i} would be subnormal`);
    if (!Object.is(got[i], w)) return false;
  }
  return true;
}

describe('exponent shift of the multifrontal factorization', () => {
  it('chooses k with max|A|·4^k just under the target, 0 for empty or non-finite input, never above 511', () => {
    for (const big of [1e-300, 1e-6, 1, 6.02, 1e6, 1e200]) {
      const k = exponentShift(new Float64Array([big, -big / 3, 0]));
      expect(k).toBeGreaterThanOrEqual(0);
      expect(k).toBeLessThanOrEqual(511);
      if (k > 0 && k < 511) {
        expect(big * pow2(2 * k)).toBeLessThanOrEqual(2 ** SHIFT_TARGET_EXPONENT);
        expect(big * pow2(2 * k + 4)).toBeGreaterThan(2 ** SHIFT_TARGET_EXPONENT);
      }
    }
    expect(exponentShift(new Float64Array([0, 0]))).toBe(0);
    expect(exponentShift(new Float64Array([1, Infinity]))).toBe(0);
    expect(exponentShift(new Float64Array([1, Number.NaN]))).toBe(400); // NaN is never the largest; the pivot check catches it
    expect(exponentShift(new Float64Array([1e300]))).toBe(0);
  });

  it('pow2 is exact over the whole exponent range', () => {
    for (const e of [-1022, -600, -1, 0, 1, 511, 1000, 1023]) expect(pow2(e)).toBe(2 ** e);
  });

  it('the factor of 4^j·A is 2^j times the factor of A, bit for bit, from j = −500 to 200', () => {
    const ref = CholeskyFactor.factor(A, sym).lowerFactor().values;
    for (const j of [-500, -300, -100, -1, 1, 100, 200]) {
      const got = CholeskyFactor.factor(scaled(A, 2 * j), sym).lowerFactor().values;
      expect(scaledBits(got, ref, j), `j = ${j}`).toBe(true);
    }
  });

  it('so does the natural/Dirichlet pair, which shares one shift', () => {
    const [ra, rb] = CholeskyFactor.factorPair(A, B, sym).map((f) => CholeskyFactor.orThrow(f).lowerFactor().values);
    // the pair's two matrices have different largest entries (B's identity rows): one shift, the smaller
    const [ga, gb] = CholeskyFactor.factorPair(scaled(A, -1000), scaled(B, -1000), sym).map((f) => CholeskyFactor.orThrow(f).lowerFactor().values);
    expect(scaledBits(ga!, ra!, -500)).toBe(true);
    expect(scaledBits(gb!, rb!, -500)).toBe(true);
  });

  it('solves agree with the unscaled system: (4^j·A)x = 4^j·b gives A⁻¹b', () => {
    const b = new Float64Array(A.n).map((_, i) => Math.sin(i));
    const x0 = new Float64Array(A.n), x1 = new Float64Array(A.n);
    CholeskyFactor.factor(A, sym).solve(b, x0);
    CholeskyFactor.factor(scaled(A, -600), sym).solve(b.map((v) => v * pow2(-600)), x1);
    for (let i = 0; i < A.n; i++) expect(x1[i]).toBe(x0[i]);
  });

  it('a failed pivot is reported at its unshifted value', () => {
    const bad = { ...A, values: A.values.slice() };
    bad.values[0] = -1;
    let message = '';
    try {
      CholeskyFactor.factor(bad, sym);
    } catch (e) {
      message = (e as Error).message;
    }
    const pivot = Number(/pivot (\S+) at column/.exec(message)?.[1]);
    expect(pivot).toBeLessThan(0);
    expect(pivot).toBeGreaterThan(-100); // the matrix's own scale, not 4^k times it
  });
});
