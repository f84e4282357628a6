/**
 * The bundled `score` demo (meshes/score-demo/): the three sound parts pass
 * every gate, their landmark pairs meet closed-form nominals (plane geometry
 * on each part's unfolding), and the part from the worn die fails exactly
 * the gates it was made to fail.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { loadSurface } from '../../src/index.js';
import { parseManifest, parseRules, scoreSurface, checkGates, groupsOfRules, orderGroups, DEFAULT_GROUPS } from '../../src/score/index.js';
import { repoPath } from '../cli/run-cli.js';

const dir = repoPath('meshes/score-demo');

describe('score demo', () => {
  it('three parts pass, the worn-die lid fails min-angle and no-duplicates; nominals within 0.001 mm', async () => {
    const rules = await parseRules(readFileSync(join(dir, 'rules.json'), 'utf8'), 'rules.json');
    const groups = orderGroups([...DEFAULT_GROUPS, ...groupsOfRules(rules)]);
    const failed: Record<string, string[]> = {};
    for (const e of parseManifest(readFileSync(join(dir, 'parts.csv'), 'utf8'), 'parts.csv')) {
      const s = await loadSurface(join(dir, e.path));
      const r = await scoreSurface(s, { groups, landmarks: e.landmarks });
      // 3-4-5 across the lid's top (50), the bracket unfolded √(45² + 20²), the washer's rim-to-rim past the hole
      for (const l of r.landmarks) expect(Math.abs(l.deviation!), `${e.path} ${l.name}`).toBeLessThan(1e-3);
      failed[e.path] = checkGates(rules, r.metrics, r.landmarks).filter((g) => !g.pass).map((g) => g.rule.name);
    }
    expect(failed).toEqual({
      'px7-lid.obj': [], 'px7-bracket.obj': [], 'px7-washer.obj': [],
      'px7-lid-defect.obj': ['min-angle-10deg', 'no-duplicates'],
    });
  });
});
