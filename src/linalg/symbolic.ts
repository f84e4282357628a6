/**
 * Symbolic analysis of a sparse Cholesky factorization P·A·Pᵀ = L·Lᵀ: the
 * fill-reducing ordering, the elimination tree, the column counts of L and the
 * permuted pattern of A. It depends on the pattern only, so one analysis
 * serves every numeric factorization with the same pattern (for example
 * M + tL and L + εM built on the same mesh).
 */
import type { CscMatrix } from './csc.js';
import { adjacencyFromLower } from './graph.js';
import { eliminationTree, postorder } from './etree.js';
import { columnCounts } from './colcounts.js';
import { nestedDissection } from './ordering-nd.js';
import { parallelNestedDissection } from './ordering-executor.js';
import type { OrderingExecutor } from './ordering-executor.js';
import { approximateMinimumDegree } from './ordering-amd.js';
import { findSupernodes } from './supernodes.js';
import type { SupernodalStructure } from './supernodes.js';
import { usageError, limitError } from '../errors.js';
import { permutedPattern, relabelLower } from './symbolic-pattern.js';
import { pow2 } from './exponent-shift.js';

/** Fill-reducing orderings: approximate minimum degree, nested dissection, or none. */
export type Ordering = 'amd' | 'nd' | 'natural';

/**
 * The ordering used when none is asked for. Nested dissection gives less fill
 * and fewer flops than AMD on surface meshes from ~100k vertices up (measured:
 * test/bench/linalg.bench.ts; e.g. the 1000×1000 triangulated grid: 34.8M vs
 * 40.3M entries in L),
 * and on closed surfaces at every size; AMD orders faster and is close on
 * small open grids.
 */
export const DEFAULT_ORDERING: Ordering = 'nd';

/** Result of {@link analyzeCholesky}; read-only and shareable between factorizations. */
export interface CholeskySymbolic {
  /** Matrix size. */
  readonly n: number;
  /** The ordering that produced `perm`. */
  readonly ordering: Ordering;
  /** perm[k] = original index of the k-th pivot (the ordering, followed by a postorder of its elimination tree). */
  readonly perm: Int32Array;
  /** Inverse permutation: pinv[perm[k]] = k. */
  readonly pinv: Int32Array;
  /** Number of nonzeros of L, diagonal included. */
  readonly nnzL: number;
  /** Elimination tree of P·A·Pᵀ (−1 at roots). */
  readonly parent: Int32Array;
  /** Postorder of the elimination tree. */
  readonly post: Int32Array;
  /** Nonzeros in each column of L, diagonal included. */
  readonly colCount: Int32Array;
  /** Column pointers of L (cumulative colCount), length n + 1. */
  readonly lColPtr: Int32Array;
  /** Numeric method the analysis prepared for. */
  readonly method: CholeskyMethod;
  /**
   * Pattern of C = P·A·Pᵀ in CSC as the method reads it: the upper triangle
   * (column k lists rows i ≤ k) for 'simplicial', the lower triangle (rows
   * i ≥ k) for 'supernodal'. Rows unsorted.
   */
  readonly cColPtr: Int32Array;
  /** Row indices of C (see `cColPtr`). */
  readonly cRowIdx: Int32Array;
  /** For entry p of the lower-triangle input, its slot in C's values. */
  readonly valueMap: Int32Array;
  /** Supernode partition and patterns ('supernodal' only, else null). */
  readonly supernodal: SupernodalStructure | null;
  /** Pattern of the analysed input, to check that a refactorization matches. */
  readonly inputColPtr: Int32Array;
  /** Row indices of the analysed input. */
  readonly inputRowIdx: Int32Array;
  /** Milliseconds spent on the ordering and on the rest of the analysis. */
  readonly timing: { readonly orderingMs: number; readonly symbolicMs: number };
}

