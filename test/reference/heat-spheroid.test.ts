import { describe, it, expect } from 'vitest';
import { Geodesic } from 'geographiclib-geodesic';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { HeatSolver } from '../../src/geodesic/heat.js';
import { spheroid } from '../fixtures/shapes.js';

const DEG = 180 / Math.PI;

/**
 * Geodetic latitude and longitude (degrees) of a point on the spheroid with
 * equatorial radius a and polar semi-axis c: tan φ = (a²/c²)·z/√(x²+y²)
 * (Karney, J. Geodesy 87 (2013); see REFERENCES.md).
 */
function latLon(x: number, y: number, z: number, a: number, c: number): [number, number] {
  return [Math.atan2(((a * a) / (c * c)) * z, Math.hypot(x, y)) * DEG, Math.atan2(y, x) * DEG];
}

/** Mean relative error of heat distances from one vertex against GeographicLib's Inverse().s12. */
function spheroidError(level: number, a: number, c: number, lat0: number, lon0: number): number {
  const s = spheroid(level, a, c);
  const nv = s.positions.length / 3;
  const { topology } = buildTopology(s.triangles, nv);
  const solver = HeatSolver.prepare(intrinsicFromPositions(topology, s.positions));
  const P = s.positions;
  // source: the vertex nearest to (lat0, lon0)
  let src = 0, best = Infinity;
  const ll = (v: number) => latLon(P[3 * v]!, P[3 * v + 1]!, P[3 * v + 2]!, a, c);
  for (let v = 0; v < nv; v++) {
    const [la, lo] = ll(v);
    const d = (la - lat0) ** 2 + (lo - lon0) ** 2;
    if (d < best) { best = d; src = v; }
  }
  const d = solver.distance({ points: [{ kind: 'vertex', vertex: src }], curves: [] }).distance;
  // Karney's solver: Geodesic(a, f) with f = (a − c)/a (negative for prolate)
  const geod = new Geodesic.Geodesic(a, (a - c) / a);
  const [la0, lo0] = ll(src);
  const h = solver.stats.meanEdgeLength;
  let sum = 0, n = 0;
  for (let v = 0; v < nv; v += 7) {
    const [la, lo] = ll(v);
    const ref = geod.Inverse(la0, lo0, la, lo).s12!;
    if (ref < 3 * h) continue; // relative error is meaningless next to the source
    sum += Math.abs(d[v]! - ref) / ref;
    n++;
  }
  expect(n).toBeGreaterThan(nv / 10);
  return sum / n;
}

describe('heat method on spheroids against GeographicLib (Karney 2013)', () => {
  it('oblate spheroid a = 1, c = 0.75, ~10k vertices: mean relative error ≤ 2%', () => {
    const e = spheroidError(5, 1, 0.75, 30, 10);
    expect(e).toBeLessThan(0.02);
  });

  it('prolate spheroid a = 1, c = 1.4, ~2.6k vertices: mean relative error ≤ 2%', () => {
    const e = spheroidError(4, 1, 1.4, -20, 45);
    expect(e).toBeLessThan(0.02);
  });
});
