import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { HeatSolver } from '../../src/geodesic/heat.js';
import { next } from '../../src/mesh/topology.js';
import type { SurfacePoint } from '../../src/mesh/surface-point.js';
import { flatGrid } from '../fixtures/shapes.js';

describe('heat method from curves through face interiors', () => {
  it('a straight curve across a jittered flat rectangle (edge points only): distance |y − y0| within 2%, zero on the curve', () => {
    // distance to a line that spans the rectangle is the perpendicular distance (elementary)
    const s = flatGrid(60, 30, 2, 1, 0.2, 4);
    const { topology: t } = buildTopology(s.triangles, s.positions.length / 3);
    const m = intrinsicFromPositions(t, s.positions);
    const P = s.positions, y0 = 0.4137;
    // the curve: every edge crossing y = y0, ordered by x (consecutive crossings share the face between them)
    const pts: { x: number; p: SurfacePoint }[] = [];
    for (let e = 0; e < t.ne; e++) {
      const h = t.edgeHalfedge[e]!, a = t.tri[h]!, b = t.tri[next(h)]!;
      const ya = P[3 * a + 1]! - y0, yb = P[3 * b + 1]! - y0;
      if (ya * yb >= 0) continue;
      const u = ya / (ya - yb);
      pts.push({ x: P[3 * a]! + u * (P[3 * b]! - P[3 * a]!), p: { kind: 'edge', edge: e, t: u } });
    }
    pts.sort((a, b) => a.x - b.x);
    const solver = HeatSolver.prepare(m);
    const d = solver.distance({ points: [], curves: [pts.map((q) => q.p)] }).distance;
    const h = solver.stats.meanEdgeLength;
    let sum = 0, n = 0, near = 0;
    for (let v = 0; v < d.length; v++) {
      const g = Math.abs(P[3 * v + 1]! - y0);
      if (g < h) { near = Math.max(near, Math.abs(d[v]! - g)); continue; }
      sum += Math.abs(d[v]! - g) / g;
      n++;
    }
    expect(sum / n).toBeLessThan(0.02);
    // vertices next to the curve hold their in-face distance to it (Dirichlet data): error well below h
    expect(near).toBeLessThan(0.25 * h);
  });
});
