/**
 * Progress reports at the library boundary (DistanceOptions.progress,
 * ExactOptions.progress): the solvers call back and never print, the shares
 * are in [0, 1] and never go back, and reporting does not change a single
 * distance. Outside source for the numbers: on a flat convex patch the
 * geodesic distance is the Euclidean one (elementary).
 */
import { describe, expect, it } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { exactDistance } from '../../src/geodesic/exact/index.js';
import { prepareDistance, type SolveProgress } from '../../src/geodesic/solver.js';
import { pointSources } from '../../src/geodesic/shared/sources.js';
import { flatGrid } from '../fixtures/shapes.js';
import { fractalHeightfield } from '../bench/meshes.js';

describe('progress callbacks', () => {
  it('exact: shares of faces reached, non-decreasing in [0, 1], and the same field as without', () => {
    const s = fractalHeightfield(20_000, 4);
    const m = intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);
    const src = pointSources([{ kind: 'vertex', vertex: 5000 }]);
    const shares: number[] = [];
    const a = exactDistance(m, src, { progress: (x) => shares.push(x) });
    const b = exactDistance(m, src);
    expect(a.field.distance).toEqual(b.field.distance);
    expect(a.windows).toBe(b.windows);
    expect(shares.length).toBeGreaterThan(10); // one report per 4096 events: ~0.5M windows here
    for (let i = 0; i < shares.length; i++) {
      expect(shares[i]).toBeGreaterThanOrEqual(i ? shares[i - 1]! : 0);
      expect(shares[i]).toBeLessThanOrEqual(1);
    }
    expect(shares[shares.length - 1]).toBeGreaterThan(0.9);
  });

  it('through prepareDistance: a prepare report (heat), a solve report per solve, and right distances', () => {
    const g = flatGrid(30, 30, 3, 3, 0.2, 5);
    const m = intrinsicFromPositions(buildTopology(g.triangles, g.positions.length / 3).topology, g.positions);
    for (const method of ['exact', 'heat', 'graph'] as const) {
      const seen: SolveProgress[] = [];
      const solver = prepareDistance(m, method, { progress: (p) => seen.push(p) });
      expect(seen.filter((p) => p.stage === 'prepare')).toHaveLength(method === 'heat' ? 1 : 0);
      const r = solver.solve(pointSources([{ kind: 'vertex', vertex: 0 }]));
      expect(seen.filter((p) => p.stage === 'solve').length).toBeGreaterThanOrEqual(1);
      if (method === 'exact') {
        // flat convex patch: exact = Euclidean distance (elementary), tolerance scaled to its 3-unit size
        let worst = 0;
        for (let v = 0; v < m.topology.nv; v++) {
          worst = Math.max(worst, Math.abs(r.field.distance[v]! - Math.hypot(g.positions[3 * v]! - g.positions[0]!, g.positions[3 * v + 1]! - g.positions[1]!)));
        }
        expect(worst).toBeLessThan(3e-12);
      }
    }
  });
});
