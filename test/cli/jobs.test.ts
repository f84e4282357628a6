/**
 * `distance --each --jobs N` (cli/jobs.ts): source sets solved in worker
 * threads give the same output as `--jobs 1`, byte for byte, and the right
 * numbers: on a flat convex patch the geodesic distance is the Euclidean one
 * (elementary: the straight segment lies in the surface and is shortest).
 * Bad `--jobs` values are usage errors (exit 2, one line).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './run-cli.js';
import { flatGrid } from '../fixtures/shapes.js';

let dir = '';
const square = flatGrid(16, 16, 8, 8, 0.3, 7); // 17 × 17 vertices over 8 × 8 units, interior jittered
const sources = [0, 144, 288, 50];

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-jobs-'));
  const L: string[] = [];
  const P = square.positions, T = square.triangles;
  for (let i = 0; i < P.length; i += 3) L.push(`v ${P[i]} ${P[i + 1]} ${P[i + 2]}`);
  for (let f = 0; f < T.length; f += 3) L.push(`f ${T[f]! + 1} ${T[f + 1]! + 1} ${T[f + 2]! + 1}`);
  writeFileSync(join(dir, 'square.obj'), L.join('\n') + '\n');
});

function run(method: string, jobs: number, out: string): { stdout: string; csv: string } {
  const from = sources.flatMap((v) => ['--from', `v:${v}`]);
  const r = runCli(['distance', join(dir, 'square.obj'), ...from, '--each', '--method', method, '--jobs', String(jobs), '--to', 'v:200', '-o', join(dir, out), '--json']);
  expect(r.stderr).toBe('');
  expect(r.code).toBe(0);
  return { stdout: r.stdout, csv: readFileSync(join(dir, out), 'utf8') };
}

/** The JSON without wall times (timings, any `…Ms` figure) and the output path, which differ from run to run. */
const sansTimings = (s: string): unknown =>
  JSON.parse(s, (k, v: unknown) => (k === 'timings' || k === 'output' || k.endsWith('Ms') ? undefined : v));

describe('distance --each --jobs', () => {
  it('exact: two workers give the Euclidean distances, identical to one job', () => {
    const one = run('exact', 1, 'exact1.csv');
    const two = run('exact', 2, 'exact2.csv');
    expect(two.csv).toBe(one.csv);
    expect(sansTimings(two.stdout)).toEqual(sansTimings(one.stdout));
    // flat convex domain: geodesic = Euclidean distance (elementary), to rounding scaled by the 8-unit size
    const rows = two.csv.trim().split('\n').slice(1).map((l) => l.split(',').map(Number));
    const P = square.positions;
    let worst = 0;
    for (const row of rows) {
      const v = row[0]!;
      sources.forEach((s, i) => {
        const d = Math.hypot(P[3 * v]! - P[3 * s]!, P[3 * v + 1]! - P[3 * s + 1]!);
        worst = Math.max(worst, Math.abs(row[4 + i]! - d));
      });
    }
    expect(rows.length).toBe(17 * 17);
    expect(worst).toBeLessThan(8 * 1e-12);
    const j = JSON.parse(two.stdout) as { sets: { targets: { distance: number }[] }[] };
    expect(j.sets).toHaveLength(sources.length);
    sources.forEach((s, i) => {
      const d = Math.hypot(P[3 * 200]! - P[3 * s]!, P[3 * 200 + 1]! - P[3 * s + 1]!);
      expect(Math.abs(j.sets[i]!.targets[0]!.distance - d)).toBeLessThan(8 * 1e-12);
    });
  });

  it('heat: three workers for four sets give the same fields as one job', () => {
    const one = run('heat', 1, 'heat1.csv');
    const three = run('heat', 3, 'heat3.csv');
    expect(three.csv).toBe(one.csv);
    expect(sansTimings(three.stdout)).toEqual(sansTimings(one.stdout));
  });

  it('a Möbius strip (double cover) with a triangle pinched on at one vertex (split, relayed): workers as one job', () => {
    // strip of 24 cells, width 0.4, around the unit circle; the half twist swaps the rows at the end
    const L: string[] = [], n = 24, w = 0.4;
    for (let i = 0; i < n; i++) {
      const th = (2 * Math.PI * i) / n;
      for (const s of [-1, 1]) {
        const r = 1 + (s * w * Math.cos(th / 2)) / 2;
        L.push(`v ${r * Math.cos(th)} ${r * Math.sin(th)} ${(s * w * Math.sin(th / 2)) / 2}`);
      }
    }
    for (let i = 0; i < n; i++) {
      const a = 2 * i + 1, b = a + 1, [c, d] = i < n - 1 ? [a + 2, a + 3] : [2, 1];
      L.push(`f ${a} ${c} ${d}`, `f ${a} ${d} ${b}`);
    }
    L.push('v 0.5 -0.3 0.2', 'v 0.5 0.3 0.2', 'f 1 49 50'); // touches the strip at vertex 1 only
    writeFileSync(join(dir, 'pinched-strip.obj'), L.join('\n') + '\n');
    const args = (jobs: number) => ['distance', join(dir, 'pinched-strip.obj'), '--split-nonmanifold', '--from', 'v:48', '--from', 'v:25', '--from', 'v:10', '--each', '--jobs', String(jobs), '--json', '-o', join(dir, `strip${jobs}.csv`)];
    const one = runCli(args(1)), two = runCli(args(2));
    expect(one.code).toBe(0);
    expect(two.code).toBe(0);
    expect(readFileSync(join(dir, 'strip2.csv'), 'utf8')).toBe(readFileSync(join(dir, 'strip1.csv'), 'utf8'));
    expect(sansTimings(two.stdout)).toEqual(sansTimings(one.stdout));
    const j = JSON.parse(two.stdout) as { prepare: { doubleCover?: boolean }; sets: { field: { unreachableVertices: number } }[] };
    expect(j.prepare.doubleCover).toBe(true);
    for (const s of j.sets) expect(s.field.unreachableVertices).toBe(0); // the pinch joins the triangle to the strip
  });

  it('a worker that hits the memory budget: exit 3, one line naming the budget and how --jobs shares it', () => {
    const r = runCli(['distance', join(dir, 'square.obj'), '--from', 'v:0', '--from', 'v:5', '--each', '--jobs', '2', '--memory-budget', '16K']);
    expect(r.code).toBe(3);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/memory budget/);
    expect(r.stderr).toMatch(/--jobs 2/);
  });

  it('refuses --jobs 0, a fraction, and --jobs without --each (exit 2, one line)', () => {
    for (const args of [['--each', '--jobs', '0'], ['--each', '--jobs', '1.5'], ['--jobs', '2']]) {
      const r = runCli(['distance', join(dir, 'square.obj'), '--from', 'v:0', '--from', 'v:5', ...args]);
      expect(r.code).toBe(2);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).toMatch(/--jobs/);
    }
  });
});
