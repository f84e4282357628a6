/**
 * The task plan of a multifrontal factorization on several threads
 * (multifrontal-plan.ts) and its tasks (multifrontal-tasks.ts), on one thread:
 * tasks are run by hand in a scrambled order that respects their inputs, with
 * two workspaces taking turns (as two threads would), and every factor must
 * be bit-identical to the serial sweep (same operations in the same order
 * give the same IEEE 754 results: common practice). Disjoint subtrees of the
 * elimination tree are independent (Liu, SIAM Review 34, 1992, §8), which is
 * what the plan's structure checks below spell out.
 */
import { describe, expect, it } from 'vitest';
import { analyzeCholesky, CholeskyFactor } from '../../src/linalg/index.js';
import { scatterValues } from '../../src/linalg/symbolic.js';
import { affectedBlocks } from '../../src/linalg/multifrontal-pair.js';
import { planFactorTasks, TASK_NODE, TASK_SUB, type PlanGroup } from '../../src/linalg/multifrontal-plan.js';
import { C_WORDS, runFactorTask, runFactorTasks, taskWorkspace, type TaskRun } from '../../src/linalg/multifrontal-tasks.js';
import { blocksToCsc } from '../../src/linalg/supernodes.js';
import { rng } from '../fixtures/shapes.js';
import { gridLaplacianLower, withIdentityRows } from './helpers.js';

function sameBits(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

const nx = 64;
const A = gridLaplacianLower(nx, nx, 0.02, true, 21);
const onRim = (v: number) => v % nx === 0 || v % nx === nx - 1 || v < nx || v >= nx * (nx - 1);
const B = withIdentityRows(A, onRim);
const P = gridLaplacianLower(nx, nx, 1e-3, true, 22); // other values, same pattern
const sym = analyzeCholesky(A);
const sn = sym.supernodal!;

/** The run's shared state over plain arrays (one thread), factors 0, 1 a pair and 2 alone. */
function setUp(opts: { slices?: number; maxTop?: number }) {
  const cx = [A, B, P].map((M) => {
    const c = new Float64Array(sym.cRowIdx.length);
    scatterValues(sym, M, c, null, 0);
    return c;
  });
  const { own, total } = affectedBlocks(sn, sym.cColPtr, cx[0]!, cx[1]!);
  const full = sn.valPtr[sn.nsuper]!;
  const groups: PlanGroup[] = [{ factors: [0, 1], own }, { factors: [2], own: null }];
  const plan = planFactorTasks(sn, groups, opts);
  const run: TaskRun = {
    sn, cp: sym.cColPtr, ci: sym.cRowIdx, plan, groups,
    factors: cx.map((c, k) => ({ cx: c, lx: new Float64Array(k === 1 ? total : full), own: k === 1 ? own : null, unscale: 1 })),
    slots: new Float64Array(plan.slotTotal), ctl: new Int32Array(C_WORDS), state: new Int32Array(plan.ntasks), pending: plan.deps.slice(),
  };
  return { run, own, plan };
}

describe('multifrontal task plan', () => {
  it('covers every supernode once per factor that stores it, children before parents', () => {
    const { plan, own } = setUp({ slices: 40, maxTop: 30 });
    expect(plan.topCount).toBeGreaterThan(3); // the cut went below the root
    const seen = [new Int32Array(sn.nsuper), new Int32Array(sn.nsuper), new Int32Array(sn.nsuper)];
    const factorsOf = [[0, 1], [2]];
    for (let t = 0; t < plan.ntasks; t++) {
      if (plan.kind[t] === TASK_SUB) {
        for (const f of factorsOf[plan.what[t]!]!) for (let s = plan.lo[t]!; s <= plan.node[t]!; s++) if (f !== 1 || own[s]! >= 0) seen[f]![s]!++;
      } else {
        expect(plan.kind[t]).toBe(TASK_NODE);
        seen[plan.what[t]!]![plan.node[t]!]!++;
      }
    }
    let wrong = 0;
    for (let f = 0; f < 3; f++) for (let s = 0; s < sn.nsuper; s++) if (seen[f]![s] !== (f === 1 && own[s]! < 0 ? 0 : 1)) wrong++;
    expect(wrong).toBe(0);
    // a task is listed after none of the tasks it waits for (the list is a valid serial order)
    let early = 0;
    for (let t = 0; t < plan.ntasks; t++) for (let i = plan.waitPtr[t]!; i < plan.waitPtr[t + 1]!; i++) if (plan.waiters[i]! <= t) early++;
    expect(early).toBe(0);
  });

  for (const [name, opts] of [['a fine cut', { slices: 64, maxTop: 64 }], ['the default cut', {}], ['no cut (one task per group)', { maxTop: 0 }]] as const) {
    it(`gives the serial factors to the bit, tasks interleaved on two workspaces: ${name}`, () => {
      const { run, plan, own } = setUp(opts);
      const ws = [taskWorkspace(sym.n, sn, true), taskWorkspace(sym.n, sn, true)];
      const r = rng(7);
      let turn = 0;
      for (let left = plan.ntasks; left > 0; left--) {
        const ready: number[] = [];
        for (let t = 0; t < plan.ntasks; t++) if (run.state[t] === 0 && run.pending[t] === 0) ready.push(t);
        expect(ready.length).toBeGreaterThan(0);
        const t = ready[Math.floor(r() * ready.length)]!; // any ready task, not the list's first
        run.state[t] = 2;
        expect(runFactorTask(run, ws[turn]!, t)).toBe(true);
        turn ^= 1;
        for (let i = plan.waitPtr[t]!; i < plan.waitPtr[t + 1]!; i++) run.pending[plan.waiters[i]!]!--;
      }
      const [sa, sb] = CholeskyFactor.factorPair(A, B, sym) as CholeskyFactor[];
      const sp = CholeskyFactor.factor(P, sym);
      expect(sameBits(blocksToCsc(sn, run.factors[0]!.lx).values, sa!.lowerFactor().values)).toBe(true);
      expect(sameBits(blocksToCsc(sn, run.factors[1]!.lx, own, run.factors[0]!.lx).values, sb!.lowerFactor().values)).toBe(true);
      expect(sameBits(blocksToCsc(sn, run.factors[2]!.lx).values, sp.lowerFactor().values)).toBe(true);
    });
  }

  it('runs the whole list on one thread through the loop, and stops at a failed pivot', () => {
    const { run, plan } = setUp({});
    expect(runFactorTasks(run, taskWorkspace(sym.n, sn, false))).toBe(plan.ntasks);
    expect(run.ctl[0]).toBe(plan.ntasks);
    // plain kernels here, SIMD there: both are checked against the serial factor of the same kernel
    expect(sameBits(blocksToCsc(sn, run.factors[2]!.lx).values, CholeskyFactor.factor(P, sym, { simd: false }).lowerFactor().values)).toBe(true);
    // a negative diagonal entry: the run reports a failure (the caller then factors serially)
    const bad = P.values.slice();
    for (let p = P.colPtr[100]!; p < P.colPtr[101]!; p++) if (P.rowIdx[p] === 100) bad[p] = -1;
    const again = setUp({});
    scatterValues(sym, { ...P, values: bad }, again.run.factors[2]!.cx, null, 0);
    const ran = runFactorTasks(again.run, taskWorkspace(sym.n, sn, true));
    expect(again.run.ctl[1]).toBe(1);
    expect(ran).toBeLessThanOrEqual(plan.ntasks);
  });
});
