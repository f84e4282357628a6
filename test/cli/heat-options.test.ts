/**
 * End-to-end checks of the heat options of `distance` (issue #8 items 5 and 9).
 * Known answers: on a flat annulus the distance to its boundary is the distance
 * to the nearest rim, min(R − r, r − r_hole) (elementary).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './run-cli.js';
import { annulus } from '../fixtures/holed-plates.js';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-heat-'));
  const s = annulus(10, 3, 0.5);
  const L: string[] = [];
  for (let i = 0; i < s.positions.length; i += 3) L.push(`v ${s.positions[i]} ${s.positions[i + 1]} 0`);
  for (let f = 0; f < s.triangles.length; f += 3) L.push(`f ${s.triangles[f]! + 1} ${s.triangles[f + 1]! + 1} ${s.triangles[f + 2]! + 1}`);
  writeFileSync(join(dir, 'annulus.obj'), L.join('\n') + '\n');
});

describe('distance --method heat options', () => {
  it('--from boundary on an annulus: every rim is the zero level, each --heat-boundary mode within 3%, and the modes differ', () => {
    const values: number[][] = [];
    for (const mode of ['average', 'neumann', 'dirichlet']) {
      const r = runCli(['distance', join(dir, 'annulus.obj'), '--from', 'boundary', '--method', 'heat', '--heat-boundary', mode,
        '--to', 'p:6.5,0,0', '--to', 'p:0,-5,0', '--to', 'p:-8.5,0,0', '--json']);
      expect(r.code).toBe(0);
      const d = JSON.parse(r.stdout).targets.map((t: { distance: number }) => t.distance);
      // nearest rim: 3.5 at r = 6.5 (both rims), 2 at r = 5 (hole), 1.5 at r = 8.5 (outer rim)
      [3.5, 2, 1.5].forEach((g, i) => expect(Math.abs(d[i] - g) / g).toBeLessThan(0.03));
      values.push(d);
    }
    const spread = Math.max(...values.map((v) => Math.abs(v[0]! - values[1]![0]!)), ...values.map((v) => Math.abs(v[1]! - values[1]![1]!)));
    expect(spread).toBeGreaterThan(1e-4);
  });

  it('--time-scale values that cannot give a distance are refused with exit 2 and one line naming the option', () => {
    // issue #8 item 9: 1e-200 printed 21.3 for a true 150.6 and 1e-300 all zeros, both with exit 0
    for (const m of ['1e-200', '1e-300', '1e300']) {
      const r = runCli(['distance', join(dir, 'annulus.obj'), '--from', 'v:0', '--method', 'heat', '--time-scale', m, '--json']);
      expect(r.code).toBe(2);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).toContain('--time-scale');
    }
  });
});
