/**
 * Several factorizations of one analysis on several threads at once: the
 * caller and an executor's threads (executor.ts) run one task plan
 * (multifrontal-plan.ts) over shared memory (multifrontal-tasks.ts). The
 * heat method's natural and Dirichlet matrices stay a pair sharing blocks
 * (multifrontal-pair.ts), and every factor is bit-identical to the serial
 * one. Subtrees of the elimination tree are independent (Liu, SIAM Review 34,
 * 1992, §8), and so are the factorizations, so two threads share the work
 * of all of them, top supernodes included (a pair's two fronts at one
 * supernode are two tasks).
 */
import type { CscMatrix } from './csc.js';
import { scatterValues, type CholeskySymbolic } from './symbolic.js';
import { affectedBlocks } from './multifrontal-pair.js';
import { exponentShift, pow2 } from './exponent-shift.js';
import { planFactorTasks, type PlanGroup } from './multifrontal-plan.js';
import { C_FAILED, C_WORDS, runFactorTasks, taskWorkspace, type TaskFactor, type TaskRun } from './multifrontal-tasks.js';
import type { MultifrontalWork } from './multifrontal.js';
import type { FactorExecutor } from './executor.js';

/** L's blocks per matrix (the second of a pair compact, with `own`), or null when a pivot failed or a thread stalled. */
export interface ThreadedFactors {
  readonly lx: Float64Array[];
  readonly own: Int32Array | null;
}

/**
 * Factors `mats` (LOWER triangles of the analysed pattern; supernodal
 * analysis, no pivot floors) with `ex`'s threads; with `pair`, mats[0] and
 * mats[1] as a pair. Throws `USAGE` for a wrong pattern; returns null when
 * the run failed (a pivot, or a stalled thread): the caller then factors
 * serially into fresh storage, which also gives the serial error.
 */
export function factorOnThreads(
  sym: CholeskySymbolic, mats: readonly CscMatrix[], pair: boolean, ex: FactorExecutor, simd: boolean, mainWork: MultifrontalWork | null,
): ThreadedFactors | null {
  const sn = sym.supernodal!;
  const ints = (k: number) => new Int32Array(ex.shared(Math.ceil(k / 2) + 1).buffer, 0, k);
  // each matrix moved to the top of the double range (exponent-shift.ts); a pair with one shift
  const shifts = mats.map((A) => exponentShift(A.values));
  if (pair) shifts[0] = shifts[1] = Math.min(shifts[0]!, shifts[1]!);
  const cx = mats.map((A, k) => {
    const c = ex.shared(sym.cRowIdx.length);
    scatterValues(sym, A, c, null, 0, shifts[k]);
    return c;
  });
  const full = sn.valPtr[sn.nsuper]!;
  let own: Int32Array | null = null, second = full;
  if (pair) ({ own, total: second } = affectedBlocks(sn, sym.cColPtr, cx[0]!, cx[1]!));
  const factors: TaskFactor[] = cx.map((c, k) => ({ cx: c, lx: ex.shared(pair && k === 1 ? second : full), own: pair && k === 1 ? own : null, unscale: pow2(-shifts[k]!) }));
  const groups: PlanGroup[] = [];
  for (let k = 0; k < mats.length; k++) {
    if (pair && k === 0) {
      groups.push({ factors: [0, 1], own });
      k++;
    } else groups.push({ factors: [k], own: null });
  }
  const plan = planFactorTasks(sn, groups);
  const pending = ints(plan.ntasks);
  pending.set(plan.deps);
  const shared = { plan, groups, factors, slots: ex.shared(plan.slotTotal), ctl: ints(C_WORDS), state: ints(plan.ntasks), pending };
  const run: TaskRun = { sn, cp: sym.cColPtr, ci: sym.cRowIdx, ...shared };
  const { hold, done } = ex.join!({ sym, run: shared, simd });
  try {
    runFactorTasks(run, taskWorkspace(sym.n, sn, simd, mainWork), { holdForWorker: hold });
  } finally {
    done();
  }
  if (Atomics.load(run.ctl, C_FAILED) !== 0) return null;
  return { lx: factors.map((f) => f.lx), own };
}
