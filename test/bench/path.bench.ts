/**
 * Path benchmark (issue 9): the exact path between opposite corners of a
 * noisy terrain (fractalHeightfield in meshes.ts: a fractal sum of octaves
 * on a grid with alternating diagonals) by intrinsic edge flips
 * (src/geodesic/flip), against the one yardstick, the typed-array
 * binary-heap edge-graph Dijkstra of harness.ts, measured in the same run on
 * the same mesh. The path time (`path_ms`) is that of `shortestPathThrough`
 * with `method: 'flip'`: its own Dijkstra for the start path, the flips and
 * the tracing back to the input faces are all included. `path_with_proof_ms`
 * adds the positions, as the CLI does: the ellipsoid proof (flip/verify.ts)
 * runs window propagation when its region has at most 50k faces, and only
 * counts faces otherwise (`proven` says which). `path_auto_ms` is the CLI's
 * default (`auto`: the proof without a face limit, always the shortest path;
 * one run, up to the 1M mesh) with the excess of the flips alone over it.
 *
 * Sizes: ~100k faces (`--quick`), ~1M and ~4M faces. Goals: ≤ 3× Dijkstra,
 * peak RSS ≤ 1.5 GB at 1M faces. Also reported: flips, the start (edge-graph)
 * length against the geodesic length, and the straight 3D chord (a lower
 * bound). On the 100k mesh the flip length is compared with window
 * propagation (`windows_rel_diff`, expected ≤ 1e-9); `PATH_CASE=1m` runs one
 * size.
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
  const runs = t.nf > 2e6 ? 1 : 3;
  const dij = await timeEdgeDijkstra(m, a, runs);
  emit({ bench: BENCH, case: name, metric: 'dijkstra_ms', value: dij.ms, unit: 'ms', ...extra });
  const stops = [{ kind: 'vertex' as const, vertex: a }, { kind: 'vertex' as const, vertex: b }];
  // flips alone (no proof), then as the CLI runs it: with positions, so the ellipsoid proof runs
  // when its region has at most FLIP_VERIFY_FACES faces (it stops counting there otherwise)
  const r = await timeMedian(() => shortestPathThrough(m, stops, { method: 'flip' }), runs, 1);
  emit({ bench: BENCH, case: name, metric: 'path_ms', value: r.ms, unit: 'ms', ratio_vs_dijkstra: r.ms / dij.ms, method: r.result.legs[0]!.method, proven: r.result.legs[0]!.proven, ...extra });
  const q = await timeMedian(() => shortestPathThrough(m, stops, { method: 'flip', positions: P }), runs, 1);
  emit({ bench: BENCH, case: name, metric: 'path_with_proof_ms', value: q.ms, unit: 'ms', ratio_vs_dijkstra: q.ms / dij.ms, method: q.result.legs[0]!.method, proven: q.result.legs[0]!.proven, length: q.result.length, ...extra });
  if (t.nf <= 2e6) {
    // the CLI's default (`auto`): the proof without a face limit, so always the shortest path
    try {
      const z = await timeMedian(() => shortestPathThrough(m, stops, { method: 'auto', positions: P }), 1, 0);
      emit({ bench: BENCH, case: name, metric: 'path_auto_ms', value: z.ms, unit: 'ms', ratio_vs_dijkstra: z.ms / dij.ms, method: z.result.legs[0]!.method, proven: z.result.legs[0]!.proven, length: z.result.length, flips_alone_rel_excess: (r.result.length - z.result.length) / z.result.length, ...extra });
    } catch (e) {
      emit({ bench: BENCH, case: name, metric: 'path_auto_ms', value: NaN, unit: 'ms', status: String((e as Error).message).slice(0, 160), ...extra });
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
