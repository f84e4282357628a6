/**
 * Named boundary loops (src/mesh/boundary.ts): ids, lengths, boxes, order.
 *
 * Outside facts:
 * - A regular n-gon inscribed in a circle of radius r has sides 2r·sin(π/n),
 *   so its perimeter is 2nr·sin(π/n) (elementary trigonometry). The holed
 *   plates (test/fixtures/holed-plates.ts) sample each circle at n equally
 *   spaced points, so each rim is exactly such a polygon.
 * - The boundary of a Möbius strip is one circle (standard topology); a
 *   strip of n quads two vertices wide has all 2n vertices on it.
 * - Shoelace formula: the signed area of a plane polygon is positive when it
 *   runs counter-clockwise.
 */
import { describe, expect, it } from 'vitest';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { surfaceFromMeshData } from '../../src/mesh/surface.js';
import { boundaryLoops, namedBoundaryLoops } from '../../src/mesh/boundary.js';
import { twoHolePlate, annulus } from '../fixtures/holed-plates.js';
import { icosphere } from '../fixtures/shapes.js';

const surf = (positions: Float64Array, triangles: ArrayLike<number>) => surfaceFromMeshData(meshFromTriangles(positions, triangles, 'case.obj'));
/** Points a plate samples on a circle of radius r at edge length h (the rule of holed-plates.ts). */
const samples = (r: number, h: number) => Math.max(8, Math.round((2 * Math.PI * r) / h));
const polygonPerimeter = (n: number, r: number) => 2 * n * r * Math.sin(Math.PI / n);

