import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { HeatSolver, type HeatOptions } from '../../src/geodesic/heat.js';
import { boundaryCurves, type SourceSet } from '../../src/geodesic/shared/sources.js';
import { surfacePointPosition } from '../../src/mesh/surface-point.js';
import { flatGrid, cylinder, type Shape } from '../fixtures/shapes.js';

function meshOf(s: Shape): IntrinsicMesh {
  const { topology } = buildTopology(s.triangles, s.positions.length / 3);
  return intrinsicFromPositions(topology, s.positions);
}

/** Mean relative error of a heat field against `truth(v)` over vertices with truth ≥ minTruth. */
function meanRelError(d: Float64Array, truth: (v: number) => number, minTruth: number): number {
  let sum = 0, n = 0;
  for (let v = 0; v < d.length; v++) {
    const g = truth(v);
    if (g < minTruth) continue;
    expect(Number.isFinite(d[v]!)).toBe(true);
    sum += Math.abs(d[v]! - g) / g;
    n++;
  }
  expect(n).toBeGreaterThan(d.length / 2);
  return sum / n;
}

/**
 * A flat grid sheared so that half the cells are split along their long
 * diagonal: fans of angles near 150°, strongly negative cotan weights.
 */
function shearedGrid(nx: number, ny: number, shear: number, aspect: number, seed: number): Shape {
  const s = flatGrid(nx, ny, nx, ny * aspect, 0.2, seed);
  for (let i = 0; i < s.positions.length; i += 3) s.positions[i]! += shear * s.positions[i + 1]!;
  return s;
}

function flatError(s: Shape, sources: SourceSet, opts: HeatOptions = {}): number {
  const m = meshOf(s);
  const solver = HeatSolver.prepare(m, opts);
  const d = solver.distance(sources).distance;
  const p = surfacePointPosition(sources.points[0]!, m.topology, s.positions);
  const P = s.positions;
  // flat region: the geodesic distance is the straight-line distance (REFERENCES.md, Lee & Preparata 1984 for convex domains)
  return meanRelError(d, (v) => Math.hypot(P[3 * v]! - p[0]!, P[3 * v + 1]! - p[1]!), 2 * solver.stats.meanEdgeLength);
}

describe('heat method on flat and developable meshes (closed-form distances)', () => {
  it('jittered flat grid, vertex source: Euclidean distance within 2%', () => {
    const s = flatGrid(60, 60, 1, 1, 0.3, 5);
    expect(flatError(s, { points: [{ kind: 'vertex', vertex: 30 * 61 + 30 }], curves: [] })).toBeLessThan(0.02);
  });

  it('point sources inside a face and on an edge: Euclidean distance to that point within 2%', () => {
    const s = flatGrid(40, 40, 2, 1, 0.25, 8);
    const m = meshOf(s);
    const f = 1234, e = 2000;
    expect(flatError(s, { points: [{ kind: 'face', face: f, bary: [0.2, 0.5, 0.3] }], curves: [] })).toBeLessThan(0.02);
    expect(flatError(s, { points: [{ kind: 'edge', edge: e, t: 0.3 }], curves: [] })).toBeLessThan(0.02);
    expect(m.topology.ne).toBeGreaterThan(e);
  });

  it('curve sources: one side of a rectangle, and the whole boundary loop converging under refinement', () => {
    // distance to the side y = 0 is y; distance to the boundary of [0,2]×[0,1]
    // is min(x, 2−x, y, 1−y) (elementary)
    const errs: number[] = [];
    for (const [nx, ny] of [[40, 20], [80, 40]] as const) {
      const s = flatGrid(nx, ny, 2, 1, 0.2, 2);
      const m = meshOf(s);
      const solver = HeatSolver.prepare(m);
      const h = solver.stats.meanEdgeLength, P = s.positions;
      const side = Array.from({ length: nx + 1 }, (_, i) => ({ kind: 'vertex' as const, vertex: i }));
      const d1 = solver.distance({ points: [], curves: [side] }).distance;
      expect(meanRelError(d1, (v) => P[3 * v + 1]!, 2 * h)).toBeLessThan(0.01);
      const d = solver.distance({ points: [], curves: boundaryCurves(m.topology) }).distance;
      const truth = (v: number) => Math.min(P[3 * v]!, 2 - P[3 * v]!, P[3 * v + 1]!, 1 - P[3 * v + 1]!);
      let sum = 0;
      for (let v = 0; v < d.length; v++) sum += Math.abs(d[v]! - truth(v));
      errs.push(sum / d.length / 0.5); // mean absolute error over the largest distance, 0.5
    }
    // The medial axis of the loop starts at the convex corners, where the
    // smoothed X over-states |∇φ| across a √t-wide band: an O(h) offset,
    // so the error must about halve when h halves.
    expect(errs[1]!).toBeLessThan(0.65 * errs[0]!);
    expect(errs[1]!).toBeLessThan(0.12);
  });

  it('open cylinder: unrolled distance sqrt((RΔθ)² + Δz²) within 2%', () => {
    // a cylinder is developable: unrolling is an isometry (elementary)
    const R = 1, H = 3, nT = 96, nz = 45;
    const s = cylinder(nT, nz, R, H);
    const m = meshOf(s);
    const solver = HeatSolver.prepare(m);
    const src = 12 * nT + 5;
    const d = solver.distance({ points: [{ kind: 'vertex', vertex: src }], curves: [] }).distance;
    const th = (v: number) => (2 * Math.PI * (v % nT)) / nT, z = (v: number) => s.positions[3 * v + 2]!;
    const truth = (v: number) => {
      let dt = Math.abs(th(v) - th(src));
      dt = Math.min(dt, 2 * Math.PI - dt);
      return Math.hypot(R * dt, z(v) - z(src));
    };
    expect(meanRelError(d, truth, 2 * solver.stats.meanEdgeLength)).toBeLessThan(0.02);
  });

  it('bad mesh (obtuse fans): intrinsic Delaunay + mollification beat the plain cotan Laplacian by a wide margin', () => {
    const s = shearedGrid(40, 40, 3, 0.2, 3);
    const src: SourceSet = { points: [{ kind: 'vertex', vertex: 20 * 41 + 20 }], curves: [] };
    const good = flatError(s, src);
    const plain = flatError(s, src, { intrinsicDelaunay: false, mollify: false });
    expect(good).toBeLessThan(0.02);
    expect(plain).toBeGreaterThan(10 * good);
  });
});
