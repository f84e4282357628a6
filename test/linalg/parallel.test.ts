/**
 * Factorizations on worker threads (parallel-node.ts) against the same
 * factorizations on this thread: the worker runs the same multifrontal
 * kernel on the same values, so every entry of L must be bit-identical
 * (IEEE 754 arithmetic is deterministic for the same operations in the same
 * order: common practice), and a matrix that is not positive definite must
 * give the same NUMERIC error naming the same column.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyzeCholesky, CholeskyFactor } from '../../src/linalg/index.js';
import type { CscMatrix } from '../../src/linalg/index.js';
import { NodeFactorExecutor } from '../../src/linalg/parallel-node.js';
import { gridLaplacianLower, withIdentityRows } from './helpers.js';

// no taking back: every job other than the first runs on a worker, whatever the machine's load
const executor = new NodeFactorExecutor({ minSize: 0, threads: 2, steal: false });
beforeAll(async () => {
  executor.warm();
  await executor.ready();
});
afterAll(() => executor.close());

/** The same pattern with other values: the diagonal scaled by `k`. */
function scaledDiagonal(A: CscMatrix, k: number): CscMatrix {
  const values = A.values.slice();
  for (let j = 0; j < A.n; j++) {
    for (let p = A.colPtr[j]!; p < A.colPtr[j + 1]!; p++) if (A.rowIdx[p] === j) values[p]! *= k;
  }
  return { ...A, values };
}

