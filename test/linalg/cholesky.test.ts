/**
 * Sparse Cholesky: residuals, dense oracle, refactorization, failures.
 */
import { describe, expect, it } from 'vitest';
import { test as fcTest, fc } from '@fast-check/vitest';
import { analyzeCholesky, CholeskyFactor, symmetricSpmvLower, TripletMatrix } from '../../src/linalg/index.js';
import type { CholeskyMethod, Ordering } from '../../src/linalg/index.js';
import { denseCholesky, denseCholeskySolve } from '../../src/linalg/dense.js';
import { OrthodromeError } from '../../src/errors.js';
import { denseFromLower, gridLaplacianLower, normInf, normOneLower, randomSpdLower } from './helpers.js';
import { icosphere, rng, terrain } from '../fixtures/shapes.js';
import type { Shape } from '../fixtures/shapes.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, meanEdgeLength } from '../../src/metric/intrinsic.js';
import { edgeCotanWeights } from '../../src/metric/triangle.js';
import { barycentricVertexAreas } from '../../src/metric/vertex-areas.js';
import type { CscMatrix } from '../../src/linalg/index.js';

const ORDERINGS: Ordering[] = ['natural', 'nd', 'amd'];
const METHODS: CholeskyMethod[] = ['supernodal', 'simplicial'];

/** Scaled residual ‖Ax − b‖∞ / (‖A‖·‖x‖∞ + ‖b‖∞). */
function scaledResidual(A: CscMatrix, x: Float64Array, b: Float64Array): number {
  const r = new Float64Array(A.n);
  symmetricSpmvLower(A, x, r);
  for (let i = 0; i < A.n; i++) r[i]! -= b[i]!;
  return normInf(r) / (normOneLower(A) * normInf(x) + normInf(b));
}

function randomVector(n: number, seed: number): Float64Array {
  const r = rng(seed);
  return Float64Array.from({ length: n }, () => 2 * r() - 1);
}

