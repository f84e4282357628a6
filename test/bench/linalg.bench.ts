/**
 * Sparse Cholesky benchmark: heat-method-style systems M + h²·L (cotangent
 * Laplacian L, barycentric mass M, h = mean edge length) on a flat grid, a
 * terrain and a sphere at ~10k, 100k and 1M unknowns (`--quick`: the first
 * two). Per ordering: ordering time, symbolic time, nnz(L), factor time
 * (refactorization with the same analysis), solve time (forward + back),
 * effective bandwidth 2 × bytes(L) / solve time, peak RSS. Baseline in the same
 * run: the typed-array binary-heap Dijkstra of harness.ts (the one yardstick)
 * over the same edge graph, so `factor/dijkstra` and `solve/dijkstra` ratios are emitted.
 * For nested dissection also: the factor without the SIMD kernel and (up to
 * 200k) the simplicial up-looking method, as before/after figures.
 * `BENCH_CASE=grid` runs the cases whose name contains the text.
 */
import { emit, peakRssMB, quick, timeMedian, edgeDijkstra } from './harness.js';
import { flatGrid, icosphere, terrain, rng } from '../fixtures/shapes.js';
import type { Shape } from '../fixtures/shapes.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, meanEdgeLength } from '../../src/metric/intrinsic.js';
import { edgeCotanWeights } from '../../src/metric/triangle.js';
import { barycentricVertexAreas } from '../../src/metric/vertex-areas.js';
import { TripletMatrix } from '../../src/linalg/triplet.js';
import type { CscMatrix } from '../../src/linalg/csc.js';
import { analyzeCholesky, CholeskyFactor } from '../../src/linalg/index.js';
import type { Ordering } from '../../src/linalg/index.js';

const BENCH = 'linalg';

/** Lower triangle of M + h²·L for a triangle mesh, plus its edge list with lengths. */
function heatSystem(s: Shape): { A: CscMatrix; ea: Int32Array; eb: Int32Array; elen: Float64Array } {
  const nv = s.positions.length / 3;
  const { topology: t } = buildTopology(s.triangles, nv);
  const m = intrinsicFromPositions(t, s.positions);
  const w = edgeCotanWeights(m);
  const area = barycentricVertexAreas(m);
  const h = meanEdgeLength(m);
  const tt = h * h;
  const T = new TripletMatrix(t.nv, 3 * t.ne + t.nv);
  const ea = new Int32Array(t.ne), eb = new Int32Array(t.ne);
  for (let e = 0; e < t.ne; e++) {
    const he = t.edgeHalfedge[e]!;
    const a = t.tri[he]!, b = t.tri[he % 3 === 2 ? he - 2 : he + 1]!;
    ea[e] = a;
    eb[e] = b;
    T.add(Math.max(a, b), Math.min(a, b), -tt * w[e]!);
    T.add(a, a, tt * w[e]!);
    T.add(b, b, tt * w[e]!);
  }
  for (let v = 0; v < t.nv; v++) T.add(v, v, area[v]!);
  return { A: T.toCsc(), ea, eb, elen: m.edgeLength };
}

interface Case {
  name: string;
  make: () => Shape;
  orderings: Ordering[];
}

function cases(): Case[] {
  const hills = (x: number, y: number) => 0.08 * Math.sin(7 * x) * Math.cos(5 * y) + 0.03 * Math.sin(23 * x + 11 * y);
  const out: Case[] = [];
  const sizes = quick() ? [100, 316] : [100, 316, 1000];
  for (const k of sizes) {
    const ords: Ordering[] = k <= 100 ? ['natural', 'nd', 'amd'] : ['nd', 'amd'];
    out.push({ name: `grid-${k * k}`, make: () => flatGrid(k - 1, k - 1, 1, 1, 0.2, 3), orderings: ords });
    out.push({ name: `terrain-${k * k}`, make: () => terrain(k - 1, k - 1, 1, 1, hills), orderings: ords });
  }
  const levels = quick() ? [5, 7] : [5, 7, 8];
  for (const l of levels) {
    out.push({ name: `sphere-${10 * 4 ** l + 2}`, make: () => icosphere(l), orderings: l <= 5 ? ['natural', 'nd', 'amd'] : ['nd', 'amd'] });
  }
  return out;
}