/** Options of {@link analyzeCholesky}. */
export interface AnalyzeOptions {
  /** Fill-reducing ordering (default {@link DEFAULT_ORDERING}). */
  ordering?: Ordering;
  /**
   * Numeric method: 'supernodal' (multifrontal with dense blocks, default) or
   * 'simplicial' (up-looking, one column at a time).
   */
  method?: CholeskyMethod;
  /**
   * Orders the parts of the nested dissection on other threads as well
   * (ordering-executor.ts; on Node `NodeOrderingExecutor`); the permutation
   * is the serial one. Without it everything runs on the calling thread.
   */
  orderingExecutor?: OrderingExecutor | null;
  /**
   * Other work of the caller's, called exactly once before analyzeCholesky
   * returns (not when it throws first): with an ordering executor and a graph
   * at or above its `minSize`, on this thread while the executor's threads
   * split and order the pattern (ordering-executor.ts, the lead split);
   * otherwise just before the ordering. The analysis reads only the input's
   * pattern, so this may fill in its values (the heat method assembles its
   * matrices here).
   */
  meanwhile?: () => void;
}

/** Numeric factorization methods. */
export type CholeskyMethod = 'supernodal' | 'simplicial';

/** nnz(L) beyond this cannot be indexed by Int32Array offsets. */
const MAX_NNZ_L = 2 ** 31 - 1;

/**
 * Symbolic analysis of a symmetric positive definite matrix given by its LOWER
 * triangle (i ≥ j, diagonal included) in CSC. Throws `USAGE` when the input
 * is not a valid lower triangle and `LIMIT` when L would not fit 32-bit offsets.
 */
export function analyzeCholesky(Alower: CscMatrix, opts: AnalyzeOptions = {}): CholeskySymbolic {
  const ordering = opts.ordering ?? DEFAULT_ORDERING;
  const method = opts.method ?? 'supernodal';
  if (method !== 'supernodal' && method !== 'simplicial') throw usageError(`unknown Cholesky method '${String(method)}'`);
  const { n, colPtr, rowIdx } = Alower;
  if (colPtr.length !== n + 1 || colPtr[0] !== 0) throw usageError(`Cholesky input: colPtr must have n + 1 = ${n + 1} entries starting at 0`);
  for (let j = 0; j < n; j++) {
    if (colPtr[j + 1]! < colPtr[j]!) throw usageError(`Cholesky input: colPtr decreases at column ${j}`);
    let last = -1;
    for (let p = colPtr[j]!; p < colPtr[j + 1]!; p++) {
      const i = rowIdx[p]!;
      if (i < j) throw usageError(`Cholesky input must be the lower triangle (row ${i} < column ${j}); see lowerTriangle()`);
      if (i >= n || i <= last) throw usageError(`Cholesky input: rows of column ${j} not sorted, repeated or out of range`);
      last = i;
    }
  }
  const nz = colPtr[n]!;
  let pending = opts.meanwhile ?? null;
  const meanwhile = (): void => {
    const f = pending;
    pending = null;
    f?.();
  };
  // without threads to overlap with, before the ordering (so its time is not counted as ordering)
  const executor = opts.orderingExecutor ?? null;
  if (!(ordering === 'nd' && executor !== null && n >= executor.minSize)) meanwhile();
  const t0 = performance.now();
  let perm0: Int32Array;
  if (ordering === 'natural') {
    perm0 = new Int32Array(n);
    for (let k = 0; k < n; k++) perm0[k] = k;
  } else if (ordering === 'nd') {
    const g = adjacencyFromLower(Alower);
    perm0 = opts.orderingExecutor ? parallelNestedDissection(g, {}, opts.orderingExecutor, pending ? meanwhile : undefined) : nestedDissection(g);
  } else if (ordering === 'amd') {
    perm0 = approximateMinimumDegree(adjacencyFromLower(Alower));
  } else {
    throw usageError(`unknown ordering '${String(ordering)}' (expected amd, nd or natural)`);
  }
  meanwhile(); // in case the threaded ordering did not call it (it always does)
  const t1 = performance.now();
  // Follow the ordering by a postorder of its elimination tree: same fill,
  // but subtrees become contiguous column ranges (supernodes, frontal stack).
  const pinv0 = inversePermutation(perm0);
  const supernodalMethod = method === 'supernodal';
  // the lower triangle's slots are kept for the supernodal C (relabelled below instead of built again)
  const first = permutedPattern(Alower, pinv0, true, true, supernodalMethod ? 'low' : 'none');
  // Children are visited by increasing column count, so the child whose
  // pattern is closest to its parent's is numbered just before it, where
  // relaxed supernode amalgamation can merge them.
  const parent0 = eliminationTree(n, first.up.ptr, first.up.idx);
  const count0 = columnCounts(n, first.low.ptr, first.low.idx, parent0, postorder(parent0, n));
  const post0 = postorder(parent0, n, count0);
  const perm = new Int32Array(n);
  for (let k = 0; k < n; k++) perm[k] = perm0[post0[k]!]!;
  const pinv = inversePermutation(perm);
  // C as the numeric method reads it: the lower triangle (supernodal) or the upper one (simplicial)
  const newOf = inversePermutation(post0);
  const C = supernodalMethod ? relabelLower(first.low, post0, newOf) : permutedPattern(Alower, pinv, true, false, 'both').up;
  // A postorder is an equivalent reordering: the elimination tree of the
  // reordered matrix is the same tree relabelled, and every column keeps its
  // count (Liu, "The role of elimination trees in sparse factorization",
  // SIAM J. Matrix Anal. Appl. 11(1), 1990, §3), so both are relabelled
  // instead of computed again.
  const parent = new Int32Array(n);
  const colCount = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const q = parent0[post0[k]!]!;
    parent[k] = q === -1 ? -1 : newOf[q]!;
    colCount[k] = count0[post0[k]!]!;
  }
  // the relabelled tree is numbered in postorder (every subtree a range ending at its root), so
  // 0, 1, …, n − 1 is its postorder, and the one postorder() gives (children by increasing index)
  const post = new Int32Array(n);
  for (let k = 0; k < n; k++) post[k] = k;
  const lColPtr = new Int32Array(n + 1);
  let total = 0;
  for (let k = 0; k < n; k++) {
    total += colCount[k]!;
    if (total > MAX_NNZ_L) throw limitError(`Cholesky factor would have more than ${MAX_NNZ_L} nonzeros (32-bit offsets); no option raises this heat-method limit: use --method exact or graph, or a coarser mesh`);
    lColPtr[k + 1] = total;
  }
  const supernodal = supernodalMethod ? findSupernodes(n, parent, colCount, C.ptr, C.idx) : null;
  const t2 = performance.now();
  return {
    n,
    ordering,
    perm,
    pinv,
    nnzL: total,
    parent,
    post,
    colCount,
    lColPtr,
    method,
    cColPtr: C.ptr,
    cRowIdx: C.idx,
    valueMap: C.map,
    supernodal,
    inputColPtr: colPtr.slice(),
    inputRowIdx: rowIdx.slice(0, nz),
    timing: { orderingMs: t1 - t0, symbolicMs: t2 - t1 },
  };
}