describe('sparse Cholesky residuals', () => {
  // Backward stability of Cholesky: the scaled residual is a small multiple of
  // machine epsilon (Davis 2006, ch. 4; Higham, Accuracy and Stability of
  // Numerical Algorithms, 2002, Thm 10.3 — from memory).
  for (const ordering of ORDERINGS) for (const method of METHODS) {
    it(`grid Laplacian + shift, ${ordering}, ${method}`, () => {
      const A = gridLaplacianLower(60, 45, 1e-4, true, 7);
      const f = CholeskyFactor.factor(A, analyzeCholesky(A, { ordering, method }));
      const b = randomVector(A.n, 3);
      const x = new Float64Array(A.n);
      f.solve(b, x);
      expect(scaledResidual(A, x, b)).toBeLessThan(1e-14);
    });
    it(`random sparse SPD, ${ordering}, ${method}`, () => {
      for (let seed = 1; seed <= 5; seed++) {
        const A = randomSpdLower(400, 3, seed);
        const f = CholeskyFactor.factor(A, analyzeCholesky(A, { ordering, method }));
        const b = randomVector(A.n, seed + 100);
        const x = new Float64Array(A.n);
        f.solve(b, x);
        expect(scaledResidual(A, x, b)).toBeLessThan(1e-14);
      }
    });
  }

  it('sizes 0 and 1 (4·x = 2 gives x = 0.5)', () => {
    for (const method of METHODS) {
      const E = new TripletMatrix(0).toCsc();
      const fe = CholeskyFactor.factor(E, analyzeCholesky(E, { method }));
      fe.solve(new Float64Array(0), new Float64Array(0));
      expect(fe.nnzL).toBe(0);
      const T = new TripletMatrix(1);
      T.add(0, 0, 4);
      const A = T.toCsc();
      const f = CholeskyFactor.factor(A, analyzeCholesky(A, { method }));
      const x = new Float64Array(1);
      f.solve(Float64Array.of(2), x);
      expect(x[0]).toBe(0.5);
    }
  });

  it('sparse right-hand sides (the forward pass skips zero supernodes) match the dense oracle', () => {
    // A⁻¹ e_k is column k of A⁻¹; the dense Cholesky oracle (dense.ts) gives it independently. Agreement
    // to 1e-12 relative is the backward-stability bound above times cond(A) ≈ 1e3 for this shifted grid
    // Laplacian (common practice). Sources at the first, middle and last vertex (leaf, interior and
    // separator supernodes under nested dissection) and a pair of far-apart nonzeros.
    const A = gridLaplacianLower(24, 19, 1e-2, true, 3);
    const n = A.n;
    const G = denseCholesky(denseFromLower(A), n)!;
    for (const method of METHODS) {
      const f = CholeskyFactor.factor(A, analyzeCholesky(A, { method }));
      for (const nz of [[0], [n >> 1], [n - 1], [5, n - 7], [12 * 24 + 11]]) {
        const b = new Float64Array(n);
        for (const k of nz) b[k] = 1 + k / n;
        const x = new Float64Array(n);
        f.solve(b, x);
        const xd = denseCholeskySolve(G, n, b);
        let err = 0;
        for (let i = 0; i < n; i++) err = Math.max(err, Math.abs(x[i]! - xd[i]!));
        expect(err / normInf(xd)).toBeLessThan(1e-12);
        expect(scaledResidual(A, x, b)).toBeLessThan(1e-14);
      }
    }
  });

  it('solve allows out to alias b', () => {
    const A = gridLaplacianLower(20, 20, 0.1);
    const f = CholeskyFactor.factor(A, analyzeCholesky(A));
    const b = randomVector(A.n, 9);
    const x = new Float64Array(A.n);
    f.solve(b, x);
    const y = b.slice();
    f.solve(y, y);
    expect(Array.from(y)).toEqual(Array.from(x));
  });

  it('the factor has exactly the predicted nnz(L), diagonal first and rows sorted', () => {
    const A = randomSpdLower(300, 4, 11);
    for (const ordering of ORDERINGS) {
      const sym = analyzeCholesky(A, { ordering, method: 'simplicial' });
      const L = CholeskyFactor.factor(A, sym).lowerFactor();
      expect(L.colPtr[A.n]).toBe(sym.nnzL);
      let bad = 0;
      for (let j = 0; j < A.n; j++) {
        if (L.rowIdx[L.colPtr[j]!] !== j) bad++;
        for (let p = L.colPtr[j]! + 1; p < L.colPtr[j + 1]!; p++) if (L.rowIdx[p]! <= L.rowIdx[p - 1]!) bad++;
      }
      expect(bad).toBe(0);
      // the supernodal factor has the same structural pattern (explicit zeros aside)
      const Ls = CholeskyFactor.factor(A, analyzeCholesky(A, { ordering })).lowerFactor();
      expect(Ls.colPtr[A.n]).toBeLessThanOrEqual(sym.nnzL);
      const inPattern = new Set<number>();
      for (let j = 0; j < A.n; j++) for (let p = L.colPtr[j]!; p < L.colPtr[j + 1]!; p++) inPattern.add(L.rowIdx[p]! * A.n + j);
      let outside = 0;
      for (let j = 0; j < A.n; j++) for (let p = Ls.colPtr[j]!; p < Ls.colPtr[j + 1]!; p++) if (!inPattern.has(Ls.rowIdx[p]! * A.n + j)) outside++;
      expect(outside).toBe(0);
    }
  });
});

/** Random SPD matrix as lower CSC: random sparse symmetric B, then B + (|row sums| + margin)·I. */
const spdArb = fc
  .record({
    n: fc.integer({ min: 1, max: 24 }),
    density: fc.double({ min: 0, max: 0.5, noNaN: true }),
    seed: fc.integer({ min: 1, max: 1_000_000 }),
  })
  .map(({ n, density, seed }) => {
    const r = rng(seed);
    const T = new TripletMatrix(n);
    const rowSum = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      for (let i = j + 1; i < n; i++) {
        if (r() >= density) continue;
        const v = 4 * r() - 2;
        T.add(i, j, v);
        rowSum[i]! += Math.abs(v);
        rowSum[j]! += Math.abs(v);
      }
    }
    for (let j = 0; j < n; j++) T.add(j, j, rowSum[j]! + 0.01 + r());
    return T.toCsc();
  });

