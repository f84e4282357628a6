/**
 * Test matrices for the sparse solver: grid Laplacians (5-point, and the
 * 7-point pattern of a triangulated grid) plus a diagonal shift, and random
 * sparse SPD matrices made diagonally dominant.
 */
import { TripletMatrix } from '../../src/linalg/triplet.js';
import type { CscMatrix } from '../../src/linalg/csc.js';
import { rng } from '../fixtures/shapes.js';

/**
 * Lower triangle of the graph Laplacian of a nx×ny vertex grid plus
 * shift·I. `diagonals` adds the alternating-diagonal edges of a triangulated
 * grid (the pattern of a cotangent Laplacian on it). Edge weights are 1 or
 * random in [0.5, 1.5) when `seed` is given.
 */
export function gridLaplacianLower(nx: number, ny: number, shift: number, diagonals = true, seed?: number): CscMatrix {
  const n = nx * ny;
  const r = seed === undefined ? () => 0.5 : rng(seed);
  const T = new TripletMatrix(n, 8 * n);
  const edge = (a: number, b: number) => {
    const w = 0.5 + r();
    const i = Math.max(a, b), j = Math.min(a, b);
    T.add(i, j, -w);
    T.add(a, a, w);
    T.add(b, b, w);
  };
  for (let y = 0; y < ny; y++) {
    for (let x = 0; x < nx; x++) {
      const v = y * nx + x;
      T.add(v, v, shift);
      if (x + 1 < nx) edge(v, v + 1);
      if (y + 1 < ny) edge(v, v + nx);
      if (diagonals && x + 1 < nx && y + 1 < ny) {
        if ((x + y) % 2 === 0) edge(v, v + nx + 1);
        else edge(v + 1, v + nx);
      }
    }
  }
  return T.toCsc();
}

/**
 * Lower triangle of a random sparse symmetric matrix with about `perCol`
 * off-diagonal entries per column in [−1, 1), made positive definite by a
 * diagonal exceeding the absolute row sum by `margin` (Gershgorin).
 */
export function randomSpdLower(n: number, perCol: number, seed: number, margin = 0.1): CscMatrix {
  const r = rng(seed);
  const T = new TripletMatrix(n);
  const rowSum = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    for (let k = 0; k < perCol; k++) {
      const i = Math.floor(r() * n);
      if (i === j) continue;
      const v = 2 * r() - 1;
      T.add(Math.max(i, j), Math.min(i, j), v);
      rowSum[i]! += Math.abs(v);
      rowSum[j]! += Math.abs(v);
    }
  }
  for (let j = 0; j < n; j++) T.add(j, j, rowSum[j]! + margin + r());
  return T.toCsc();
}

/** Dense row-major copy of the symmetric matrix with lower triangle L. */
export function denseFromLower(L: CscMatrix): Float64Array {
  const n = L.n;
  const A = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let p = L.colPtr[j]!; p < L.colPtr[j + 1]!; p++) {
      const i = L.rowIdx[p]!;
      A[i * n + j]! += L.values[p]!;
      if (i !== j) A[j * n + i]! += L.values[p]!;
    }
  }
  return A;
}

/** max over columns of Σ|a_ij| (the 1-norm) of the symmetric matrix with lower triangle L. */
export function normOneLower(L: CscMatrix): number {
  const s = new Float64Array(L.n);
  for (let j = 0; j < L.n; j++) {
    for (let p = L.colPtr[j]!; p < L.colPtr[j + 1]!; p++) {
      const i = L.rowIdx[p]!, a = Math.abs(L.values[p]!);
      s[j]! += a;
      if (i !== j) s[i]! += a;
    }
  }
  let m = 0;
  for (let j = 0; j < L.n; j++) m = Math.max(m, s[j]!);
  return m;
}

/** ∞-norm of a vector. */
export function normInf(x: Float64Array): number {
  let m = 0;
  for (let i = 0; i < x.length; i++) m = Math.max(m, Math.abs(x[i]!));
  return m;
}

/** True when `p` holds each of 0 … n−1 exactly once. */
export function isPermutation(p: Int32Array, n: number): boolean {
  if (p.length !== n) return false;
  const seen = new Uint8Array(n);
  for (const v of p) {
    if (v < 0 || v >= n || seen[v]) return false;
    seen[v] = 1;
  }
  return true;
}

/** A with the rows and columns of `fixed` replaced by identity rows (Dirichlet rows: the heat pair's second matrix). */
export function withIdentityRows(A: CscMatrix, fixed: (v: number) => boolean): CscMatrix {
  const values = A.values.slice();
  for (let j = 0; j < A.n; j++) {
    for (let p = A.colPtr[j]!; p < A.colPtr[j + 1]!; p++) {
      const i = A.rowIdx[p]!;
      if (fixed(i) || fixed(j)) values[p] = i === j ? 1 : 0;
    }
  }
  return { ...A, values };
}
