/**
 * CSC storage, triplet assembly and the products.
 */
import { describe, expect, it } from 'vitest';
import { test as fcTest, fc } from '@fast-check/vitest';
import {
  TripletMatrix,
  checkCsc,
  lowerTriangle,
  spmv,
  symmetricFromLower,
  symmetricSpmvLower,
  transpose,
} from '../../src/linalg/index.js';
import type { CscMatrix } from '../../src/linalg/index.js';

function dense(A: CscMatrix): number[][] {
  const D = Array.from({ length: A.n }, () => new Array<number>(A.n).fill(0));
  for (let j = 0; j < A.n; j++) for (let p = A.colPtr[j]!; p < A.colPtr[j + 1]!; p++) D[A.rowIdx[p]!]![j]! += A.values[p]!;
  return D;
}

const triplets = fc
  .integer({ min: 1, max: 12 })
  .chain((n) =>
    fc.tuple(
      fc.constant(n),
      fc.array(fc.tuple(fc.integer({ min: 0, max: n - 1 }), fc.integer({ min: 0, max: n - 1 }), fc.integer({ min: -9, max: 9 })), {
        maxLength: 60,
      }),
    ),
  );

describe('TripletMatrix', () => {
  it('sums duplicates and sorts rows: a hand-worked 3×3 example (common practice)', () => {
    const T = new TripletMatrix(3, 1); // capacity 1 forces growth
    T.add(2, 0, 1);
    T.add(0, 0, 4);
    T.add(1, 0, 2);
    T.add(2, 0, 0.5);
    T.add(0, 2, 1);
    T.add(1, 1, 3);
    T.add(2, 2, 5);
    const A = T.toCsc();
    expect(Array.from(A.colPtr)).toEqual([0, 3, 4, 6]);
    expect(Array.from(A.rowIdx)).toEqual([0, 1, 2, 1, 0, 2]);
    expect(Array.from(A.values)).toEqual([4, 2, 1.5, 3, 1, 5]);
    expect(() => checkCsc(A)).not.toThrow();
  });

  fcTest.prop([triplets])('toCsc equals the dense sum of the triplets and is a valid CSC', ([n, ts]) => {
    const T = new TripletMatrix(n);
    const D = Array.from({ length: n }, () => new Array<number>(n).fill(0));
    for (const [i, j, v] of ts) {
      T.add(i, j, v);
      D[i]![j]! += v;
    }
    const A = T.toCsc();
    checkCsc(A);
    expect(dense(A)).toEqual(D);
    expect(A.colPtr[n]).toBe(new Set(ts.map(([i, j]) => i * n + j)).size);
  });

  it('rejects out-of-range and non-integer indices with USAGE', () => {
    const T = new TripletMatrix(2);
    expect(() => T.add(2, 0, 1)).toThrow(expect.objectContaining({ code: 'USAGE' }));
    expect(() => T.add(0, -1, 1)).toThrow(expect.objectContaining({ code: 'USAGE' }));
    expect(() => T.add(0.5, 0, 1)).toThrow(expect.objectContaining({ code: 'USAGE' }));
  });
});

describe('products', () => {
  fcTest.prop([triplets, fc.integer({ min: 1, max: 1000 })])('spmv, transpose and the symmetric products agree with dense ones', ([n, ts], seed) => {
    const T = new TripletMatrix(n);
    for (const [i, j, v] of ts) T.add(i, j, v);
    const A = T.toCsc();
    const x = Float64Array.from({ length: n }, (_, i) => Math.sin(seed + 3 * i));
    const D = dense(A);
    const y = new Float64Array(n);
    spmv(A, x, y);
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) s += D[i]![j]! * x[j]!;
      expect(y[i]).toBeCloseTo(s, 12);
    }
    expect(dense(transpose(A))).toEqual(D.map((_, i) => D.map((row) => row[i]!)));
    // symmetric part from the lower triangle: S = L + Lᵀ − diag(L)
    const L = lowerTriangle(A);
    const S = dense(symmetricFromLower(L));
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) expect(S[i]![j]).toBe(i >= j ? D[i]![j] : D[j]![i]);
    const z = new Float64Array(n);
    symmetricSpmvLower(L, x, z);
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) s += S[i]![j]! * x[j]!;
      expect(z[i]).toBeCloseTo(s, 12);
    }
  });

  it('checkCsc names the first bad column', () => {
    const A: CscMatrix = { n: 2, colPtr: Int32Array.from([0, 2, 3]), rowIdx: Int32Array.from([1, 0, 1]), values: new Float64Array(3) };
    expect(() => checkCsc(A)).toThrow(/column 0/);
  });
});