describe('dense Cholesky oracle (Golub & Van Loan Alg. 4.2.1, in src/linalg/dense.ts)', () => {
  fcTest.prop([spdArb, fc.constantFrom<Ordering>('natural', 'nd', 'amd'), fc.constantFrom<CholeskyMethod>(...METHODS)], { numRuns: 200 })(
    'L·Lᵀ = P·A·Pᵀ and solutions agree',
    (A, ordering, method) => {
      const n = A.n;
      const sym = analyzeCholesky(A, { ordering, method });
      const f = CholeskyFactor.factor(A, sym);
      const Ad = denseFromLower(A);
      // PAPᵀ(k, l) = A(perm[k], perm[l]); LLᵀ from the sparse factor
      const Ld = new Float64Array(n * n);
      const Lc = f.lowerFactor();
      for (let j = 0; j < n; j++) for (let p = Lc.colPtr[j]!; p < Lc.colPtr[j + 1]!; p++) Ld[Lc.rowIdx[p]! * n + j] = Lc.values[p]!;
      let scale = 0;
      for (let k = 0; k < n * n; k++) scale = Math.max(scale, Math.abs(Ad[k]!));
      for (let k = 0; k < n; k++) {
        for (let l = 0; l <= k; l++) {
          let s = 0;
          for (let m = 0; m <= l; m++) s += Ld[k * n + m]! * Ld[l * n + m]!;
          expect(Math.abs(s - Ad[sym.perm[k]! * n + sym.perm[l]!]!)).toBeLessThanOrEqual(1e-13 * scale);
        }
      }
      const G = denseCholesky(Ad, n);
      expect(G).not.toBeNull();
      const b = randomVector(n, n + 5);
      const xd = denseCholeskySolve(G!, n, b);
      const x = new Float64Array(n);
      f.solve(b, x);
      const xs = Math.max(1, normInf(xd));
      for (let i = 0; i < n; i++) expect(Math.abs(x[i]! - xd[i]!)).toBeLessThanOrEqual(1e-11 * xs);
    },
  );
});

describe('heat-method systems from the project\'s own cotangent Laplacian', () => {
  // M + t·L (t = h², h = mean edge length) and L + ε·M on an icosphere and a
  // terrain: the systems of the heat method (Crane, Weischedel, Wardetzky,
  // ACM TOG 32(5), 2013). Both are SPD: L is PSD with kernel = constants
  // (common practice for Delaunay-like meshes), M is diagonal positive.
  function heatSystems(s: Shape): [CscMatrix, CscMatrix] {
    const nv = s.positions.length / 3;
    const { topology: t } = buildTopology(s.triangles, nv);
    const m = intrinsicFromPositions(t, s.positions);
    const w = edgeCotanWeights(m);
    const area = barycentricVertexAreas(m);
    const h = meanEdgeLength(m);
    const build = (a: number, b: number) => {
      const T = new TripletMatrix(t.nv);
      for (let e = 0; e < t.ne; e++) {
        const he = t.edgeHalfedge[e]!;
        const i = t.tri[he]!, j = t.tri[he % 3 === 2 ? he - 2 : he + 1]!;
        T.add(Math.max(i, j), Math.min(i, j), -b * w[e]!);
        T.add(i, i, b * w[e]!);
        T.add(j, j, b * w[e]!);
      }
      for (let v = 0; v < t.nv; v++) T.add(v, v, a * area[v]!);
      return T.toCsc();
    };
    return [build(1, h * h), build(1e-8, 1)];
  }
  const shapes: [string, Shape][] = [
    ['icosphere level 4', icosphere(4)],
    ['terrain 60×50', terrain(59, 49, 2, 1.5, (x, y) => 0.2 * Math.sin(3 * x) * Math.cos(4 * y))],
  ];
  for (const [name, shape] of shapes) {
    it(`${name}: residual ≤ 1e-14 for M + tL and L + εM, one analysis for both`, () => {
      const [heat, poisson] = heatSystems(shape);
      const sym = analyzeCholesky(heat);
      const f = CholeskyFactor.factor(heat, sym);
      const b = randomVector(heat.n, 12);
      const x = new Float64Array(heat.n);
      f.solve(b, x);
      expect(scaledResidual(heat, x, b)).toBeLessThan(1e-14);
      f.refactor(poisson); // same pattern, new values
      // right-hand side with zero mean, as for the heat method's Poisson step
      let mean = 0;
      for (let i = 0; i < b.length; i++) mean += b[i]! / b.length;
      const b2 = b.map((v) => v - mean);
      f.solve(b2, x);
      expect(scaledResidual(poisson, x, b2)).toBeLessThan(1e-14);
    });
  }
});

