/**
 * User metrics measured through the facade, against closed forms: the
 * hyperbolic upper half-plane, a constant tensor, a cylinder and a sphere
 * given by their first fundamental forms, and a metric that breaks the
 * triangle inequality (counted and repaired).
 */
import { describe, expect, it } from 'vitest';
import { openSurface, measureDistances, shortestPath, curvatureSummary, type Surface } from '../../src/index.js';
import { attachMetric, attachedMetric, parseMetricSpec, triangleInequalityViolations } from '../../src/api/metric.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { flatGrid, rng } from '../fixtures/shapes.js';

/** A flat grid over [x0, x0 + w] × [y0, y0 + h], n × n cells. */
function plane(n: number, x0: number, y0: number, w: number, h: number, props: { name: string; values: Float64Array }[] = []): Surface {
  const g = flatGrid(n, n, w, h);
  for (let i = 0; i < g.positions.length; i += 3) {
    g.positions[i] += x0;
    g.positions[i + 1] += y0;
  }
  const data = meshFromTriangles(g.positions, g.triangles, 'grid');
  data.vertexProps = props.map((p) => ({ ...p, type: 'float64' as const }));
  return openSurface(data);
}
const vertexAt = (n: number, i: number, j: number) => ({ kind: 'vertex' as const, vertex: j * (n + 1) + i });
const dist = (s: Surface, a: ReturnType<typeof vertexAt>, b: ReturnType<typeof vertexAt>, method: 'exact' | 'heat' = 'exact') =>
  measureDistances(s, { points: [a], curves: [] }, { method, targets: [b] }).at(b);

describe('hyperbolic upper half-plane, conformal:1/y on a planar mesh in y > 0', () => {
  // closed forms of hyperbolic geometry (Beardon, The Geometry of Discrete Groups, 1983, §7.2 — from memory):
  // d(p, q) = arccosh(1 + |p − q|² / (2 y_p y_q)); on a vertical line d = ln(y₂/y₁); curvature −1
  const closed = (p: number[], q: number[]) => Math.acosh(1 + ((p[0]! - q[0]!) ** 2 + (p[1]! - q[1]!) ** 2) / (2 * p[1]! * q[1]!));
  const errorAt = (n: number) => {
    const s = plane(n, -1, 0.5, 2, 2);
    const r = attachMetric(s, parseMetricSpec('conformal:1/y'));
    expect(r.triangleInequalityViolations).toBe(0);
    const xy = (i: number, j: number) => [-1 + (2 * i) / n, 0.5 + (2 * j) / n];
    const a = [n / 4, n / 4], b = [(3 * n) / 4, n / 4];
    const across = Math.abs(dist(s, vertexAt(n, a[0]!, a[1]!), vertexAt(n, b[0]!, b[1]!)) - closed(xy(a[0]!, a[1]!), xy(b[0]!, b[1]!)));
    const vertical = Math.abs(dist(s, vertexAt(n, n / 2, 0), vertexAt(n, n / 2, n)) - Math.log(2.5 / 0.5));
    return { s, across, vertical };
  };
  it('distances converge to the closed forms; Gaussian curvature ≈ −1; the path approaches a semicircle centred on the x-axis', () => {
    const coarse = errorAt(12), fine = errorAt(24);
    expect(fine.across).toBeLessThan(0.01);
    expect(fine.across).toBeLessThan(coarse.across); // converges
    expect(fine.vertical).toBeLessThan(1e-9); // the vertical edges are exact (a straight edge along a geodesic)
    const c = curvatureSummary(fine.s);
    expect(Math.abs(c.summary.gaussian.mean + 1)).toBeLessThan(0.02);
    expect(c.summary.gaussian.min).toBeGreaterThan(-1.3);
    expect(c.summary.gaussian.max).toBeLessThan(-0.7);
    // the geodesic from (−0.5, 1) to (0.5, 1) is the circle through them centred at (0, 0), radius √1.25
    const n = 24;
    const route = shortestPath(fine.s, [vertexAt(n, n / 4, n / 4), vertexAt(n, (3 * n) / 4, n / 4)]);
    let worst = 0;
    for (let k = 0; k < route.polyline.length / 3; k++) worst = Math.max(worst, Math.abs(Math.hypot(route.polyline[3 * k]!, route.polyline[3 * k + 1]!) - Math.sqrt(1.25)));
    expect(worst).toBeLessThan(0.03);
    expect(Math.max(...Array.from({ length: route.polyline.length / 3 }, (_, k) => route.polyline[3 * k + 1]!))).toBeGreaterThan(1.08); // it bulges up, the straight segment stays at y = 1
  });
});

