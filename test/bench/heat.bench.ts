/**
 * Heat-method benchmark: preparation (mollify + intrinsic flips, ordering +
 * symbolic analysis, numeric factorizations), nnz(L), single-source solve
 * time and peak memory, with ratios against edge-graph Dijkstra measured in
 * the same run on the same mesh (edgeDijkstra in harness.ts, the one yardstick).
 *
 * Meshes: jittered terrain grids (~10k, ~100k, ~1M vertices) and perturbed
 * icospheres (levels 5, 7, 8: 10242, 163842, 655362 vertices, the levels
 * nearest those sizes). `--quick` runs the 10k and 100k sizes only.
 * Goals at 1M: solve ≤ 1.5× Dijkstra, factorization ≤ 20× Dijkstra, peak RSS < 3 GB.
 *
 * `--factor-threads=N` factors on worker threads as well (NodeFactorExecutor with N
 * threads, linalg/parallel-node.ts, of which cores − 1 join the task run of
 * multifrontal-parallel.ts; default 0: all on this thread, as in earlier runs);
 * `prepare.threadCpuMs` is the CPU time of each busy thread during preparation (Linux);
 * `--ordering-threads=N` orders the nested dissection's parts on N worker threads as well
 * (NodeOrderingExecutor, linalg/ordering-parallel-node.ts; the same ordering; default 0);
 * `HEAT_CASE=terrain-1000` runs the cases whose name contains the text.
 * `prepare` counts the remesh too; `ordering+symbolic` + `factorization` is
 * the "preparation" (its ratio: `orderingPlusFactorRatio`).
 * `ordering+symbolic` includes the assembly of the matrices and face data,
 * which runs on this thread while the ordering worker splits and orders
 * (--ordering-threads ≥ 1), and before the ordering otherwise.
 */