describe('dense update kernels', () => {
  it('the WebAssembly SIMD kernel and the plain one give the same factor to rounding', () => {
    // large enough for fronts with many 4×2 tiles and odd block widths
    const A = gridLaplacianLower(70, 70, 1e-3, true, 5);
    const sym = analyzeCholesky(A);
    const a = CholeskyFactor.factor(A, sym, { simd: true });
    const b = CholeskyFactor.factor(A, sym, { simd: false });
    expect(a.usesSimd).toBe(true); // Node 20 has WebAssembly SIMD
    expect(b.usesSimd).toBe(false);
    const la = a.lowerFactor().values, lb = b.lowerFactor().values;
    expect(la.length).toBe(lb.length);
    let maxDiff = 0, maxAbs = 0;
    for (let p = 0; p < la.length; p++) {
      maxDiff = Math.max(maxDiff, Math.abs(la[p]! - lb[p]!));
      maxAbs = Math.max(maxAbs, Math.abs(lb[p]!));
    }
    // pairwise-lane summation changes rounding only (common practice: ~n·eps relative)
    expect(maxDiff).toBeLessThanOrEqual(1e-12 * maxAbs);
    const rhs = randomVector(A.n, 8);
    const x = new Float64Array(A.n);
    a.solve(rhs, x);
    expect(scaledResidual(A, x, rhs)).toBeLessThan(1e-14);
  });
});

describe('refactorization', () => {
  it('new values on the same pattern give the same factor as a fresh one', () => {
    const A1 = gridLaplacianLower(30, 30, 1e-3, true, 1);
    const A2 = gridLaplacianLower(30, 30, 2.5, true, 2);
    expect(Array.from(A2.rowIdx)).toEqual(Array.from(A1.rowIdx));
    const sym = analyzeCholesky(A1);
    const f = CholeskyFactor.factor(A1, sym);
    f.refactor(A2);
    const g = CholeskyFactor.factor(A2, sym);
    expect(Array.from(f.lowerFactor().values)).toEqual(Array.from(g.lowerFactor().values));
    const b = randomVector(A2.n, 4);
    const x = new Float64Array(A2.n);
    f.solve(b, x);
    expect(scaledResidual(A2, x, b)).toBeLessThan(1e-14);
  });

  it('factors of one analysis share scratch but not results: each still solves its own matrix', () => {
    // scaled residual ≤ 1e-14 for a backward-stable Cholesky solve (common practice, as above)
    const A1 = gridLaplacianLower(40, 40, 1e-3, true, 5);
    const A2 = gridLaplacianLower(40, 40, 3, true, 6);
    const sym = analyzeCholesky(A1);
    const f1 = CholeskyFactor.factor(A1, sym);
    const f2 = CholeskyFactor.factor(A2, sym);
    const f3 = CholeskyFactor.factor(A1, sym, { simd: false });
    f2.refactor(A2);
    const b = randomVector(A1.n, 7);
    const x = new Float64Array(A1.n);
    for (const [f, A] of [[f1, A1], [f2, A2], [f3, A1]] as const) {
      f.solve(b, x);
      expect(scaledResidual(A, x, b)).toBeLessThan(1e-14);
    }
  });

  it('a different pattern is rejected with USAGE', () => {
    const A1 = gridLaplacianLower(10, 10, 1, true);
    const A2 = gridLaplacianLower(10, 10, 1, false);
    const f = CholeskyFactor.factor(A1, analyzeCholesky(A1));
    expect(() => f.refactor(A2)).toThrow(expect.objectContaining({ code: 'USAGE' }));
  });

  it('recovers after a failed refactorization', () => {
    const A = gridLaplacianLower(12, 12, 1);
    const sym = analyzeCholesky(A);
    const f = CholeskyFactor.factor(A, sym);
    const bad = { ...A, values: A.values.map((v) => -v) };
    expect(() => f.refactor(bad)).toThrow(OrthodromeError);
    f.refactor(A);
    const b = randomVector(A.n, 1);
    const x = new Float64Array(A.n);
    f.solve(b, x);
    expect(scaledResidual(A, x, b)).toBeLessThan(1e-14);
  });
});