describe('a constant tensor on a flat mesh', () => {
  it('the exact distance is √(Δᵀ G Δ) to 1e-9 (a linear change of coordinates maps the metric to the Euclidean one; convex domain: the segment is shortest)', () => {
    const n = 10, s = plane(n, 0, 0, 1, 1);
    attachMetric(s, parseMetricSpec('tensor:2,0.7,0,1,0,4'));
    const G = [[2, 0.7], [0.7, 1]];
    for (const [a, b] of [[[0, 0], [10, 10]], [[3, 7], [9, 1]], [[0, 10], [10, 3]]] as const) {
      const d = [(b[0] - a[0]) / n, (b[1] - a[1]) / n];
      const want = Math.sqrt(G[0]![0]! * d[0]! ** 2 + 2 * G[0]![1]! * d[0]! * d[1]! + G[1]![1]! * d[1]! ** 2);
      expect(Math.abs(dist(s, vertexAt(n, a[0], a[1]), vertexAt(n, b[0], b[1])) - want)).toBeLessThan(1e-9);
    }
  });
});

describe('surfaces given by their first fundamental form (form:E;F;G over x, y)', () => {
  it('a cylinder of radius R (E = R², F = 0, G = 1): distances are the unrolled closed form √((RΔu)² + Δv²), curvature 0', () => {
    const n = 12, R = 1.5, s = plane(n, 0, 0, Math.PI, 1);
    attachMetric(s, parseMetricSpec(`form:${R}^2;0;1`));
    const d = dist(s, vertexAt(n, 1, 2), vertexAt(n, 11, 9));
    expect(Math.abs(d - Math.hypot((R * Math.PI * 10) / n, 7 / n))).toBeLessThan(1e-9); // the unrolled cylinder is a flat rectangle
    const c = curvatureSummary(s);
    expect(Math.max(Math.abs(c.summary.gaussian.min), Math.abs(c.summary.gaussian.max))).toBeLessThan(1e-9);
  });
  it('a sphere of radius R as a latitude–longitude rectangle (E = R² cos² v, G = R²): distances ≈ R·(central angle); band curvature matches Gauss–Bonnet', () => {
    const R = 2, u1 = 1.2, v0 = -0.6, v1 = 0.6;
    const run = (n: number) => {
      const s = plane(n, 0, v0, u1, v1 - v0);
      attachMetric(s, parseMetricSpec(`form:${R}^2*cos(v)^2;0;${R}^2`));
      const uv = (i: number, j: number) => [(u1 * i) / n, v0 + ((v1 - v0) * j) / n];
      const [pa, pb] = [uv(n / 6, n / 4), uv((5 * n) / 6, (3 * n) / 4)];
      // spherical law of cosines (common practice): cos c = sin φ₁ sin φ₂ + cos φ₁ cos φ₂ cos Δλ
      const want = R * Math.acos(Math.sin(pa[1]!) * Math.sin(pb[1]!) + Math.cos(pa[1]!) * Math.cos(pb[1]!) * Math.cos(pb[0]! - pa[0]!));
      const got = dist(s, vertexAt(n, n / 6, n / 4), vertexAt(n, (5 * n) / 6, (3 * n) / 4));
      const c = curvatureSummary(s);
      return { rel: Math.abs(got - want) / want, K: c.summary.gaussian.mean, total: c.summary.totalAngleDefect };
    };
    const coarse = run(12), fine = run(24);
    expect(fine.rel).toBeLessThan(2e-3);
    expect(fine.rel).toBeLessThan(coarse.rel);
    expect(Math.abs(fine.K * R * R - 1)).toBeLessThan(0.01); // K = 1/R²
    // Gauss–Bonnet (do Carmo §4-5, from memory): ∫K dA over the band = Δu (sin v₁ − sin v₀); the interior vertices'
    // defects cover it less a boundary strip of half a cell, so the sum approaches it at O(h)
    const band = u1 * (Math.sin(v1) - Math.sin(v0));
    expect(Math.abs(fine.total - band) / band).toBeLessThan(0.1);
    expect(Math.abs(fine.total - band)).toBeLessThan(Math.abs(coarse.total - band));
  });
});

