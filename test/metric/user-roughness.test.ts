/**
 * The heat method against the exact method under a walking-time metric
 * (a per-vertex cost, `field:cost`, ds = cost · |dx|), and the cautions a
 * metric too rough for its mesh calls for (src/metric/user/roughness.ts).
 *
 * Sources of the tolerances: the README's heat-accuracy table (mean relative
 * error against the exact method over vertices at least 2h from the source:
 * 0.4–2.0% on smooth meshes, smooth terrain the largest at 2.02%), and
 * convergence under refinement (the heat method converges as h → 0 on a
 * smooth metric: Crane, Weischedel & Wardetzky, "Geodesics in heat", ACM TOG
 * 32(5), 2013, §3.2 — from memory). The exact method gives the polyhedral
 * distance of the edge lengths; on finer meshes of one continuous metric it
 * converges to that metric's distance (common practice).
 */
import { describe, expect, it } from 'vitest';
import { openSurface, measureDistances, type Surface } from '../../src/index.js';
import { attachMetric, parseMetricSpec, metricCautions, type MetricReport } from '../../src/api/metric.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { flatGrid, gridTriangles, rng } from '../fixtures/shapes.js';

/** The unit square as an n × n grid (alternating diagonals) carrying a per-vertex `cost` from `cost(x, y)`. */
function costGrid(n: number, cost: (x: number, y: number) => number): { s: Surface; rep: MetricReport } {
  const g = flatGrid(n, n, 1, 1);
  const data = meshFromTriangles(g.positions, g.triangles, 'grid');
  const values = new Float64Array((n + 1) ** 2);
  for (let v = 0; v < values.length; v++) values[v] = cost(g.positions[3 * v]!, g.positions[3 * v + 1]!);
  data.vertexProps = [{ name: 'cost', values, type: 'float64' }];
  const s = openSurface(data);
  return { s, rep: attachMetric(s, parseMetricSpec('field:cost'), { repair: 'mollify' }) }; // the mollification's effect is what these tests measure (auto refuses the rough cost)
}

const corner = { points: [{ kind: 'vertex' as const, vertex: 0 }], curves: [] };

/** Mean relative difference of heat from exact over the vertices at least 2h from the source (the README table's rule). */
function heatError(s: Surface, rep: MetricReport): number {
  const ex = measureDistances(s, corner, { method: 'exact' }).field.distance;
  const he = measureDistances(s, corner, { method: 'heat' }).field.distance;
  let sum = 0, cnt = 0;
  for (let v = 0; v < ex.length; v++) {
    expect(Number.isFinite(he[v]!)).toBe(true);
    if (!(ex[v]! >= 2 * rep.meanEdgeLength)) continue;
    sum += Math.abs(he[v]! - ex[v]!) / ex[v]!;
    cnt++;
  }
  return sum / cnt;
}

describe('a walking-time cost the mesh resolves: heat agrees with exact within its usual error', () => {
  // open ground (cost 1) with a bog (cost up to 8) whose edge is spread over several cells at these resolutions
  const bog = (x: number, y: number) => 1 + 7 * Math.exp(-((x - 0.55) ** 2 + (y - 0.45) ** 2) / 0.01);
  it('needs no repair; the heat error falls under refinement (16 → 32 → 64 cells) to within the README table (≤ 2.02% mean)', () => {
    const errs = [16, 32, 64].map((n) => {
      const { s, rep } = costGrid(n, bog);
      expect(rep.triangleInequalityViolations).toBe(0);
      return heatError(s, rep);
    });
    expect(errs[1]!).toBeLessThan(errs[0]!);
    expect(errs[2]!).toBeLessThan(errs[1]!);
    expect(errs[2]!).toBeLessThan(0.0202); // README heat-accuracy table: smooth terrain, 2.02% mean (the largest smooth kind)
  });
});

