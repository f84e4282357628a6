/**
 * Orderings, elimination tree, column counts and supernodes against brute
 * force: the symbolic factorization by explicit elimination on a boolean
 * matrix (the graph-elimination model of Parter 1961 / Rose 1972: eliminating
 * vertex k joins all its later neighbours into a clique).
 */
import { describe, expect, it } from 'vitest';
import { test as fcTest, fc } from '@fast-check/vitest';
import { adjacencyFromLower, analyzeCholesky, approximateMinimumDegree, nestedDissection, postorder } from '../../src/linalg/index.js';
import type { CscMatrix, Ordering } from '../../src/linalg/index.js';
import { gridLaplacianLower, randomSpdLower, isPermutation } from './helpers.js';

/** Column patterns of L for P·A·Pᵀ by explicit elimination; O(n³), small n only. */
function bruteForceFactorPattern(A: CscMatrix, perm: Int32Array): { counts: number[]; parent: number[] } {
  const n = A.n;
  const pinv = new Int32Array(n);
  for (let k = 0; k < n; k++) pinv[perm[k]!] = k;
  const M = Array.from({ length: n }, () => new Uint8Array(n));
  for (let j = 0; j < n; j++) {
    for (let p = A.colPtr[j]!; p < A.colPtr[j + 1]!; p++) {
      const a = pinv[A.rowIdx[p]!]!, b = pinv[j]!;
      M[a]![b] = M[b]![a] = 1;
    }
  }
  const counts: number[] = [];
  const parent: number[] = [];
  for (let k = 0; k < n; k++) {
    const below: number[] = [];
    for (let i = k + 1; i < n; i++) if (M[i]![k]) below.push(i);
    counts.push(below.length + 1);
    parent.push(below.length ? below[0]! : -1);
    for (const a of below) for (const b of below) M[a]![b] = 1; // fill: later neighbours become a clique
  }
  return { counts, parent };
}

const ORDERINGS: Ordering[] = ['natural', 'nd', 'amd'];

describe('symbolic analysis against explicit elimination', () => {
  fcTest.prop([fc.integer({ min: 1, max: 60 }), fc.integer({ min: 0, max: 4 }), fc.integer({ min: 1, max: 10_000 }), fc.constantFrom(...ORDERINGS)], {
    numRuns: 60,
  })('etree, column counts and nnz(L) match', (n, perCol, seed, ordering) => {
    const A = randomSpdLower(n, perCol, seed);
    const sym = analyzeCholesky(A, { ordering });
    expect(isPermutation(sym.perm, n)).toBe(true);
    const bf = bruteForceFactorPattern(A, sym.perm);
    expect(Array.from(sym.colCount)).toEqual(bf.counts);
    expect(Array.from(sym.parent)).toEqual(bf.parent);
    expect(sym.nnzL).toBe(bf.counts.reduce((a, b) => a + b, 0));
    // the analysis postorders the elimination tree: every parent after its child
    for (let j = 0; j < n; j++) if (sym.parent[j] !== -1) expect(sym.parent[j]!).toBeGreaterThan(j);
  });

  fcTest.prop([fc.integer({ min: 2, max: 60 }), fc.integer({ min: 0, max: 4 }), fc.integer({ min: 1, max: 10_000 })], { numRuns: 40 })(
    'supernodes partition the columns and their row patterns cover the factor pattern',
    (n, perCol, seed) => {
      const A = randomSpdLower(n, perCol, seed);
      const sym = analyzeCholesky(A, { ordering: 'amd' });
      const sn = sym.supernodal!;
      expect(sn.superStart[0]).toBe(0);
      expect(sn.superStart[sn.nsuper]).toBe(n);
      let stored = 0;
      for (let s = 0; s < sn.nsuper; s++) {
        const f = sn.superStart[s]!, l = sn.superStart[s + 1]!;
        expect(l).toBeGreaterThan(f);
        const rows = Array.from(sn.rows.subarray(sn.rowPtr[s]!, sn.rowPtr[s + 1]!));
        for (let c = f; c < l; c++) expect(rows[c - f]).toBe(c); // own columns first
        for (let r = l - f + 1; r < rows.length; r++) expect(rows[r]!).toBeGreaterThan(rows[r - 1]!);
        // every column's count fits in the block: colCount[c] ≤ rows from c down
        for (let c = f; c < l; c++) expect(sym.colCount[c]!).toBeLessThanOrEqual(rows.length - (c - f));
        stored += rows.length * (l - f) - ((l - f) * (l - f - 1)) / 2;
      }
      expect(stored).toBeGreaterThanOrEqual(sym.nnzL);
    },
  );
});

