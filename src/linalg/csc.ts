/**
 * Compressed-column (CSC) storage and the products on it.
 *
 * Column j holds rows rowIdx[colPtr[j] .. colPtr[j+1]-1] with their values;
 * rows are sorted within each column and no (i, j) appears twice.
 *
 * ```
 *   A = | 4 . 1 |     colPtr = [0, 2, 3, 5]
 *       | 2 3 . |     rowIdx = [0, 1,  1,  0, 2]
 *       | . . 5 |     values = [4, 2,  3,  1, 5]
 * ```
 */
import { usageError } from '../errors.js';

/** A square n×n matrix in compressed-column form; row indices sorted within each column. */
export interface CscMatrix {
  /** Number of rows and of columns. */
  readonly n: number;
  /** Column start offsets, length n + 1; colPtr[n] = number of stored entries. */
  readonly colPtr: Int32Array;
  /** Row index of every stored entry, sorted within each column. */
  readonly rowIdx: Int32Array;
  /** Value of every stored entry. */
  readonly values: Float64Array;
}

/** Number of stored entries of `A`. */
export function nnz(A: CscMatrix): number {
  return A.colPtr[A.n]!;
}

/**
 * Checks the structure of a CSC matrix (pointer monotonicity, row range, sorted
 * rows without repeats) and throws a `USAGE` error naming the first bad column.
 * O(nnz); the kernels below trust their input and never check.
 */
export function checkCsc(A: CscMatrix, label = 'matrix'): void {
  const { n, colPtr, rowIdx, values } = A;
  if (!Number.isInteger(n) || n < 0) throw usageError(`${label}: bad size ${n}`);
  if (colPtr.length !== n + 1 || colPtr[0] !== 0) throw usageError(`${label}: colPtr must have n + 1 = ${n + 1} entries starting at 0`);
  const nz = colPtr[n]!;
  if (rowIdx.length < nz || values.length < nz) throw usageError(`${label}: rowIdx/values shorter than colPtr[n] = ${nz}`);
  for (let j = 0; j < n; j++) {
    const p0 = colPtr[j]!, p1 = colPtr[j + 1]!;
    if (p1 < p0) throw usageError(`${label}: colPtr decreases at column ${j}`);
    let last = -1;
    for (let p = p0; p < p1; p++) {
      const i = rowIdx[p]!;
      if (i <= last || i >= n) throw usageError(`${label}: rows of column ${j} not sorted, repeated or out of range (row ${i})`);
      last = i;
    }
  }
}

/**
 * out = A·x for A stored in full (general, or symmetric with both triangles).
 * `out` must not alias `x`. Does not allocate.
 */
export function spmv(A: CscMatrix, x: Float64Array, out: Float64Array): void {
  const { n, colPtr, rowIdx, values } = A;
  out.fill(0, 0, n);
  for (let j = 0; j < n; j++) {
    const xj = x[j]!;
    if (xj === 0) continue;
    const p1 = colPtr[j + 1]!;
    for (let p = colPtr[j]!; p < p1; p++) out[rowIdx[p]!]! += values[p]! * xj;
  }
}

/**
 * out = A·x for a symmetric A given by its lower triangle L (i ≥ j, diagonal
 * included): A = L + Lᵀ − diag(L). `out` must not alias `x`. Does not allocate.
 */
export function symmetricSpmvLower(L: CscMatrix, x: Float64Array, out: Float64Array): void {
  const { n, colPtr, rowIdx, values } = L;
  out.fill(0, 0, n);
  for (let j = 0; j < n; j++) {
    const xj = x[j]!;
    let acc = 0;
    const p1 = colPtr[j + 1]!;
    for (let p = colPtr[j]!; p < p1; p++) {
      const i = rowIdx[p]!;
      const a = values[p]!;
      if (i === j) {
        acc += a * xj;
      } else {
        out[i]! += a * xj; // A(i,j) x_j
        acc += a * x[i]!; // A(j,i) x_i, the mirrored entry
      }
    }
    out[j]! += acc;
  }
}

/** The lower triangle (entries with i ≥ j) of `A`, as a new matrix. */
export function lowerTriangle(A: CscMatrix): CscMatrix {
  const { n, colPtr, rowIdx, values } = A;
  let count = 0;
  for (let j = 0; j < n; j++) for (let p = colPtr[j]!; p < colPtr[j + 1]!; p++) if (rowIdx[p]! >= j) count++;
  const cp = new Int32Array(n + 1);
  const ri = new Int32Array(count);
  const vx = new Float64Array(count);
  let q = 0;
  for (let j = 0; j < n; j++) {
    cp[j] = q;
    for (let p = colPtr[j]!; p < colPtr[j + 1]!; p++) {
      if (rowIdx[p]! >= j) {
        ri[q] = rowIdx[p]!;
        vx[q++] = values[p]!;
      }
    }
  }
  cp[n] = q;
  return { n, colPtr: cp, rowIdx: ri, values: vx };
}

/**
 * Aᵀ by a counting sort over rows; rows of the result come out sorted because
 * columns of A are visited in increasing order.
 */
export function transpose(A: CscMatrix): CscMatrix {
  const { n, colPtr, rowIdx, values } = A;
  const nz = colPtr[n]!;
  const cp = new Int32Array(n + 1);
  for (let p = 0; p < nz; p++) cp[rowIdx[p]! + 1]!++;
  for (let i = 0; i < n; i++) cp[i + 1]! += cp[i]!;
  const fill = cp.slice(0, n);
  const ri = new Int32Array(nz);
  const vx = new Float64Array(nz);
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]!; p < colPtr[j + 1]!; p++) {
      const q = fill[rowIdx[p]!]!++;
      ri[q] = j;
      vx[q] = values[p]!;
    }
  }
  return { n, colPtr: cp, rowIdx: ri, values: vx };
}

/** The full symmetric matrix L + Lᵀ − diag(L) from its lower triangle. */
export function symmetricFromLower(L: CscMatrix): CscMatrix {
  const U = transpose(L);
  const { n } = L;
  const cp = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) {
    let c = L.colPtr[j + 1]! - L.colPtr[j]! + U.colPtr[j + 1]! - U.colPtr[j]!;
    for (let p = L.colPtr[j]!; p < L.colPtr[j + 1]!; p++) if (L.rowIdx[p] === j) c--;
    cp[j + 1] = cp[j]! + c;
  }
  const ri = new Int32Array(cp[n]!);
  const vx = new Float64Array(cp[n]!);
  for (let j = 0; j < n; j++) {
    let q = cp[j]!;
    // column j of A = column j of U (rows ≤ j) followed by column j of L without its diagonal
    for (let p = U.colPtr[j]!; p < U.colPtr[j + 1]!; p++) {
      ri[q] = U.rowIdx[p]!;
      vx[q++] = U.values[p]!;
    }
    for (let p = L.colPtr[j]!; p < L.colPtr[j + 1]!; p++) {
      if (L.rowIdx[p] === j) continue;
      ri[q] = L.rowIdx[p]!;
      vx[q++] = L.values[p]!;
    }
  }
  return { n, colPtr: cp, rowIdx: ri, values: vx };
}
