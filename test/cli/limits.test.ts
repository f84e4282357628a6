/**
 * End-to-end: the exact method's memory budget on the command line
 * (`--memory-budget`, exit 3), and what `distance` says about the field it
 * computed (complete run, stop at --max-distance, stop once the targets are
 * final, with or without --json).
 *
 * Known answers: on a flat square the geodesic distance is the Euclidean one
 * (elementary). Exit codes are the project's documented contract (README,
 * cli/run.ts). The heap check runs a solve whose windows outnumber the JS
 * heap limit that Node reports for --max-old-space-size=16 (V8's own
 * getHeapStatistics, read in a child process): typed arrays live outside
 * the JS heap (ECMAScript ArrayBuffer backing stores; V8 allocates them
 * outside its managed heap), so the run must pass.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli, repoPath } from './run-cli.js';
import { flatGrid, terrain, rng, objText } from '../fixtures/shapes.js';
import type { Shape } from '../fixtures/shapes.js';

let dir = '';
/** Rolling terrain with 2 cm of height noise on 0.77 m cells: every vertex a saddle or a peak, many windows per face. */
function roughTerrain(n: number): Shape {
  const s = terrain(n, n, 100, 100, (x, y) => 4 * Math.sin(x / 9) * Math.cos(y / 13));
  const r = rng(3);
  for (let i = 2; i < s.positions.length; i += 3) s.positions[i]! += 0.02 * (r() - 0.5);
  return s;
}
const oneLine = (text: string) => text.trim().split('\n').length === 1;
const noStack = (text: string) => !/\bat \w+ \(|\.ts:\d+:\d+/.test(text);

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-limits-'));
  writeFileSync(join(dir, 'square.obj'), objText(flatGrid(10, 10, 10, 10, 0.15, 3)));
  writeFileSync(join(dir, 'rough.obj'), objText(roughTerrain(40)));
  writeFileSync(join(dir, 'rough130.obj'), objText(roughTerrain(130)));
});

describe('--memory-budget', () => {
  it('a budget the run exceeds: exit 3, one line naming the budget, the option and --method heat; no output file', () => {
    const out = join(dir, 'over.csv');
    for (const budget of ['2M']) {
      const r = runCli(['distance', join(dir, 'rough.obj'), '--from', 'v:800', '--memory-budget', budget, '-o', out]);
      expect(r.code).toBe(3);
      expect(oneLine(r.stderr)).toBe(true);
      expect(noStack(r.stderr)).toBe(true);
      expect(r.stderr).toMatch(/memory budget of 2 MiB/);
      expect(r.stderr).toMatch(/--memory-budget/);
      expect(r.stderr).toMatch(/--method heat/);
      expect(r.stdout).toBe('');
      expect(existsSync(out)).toBe(false);
    }
    const p = runCli(['path', join(dir, 'rough.obj'), '--from', 'v:0', '--to', 'v:1680', '--memory-budget', '1M']);
    expect(p.code).toBe(3);
    expect(p.stderr).toMatch(/memory budget of 1 MiB.*--memory-budget/);
  });

  it('a budget that holds the run gives the same numbers as the default, and the Euclidean distance on a flat square', () => {
    const get = (extra: string[]) => {
      const r = runCli(['distance', join(dir, 'square.obj'), '--from', 'v:0', '--to', 'v:120', '--to', 'p:3,4,0', '-o', join(dir, 'sq.csv'), '--json', ...extra]);
      expect(r.code).toBe(0);
      return JSON.parse(r.stdout);
    };
    const small = get(['--memory-budget', '4M']), dflt = get([]);
    expect(small.targets.map((t: { distance: number }) => t.distance)).toEqual(dflt.targets.map((t: { distance: number }) => t.distance));
    expect(Math.abs(small.targets[0].distance - 10 * Math.SQRT2)).toBeLessThan(1e-9); // corner to corner
    expect(Math.abs(small.targets[1].distance - 5)).toBeLessThan(1e-9); // (0,0) to (3,4)
    expect(small.details.memoryBytes).toBeLessThanOrEqual(4 * 2 ** 20);
  });

  it('a size that does not read is a usage error (exit 2) naming the option', () => {
    for (const bad of ['lots', '2X']) {
      const r = runCli(['distance', join(dir, 'square.obj'), '--from', 'v:0', '--memory-budget', bad]);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/--memory-budget/);
    }
  });

  it("windows live outside the JS heap: a solve whose windows exceed Node's heap limit passes", () => {
    const limit = spawnSync(process.execPath, ['--max-old-space-size=16', '-e', 'process.stdout.write(String(require("v8").getHeapStatistics().heap_size_limit))'], { encoding: 'utf8' });
    const heapLimit = Number(limit.stdout);
    expect(heapLimit).toBeGreaterThan(0);
    const r = spawnSync(
      process.execPath,
      ['--max-old-space-size=16', '--import', 'tsx', repoPath('cli/orthodrome.ts'), 'distance', join(dir, 'rough130.obj'), '--from', 'v:8580', '--json'],
      { encoding: 'utf8', cwd: repoPath('.'), env: { ...process.env, ORTHODROME_DEBUG: '' }, timeout: 120_000 },
    );
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.complete).toBe(true);
    expect(j.details.memoryBytes).toBeGreaterThan(heapLimit);
    expect(j.field.computedVertices).toBe(131 * 131);
  });
});

