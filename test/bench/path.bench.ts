/**
 * Path benchmark (issue 9): the path between opposite corners of a noisy
 * terrain (fractalHeightfield in meshes.ts: a fractal sum of octaves on a grid
 * with alternating diagonals) by intrinsic edge flips (src/geodesic/flip),
 * against the one yardstick, the typed-array binary-heap edge-graph Dijkstra
 * of harness.ts, measured in the same run on the same mesh. Every path time
 * is that of `shortestPathThrough`: its own Dijkstra for the start path, the
 * flips and the tracing back to the input faces are all included.
 *
 * - `path_ms`: flips alone (`method: 'flip'`, no positions: no check at all).
 * - `path_auto_ms`: the CLI's default (`auto` with positions): the flips, then
 *   the ellipsoid check (flip/verify.ts), which proves the leg by window
 *   propagation when its region has at most AUTO_PROVE_FACES (50k) faces and
 *   otherwise returns it with its certified bound (`excess_bound`, from the
 *   3D chord; `proven` says which).
 * - `path_proven_ms` (up to the 1M mesh, one run): the full proof
 *   (`verifyFaces: Infinity`, `--prove-limit` without a limit), the shortest
 *   path; `auto_true_excess` is how much longer the default's path really was,
 *   `bound_holds` that the certified bound covers it.
 *
 * Sizes: ~100k faces (`--quick`), ~1M and ~4M faces. Goals: ≤ 3× Dijkstra,
 * peak RSS ≤ 1.5 GB at 1M and 4M faces. Also reported: flips, the start
 * (edge-graph) length against the geodesic length, and the straight 3D chord
 * (the lower bound). On the 100k mesh the flip length is compared with window
 * propagation (`windows_rel_diff`); `PATH_CASE=1m` runs one size.
 */
import { emit, timeMedian, timeEdgeDijkstra, peakRssMB, quick } from './harness.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { shortestPathThrough } from '../../src/geodesic/waypoints.js';
import { flipGeodesicPath } from '../../src/geodesic/flip/index.js';
import { USER_MESHES } from './meshes.js';

const BENCH = 'path';

async function runCase(name: string, faces: number, compareWindows: boolean): Promise<void> {
  const s = USER_MESHES.fractal(faces, 7);
  const m: IntrinsicMesh = intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);
  const t = m.topology, P = s.positions;
  const a = 0, b = t.nv - 1; // grid corners (0, 0) and (1000, 1000)
  const extra = { faces: t.nf, vertices: t.nv };
  const runs = 3;
  const dij = await timeEdgeDijkstra(m, a, runs);
  emit({ bench: BENCH, case: name, metric: 'dijkstra_ms', value: dij.ms, unit: 'ms', ...extra });
  const stops = [{ kind: 'vertex' as const, vertex: a }, { kind: 'vertex' as const, vertex: b }];
  // flips alone (no check), then the CLI's default (auto, with positions: proven or a certified bound)
  const r = await timeMedian(() => shortestPathThrough(m, stops, { method: 'flip' }), runs, 1);
  emit({ bench: BENCH, case: name, metric: 'path_ms', value: r.ms, unit: 'ms', ratio_vs_dijkstra: r.ms / dij.ms, method: r.result.legs[0]!.method, proven: r.result.legs[0]!.proven, ...extra });
  const q = await timeMedian(() => shortestPathThrough(m, stops, { method: 'auto', positions: P }), 3, 1);
  const leg = q.result.legs[0]!;
  emit({ bench: BENCH, case: name, metric: 'peak_rss_before_proof', value: peakRssMB(), unit: 'MB', ...extra }); // the mesh, Dijkstra, flips and auto
  emit({ bench: BENCH, case: name, metric: 'path_auto_ms', value: q.ms, unit: 'ms', ratio_vs_dijkstra: q.ms / dij.ms, method: leg.method, proven: leg.proven, excess_bound: leg.excessBound, length: q.result.length, ...extra });
  if (t.nf <= 2e6) {
    // the full proof (no face limit): the shortest path, to measure the default's real excess
    try {
      const z = await timeMedian(() => shortestPathThrough(m, stops, { method: 'auto', positions: P, verifyFaces: Infinity }), 1, 0);
      const trueExcess = (q.result.length - z.result.length) / z.result.length;
      emit({ bench: BENCH, case: name, metric: 'path_proven_ms', value: z.ms, unit: 'ms', ratio_vs_dijkstra: z.ms / dij.ms, method: z.result.legs[0]!.method, proven: z.result.legs[0]!.proven, length: z.result.length, auto_true_excess: trueExcess, bound_holds: trueExcess <= (leg.excessBound ?? Infinity), ...extra });
    } catch (e) {
      emit({ bench: BENCH, case: name, metric: 'path_proven_ms', value: NaN, unit: 'ms', status: String((e as Error).message).slice(0, 160), ...extra });
    }
  }
  const f = flipGeodesicPath(m, a, b);
  const chord = Math.hypot(P[3 * b]! - P[3 * a]!, P[3 * b + 1]! - P[3 * a + 1]!, P[3 * b + 2]! - P[3 * a + 2]!);
  emit({
    bench: BENCH, case: name, metric: 'length', value: r.result.length, unit: 'mesh units',
    edge_graph: f.startLength, chord, flips: f.flips, sweeps: f.sweeps, points: r.result.path.points.length, ...extra,
  });
  if (compareWindows) {
    try {
      const w = shortestPathThrough(m, stops, { method: 'windows' });
      emit({ bench: BENCH, case: name, metric: 'windows_rel_diff', value: Math.abs(w.length - r.result.length) / w.length, unit: 'ratio', ...extra });
    } catch (e) {
      emit({ bench: BENCH, case: name, metric: 'windows_rel_diff', value: NaN, unit: 'ratio', status: String((e as Error).message).slice(0, 120), ...extra });
    }
  }
  emit({ bench: BENCH, case: name, metric: 'peak_rss', value: peakRssMB(), unit: 'MB', ...extra });
}

const only = process.env.PATH_CASE;
const cases: [string, number, boolean][] = quick() ? [['100k', 100_000, true]] : [['100k', 100_000, true], ['1m', 1_000_000, false], ['4m', 4_000_000, false]];
for (const [name, faces, cmp] of cases) {
  if (only && only !== name) continue;
  await runCase(name, faces, cmp);
}
