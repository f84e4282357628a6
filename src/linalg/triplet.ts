/**
 * Triplet (coordinate) assembly: add (i, j, v) in any order, repeats allowed;
 * `toCsc` sums repeats and sorts rows. Storage grows by doubling.
 */
import type { CscMatrix } from './csc.js';
import { usageError } from '../errors.js';

/** Triplet assembly of an n×n matrix with duplicates summed on conversion. */
export class TripletMatrix {
  /** Number of rows and of columns. */
  readonly n: number;
  private rows: Int32Array;
  private cols: Int32Array;
  private vals: Float64Array;
  private count = 0;

  /**
   * @param n - matrix size
   * @param capacity - initial number of triplets to reserve (grows as needed)
   */
  constructor(n: number, capacity = 16) {
    if (!Number.isInteger(n) || n < 0) throw usageError(`matrix size must be a non-negative integer, got ${n}`);
    const c = Math.max(1, Math.floor(capacity));
    this.n = n;
    this.rows = new Int32Array(c);
    this.cols = new Int32Array(c);
    this.vals = new Float64Array(c);
  }

  /** Number of triplets added so far (repeats counted). */
  get size(): number {
    return this.count;
  }

  /** Adds v to entry (i, j); throws `USAGE` when i or j is outside 0..n-1. */
  add(i: number, j: number, v: number): void {
    if (!(i >= 0 && i < this.n && j >= 0 && j < this.n) || (i | 0) !== i || (j | 0) !== j) {
      throw usageError(`entry (${i}, ${j}) outside a ${this.n}×${this.n} matrix`);
    }
    if (this.count === this.rows.length) this.grow();
    const k = this.count++;
    this.rows[k] = i;
    this.cols[k] = j;
    this.vals[k] = v;
  }

  /** Forgets all triplets, keeping the storage. */
  clear(): void {
    this.count = 0;
  }

  private grow(): void {
    const c = 2 * this.rows.length;
    const r = new Int32Array(c), cc = new Int32Array(c), v = new Float64Array(c);
    r.set(this.rows);
    cc.set(this.cols);
    v.set(this.vals);
    this.rows = r;
    this.cols = cc;
    this.vals = v;
  }

  /**
   * Compressed-column form with repeats summed and rows sorted. Two counting
   * sorts: by row into a row-major list, then by column, which leaves the rows
   * of every column in increasing order; repeats are then adjacent. O(nnz + n).
   */
  toCsc(): CscMatrix {
    const { n, count, rows, cols, vals } = this;
    const rp = new Int32Array(n + 1);
    for (let k = 0; k < count; k++) rp[rows[k]! + 1]!++;
    for (let i = 0; i < n; i++) rp[i + 1]! += rp[i]!;
    const byRowCol = new Int32Array(count);
    const byRowVal = new Float64Array(count);
    const next = rp.slice(0, n);
    for (let k = 0; k < count; k++) {
      const q = next[rows[k]!]!++;
      byRowCol[q] = cols[k]!;
      byRowVal[q] = vals[k]!;
    }
    // second pass: walk rows in order, append to columns
    const cp = new Int32Array(n + 1);
    for (let k = 0; k < count; k++) cp[cols[k]! + 1]!++;
    for (let j = 0; j < n; j++) cp[j + 1]! += cp[j]!;
    const fill = cp.slice(0, n);
    const ri = new Int32Array(count);
    const vx = new Float64Array(count);
    for (let i = 0; i < n; i++) {
      for (let q = rp[i]!; q < rp[i + 1]!; q++) {
        const j = byRowCol[q]!;
        const p = fill[j]!++;
        ri[p] = i;
        vx[p] = byRowVal[q]!;
      }
    }
    // sum repeats (adjacent within each column), compacting in place
    let w = 0;
    const outPtr = new Int32Array(n + 1);
    for (let j = 0; j < n; j++) {
      outPtr[j] = w;
      const start = w;
      for (let p = cp[j]!; p < cp[j + 1]!; p++) {
        if (w > start && ri[w - 1] === ri[p]) {
          vx[w - 1]! += vx[p]!;
        } else {
          ri[w] = ri[p]!;
          vx[w++] = vx[p]!;
        }
      }
    }
    outPtr[n] = w;
    return { n, colPtr: outPtr, rowIdx: w === count ? ri : ri.slice(0, w), values: w === count ? vx : vx.slice(0, w) };
  }
}
