/**
 * Exact-geodesic benchmark: single source to all vertices on ~10k, ~100k and
 * ~1M faces (jittered terrain grid; perturbed icosphere), with time, windows
 * created, peak RSS and the ratio to edge-graph Dijkstra measured in the
 * same run on the same mesh (edgeDijkstra in harness.ts, the one yardstick); a two-point query between nearby points
 * (targets option): time and fraction of faces touched, also on a mesh
 * whose solver geometry was prepared once (geometry.ts); and the event queue
 * (typed-array heap) against heap-js on the same push/pop sequence.
 *
 * Also the kinds of mesh users bring (meshes.ts: smooth and fractal
 * heightfields, a scan-like Delaunay terrain, a CAD part with thin triangles
 * and fans) at ~200k faces (~20k with `--quick`): windows per face and ns per
 * window on each, and whether the whole field fits the memory budget
 * (status "limit" otherwise). `EXACT_CASE=scan-200k` runs one case.
 *
 * `--quick` runs the ~10k and ~100k sizes only. Goals at 1M faces: ≤ 8×
 * Dijkstra, two-point query touching a small fraction of faces, peak RSS
 * ≤ 2 GB. Also the windows the final field uses (`windows_used`, see
 * src/geodesic/exact/usage.ts) and the time per used window the 8× goal
 * leaves (`goal_ns_per_used_window`), to set beside `ns_per_window`.
 * A run that trips the window cap is reported as status "limit"
 * with the time it took to get there.
 */
import { Heap } from 'heap-js';
import { emit, timeMedian, timeEdgeDijkstra, peakRssMB, quick } from './harness.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, meanEdgeLength, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { exactDistance, type ExactResult } from '../../src/geodesic/exact/index.js';
import { prepareExactGeometry } from '../../src/geodesic/exact/geometry.js';
import { EventQueue } from '../../src/geodesic/exact/queue.js';
import { pointSources } from '../../src/geodesic/shared/sources.js';
import { isOrthodromeError } from '../../src/errors.js';
import { rng, type Shape } from '../fixtures/shapes.js';
import { jitteredTerrain, bumpySphere, USER_MESHES } from './meshes.js';

const BENCH = 'exact';

function meshOf(s: Shape): IntrinsicMesh {
  return intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);
}

/** The vertex nearest the centre of the bounding box, and one about `hops` mean edges away. */
function pickPair(s: Shape, m: IntrinsicMesh, hops: number): [number, number] {
  const P = s.positions, nv = P.length / 3;
  const c = [0, 1, 2].map((d) => { let lo = Infinity, hi = -Infinity; for (let v = 0; v < nv; v++) { lo = Math.min(lo, P[3 * v + d]!); hi = Math.max(hi, P[3 * v + d]!); } return (lo + hi) / 2; });
  let a = 0, best = Infinity;
  for (let v = 0; v < nv; v++) { const d = Math.hypot(P[3 * v]! - c[0]!, P[3 * v + 1]! - c[1]!, P[3 * v + 2]! - c[2]!) ; if (d < best) { best = d; a = v; } }
  const want = hops * meanEdgeLength(m);
  let b = a; best = Infinity;
  for (let v = 0; v < nv; v++) { const d = Math.abs(Math.hypot(P[3 * v]! - P[3 * a]!, P[3 * v + 1]! - P[3 * a + 1]!, P[3 * v + 2]! - P[3 * a + 2]!) - want); if (d < best) { best = d; b = v; } }
  return [a, b];
}

