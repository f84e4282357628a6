/**
 * `orthodrome score` end to end, in child processes: gates and exit codes,
 * error rows for meshes that cannot be scored or are over a limit, shards
 * merged equal to one run (byte for byte), a run killed with SIGKILL and
 * resumed equal to an uninterrupted one, and a typo in a rules file refused.
 */
import { describe, expect, it, beforeAll, vi } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, mkdirSync, readFileSync, writeFileSync, existsSync, copyFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createRequire } from 'node:module';
import { pathToFileURL } from 'node:url';
import { repoPath } from './run-cli.js';
import { runMerge } from '../../cli/score/merge.js';
import { registerScore } from '../../cli/commands/score.js';
import { Command } from 'commander';
import { icosphere, torus, flatGrid, objText } from '../fixtures/shapes.js';
import { subdivide, type V3 } from '../fixtures/subdivide.js';

let dir = '';
/** tsx's loader by URL: the runs' working directory is a temporary folder, where a bare `tsx` would not resolve. */
const TSX = pathToFileURL(createRequire(import.meta.url).resolve('tsx')).href;

function cubeObj(m: number): string {
  const P: V3[] = [[0, 0, 0], [1, 0, 0], [1, 1, 0], [0, 1, 0], [0, 0, 1], [1, 0, 1], [1, 1, 1], [0, 1, 1]];
  const quads = [[0, 3, 2, 1], [4, 5, 6, 7], [0, 1, 5, 4], [1, 2, 6, 5], [2, 3, 7, 6], [3, 0, 4, 7]];
  const tris: V3[][] = [];
  for (const [a, b, c, d] of quads) tris.push([P[a!]!, P[b!]!, P[c!]!], [P[a!]!, P[c!]!, P[d!]!]);
  return objText(subdivide(tris, m));
}

const RULES = { rules: [{ name: 'closed', metric: 'genus', op: '==', value: 0 }, { name: 'angles', metric: 'minAngleDeg', op: '>=', value: 10 }] };

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-score-'));
  const parts = join(dir, 'parts');
  mkdirSync(join(parts, 'sub'), { recursive: true });
  writeFileSync(join(parts, 'cube-a.obj'), cubeObj(2));
  writeFileSync(join(parts, 'cube-b.obj'), cubeObj(3));
  writeFileSync(join(parts, 'sphere.obj'), objText(icosphere(2)));
  writeFileSync(join(parts, 'ring.obj'), objText(torus(16, 8))); // genus 1: fails "closed"
  writeFileSync(join(parts, 'strip.obj'), objText(flatGrid(4, 4, 1, 0.05))); // angles of about 3°: fails "angles"
  writeFileSync(join(parts, 'sub', 'plate.obj'), objText(flatGrid(6, 6)));
  writeFileSync(join(parts, 'broken.obj'), 'v 0 0 0\nf 1 2 three\n'); // cannot be read: an error row
  writeFileSync(join(dir, 'rules.json'), JSON.stringify(RULES, null, 2));
  // eight meshes that take a little while each (every group: exact and heat), for the kill; small, so the test stays cheap
  const slow = join(dir, 'slow');
  mkdirSync(slow);
  for (let i = 0; i < 8; i++) writeFileSync(join(slow, `s${String(i).padStart(2, '0')}.obj`), objText(torus(14 + i, 7)));
});

/**
 * `orthodrome score ARGS` in this process, in `dir`: the command as the CLI registers it (commander, the action
 * wrapper that sets the exit code), with stdout and stderr captured. A process start costs about a second of CPU
 * from source, so the runs whose checks are about the results (shards, limits, manifests, the clean run beside
 * the killed one) go here; the runs that check the process itself (exit code and stderr of the real command,
 * standard input, SIGKILL) are spawned.
 */