describe('a metric that breaks the triangle inequality', () => {
  it('is counted and repaired by mollification: the repaired lengths make valid triangles and both methods return finite distances (how far heat is from exact there: user-roughness.test.ts)', () => {
    // a per-vertex cost factor of 1 or 8 at random (a walking-time-like rough cost)
    const n = 30, r = rng(7);
    const lambda = new Float64Array((n + 1) ** 2).map(() => (r() < 0.3 ? 8 : 1));
    const s = plane(n, 0, 0, 1, 1, [{ name: 'cost', values: lambda }]);
    expect(() => attachMetric(plane(n, 0, 0, 1, 1, [{ name: 'cost', values: lambda }]), parseMetricSpec('field:cost'))).toThrow(/under the metric field:cost, 654 of 1800 faces break the triangle inequality/); // auto refuses (ε 0.70× the mean edge)
    const rep = attachMetric(s, parseMetricSpec('field:cost'), { repair: 'mollify' });
    expect(rep.triangleInequalityViolations).toBeGreaterThan(300); // 654 of 1800 faces (measured)
    expect(rep.mollifyEpsilon).toBeGreaterThan(0);
    const repaired = attachedMetric(s)!.mesh;
    expect(triangleInequalityViolations(repaired)).toBe(0);
    const src = { points: [vertexAt(n, 0, 0)], curves: [] };
    for (const method of ['exact', 'heat'] as const) {
      const d = measureDistances(s, src, { method }).field.distance;
      expect(d.every((x) => Number.isFinite(x) && x >= 0)).toBe(true);
    }
  });
  it('a metric that is not positive definite is an INPUT error naming the point and the edge', () => {
    const s = plane(4, -1, -1, 2, 2);
    expect(() => attachMetric(s, parseMetricSpec('conformal:y'))).toThrow(/not positive definite at \(.*\) on the edge between vertices \d+ and \d+/);
    const s2 = plane(4, 0, 0, 1, 1);
    expect(() => attachMetric(s2, parseMetricSpec('form:1;2;1'))).toThrow(/not positive definite/);
  });
});

describe('a non-orientable surface', () => {
  it('a Möbius strip (solved on its double cover) in conformal:2 measures twice its Euclidean distances, across the seam too (scaling, common practice)', () => {
    const n = 24, P: number[] = [], T: number[] = [];
    for (let i = 0; i < n; i++) {
      const t = (2 * Math.PI * i) / n;
      for (const w of [-0.3, 0.3]) P.push((1 + w * Math.cos(t / 2)) * Math.cos(t), (1 + w * Math.cos(t / 2)) * Math.sin(t), w * Math.sin(t / 2));
    }
    for (let i = 0; i < n; i++) {
      const a = 2 * i, b = a + 1;
      let c = 2 * ((i + 1) % n), d = c + 1;
      if (i === n - 1) [c, d] = [d, c]; // the half twist
      T.push(a, c, d, a, d, b);
    }
    const make = () => openSurface(meshFromTriangles(new Float64Array(P), T, 'moebius'));
    const plain = make(), scaled = make();
    expect(plain.report.orientationSeams.length).toBeGreaterThan(0);
    attachMetric(scaled, parseMetricSpec('conformal:2'));
    const src = { points: [{ kind: 'vertex' as const, vertex: 0 }], curves: [] };
    const a = measureDistances(plain, src).field.distance, b = measureDistances(scaled, src).field.distance;
    for (let v = 0; v < a.length; v++) expect(Math.abs(b[v]! - 2 * a[v]!)).toBeLessThan(1e-12);
  });
});

describe('curves under a user metric', () => {
  it('isolines and offsets report lengths in the metric: in conformal:2 the level-L curve is the plain level-L/2 curve, twice as long (scaling, common practice)', async () => {
    const { surfaceIsolines, surfaceOffset } = await import('../../src/index.js');
    const { distanceScalarField } = await import('../../src/curves/index.js');
    const n = 16, plain = plane(n, 0, 0, 1, 1), scaled = plane(n, 0, 0, 1, 1);
    attachMetric(scaled, parseMetricSpec('conformal:2'));
    const src = { points: [vertexAt(n, 8, 8)], curves: [] };
    const a = surfaceIsolines(plain, distanceScalarField(measureDistances(plain, src)), { levels: [0.3] });
    const b = surfaceIsolines(scaled, distanceScalarField(measureDistances(scaled, src)), { levels: [0.6] });
    expect(a.curves).toHaveLength(1);
    expect(Math.abs(b.curves[0]!.length - 2 * a.curves[0]!.length)).toBeLessThan(1e-9);
    // the offset against the plain offset (not the isoline: offsets may follow the exact field inside faces)
    const o = surfaceOffset(scaled, src, 0.6), op = surfaceOffset(plain, src, 0.3);
    expect(op.curves).toHaveLength(1);
    expect(Math.abs(o.curves[0]!.length - 2 * op.curves[0]!.length)).toBeLessThan(1e-9);
  });
});
