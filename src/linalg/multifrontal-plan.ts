/**
 * The task plan of a multifrontal factorization on several threads (tree
 * parallelism: Duff & Reid 1983; Liu, "The multifrontal method for sparse
 * matrix factorization", SIAM Review 34, 1992, §8: disjoint subtrees of the
 * elimination tree are independent).
 *
 * The supernodal tree is cut into a top part T (a few supernodes near the
 * roots) and the subtrees hanging below it. Every factorization of a group
 * (one factor, or a pair sharing blocks: multifrontal-pair.ts) gets
 *
 * - one SUB task per subtree: the serial sweep over the subtree's
 *   contiguous postorder range, whose root update matrix is then copied to a
 *   slot;
 * - one NODE task per supernode of T and factor (the second of a pair only
 *   where it stores the block): its front extend-adds the children's update
 *   matrices from their slots, in the serial order (last child first), and
 *   leaves its own update matrix in a slot.
 *
 * Each supernode is thus computed from the same values by the same operations
 * in the same order as in the serial sweep, so the factors are bit-identical
 * whichever thread ran which task. The cut expands the costliest subtree
 * (cost ≈ nc·nr² flops plus nr² for assembly, per factor that computes the
 * block) until none is above the total over `slices`, or T reaches `maxTop`.
 * A top supernode's update matrix is written over a child's slot that only
 * it reads, when one is large enough (it has read all its children by then).
 * Tasks are listed by decreasing upward path cost (the longest chain of work
 * from the task to the end: highest level first list scheduling, Hu 1961), so
 * a thread taking the first ready task keeps the critical path moving.
 */
import type { SupernodalStructure } from './supernodes.js';
import { updateOrder } from './multifrontal.js';

/** One factorization group: a single factor, or a pair (second shares the first's blocks). */
export interface PlanGroup {
  /** Factor indices: [f] or [a, b]. */
  readonly factors: readonly number[];
  /** For a pair: the second's block offsets (−1: shared with the first). */
  readonly own: Int32Array | null;
}

/** Task kinds. */
export const TASK_SUB = 0, TASK_NODE = 1;

/** The plan; every array is read-only once built (safe to copy to another thread). */
export interface TaskPlan {
  readonly ntasks: number;
  /** TASK_SUB or TASK_NODE, in list (priority) order. */
  readonly kind: Int32Array;
  /** SUB: the subtree's root; NODE: the supernode. */
  readonly node: Int32Array;
  /** SUB: the group index; NODE: the factor index. */
  readonly what: Int32Array;
  /** SUB: first supernode of the subtree's range (the root is the last). */
  readonly lo: Int32Array;
  /** Tasks each task waits for (counts). */
  readonly deps: Int32Array;
  /** Tasks waiting for task t: waiters[waitPtr[t] … waitPtr[t+1]). */
  readonly waitPtr: Int32Array;
  readonly waiters: Int32Array;
  /** NODE: slot offsets of its children's update matrices, last child first: childSlot[childPtr[t] …). */
  readonly childPtr: Int32Array;
  readonly childNode: Int32Array;
  readonly childSlot: Int32Array;
  /** Where a task leaves update matrices: NODE one slot; SUB one per factor of its group (−1: none). */
  readonly outSlot: Int32Array;
  /** Doubles in the slot arena. */
  readonly slotTotal: number;
  /** Supernodes in T. */
  readonly topCount: number;
}

/** Options of {@link planFactorTasks}. */
export interface PlanOptions {
  /** Subtrees are cut until none costs more than the total over this (default 16). */
  slices?: number;
  /**
   * Most supernodes in the top part (default 24: bounds the slot memory; on
   * the 1M-vertex terrain 24 gives 149 MB of slots, 48 gives 201 MB, with no
   * measurable gain in balance).
   */
  maxTop?: number;
}

