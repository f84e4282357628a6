import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { HeatSolver } from '../../src/geodesic/heat.js';
import { icosphere } from '../fixtures/shapes.js';

/**
 * Mean relative error of heat distances on an icosphere of radius R against
 * the great-circle distance R·acos(n1·n2) (do Carmo, Differential Geometry of
 * Curves and Surfaces, 1976), over every vertex but the source.
 */
function sphereError(level: number, R: number, sources: number[]): number {
  const s = icosphere(level, R);
  const nv = s.positions.length / 3;
  const { topology } = buildTopology(s.triangles, nv);
  const solver = HeatSolver.prepare(intrinsicFromPositions(topology, s.positions));
  const P = s.positions;
  let sum = 0, n = 0;
  for (const src of sources) {
    const d = solver.distance({ points: [{ kind: 'vertex', vertex: src }], curves: [] }).distance;
    expect(d[src]).toBe(0);
    for (let v = 0; v < nv; v++) {
      const dot = (P[3 * v]! * P[3 * src]! + P[3 * v + 1]! * P[3 * src + 1]! + P[3 * v + 2]! * P[3 * src + 2]!) / (R * R);
      const g = R * Math.acos(Math.max(-1, Math.min(1, dot)));
      if (v === src) continue;
      sum += Math.abs(d[v]! - g) / g;
      n++;
    }
  }
  return sum / n;
}

describe('heat method on the sphere (great-circle distance, do Carmo 1976)', () => {
  it('mean relative error ≤ 1.5% at 10242 vertices and falls under refinement 3 → 4 → 5', () => {
    // sources: an original icosahedron corner (valence 5) and a regular vertex
    const e3 = sphereError(3, 2, [0, 500]);
    const e4 = sphereError(4, 2, [0, 500]);
    const e5 = sphereError(5, 2, [0, 500]);
    expect(e5).toBeLessThan(0.015);
    expect(e4).toBeLessThan(0.9 * e3);
    expect(e5).toBeLessThan(0.9 * e4);
  });

  it('antipode distance is close to πR and the field never exceeds it by much', () => {
    // the farthest point from any point of a sphere is its antipode at πR (do Carmo 1976)
    const R = 3;
    const s = icosphere(4, R);
    const nv = s.positions.length / 3;
    const { topology } = buildTopology(s.triangles, nv);
    const d = HeatSolver.prepare(intrinsicFromPositions(topology, s.positions))
      .distance({ points: [{ kind: 'vertex', vertex: 7 }], curves: [] }).distance;
    let max = 0;
    for (const x of d) max = Math.max(max, x);
    expect(Math.abs(max - Math.PI * R) / (Math.PI * R)).toBeLessThan(0.02);
  });
});
