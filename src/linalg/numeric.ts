/**
 * The numeric Cholesky factor P·A·Pᵀ = L·Lᵀ: owns L's values and every
 * workspace, so refactorization and solves never allocate. The method
 * (supernodal multifrontal or simplicial up-looking) is fixed by the
 * symbolic analysis.
 */
import type { CscMatrix } from './csc.js';
import { scatterValues, type CholeskySymbolic } from './symbolic.js';
import { upLookingFactor } from './simplicial.js';
import { multifrontalFactor, multifrontalWork } from './multifrontal.js';
import { blocksToCsc } from './supernodes.js';
import { affectedBlocks, multifrontalPair } from './multifrontal-pair.js';
import { supernodalLowerSolve, supernodalLowerTransposeSolve } from './solve-supernodal.js';
import type { MultifrontalWork } from './multifrontal.js';
import { lowerSolve, lowerTransposeSolve } from './solve.js';
import { pairTransposeSolve } from './solve-pair.js';
import { numericError, usageError, type OrthodromeError } from '../errors.js';
import type { FactorExecutor } from './executor.js';
import { factorOnThreads } from './multifrontal-parallel.js';
import { exponentShift, pow2 } from './exponent-shift.js';

/** Options of {@link CholeskyFactor.factor}. */
export interface FactorOptions {
  /**
   * Use the WebAssembly SIMD tile kernel for the dense updates when the
   * platform has it (default true); false forces the plain kernels.
   */
  simd?: boolean;
  /**
   * Relative pivot floor τ ≥ 0 (default 0): a pivot d_k ≤ τ·|A_kk| is
   * rejected like a non-positive one. With τ = 0 only d_k ≤ 0 is caught, and a
   * singular positive semidefinite matrix (a pure cotangent Laplacian, say)
   * can pass with a tiny positive rounding pivot and give huge solutions;
   * τ ≈ 1e-10 catches that case but also rejects SPD matrices that are that
   * close to singular.
   */
  pivotTolerance?: number;
}

/** Options of {@link CholeskyFactor.factorMany}. */
export interface FactorManyOptions extends FactorOptions {
  /**
   * Factors some of the matrices on other threads (executor.ts); results
   * are bit-identical to the serial ones. Without it (or below the
   * executor's size threshold, or for the simplicial method) everything is
   * factored here, one after the other.
   */
  executor?: FactorExecutor | null;
  /**
   * Factor `mats[0]` and `mats[1]` together on this thread
   * ({@link CholeskyFactor.factorPair}: the second shares the first's
   * blocks where they agree); the rest as usual.
   */
  pairFirst?: boolean;
}

/**
 * Scratch shared by every factor of one analysis: C's values and the
 * multifrontal workspaces are only used inside a (synchronous) factorization,
 * so factors of the same pattern (the heat method keeps two or three) need
 * one copy, and each later factor touches fresh memory only for its L.
 */
interface SharedScratch {
  readonly Cx: Float64Array;
  simd?: MultifrontalWork;
  plain?: MultifrontalWork;
}

const scratchOf = new WeakMap<CholeskySymbolic, SharedScratch>();

function scratchFor(sym: CholeskySymbolic): SharedScratch {
  let scratch = scratchOf.get(sym);
  if (!scratch) {
    scratch = { Cx: new Float64Array(sym.cRowIdx.length) };
    scratchOf.set(sym, scratch);
  }
  return scratch;
}

/** The analysis' shared multifrontal workspace (supernodal only). */
function sharedWork(sym: CholeskySymbolic, simd: boolean): MultifrontalWork {
  const scratch = scratchFor(sym);
  return simd ? (scratch.simd ??= multifrontalWork(sym.n, sym.supernodal!, true)) : (scratch.plain ??= multifrontalWork(sym.n, sym.supernodal!, false));
}

/** A numeric Cholesky factor P·A·Pᵀ = L·Lᵀ of a symmetric positive definite matrix. */
export class CholeskyFactor {
  /** Matrix size. */
  readonly n: number;
  /** Nonzeros of L, diagonal included (structural count; the supernodal storage adds explicit zeros). */
  readonly nnzL: number;
  /** The symbolic analysis this factor was built on. */
  readonly symbolic: CholeskySymbolic;
  /** True when the dense updates run in WebAssembly SIMD. */
  get usesSimd(): boolean {
    return this.mf?.simd != null;
  }
  /** Values of L: CSC columns (simplicial) or packed row-major supernode blocks (supernodal; see SupernodalStructure.valPtr). */
  private readonly Lx: Float64Array;
  /** Row indices of L (simplicial only). */
  private readonly Li: Int32Array;
  /** C's values in the analysed order (scratch shared with the analysis' other factors). */
  private readonly Cx: Float64Array;
  private readonly x: Float64Array;
  private readonly intWork: [Int32Array, Int32Array, Int32Array];
  /** Multifrontal workspaces (shared with the analysis' other factors). */
  private readonly mf: MultifrontalWork | null;
  private readonly pivot = new Float64Array(1);
  private readonly pivotTolerance: number;
  private readonly minPivot: Float64Array | null;
  /** Shared blocks (factorPair): block s at own[s] in Lx, or at valPtr[s] in base where own[s] < 0. */
  private own: Int32Array | null = null;
  private base: Float64Array | null = null;
  /** Set on a factor whose blocks another factor reads: refactor would change both. */
  private lent = false;
  /** The supernodal factorization runs on 4^shift·A (exponent-shift.ts); set by load. */
  private shift = 0;

