/**
 * `offset --from-polyline` reads back the scribe lines `straight` writes
 * (CSV and OBJ), and refuses a genuinely bad polyline file naming the file
 * and line; a reference nearly normal to the surface is refused by
 * `straight`; the offset round a point inside a face of the cup's floor is
 * found (it crosses no vertex's level). Checks are of the contract (exit
 * codes, one-line errors): common practice, except where a source is named.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli, repoPath } from './run-cli.js';
import { checkSurfacePoint } from '../../src/mesh/surface-point.js';
import { buildTopology } from '../../src/mesh/build.js';
import { OrthodromeError } from '../../src/errors.js';

const cup = repoPath('meshes/px7-cup.ply');
let dir = '';
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'orthodrome-k-')); });

describe('straight → offset --from-polyline round trip on the cup', () => {
  for (const ext of ['csv', 'obj']) {
    it(`.${ext}: the scribe line written by straight is accepted as a source (exit 0, curves found)`, () => {
      const f = join(dir, `scribe.${ext}`);
      const w = runCli(['straight', cup, '--from', 'v:10', '--toward', '12,30,5', '--length', '40', '-o', f]);
      expect(w.code, w.stderr).toBe(0);
      const r = runCli(['offset', cup, '--from-polyline', f, '--distance', '2', '--json']);
      expect(r.code, r.stderr).toBe(0);
      const j = JSON.parse(r.stdout);
      expect(j.curves.length).toBeGreaterThan(0);
      // the offset at D of a line of length 40 is at least its two sides (Steiner's formula, 2L + 2πD on a plane)
      expect(j.curves.reduce((s: number, c: { length: number }) => s + c.length, 0)).toBeGreaterThan(2 * 40 * 0.9);
    });
  }
  it('a bad number in a polyline file: exit 2, one line naming the file and line', () => {
    const f = join(dir, 'bad.csv');
    writeFileSync(f, 'x,y,z\n4.7,3.6,0\nabc,5,0\n');
    const r = runCli(['offset', cup, '--from-polyline', f, '--distance', '2']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain(`${f}:3`);
  });
  it('the validator still refuses a real negative barycentric coordinate (−0.1)', () => {
    const { topology } = buildTopology(Uint32Array.from([0, 1, 2]), 3);
    let err: unknown;
    try { checkSurfacePoint({ kind: 'face', face: 0, bary: [-0.1, 0.6, 0.5] }, topology); } catch (e) { err = e; }
    expect((err as OrthodromeError).code).toBe('USAGE');
  });
});

describe('straight --reference nearly normal to the surface', () => {
  it('v:10 on the cup floor with --reference 0,0,1: exit 2, one line', () => {
    const r = runCli(['straight', cup, '--from', 'v:10', '--heading', '5', '--reference', '0,0,1', '--length', '4']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/nearly normal to the surface/);
  });
});

describe('offset round a point inside a face of the cup floor (f:7), D = 0.2', () => {
  it('exact: one closed curve, length 2πD (a circle: the floor is flat to the scan noise, 0.005 in z; tolerance 1e-3, common practice)', () => {
    const r = runCli(['offset', cup, '--from', 'f:7:0.3,0.3,0.4', '--distance', '0.2', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.curves).toHaveLength(1);
    expect(j.curves[0].closed).toBe(true);
    expect(Math.abs(j.curves[0].length / (2 * Math.PI * 0.2) - 1)).toBeLessThan(1e-3);
  });
  it('heat: no curve, and the text says the distance is below the field\'s resolution, not that nothing lies there', () => {
    const r = runCli(['offset', cup, '--from', 'f:7:0.3,0.3,0.4', '--distance', '0.2', '--method', 'heat']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/below the heat field's resolution near a source/);
    expect(r.stdout).not.toMatch(/nothing on the surface lies/);
  });
});

