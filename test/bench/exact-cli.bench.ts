/**
 * Whole-field exact from the command line on the meshes users bring
 * (meshes.ts) at ~200k faces (~20k with `--quick`): does
 * `orthodrome distance MESH --from v:CENTRE` finish within 2 GB, or stop in
 * under 5 s with exit code 3 (LIMIT) and a message suggesting the heat
 * method? Each run is its own process (the CLI from source through tsx, or
 * the built CLI named by ORTHODROME_CLI, e.g. dist/cli/orthodrome.js),
 * with the default memory budget; peak RSS comes from GNU time's %M when
 * /usr/bin/time exists. Records per case: `wall_ms` (the whole process:
 * start-up, load, solve), `exit_code`, `peak_rss` (MB), and `verdict`
 * (1 = meets the goal, 0 = does not) with the first line of stderr.
 * `--jobs` measures `distance --each --jobs 1` and `--jobs 2` with four
 * sources on the smooth heightfield (`JOBS_FACES`, default 50k faces).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { emit, quick } from './harness.js';
import { USER_MESHES, smoothHeightfield } from './meshes.js';
import { writePly } from '../../src/io/write-ply.js';
import type { Shape } from '../fixtures/shapes.js';

const BENCH = 'exact-cli';
const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const gnuTime = existsSync('/usr/bin/time');

function writeShape(s: Shape, file: string): void {
  const nf = s.triangles.length / 3;
  writeFileSync(file, writePly({ positions: s.positions, faceIndices: s.triangles, faceOffsets: Uint32Array.from({ length: nf + 1 }, (_, f) => 3 * f) }));
}

/** The vertex nearest the centre of the bounding box. */
function centreVertex(s: Shape): number {
  const P = s.positions, nv = P.length / 3, lo = [Infinity, Infinity, Infinity], hi = [-Infinity, -Infinity, -Infinity];
  for (let v = 0; v < nv; v++) for (let d = 0; d < 3; d++) { lo[d] = Math.min(lo[d]!, P[3 * v + d]!); hi[d] = Math.max(hi[d]!, P[3 * v + d]!); }
  let best = 0, bd = Infinity;
  for (let v = 0; v < nv; v++) {
    const d = Math.hypot(P[3 * v]! - (lo[0]! + hi[0]!) / 2, P[3 * v + 1]! - (lo[1]! + hi[1]!) / 2, P[3 * v + 2]! - (lo[2]! + hi[2]!) / 2);
    if (d < bd) { bd = d; best = v; }
  }
  return best;
}

/** Runs the CLI; wall time, exit code, stdout, stderr and peak RSS (MB, NaN when unknown). */
function cli(args: string[]): { ms: number; code: number; stdout: string; stderr: string; rssMB: number } {
  const built = process.env.ORTHODROME_CLI; // e.g. dist/cli/orthodrome.js: what users run (no TypeScript loader)
  const node = built ? [process.execPath, resolve(built), ...args] : [process.execPath, '--import', 'tsx', join(root, 'cli/orthodrome.ts'), ...args];
  const cmd = gnuTime ? ['/usr/bin/time', '-f', 'peak-rss-kB %M', ...node] : node;
  const t0 = performance.now();
  const r = spawnSync(cmd[0]!, cmd.slice(1), { cwd: root, encoding: 'utf8', env: { ...process.env, ORTHODROME_DEBUG: '' }, maxBuffer: 1 << 28 });
  const ms = performance.now() - t0;
  const m = /peak-rss-kB (\d+)/.exec(r.stderr);
  return { ms, code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr.replace(/peak-rss-kB \d+\n?/, ''), rssMB: m ? Number(m[1]) / 1024 : NaN };
}

const dir = mkdtempSync(join(tmpdir(), 'orthodrome-bench-'));
try {
  const faces = quick() ? 20_000 : 200_000;
  const only = process.env.EXACT_CASE;
  if (!process.argv.includes('--jobs')) {
    for (const [kind, make] of Object.entries(USER_MESHES)) {
      const name = `${kind}-${faces / 1000}k`;
      if (only && name !== only) continue;
      const s = make(faces, 1), file = join(dir, `${kind}.ply`);
      writeShape(s, file);
      const r = cli(['distance', file, '--from', `v:${centreVertex(s)}`, '--json']);
      const extra = { faces: s.triangles.length / 3 };
      const firstLine = r.stderr.split('\n')[0] ?? '';
      // the goal (issue 9): exit 0 within 2 GB, or exit 3 in under 5 s naming the budget and suggesting heat
      const ok = (r.code === 0 && !(r.rssMB > 2048)) || (r.code === 3 && r.ms < 5000 && /heat/.test(firstLine) && /budget/.test(firstLine));
      emit({ bench: BENCH, case: name, metric: 'wall_ms', value: r.ms, unit: 'ms', ...extra });
      emit({ bench: BENCH, case: name, metric: 'exit_code', value: r.code, unit: 'code', ...extra });
      emit({ bench: BENCH, case: name, metric: 'peak_rss', value: r.rssMB, unit: 'MB', goal: 2048, ...extra });
      if (r.code === 0) {
        const j = JSON.parse(r.stdout) as { timings: { solve: number }; details?: { windows?: number } };
        emit({ bench: BENCH, case: name, metric: 'solve_ms', value: j.timings.solve, unit: 'ms', windowsPerFace: (j.details?.windows ?? NaN) / extra.faces, ...extra });
      }
      emit({ bench: BENCH, case: name, metric: 'verdict', value: ok ? 1 : 0, unit: 'bool', stderr: firstLine, ...extra });
    }
  } else {
    // --jobs: four sources from the corners' neighbourhood and the centre, --each, on two cores
    const nf = Number(process.env.JOBS_FACES ?? (quick() ? 20_000 : 50_000));
    const s = smoothHeightfield(nf, 1), file = join(dir, 'jobs.ply');
    writeShape(s, file);
    const nv = s.positions.length / 3, side = Math.round(Math.sqrt(nv));
    const from = [centreVertex(s), side + 1, nv - side - 2, 2 * side - 2].flatMap((v) => ['--from', `v:${v}`]);
    for (const method of ['exact', 'heat']) {
      for (const jobs of [1, 2]) {
        const r = cli(['distance', file, ...from, '--each', '--method', method, '--jobs', String(jobs), '-o', join(dir, `jobs-${method}-${jobs}.csv`)]);
        if (r.code !== 0) throw new Error(`distance --jobs ${jobs} failed: ${r.stderr}`);
        emit({ bench: BENCH, case: `jobs-${method}-${nf / 1000}k`, metric: `jobs${jobs}_wall_ms`, value: r.ms, unit: 'ms', sources: 4, peakRssMB: r.rssMB });
      }
    }
  }
} finally {
  rmSync(dir, { recursive: true, force: true });
}
