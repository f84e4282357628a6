/**
 * Metrics of `score` on meshes with closed-form answers: landmark distances
 * with the exact method on a unit cube, a triangular prism and a flat plate
 * (unfoldings: every number below is plane geometry on the unfolded faces),
 * triangle quality, the two-sweep diameter and the heat error.
 */
import { describe, expect, it } from 'vitest';
import { openSurface } from '../../src/index.js';
import { scoreSurface, parseLandmarks, radiusRatio, nearestRank } from '../../src/score/index.js';
import { meshFromTriangles } from '../../src/api/io.js';
import { subdivide, type V3 } from '../fixtures/subdivide.js';
import { flatGrid, icosphere, torus } from '../fixtures/shapes.js';

const surfaceOf = (s: { positions: Float64Array; triangles: Uint32Array }, name = 'mesh') => openSurface(meshFromTriangles(s.positions, s.triangles, name), name);

/** Unit cube [0,1]³, each face two triangles, outward winding; subdivided m×m per triangle. */
function cube(m: number) {
  const P: V3[] = [[0, 0, 0], [1, 0, 0], [1, 1, 0], [0, 1, 0], [0, 0, 1], [1, 0, 1], [1, 1, 1], [0, 1, 1]];
  const quads = [[0, 3, 2, 1], [4, 5, 6, 7], [0, 1, 5, 4], [1, 2, 6, 5], [2, 3, 7, 6], [3, 0, 4, 7]];
  const tris: V3[][] = [];
  for (const [a, b, c, d] of quads) tris.push([P[a!]!, P[b!]!, P[c!]!], [P[a!]!, P[c!]!, P[d!]!]);
  return surfaceOf(subdivide(tris, m), 'cube');
}

/** Triangular prism: equilateral base of side 1 at z = 0, height h, closed, subdivided m×m per triangle. */
function prism(h: number, m: number) {
  const A: V3 = [0, 0, 0], B: V3 = [1, 0, 0], C: V3 = [0.5, Math.sqrt(3) / 2, 0];
  const up = (p: V3): V3 => [p[0], p[1], h];
  const tris: V3[][] = [[A, C, B], [up(A), up(B), up(C)]];
  for (const [p, q] of [[A, B], [B, C], [C, A]] as [V3, V3][]) tris.push([p, q, up(q)], [p, up(q), up(p)]);
  return surfaceOf(subdivide(tris, m), 'prism');
}

const score = (s: ReturnType<typeof cube>, landmarks: string) =>
  scoreSurface(s, { groups: ['landmarks'], landmarks: parseLandmarks(landmarks, 'test') });