async function scoreHere(args: string[], env: Record<string, string> = {}): Promise<{ code: number; stdout: string; stderr: string }> {
  const out: string[] = [], err: string[] = [];
  const saved = { ...process.env }, cwd = process.cwd();
  const o = vi.spyOn(process.stdout, 'write').mockImplementation((x: string | Uint8Array) => (out.push(String(x)), true));
  const e = vi.spyOn(process.stderr, 'write').mockImplementation((x: string | Uint8Array) => (err.push(String(x)), true));
  try {
    for (const k of ['JOB_COMPLETION_INDEX', 'ORTHODROME_SHARDS', 'SLURM_ARRAY_TASK_ID', 'SLURM_ARRAY_TASK_COUNT', 'SLURM_ARRAY_TASK_MIN']) delete process.env[k];
    Object.assign(process.env, env);
    process.chdir(dir);
    process.exitCode = undefined;
    const program = new Command().exitOverride();
    registerScore(program);
    await program.parseAsync(['node', 'orthodrome', 'score', ...args]);
    return { code: Number(process.exitCode ?? 0), stdout: out.join(''), stderr: err.join('') };
  } finally {
    process.exitCode = undefined;
    process.chdir(cwd);
    for (const k of Object.keys(process.env)) if (!(k in saved)) delete process.env[k];
    Object.assign(process.env, saved);
    o.mockRestore();
    e.mockRestore();
  }
}

/** `orthodrome score ARGS` from source in `dir`, with extra environment variables and standard input. */
function score(args: string[], env: Record<string, string> = {}, input = ''): { code: number; stdout: string; stderr: string } {
  const base: NodeJS.ProcessEnv = { ...process.env, ORTHODROME_DEBUG: '' };
  for (const k of ['JOB_COMPLETION_INDEX', 'ORTHODROME_SHARDS', 'SLURM_ARRAY_TASK_ID', 'SLURM_ARRAY_TASK_COUNT', 'SLURM_ARRAY_TASK_MIN']) delete base[k];
  const r = spawnSync(process.execPath, ['--import', TSX, repoPath('cli/orthodrome.ts'), 'score', ...args], {
    cwd: dir, encoding: 'utf8', input, timeout: 180_000, env: { ...base, ...env },
  });
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}

