/**
 * The one home of each small piece of triangle geometry (issue #10):
 * cotangents and their rule for degenerate triangles, lumped mass, laying a
 * triangle out from its lengths (metric/triangle.ts, metric/layout.ts) and
 * surface points in faces (metric/face-points.ts). Every consumer reads these
 * homes, so a check here covers the Laplacian, the Delaunay flips, the exact
 * solver's face frames, the graph seeds and path lengths alike.
 */
import { describe, expect, it } from 'vitest';
import { fc, test } from '@fast-check/vitest';
import {
  cotOpposite, faceCotans, halfedgeCotans, anglesOfSides, placeThirdCorner, triangleArea,
  faceAreas, COT_LIMIT, edgeCotanWeights,
} from '../../src/metric/triangle.js';
import { barycentricVertexAreas } from '../../src/metric/vertex-areas.js';
import { lumpedMass, cotanLaplacian, edgePattern, faceGeometry } from '../../src/metric/laplacian.js';
import { edgeCotanSum } from '../../src/metric/delaunay.js';
import { layoutAlong, layoutFace, planarLength, pointSegmentDistance } from '../../src/metric/layout.js';
import { baryInFace, commonFaces, facesOfPoint, inFaceDistance, pointInLayout } from '../../src/metric/face-points.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromLengths, intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { flatGrid, icosphere } from '../fixtures/shapes.js';

/** A one-triangle mesh with the given side lengths (half-edge k has length l[k]). */
function oneTriangle(l0: number, l1: number, l2: number) {
  const { topology: t } = buildTopology(new Uint32Array([0, 1, 2]), 3);
  const L = new Float64Array(t.ne);
  for (let k = 0; k < 3; k++) L[t.edgeOf[k]!] = [l0, l1, l2][k]!;
  return intrinsicFromLengths(t, L);
}

describe('cotangents from lengths: closed forms', () => {
  it('3-4-5 right triangle: cot 4/3 opposite 3, 3/4 opposite 4, 0 opposite the hypotenuse (elementary trigonometry)', () => {
    expect(cotOpposite(3, 4, 5)).toBeCloseTo(4 / 3, 14);
    expect(cotOpposite(4, 5, 3)).toBeCloseTo(3 / 4, 14);
    expect(cotOpposite(5, 3, 4)).toBeCloseTo(0, 14);
    const out = [0, 0, 0];
    expect(faceCotans(3, 4, 5, out, 0)).toBeCloseTo(6, 14); // area 3·4/2
    expect(out[0]).toBeCloseTo(4 / 3, 14);
    expect(out[1]).toBeCloseTo(3 / 4, 14);
    expect(out[2]).toBeCloseTo(0, 14);
  });

  it('equilateral triangle: every cot is cot 60° = 1/√3, at any scale (elementary trigonometry)', () => {
    for (const s of [1e-6, 1, 1e6]) {
      const out = new Float64Array(3);
      faceCotans(s, s, s, out, 0);
      for (const c of out) expect(c).toBeCloseTo(1 / Math.sqrt(3), 12);
    }
  });

  test.prop([fc.double({ min: 0.05, max: 3, noNaN: true }), fc.double({ min: 0.05, max: 3, noNaN: true }), fc.double({ min: 0.2, max: 2.9, noNaN: true })])(
    'cot = cos/sin of the Kahan angles, faceCotans = cotOpposite, and cot α·cot β + cot β·cot γ + cot γ·cot α = 1 (identity for α + β + γ = π)',
    (a, b, gamma) => {
      const c = Math.sqrt(a * a + b * b - 2 * a * b * Math.cos(gamma)); // law of cosines
      const ang = new Float64Array(3), cot = new Float64Array(3);
      anglesOfSides(a, b, c, ang, 0);
      faceCotans(a, b, c, cot, 0);
      const scale = 1 + Math.max(...cot.map(Math.abs));
      for (let k = 0; k < 3; k++) expect(Math.abs(cot[k]! - 1 / Math.tan(ang[k]!))).toBeLessThan(1e-9 * scale * scale);
      expect(cot[0]).toBe(cotOpposite(a, b, c));
      expect(cot[1]).toBe(cotOpposite(b, c, a));
      expect(cot[2]).toBe(cotOpposite(c, a, b));
      expect(Math.abs(cot[0]! * cot[1]! + cot[1]! * cot[2]! + cot[2]! * cot[0]! - 1)).toBeLessThan(1e-8 * scale * scale);
    },
  );
});

