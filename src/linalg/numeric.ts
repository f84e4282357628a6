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
 * All memory is allocated once per factor; refactorization reuses it.
 */
import type { CscMatrix } from './csc.js';
import type { CholeskySymbolic } from './symbolic.js';
import { lowerSolve, lowerTransposeSolve } from './solve.js';
import { numericError, usageError } from '../errors.js';

/**
 * Up-looking factorization kernel. Returns −1 on success, or the pivot column
 * k where γ − l₁₂ᵀl₁₂ was not a positive finite number (then `Lx[Lp[k]]` holds
 * that value and the factor is incomplete). Never throws.
 */
function upLooking(
  sym: CholeskySymbolic,
  Cx: Float64Array,
  Li: Int32Array,
  Lx: Float64Array,
  x: Float64Array,
  next: Int32Array,
  stack: Int32Array,
  mark: Int32Array,
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
    if (!(d > 0 && d < Infinity)) {
      Lx[pk] = d;
      return k;
    }
    Lx[pk] = Math.sqrt(d);
    next[k] = pk + 1;
  }
  return -1;
}

/** A numeric Cholesky factor P·A·Pᵀ = L·Lᵀ of a symmetric positive definite matrix. */
export class CholeskyFactor {
  /** Matrix size. */
  readonly n: number;
  /** Nonzeros of L, diagonal included. */
  readonly nnzL: number;
  /** The symbolic analysis this factor was built on. */
  readonly symbolic: CholeskySymbolic;
  /** Column pointers of L (shared with the analysis). */
  readonly Lp: Int32Array;
  /** Row indices of L, sorted per column, diagonal first. */
  readonly Li: Int32Array;
  /** Values of L. */
  readonly Lx: Float64Array;
  private readonly Cx: Float64Array;
  private readonly x: Float64Array;
  private readonly nextSlot: Int32Array;
  private readonly stack: Int32Array;
  private readonly mark: Int32Array;

  private constructor(sym: CholeskySymbolic) {
    this.n = sym.n;
    this.nnzL = sym.nnzL;
    this.symbolic = sym;
    this.Lp = sym.lColPtr;
    this.Li = new Int32Array(sym.nnzL);
    this.Lx = new Float64Array(sym.nnzL);
    this.Cx = new Float64Array(sym.cRowIdx.length);
    this.x = new Float64Array(sym.n);
    this.nextSlot = new Int32Array(sym.n);
    this.stack = new Int32Array(sym.n);
    this.mark = new Int32Array(sym.n);
  }

  /**
   * Factors the matrix whose LOWER triangle is `Alower` using the analysis
   * `sym` (made from the same pattern). Throws `NUMERIC` naming the column
   * (in the caller's numbering) on a non-positive or non-finite pivot.
   */
  static factor(Alower: CscMatrix, sym: CholeskySymbolic): CholeskyFactor {
    const f = new CholeskyFactor(sym);
    f.refactor(Alower);
    return f;
  }

  /**
   * Factors new values with the same pattern, reusing all memory. Throws
   * `USAGE` when the pattern differs from the analysed one, `NUMERIC` on a
   * non-positive or non-finite pivot.
   */
  refactor(Alower: CscMatrix): void {
    const sym = this.symbolic;
    const { n, inputColPtr, inputRowIdx, valueMap } = sym;
    if (Alower.n !== n) throw usageError(`refactor: matrix is ${Alower.n}×${Alower.n}, analysis was for ${n}×${n}`);
    const nz = inputColPtr[n]!;
    if (Alower.colPtr !== inputColPtr || Alower.rowIdx !== inputRowIdx) {
      for (let j = 0; j <= n; j++) {
        if (Alower.colPtr[j] !== inputColPtr[j]) throw usageError(`refactor: pattern differs from the analysed one at column ${j}`);
      }
      for (let p = 0; p < nz; p++) {
        if (Alower.rowIdx[p] !== inputRowIdx[p]) throw usageError(`refactor: pattern differs from the analysed one at entry ${p}`);
      }
    }
    const Cx = this.Cx, Ax = Alower.values;
    for (let p = 0; p < nz; p++) Cx[valueMap[p]!] = Ax[p]!;
    this.nextSlot.set(sym.lColPtr.subarray(0, n));
    const bad = upLooking(sym, Cx, this.Li, this.Lx, this.x, this.nextSlot, this.stack, this.mark);
    if (bad >= 0) {
      const pivot = this.Lx[this.Lp[bad]!]!;
      this.Lx.fill(0);
      throw numericError(`matrix is not positive definite (pivot ${pivot} at column ${sym.perm[bad]})`);
    }
  }

  /**
   * out = A⁻¹·b = Pᵀ L⁻ᵀ L⁻¹ P b. Does not allocate (uses an internal
   * workspace, so one factor must not be used by two solves at once); `out`
   * may be the same array as `b`.
   */
  solve(b: Float64Array, out: Float64Array): void {
    const { n, x } = this;
    const perm = this.symbolic.perm;
    for (let k = 0; k < n; k++) x[k] = b[perm[k]!]!;
    lowerSolve(n, this.Lp, this.Li, this.Lx, x);
    lowerTransposeSolve(n, this.Lp, this.Li, this.Lx, x);
    for (let k = 0; k < n; k++) out[perm[k]!] = x[k]!;
  }
}