describe('orthodrome score', () => {
  it('scores a folder with gates: fail and error rows, exit 1; two shards merged equal the single run byte for byte', async () => {
    const one = score(['parts', '--rules', 'rules.json', '-o', 'single.csv', '--jobs', '2']);
    expect(one.code, one.stderr).toBe(1);
    const text = readFileSync(join(dir, 'single.csv'), 'utf8');
    const lines = text.trim().split('\n');
    expect(lines[0]!.startsWith('file,status,settings,tag,units,error,vertices,')).toBe(true);
    expect(lines[0]!.endsWith(',gate:closed,gate:angles')).toBe(true);
    const status = Object.fromEntries(lines.slice(1).map((l) => [l.split(',')[0], l.split(',')[1]]));
    // sorted by file; a torus has genus 1 (common practice), the strip's smallest angle is atan(0.05) ≈ 2.9°
    expect(status).toEqual({
      'parts/broken.obj': 'error', 'parts/cube-a.obj': 'pass', 'parts/cube-b.obj': 'pass', 'parts/ring.obj': 'fail',
      'parts/sphere.obj': 'pass', 'parts/strip.obj': 'fail', 'parts/sub/plate.obj': 'pass',
    });
    expect(text).toMatch(/parts\/broken\.obj,error,\w+,,,parts\/broken\.obj:\d*:? ?[^,\n]+/);
    expect(one.stdout).toMatch(/7 mesh\(es\): 4 pass, 2 fail, 1 error/);
    expect(one.stdout).toMatch(/gate closed \(genus == 0\): 1 failed; worst: parts\/ring\.obj \(measured 1, needs == 0\)/);
    expect(one.stdout).toMatch(/gate angles \(minAngleDeg >= 10\): 1 failed; worst: parts\/strip\.obj/);
    // plain progress lines on stderr (not a terminal), one per mesh
    expect(one.stderr.match(/^score \d\/7 (pass|fail|error) /gm)?.length).toBe(7);

    const counts: number[] = [];
    for (let i = 0; i < 2; i++) {
      // shard 1 reads its index as a Kubernetes Indexed Job would give it
      const r = i === 1
        ? await scoreHere(['parts', '--rules', 'rules.json', '-o', 'part-{shard}.csv', '--jobs', '1', '--shard', 'env', '--quiet'], { JOB_COMPLETION_INDEX: '1', ORTHODROME_SHARDS: '2' })
        : await scoreHere(['parts', '--rules', 'rules.json', '-o', 'part-{shard}.csv', '--jobs', '1', '--shard', `${i}/2`, '--quiet']);
      expect([0, 1]).toContain(r.code);
      const m = new RegExp(`score: (\\d+) mesh\\(es\\) \\(shard ${i}/2 of 7\\)`).exec(r.stdout);
      expect(m, r.stdout).not.toBeNull();
      counts.push(Number(m![1]));
    }
    expect(counts[0]! + counts[1]!).toBe(7);
    expect(Math.min(...counts)).toBeGreaterThan(0); // both shards have work, so the merge joins two real parts

    // the merge in-process (a process start less; its exit codes are run.ts's, tested with the other commands)
    const at = (f: string) => join(dir, f);
    const said: string[] = [];
    const spy = vi.spyOn(process.stdout, 'write').mockImplementation((x: string | Uint8Array) => (said.push(String(x)), true));
    let code: number;
    try {
      code = await runMerge([at('part-0.csv'), at('part-1.csv')], at('merged.csv'));
    } finally {
      spy.mockRestore();
    }
    expect(code).toBe(1); // a mesh failed its gates
    expect(said.join('')).toMatch(/2 part\(s\), 7 mesh\(es\), none missing or duplicated/);
    expect(readFileSync(join(dir, 'merged.csv'), 'utf8')).toBe(text);
    expect(readFileSync(join(dir, 'merged.csv.plan.json'), 'utf8')).toBe(readFileSync(join(dir, 'single.csv.plan.json'), 'utf8'));

    // merge refuses a missing shard, a shard given twice and a torn part (USAGE: exit 2, one line)
    await expect(runMerge([at('part-0.csv')], at('bad.csv'))).rejects.toThrow(/shard\(s\) 1\/2 missing/);
    copyFileSync(at('part-0.csv'), at('again.csv'));
    copyFileSync(at('part-0.csv.plan.json'), at('again.csv.plan.json'));
    await expect(runMerge([at('part-0.csv'), at('again.csv'), at('part-1.csv')], at('bad.csv'))).rejects.toThrow(/shard 0\/2 is given twice/);
    writeFileSync(at('torn.csv'), readFileSync(at('part-1.csv'), 'utf8').slice(0, -3));
    copyFileSync(at('part-1.csv.plan.json'), at('torn.csv.plan.json'));
    await expect(runMerge([at('part-0.csv'), at('torn.csv')], at('bad.csv'))).rejects.toThrow(/torn|no row/);
    expect(existsSync(at('bad.csv'))).toBe(false);
  }, 240_000);

  it('a run killed with SIGKILL and resumed gives the same report as an uninterrupted run', async () => {
    const args = ['slow', '--metrics', 'all', '--jobs', '1', '--quiet', '--rules', 'rules.json'];
    const clean = await scoreHere([...args, '-o', 'clean.jsonl']);
    expect(clean.code, clean.stderr).toBe(1); // tori: genus 1
    const out = join(dir, 'killed.jsonl');
    const child = spawn(process.execPath, ['--import', TSX, repoPath('cli/orthodrome.ts'), 'score', ...args, '-o', 'killed.jsonl'], { cwd: dir, stdio: 'ignore' });
    const exited = new Promise<NodeJS.Signals | null>((res) => child.on('exit', (_c, sig) => res(sig)));
    // wait for the first record on disk, then kill without warning
    const t0 = Date.now();
    while (Date.now() - t0 < 120_000) {
      if (existsSync(out) && readFileSync(out, 'utf8').split('\n').filter(Boolean).length >= 1) break;
      await new Promise((r) => setTimeout(r, 10));
    }
    child.kill('SIGKILL');
    expect(await exited).toBe('SIGKILL');
    const partial = readFileSync(out, 'utf8').split('\n').filter(Boolean).length;
    expect(partial).toBeGreaterThanOrEqual(1);
    expect(partial).toBeLessThan(8); // the kill came mid-run
    const resumed = score([...args, '-o', 'killed.jsonl', '--resume']);
    expect(resumed.code, resumed.stderr).toBe(1);
    expect(resumed.stdout).toMatch(new RegExp(`${partial} kept from before \\(--resume\\)`));
    expect(readFileSync(out, 'utf8')).toBe(readFileSync(join(dir, 'clean.jsonl'), 'utf8'));
  }, 240_000);

  it('a mesh over the time limit or the memory estimate is an error row naming the limit; the run goes on', async () => {
    const mem = await scoreHere(['parts/cube-a.obj', 'parts/sphere.obj', '--mesh-memory', '1K', '-o', 'mem.jsonl', '--jobs', '1', '--quiet']);
    expect(mem.code).toBe(1);
    const rows = readFileSync(join(dir, 'mem.jsonl'), 'utf8').trim().split('\n').map((l) => JSON.parse(l) as Record<string, unknown>);
    expect(rows.map((r) => r.status)).toEqual(['error', 'error']);
    expect(String(rows[0]!.error)).toMatch(/parts\/cube-a\.obj: memory estimate .* over the per-mesh limit of 1 KiB; raise it with --mesh-memory/);
    const slow = await scoreHere(['slow/s00.obj', 'parts/cube-a.obj', '--metrics', 'all', '--time-limit', '0.001', '-o', 'time.csv', '--jobs', '1', '--quiet']);
    expect(slow.code).toBe(1);
    expect(readFileSync(join(dir, 'time.csv'), 'utf8')).toMatch(/slow\/s00\.obj: over the per-mesh time limit of 0\.001 s; raise it with --time-limit/);
  }, 240_000);

  it('a typo in the rules file is exit 2 naming the rule, before any mesh is scored', () => {
    writeFileSync(join(dir, 'typo.json'), JSON.stringify({ rules: [RULES.rules[0], { name: 'angles', metric: 'minAngelDeg', op: '>=', value: 10 }] }));
    const r = score(['parts', '--rules', 'typo.json', '-o', 'typo.csv']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim()).toBe("orthodrome: typo.json: rule 2 ('angles'): unknown metric 'minAngelDeg' (did you mean 'minAngleDeg'?); 'orthodrome score --list-metrics' lists them");
    expect(existsSync(join(dir, 'typo.csv'))).toBe(false);
  });
});