// The rule itself is the project's (metric/triangle.ts module comment); that a zero-area element adds
// nothing to a finite-element assembly is common practice. Areas are Kahan's (the 3-4-5 checks above).
describe('the one rule for degenerate triangles (metric/triangle.ts module comment)', () => {
  const degenerate: [string, number, number, number][] = [
    ['collinear 1-1-2', 1, 1, 2],
    ['spike 0-1-1 (two coincident corners)', 0, 1, 1],
    ['all corners coincident', 0, 0, 0],
    ['lengths breaking the triangle inequality', 1, 1, 3],
  ];
  for (const [name, a, b, c] of degenerate) {
    it(`${name}: area 0, every cotangent 0 (never NaN, never ±Infinity)`, () => {
      expect(triangleArea(a, b, c)).toBe(0);
      const out = [NaN, NaN, NaN];
      faceCotans(a, b, c, out, 0);
      expect(out).toEqual([0, 0, 0]);
      expect(cotOpposite(a, b, c)).toBe(0);
      expect(cotOpposite(b, c, a)).toBe(0);
      expect(cotOpposite(c, a, b)).toBe(0);
    });
  }

  it('a zero-area face adds nothing: half-edge cotangents, cotangent weights, Laplacian, mass and gradients are 0 there', () => {
    const m = oneTriangle(1, 1, 2);
    expect(Array.from(halfedgeCotans(m))).toEqual([0, 0, 0]);
    expect(Array.from(edgeCotanWeights(m))).toEqual([0, 0, 0]);
    expect(Array.from(cotanLaplacian(m, edgePattern(m.topology))).every((x) => x === 0)).toBe(true);
    expect(Array.from(lumpedMass(m))).toEqual([0, 0, 0]);
    expect(Array.from(faceGeometry(m).grad).every((x) => x === 0)).toBe(true);
  });

  it('the Delaunay test reads the same cotangents: a zero-area neighbour adds 0 to cot α + cot β', () => {
    // square 0-1-2-3 split along 0-2, then vertex 3 moved onto the diagonal's line would be
    // degenerate; here: face (0,1,2) is a 3-4-5 triangle, face (0,2,3) has lengths 5, 2.5, 2.5 (collinear)
    const { topology: t } = buildTopology(new Uint32Array([0, 1, 2, 0, 2, 3]), 4);
    const L = new Float64Array(t.ne);
    const len = (a: number, b: number) => ({ '0-1': 3, '1-2': 4, '0-2': 5, '2-3': 2.5, '0-3': 2.5 } as Record<string, number>)[`${Math.min(a, b)}-${Math.max(a, b)}`]!;
    for (let h = 0; h < 6; h++) L[t.edgeOf[h]!] = len(t.tri[h]!, t.tri[h % 3 === 2 ? h - 2 : h + 1]!);
    const h02 = [0, 1, 2, 3, 4, 5].find((h) => t.twin[h]! >= 0)!;
    // cot of the right angle opposite 0-2 is 0, the collinear face adds 0: sum 0 (up to rounding)
    expect(Math.abs(edgeCotanSum(t, L, h02))).toBeLessThan(1e-15);
  });

  it('assembled weights are bounded by COT_LIMIT; cotOpposite itself is not (a needle with a 1e-9 side)', () => {
    // sides 1e-9, 1, 1: the angle opposite the short side is ≈ 1e-9 rad, cot ≈ 1e9 (small-angle approximation)
    expect(cotOpposite(1e-9, 1, 1)).toBeGreaterThan(0.99e9);
    expect(cotOpposite(1e-9, 1, 1)).toBeLessThan(1.01e9);
    const m = oneTriangle(1e-9, 1, 1);
    for (const c of halfedgeCotans(m)) expect(Math.abs(c)).toBeLessThanOrEqual(COT_LIMIT);
  });
});

