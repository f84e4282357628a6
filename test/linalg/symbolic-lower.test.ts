/**
 * The supernodal analysis's C = P·A·Pᵀ (lower triangle, with the slot of
 * every input entry) is relabelled from the ordering's own lower triangle
 * (symbolic-pattern.ts, relabelLower) rather than built again. Checked here against
 * the definition, built the plain way from the final permutation: entry
 * (i, j) of A goes to column min(pinv i, pinv j), row max, columns filled in
 * the order of A's entries (common practice for a permuted CSC pattern).
 * Every ordering, on a flipped terrain, a sphere and a mesh of two parts.
 */
import { describe, expect, it } from 'vitest';
import { analyzeCholesky } from '../../src/linalg/index.js';
import type { CscMatrix } from '../../src/linalg/csc.js';
import { edgePattern, patternMatrix } from '../../src/metric/laplacian.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { intrinsicDelaunay } from '../../src/metric/delaunay.js';
import { flatGrid, icosphere, terrain } from '../fixtures/shapes.js';

function plainLower(A: CscMatrix, pinv: Int32Array) {
  const { n, colPtr, rowIdx } = A;
  const cols: number[][] = Array.from({ length: n }, () => []);
  const where: [number, number][] = [];
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]!; p < colPtr[j + 1]!; p++) {
      const a = pinv[rowIdx[p]!]!, b = pinv[j]!;
      const lo = Math.min(a, b);
      where.push([lo, cols[lo]!.length]);
      cols[lo]!.push(Math.max(a, b));
    }
  }
  const ptr = [0];
  for (const c of cols) ptr.push(ptr[ptr.length - 1]! + c.length);
  return { ptr, idx: cols.flat(), map: where.map(([c, k]) => ptr[c]! + k) };
}

function meshMatrix(positions: ArrayLike<number>, triangles: ArrayLike<number>, flip: boolean): CscMatrix {
  const { topology } = buildTopology(triangles as Uint32Array, positions.length / 3);
  const m = intrinsicFromPositions(topology, positions as Float64Array);
  const t = flip ? intrinsicDelaunay(m).mesh.topology : topology;
  const p = edgePattern(t);
  return patternMatrix(p, new Float64Array(p.colPtr[p.n]!));
}

describe('supernodal analysis: C = P·A·Pᵀ', () => {
  const grid = flatGrid(20, 15, 1, 1, 0.3, 2);
  const two = { positions: new Float64Array([...grid.positions, ...grid.positions.map((v, i) => (i % 3 === 0 ? v + 5 : v))]), triangles: new Uint32Array([...grid.triangles, ...grid.triangles.map((v) => v + grid.positions.length / 3)]) };
  const wavy = terrain(40, 40, 1, 1, (x, y) => 0.1 * Math.sin(9 * x) * Math.cos(7 * y));
  const sphere = icosphere(3);
  const cases: [string, CscMatrix][] = [
    ['flipped terrain', meshMatrix(wavy.positions, wavy.triangles, true)],
    ['sphere', meshMatrix(sphere.positions, sphere.triangles, false)],
    ['two separate grids', meshMatrix(two.positions, two.triangles, false)],
  ];
  for (const [name, A] of cases) {
    it(`is the permuted lower triangle on the ${name}`, () => {
      for (const ordering of ['nd', 'amd', 'natural'] as const) {
        const sym = analyzeCholesky(A, { ordering });
        const want = plainLower(A, sym.pinv);
        expect([...sym.cColPtr], ordering).toEqual(want.ptr);
        expect([...sym.cRowIdx], ordering).toEqual(want.idx);
        expect([...sym.valueMap], ordering).toEqual(want.map);
      }
    });
  }
});