describe('postorder', () => {
  // Definition of a postorder (common practice): every node after all nodes
  // of its subtree, each subtree a contiguous range ending at its root.
  fcTest.prop([fc.array(fc.integer({ min: 0, max: 1_000_000 }), { minLength: 1, maxLength: 80 }), fc.boolean()], { numRuns: 60 })(
    'children before parents, contiguous subtrees, siblings by weight',
    (raw, weighted) => {
      const n = raw.length;
      // random forest: parent of j is a larger index or −1
      const parent = Int32Array.from(raw, (r, j) => (j === n - 1 || r % 5 === 0 ? -1 : j + 1 + (r % (n - 1 - j))));
      const weight = Int32Array.from(raw, (r) => r % 7);
      const post = postorder(parent, n, weighted ? weight : undefined);
      expect(isPermutation(post, n)).toBe(true);
      const at = new Int32Array(n);
      for (let k = 0; k < n; k++) at[post[k]!] = k;
      const size = new Int32Array(n).fill(1);
      for (let j = 0; j < n; j++) if (parent[j] !== -1) expect(at[j]!).toBeLessThan(at[parent[j]!]!);
      for (let k = 0; k < n; k++) {
        const j = post[k]!;
        if (parent[j] !== -1) size[parent[j]!]! += size[j]!;
      }
      // the subtree of j occupies post[at[j] − size[j] + 1 .. at[j]]
      for (let j = 0; j < n; j++) {
        for (let k = at[j]! - size[j]! + 1; k <= at[j]!; k++) {
          let a = post[k]!;
          while (a !== j && a !== -1) a = parent[a]!;
          expect(a).toBe(j);
        }
      }
      if (weighted) {
        for (let a = 0; a < n; a++) {
          for (let b = 0; b < n; b++) {
            if (a !== b && parent[a] !== -1 && parent[a] === parent[b] && weight[a]! < weight[b]!) expect(at[a]!).toBeLessThan(at[b]!);
          }
        }
      }
    },
  );
});

describe('orderings', () => {
  it('both fill-reducing orderings are far below natural order on a 100×100 grid', () => {
    // Natural (row-by-row) order of a k×k grid gives a band factor of about
    // k³ = 10⁶ entries, nested dissection O(k² log k) (George 1973); the 50%
    // bar is the brief's, common practice.
    const A = gridLaplacianLower(100, 100, 1e-3, true);
    const fill: Record<string, number> = {};
    for (const ordering of ORDERINGS) fill[ordering] = analyzeCholesky(A, { ordering }).nnzL;
    // reported for the record (stdout of the test run)
    console.log(`nnz(L) on the 100×100 triangulated grid: ${JSON.stringify(fill)}`);
    expect(fill.natural!).toBeGreaterThan(0.9e6);
    expect(fill.natural!).toBeLessThan(1.1e6);
    expect(fill.amd!).toBeLessThan(0.5 * fill.natural!);
    expect(fill.nd!).toBeLessThan(0.5 * fill.natural!);
  });

  it('nested dissection and AMD handle disconnected graphs, isolated vertices and tiny sizes', () => {
    for (const n of [0, 1, 2, 3, 7, 500]) {
      const A = randomSpdLower(n, n > 100 ? 1 : 0, 3); // perCol 1 on 500 vertices leaves many components
      const g = adjacencyFromLower(A);
      expect(isPermutation(nestedDissection(g), n)).toBe(true);
      expect(isPermutation(nestedDissection(g, { leafSize: 2, leafOrder: 'bfs' }), n)).toBe(true);
      expect(isPermutation(approximateMinimumDegree(g), n)).toBe(true);
    }
  });

  it('AMD orders a star (one dense row) with no fill: the hub goes last', () => {
    // Eliminating the leaves of a star first creates no fill (common practice);
    // the hub of degree n−1 exceeds the dense threshold and is ordered last.
    const n = 400;
    const colPtr = new Int32Array(n + 1);
    const rows: number[] = [];
    for (let j = 0; j < n; j++) {
      rows.push(j);
      if (j === 0) for (let i = 1; i < n; i++) rows.push(i);
      colPtr[j + 1] = rows.length;
    }
    const A: CscMatrix = { n, colPtr, rowIdx: Int32Array.from(rows), values: new Float64Array(rows.length) };
    const perm = approximateMinimumDegree(adjacencyFromLower(A));
    expect(perm[n - 1]).toBe(0);
    expect(analyzeCholesky(A, { ordering: 'amd' }).nnzL).toBe(2 * n - 1);
  });

  it('unknown ordering or method is a USAGE error', () => {
    const A = gridLaplacianLower(3, 3, 1);
    expect(() => analyzeCholesky(A, { ordering: 'metis' as Ordering })).toThrow(expect.objectContaining({ code: 'USAGE' }));
    expect(() => analyzeCholesky(A, { method: 'magic' as 'simplicial' })).toThrow(expect.objectContaining({ code: 'USAGE' }));
  });
});
