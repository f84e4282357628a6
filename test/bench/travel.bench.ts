/**
 * Walking-time benchmark (issue 13): the travel-time field of a noisy
 * terrain (fractalHeightfield in meshes.ts, 1 km², ±60 m) from its centre on
 * the Steiner graph with k = 3 points per edge (src/travel), against the one
 * yardstick, the typed-array binary-heap edge-graph Dijkstra of harness.ts,
 * measured in the same run on the same mesh.
 *
 * - `travel_field_ms`: graph build (node coordinates, multipliers) + the
 *   search over every node, Tobler's function; `ratio_vs_dijkstra` is the
 *   goal's figure (≤ 25× at 1M faces), `peak_rss_mb` the process's peak
 *   (goal ≤ 2 GB).
 * - `travel_route_ms`: corner to corner (the search stops at the target).
 * - `route_seconds_k*`: the corner-to-corner route time as k grows (1, 3, 7,
 *   15, uniform: each halves the gap, so the times can only fall), on the
 *   smallest size: the convergence curve.
 *
 * - `cpu_ratio_vs_dijkstra`: the same ratio in CPU time of this process
 *   (user + system, medians of 3), steadier than wall time on a shared machine.
 *
 * Sizes: ~100k faces (`--quick`) and ~1M faces; `TRAVEL_CASE=1m` runs one.
 *
 * Measured at 1M faces on the shared 2-core machine (load 5–11): field CPU
 * 4.7 s, 20.9× the edge-graph Dijkstra (was 6.3 s, 27–32×, before the search
 * walked arcs in place over per-edge records with a 4-ary queue), peak RSS
 * 535 MB. CPU ratios drift with the machine's load: the small Dijkstra keeps
 * its data in cache, the search does not, so compare runs made together.
 */
import { emit, median, timeMedian, timeEdgeDijkstra, edgeDijkstra, meshEdgeList, peakRssMB, quick } from './harness.js';
import { openSurface } from '../../src/api/surface.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { travelField, travelRoute } from '../../src/travel/index.js';
import { USER_MESHES } from './meshes.js';

const BENCH = 'travel';

async function runCase(name: string, faces: number, convergence: boolean): Promise<void> {
  const shape = USER_MESHES.fractal(faces, 7);
  const s = openSurface(meshFromTriangles(shape.positions, shape.triangles, name), name);
  const m = intrinsicFromPositions(s.topology, s.positions);
  const t = s.topology;
  const n = Math.round(Math.sqrt(t.nv)) - 1; // grid side in cells
  const centre = (n >> 1) * (n + 1) + (n >> 1);
  const extra = { faces: t.nf, vertices: t.nv, k: 3 };
  const runs = 3;
  const dij = await timeEdgeDijkstra(m, centre, runs);
  emit({ bench: BENCH, case: name, metric: 'dijkstra_ms', value: dij.ms, unit: 'ms', ...extra });
  const src = [{ kind: 'vertex' as const, vertex: centre }];
  const cpu = (fn: () => unknown) => { const c0 = process.cpuUsage(); fn(); const d = process.cpuUsage(c0); return (d.user + d.system) / 1000; };
  const el = meshEdgeList(m);
  const cpuDij = median([0, 1, 2].map(() => cpu(() => edgeDijkstra(el.n, el.ea, el.eb, el.elen, centre))));
  const cpuField = median([0, 1, 2].map(() => cpu(() => travelField(s, src, { k: 3 }))));
  emit({ bench: BENCH, case: name, metric: 'travel_field_cpu_ms', value: cpuField, unit: 'ms', dijkstra_cpu_ms: cpuDij, cpu_ratio_vs_dijkstra: cpuField / cpuDij, ...extra });
  const f = await timeMedian(() => travelField(s, src, { k: 3 }), runs, 1);
  emit({
    bench: BENCH, case: name, metric: 'travel_field_ms', value: f.ms, unit: 'ms', ratio_vs_dijkstra: f.ms / dij.ms,
    graph_ms: f.result.timings.graph, search_ms: f.result.timings.search, nodes: f.result.approximation.nodes,
    relaxed: f.result.work.relaxed, ns_per_arc: (1e6 * f.result.timings.search) / f.result.work.relaxed, ...extra,
  });
  emit({ bench: BENCH, case: name, metric: 'peak_rss_mb', value: peakRssMB(), unit: 'MB', ...extra });
  const stops = [{ kind: 'vertex' as const, vertex: 0 }, { kind: 'vertex' as const, vertex: t.nv - 1 }];
  const r = await timeMedian(() => travelRoute(s, stops, { k: 3 }), runs, 1);
  emit({ bench: BENCH, case: name, metric: 'travel_route_ms', value: r.ms, unit: 'ms', ratio_vs_dijkstra: r.ms / dij.ms, route_seconds: r.result.seconds, route_meters: r.result.meters, ...extra });
  if (convergence) {
    let prev = Infinity;
    for (const k of [1, 3, 7, 15]) {
      const q = travelRoute(s, stops, { k });
      emit({ bench: BENCH, case: name, metric: `route_seconds_k${k}`, value: q.seconds, unit: 's', k, change_vs_previous: prev === Infinity ? null : q.seconds / prev - 1, faces: t.nf });
      prev = q.seconds;
    }
  }
}

const only = process.env.TRAVEL_CASE;
const cases: [string, number, boolean][] = [['fractal-100k', 100_000, true], ['fractal-1m', 1_000_000, false]];
for (const [name, faces, conv] of cases) {
  if (only && !name.endsWith(only)) continue;
  if (quick() && faces > 100_000) continue;
  await runCase(name, faces, conv);
}
