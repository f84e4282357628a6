/**
 * Ear clipping checks. For a simple polygon, any triangulation into n − 2
 * triangles with no flipped triangle has total area equal to the polygon's,
 * given by the shoelace formula A = ½ Σ (x_i·y_{i+1} − x_{i+1}·y_i) (Gauss's
 * area formula; any computational geometry text, e.g. O'Rourke,
 * "Computational Geometry in C", 2nd ed. 1998, ch. 1; edition and chapter from
 * memory). Overlapping or flipped
 * triangles would make the sum differ or an area negative.
 */
import { describe, expect, it } from 'vitest';
import { fc, test as fcTest } from '@fast-check/vitest';
import { triangulate } from '../../src/mesh/triangulate.js';
import type { MeshData } from '../../src/io/mesh-data.js';

function shoelace(xy: number[]): number {
  let a = 0;
  const n = xy.length / 2;
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    a += xy[2 * i]! * xy[2 * j + 1]! - xy[2 * j]! * xy[2 * i + 1]!;
  }
  return a / 2;
}

/** A rigid motion into 3D: rotation about axis (1, 2, 3)/√14 by 0.7 rad, then a map offset. */
const AXIS = [1 / Math.sqrt(14), 2 / Math.sqrt(14), 3 / Math.sqrt(14)] as const;
function place(x: number, y: number, z: number, offset: readonly number[]): [number, number, number] {
  const [ux, uy, uz] = AXIS, c = Math.cos(0.7), s = Math.sin(0.7), d = ux * x + uy * y + uz * z;
  // Rodrigues' rotation formula
  return [
    x * c + (uy * z - uz * y) * s + ux * d * (1 - c) + offset[0]!,
    y * c + (uz * x - ux * z) * s + uy * d * (1 - c) + offset[1]!,
    z * c + (ux * y - uy * x) * s + uz * d * (1 - c) + offset[2]!,
  ];
}

function polygonMesh(xy: number[], offset: readonly number[] = [0, 0, 0], rotate = false): MeshData {
  const n = xy.length / 2;
  const positions = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) {
    const p = rotate ? place(xy[2 * i]!, xy[2 * i + 1]!, 0, offset) : [xy[2 * i]! + offset[0]!, xy[2 * i + 1]! + offset[1]!, offset[2]!];
    positions.set(p, 3 * i);
  }
  return { positions, faceOffsets: Uint32Array.from([0, n]), faceIndices: Uint32Array.from({ length: n }, (_, i) => i), vertexProps: [], faceProps: [], name: 'p' };
}

/** Signed areas of the output triangles measured in the polygon's own 2D coordinates. */
function triangleAreas(xy: number[], triangles: Uint32Array): number[] {
  const out: number[] = [];
  for (let t = 0; t < triangles.length; t += 3) {
    const a = triangles[t]!, b = triangles[t + 1]!, c = triangles[t + 2]!;
    out.push(shoelace([xy[2 * a]!, xy[2 * a + 1]!, xy[2 * b]!, xy[2 * b + 1]!, xy[2 * c]!, xy[2 * c + 1]!]));
  }
  return out;
}

function checkPolygon(xy: number[], label: string): void {
  const A = shoelace(xy);
  expect(A, label).toBeGreaterThan(0);
  const n = xy.length / 2;
  for (const [offset, rotate] of [[[0, 0, 0], false], [[512000, 4200000, 300], false], [[512000, 4200000, 300], true]] as const) {
    const { triangles, source } = triangulate(polygonMesh(xy, offset, rotate));
    expect(triangles.length, label).toBe(3 * (n - 2));
    expect(Array.from(source)).toEqual(new Array(n - 2).fill(0));
    const areas = triangleAreas(xy, triangles);
    const tol = 1e-9 * A;
    for (const a of areas) expect(a, `${label} ${offset} ${rotate}`).toBeGreaterThan(tol);
    expect(areas.reduce((s, a) => s + a, 0)).toBeCloseTo(A, 9);
  }
}