describe('landmark distances (exact method) against closed forms', () => {
  it('unit cube: edge 1, face diagonal √2, opposite corners √5, opposite face centres 2', async () => {
    // unfoldings of the unit cube (plane geometry): corner to opposite corner over two faces is √(1² + 2²)
    const r = await score(cube(3), 'edge=p:0,0,0>p:1,0,0=1; diag=p:0,0,0>p:1,1,0=1.4142135623730951; far=p:0,0,0>p:1,1,1=2.23606797749979; centres=p:0.5,0.5,0>p:0.5,0.5,1=2');
    for (const l of r.landmarks) expect(Math.abs(l.deviation!), l.name).toBeLessThan(1e-9);
    expect(r.metrics.landmarkCount).toBe(4);
    expect(r.metrics.landmarkMaxAbsDeviation as number).toBeLessThan(1e-9);
  });

  it('prism: up an edge h, across a side √(1 + h²), to the top centroid √(1/4 + (h + 1/(2√3))²)', async () => {
    const h = 2;
    const cx = 0.5, cy = Math.sqrt(3) / 6; // centroid of the top triangle
    // unfold the side face ABB'A' with the top triangle hinged on A'B': the centroid lies 1/(2√3) beyond the
    // midpoint of A'B', so from A it is √(0.5² + (h + 1/(2√3))²); the straight line crosses A'B' inside it
    const toCentroid = Math.sqrt(0.25 + (h + 1 / (2 * Math.sqrt(3))) ** 2);
    const r = await score(prism(h, 3), `up=p:0,0,0>p:0,0,${h}=${h}; side=p:0,0,0>p:1,0,${h}=${Math.sqrt(1 + h * h)}; top=p:0,0,0>p:${cx},${cy},${h}=${toCentroid}`);
    for (const l of r.landmarks) expect(Math.abs(l.deviation!), `${l.name}: ${l.measured}`).toBeLessThan(1e-9);
  });

  it('flat plate 2 × 1 (jittered grid, convex): distances are straight lines', async () => {
    const plate = surfaceOf(flatGrid(8, 4, 2, 1, 0.2, 7), 'plate');
    // a convex flat domain: the geodesic is the straight segment (plane geometry)
    const r = await score(plate, 'diag=p:0,0,0>p:2,1,0=2.23606797749979; side=p:0,0,0>p:2,0,0=2; mid=p:0,0.5,0>p:2,0.5,0=2');
    for (const l of r.landmarks) expect(Math.abs(l.deviation!), `${l.name}: ${l.measured}`).toBeLessThan(1e-9);
  });

  it('a wrong nominal shows as its deviation, a pair on another component as unreachable (null)', async () => {
    const r = await score(cube(1), 'far=p:0,0,0>p:1,1,1=1.7320508075688772±0.01');
    // √5 − √3 (the 3D diagonal is not the surface distance)
    expect(r.landmarks[0]!.deviation).toBeCloseTo(Math.sqrt(5) - Math.sqrt(3), 12);
    expect(r.landmarks[0]!.tolerance).toBe(0.01);
    // two separate triangles: no path from one to the other
    const two = surfaceOf({ positions: Float64Array.from([0, 0, 0, 1, 0, 0, 0, 1, 0, 5, 0, 0, 6, 0, 0, 5, 1, 0]), triangles: Uint32Array.from([0, 1, 2, 3, 4, 5]) });
    const u = await score(two, 'gap=v:0>v:3=5');
    expect(u.landmarks[0]).toMatchObject({ measured: null, deviation: null });
    expect(u.metrics.landmarkMaxAbsDeviation).toBeNull();
  });
});

describe('the landmark text form', () => {
  it('reads names, nominals and tolerances, and refuses what does not fit', () => {
    const l = parseLandmarks('a=v:0>v:6=2.5±0.1; v:1>e:3:0.5=1 ; b=p:1,2,3>f:2:1,1,1=0.5+-0.2', 'm.csv:2');
    expect(l.map((x) => [x.name, x.from, x.to, x.nominal, x.tolerance])).toEqual([
      ['a', 'v:0', 'v:6', 2.5, 0.1], ['L2', 'v:1', 'e:3:0.5', 1, undefined], ['b', 'p:1,2,3', 'f:2:1,1,1', 0.5, 0.2],
    ]);
    expect(() => parseLandmarks('v:0=1', 'm.csv:2')).toThrow(/m\.csv:2.*FROM>TO/);
    expect(() => parseLandmarks('v:0>v:1=abc', 'm.csv:3')).toThrow(/m\.csv:3.*nominal 'abc'/);
    expect(() => parseLandmarks('x=v:0>v:1=1; x=v:0>v:2=1', 'm.csv:4')).toThrow(/used twice/);
  });
});

