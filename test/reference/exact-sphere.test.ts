/**
 * Exact polyhedral distances on inscribed spheres and spheroids converge to
 * the smooth geodesic distance like h² (the polyhedron's metric differs
 * from the smooth one by O(h²)); the observed rate between refinement levels
 * should be near 2.
 */
import { describe, it, expect } from 'vitest';
import { Geodesic } from 'geographiclib-geodesic';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { exactDistance } from '../../src/geodesic/exact/index.js';
import { pointSources } from '../../src/geodesic/shared/sources.js';
import { icosphere, spheroid } from '../fixtures/shapes.js';

const DEG = 180 / Math.PI;

/** Max absolute error over vertices from vertex 0 against a reference distance function. */
function maxError(positions: Float64Array, triangles: Uint32Array, ref: (v: number) => number): number {
  const m = intrinsicFromPositions(buildTopology(triangles, positions.length / 3).topology, positions);
  const d = exactDistance(m, pointSources([{ kind: 'vertex', vertex: 0 }])).field.distance;
  let e = 0;
  for (let v = 0; v < d.length; v++) e = Math.max(e, Math.abs(d[v]! - ref(v)));
  return e;
}

describe('exact distance on spheres and spheroids: error ~ h²', () => {
  it('unit icosphere, levels 2–4: against R·acos(n1·n2) (do Carmo 1976)', () => {
    const errs = [2, 3, 4].map((level) => {
      const s = icosphere(level, 1);
      const P = s.positions;
      return maxError(P, s.triangles, (v) => Math.acos(Math.max(-1, Math.min(1, P[3 * v]! * P[0]! + P[3 * v + 1]! * P[1]! + P[3 * v + 2]! * P[2]!))));
    });
    // h halves per level: rate = log2(e_k / e_{k+1})
    for (let i = 0; i + 1 < errs.length; i++) expect(Math.log2(errs[i]! / errs[i + 1]!)).toBeGreaterThan(1.5);
    expect(errs[2]).toBeLessThan(0.01);
  });

  it('oblate spheroid a = 1, c = 0.7, levels 2–4: against GeographicLib Inverse (Karney, J. Geodesy 87, 2013)', () => {
    const a = 1, c = 0.7;
    const geod = new Geodesic.Geodesic(a, (a - c) / a);
    // geodetic latitude on the spheroid: tan φ = (a²/c²)·z/√(x²+y²)
    const latLon = (P: Float64Array, v: number) => [
      Math.atan2(((a * a) / (c * c)) * P[3 * v + 2]!, Math.hypot(P[3 * v]!, P[3 * v + 1]!)) * DEG,
      Math.atan2(P[3 * v + 1]!, P[3 * v]!) * DEG,
    ];
    const errs = [2, 3, 4].map((level) => {
      const s = spheroid(level, a, c);
      const P = s.positions;
      const [la0, lo0] = latLon(P, 0);
      return maxError(P, s.triangles, (v) => {
        const [la, lo] = latLon(P, v);
        return geod.Inverse(la0!, lo0!, la!, lo!).s12!;
      });
    });
    for (let i = 0; i + 1 < errs.length; i++) expect(Math.log2(errs[i]! / errs[i + 1]!)).toBeGreaterThan(1.5);
  });
});