  private constructor(sym: CholeskySymbolic, opts: FactorOptions, Lx: Float64Array | null = null) {
    const n = sym.n;
    const tol = opts.pivotTolerance ?? 0;
    if (!(tol >= 0 && tol < Infinity)) throw usageError(`pivotTolerance must be a finite number ≥ 0, got ${tol}`);
    this.pivotTolerance = tol;
    this.minPivot = tol > 0 ? new Float64Array(n) : null;
    this.n = n;
    this.nnzL = sym.nnzL;
    this.symbolic = sym;
    this.Cx = scratchFor(sym).Cx;
    this.x = new Float64Array(n);
    if (sym.supernodal) {
      this.Lx = Lx ?? new Float64Array(sym.supernodal.valPtr[sym.supernodal.nsuper]!);
      this.Li = new Int32Array(0);
      this.intWork = [new Int32Array(0), new Int32Array(0), new Int32Array(0)];
      this.mf = sharedWork(sym, opts.simd ?? true);
    } else {
      this.Lx = new Float64Array(sym.nnzL);
      this.Li = new Int32Array(sym.nnzL);
      this.intWork = [new Int32Array(n), new Int32Array(n), new Int32Array(n)];
      this.mf = null;
    }
  }

  /**
   * Factors the matrix whose LOWER triangle is `Alower` using the analysis
   * `sym` (made from the same pattern). Throws `NUMERIC` naming the column
   * (in the caller's numbering) on a non-positive or non-finite pivot.
   */
  static factor(Alower: CscMatrix, sym: CholeskySymbolic, opts: FactorOptions = {}): CholeskyFactor {
    const f = new CholeskyFactor(sym, opts);
    f.refactor(Alower);
    return f;
  }

  /**
   * Factors several matrices of one analysis (LOWER triangles with the
   * analysed pattern). Entry k is the factor of `mats[k]`, or the `NUMERIC`
   * error its factorization raised (a `USAGE` error for a wrong pattern is
   * thrown). With an executor, `mats[0]` is factored on this thread while
   * the others run on the executor's threads.
   */
  static factorMany(mats: CscMatrix[], sym: CholeskySymbolic, opts: FactorManyOptions = {}): (CholeskyFactor | OrthodromeError)[] {
    // an executor copied to another thread (structured clone) loses its methods: factor here then
    const ex = typeof opts.executor?.start === 'function' ? opts.executor : null;
    const one = (A: CscMatrix): CholeskyFactor | OrthodromeError => {
      try {
        return CholeskyFactor.factor(A, sym, opts);
      } catch (e) {
        if (e instanceof Error && (e as OrthodromeError).code === 'NUMERIC') return e as OrthodromeError;
        throw e;
      }
    };
    if (ex?.join && sym.supernodal && sym.n >= ex.minSize && mats.length >= 2 && !((opts.pivotTolerance ?? 0) > 0)) {
      // the caller and the executor's threads share the tasks of all the factorizations (multifrontal-parallel.ts)
      const simd = opts.simd ?? true, pair = opts.pairFirst === true;
      const r = factorOnThreads(sym, mats, pair, ex, simd, sharedWork(sym, simd));
      if (!r) return CholeskyFactor.factorMany(mats, sym, { ...opts, executor: null }); // a failed pivot or thread: serially, fresh storage
      const fs = r.lx.map((lx) => new CholeskyFactor(sym, opts, lx));
      if (pair) {
        fs[1]!.own = r.own;
        fs[1]!.base = fs[0]!.Lx;
        fs[0]!.lent = true;
      }
      return fs;
    }
    const first = opts.pairFirst && mats.length >= 2 ? 2 : 1;
    const here = (): (CholeskyFactor | OrthodromeError)[] => (first === 2 ? CholeskyFactor.factorPair(mats[0]!, mats[1]!, sym, opts) : [one(mats[0]!)]);
    if (!ex || mats.length <= first || !sym.supernodal || sym.n < ex.minSize) return [...here(), ...mats.slice(first).map(one)];
    const simd = opts.simd ?? true; // the thread decides as multifrontalWork does here: same kernels, same bits
    const remote = mats.slice(first).map((A) => {
      const f = new CholeskyFactor(sym, opts, ex.shared(sym.supernodal!.valPtr[sym.supernodal!.nsuper]!));
      const cx = ex.shared(sym.cRowIdx.length);
      const minPivot = f.minPivot ? ex.shared(sym.n) : null;
      f.load(A, cx, minPivot);
      return { f, wait: ex.start({ sym, cx, lx: f.Lx, minPivot, simd, unscale: pow2(-f.shift) }) };
    });
    const out = here();
    for (const { f, wait } of remote) {
      const r = wait();
      if (r.bad === -2 || r.bad === -3) {
        // taken back before a thread started it: factor here into the same storage;
        // the thread failed or stalled: factor here into fresh storage
        out.push(r.bad === -2 ? f.refactorOr(mats[out.length]!) : one(mats[out.length]!));
        continue;
      }
      f.pivot[0] = r.pivot;
      out.push(r.bad >= 0 ? f.failure(r.bad) : f);
    }
    return out;
  }