describe('distance says what it computed', () => {
  const sq = () => join(dir, 'square.obj');
  it('complete run: statistics over every vertex, nothing "not computed"', () => {
    const r = runCli(['distance', sq(), '--from', 'v:0']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/from v:0: min 0, mean [\d.]+, max 14\.1421/);
    expect(r.stdout).not.toMatch(/not computed|stopped/);
  });

  it('--max-distance with -o: says it stopped at the distance, not at targets', () => {
    const r = runCli(['distance', sq(), '--from', 'v:0', '--max-distance', '5', '-o', join(dir, 'md.csv')]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/stopped at --max-distance 5: \d+ of 121 vertices within it \(min 0, mean [\d.]+, max [\d.]+\); \d+ farther or unreachable/);
    expect(r.stdout).not.toMatch(/targets|give -o/);
    // a cap beyond the whole field: every vertex within it
    const all = runCli(['distance', sq(), '--from', 'v:0', '--max-distance', '300', '-o', join(dir, 'md.csv')]);
    expect(all.stdout).not.toMatch(/not computed|targets|farther/);
    const j = JSON.parse(runCli(['distance', sq(), '--from', 'v:0', '--max-distance', '5', '--json']).stdout);
    expect(j.field.stoppedBy).toBe('maxDistance');
    expect(j.field.max).toBeLessThanOrEqual(5);
    expect(j.field.computedVertices + j.field.notComputedVertices).toBe(121);
    expect(j.field.unreachableVertices).toBeNull();
  });

  it('--to with --json keeps the early stop and reports statistics only for the vertices computed', () => {
    const args = ['distance', sq(), '--from', 'v:0', '--to', 'v:12'];
    const early = JSON.parse(runCli([...args, '--json']).stdout);
    const full = JSON.parse(runCli([...args, '--json', '-o', join(dir, 'full.csv')]).stdout);
    expect(early.complete).toBe(false);
    expect(early.field.stoppedBy).toBe('targets');
    expect(early.field.computedVertices).toBeLessThan(121);
    expect(early.field.notComputedVertices).toBe(121 - early.field.computedVertices);
    expect(early.details.faceFraction).toBeLessThan(full.details.faceFraction);
    expect(full.complete).toBe(true);
    expect(full.field.computedVertices).toBe(121);
    expect(full.field.unreachableVertices).toBe(0);
    expect(early.targets[0].distance).toBe(full.targets[0].distance);
    expect(early.field.max).toBeLessThanOrEqual(full.field.max);
    const text = runCli(args);
    expect(text.stdout).toMatch(/stopped once the targets were final: \d+ of 121 vertices computed \(min 0, mean [\d.]+, max [\d.]+ over those\); give -o for every vertex/);
  });
});