describe('named boundary loops', () => {
  const R = 1, h = 0.05;
  const plate = twoHolePlate(R, h);
  const s = surf(plate.positions, plate.triangles);
  const loops = namedBoundaryLoops(s.topology, s.positions);

  it('plate with two holes: three loops, perimeters are the exact polygon perimeters 2nr·sin(π/n)', () => {
    expect(loops.length).toBe(3);
    const no = samples(R, h), nh = samples(0.2 * R, h);
    expect(loops.map((l) => l.vertices.length)).toEqual([no, nh, nh]);
    expect(loops.map((l) => l.id)).toEqual([0, 1, 2]);
    // closed form; tolerance: rounding of n sums of chords of size ~h
    expect(Math.abs(loops[0]!.length - polygonPerimeter(no, R))).toBeLessThan(1e-13 * no);
    expect(Math.abs(loops[1]!.length - polygonPerimeter(nh, 0.2 * R))).toBeLessThan(1e-13 * nh);
    expect(Math.abs(loops[2]!.length - polygonPerimeter(nh, 0.2 * R))).toBeLessThan(1e-13 * nh);
  });

  it('ids: longest first; equally long holes by smallest vertex index (the left hole was sampled first)', () => {
    expect(loops[0]!.length).toBeGreaterThan(loops[1]!.length);
    // holes at (∓0.45 R, 0), radius 0.2 R: the boxes tell which is which
    expect(loops[1]!.max[0]).toBeLessThan(0);
    expect(loops[2]!.min[0]).toBeGreaterThan(0);
    expect(Math.min(...loops[1]!.vertices)).toBeLessThan(Math.min(...loops[2]!.vertices));
    expect(loops[1]!.representative).toBe(Math.min(...loops[1]!.vertices));
  });

  it('bounding boxes: the outer polygon reaches x = ±R (a sample at angle 0 and, n even, at π); the holes ±0.2 R about their centres', () => {
    const tol = 1e-12;
    expect(samples(R, h) % 2).toBe(0);
    expect(Math.abs(loops[0]!.max[0] - R)).toBeLessThan(tol);
    expect(Math.abs(loops[0]!.min[0] + R)).toBeLessThan(tol);
    expect(Math.abs(loops[1]!.max[0] - (-0.45 * R + 0.2 * R))).toBeLessThan(tol);
    const nh = samples(0.2 * R, h); // odd here: the leftmost sample is at angle π ± π/n
    expect(Math.abs(loops[2]!.min[0] - (0.45 * R - 0.2 * R * (nh % 2 ? Math.cos(Math.PI / nh) : 1)))).toBeLessThan(tol);
    for (const l of loops) expect(l.min[2]).toBe(0);
  });

  it('orientation: the outer loop runs counter-clockwise from +z, a hole clockwise (shoelace: signed area ±(n/2)r²·sin(2π/n))', () => {
    const a = annulus(1, 0.4, 0.1);
    const sa = surf(a.positions, a.triangles);
    const [outer, hole] = namedBoundaryLoops(sa.topology, sa.positions);
    const signed = (vs: Int32Array) => {
      let s2 = 0;
      for (let i = 0; i < vs.length; i++) {
        const p = vs[i]!, q = vs[(i + 1) % vs.length]!;
        s2 += sa.positions[3 * p]! * sa.positions[3 * q + 1]! - sa.positions[3 * q]! * sa.positions[3 * p + 1]!;
      }
      return s2 / 2;
    };
    // area of a regular n-gon inscribed in radius r: (n/2)·r²·sin(2π/n) (elementary)
    const ngonArea = (n: number, r: number) => (n / 2) * r * r * Math.sin((2 * Math.PI) / n);
    expect(signed(outer!.vertices)).toBeCloseTo(ngonArea(samples(1, 0.1), 1), 12);
    expect(signed(hole!.vertices)).toBeCloseTo(-ngonArea(samples(0.4, 0.1), 0.4), 12);
  });

  it('ids and vertex order do not depend on the order of faces in the file', () => {
    const T = plate.triangles, nf = T.length / 3;
    const shuffled: number[] = [];
    for (let k = 0; k < nf; k++) {
      const f = (k * 7919) % nf; // 7919 is prime and does not divide nf: a permutation
      shuffled.push(T[3 * f]!, T[3 * f + 1]!, T[3 * f + 2]!);
    }
    expect(nf % 7919).not.toBe(0);
    const s2 = surf(plate.positions, shuffled);
    const l2 = namedBoundaryLoops(s2.topology, s2.positions);
    // the same vertices in the same order, each loop starting at its smallest vertex
    expect(l2.map((l) => [...l.vertices])).toEqual(loops.map((l) => [...l.vertices]));
    for (const l of loops) expect(l.vertices[0]).toBe(Math.min(...l.vertices));
    expect(l2.map((l) => l.representative)).toEqual(loops.map((l) => l.representative));
  });

  it('a closed surface has none; without seams the loops are those of boundaryLoops', () => {
    const ico = icosphere(1);
    const si = surf(ico.positions, ico.triangles);
    expect(namedBoundaryLoops(si.topology, si.positions)).toEqual([]);
    const raw = boundaryLoops(s.topology).map((l) => [...l].sort((a, b) => a - b).join(','));
    expect(loops.map((l) => [...l.halfedges].sort((a, b) => a - b).join(',')).sort()).toEqual(raw.sort());
  });

  it('Möbius strip (cut along a seam to be built): one loop through all 2n vertices, length = the sum of its rim edges', () => {
    const n = 40, P = new Float64Array(6 * n), T: number[] = [];
    for (let i = 0; i < n; i++) {
      const u = (2 * Math.PI * i) / n;
      for (let j = 0; j < 2; j++) {
        const w = j - 0.5, r = 3 + w * Math.cos(u / 2);
        P.set([r * Math.cos(u), r * Math.sin(u), w * Math.sin(u / 2)], 3 * (2 * i + j));
      }
    }
    for (let i = 0; i < n; i++) {
      const a = 2 * i, b = 2 * i + 1;
      const c = i < n - 1 ? 2 * i + 2 : 1, d = i < n - 1 ? 2 * i + 3 : 0; // half twist
      T.push(a, c, b, b, c, d);
    }
    const sm = surf(P, T);
    expect(sm.report.orientationSeams.length).toBeGreaterThan(0);
    const ml = namedBoundaryLoops(sm.topology, sm.positions, sm.report.orientationSeams);
    expect(ml.length).toBe(1);
    expect(ml[0]!.vertices.length).toBe(2 * n);
    const files = new Set([...ml[0]!.vertices].map((v) => sm.topology.vertexOrigin[v]));
    expect(files.size).toBe(2 * n);
    // rim edges: (i, j) – (i+1, j) for i < n−1, and the twisted closing edges (n−1, j) – (0, 1−j)
    const d = (p: number, q: number) => Math.hypot(P[3 * p]! - P[3 * q]!, P[3 * p + 1]! - P[3 * q + 1]!, P[3 * p + 2]! - P[3 * q + 2]!);
    let len = 0;
    for (let i = 0; i < n - 1; i++) len += d(2 * i, 2 * i + 2) + d(2 * i + 1, 2 * i + 3);
    len += d(2 * n - 2, 1) + d(2 * n - 1, 0);
    expect(Math.abs(ml[0]!.length - len)).toBeLessThan(1e-12 * len);
    // without gluing the seams the cut strip is a disc whose one loop also runs along the seam
    const cut = namedBoundaryLoops(sm.topology, sm.positions);
    expect(cut.length).toBe(1);
    expect(cut[0]!.length).toBeGreaterThan(len);
  });
});