describe('ear clipping (shoelace area check)', () => {
  it('L-shape (area 3)', () => {
    const L = [0, 0, 2, 0, 2, 1, 1, 1, 1, 2, 0, 2];
    expect(shoelace(L)).toBe(3);
    checkPolygon(L, 'L');
  });

  it('five-pointed star', () => {
    const star: number[] = [];
    for (let k = 0; k < 10; k++) {
      const r = k % 2 ? 0.38 : 1, t = Math.PI / 2 + (k * Math.PI) / 5;
      star.push(r * Math.cos(t), r * Math.sin(t));
    }
    checkPolygon(star, 'star');
  });

  it('comb with deep slots', () => {
    const comb = [0, 0, 7, 0, 7, 3, 6, 3, 6, 1, 5, 1, 5, 3, 4, 3, 4, 1, 3, 1, 3, 3, 2, 3, 2, 1, 1, 1, 1, 3, 0, 3];
    checkPolygon(comb, 'comb');
  });

  it('square with collinear midpoints makes no zero-area triangle', () => {
    checkPolygon([0, 0, 1, 0, 2, 0, 2, 1, 2, 2, 1, 2, 0, 2, 0, 1], 'square8');
  });

  it('a polygon larger than the best-ear limit (classic first-ear path)', () => {
    const xy: number[] = [];
    for (let k = 0; k < 80; k++) {
      const r = k % 2 ? 0.6 : 1, t = (2 * Math.PI * k) / 80;
      xy.push(r * Math.cos(t), r * Math.sin(t));
    }
    checkPolygon(xy, 'gear80');
  });

  fcTest.prop([fc.array(fc.double({ min: 0.2, max: 1, noNaN: true }), { minLength: 4, maxLength: 24 })], { numRuns: 100 })(
    'random star-shaped polygons',
    (radii) => {
      const n = radii.length;
      const xy = radii.flatMap((r, k) => [r * Math.cos((2 * Math.PI * k) / n), r * Math.sin((2 * Math.PI * k) / n)]);
      checkPolygon(xy, 'random');
    },
  );
});

describe('triangulate on whole meshes', () => {
  it('passes an all-triangle mesh through unchanged with identity sources', () => {
    const m: MeshData = { positions: new Float64Array(12), faceOffsets: Uint32Array.from([0, 3, 6]), faceIndices: Uint32Array.from([0, 1, 2, 2, 1, 3]), vertexProps: [], faceProps: [], name: 't' };
    const r = triangulate(m);
    expect(Array.from(r.triangles)).toEqual([0, 1, 2, 2, 1, 3]);
    expect(Array.from(r.source)).toEqual([0, 1]);
    expect(r.triangles).not.toBe(m.faceIndices);
  });

  it('keeps triangles, splits polygons and records the source polygon of each triangle', () => {
    const positions = Float64Array.from([0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 2, 0, 0, 2, 1, 0]);
    const m: MeshData = { positions, faceOffsets: Uint32Array.from([0, 4, 7]), faceIndices: Uint32Array.from([0, 1, 2, 3, 1, 4, 5]), vertexProps: [], faceProps: [], name: 'm' };
    const r = triangulate(m);
    expect(Array.from(r.source)).toEqual([0, 0, 1]);
    expect(Array.from(r.triangles.subarray(6))).toEqual([1, 4, 5]);
    expect(new Set(r.triangles.subarray(0, 6))).toEqual(new Set([0, 1, 2, 3]));
  });

  it('hopeless polygons (all points on a line, or a bow-tie) still give n − 2 finite triangles', () => {
    for (const xy of [[0, 0, 1, 0, 2, 0, 3, 0], [0, 0, 1, 1, 1, 0, 0, 1]]) {
      const r = triangulate(polygonMesh(xy));
      expect(r.triangles.length).toBe(6);
      expect(r.triangles.every((i) => i < 4)).toBe(true);
    }
  });

  it('a slightly warped hexagon is triangulated with the orientation of its Newell normal', () => {
    const xy: number[] = [];
    for (let k = 0; k < 6; k++) xy.push(Math.cos((k * Math.PI) / 3), Math.sin((k * Math.PI) / 3));
    const m = polygonMesh(xy);
    for (let k = 0; k < 6; k++) m.positions[3 * k + 2] = k % 2 ? 0.05 : -0.05;
    const r = triangulate(m);
    for (const a of triangleAreas(xy, r.triangles)) expect(a).toBeGreaterThan(0);
  });
});