import { emit, timeMedian, timeEdgeDijkstra, peakRssMB, quick } from './harness.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { HeatSolver, type HeatOptions } from '../../src/geodesic/heat.js';
import type { Shape } from '../fixtures/shapes.js';
import { jitteredTerrain, bumpySphere, smoothHeightfield, fractalHeightfield, scanTerrain } from './meshes.js';
import { NodeFactorExecutor } from '../../src/linalg/parallel-node.js';
import { NodeOrderingExecutor } from '../../src/linalg/ordering-parallel-node.js';
import { readdirSync, readFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

/**
 * CPU ms of each thread of this process (Linux /proc/self/task/<tid>/stat, utime + stime in
 * clock ticks of 10 ms; empty elsewhere). Two-thread wall times are meaningless on a loaded
 * machine: the factorization reports CPU per thread too (the critical path is the largest).
 */
function threadCpu(): Map<number, number> {
  const m = new Map<number, number>();
  let tids: string[] = [];
  try {
    tids = readdirSync('/proc/self/task');
  } catch {
    return m;
  }
  for (const t of tids) {
    try {
      const st = readFileSync(`/proc/self/task/${t}/stat`, 'utf8');
      const f = st.slice(st.lastIndexOf(')') + 2).split(' ');
      m.set(Number(t), (Number(f[11]) + Number(f[12])) * 10);
    } catch {
      // the thread ended
    }
  }
  return m;
}

/** Threads that used at least 100 ms between two threadCpu() readings, busiest first ('main' for this thread). */
function busyThreads(a: Map<number, number>, b: Map<number, number>): Record<string, number> {
  const rows = [...b].map(([t, v]) => [t === process.pid ? 'main' : `thread${t}`, v - (a.get(t) ?? 0)] as const).filter(([, v]) => v >= 100);
  return Object.fromEntries(rows.sort((x, y) => y[1] - x[1]));
}

const factorThreads = Number(process.argv.find((a) => a.startsWith('--factor-threads='))?.slice(17) ?? 0);
const orderingThreads = Number(process.argv.find((a) => a.startsWith('--ordering-threads='))?.slice(19) ?? 0);

const BENCH = 'heat';

function meshOf(s: Shape): IntrinsicMesh {
  const { topology } = buildTopology(s.triangles, s.positions.length / 3);
  return intrinsicFromPositions(topology, s.positions);
}

async function runCase(name: string, make: () => Shape, opts: HeatOptions): Promise<void> {
  const mesh = meshOf(make());
  const nv = mesh.topology.nv;
  const extra = { nv, nf: mesh.topology.nf };
  (globalThis as { gc?: () => void }).gc?.();

  const runs = nv > 500_000 ? 3 : 5;
  const centre = (nv / 2) | 0;
  // the one yardstick (harness.ts): typed-array binary-heap Dijkstra over the edge graph
  const dijkstra = await timeEdgeDijkstra(mesh, centre, runs);

  const executor = factorThreads > 0 ? new NodeFactorExecutor({ threads: factorThreads }) : null;
  const orderingExecutor = orderingThreads > 0 ? new NodeOrderingExecutor({ threads: orderingThreads }) : null;
  // the workers start and load their modules before the timed preparation, as the CLI starts them
  // while it reads a large mesh file (cli/jobs.ts warmHeatThreads); from source that loading includes
  // tsx transpiling every module, which would otherwise run during the remesh. EARLY_WORKERS=0 leaves
  // the start to prepare (it starts them itself above the executor's threshold)
  if (process.env.EARLY_WORKERS !== '0') {
    executor?.warm();
    orderingExecutor?.warm();
    await Promise.all([executor?.ready(), orderingExecutor?.ready()]);
  }
  const cpu0 = threadCpu();
  const ru0 = process.resourceUsage();
  const t0 = performance.now();
  const solver = HeatSolver.prepare(mesh, { ...opts, factorExecutor: executor, orderingExecutor });
  const prepareMs = performance.now() - t0;
  const prepareCpu = busyThreads(cpu0, threadCpu());
  const ru1 = process.resourceUsage();
  // page faults and kernel CPU of the whole process during preparation: first touches of fresh
  // memory are a large, machine-dependent part of it (on a virtual machine whose guest memory the
  // host backs lazily, a first touch measured 0.3 to 3 s per GiB)
  const faults = { minorFaults: ru1.minorPageFault - ru0.minorPageFault, systemCpuMs: Math.round((ru1.systemCPUTime - ru0.systemCPUTime) / 1000), userCpuMs: Math.round((ru1.userCPUTime - ru0.userCPUTime) / 1000) };
  const counts = executor ? { ...executor.counts } : null;
  await executor?.close();
  await orderingExecutor?.close();
  const st = solver.stats;
  // typical source (centre: every vertex within ~700 rings, one heat stage), and
  // varied sources (corners and boundary points; may need relay stages on the largest meshes)
  const centreSolve = await timeMedian(() => solver.solve({ points: [{ kind: 'vertex', vertex: centre }], curves: [] }), runs, 1);
  const centreStats = centreSolve.result.stats;
  let k = 0;
  const sources = [0, (nv / 3) | 0, (2 * nv / 3) | 0, nv - 1, (nv / 7) | 0];
  let maxStages = 0;
  const solve = await timeMedian(() => {
    const r = solver.solve({ points: [{ kind: 'vertex', vertex: sources[k++ % sources.length]! }], curves: [] });
    maxStages = Math.max(maxStages, r.stats.relayStages);
    return r.field;
  }, runs, 1);

  // sanity: heat distance should be within a few percent of (and mostly below) the graph distance
  const dh = solver.distance({ points: [{ kind: 'vertex', vertex: centre }], curves: [] }).distance;
  const dg = dijkstra.distance;
  let ratioSum = 0, n = 0;
  for (let v = 0; v < nv; v += 97) if (dg[v]! > 0 && Number.isFinite(dg[v]!)) { ratioSum += dh[v]! / dg[v]!; n++; }

  const rec = (metric: string, value: number, unit: string, more: Record<string, unknown> = {}) =>
    emit({ bench: BENCH, case: name, metric, value, unit, ...extra, ...more });
  rec('dijkstra', dijkstra.ms, 'ms');
  rec('prepare', prepareMs, 'ms', { ratioToDijkstra: prepareMs / dijkstra.ms, threadCpuMs: prepareCpu, ...faults });
  rec('remesh', st.remeshMs, 'ms', { flips: st.flips, mollifyEpsilon: st.mollifyEpsilon });
  rec('ordering+symbolic', st.analysisMs, 'ms', { ordering: st.ordering, orderingThreads });
  rec('factorization', st.factorMs, 'ms', {
    factorizations: st.factorizations, ratioToDijkstra: st.factorMs / dijkstra.ms, factorThreads, threadJobs: counts,
    orderingPlusFactorRatio: (st.analysisMs + st.factorMs) / dijkstra.ms,
  });
  rec('nnzL', st.nnzL, 'entries', { perVertex: st.nnzL / nv });
  rec('factorMemory', (8 * st.factorValues) / 2 ** 20, 'MB', { factorValues: st.factorValues, factorizations: st.factorizations });
  rec('solve', centreSolve.ms, 'ms', {
    ratioToDijkstra: centreSolve.ms / dijkstra.ms, source: 'centre', relayStages: centreStats.relayStages, flatFaces: centreStats.flatFaces,
  });
  rec('solveVaried', solve.ms, 'ms', { ratioToDijkstra: solve.ms / dijkstra.ms, source: 'corners/boundary', maxRelayStages: maxStages });
  rec('heatOverGraph', ratioSum / n, 'ratio');
  rec('peakRss', peakRssMB(), 'MB');
}

const sizes = quick() ? [0, 1] : [0, 1, 2];
const grid = [100, 316, 1000];
const level = [5, 7, 8];
const ordering = process.argv.find((a) => a.startsWith('--ordering='))?.slice(11) as HeatOptions['ordering'];
const opts: HeatOptions = ordering ? { ordering } : {};
const only = process.env.HEAT_CASE;
/**
 * Runs a case here, or, for a large case when several are run, in a fresh process of this
 * benchmark (HEAT_CASE = its name): as the CLI runs, without the heap and memory earlier cases
 * left (measured: the 1M heightfield's preparation 6.8 s in a fresh process, 7.5 s after six
 * other cases), and with its own peak memory.
 */
async function run(name: string, large: boolean, make: () => Shape): Promise<void> {
  if (only && !name.includes(only)) return;
  if (!large || only === name) return runCase(name, make, opts);
  const r = spawnSync(process.execPath, [...process.execArgv, fileURLToPath(import.meta.url), ...process.argv.slice(2)], {
    stdio: 'inherit', env: { ...process.env, HEAT_CASE: name },
  });
  if (r.status !== 0) throw new Error(`heat bench: case ${name} failed with exit ${r.status}`);
}
for (const i of sizes) {
  await run(`terrain-${grid[i]}x${grid[i]}`, grid[i]! >= 1000, () => jitteredTerrain(grid[i]!, 3));
  await run(`sphere-level${level[i]}`, level[i]! >= 8, () => bumpySphere(level[i]!, 5));
}
// the generators of meshes users bring (meshes.ts) at 2M faces (1M vertices; 200k faces with --quick):
// the issue's own smooth heightfield with alternating diagonals, multi-scale noise, a scan-like Delaunay terrain
const users: [string, (faces: number, seed: number) => Shape][] = [['smooth', smoothHeightfield], ['fractal', fractalHeightfield], ['scan', scanTerrain]];
const faces = quick() ? 200_000 : 2_000_000;
for (const [kind, make] of users) await run(`${kind}-${faces / 1000}k-faces`, faces >= 1_000_000, () => make(faces, 11));
