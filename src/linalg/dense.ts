/**
 * Dense Cholesky for small matrices, the test oracle of the sparse solver.
 * Row-major n×n Float64Array; textbook column-by-column algorithm
 * (Golub & Van Loan, Matrix Computations, Alg. 4.2.1).
 */

/**
 * Lower-triangular G with A = G·Gᵀ (row-major), or null when a pivot is not
 * positive.
 */
export function denseCholesky(A: Float64Array, n: number): Float64Array | null {
  const G = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    let d = A[j * n + j]!;
    for (let k = 0; k < j; k++) d -= G[j * n + k]! * G[j * n + k]!;
    if (!(d > 0)) return null;
    const gjj = Math.sqrt(d);
    G[j * n + j] = gjj;
    for (let i = j + 1; i < n; i++) {
      let s = A[i * n + j]!;
      for (let k = 0; k < j; k++) s -= G[i * n + k]! * G[j * n + k]!;
      G[i * n + j] = s / gjj;
    }
  }
  return G;
}

/** Solves (G·Gᵀ) x = b with a dense lower-triangular G (row-major). */
export function denseCholeskySolve(G: Float64Array, n: number, b: Float64Array): Float64Array {
  const x = Float64Array.from(b);
  for (let i = 0; i < n; i++) {
    let s = x[i]!;
    for (let k = 0; k < i; k++) s -= G[i * n + k]! * x[k]!;
    x[i] = s / G[i * n + i]!;
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = x[i]!;
    for (let k = i + 1; k < n; k++) s -= G[k * n + i]! * x[k]!;
    x[i] = s / G[i * n + i]!;
  }
  return x;
}