describe('a walking-time cost that jumps between neighbouring vertices (1 or 8 at random)', () => {
  // the cost as a continuous function: linear over the triangles of a 30 × 30 grid, 1 or 8 at its vertices
  const n = 30, r = rng(7);
  const vertexCost = Float64Array.from({ length: (n + 1) ** 2 }, () => (r() < 0.3 ? 8 : 1));
  const tri = gridTriangles(n, n);
  const cost = (x: number, y: number): number => {
    const i = Math.min(n - 1, Math.floor(x * n + 1e-9)), j = Math.min(n - 1, Math.floor(y * n + 1e-9));
    const at = (v: number) => [(v % (n + 1)) / n, Math.floor(v / (n + 1)) / n];
    for (const f of [2 * (j * n + i), 2 * (j * n + i) + 1]) {
      const [A, B, C] = [tri[3 * f]!, tri[3 * f + 1]!, tri[3 * f + 2]!];
      const [a, b, c] = [at(A), at(B), at(C)];
      const det = (b[0]! - a[0]!) * (c[1]! - a[1]!) - (c[0]! - a[0]!) * (b[1]! - a[1]!);
      const l1 = ((x - a[0]!) * (c[1]! - a[1]!) - (c[0]! - a[0]!) * (y - a[1]!)) / det;
      const l2 = ((b[0]! - a[0]!) * (y - a[1]!) - (x - a[0]!) * (b[1]! - a[1]!)) / det;
      if (Math.min(1 - l1 - l2, l1, l2) >= -1e-9) return (1 - l1 - l2) * vertexCost[A]! + l1 * vertexCost[B]! + l2 * vertexCost[C]!;
    }
    throw new Error(`(${x}, ${y}) outside the grid`);
  };
  it('on its own mesh: counted, repaired, and every caution given (the repair changes the metric; heat is far off)', () => {
    const { s, rep } = costGrid(n, cost);
    expect(rep.triangleInequalityViolations).toBeGreaterThan(300); // 654 of 1800 faces (measured)
    expect(rep.largestRelativeChange).toBeGreaterThan(1); // ε = 0.077, 2.3× the shortest edge (measured)
    expect(rep.roughEdgeShare!).toBeGreaterThan(0.2); // 39% of the edges see the cost change by more than 1.5× (measured)
    expect(metricCautions(rep).map((c) => c.kind)).toEqual(['repair']);
    expect(metricCautions(rep, 'exact').map((c) => c.kind)).toEqual(['repair']);
    expect(metricCautions(rep, 'heat').map((c) => c.kind)).toEqual(['repair', 'rough']);
    expect(heatError(s, rep)).toBeGreaterThan(0.05); // 14.5% mean (measured): why the rough caution is given
  });
  it('the repaired distances are far from the metric: on 2× and 4× finer meshes of the same cost the exact method converges, away from them', () => {
    const far = (k: number) => {
      const { s, rep } = costGrid(k * n, cost);
      const d = measureDistances(s, corner, { method: 'exact' }).field.distance;
      const N = k * n, out: number[] = [];
      for (let j = 10; j <= n; j += 10) for (let i = 10; i <= n; i += 10) out.push(d[k * j * (N + 1) + k * i]!);
      return { rep, out };
    };
    const [d1, d2, d4] = [far(1), far(2), far(4)];
    expect(d4.rep.triangleInequalityViolations).toBe(0); // the finer mesh resolves the cost: no repair needed
    const rel = (a: number[], b: number[]) => Math.max(...a.map((x, q) => Math.abs(x - b[q]!) / b[q]!));
    expect(rel(d2.out, d4.out)).toBeLessThan(0.3); // 15% at the worst of 9 sample vertices (measured)
    expect(rel(d1.out, d4.out)).toBeGreaterThan(1); // the repaired 30 × 30 distances are 2–3× too long (measured: up to 171%)
  });
});

describe('which metrics get a heat caution', () => {
  const plain = () => {
    const g = flatGrid(6, 6, 1, 1);
    for (let i = 1; i < g.positions.length; i += 3) g.positions[i] += 0.5;
    return openSurface(meshFromTriangles(g.positions, g.triangles, 'grid'));
  };
  it('none for a constant tensor (a linear image of the mesh: the heat method keeps its accuracy, common practice); the general one for a smooth varying metric', () => {
    const t = attachMetric(plain(), parseMetricSpec('tensor:2,0.7,0,1,0,4'));
    expect(metricCautions(t, 'heat')).toEqual([]);
    const c = attachMetric(plain(), parseMetricSpec('conformal:1/y'));
    expect(c.largestSpeedRatio!).toBeLessThan(1.5);
    expect(metricCautions(c, 'heat').map((k) => k.kind)).toEqual(['heat']);
    expect(metricCautions(c, 'exact')).toEqual([]);
  });
});