describe('score inputs', () => {
  it('a manifest with landmarks and a missing mesh; a glob; a list on standard input', async () => {
    writeFileSync(join(dir, 'parts.csv'), 'path,landmarks,units,tag\nparts/cube-a.obj,"far=p:0,0,0>p:1,1,1=2.23606797749979±1e-9",mm,b7\nparts/nothing.obj,,mm,b7\n');
    writeFileSync(join(dir, 'lm.json'), JSON.stringify({ rules: [{ name: 'nominal', landmarks: { tolerance: 0.001 } }] }));
    const r = await scoreHere(['parts.csv', 'parts/s*.obj', '--rules', 'lm.json', '-o', 'lm.jsonl', '--jobs', '1', '--quiet']);
    expect(r.code).toBe(1);
    const rows = readFileSync(join(dir, 'lm.jsonl'), 'utf8').trim().split('\n').map((l) => JSON.parse(l) as Record<string, unknown>);
    expect(rows.map((x) => [x.file, x.status])).toEqual([
      ['parts/cube-a.obj', 'pass'], ['parts/nothing.obj', 'error'], ['parts/sphere.obj', 'fail'], ['parts/strip.obj', 'fail'],
    ]);
    // unit cube, opposite corners over two faces: √5 (unfolding)
    const cube = rows[0]!;
    expect(cube).toMatchObject({ units: 'mm', tag: 'b7', landmarkCount: 1 });
    expect(cube.landmarkMaxAbsDeviation as number).toBeLessThan(1e-9);
    expect(rows[2]!['gate:nominal']).toBe('no landmark pairs given for this mesh');
    expect(String(rows[1]!.error)).toMatch(/parts\/nothing\.obj/);
    // a list on standard input (blank lines and # comments skipped); --list-metrics-free summary on stdout
    const s = score(['-', '--jobs', '1', '--quiet'], {}, '# two parts\nparts/cube-a.obj\n\nparts/sub/plate.obj\n');
    expect(s.code, s.stderr).toBe(0);
    expect(s.stdout).toMatch(/2 mesh\(es\): 2 pass, 0 fail, 0 error/);
  }, 240_000);
});