async function runCase(name: string, s: Shape, big: boolean): Promise<void> {
  const m = meshOf(s);
  const nf = m.topology.nf;
  const extra = { faces: nf, vertices: m.topology.nv };
  const [a, b] = pickPair(s, m, 8);
  const src = pointSources([{ kind: 'vertex', vertex: a }]);
  const runs = big ? 1 : 3;
  const g = await timeEdgeDijkstra(m, a, big ? 3 : 5); // the one yardstick (harness.ts)
  emit({ bench: BENCH, case: name, metric: 'graph_ms', value: g.ms, unit: 'ms', ...extra });
  let ex: { ms: number; result: ExactResult } | undefined;
  const t0 = performance.now();
  try {
    ex = await timeMedian(() => exactDistance(m, src), runs, big ? 0 : 1);
  } catch (e) {
    if (!isOrthodromeError(e) || e.code !== 'LIMIT') throw e;
    emit({ bench: BENCH, case: name, metric: 'exact_ms', value: performance.now() - t0, unit: 'ms', status: 'limit', message: e.message, ...extra });
  }
  if (ex) {
    emit({ bench: BENCH, case: name, metric: 'exact_ms', value: ex.ms, unit: 'ms', status: 'ok', ...extra });
    emit({ bench: BENCH, case: name, metric: 'exact_over_graph', value: ex.ms / g.ms, unit: 'ratio', goal: 8, ...extra });
    emit({ bench: BENCH, case: name, metric: 'windows', value: ex.result.windows, unit: 'count', perFace: ex.result.windows / nf, ...extra });
    // the run costs windows × time per window: this separates the two
    emit({ bench: BENCH, case: name, metric: 'ns_per_window', value: (1e6 * ex.ms) / ex.result.windows, unit: 'ns', ...extra });
    // windows the final field uses (sampled, a lower bound; usage.ts): no pruning can skip these, so
    // the goal leaves at most 8 × graph time per used window, set beside the time spent per window now
    const u = ex.result.windowUsage(5);
    emit({ bench: BENCH, case: name, metric: 'windows_used', value: u.used, unit: 'count', fractionOfCreated: u.used / u.created, perFace: u.used / nf, ...extra });
    emit({ bench: BENCH, case: name, metric: 'goal_ns_per_used_window', value: (8e6 * g.ms) / u.used, unit: 'ns', ...extra });
  }
  emit({ bench: BENCH, case: name, metric: 'peak_rss', value: peakRssMB(), unit: 'MB', goal: 2048, ...extra });
  const q = await timeMedian(() => exactDistance(m, src, { targets: [{ kind: 'vertex', vertex: b }] }), big ? 3 : 5, 1);
  emit({ bench: BENCH, case: name, metric: 'two_point_ms', value: q.ms, unit: 'ms', distance: q.result.distanceAt({ kind: 'vertex', vertex: b }), ...extra });
  emit({ bench: BENCH, case: name, metric: 'two_point_faces_touched', value: q.result.facesTouched / nf, unit: 'fraction', ...extra });
  emit({ bench: BENCH, case: name, metric: 'two_point_over_graph', value: q.ms / g.ms, unit: 'ratio', ...extra });
  // the same query on a prepared mesh (geometry.ts made once: what `path --via` legs and a prepared solver reuse)
  const p0 = performance.now();
  const geometry = prepareExactGeometry(m);
  emit({ bench: BENCH, case: name, metric: 'prepare_geometry_ms', value: performance.now() - p0, unit: 'ms', ...extra });
  const qp = await timeMedian(() => exactDistance(m, src, { targets: [{ kind: 'vertex', vertex: b }], geometry }), big ? 5 : 9, 1);
  emit({ bench: BENCH, case: name, metric: 'two_point_prepared_ms', value: qp.ms, unit: 'ms', ...extra });
  emit({ bench: BENCH, case: name, metric: 'two_point_prepared_over_graph', value: qp.ms / g.ms, unit: 'ratio', ...extra });
}

/** The event queue: the typed heap against heap-js on the same 2M pushes and pops (distance-like keys). */
async function queueCase(): Promise<void> {
  const n = 2_000_000, r = rng(3);
  const keys = new Float64Array(n).map((_, i) => i * 1e-3 + r());
  const typed = await timeMedian(() => {
    const q = new EventQueue(1024);
    let sum = 0;
    for (let i = 0; i < n; i++) { q.push(keys[i]!, i); if (i % 3 === 2) sum += q.pop(); }
    while (q.size) sum += q.pop();
    return sum;
  }, 3, 1);
  const hj = await timeMedian(() => {
    const q = new Heap<[number, number]>((x, y) => x[0] - y[0]);
    let sum = 0;
    for (let i = 0; i < n; i++) { q.push([keys[i]!, i]); if (i % 3 === 2) sum += q.pop()![1]; }
    while (q.size()) sum += q.pop()![1];
    return sum;
  }, 3, 1);
  emit({ bench: BENCH, case: 'queue-2M', metric: 'typed_heap_ms', value: typed.ms, unit: 'ms' });
  emit({ bench: BENCH, case: 'queue-2M', metric: 'heapjs_ms', value: hj.ms, unit: 'ms' });
  emit({ bench: BENCH, case: 'queue-2M', metric: 'heapjs_over_typed', value: hj.ms / typed.ms, unit: 'ratio' });
}

const only = process.env.EXACT_CASE;
const cases: [string, () => Shape, boolean][] = [
  ['terrain-10k', () => jitteredTerrain(71, 1), false],
  ['sphere-20k', () => bumpySphere(5, 2), false],
  ['terrain-100k', () => jitteredTerrain(224, 1), true],
  ['sphere-82k', () => bumpySphere(6, 2), true],
];
// the kinds of mesh users bring (meshes.ts): ~20k faces in --quick, ~200k in a full run
for (const [kind, make] of Object.entries(USER_MESHES)) {
  cases.push(quick() ? [`${kind}-20k`, () => make(20_000, 1), false] : [`${kind}-200k`, () => make(200_000, 1), true]);
}
if (!quick()) cases.push(['terrain-1M', () => jitteredTerrain(708, 1), true], ['sphere-1.3M', () => bumpySphere(8, 2), true]);
if (!only || only === 'queue') await queueCase();
for (const [name, make, big] of cases) if (!only || name === only) await runCase(name, make(), big);