  /**
   * Factors two matrices of one analysis that differ in a few columns, in
   * one sweep (multifrontal-pair.ts): the second factor stores only the
   * blocks whose subtree sees a difference and reads the first's for the
   * rest; both are bit-identical to separate factorizations. The first can
   * then no longer be refactored (`USAGE`). Entry k is the factor or its
   * `NUMERIC` error. Simplicial analyses and pivot floors factor the two
   * separately.
   */
  static factorPair(A: CscMatrix, B: CscMatrix, sym: CholeskySymbolic, opts: FactorOptions = {}): (CholeskyFactor | OrthodromeError)[] {
    const sn = sym.supernodal;
    if (!sn || (opts.pivotTolerance ?? 0) > 0) return CholeskyFactor.factorMany([A, B], sym, { ...opts, pairFirst: false });
    const fa = new CholeskyFactor(sym, opts);
    // one shift for both (B reads A's update matrices), safe for both
    const shift = Math.min(exponentShift(A.values), exponentShift(B.values));
    fa.load(A, fa.Cx, null, shift);
    const cxB = new Float64Array(sym.cRowIdx.length);
    fa.load(B, cxB, null, shift);
    const { own, total } = affectedBlocks(sn, sym.cColPtr, fa.Cx, cxB);
    const fb = new CholeskyFactor(sym, opts, new Float64Array(total));
    fb.own = own;
    fb.base = fa.Lx;
    fa.lent = true;
    const workB = multifrontalWork(sym.n, sn, opts.simd ?? true);
    const status = new Int32Array(2);
    const pivots = new Float64Array(2);
    multifrontalPair(sn, sym.cColPtr, sym.cRowIdx, fa.Cx, cxB, fa.Lx, fb.Lx, own, fa.mf!, workB, status, pivots, 0, sn.nsuper, pow2(-shift));
    fa.pivot[0] = pivots[0]!;
    fb.pivot[0] = pivots[1]!;
    if (status[0]! >= 0) {
      // A failed: B's factorization stopped with it; redo B alone
      const err = fa.failure(status[0]!);
      let rb: CholeskyFactor | OrthodromeError;
      try {
        rb = CholeskyFactor.factor(B, sym, opts);
      } catch (e) {
        if (!(e instanceof Error) || (e as OrthodromeError).code !== 'NUMERIC') throw e;
        rb = e as OrthodromeError;
      }
      return [err, rb];
    }
    return [fa, status[1]! >= 0 ? fb.failure(status[1]!) : fb];
  }

  /** An entry of {@link CholeskyFactor.factorMany}'s result as a factor, or throws its error. */
  static orThrow(f: CholeskyFactor | OrthodromeError): CholeskyFactor {
    if (f instanceof CholeskyFactor) return f;
    throw f;
  }

  /** Values of L stored by this factor (shared blocks excluded). */
  get storedValues(): number {
    return this.Lx.length;
  }

  /**
   * Checks the pattern of `Alower`, scatters its values into C's order (cx)
   * and fills the pivot floors; throws `USAGE` for a pattern other than the
   * analysed one. A supernodal factor takes them times 4^k (`shift`, by
   * default {@link exponentShift} of A: exponent-shift.ts); the simplicial
   * method does not shift.
   */
  private load(Alower: CscMatrix, Cx: Float64Array, minPivot: Float64Array | null, shift = this.symbolic.supernodal ? exponentShift(Alower.values) : 0): void {
    this.shift = shift;
    scatterValues(this.symbolic, Alower, Cx, minPivot, this.pivotTolerance, shift);
  }

  /** refactor(A), or its `NUMERIC` error as a value. */
  private refactorOr(A: CscMatrix): CholeskyFactor | OrthodromeError {
    try {
      this.refactor(A);
      return this;
    } catch (e) {
      if (e instanceof Error && (e as OrthodromeError).code === 'NUMERIC') return e as OrthodromeError;
      throw e;
    }
  }