describe('lumped mass: one home', () => {
  it('is one function under two names; one third of the face area per corner (P1 lumped mass, common practice)', () => {
    expect(lumpedMass).toBe(barycentricVertexAreas);
    const m = oneTriangle(3, 4, 5);
    for (const x of lumpedMass(m)) expect(x).toBeCloseTo(2, 14); // area 6 / 3
  });

  it('on a closed sphere the vertex areas sum to the face areas, each vertex a third of its fan', () => {
    const s = icosphere(2);
    const { topology: t } = buildTopology(s.triangles, s.positions.length / 3);
    const m = intrinsicFromPositions(t, s.positions);
    const A = faceAreas(m), M = lumpedMass(m);
    const want = new Float64Array(t.nv);
    for (let f = 0; f < t.nf; f++) for (let k = 0; k < 3; k++) want[t.tri[3 * f + k]!]! += A[f]! / 3;
    for (let v = 0; v < t.nv; v++) expect(M[v]).toBeCloseTo(want[v]!, 14);
  });
});

describe('laying a triangle out from its lengths: one home', () => {
  it('3-4-5 with the side of length 4 on the axis puts the right-angle corner above the origin (elementary)', () => {
    const out = [0, 0];
    // AB = 4, BC = 5, CA = 3: the right angle is at A, so C = (0, 3)
    placeThirdCorner(4, 5, 3, triangleArea(4, 5, 3), out, 0);
    expect(out[0]).toBeCloseTo(0, 14);
    expect(out[1]).toBeCloseTo(3, 14);
    // AB = 5 (hypotenuse): C = (9/5, 12/5), the foot of the altitude at 3²/5 (Euclid VI.8)
    placeThirdCorner(5, 4, 3, 6, out, 0);
    expect(out[0]).toBeCloseTo(9 / 5, 14);
    expect(out[1]).toBeCloseTo(12 / 5, 14);
  });

  it('zero-length base puts C at (0, |CA|); zero area puts C on the axis', () => {
    const out = [9, 9];
    placeThirdCorner(0, 2, 2, 0, out, 0);
    expect(out).toEqual([0, 2]);
    placeThirdCorner(2, 1, 1, 0, out, 0);
    expect(out).toEqual([1, 0]);
  });

  it('layoutAlong and layoutFace reproduce a planar triangle up to a rigid motion (distances preserved)', () => {
    const P = [[0.3, -0.2], [2.1, 0.4], [0.9, 1.7]];
    const d = (i: number, j: number) => Math.hypot(P[i]![0]! - P[j]![0]!, P[i]![1]! - P[j]![1]!);
    const m = oneTriangle(d(0, 1), d(1, 2), d(2, 0));
    const lay = layoutFace(m, 0, new Float64Array(6));
    const e = (i: number, j: number) => Math.hypot(lay[2 * i]! - lay[2 * j]!, lay[2 * i + 1]! - lay[2 * j + 1]!);
    for (const [i, j] of [[0, 1], [1, 2], [2, 0]] as const) expect(e(i, j)).toBeCloseTo(d(i, j), 13);
    expect(lay[5]).toBeGreaterThan(0);
    const c = new Float64Array(2);
    expect(layoutAlong(m, 1, c)).toBeCloseTo(d(1, 2), 14);
    expect(Math.hypot(c[0]!, c[1]!)).toBeCloseTo(d(0, 1), 13); // tail of h=1 is corner 1; third corner 0
  });

  it('planarLength is the Euclidean length (3-4-5), pointSegmentDistance the distance to a segment (elementary)', () => {
    expect(planarLength(3, 4)).toBe(5);
    expect(planarLength(-3, -4)).toBe(5);
    expect(pointSegmentDistance(0.5, 2, 0, 0, 1, 0)).toBe(2); // foot inside
    expect(pointSegmentDistance(4, 4, 0, 0, 1, 0)).toBe(5); // nearest end (1, 0): 3-4-5
  });
});