async function main(): Promise<void> {
  const only = process.env.BENCH_CASE;
  for (const c of cases()) {
    if (only && !c.name.includes(only)) continue;
    const { A, ea, eb, elen } = heatSystem(c.make());
    const n = A.n;
    const dj = await timeMedian(() => edgeDijkstra(n, ea, eb, elen, 0), n > 500_000 ? 3 : 5);
    emit({ bench: BENCH, case: c.name, metric: 'dijkstra', value: dj.ms, unit: 'ms', n });
    const r = rng(5);
    const b = Float64Array.from({ length: n }, () => r() - 0.5);
    const x = new Float64Array(n);
    for (const ordering of c.orderings) {
      const sym = analyzeCholesky(A, { ordering });
      const f = CholeskyFactor.factor(A, sym);
      const big = n > 500_000;
      const fac = await timeMedian(() => f.refactor(A), 3, 0);
      const sol = await timeMedian(() => f.solve(b, x), big ? 3 : 7, 1);
      // bytes of L a solve pass reads: supernodal blocks (values incl. explicit zeros) + one row index per block row
      const sn = sym.supernodal;
      const bytesL = sn ? 8 * sn.valPtr[sn.nsuper]! + 4 * sn.rows.length : sym.nnzL * 12 + 4 * (n + 1);
      const extra = { ordering, n };
      emit({ bench: BENCH, case: c.name, metric: 'ordering', value: sym.timing.orderingMs, unit: 'ms', ...extra });
      emit({ bench: BENCH, case: c.name, metric: 'symbolic', value: sym.timing.symbolicMs, unit: 'ms', ...extra });
      emit({ bench: BENCH, case: c.name, metric: 'nnzL', value: sym.nnzL, unit: 'entries', ...extra });
      emit({ bench: BENCH, case: c.name, metric: 'factor', value: fac.ms, unit: 'ms', ...extra });
      emit({ bench: BENCH, case: c.name, metric: 'solve', value: sol.ms, unit: 'ms', ...extra });
      emit({ bench: BENCH, case: c.name, metric: 'solve-bandwidth', value: (2 * bytesL) / (sol.ms * 1e6), unit: 'GB/s', ...extra });
      emit({ bench: BENCH, case: c.name, metric: 'factor/dijkstra', value: fac.ms / dj.ms, unit: 'ratio', ...extra });
      emit({ bench: BENCH, case: c.name, metric: 'solve/dijkstra', value: sol.ms / dj.ms, unit: 'ratio', ...extra });
      emit({ bench: BENCH, case: c.name, metric: 'peak-rss', value: peakRssMB(), unit: 'MB', ...extra });
      if (ordering !== 'nd') continue;
      // before/after: the same analysis without the SIMD kernel, and the simplicial method
      const plain = CholeskyFactor.factor(A, sym, { simd: false });
      const facPlain = await timeMedian(() => plain.refactor(A), big ? 1 : 3, 0);
      emit({ bench: BENCH, case: c.name, metric: 'factor-no-simd', value: facPlain.ms, unit: 'ms', ...extra });
      emit({ bench: BENCH, case: c.name, metric: 'simd-speedup', value: facPlain.ms / fac.ms, unit: 'ratio', ...extra });
      if (n <= 200_000) {
        const symS = analyzeCholesky(A, { ordering, method: 'simplicial' });
        const fs = CholeskyFactor.factor(A, symS);
        const facS = await timeMedian(() => fs.refactor(A), 3, 0);
        const solS = await timeMedian(() => fs.solve(b, x), 7, 1);
        emit({ bench: BENCH, case: c.name, metric: 'factor-simplicial', value: facS.ms, unit: 'ms', ...extra });
        emit({ bench: BENCH, case: c.name, metric: 'solve-simplicial', value: solS.ms, unit: 'ms', ...extra });
        emit({ bench: BENCH, case: c.name, metric: 'supernodal-speedup', value: facS.ms / fac.ms, unit: 'ratio', ...extra });
      }
    }
  }
}

await main();