describe('health, quality and curvature groups', () => {
  it('unit cube (12 triangles): counts, genus 0, area 6, angles 45°/90°, radius ratio (1 + √2)/2, total curvature 4π', async () => {
    const r = await scoreSurface(cube(1), { groups: ['health', 'quality', 'curvature'] });
    const m = r.metrics;
    // Euler: V − E + F = 8 − 18 + 12 = 2, genus 0 (common practice)
    expect([m.vertices, m.triangles, m.edges, m.eulerCharacteristic, m.genus, m.orientable]).toEqual([8, 12, 18, 2, 0, true]);
    expect(m.area as number).toBeCloseTo(6, 12);
    expect(m.minAngleDeg as number).toBeCloseTo(45, 10);
    expect(m.maxAngleDeg as number).toBeCloseTo(90, 10);
    // right isosceles triangle: R = √2/2, r = (2 − √2)/2, R/(2r) = (1 + √2)/2 (plane geometry)
    expect(m.aspectRatioP50 as number).toBeCloseTo((1 + Math.SQRT2) / 2, 12);
    expect(m.aspectRatioMax as number).toBeCloseTo((1 + Math.SQRT2) / 2, 12);
    // opposite angles of each diagonal sum to exactly π: Delaunay (a tie), not a violation
    expect(m.nonDelaunayEdges).toBe(0);
    // Gauss–Bonnet: total defect 2πχ = 4π; each corner π/2
    expect(m.totalAngleDefect as number).toBeCloseTo(4 * Math.PI, 12);
    expect([m.zeroAreaTriangles, m.sliverTriangles, m.duplicateFacesDropped, m.problems]).toEqual([0, 0, 0, 0]);
  });

  it('torus: genus 1, χ = 0 (common practice)', async () => {
    const r = await scoreSurface(surfaceOf(torus(12, 8)), { groups: ['health'] });
    expect([r.metrics.genus, r.metrics.eulerCharacteristic]).toEqual([1, 0]);
  });

  it('radius ratio: 1 for an equilateral triangle, Infinity without area; nearest-rank quantiles', () => {
    expect(radiusRatio(1, 1, 1)).toBeCloseTo(1, 14);
    // 3-4-5 right triangle: R = 2.5, r = 1, ratio 1.25 (plane geometry)
    expect(radiusRatio(3, 4, 5)).toBeCloseTo(1.25, 14);
    expect(radiusRatio(1, 1, 2)).toBe(Infinity);
    // Hyndman & Fan (1996) definition 1 on 1..10: the 0.5 quantile is 5, the 0.9 is 9, the 0.99 is 10
    const xs = Float64Array.from({ length: 10 }, (_, i) => i + 1);
    expect([nearestRank(xs, 0.5), nearestRank(xs, 0.9), nearestRank(xs, 0.99)]).toEqual([5, 9, 10]);
  });

  it('a flipped diagonal in a flat quad is a non-Delaunay edge', async () => {
    // rhombus with a 120° pair of angles split along its long diagonal: the angles opposite it are 120° + 120° > π
    const s = Math.sqrt(3) / 2;
    const q = surfaceOf({ positions: Float64Array.from([0, 0, 0, 1, 0, 0, 1.5, s, 0, 0.5, s, 0]), triangles: Uint32Array.from([0, 1, 3, 1, 2, 3]) });
    const long = surfaceOf({ positions: Float64Array.from([0, 0, 0, 1, 0, 0, 1.5, s, 0, 0.5, s, 0]), triangles: Uint32Array.from([0, 1, 2, 0, 2, 3]) });
    expect((await scoreSurface(q, { groups: ['quality'] })).metrics.nonDelaunayEdges).toBe(0);
    expect((await scoreSurface(long, { groups: ['quality'] })).metrics).toMatchObject({ nonDelaunayEdges: 1, nonDelaunayFraction: 1 });
  });
});

describe('diameter and heat error', () => {
  it('two sweeps on a 2 × 1 plate find the diagonal √5; on the unit cube corner to corner √5 (a lower bound)', async () => {
    const plate = await scoreSurface(surfaceOf(flatGrid(8, 4, 2, 1, 0.2, 7)), { groups: ['diameter'] });
    // the diameter of a convex plane region is its longest chord: the rectangle's diagonal (plane geometry)
    expect(plate.metrics.diameterLowerBound as number).toBeCloseTo(Math.sqrt(5), 9);
    const c = await scoreSurface(cube(1), { groups: ['diameter'] });
    // on the 8 corners the farthest pair is opposite corners at √5 (unfolding); the surface's diameter is at least that
    expect(c.metrics.diameterLowerBound as number).toBeCloseTo(Math.sqrt(5), 9);
  });

  it('heat error on a unit sphere is small and not zero', async () => {
    const r = await scoreSurface(surfaceOf(icosphere(3)), { groups: ['heat'], heatSamples: 2 });
    expect(r.metrics.heatSamples).toBe(2);
    // the heat method is an approximation: a few percent at most on a fine regular mesh
    // (Crane, Weischedel & Wardetzky 2013 report errors of this order; from memory)
    expect(r.metrics.heatErrorMax as number).toBeGreaterThan(0);
    expect(r.metrics.heatErrorMax as number).toBeLessThan(0.1);
    expect(r.metrics.heatErrorMean as number).toBeLessThanOrEqual(r.metrics.heatErrorMax as number);
  });
});