describe('non-SPD input is rejected with NUMERIC, never NaN', () => {
  function expectNumeric(A: CscMatrix, column?: number): void {
    for (const method of METHODS) {
      let err: unknown;
      try {
        CholeskyFactor.factor(A, analyzeCholesky(A, { method }));
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(OrthodromeError);
      const e = err as OrthodromeError;
      expect(e.code).toBe('NUMERIC');
      expect(e.message).toMatch(/^matrix is not positive definite \(pivot \S+ at column \d+\)$/);
      if (column !== undefined) expect(e.message).toContain(`at column ${column})`);
    }
  }
  it('indefinite: a pure Laplacian minus a shift (smallest eigenvalue −1)', () => {
    expectNumeric(gridLaplacianLower(10, 10, -1));
  });
  it('zero diagonal at one vertex names that column', () => {
    const T = new TripletMatrix(3);
    T.add(0, 0, 2);
    T.add(2, 2, 2);
    T.add(2, 0, 0.5);
    expectNumeric(T.toCsc(), 1); // column 1 has no diagonal entry at all
    const U = new TripletMatrix(3);
    U.add(0, 0, 2);
    U.add(1, 1, 0);
    U.add(2, 2, 2);
    expectNumeric(U.toCsc(), 1);
  });
  it('NaN and Infinity entries', () => {
    const A = gridLaplacianLower(8, 8, 1);
    const v1 = A.values.slice();
    v1[5] = NaN;
    expectNumeric({ ...A, values: v1 });
    const v2 = A.values.slice();
    v2[0] = Infinity;
    expectNumeric({ ...A, values: v2 });
  });
  it('a 2×2 with |off-diagonal| > diagonal fails at the second pivot: [[1,2],[2,1]] (eigenvalues 3, −1)', () => {
    const T = new TripletMatrix(2);
    T.add(0, 0, 1);
    T.add(1, 0, 2);
    T.add(1, 1, 1);
    const A = T.toCsc();
    // natural order: pivot 2 = 1 − 2² = −3 at column 1 (hand computation)
    expect(() => CholeskyFactor.factor(A, analyzeCholesky(A, { ordering: 'natural' }))).toThrow(
      'matrix is not positive definite (pivot -3 at column 1)',
    );
  });
  it('a singular PSD matrix (pure Laplacian of a 120×120 grid) is caught with a relative pivot floor', () => {
    // The graph Laplacian has the constant vector in its kernel (common
    // practice), so its last pivot is zero up to rounding and may come out
    // tiny and positive; pivotTolerance turns that into the NUMERIC error.
    const A = gridLaplacianLower(120, 120, 0, true, 3);
    const Ashift = gridLaplacianLower(120, 120, 1e-3, true, 3);
    for (const method of METHODS) {
      const sym = analyzeCholesky(A, { method });
      expect(() => CholeskyFactor.factor(A, sym, { pivotTolerance: 1e-10 })).toThrow(
        expect.objectContaining({ code: 'NUMERIC', message: expect.stringMatching(/^matrix is not positive definite \(pivot \S+ at column \d+\)$/) }),
      );
      const f = CholeskyFactor.factor(Ashift, sym, { pivotTolerance: 1e-10 });
      const b = randomVector(A.n, 2);
      const x = new Float64Array(A.n);
      f.solve(b, x);
      expect(scaledResidual(Ashift, x, b)).toBeLessThan(1e-14);
    }
    expect(() => CholeskyFactor.factor(A, analyzeCholesky(A), { pivotTolerance: -1 })).toThrow(expect.objectContaining({ code: 'USAGE' }));
  });
  it('an upper-triangle input is a USAGE error', () => {
    const T = new TripletMatrix(2);
    T.add(0, 0, 1);
    T.add(0, 1, 0.5);
    T.add(1, 1, 1);
    expect(() => analyzeCholesky(T.toCsc())).toThrow(expect.objectContaining({ code: 'USAGE' }));
  });
});
