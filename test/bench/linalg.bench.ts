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
 * Per ordering also the work of the factorization: `flops` = Σ c_j² over the
 * column counts c_j of L (the usual count of a column Cholesky, George & Liu,
 * "Computer Solution of Large Sparse Positive Definite Systems", 1981, §2.2)
 * and `denseFlops` = the same over the supernodal blocks with their explicit
 * zeros (what the multifrontal kernels do).
 * `heat-terrain-N` cases: the heat method's own matrix on the benchmark's
 * jittered terrain after its intrinsic Delaunay flips (heat-setup.ts), N×N cells;
 * the Dijkstra baseline runs on that flipped edge graph.
 * `--ordering-threads=N` (N ≥ 1) also times nested dissection with N worker
 * threads (NodeOrderingExecutor; `ordering-threads`, and `sameOrder` = 1 when
 * the permutation equals the serial one) and records the CPU time of the
 * ordering on this thread alone (`ordering-cpu`).
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
import type { CholeskySymbolic, Ordering } from '../../src/linalg/index.js';
import { NodeOrderingExecutor } from '../../src/linalg/ordering-parallel-node.js';
import type { IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { heatTriangulation } from '../../src/geodesic/heat-setup.js';
import { jitteredTerrain } from './meshes.js';

const BENCH = 'linalg';

const orderingThreads = Number(process.argv.find((a) => a.startsWith('--ordering-threads='))?.slice(19) ?? 0);

/** Lower triangle of M + h²·L for a triangle mesh, plus its edge list with lengths. */
function heatSystem(s: Shape): { A: CscMatrix; ea: Int32Array; eb: Int32Array; elen: Float64Array } {
  const nv = s.positions.length / 3;
  const { topology: t } = buildTopology(s.triangles, nv);
  return heatSystemOf(intrinsicFromPositions(t, s.positions));
}

/** {@link heatSystem} of an intrinsic mesh. */
function heatSystemOf(m: IntrinsicMesh): { A: CscMatrix; ea: Int32Array; eb: Int32Array; elen: Float64Array } {
  const t = m.topology;
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
  make: () => Shape | IntrinsicMesh;
  orderings: Ordering[];
}

/** Column-count flops Σ c_j² and supernodal dense flops (module comment). */
function flopCounts(sym: CholeskySymbolic): { flops: number; denseFlops: number } {
  let flops = 0;
  for (let j = 0; j < sym.n; j++) flops += sym.colCount[j]! * sym.colCount[j]!;
  const sn = sym.supernodal;
  let denseFlops = 0;
  if (sn) {
    for (let s = 0; s < sn.nsuper; s++) {
      const nc = sn.superStart[s + 1]! - sn.superStart[s]!, nr = sn.rowPtr[s + 1]! - sn.rowPtr[s]!;
      for (let k = 0; k < nc; k++) denseFlops += (nr - k) * (nr - k);
    }
  }
  return { flops, denseFlops };
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
  for (const k of quick() ? [100, 316] : [100, 316, 1000]) {
    out.push({ name: `heat-terrain-${k}`, make: () => heatTriangulation(meshOf(jitteredTerrain(k, 3)), {}).work, orderings: k <= 100 ? ['nd', 'amd'] : ['nd'] });
  }
  const levels = quick() ? [5, 7] : [5, 7, 8];
  for (const l of levels) {
    out.push({ name: `sphere-${10 * 4 ** l + 2}`, make: () => icosphere(l), orderings: l <= 5 ? ['natural', 'nd', 'amd'] : ['nd', 'amd'] });
  }
  return out;
}

function meshOf(s: Shape): IntrinsicMesh {
  const { topology } = buildTopology(s.triangles, s.positions.length / 3);
  return intrinsicFromPositions(topology, s.positions);
}

async function main(): Promise<void> {
  const only = process.env.BENCH_CASE;
  const executor = orderingThreads > 0 ? new NodeOrderingExecutor({ threads: orderingThreads }) : null;
  executor?.warm();
  await executor?.ready();
  for (const c of cases()) {
    if (only && !c.name.includes(only)) continue;
    const made = c.make();
    const { A, ea, eb, elen } = 'topology' in made ? heatSystemOf(made) : heatSystem(made);
    const n = A.n;
    const dj = await timeMedian(() => edgeDijkstra(n, ea, eb, elen, 0), n > 500_000 ? 3 : 5);
    emit({ bench: BENCH, case: c.name, metric: 'dijkstra', value: dj.ms, unit: 'ms', n });
    const r = rng(5);
    const b = Float64Array.from({ length: n }, () => r() - 0.5);
    const x = new Float64Array(n);
    for (const ordering of c.orderings) {
      const cpu0 = process.cpuUsage();
      const sym = analyzeCholesky(A, { ordering });
      const cpu1 = process.cpuUsage(cpu0);
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
      emit({ bench: BENCH, case: c.name, metric: 'ordering+symbolic-cpu', value: (cpu1.user + cpu1.system) / 1000, unit: 'ms', ...extra });
      emit({ bench: BENCH, case: c.name, metric: 'nnzL', value: sym.nnzL, unit: 'entries', ...extra });
      const fl = flopCounts(sym);
      emit({ bench: BENCH, case: c.name, metric: 'flops', value: fl.flops / 1e9, unit: 'G', ...extra });
      emit({ bench: BENCH, case: c.name, metric: 'denseFlops', value: fl.denseFlops / 1e9, unit: 'G', ...extra });
      if (executor && ordering === 'nd') {
        const symT = analyzeCholesky(A, { ordering, orderingExecutor: executor });
        let same = symT.perm.length === sym.perm.length ? 1 : 0;
        for (let k = 0; k < n && same; k++) if (symT.perm[k] !== sym.perm[k]) same = 0;
        emit({ bench: BENCH, case: c.name, metric: 'ordering-threads', value: symT.timing.orderingMs, unit: 'ms', ...extra, threads: orderingThreads, sameOrder: same });
        emit({ bench: BENCH, case: c.name, metric: 'symbolic-threads', value: symT.timing.symbolicMs, unit: 'ms', ...extra, threads: orderingThreads });
      }
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
