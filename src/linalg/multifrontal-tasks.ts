/**
 * Runs the tasks of a plan (multifrontal-plan.ts) on one thread; every
 * thread taking part (the caller and the executor's workers) runs this same
 * loop over the same shared state, so the work spreads itself: a thread takes
 * the first task in list order whose inputs are ready and that no other
 * thread has claimed (a compare-and-swap on its state word), runs it, and
 * releases the tasks waiting for it. SUB tasks are the serial sweeps
 * (multifrontal.ts, multifrontal-pair.ts) over a subtree; NODE tasks factor
 * one supernode from its children's update matrices in the slots, in the
 * serial order (Duff & Reid 1983; Liu 1992), so the result is the serial one
 * to the bit.
 *
 * Never throws for numeric trouble: a failed pivot sets the FAILED control
 * word, every thread stops taking tasks, and the caller factors serially.
 */
import type { SupernodalStructure } from './supernodes.js';
import { factorFront } from './dense-kernels.js';
import { assembleFront, extendAdd, multifrontalFactor, multifrontalWork, pushUpdate, storeBlock, updateOrder, type MultifrontalWork } from './multifrontal.js';
import { multifrontalPair } from './multifrontal-pair.js';
import { TASK_NODE, type PlanGroup, type TaskPlan } from './multifrontal-plan.js';

/** Control words (ctl): tasks done, failure (0 none, 1 pivot, 2 a thread stalled), heartbeat, worker tasks, worker started. */
export const C_DONE = 0, C_FAILED = 1, C_BEAT = 2, C_REMOTE = 3, C_STARTED = 4, C_WORDS = 5;
/** Task states. */
const FREE = 0, CLAIMED = 1, FINISHED = 2;

/** One factor's values: C in the analysed order, L's blocks (full, or compact with `own` for a pair's second). */
export interface TaskFactor {
  readonly cx: Float64Array;
  readonly lx: Float64Array;
  readonly own: Int32Array | null;
  /** 2^−k when cx holds 4^k·C (exponent-shift.ts; a pair's two share k), else 1. */
  readonly unscale: number;
}

/** Everything the threads share for one run. */
export interface TaskRun {
  readonly sn: SupernodalStructure;
  readonly cp: Int32Array;
  readonly ci: Int32Array;
  readonly plan: TaskPlan;
  readonly groups: readonly PlanGroup[];
  readonly factors: readonly TaskFactor[];
  /** Update matrices of task roots and top supernodes (plan.slotTotal doubles). */
  readonly slots: Float64Array;
  /** Control words (C_*), per-task state and count of unfinished inputs: shared Int32Arrays. */
  readonly ctl: Int32Array;
  readonly state: Int32Array;
  readonly pending: Int32Array;
}

/** A thread's own workspaces: two fronts and stacks (a pair's sweep needs both), pivot scratch. */
export interface TaskWorkspace {
  readonly a: MultifrontalWork;
  readonly b: MultifrontalWork;
  readonly status: Int32Array;
  readonly pivots: Float64Array;
}

/** A thread's workspaces (`a` may be one it already has, such as the analysis' shared scratch). */
export function taskWorkspace(n: number, sn: SupernodalStructure, simd: boolean, a: MultifrontalWork | null = null): TaskWorkspace {
  return { a: a ?? multifrontalWork(n, sn, simd), b: multifrontalWork(n, sn, simd), status: new Int32Array(2), pivots: new Float64Array(2) };
}

/** Options of {@link runFactorTasks}. */
export interface RunOptions {
  /** This thread is a worker (its tasks are counted in C_REMOTE). */
  worker?: boolean;
  /** Wait for a worker to take a task before taking any (tests: the worker surely works). */
  holdForWorker?: boolean;
  /** Give up (C_FAILED = 2) when nothing finishes for this long while waiting; default 120 000 ms. */
  stallMs?: number;
}

