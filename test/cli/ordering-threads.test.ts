/**
 * `distance --method heat` with the nested dissection's parts ordered on a
 * worker thread (cli/jobs.ts orderingThreads) against the same command on
 * one thread. The parts left by a separator are independent subproblems
 * (George, SIAM J. Numer. Anal. 10, 1973) and each is ordered by the same
 * deterministic code, so the ordering, hence every factor and the output
 * file, must be byte-identical (common practice).
 *
 * The threshold (200k vertices) is far above a unit-test mesh; the test-only
 * variable ORTHODROME_TEST_ORDERING_MIN_SIZE=0 lowers it and leaves every
 * part to the worker. `prepare.orderingThreadJobs` in the JSON output says
 * how many parts the worker ordered.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './run-cli.js';
import { objText, terrain } from '../fixtures/shapes.js';

const VAR = 'ORTHODROME_TEST_ORDERING_MIN_SIZE';
let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-ordering-threads-'));
  // 60×50 cells: 3111 vertices, enough for nested dissection to split (leaves of 512)
  writeFileSync(join(dir, 'hill.obj'), objText(terrain(60, 50, 10, 8, (x, y) => 0.6 * Math.sin(0.7 * x) * Math.cos(0.5 * y))));
});

function distance(threads: boolean, tag: string): { csv: string; json: { prepare: Record<string, unknown>; targets: { distance: number }[] } } {
  const out = join(dir, `${tag}.csv`);
  const env = process.env[VAR];
  if (threads) process.env[VAR] = '0';
  else delete process.env[VAR];
  try {
    const r = runCli(['distance', join(dir, 'hill.obj'), '--from', 'p:2,2', '--method', 'heat', '--to', 'p:8,6', '-o', out, '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    return { csv: readFileSync(out, 'utf8'), json: JSON.parse(r.stdout) };
  } finally {
    if (env === undefined) delete process.env[VAR];
    else process.env[VAR] = env;
  }
}

describe('nested dissection on a worker thread from the CLI', () => {
  it('distance --method heat: the same bytes with and without the thread', () => {
    const one = distance(false, 'one');
    const two = distance(true, 'two');
    expect(one.json.prepare.orderingThreadJobs).toBe(0);
    expect(two.json.prepare.orderingThreadJobs).toBe(2); // depth 1: both parts on the worker
    expect(two.csv).toBe(one.csv);
    expect(two.json.targets[0]!.distance).toBe(one.json.targets[0]!.distance);
    // the straight-line chord bounds a surface distance from below (elementary): the field is a distance, not zeros
    expect(one.json.targets[0]!.distance).toBeGreaterThan(Math.hypot(6, 4) * 0.97);
  });
});