describe('surface points in faces: one home', () => {
  const s = flatGrid(2, 1, 2, 1); // two unit squares side by side, each split in two
  const { topology: t } = buildTopology(s.triangles, s.positions.length / 3);
  const m = intrinsicFromPositions(t, s.positions);
  const xy = (v: number) => [s.positions[3 * v]!, s.positions[3 * v + 1]!];

  it('a vertex lies in its whole fan, an interior edge point in two faces, a face point in one', () => {
    for (let v = 0; v < t.nv; v++) {
      let fan = 0;
      for (let f = 0; f < t.nf; f++) if ([0, 1, 2].some((k) => t.tri[3 * f + k] === v)) fan++;
      expect(facesOfPoint(t, { kind: 'vertex', vertex: v }).length).toBe(fan);
    }
    const e = [...Array(t.ne).keys()].find((e) => t.twin[t.edgeHalfedge[e]!]! >= 0)!;
    expect(facesOfPoint(t, { kind: 'edge', edge: e, t: 0.5 }).length).toBe(2);
    expect(facesOfPoint(t, { kind: 'face', face: 1, bary: [0.2, 0.3, 0.5] })).toEqual([1]);
  });

  it('barycentric coordinates and layout positions agree with the 3D positions on a flat mesh (up to a rigid motion)', () => {
    const lay = new Float64Array(6), q = new Float64Array(2), b = [0, 0, 0];
    for (let f = 0; f < t.nf; f++) {
      layoutFace(m, f, lay);
      const p = { kind: 'face' as const, face: f, bary: [0.2, 0.3, 0.5] as [number, number, number] };
      expect(baryInFace(t, f, p, b)).toBe(true);
      expect(pointInLayout(t, f, p, lay, q)).toBe(true);
      // the distance from the point to each corner is the same in the layout and in 3D
      const P3 = [0, 1].map((i) => [0, 1, 2].reduce((acc, k) => acc + p.bary[k]! * xy(t.tri[3 * f + k]!)[i]!, 0));
      for (let k = 0; k < 3; k++) {
        const c = xy(t.tri[3 * f + k]!);
        expect(Math.hypot(q[0]! - lay[2 * k]!, q[1]! - lay[2 * k + 1]!)).toBeCloseTo(Math.hypot(P3[0]! - c[0]!, P3[1]! - c[1]!), 13);
      }
      expect(baryInFace(t, (f + 1) % t.nf, p, b)).toBe(false);
    }
  });

  it('inFaceDistance: the straight distance over shared faces, Infinity with face −1 when none is shared (plane geometry)', () => {
    // vertices on the bottom row: 0 (0,0), 1 (1,0), 2 (2,0); the two squares share the edge x = 1
    const find = (x: number, y: number) => [...Array(t.nv).keys()].find((v) => xy(v)[0] === x && xy(v)[1] === y)!;
    const a = { kind: 'vertex' as const, vertex: find(0, 0) }, b = { kind: 'vertex' as const, vertex: find(1, 1) };
    const r = inFaceDistance(m, a, b);
    if (commonFaces(t, a, b).length > 0) expect(r.distance).toBeCloseTo(Math.SQRT2, 14); // along the diagonal
    else expect(r.distance).toBe(Infinity);
    const far = inFaceDistance(m, a, { kind: 'vertex', vertex: find(2, 1) });
    expect(far.distance).toBe(Infinity);
    expect(far.face).toBe(-1);
    const near = inFaceDistance(m, a, { kind: 'vertex', vertex: find(1, 0) });
    expect(near.distance).toBeCloseTo(1, 14);
    expect(commonFaces(t, a, { kind: 'vertex', vertex: find(1, 0) })).toContain(near.face);
  });
});

describe('the heat relay packs the face geometry of laplacian.ts', () => {
  it("relayGeometry's five numbers per face and largest gradient are faceGeometry's, bit for bit (sphere, flat grid, a zero-area face)", async () => {
    const { relayGeometry } = await import('../../src/geodesic/heat-relay.js');
    const sphere = icosphere(3), grid = flatGrid(12, 9, 3, 2, 0.3, 5);
    const meshes = [
      intrinsicFromPositions(buildTopology(sphere.triangles, sphere.positions.length / 3).topology, sphere.positions),
      intrinsicFromPositions(buildTopology(grid.triangles, grid.positions.length / 3).topology, grid.positions),
      oneTriangle(1, 1, 2),
    ];
    for (const m of meshes) {
      const g = faceGeometry(m), r = relayGeometry(m);
      let maxGrad = 0;
      for (const x of g.grad) maxGrad = Math.max(maxGrad, Math.abs(x));
      expect(Object.is(r.maxGrad, maxGrad)).toBe(true);
      for (let f = 0; f < m.topology.nf; f++) {
        const want = [g.grad[6 * f + 2], g.grad[6 * f + 1], g.grad[6 * f + 3], g.grad[6 * f + 5], g.area[f]];
        for (let k = 0; k < 5; k++) expect(Object.is(r.faces[5 * f + k], want[k])).toBe(true);
      }
    }
  });
});
