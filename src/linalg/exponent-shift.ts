/**
 * Moves a factorization into the top of the double range, where the small
 * entries of a fast-decaying factor stay normal numbers.
 *
 * The multifrontal factorization of P·A·Pᵀ works on 4^k·A instead of A (an
 * exact scaling: 4^k is a power of two) and stores 2^−k times what it
 * computes. IEEE 754 rounding commutes with scaling by a power of two when
 * nothing over- or underflows (sqrt(4^k·d) = 2^k·sqrt(d), (2^k·a)(2^k·b) =
 * 4^k·ab, 2^−k/… likewise), so where the unscaled run stays in the normal
 * range the stored factor is the same to the bit. Where it does not, the
 * shifted run is the better one: it keeps full precision on products the
 * unscaled run rounds into subnormal numbers or to zero.
 *
 * Why it matters: the heat method's M + tL with t = h² has an inverse, and
 * a Cholesky factor, whose entries fall by about e per edge ring, so the
 * large fronts of a 1M-vertex mesh hold entries and partial products below
 * 2^−1022 (≈ 2.2e-308). x86 processors handle each operation that makes or
 * reads a subnormal number in microcode assists, tens of times slower (the
 * Intel optimization reference manual's section on floating-point
 * exceptions, cited from memory; WebAssembly has no flush-to-zero mode). Measured on the 1M heat matrix: 4.7 s unscaled, 2.5 s
 * with the shift (the same as a Laplacian-like matrix of the same pattern,
 * which has no such entries). Flushing those values to zero was measured to
 * cost accuracy (the relay uses the heat down to 1e-290), the shift does not.
 *
 * Overflow cannot follow: for a symmetric positive definite matrix every
 * |entry| of a front, of L·Lᵀ's partial sums and of the update matrices is
 * at most max|A_ij| (= the largest diagonal entry; Cauchy–Schwarz on the
 * Schur complements), and the target leaves a factor of 2^200 of headroom.
 * A matrix that is not positive definite still fails on its pivot.
 */

/** Largest entry after the shift, as a power of two (headroom 2^200 below the overflow at 2^1024). */
export const SHIFT_TARGET_EXPONENT = 800;

/**
 * The k ≥ 0 to factor 4^k·A with: the largest |value| of A times 4^k stays
 * at or below 2^SHIFT_TARGET_EXPONENT. 0 for an all-zero or non-finite
 * matrix (the factorization then reports it as usual).
 */
export function exponentShift(values: Float64Array): number {
  let big = 0;
  for (let p = 0; p < values.length; p++) {
    const v = Math.abs(values[p]!);
    if (v > big) big = v;
  }
  if (!(big > 0 && big < Infinity)) return 0;
  // k ≤ 511 keeps 4^k a double
  return Math.min(511, Math.max(0, Math.floor((SHIFT_TARGET_EXPONENT - Math.ceil(Math.log2(big))) / 2)));
}

/** 2^e for an integer e in [−1022, 1023], exactly. */
export function pow2(e: number): number {
  // 2 ** e is exact in V8 for these e, but two halves keep it exact whatever Math.pow does
  const a = e >> 1;
  return 2 ** a * 2 ** (e - a);
}