/** Plans the tasks of `groups` (factor indices 0, 1, …) over one supernodal structure. */
export function planFactorTasks(sn: SupernodalStructure, groups: readonly PlanGroup[], opts: PlanOptions = {}): TaskPlan {
  const { nsuper, superStart, superParent, rowPtr } = sn;
  // cost per supernode and factor count that computes it
  const w = new Float64Array(nsuper);
  for (let s = 0; s < nsuper; s++) {
    const nc = superStart[s + 1]! - superStart[s]!, nr = rowPtr[s + 1]! - rowPtr[s]!;
    let k = 0;
    for (const g of groups) k += g.factors.length === 2 && g.own![s]! < 0 ? 1 : g.factors.length;
    w[s] = k * (nc * nr * nr + 2 * nr * nr);
  }
  const first = new Int32Array(nsuper), sub = new Float64Array(nsuper);
  for (let s = 0; s < nsuper; s++) first[s] = s;
  for (let s = 0; s < nsuper; s++) {
    sub[s]! += w[s]!;
    const p = superParent[s]!;
    if (p >= 0) {
      sub[p]! += sub[s]!;
      if (first[s]! < first[p]!) first[p] = first[s]!;
    }
  }
  let total = 0;
  const open: number[] = [];
  for (let s = 0; s < nsuper; s++) if (superParent[s]! < 0) {
    open.push(s);
    total += sub[s]!;
  }
  // expand the costliest open subtree into its top supernode (T) and its children
  const inTop = new Uint8Array(nsuper);
  const budget = total / (opts.slices ?? 16), maxTop = opts.maxTop ?? 24;
  let topCount = 0;
  for (;;) {
    let bi = -1;
    for (let i = 0; i < open.length; i++) if (bi < 0 || sub[open[i]!]! > sub[open[bi]!]!) bi = i;
    if (bi < 0 || sub[open[bi]!]! <= budget || topCount >= maxTop) break;
    const r = open[bi]!;
    if (r === first[r]) break; // a leaf: nothing to split
    open.splice(bi, 1);
    inTop[r] = 1;
    topCount++;
    for (let c = r - 1; c >= first[r]!; c = first[c]! - 1) open.push(c); // children, last first
  }
  open.sort((a, b) => a - b);
  const roots = open;
  const top: number[] = [];
  for (let s = 0; s < nsuper; s++) if (inTop[s]) top.push(s);

  // slots: an update matrix per (factor, supernode) for task roots and top supernodes
  const slotOf = new Map<number, number>();
  let slotTotal = 0;
  const stores = (g: PlanGroup, j: number, s: number) => j === 0 || g.own![s]! >= 0;
  const slot = (f: number, s: number): number => {
    const key = f * nsuper + s;
    let o = slotOf.get(key);
    if (o === undefined) {
      const m = updateOrder(sn, s);
      o = slotTotal;
      slotTotal += (m * (m + 1)) >> 1;
      slotOf.set(key, o);
    }
    return o;
  };
  interface T { kind: number; node: number; what: number; lo: number; cost: number; out: number[]; kids: [number, number][]; deps: Set<number> }
  const tasks: T[] = [];
  const producer = new Map<number, number>(); // factor·nsuper + s → task
  const readers = new Map<number, number>(); // factor·nsuper + s → tasks reading that update matrix
  groups.forEach((g, gi) => {
    for (const r of roots) {
      const out = g.factors.map((f, j) => (stores(g, j, r) && superParent[r]! >= 0 ? slot(f, r) : -1));
      const t = tasks.push({ kind: TASK_SUB, node: r, what: gi, lo: first[r]!, cost: 0, out, kids: [], deps: new Set() }) - 1;
      g.factors.forEach((f, j) => { if (stores(g, j, r)) producer.set(f * nsuper + r, t); });
      for (let s = first[r]!; s <= r; s++) tasks[t]!.cost += w[s]!;
    }
    for (const s of top) {
      g.factors.forEach((f, j) => {
        if (!stores(g, j, s)) return;
        const kids: [number, number][] = [];
        for (let c = s - 1; c >= first[s]!; c = first[c]! - 1) {
          const fc = stores(g, j, c) ? f : g.factors[0]!; // an unaffected child of the second: the first's update
          kids.push([c, fc]);
          readers.set(fc * nsuper + c, (readers.get(fc * nsuper + c) ?? 0) + 1);
        }
        const nc = superStart[s + 1]! - superStart[s]!, nr = rowPtr[s + 1]! - rowPtr[s]!;
        producer.set(f * nsuper + s, tasks.push({ kind: TASK_NODE, node: s, what: f, lo: s, cost: nc * nr * nr + 2 * nr * nr, out: [-1], kids, deps: new Set() }) - 1);
      });
    }
  });
  // a top supernode's update matrix goes over the smallest large enough slot of a child that only
  // it reads (all its children are read before it writes), else into a new slot; parents come later
  const size = (s: number) => { const m = updateOrder(sn, s); return (m * (m + 1)) >> 1; };
  for (const t of tasks) {
    if (t.kind !== TASK_NODE || superParent[t.node]! < 0) continue;
    let best = -1;
    for (const [c, fc] of t.kids) {
      const key = fc * nsuper + c;
      if (readers.get(key) === 1 && size(c) >= size(t.node) && (best < 0 || size(c) < size(best % nsuper))) best = key;
    }
    if (best >= 0) {
      readers.set(best, 0); // taken
      slotOf.set(t.what * nsuper + t.node, slotOf.get(best)!);
    }
    t.out[0] = slot(t.what, t.node);
  }
  for (const t of tasks) for (const [c, fc] of t.kids) t.deps.add(producer.get(fc * nsuper + c)!);
  // upward path cost: tasks come after their producers in `tasks` (roots first, then T in postorder)
  const waitLists: number[][] = tasks.map(() => []);
  tasks.forEach((t, i) => { for (const d of t.deps) waitLists[d]!.push(i); });
  const level = new Float64Array(tasks.length);
  for (let i = tasks.length - 1; i >= 0; i--) {
    let up = 0;
    for (const u of waitLists[i]!) up = Math.max(up, level[u]!);
    level[i] = tasks[i]!.cost + up;
  }
  const order = tasks.map((_, i) => i).sort((a, b) => level[b]! - level[a]! || a - b);
  const rank = new Int32Array(tasks.length);
  order.forEach((t, i) => { rank[t] = i; });

  const n = tasks.length;
  const kind = new Int32Array(n), node = new Int32Array(n), what = new Int32Array(n), lo = new Int32Array(n), deps = new Int32Array(n);
  const waitPtr = new Int32Array(n + 1), childPtr = new Int32Array(n + 1), outSlot = new Int32Array(2 * n).fill(-1);
  const waiters: number[] = [], childNode: number[] = [], childSlot: number[] = [];
  order.forEach((ti, i) => {
    const t = tasks[ti]!;
    kind[i] = t.kind;
    node[i] = t.node;
    what[i] = t.what;
    lo[i] = t.lo;
    deps[i] = t.deps.size;
    t.out.forEach((o, j) => { outSlot[2 * i + j] = o; });
    for (const u of waitLists[ti]!) waiters.push(rank[u]!);
    waitPtr[i + 1] = waiters.length;
    for (const [c, fc] of t.kids) {
      childNode.push(c);
      childSlot.push(slotOf.get(fc * nsuper + c)!);
    }
    childPtr[i + 1] = childNode.length;
  });
  return {
    ntasks: n, kind, node, what, lo, deps, waitPtr, waiters: Int32Array.from(waiters), childPtr, childNode: Int32Array.from(childNode),
    childSlot: Int32Array.from(childSlot), outSlot, slotTotal, topCount,
  };
}
