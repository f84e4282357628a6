/**
 * Ear clipping of polygons over the best-ear limit, where emptiness is tested
 * against the non-convex corners only (a simple polygon's candidate ear that
 * holds any vertex holds a reflex one: Eberly, "Triangulation by Ear
 * Clipping", 2002). Checked against the definition of a triangulation of a
 * simple polygon: n − 2 triangles, none flipped or empty, none holding
 * another corner of the polygon, total area equal to the polygon's (shoelace
 * formula; common practice).
 */
import { expect, it } from 'vitest';
import { fc, test } from '@fast-check/vitest';
import { triangulate, BEST_EAR_LIMIT } from '../../src/mesh/triangulate.js';
import type { MeshData } from '../../src/io/mesh-data.js';

function polygon(xy: number[]): MeshData {
  const n = xy.length / 2;
  const positions = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) positions.set([xy[2 * i]!, xy[2 * i + 1]!, 0], 3 * i);
  return {
    positions,
    faceOffsets: Uint32Array.from([0, n]),
    faceIndices: Uint32Array.from({ length: n }, (_, i) => i),
    vertexProps: [],
    faceProps: [],
    name: 'polygon',
  } as MeshData;
}

/** Checks the triangulation of a simple polygon; `full` also checks that no corner lies inside a triangle (O(n²)). */
function checkTriangulation(xy: number[], full: boolean): void {
  const n = xy.length / 2;
  const t = triangulate(polygon(xy)).triangles;
  expect(t.length).toBe(3 * (n - 2));
  const o = (a: number, b: number, c: number) =>
    (xy[2 * b]! - xy[2 * a]!) * (xy[2 * c + 1]! - xy[2 * a + 1]!) - (xy[2 * b + 1]! - xy[2 * a + 1]!) * (xy[2 * c]! - xy[2 * a]!);
  let sum = 0, shoelace = 0;
  for (let i = 0; i < n; i++) shoelace += xy[2 * i]! * xy[2 * ((i + 1) % n) + 1]! - xy[2 * ((i + 1) % n)]! * xy[2 * i + 1]!;
  for (let f = 0; f < t.length; f += 3) {
    const a = t[f]!, b = t[f + 1]!, c = t[f + 2]!;
    const area = o(a, b, c);
    expect(area).toBeGreaterThan(0);
    sum += area;
    if (!full) continue;
    for (let v = 0; v < n; v++) {
      if (v === a || v === b || v === c) continue;
      expect(o(a, b, v) > 0 && o(b, c, v) > 0 && o(c, a, v) > 0).toBe(false);
    }
  }
  expect(Math.abs(sum - shoelace)).toBeLessThan(1e-9 * Math.abs(shoelace));
}

it('a 20 000-corner convex cap (a circle as one polygon, as CAD exports write it) triangulates completely', () => {
  const n = 20000, xy: number[] = [];
  for (let i = 0; i < n; i++) xy.push(Math.cos((2 * Math.PI * i) / n), Math.sin((2 * Math.PI * i) / n));
  checkTriangulation(xy, false);
});

test.prop([fc.integer({ min: BEST_EAR_LIMIT + 1, max: 150 }), fc.array(fc.double({ min: 0.15, max: 1, noNaN: true }), { minLength: 150, maxLength: 150 })])(
  'property: random star-shaped polygons over the best-ear limit give a valid triangulation',
  (n, radii) => {
    // star-shaped about the origin with increasing angles: simple
    const xy: number[] = [];
    for (let i = 0; i < n; i++) xy.push(radii[i]! * Math.cos((2 * Math.PI * i) / n), radii[i]! * Math.sin((2 * Math.PI * i) / n));
    checkTriangulation(xy, true);
  },
);