function sameBits(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

describe('factorizations on worker threads', () => {
  it('give factors bit-identical to the serial ones, whichever thread ran them', () => {
    // a triangulated 70×70 grid (4900 unknowns, separators large enough for the SIMD kernel)
    const A = gridLaplacianLower(70, 70, 0.01, true, 7);
    const mats = [A, scaledDiagonal(A, 1.5), scaledDiagonal(A, 3)];
    const sym = analyzeCholesky(A);
    const before = executor.counts.remote;
    for (let round = 0; round < 2; round++) {
      const par = CholeskyFactor.factorMany(mats, sym, { executor });
      const ser = CholeskyFactor.factorMany(mats, sym);
      for (let k = 0; k < mats.length; k++) {
        const fp = par[k]!, fs = ser[k]!;
        expect(fp).toBeInstanceOf(CholeskyFactor);
        expect(fs).toBeInstanceOf(CholeskyFactor);
        expect(sameBits((fp as CholeskyFactor).lowerFactor().values, (fs as CholeskyFactor).lowerFactor().values)).toBe(true);
      }
    }
    expect(executor.counts.remote - before).toBe(2); // one task run per round, joined by the workers (multifrontal-tasks.ts)
    expect(executor.counts.failed).toBe(0);
  });

  it('are taken back by the caller when no worker has started them, with the same bits', async () => {
    // a fresh executor: its worker is still loading when this thread is done with the first matrix
    const fresh = new NodeFactorExecutor({ minSize: 0, threads: 1 });
    try {
      const A = gridLaplacianLower(30, 30, 0.01, true, 5);
      const mats = [A, scaledDiagonal(A, 2), scaledDiagonal(A, 4)];
      const sym = analyzeCholesky(A);
      const par = CholeskyFactor.factorMany(mats, sym, { executor: fresh });
      const ser = CholeskyFactor.factorMany(mats, sym);
      // the run's tasks ran here or there (usually all here: a worker takes far longer to load
      // than this thread takes for 900 unknowns; no assertion on which, that would be a timing test)
      expect(fresh.counts.takenBack + fresh.counts.remote).toBe(1); // one task run
      expect(fresh.counts.failed).toBe(0);
      for (let k = 0; k < 3; k++) {
        expect(sameBits((par[k] as CholeskyFactor).lowerFactor().values, (ser[k] as CholeskyFactor).lowerFactor().values)).toBe(true);
      }
    } finally {
      await fresh.close();
    }
  });

  it('report a matrix that is not positive definite like the serial factorization', () => {
    const A = gridLaplacianLower(60, 60, 0.01, true, 3);
    // a negative diagonal entry at one vertex: the pivot fails at that column
    const bad = A.values.slice();
    for (let p = A.colPtr[1234]!; p < A.colPtr[1235]!; p++) if (A.rowIdx[p] === 1234) bad[p] = -1;
    const mats = [A, { ...A, values: bad }, scaledDiagonal(A, 2)];
    const sym = analyzeCholesky(A);
    const par = CholeskyFactor.factorMany(mats, sym, { executor });
    const ser = CholeskyFactor.factorMany(mats, sym);
    expect(par[1]).not.toBeInstanceOf(CholeskyFactor);
    expect((par[1] as Error).message).toBe((ser[1] as Error).message);
    expect((par[1] as { code?: string }).code).toBe('NUMERIC');
    expect(par[2]).toBeInstanceOf(CholeskyFactor);
    // the solution of A x = b from the worker's factor equals the serial one bit for bit
    const b = Float64Array.from({ length: A.n }, (_, i) => Math.sin(i));
    const xp = new Float64Array(A.n), xs = new Float64Array(A.n);
    (par[2] as CholeskyFactor).solve(b, xp);
    (ser[2] as CholeskyFactor).solve(b, xs);
    expect(sameBits(xp, xs)).toBe(true);
  });
});

describe('a pair of factorizations sharing blocks (factorPair)', () => {
  const nx = 50;
  const A = gridLaplacianLower(nx, nx, 0.01, true, 11);
  const sym = analyzeCholesky(A);
  const onRim = (v: number) => v % nx === 0 || v % nx === nx - 1 || v < nx || v >= nx * (nx - 1);
  const b = Float64Array.from({ length: A.n }, (_, i) => Math.cos(0.37 * i));

  for (const [name, B] of [
    ['identity rows on the grid boundary', withIdentityRows(A, onRim)],
    ['one interior column changed', scaledDiagonal(withIdentityRows(A, (v) => v === 1275), 1)],
    ['the same matrix', A],
  ] as const) {
    it(`gives the factors and solutions of separate factorizations, bit for bit: ${name}`, () => {
      const [pa, pb] = CholeskyFactor.factorPair(A, B, sym);
      const sa = CholeskyFactor.factor(A, sym), sb = CholeskyFactor.factor(B, sym);
      expect(pa).toBeInstanceOf(CholeskyFactor);
      expect(pb).toBeInstanceOf(CholeskyFactor);
      const fa = pa as CholeskyFactor, fb = pb as CholeskyFactor;
      expect(sameBits(fa.lowerFactor().values, sa.lowerFactor().values)).toBe(true);
      expect(sameBits(fb.lowerFactor().values, sb.lowerFactor().values)).toBe(true);
      const x1 = new Float64Array(A.n), x2 = new Float64Array(A.n);
      fb.solve(b, x1);
      sb.solve(b, x2);
      expect(sameBits(x1, x2)).toBe(true);
      // both solved together (the shared blocks read once): the same bits as two solves
      const c = Float64Array.from(b, (v, i) => v * (1 + (i % 3))), ya = new Float64Array(A.n), yb = new Float64Array(A.n), za = new Float64Array(A.n);
      CholeskyFactor.solvePair(fa, fb, c, b, ya, yb);
      fa.solve(c, za);
      expect(sameBits(ya, za)).toBe(true);
      expect(sameBits(yb, x2)).toBe(true);
      // the second stores only the blocks the difference reaches
      expect(fb.storedValues).toBeLessThanOrEqual(sa.storedValues);
      if (B === A) expect(fb.storedValues).toBe(0);
      // the first lends its blocks: refactoring it would change the second
      expect(() => fa.refactor(A)).toThrow(/shares its blocks/);
    });
  }

  it('reports a failed pivot of either matrix like a separate factorization', () => {
    const bad = withIdentityRows(A, onRim);
    const vals = bad.values.slice();
    for (let p = A.colPtr[777]!; p < A.colPtr[778]!; p++) if (A.rowIdx[p] === 777) vals[p] = -2;
    const B = { ...A, values: vals };
    const [fa, fb] = CholeskyFactor.factorPair(A, B, sym);
    expect(fa).toBeInstanceOf(CholeskyFactor);
    expect(fb).not.toBeInstanceOf(CholeskyFactor);
    expect(() => CholeskyFactor.factor(B, sym)).toThrow((fb as Error).message);
    const [ga, gb] = CholeskyFactor.factorPair(B, A, sym);
    expect(ga).not.toBeInstanceOf(CholeskyFactor);
    expect(gb).toBeInstanceOf(CholeskyFactor);
  });
});
