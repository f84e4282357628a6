/**
 * The graph method is an upper bound on the geodesic distance at every
 * surface point, not only at vertices (issue #8 item 6).
 *
 * Sources of the checks:
 * - every graph value is the length of a path on the surface, so it is at
 *   least the exact polyhedral distance (definition of the geodesic distance
 *   as the infimum of path lengths);
 * - on an open prism tube (a 7-sided polygon swept along z; every side a
 *   flat rectangle) the surface is developable: cut along one vertical edge
 *   it unrolls isometrically onto a strip of width P (the perimeter), so the
 *   distance between points at perimeter coordinates u1, u2 and heights z1,
 *   z2 is min over k of √((u2 − u1 + kP)² + (z2 − z1)²) (closed form of the
 *   cylinder's development, R·Δθ replaced by the arc along the polygon)
 *   for points whose straight segment in the development stays inside the
 *   strip (it always does: the strip spans the tube's full height).
 */
import { describe, it, expect } from 'vitest';
import { test, fc } from '@fast-check/vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { prepareDistance } from '../../src/geodesic/solver.js';
import { pointSources } from '../../src/geodesic/shared/sources.js';
import { surfacePointPosition } from '../../src/mesh/surface-point.js';
import type { SurfacePoint } from '../../src/mesh/surface-point.js';
import { valueAtPoint } from '../../src/geodesic/heat-sources.js';
import { cylinder, flatGrid, terrain, rng } from '../fixtures/shapes.js';
import type { Shape } from '../fixtures/shapes.js';

const build = (s: Shape) => intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);

function randomPoints(nf: number, ne: number, r: () => number, n: number): SurfacePoint[] {
  const out: SurfacePoint[] = [];
  for (let i = 0; i < n; i++) {
    if (i % 2) out.push({ kind: 'edge', edge: Math.floor(r() * ne), t: r() });
    else {
      const a = r(), b = r() * (1 - a);
      out.push({ kind: 'face', face: Math.floor(r() * nf), bary: [a, b, 1 - a - b] });
    }
  }
  return out;
}

describe('graph distance at surface points is an upper bound', () => {
  test.prop([fc.integer({ min: 1, max: 1e6 }), fc.boolean()], { numRuns: 6 })('random flat meshes and jittered terrains: graph ≥ exact everywhere', (seed, hilly) => {
    const r = rng(seed);
    const s = hilly ? terrain(6, 6, 1, 1, (x, y) => 0.15 * Math.sin(5 * x + 3 * y) + 0.05 * r()) : flatGrid(6, 6, 1, 1, 0.2, seed);
    const m = build(s);
    const t = m.topology;
    const src = randomPoints(t.nf, t.ne, r, 2);
    const exact = prepareDistance(m, 'exact').solve(pointSources(src));
    const graph = prepareDistance(m, 'graph').solve(pointSources(src));
    for (let v = 0; v < t.nv; v++) expect(graph.field.distance[v]!).toBeGreaterThanOrEqual(exact.field.distance[v]! - 1e-12);
    for (const p of [...randomPoints(t.nf, t.ne, r, 40), ...src]) {
      expect(graph.at(p)).toBeGreaterThanOrEqual(exact.at(p) - 1e-12);
    }
  });

  it('open 7-sided prism tube: exact matches the development (closed form), graph stays above it', () => {
    const n = 7, R = 1, H = 3;
    const s = cylinder(n, 3, R, H);
    const m = build(s);
    const t = m.topology;
    const side = 2 * R * Math.sin(Math.PI / n), P = n * side;
    // perimeter coordinate of a surface point: blend of its corners' u, unwrapped within the face
    const vertexU = (v: number) => (v % n) * side;
    const coords = (p: SurfacePoint): [number, number] => {
      const xyz = surfacePointPosition(p, t, s.positions);
      const f = p.kind === 'face' ? p.face : p.kind === 'edge' ? (t.edgeHalfedge[p.edge]! / 3) | 0 : -1;
      if (f < 0) return [vertexU((p as { vertex: number }).vertex), xyz[2]!];
      const cs = [0, 1, 2].map((k) => t.tri[3 * f + k]!);
      const us = cs.map(vertexU);
      const lo = Math.min(...us), hi = Math.max(...us);
      const uw = us.map((u) => (hi - lo > P / 2 && u < P / 2 ? u + P : u));
      const w = [0, 0, 0];
      if (p.kind === 'face') p.bary.forEach((b, k) => { w[k] = b; });
      else if (p.kind === 'edge') {
        const h = t.edgeHalfedge[p.edge]!, k = h % 3;
        w[k] = 1 - p.t; w[(k + 1) % 3] = p.t;
      }
      return [w[0]! * uw[0]! + w[1]! * uw[1]! + w[2]! * uw[2]!, xyz[2]!];
    };
    const closed = (a: SurfacePoint, b: SurfacePoint) => {
      const [u1, z1] = coords(a), [u2, z2] = coords(b);
      let best = Infinity;
      for (let k = -2; k <= 2; k++) best = Math.min(best, Math.hypot(u2 - u1 + k * P, z2 - z1));
      return best;
    };
    const src: SurfacePoint = { kind: 'vertex', vertex: 0 };
    const exact = prepareDistance(m, 'exact').solve(pointSources([src]));
    const graph = prepareDistance(m, 'graph').solve(pointSources([src]));
    let blendUndershoots = 0;
    for (let e = 0; e < t.ne; e++) {
      for (const tt of [0.25, 0.5, 0.75]) {
        const p: SurfacePoint = { kind: 'edge', edge: e, t: tt };
        const want = closed(src, p);
        expect(exact.at(p), `e:${e}:${tt}`).toBeCloseTo(want, 9);
        expect(graph.at(p), `e:${e}:${tt}`).toBeGreaterThanOrEqual(want - 1e-12);
        // the repro of the issue: linear blending of corner values falls below the true distance here
        if (valueAtPoint(t, p, graph.field.distance) < want - 1e-6) blendUndershoots++;
      }
    }
    expect(blendUndershoots).toBeGreaterThan(0); // the mesh does exercise the case
    const r = rng(5);
    for (const p of randomPoints(t.nf, t.ne, r, 30)) {
      expect(exact.at(p)).toBeCloseTo(closed(src, p), 9);
      expect(graph.at(p)).toBeGreaterThanOrEqual(closed(src, p) - 1e-12);
    }
    // a source and a target in the same face: the straight segment (elementary)
    const a: SurfacePoint = { kind: 'face', face: 4, bary: [0.2, 0.3, 0.5] }, b: SurfacePoint = { kind: 'face', face: 4, bary: [0.5, 0.3, 0.2] };
    const pa = surfacePointPosition(a, t, s.positions), pb = surfacePointPosition(b, t, s.positions);
    const g = prepareDistance(m, 'graph').solve(pointSources([a]));
    expect(g.at(b)).toBeCloseTo(Math.hypot(pa[0]! - pb[0]!, pa[1]! - pb[1]!, pa[2]! - pb[2]!), 12);
  });
});
