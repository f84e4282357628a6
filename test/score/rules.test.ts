/**
 * The rules file of `score`: what it accepts, every kind of typo refused with
 * the rule named (never a silent pass), and gates checked on metric values.
 */
import { describe, expect, it } from 'vitest';
import { parseRules, checkGates, groupsOfRules, type LandmarkResult } from '../../src/score/index.js';

const rules = (o: unknown) => JSON.stringify(o);

describe('parseRules', () => {
  it('reads genus == 0, minimum angle >= 10°, between, tolerance, true/false and a landmark tolerance', async () => {
    const r = await parseRules(
      rules({
        rules: [
          { name: 'closed', metric: 'genus', op: '==', value: 0 },
          { name: 'angles', metric: 'minAngleDeg', op: '>=', value: 10 },
          { metric: 'triangles', op: 'between', value: [100, 2000] },
          { name: 'area', metric: 'area', op: '==', value: 6, tolerance: 1e-6 },
          { name: 'oriented', metric: 'orientable', op: '==', value: true },
          { name: 'nominals', landmarks: { tolerance: 0.05 } },
        ],
      }),
      'r.json',
    );
    expect(r.map((x) => x.name)).toEqual(['closed', 'angles', 'triangles between [100, 2000]', 'area', 'oriented', 'nominals']);
    expect(groupsOfRules(r).sort()).toEqual(['health', 'landmarks']);
  });

  const bad: [string, unknown, RegExp][] = [
    ['a misspelt metric, with a hint', { rules: [{ name: 'angles', metric: 'minAngelDeg', op: '>=', value: 10 }] }, /r\.json: rule 1 \('angles'\): unknown metric 'minAngelDeg' \(did you mean 'minAngleDeg'\?\)/],
    ['a misspelt key', { rules: [{ name: 'g', metric: 'genus', op: '==', valeu: 0 }] }, /rule 1 \('g'\).*(valeu|value)/],
    ['an unknown operator', { rules: [{ metric: 'genus', op: '=', value: 0 }] }, /rule 1: op/],
    ['between with one value', { rules: [{ metric: 'area', op: 'between', value: 3 }] }, /rule 1: "between" needs/],
    ['between reversed', { rules: [{ metric: 'area', op: 'between', value: [3, 1] }] }, /LOW <= HIGH/],
    ['a number for a true/false metric', { rules: [{ metric: 'orientable', op: '==', value: 1 }] }, /true\/false/],
    ['a string value', { rules: [{ metric: 'genus', op: '==', value: '0' }] }, /rule 1: value/],
    ['tolerance with <=', { rules: [{ metric: 'area', op: '<=', value: 3, tolerance: 1 }] }, /"tolerance" goes with "==" only/],
    ['a landmark rule with neither tolerance', { rules: [{ name: 'lm', landmarks: {} }] }, /rule 1 \('lm'\): a landmark rule needs exactly one/],
    ['a misspelt landmark key', { rules: [{ landmarks: { tolerence: 0.1 } }] }, /rule 1: .*tolerence/],
    ['two rules with one name', { rules: [{ name: 'x', metric: 'genus', op: '==', value: 0 }, { name: 'x', metric: 'area', op: '>=', value: 0 }] }, /rule 2 \('x'\): another rule has this name/],
    ['a misspelt top-level key', { rule: [] }, /r\.json: expected \{ "rules"/],
  ];
  for (const [what, json, re] of bad) {
    it(`refuses ${what}, naming the rule (INPUT)`, async () => {
      await expect(parseRules(rules(json), 'r.json')).rejects.toThrow(re);
      await expect(parseRules(rules(json), 'r.json')).rejects.toMatchObject({ code: 'INPUT' });
    });
  }

  it('a JSON syntax error names the line and column', async () => {
    await expect(parseRules('{ "rules": [\n  { "metric": "genus", }\n] }', 'r.json')).rejects.toThrow(/r\.json:2:\d+: not valid JSON/);
  });
});

const parsed = await parseRules(
  rules({
    rules: [
      { name: 'closed', metric: 'genus', op: '==', value: 0 },
      { name: 'angles', metric: 'minAngleDeg', op: '>=', value: 10 },
      { name: 'size', metric: 'triangles', op: 'between', value: [10, 20] },
      { name: 'area', metric: 'area', op: '==', value: 6, tolerance: 1e-6 },
      { name: 'lm', landmarks: { tolerance: 0.05 } },
    ],
  }),
  'r.json',
);

describe('checkGates', () => {
  const lm = (deviation: number | null, tolerance?: number): LandmarkResult => ({
    name: 'a', from: 'v:0', to: 'v:1', nominal: 1, ...(tolerance !== undefined ? { tolerance } : {}),
    measured: deviation === null ? null : 1 + deviation, deviation, relDeviation: deviation === null ? null : Math.abs(deviation),
  });

  it('passes inside the bounds (ends included) and fails outside, with how far', () => {
    const ok = checkGates(parsed, { genus: 0, minAngleDeg: 10, triangles: 20, area: 6 + 5e-7 }, [lm(0.05)]);
    expect(ok.map((g) => g.pass)).toEqual([true, true, true, true, true]);
    const bad = checkGates(parsed, { genus: 1, minAngleDeg: 4, triangles: 25, area: 6.1 }, [lm(-0.2)]);
    expect(bad.map((g) => g.pass)).toEqual([false, false, false, false, false]);
    expect(bad[1]!.excess).toBeCloseTo(6, 12);
    expect(bad[1]!.detail).toBe('measured 4, needs >= 10');
    expect(bad[2]!.excess).toBe(5);
    expect(bad[4]!.excess).toBeCloseTo(0.15, 12);
  });

  it('a value the mesh does not have (null genus) fails; no landmark pairs fail unless missing: pass', async () => {
    const g = checkGates(parsed, { genus: null, minAngleDeg: 30, triangles: 12, area: 6 }, []);
    expect(g[0]).toMatchObject({ pass: false, excess: Infinity });
    expect(g[4]).toMatchObject({ pass: false, detail: 'no landmark pairs given for this mesh' });
    const lenient = await parseRules(rules({ rules: [{ landmarks: { relative: 0.01, missing: 'pass' } }] }), 'r.json');
    expect(checkGates(lenient, {}, [])[0]!.pass).toBe(true);
  });

  it("a pair's own tolerance replaces the rule's; an unreachable pair fails", () => {
    expect(checkGates(parsed, {}, [lm(0.2, 0.3)])[4]!.pass).toBe(true);
    expect(checkGates(parsed, {}, [lm(null)])[4]).toMatchObject({ pass: false, excess: Infinity });
  });
});
