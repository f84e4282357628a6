/**
 * Two nearly equal routes: a flat plate with a hole placed slightly off the
 * line between the two points. The shortest path in a polygonal domain is a
 * taut string bending only at obstacle corners (Lee & Preparata, "Euclidean
 * shortest paths in the presence of rectilinear barriers", Networks 14,
 * 1984); round one convex hole it is, on each side, that side's convex hull
 * chain of the two points and the hole polygon's corners (elementary). The
 * answer is the shorter of the two chains.
 *
 * Edge flips alone keep the side of the edge-graph route and return that
 * side's chain, which may be the longer one; the `path` entry proves each
 * flip leg against window propagation in the ellipsoid holding every shorter
 * path (flip/verify.ts) and must return the shorter chain.
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { flipGeodesicPath } from '../../src/geodesic/flip/index.js';
import { shortestPathThrough } from '../../src/geodesic/waypoints.js';
import { pathLength, isSurfacePath } from '../../src/geodesic/path.js';
import { holedPlate } from '../fixtures/holed-plates.js';

/** Length of the convex hull chain from the leftmost to the rightmost point, on the upper (+1) or lower (−1) side. */
function hullChain(pts: [number, number][], side: 1 | -1): number {
  const p = [...pts].sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  const chain: [number, number][] = [];
  for (const q of p) {
    // keep a right turn (upper side) or a left turn (lower side) at every chain corner
    while (chain.length >= 2) {
      const [o, a] = [chain[chain.length - 2]!, chain[chain.length - 1]!];
      const cross = (a[0] - o[0]) * (q[1] - o[1]) - (a[1] - o[1]) * (q[0] - o[0]);
      if (side * cross >= 0) chain.pop();
      else break;
    }
    chain.push(q);
  }
  let len = 0;
  for (let i = 1; i < chain.length; i++) len += Math.hypot(chain[i]![0] - chain[i - 1]![0], chain[i]![1] - chain[i - 1]![1]);
  return len;
}

describe('plate with a hole slightly off the line: the shorter of the two taut strings (Lee & Preparata 1984)', () => {
  // with this mesh (seed 3) the edge-graph route of the second case passes on the longer side
  let flipAloneLonger = 0;
  for (const dy of [0.005, -0.005]) {
    it(`hole of radius 0.2 centred at (0, ${dy}), points near (±0.7, 0)`, () => {
      const hole = { x: 0, y: dy, r: 0.2 };
      const s = holedPlate(1, [hole], 0.04, 0.15, 3);
      const m = intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);
      const P = s.positions, nv = P.length / 3;
      const nearest = (x: number, y: number) => {
        let best = -1, d = Infinity;
        for (let v = 0; v < nv; v++) { const e = Math.hypot(P[3 * v]! - x, P[3 * v + 1]! - y); if (e < d) { d = e; best = v; } }
        return best;
      };
      const a = nearest(-0.7, 0), b = nearest(0.7, 0);
      // the hole polygon: the rim vertices (on the circle, as holedPlate samples it)
      const rim: [number, number][] = [];
      for (let v = 0; v < nv; v++) if (Math.abs(Math.hypot(P[3 * v]! - hole.x, P[3 * v + 1]! - hole.y) - hole.r) < 1e-12) rim.push([P[3 * v]!, P[3 * v + 1]!]);
      expect(rim.length).toBeGreaterThanOrEqual(8);
      const ends: [number, number][] = [[P[3 * a]!, P[3 * a + 1]!], [P[3 * b]!, P[3 * b + 1]!]];
      const upper = hullChain([...ends, ...rim], 1), lower = hullChain([...ends, ...rim], -1);
      const want = Math.min(upper, lower);
      expect(Math.abs(upper - lower)).toBeLessThan(0.01 * want); // nearly equal routes
      expect(Math.abs(upper - lower)).toBeGreaterThan(1e-4 * want); // yet distinct

      const f = flipGeodesicPath(m, a, b);
      expect(f.status).toBe('ok');
      const side = Math.abs(f.path.length - upper) < 1e-9 * want ? upper : lower;
      expect(Math.abs(f.path.length - side)).toBeLessThanOrEqual(1e-9 * want); // one taut string or the other
      if (side > want * (1 + 1e-9)) flipAloneLonger++;

      const r = shortestPathThrough(m, [{ kind: 'vertex', vertex: a }, { kind: 'vertex', vertex: b }], { method: 'flip', positions: P });
      expect(r.legs[0]!.proven).toBe(true);
      expect(Math.abs(r.length - want)).toBeLessThanOrEqual(1e-9 * want);
      expect(isSurfacePath(m.topology, r.path.points)).toBe(true);
      expect(Math.abs(pathLength(m, r.path.points) - want)).toBeLessThanOrEqual(1e-9 * want);
      // the route passes on the side of the hole away from its centre's offset
      const ys = r.path.points.map((p) => (p.kind === 'vertex' ? P[3 * p.vertex + 1]! : 0));
      expect(Math.sign(ys.reduce((x, y) => (Math.abs(y) > Math.abs(x) ? y : x), 0))).toBe(-Math.sign(dy));
      if (dy < 0) expect(flipAloneLonger).toBe(1); // the proof did correct a route
    });
  }
});