/**
 * Checks that `Alower` has the analysed pattern (`USAGE` naming the first
 * difference otherwise), scatters its values into C's order (Cx) and, when
 * `minPivot` is given, sets the pivot floors τ·|A_kk| in the permuted
 * numbering (missing diagonal: 0). With `shift` = k > 0 both are scaled by
 * 4^k, exactly (exponent-shift.ts).
 */
export function scatterValues(sym: CholeskySymbolic, Alower: CscMatrix, Cx: Float64Array, minPivot: Float64Array | null, tau: number, shift = 0): void {
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
  const Ax = Alower.values;
  const scale = pow2(2 * shift); // 1 for no shift (x·1 = x for every double)
  for (let p = 0; p < nz; p++) Cx[valueMap[p]!] = Ax[p]! * scale;
  if (minPivot !== null) {
    minPivot.fill(0);
    const { pinv } = sym;
    for (let j = 0; j < n; j++) {
      for (let p = Alower.colPtr[j]!; p < Alower.colPtr[j + 1]!; p++) {
        if (Alower.rowIdx[p] === j) minPivot[pinv[j]!] = tau * Math.abs(Ax[p]! * scale);
      }
    }
  }
}

function inversePermutation(perm: Int32Array): Int32Array {
  const pinv = new Int32Array(perm.length);
  for (let k = 0; k < perm.length; k++) pinv[perm[k]!] = k;
  return pinv;
}
