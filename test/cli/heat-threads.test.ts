/**
 * `distance` and `offset --method heat` with the heat method's
 * factorizations on a worker thread (cli/jobs.ts factorThreads) against the
 * same commands on one thread. The thread runs the same kernel on the same
 * values, so the output files must be byte-identical (same operations in the
 * same order give the same IEEE 754 results: common practice).
 *
 * The threshold (200k unknowns) is far above a unit-test mesh; the test-only
 * variable ORTHODROME_TEST_FACTOR_MIN_SIZE=0 lowers it and stops the caller
 * from taking the job back, so the worker does factor. `prepare.factorThreadJobs`
 * in the JSON output says how many factorizations ran on another thread.
 */
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './run-cli.js';
import { terrain } from '../fixtures/shapes.js';

const VAR = 'ORTHODROME_TEST_FACTOR_MIN_SIZE';
let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-heat-threads-'));
  const s = terrain(24, 20, 10, 8, (x, y) => 0.6 * Math.sin(0.7 * x) * Math.cos(0.5 * y));
  const L: string[] = [];
  for (let i = 0; i < s.positions.length; i += 3) L.push(`v ${s.positions[i]} ${s.positions[i + 1]} ${s.positions[i + 2]}`);
  for (let f = 0; f < s.triangles.length; f += 3) L.push(`f ${s.triangles[f]! + 1} ${s.triangles[f + 1]! + 1} ${s.triangles[f + 2]! + 1}`);
  writeFileSync(join(dir, 'hill.obj'), L.join('\n') + '\n');
});
afterEach(() => {
  delete process.env[VAR];
});

/** Runs `distance` writing a CSV; returns the file's bytes and the JSON report. */
function distance(threads: boolean, mode: string, tag: string): { csv: string; json: { prepare: Record<string, unknown>; targets: { distance: number }[] } } {
  if (threads) process.env[VAR] = '0';
  else delete process.env[VAR];
  const out = join(dir, `${tag}.csv`);
  const r = runCli(['distance', join(dir, 'hill.obj'), '--from', 'p:2,2', '--method', 'heat', '--heat-boundary', mode, '--to', 'p:8,6', '-o', out, '--json']);
  expect(r.stderr).toBe('');
  expect(r.code).toBe(0);
  return { csv: readFileSync(out, 'utf8'), json: JSON.parse(r.stdout) };
}

describe('heat factorizations on a worker thread from the CLI', () => {
  it.each([
    ['average'], // natural + Dirichlet as a pair here, Poisson on the thread (neumann, two factors: test/geodesic/heat-threads.test.ts)
  ])('distance --heat-boundary %s: the same bytes with and without the thread', (mode) => {
    const one = distance(false, mode, `${mode}-one`);
    const two = distance(true, mode, `${mode}-two`);
    expect(one.json.prepare.factorThreadJobs).toBe(0);
    expect(two.json.prepare.factorThreadJobs).toBe(1);
    expect(two.csv).toBe(one.csv);
    expect(two.json.targets[0]!.distance).toBe(one.json.targets[0]!.distance);
    // the straight-line chord bounds a surface distance from below (elementary): the field is a distance, not zeros
    expect(one.json.targets[0]!.distance).toBeGreaterThan(Math.hypot(6, 4) * 0.97);
  });

  it('offset --method heat (the facade path isolines shares): the same bytes with and without the thread', () => {
    const outputs: string[] = [];
    for (const threads of [false, true]) {
      if (threads) process.env[VAR] = '0';
      const off = join(dir, `off-${threads}.csv`);
      const b = runCli(['offset', join(dir, 'hill.obj'), '--from', 'p:2,2', '--method', 'heat', '--distance', '3', '-o', off]);
      expect([b.code, b.stderr]).toEqual([0, '']);
      outputs.push(readFileSync(off, 'utf8'));
    }
    expect(outputs[1]).toBe(outputs[0]);
    expect(outputs[0]!.split('\n').length).toBeGreaterThan(10); // a closed curve around the source, many points
  });
});
