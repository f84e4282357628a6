/**
 * `inspect --require KEY OP VALUE` gates: pass (exit 0), fail (exit 1 with
 * each failed requirement and its measured value), typo (exit 2, before any
 * work), and the parser on its own.
 *
 * Known answers: a closed icosphere has genus 0 and χ = 2 (Euler's
 * polyhedron formula); a grid of unit squares cut by one diagonal has right
 * isosceles triangles, so its smallest angle is 45° and its largest 90°
 * (elementary); an open cylinder has 2 boundary loops (elementary topology).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './run-cli.js';
import { flatGrid, icosphere, cylinder, objText } from '../fixtures/shapes.js';
import { parseRequirement, checkRequirements } from '../../src/report/require.js';
import { isOrthodromeError } from '../../src/errors.js';

let dir = '';
const codeOf = (fn: () => unknown): string | undefined => {
  try {
    fn();
  } catch (e) {
    return isOrthodromeError(e) ? e.code : 'other';
  }
  return undefined;
};

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-gates-'));
  writeFileSync(join(dir, 'ball.obj'), objText(icosphere(2, 3)));
  writeFileSync(join(dir, 'grid.obj'), objText(flatGrid(4, 4, 4, 4)));
  writeFileSync(join(dir, 'tube.obj'), objText(cylinder(24, 6, 1, 4)));
});

describe('inspect --require', () => {
  it('every requirement holds: exit 0, each listed with its measured value', () => {
    const r = runCli(['inspect', join(dir, 'ball.obj'), '--require', 'genus==0', '--require', 'eulerCharacteristic==2', '--require', 'boundaryLoops<1', '--require', 'orientable==true']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/requirements: 4 of 4 passed/);
    expect(r.stdout).toMatch(/pass genus==0: measured 0/);
    expect(r.stderr).toBe('');
  });

  it('a failed requirement: exit 1, the report still printed, one stderr line with each failure and its measured value', () => {
    const r = runCli(['inspect', join(dir, 'grid.obj'), '--require', 'minAngleDeg>=44.9', '--require', 'minAngleDeg>=46', '--require', 'maxAngleDeg<=89', '--require', 'genus==0']);
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/requirements: 2 of 4 passed/);
    expect(r.stdout).toMatch(/FAIL minAngleDeg>=46: measured 45\b/);
    expect(r.stdout).toMatch(/FAIL maxAngleDeg<=89: measured 90\b/);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/2 of 4 requirement\(s\) failed: minAngleDeg>=46 \(measured 45\); maxAngleDeg<=89 \(measured 90\)/);
    // --json carries the outcome of each requirement
    const j = JSON.parse(runCli(['inspect', join(dir, 'tube.obj'), '--json', '--require', 'boundaryLoops==2', '--require', 'boundaryLoops>2']).stdout);
    expect(j.requirements.map((q: { pass: boolean; measured: number }) => [q.pass, q.measured])).toEqual([[true, 2], [false, 2]]);
  });

  it('a typo in the key or the operator is exit 2 naming it, never a silent pass', () => {
    const key = runCli(['inspect', join(dir, 'ball.obj'), '--require', 'genos==0']);
    expect(key.code).toBe(2);
    expect(key.stderr).toMatch(/'genos' is not a key of the report; keys: .*genus/);
    expect(key.stdout).toBe('');
    for (const bad of ['genus=0', 'minAngleDeg=>10']) { // more spellings in the parser test below
      const r = runCli(['inspect', join(dir, 'ball.obj'), '--require', bad]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain(`'${bad}'`);
      expect(r.stdout).toBe(''); // refused before any work
    }
  });
});

describe('requirement parser and checker', () => {
  const report = { genus: null as number | null, orientable: false, edgeLength: { min: 0.5, max: 2 }, file: 'x.obj', locations: { faces: [1, 2] } };
  it('reads the five operators, numbers and true/false', () => {
    expect(parseRequirement(' edgeLength.min >= 1e-3 ')).toMatchObject({ key: 'edgeLength.min', op: '>=', value: 0.001 });
    for (const op of ['<=', '>=', '==', '<', '>']) expect(parseRequirement(`genus${op}0`).op).toBe(op);
    expect(parseRequirement('orientable==true').value).toBe(true);
    for (const bad of ['genus', 'genus!=0', 'genus==', '==0', 'genus=<0', 'genus==zero', 'genus<=0x1', 'orientable>=true', 'genus==0 1']) expect(codeOf(() => parseRequirement(bad))).toBe('USAGE');
  });
  it('checks nested keys; a null measure fails; non-number keys and mismatched bounds are usage errors', () => {
    const res = checkRequirements(report, ['edgeLength.max<=2', 'edgeLength.min>0.5', 'genus==0', 'orientable==false'].map((t) => parseRequirement(t)));
    expect(res.map((r) => r.pass)).toEqual([true, false, false, true]);
    expect(res[2]!.measured).toBeNull();
    for (const bad of ['file==1', 'locations==1', 'edgeLength==1', 'nothing==1', 'orientable==1', 'edgeLength.min==true']) {
      expect(codeOf(() => checkRequirements(report, [parseRequirement(bad)]))).toBe('USAGE');
    }
  });
});
