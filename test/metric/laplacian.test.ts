import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import {
  edgePattern, cotanLaplacian, lumpedMass, faceGeometry, faceGradient, weakDivergence, combine, constrainRows,
} from '../../src/metric/laplacian.js';
import { checkCsc, symmetricSpmvLower } from '../../src/linalg/csc.js';
import { flatGrid, icosphere, rng, type Shape } from '../fixtures/shapes.js';

function meshOf(s: Shape) {
  const { topology } = buildTopology(s.triangles, s.positions.length / 3);
  return intrinsicFromPositions(topology, s.positions);
}

/** Dense symmetric matrix from lower-triangle pattern values. */
function dense(p: ReturnType<typeof edgePattern>, vals: Float64Array): number[][] {
  const A = Array.from({ length: p.n }, () => new Array<number>(p.n).fill(0));
  for (let j = 0; j < p.n; j++) {
    for (let s = p.colPtr[j]!; s < p.colPtr[j + 1]!; s++) {
      A[p.rowIdx[s]!]![j] = vals[s]!;
      A[j]![p.rowIdx[s]!] = vals[s]!;
    }
  }
  return A;
}

describe('cotangent Laplacian from lengths', () => {
  it('is the 5-point stencil on a regular right-triangle grid', () => {
    // Courant's P1 elements on a square grid split by diagonals give the
    // 5-point finite-difference stencil: axis edges have two 45° opposite
    // angles (w = (1 + 1)/2 = 1), diagonals two 90° angles (w = 0). Common practice (FEM textbooks).
    const n = 6;
    const m = meshOf(flatGrid(n, n, n, n));
    const p = edgePattern(m.topology);
    checkCsc({ n: p.n, colPtr: p.colPtr, rowIdx: p.rowIdx, values: new Float64Array(p.rowIdx.length) });
    const A = dense(p, cotanLaplacian(m, p));
    const id = (i: number, j: number) => j * (n + 1) + i;
    const c = id(3, 3);
    expect(A[c]![c]).toBeCloseTo(4, 12);
    for (const nb of [id(2, 3), id(4, 3), id(3, 2), id(3, 4)]) expect(A[c]![nb]).toBeCloseTo(-1, 12);
    for (const nb of [id(2, 2), id(4, 4), id(2, 4), id(4, 2)]) expect(A[c]![nb]).toBeCloseTo(0, 12);
  });

  it('annihilates constants, reproduces linear functions on flat meshes, and is PSD', () => {
    // L·1 = 0 (rows sum to zero) and L·x = 0 at interior vertices of a flat
    // mesh (linear precision of the cotan formula). Common practice.
    const s = flatGrid(8, 7, 2, 1.5, 0.3, 3);
    const m = meshOf(s);
    const p = edgePattern(m.topology);
    const Lv = cotanLaplacian(m, p);
    const M = { n: p.n, colPtr: p.colPtr, rowIdx: p.rowIdx, values: Lv };
    const ones = new Float64Array(p.n).fill(1), out = new Float64Array(p.n);
    symmetricSpmvLower(M, ones, out);
    for (const x of out) expect(Math.abs(x)).toBeLessThan(1e-12);
    const x = new Float64Array(p.n);
    for (let v = 0; v < p.n; v++) x[v] = s.positions[3 * v]! + 0.7 * s.positions[3 * v + 1]!;
    symmetricSpmvLower(M, x, out);
    for (let v = 0; v < p.n; v++) {
      const i = v % 9, j = Math.floor(v / 9);
      if (i > 0 && i < 8 && j > 0 && j < 7) expect(Math.abs(out[v]!)).toBeLessThan(1e-12);
    }
    const r = rng(5);
    for (let trial = 0; trial < 5; trial++) {
      const u = Float64Array.from({ length: p.n }, () => r() - 0.5);
      symmetricSpmvLower(M, u, out);
      let q = 0;
      for (let v = 0; v < p.n; v++) q += u[v]! * out[v]!;
      expect(q).toBeGreaterThan(0);
    }
  });

  it('equals weakDivergence ∘ faceGradient, and gradients of linear functions are exact', () => {
    // L u = Σ_f A_f ∇φ_i·∇u (P1 stiffness identity, common practice); on a
    // flat mesh the gradient of u = x has length 1 in every face frame.
    const s = flatGrid(6, 6, 1, 1, 0.35, 9);
    const m = meshOf(s);
    const t = m.topology;
    const p = edgePattern(t);
    const g = faceGeometry(m);
    const Lv = cotanLaplacian(m, p);
    const u = Float64Array.from({ length: t.nv }, (_, v) => Math.sin(3 * s.positions[3 * v]!) + s.positions[3 * v + 1]! ** 2);
    const a = new Float64Array(t.nv);
    symmetricSpmvLower({ n: p.n, colPtr: p.colPtr, rowIdx: p.rowIdx, values: Lv }, u, a);
    const b = weakDivergence(t, g, faceGradient(t, g, u));
    for (let v = 0; v < t.nv; v++) expect(b[v]).toBeCloseTo(a[v]!, 10);
    const x = Float64Array.from({ length: t.nv }, (_, v) => s.positions[3 * v]!);
    const gx = faceGradient(t, g, x);
    for (let f = 0; f < t.nf; f++) expect(Math.hypot(gx[2 * f]!, gx[2 * f + 1]!)).toBeCloseTo(1, 10);
  });

  it('lumped mass sums to the total area; sphere area tends to 4πR²', () => {
    // Area of the unit square (elementary); sphere area 4πR² (do Carmo 1976),
    // inscribed icosphere under-estimates it by O(h²).
    const sq = meshOf(flatGrid(5, 4, 1, 1, 0.2, 2));
    const M = lumpedMass(sq);
    expect(M.reduce((x, y) => x + y, 0)).toBeCloseTo(1, 12);
    const sp = meshOf(icosphere(3, 2));
    const A = lumpedMass(sp).reduce((x, y) => x + y, 0);
    expect(Math.abs(A - 16 * Math.PI) / (16 * Math.PI)).toBeLessThan(0.01);
  });

  it('combine and constrainRows keep the pattern and give identity rows', () => {
    const m = meshOf(flatGrid(3, 3));
    const p = edgePattern(m.topology);
    const Lv = cotanLaplacian(m, p), Mv = lumpedMass(m);
    const A = combine(p, 0.5, Lv, 2, Mv);
    const D = dense(p, A), Ld = dense(p, Lv);
    for (let i = 0; i < p.n; i++) {
      for (let j = 0; j < p.n; j++) expect(D[i]![j]).toBeCloseTo(0.5 * Ld[i]![j]! + (i === j ? 2 * Mv[i]! : 0), 14);
    }
    const fixed = new Uint8Array(p.n);
    fixed[0] = 1; fixed[5] = 1;
    constrainRows(p, A, fixed);
    const C = dense(p, A);
    for (let j = 0; j < p.n; j++) {
      expect(C[0]![j]).toBe(j === 0 ? 1 : 0);
      expect(C[5]![j]).toBe(j === 5 ? 1 : 0);
    }
    expect(C[6]![6]).toBeCloseTo(D[6]![6]!, 14);
  });
});