  /** The `NUMERIC` error for a failed pivot at (permuted) column `bad`; leaves L zeroed. */
  private failure(bad: number): OrthodromeError {
    this.Lx.fill(0);
    return numericError(`matrix is not positive definite (pivot ${this.pivot[0]} at column ${this.symbolic.perm[bad]})`);
  }

  /**
   * Factors new values with the same pattern, reusing all memory. Throws
   * `USAGE` when the pattern differs from the analysed one, `NUMERIC` on a
   * non-positive or non-finite pivot (the factor is then unusable until a
   * successful refactorization).
   */
  refactor(Alower: CscMatrix): void {
    if (this.lent || this.own) throw usageError('refactor: this factor shares its blocks with another (factorPair)');
    const sym = this.symbolic;
    const minPivot = this.minPivot;
    this.load(Alower, this.Cx, minPivot);
    let bad: number;
    if (sym.supernodal) {
      bad = multifrontalFactor(sym.supernodal, sym.cColPtr, sym.cRowIdx, this.Cx, this.Lx, this.mf!, this.pivot, minPivot, null, 0, sym.supernodal.nsuper, pow2(-this.shift));
    } else {
      const [next, stack, mark] = this.intWork;
      for (let k = 0; k < sym.n; k++) next[k] = sym.lColPtr[k]!;
      bad = upLookingFactor(sym, this.Cx, this.Li, this.Lx, this.x, next, stack, mark, minPivot);
      if (bad >= 0) this.pivot[0] = this.Lx[sym.lColPtr[bad]!]!;
    }
    if (bad >= 0) throw this.failure(bad);
  }

  /**
   * out = A⁻¹·b = Pᵀ L⁻ᵀ L⁻¹ P b. Does not allocate (uses an internal
   * workspace, so one factor must not be used by two solves at once); `out`
   * may be the same array as `b`.
   */
  solve(b: Float64Array, out: Float64Array): void {
    const { n, x } = this;
    const sym = this.symbolic;
    const perm = sym.perm;
    for (let k = 0; k < n; k++) x[k] = b[perm[k]!]!;
    if (sym.supernodal) {
      supernodalLowerSolve(sym.supernodal, this.Lx, x, this.own, this.base);
      supernodalLowerTransposeSolve(sym.supernodal, this.Lx, x, this.own, this.base);
    } else {
      lowerSolve(n, sym.lColPtr, this.Li, this.Lx, x);
      lowerTransposeSolve(n, sym.lColPtr, this.Li, this.Lx, x);
    }
    for (let k = 0; k < n; k++) out[perm[k]!] = x[k]!;
  }

  /**
   * outA = A⁻¹·bA and outB = B⁻¹·bB for a pair from
   * {@link CholeskyFactor.factorPair} (`fa` the first, `fb` the second): the
   * backward passes run together and read each shared block once
   * (solve-pair.ts); the results equal two `solve` calls to the bit. Other
   * factors are solved one after the other. Does not allocate; an output may
   * be the same array as its right-hand side.
   */
  static solvePair(fa: CholeskyFactor, fb: CholeskyFactor, bA: Float64Array, bB: Float64Array, outA: Float64Array, outB: Float64Array): void {
    const sn = fa.symbolic.supernodal;
    if (!sn || fb.base !== fa.Lx || fb.own === null || fa === fb) {
      fa.solve(bA, outA);
      fb.solve(bB, outB);
      return;
    }
    const { n, x } = fa, z = fb.x, perm = fa.symbolic.perm;
    for (let k = 0; k < n; k++) {
      x[k] = bA[perm[k]!]!;
      z[k] = bB[perm[k]!]!;
    }
    supernodalLowerSolve(sn, fa.Lx, x);
    supernodalLowerSolve(sn, fb.Lx, z, fb.own, fb.base);
    pairTransposeSolve(sn, fa.Lx, x, fb.Lx, fb.own, z);
    for (let k = 0; k < n; k++) {
      outA[perm[k]!] = x[k]!;
      outB[perm[k]!] = z[k]!;
    }
  }

  /**
   * L as a CSC matrix (rows sorted, diagonal first, explicit zeros of the
   * supernodal storage dropped) in the permuted numbering: P·A·Pᵀ = L·Lᵀ with
   * P from `symbolic.perm`. Allocates; for inspection and tests.
   */
  lowerFactor(): CscMatrix {
    const sym = this.symbolic;
    const n = this.n;
    if (!sym.supernodal) {
      return { n, colPtr: sym.lColPtr.slice(), rowIdx: this.Li.slice(), values: this.Lx.slice() };
    }
    return blocksToCsc(sym.supernodal, this.Lx, this.own, this.base);
  }
}