/** Runs tasks until all are finished or the run failed; returns the number run here. */
export function runFactorTasks(run: TaskRun, ws: TaskWorkspace, opts: RunOptions = {}): number {
  const { plan, ctl, state, pending } = run;
  const n = plan.ntasks, stallMs = opts.stallMs ?? 120_000;
  let ran = 0;
  if (opts.worker) Atomics.add(ctl, C_STARTED, 1);
  else if (opts.holdForWorker) {
    // the first claim bumps the heartbeat; give up holding if no worker shows up
    const t0 = performance.now();
    while (Atomics.load(ctl, C_BEAT) === 0 && Atomics.load(ctl, C_FAILED) === 0 && performance.now() - t0 < stallMs) Atomics.wait(ctl, C_BEAT, 0, 20);
  }
  let beat = Atomics.load(ctl, C_BEAT), since = performance.now();
  for (;;) {
    if (Atomics.load(ctl, C_FAILED) !== 0) return ran;
    const done = Atomics.load(ctl, C_DONE);
    if (done >= n) return ran;
    let t = -1;
    for (let i = 0; i < n; i++) {
      if (Atomics.load(state, i) === FREE && Atomics.load(pending, i) === 0 && Atomics.compareExchange(state, i, FREE, CLAIMED) === FREE) {
        t = i;
        break;
      }
    }
    if (t < 0) {
      // inputs still being computed by another thread
      Atomics.wait(ctl, C_DONE, done, 100);
      const b = Atomics.load(ctl, C_BEAT);
      if (b !== beat || Atomics.load(ctl, C_DONE) !== done) {
        beat = b;
        since = performance.now();
      } else if (performance.now() - since > stallMs) {
        Atomics.compareExchange(ctl, C_FAILED, 0, 2);
        Atomics.notify(ctl, C_DONE);
        return ran;
      }
      continue;
    }
    Atomics.add(ctl, C_BEAT, 1);
    Atomics.notify(ctl, C_BEAT);
    const ok = runFactorTask(run, ws, t);
    ran++;
    if (opts.worker) Atomics.add(ctl, C_REMOTE, 1);
    if (!ok) {
      Atomics.compareExchange(ctl, C_FAILED, 0, 1);
      Atomics.notify(ctl, C_DONE);
      return ran;
    }
    Atomics.store(state, t, FINISHED);
    for (let i = plan.waitPtr[t]!; i < plan.waitPtr[t + 1]!; i++) Atomics.sub(pending, plan.waiters[i]!, 1);
    Atomics.add(ctl, C_DONE, 1);
    Atomics.notify(ctl, C_DONE);
    beat = Atomics.load(ctl, C_BEAT);
    since = performance.now();
  }
}

/**
 * Runs task t of the plan on this thread with workspace `ws` (its inputs must
 * be finished); false on a failed pivot. The loop's step, exported for tests
 * that interleave tasks by hand.
 */
export function runFactorTask(run: TaskRun, ws: TaskWorkspace, t: number): boolean {
  const { sn, cp, ci, plan, factors, slots } = run;
  const s = plan.node[t]!;
  if (plan.kind[t] === TASK_NODE) {
    const fac = factors[plan.what[t]!]!;
    const work = ws.a, F = work.front;
    const f0 = sn.superStart[s]!, nc = sn.superStart[s + 1]! - f0, nr = sn.rowPtr[s + 1]! - sn.rowPtr[s]!;
    assembleFront(sn, s, cp, ci, fac.cx, work, F);
    for (let k = plan.childPtr[t]!; k < plan.childPtr[t + 1]!; k++) extendAdd(sn, plan.childNode[k]!, slots, plan.childSlot[k]!, work, F, nr);
    if (factorFront(F, nr, nc, work.simd, null, f0) >= 0) return false;
    storeBlock(F, nr, nc, fac.lx, fac.own ? fac.own[s]! : sn.valPtr[s]!, fac.unscale);
    const out = plan.outSlot[2 * t]!;
    if (nr > nc && out >= 0) pushUpdate(F, nr, nc, slots, out);
    return true;
  }
  const g = run.groups[plan.what[t]!]!, lo = plan.lo[t]!, m = updateOrder(sn, s), len = (m * (m + 1)) >> 1;
  const fa = factors[g.factors[0]!]!, { status, pivots } = ws;
  if (g.factors.length === 2) {
    const fb = factors[g.factors[1]!]!;
    multifrontalPair(sn, cp, ci, fa.cx, fb.cx, fa.lx, fb.lx, fb.own!, ws.a, ws.b, status, pivots, lo, s + 1, fa.unscale);
    if (status[0]! >= 0 || status[1]! >= 0) return false;
    const ob = plan.outSlot[2 * t + 1]!;
    if (ob >= 0) slots.set(ws.b.stack.subarray(0, len), ob);
  } else if (multifrontalFactor(sn, cp, ci, fa.cx, fa.lx, ws.a, pivots, null, null, lo, s + 1, fa.unscale) >= 0) {
    return false;
  }
  const oa = plan.outSlot[2 * t]!;
  if (oa >= 0) slots.set(ws.a.stack.subarray(0, len), oa);
  return true;
}
