/**
 * Triangle quantities from side lengths, against closed forms.
 */
import { describe, expect, it } from 'vitest';
import { fc, test } from '@fast-check/vitest';
import { triangleArea, angleOpposite, cotOpposite, cornerAngles, faceAreas, anglesOfSides, unfoldedDiagonal } from '../../src/metric/triangle.js';
import { mixedVoronoiVertexAreas, barycentricVertexAreas } from '../../src/metric/vertex-areas.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, intrinsicFromLengths } from '../../src/metric/intrinsic.js';
import { flatGrid, icosphere } from '../fixtures/shapes.js';

describe('closed forms', () => {
  it('3-4-5 right triangle: area 6, right angle opposite 5, cot 4/3 opposite 3 (elementary)', () => {
    expect(triangleArea(3, 4, 5)).toBeCloseTo(6, 14);
    expect(angleOpposite(5, 3, 4)).toBeCloseTo(Math.PI / 2, 14);
    expect(angleOpposite(3, 4, 5)).toBeCloseTo(Math.atan2(3, 4), 14);
    expect(cotOpposite(3, 4, 5)).toBeCloseTo(4 / 3, 13);
  });
  it('equilateral triangle: area √3/4·a², angles π/3 (elementary)', () => {
    expect(triangleArea(2, 2, 2)).toBeCloseTo(Math.sqrt(3), 14);
    expect(angleOpposite(2, 2, 2)).toBeCloseTo(Math.PI / 3, 14);
  });
  it('needle triangle keeps its relative accuracy (Kahan 2000: the sorted formula is stable)', () => {
    // sides 1, 1, ε: area = (ε/2)·sqrt(1 − ε²/4) exactly (isosceles, elementary)
    for (const eps of [1e-6, 1e-9, 1e-12]) {
      const exact = (eps / 2) * Math.sqrt(1 - (eps * eps) / 4);
      expect(Math.abs(triangleArea(1, 1, eps) - exact) / exact).toBeLessThan(1e-12);
      // small angle opposite ε: 2·asin(ε/2)
      expect(Math.abs(angleOpposite(eps, 1, 1) - 2 * Math.asin(eps / 2)) / eps).toBeLessThan(1e-12);
    }
  });
  it('needle: the two angles beside the short side keep their accuracy too (Kahan 2000, angle formula)', () => {
    // isosceles 1, 1, ε: base angles (π − 2·asin(ε/2)) / 2 = π/2 − asin(ε/2) (elementary). The cosine
    // rule gives b² + c² − a² = ε² + 1 − 1, which rounds to 0 for ε < 1e-8: a base angle of exactly π/2
    for (const eps of [1e-6, 1e-9, 1e-12]) {
      const base = Math.PI / 2 - Math.asin(eps / 2);
      expect(Math.abs(angleOpposite(1, 1, eps) - base)).toBeLessThan(4e-16);
      const out = new Float64Array(3);
      anglesOfSides(1, eps, 1, out, 0);
      expect(Math.abs(out[0]! + out[1]! + out[2]! - Math.PI)).toBeLessThan(4 * Number.EPSILON * Math.PI);
    }
  });
  it('degenerate triangles: angles still sum to π (collinear {π,0,0}, spike {π/2,π/2,0}, point {π/3}×3)', () => {
    // conventions documented in src/metric/triangle.ts; the sum π is what keeps discrete Gauss–Bonnet exact
    const out = new Float64Array(3);
    anglesOfSides(3, 1, 2, out, 0); // collinear corners: 3 = 1 + 2
    expect(Array.from(out)).toEqual([Math.PI, 0, 0]);
    anglesOfSides(1, 0, 1, out, 0); // two corners coincide: the limit of an isosceles triangle with a shrinking base
    expect(Array.from(out)).toEqual([Math.PI / 2, 0, Math.PI / 2]);
    anglesOfSides(0, 0, 0, out, 0); // three coincident corners
    expect(Array.from(out)).toEqual([Math.PI / 3, Math.PI / 3, Math.PI / 3]);
    anglesOfSides(1e-200, 1e-200, 1e-200, out, 0); // tiny equilateral: no underflow to a false degenerate
    for (const x of out) expect(x).toBeCloseTo(Math.PI / 3, 15);
    anglesOfSides(3e200, 4e200, 5e200, out, 0); // huge 3-4-5: no overflow
    expect(out[2]!).toBeCloseTo(Math.PI / 2, 15);
  });
  test.prop([
    fc.oneof(fc.constant(0), fc.double({ min: 1e-12, max: 100, noNaN: true })),
    fc.oneof(fc.constant(0), fc.double({ min: 1e-12, max: 100, noNaN: true })),
    fc.oneof(fc.constant(0), fc.double({ min: 1e-12, max: 100, noNaN: true })),
  ])('property: for any lengths, the three angles lie in [0, π] and sum to π (Euclid; degenerate conventions above)', (a, b, c) => {
    const out = new Float64Array(3);
    anglesOfSides(a, b, c, out, 0);
    for (const x of out) {
      expect(x).toBeGreaterThanOrEqual(0);
      expect(x).toBeLessThanOrEqual(Math.PI);
    }
    expect(Math.abs(out[0]! + out[1]! + out[2]! - Math.PI)).toBeLessThan(1e-14);
  });
  it('lengths that break the triangle inequality give area 0 and angles {π, 0, 0}, never NaN', () => {
    expect(triangleArea(1, 1, 3)).toBe(0);
    expect(angleOpposite(3, 1, 1)).toBeCloseTo(Math.PI, 15);
    expect(angleOpposite(1, 1, 3)).toBe(0);
    expect(Number.isFinite(cotOpposite(1, 1, 3))).toBe(true);
    expect(Number.isFinite(cotOpposite(0, 0, 0))).toBe(true);
  });
  test.prop([fc.double({ min: 0.01, max: 100 }), fc.double({ min: 0.01, max: 100 }), fc.double({ min: 0.01, max: 100 })])(
    'angles of any valid triangle sum to π (Euclid)',
    (a, b, c) => {
      fc.pre(a < b + c && b < a + c && c < a + b);
      const s = angleOpposite(a, b, c) + angleOpposite(b, c, a) + angleOpposite(c, a, b);
      expect(Math.abs(s - Math.PI)).toBeLessThan(1e-12);
    },
  );
});

describe('mesh arrays', () => {
  it('corner angles of a flat jittered grid sum to 2π at interior vertices; areas sum to w·h', () => {
    const s = flatGrid(12, 9, 3, 2, 0.2, 9);
    const { topology: t } = buildTopology(s.triangles, s.positions.length / 3);
    const im = intrinsicFromPositions(t, s.positions);
    const A = faceAreas(im).reduce((x, y) => x + y, 0);
    expect(A).toBeCloseTo(6, 12);
    const ang = cornerAngles(im);
    const sum = new Float64Array(t.nv);
    for (let h = 0; h < ang.length; h++) sum[t.tri[h]!]! += ang[h]!;
    // interior vertex (1,1) of the grid
    expect(sum[13 + 1]!).toBeCloseTo(2 * Math.PI, 12);
  });
  it('mixed Voronoi and barycentric vertex areas both sum to the total area (Meyer et al. 2003)', () => {
    const s = icosphere(2, 3);
    const { topology: t } = buildTopology(s.triangles, s.positions.length / 3);
    const im = intrinsicFromPositions(t, s.positions);
    const A = faceAreas(im).reduce((x, y) => x + y, 0);
    expect(mixedVoronoiVertexAreas(im).reduce((x, y) => x + y, 0)).toBeCloseTo(A, 10);
    expect(barycentricVertexAreas(im).reduce((x, y) => x + y, 0)).toBeCloseTo(A, 10);
  });
  it('lengths given directly are validated (typed INPUT error)', () => {
    const s = icosphere(0);
    const { topology: t } = buildTopology(s.triangles, 12);
    expect(() => intrinsicFromLengths(t, new Float64Array(t.ne).fill(NaN))).toThrow(/invalid length/);
    expect(() => intrinsicFromLengths(t, new Float64Array(3))).toThrow(/expected 30 edge lengths/);
  });
  it('the unfolded other diagonal of two triangles sharing a side (elementary plane geometry)', () => {
    // unit square cut along a diagonal: the other diagonal is also sqrt(2)
    expect(unfoldedDiagonal(Math.SQRT2, 1, 1, 1, 1)).toBeCloseTo(Math.SQRT2, 14);
    // two unit equilateral triangles (a rhombus of 60°): the long diagonal is sqrt(3)
    const out = new Float64Array(4);
    expect(unfoldedDiagonal(1, 1, 1, 1, 1, out)).toBeCloseTo(Math.sqrt(3), 14);
    expect(Array.from(out)).toEqual([0.5, expect.closeTo(Math.sqrt(3) / 2, 14), 0.5, expect.closeTo(Math.sqrt(3) / 2, 14)]);
    // a collinear (zero-area) triangle has no unfolding
    expect(unfoldedDiagonal(2, 1, 1, 1, 1)).toBeNaN();
  });
});
