/**
 * Nested dissection on more than one thread: the interface the ordering sees
 * and the loop every thread runs. No platform API here (src/ runs in a
 * browser; shared memory and Atomics only); the Node implementation with
 * worker threads is ordering-parallel-node.ts, reached only from the Node
 * entry.
 *
 * After the top `depth` levels of the dissection (George 1973: the parts
 * left by a separator are independent subproblems, ordered into disjoint
 * ranges of the permutation) the parts are jobs. Each job is a subgraph in
 * shared memory (ordering-subgraph.ts), claimed by whichever thread is free
 * (a compare-and-swap on the job's state word: the executor's threads take
 * the largest open job, the caller the smallest, so the caller, which has
 * already split the top levels, gets the lighter share), and ordered into
 * the shared permutation. A part's order depends on the part alone, so the permutation
 * is the serial one bit for bit, whoever orders which part (and a job left
 * unfinished by a failed thread is simply ordered again by the caller).
 *
 * When the caller has other work meanwhile (`parallelNestedDissection`'s
 * `meanwhile`, e.g. the heat method assembling its matrices while the
 * pattern is ordered), the top levels become a job too (`NdBatch.lead`):
 * the whole graph is copied to shared memory and the first thread free
 * (usually an executor's thread, while the caller works on) claims the split,
 * carves the parts from one shared pool and lists them in a shared table;
 * the others read the parts from the table. The split is the serial one, so
 * the permutation still is; if the splitting thread fails, the caller orders
 * the whole graph itself.
 */
import type { AdjacencyGraph } from './graph.js';
import { extractParts, ndSettings, ndWorkspace, orderSubgraph, splitSubgraph } from './ordering-nd.js';
import type { NdSettings, NdWorkspace, NestedDissectionOptions } from './ordering-nd.js';
import { plainAlloc, rootSubgraph } from './ordering-subgraph.js';
import type { Int32Alloc, Subgraph } from './ordering-subgraph.js';

/** One part to order: a subgraph in shared memory and where its order starts in the permutation. */
export interface NdJob {
  readonly sub: Subgraph;
  readonly at: number;
}

/** Slots of {@link NdBatch.control}: jobs done, threads failed, heartbeat, jobs done by the executor's threads, state of the lead split. */
export const C_DONE = 0, C_FAILED = 1, C_BEAT = 2, C_REMOTE = 3, C_SPLIT = 4;
/** Length of {@link NdBatch.control}. */
export const CONTROL_LENGTH = 5;
/** States of the lead split in control[C_SPLIT]: open, claimed by a thread, parts listed in the table, given up by the caller. */
export const SPLIT_OPEN = 0, SPLIT_TAKEN = 1, SPLIT_DONE = 2, SPLIT_ABANDONED = 3;
/** Int32 slots per job in {@link NdLead.table} (after the count): n, at, and the pool offsets of xadj, adj, deg, gid. */
const TABLE_STRIDE = 6;

/**
 * The top levels of a dissection as a job of their own (see the module
 * comment): the whole graph and the parts cut from it live in `pool`.
 */
export interface NdLead {
  /** The whole graph (its arrays are views of `pool`). */
  readonly root: Subgraph;
  /** Levels to split before the parts become jobs. */
  readonly depth: number;
  /** Shared memory the parts are carved from, after the root's arrays. */
  readonly pool: Int32Array;
  /** First free slot of `pool`. */
  readonly free: number;
  /** table[0] = number of jobs, then {@link TABLE_STRIDE} slots per job, largest job first. */
  readonly table: Int32Array;
}
/** Job states in {@link NdBatch.state}: open, taken by a thread, finished. */
export const JOB_OPEN = 0, JOB_TAKEN = 1, JOB_DONE = 2;

/** The parts of one dissection handed to the threads (all arrays in shared memory). */
export interface NdBatch {
  /** Jobs, largest first (the order they are claimed in). */
  readonly jobs: readonly NdJob[];
  /** The permutation being built (whole-graph ids). */
  readonly out: Int32Array;
  /** Jobs finished, threads failed, heartbeat (subgraphs split), jobs done by the executor's threads. */
  readonly control: Int32Array;
  /** JOB_OPEN / JOB_TAKEN / JOB_DONE per job. */
  readonly state: Int32Array;
  /** The dissection's settings (ordering-nd.ts). */
  readonly settings: NdSettings;
  /** The top levels still to split (then `jobs` is empty: they are in `lead.table` once split), or null. */
  readonly lead?: NdLead | null;
}

/** Runs the parts of a nested dissection on other threads (ordering-parallel-node.ts). */
export interface OrderingExecutor {
  /** Smallest graph worth the threads (smaller ones are ordered on the calling thread alone). */
  readonly minSize: number;
  /** Levels split by the calling thread before the parts become jobs (1: two jobs, 2: four). */
  readonly depth: number;
  /** The calling thread orders jobs too (default true; false leaves every job to the threads, for tests). */
  readonly callerOrders?: boolean;
  /** An Int32Array of `length` zeros that the executor's threads can read and write. */
  shared(length: number): Int32Array;
  /**
   * Lets the threads claim jobs of `batch` (as {@link runJobs} does, after
   * {@link leadJobs} when the batch has a lead split); the returned function
   * blocks until every job is done (true), or until the threads failed or
   * stalled (false: the caller orders the open jobs itself). Called with
   * `splitOnly` true it returns as soon as the lead split is done (true).
   */
  start(batch: NdBatch): (splitOnly?: boolean) => boolean;
  /** Starts the threads ahead of the first batch (optional), so they load while the caller works. */
  warm?(): void;
}

/**
 * Claims and orders jobs of `batch` until none is left; every thread runs
 * this, the caller too (`remote` false). `ws` must hold the largest job.
 */
export function runJobs(batch: NdBatch, ws: NdWorkspace, remote: boolean): void {
  const { jobs, control, state, out, settings } = batch;
  const beat = control.subarray(C_BEAT, C_BEAT + 1);
  const k = jobs.length;
  for (let i = 0; i < k; i++) {
    const j = remote ? i : k - 1 - i; // the caller takes the smallest open job, the threads the largest
    if (Atomics.compareExchange(state, j, JOB_OPEN, JOB_TAKEN) !== JOB_OPEN) continue;
    const job = jobs[j]!;
    orderSubgraph(ws, settings, job.sub, out, job.at, plainAlloc, beat);
    Atomics.store(state, j, JOB_DONE);
    if (remote) Atomics.add(control, C_REMOTE, 1);
    Atomics.add(control, C_DONE, 1);
    Atomics.notify(control, C_DONE);
  }
}

/**
 * The top `depth` levels of `root`, breadth first (separators written to
 * `out`); every part of the last level becomes a job, largest first.
 */
function splitTop(ws: NdWorkspace, st: NdSettings, root: Subgraph, depth: number, out: Int32Array, alloc: Int32Alloc, beat: Int32Array | null): NdJob[] {
  let level: NdJob[] = [{ sub: root, at: 0 }];
  for (let d = 0; d < depth && level.length > 0; d++) {
    const next: NdJob[] = [];
    for (const { sub, at } of level) {
      const split = splitSubgraph(ws, st, sub, out, at);
      if (beat !== null) Atomics.add(beat, 0, 1);
      if (split === null) continue; // a leaf: already ordered
      const [a, b] = extractParts(ws, sub, split, alloc);
      next.push({ sub: a, at }, { sub: b, at: at + split.na });
    }
    level = next;
  }
  return level.sort((x, y) => y.sub.n - x.sub.n || x.at - y.at);
}

/**
 * Splits the top levels of a lead batch (the thread that claimed
 * control[C_SPLIT]): parts carved from the pool, listed in the table, then
 * the split marked done. Returns the jobs.
 */
export function leadSplit(batch: NdBatch, ws: NdWorkspace): NdJob[] {
  const { pool, table, root, depth } = batch.lead!;
  let free = batch.lead!.free;
  const alloc = (len: number): Int32Array => {
    if (free + len > pool.length) throw new Error('nested dissection: lead pool exhausted'); // cannot happen: sized for the worst case
    const a = pool.subarray(free, free + len);
    free += len;
    return a;
  };
  const jobs = splitTop(ws, batch.settings, root, depth, batch.out, alloc, batch.control.subarray(C_BEAT, C_BEAT + 1));
  const at = (a: Int32Array | null): number => (a === null ? -1 : (a.byteOffset - pool.byteOffset) >> 2);
  jobs.forEach((j, i) => table.set([j.sub.n, j.at, at(j.sub.xadj), at(j.sub.adj), at(j.sub.deg), at(j.sub.gid)], 1 + TABLE_STRIDE * i));
  table[0] = jobs.length;
  Atomics.store(batch.control, C_SPLIT, SPLIT_DONE);
  Atomics.notify(batch.control, C_SPLIT);
  Atomics.notify(batch.control, C_DONE);
  return jobs;
}

/** The jobs of a lead batch whose split is done, read from its table (by the threads that did not split). */
export function leadJobs(batch: NdBatch): NdJob[] {
  const { pool, table } = batch.lead!;
  const jobs: NdJob[] = [];
  for (let i = 0; i < table[0]!; i++) {
    const o = 1 + TABLE_STRIDE * i, n = table[o]!, x = table[o + 2]!;
    const xadj = pool.subarray(x, x + n + 1), a = table[o + 3]!, d = table[o + 4]!, g = table[o + 5]!;
    const sub: Subgraph = {
      n, xadj, adj: pool.subarray(a, a + xadj[n]!), deg: d < 0 ? null : pool.subarray(d, d + n), gid: g < 0 ? null : pool.subarray(g, g + n),
    };
    jobs.push({ sub, at: table[o + 1]! });
  }
  return jobs;
}

/**
 * What an executor's thread does with a batch: claims the lead split when it
 * is still open (else waits for the parts, or leaves a batch the caller gave
 * up), then claims jobs. The workspace is sized for the root or the largest job.
 */
export function runBatch(batch: NdBatch): void {
  const { control, lead } = batch;
  let jobs = batch.jobs, ws: NdWorkspace | null = null;
  if (lead) {
    if (Atomics.compareExchange(control, C_SPLIT, SPLIT_OPEN, SPLIT_TAKEN) === SPLIT_OPEN) {
      ws = ndWorkspace(lead.root.n, lead.root.adj.length);
      jobs = leadSplit(batch, ws); // the same workspace then orders the parts
    } else {
      let s: number;
      while ((s = Atomics.load(control, C_SPLIT)) === SPLIT_TAKEN) Atomics.wait(control, C_SPLIT, SPLIT_TAKEN, 1000);
      if (s !== SPLIT_DONE) return;
      jobs = leadJobs(batch);
    }
  }
  if (ws === null) {
    let n = 0, nnz = 0;
    for (const j of jobs) {
      n = Math.max(n, j.sub.n);
      nnz = Math.max(nnz, j.sub.adj.length);
    }
    ws = ndWorkspace(n, nnz);
  }
  // a workspace per batch (tens of MB at 1M vertices: not kept between batches)
  runJobs({ ...batch, jobs }, ws, true);
}

/** Pool size for a lead split of `depth` levels: the root, and per level at most 3n + 2^level + nnz slots (xadj, gid, deg, adj). */
function leadPoolSize(g: AdjacencyGraph, depth: number): number {
  return g.n + 1 + g.adj.length + depth * (3 * g.n + g.adj.length) + 2 ** (depth + 1);
}

/**
 * Nested dissection (ordering-nd.ts) with the parts below the top
 * `executor.depth` levels ordered by the executor's threads and the calling
 * thread together; the same permutation as {@link nestedDissection}. Graphs
 * below `executor.minSize` vertices are ordered on the calling thread alone.
 *
 * `meanwhile`, when given, is called once on the calling thread while the
 * executor's threads work: the top split is then a job of its own that a
 * free thread claims (see the module comment), and the caller claims it
 * only when it comes back first. It is not called for graphs below
 * `minSize` (the caller runs it then).
 */
export function parallelNestedDissection(g: AdjacencyGraph, opts: NestedDissectionOptions, executor: OrderingExecutor, meanwhile?: () => void): Int32Array {
  const st = ndSettings(opts);
  const ws = ndWorkspace(g.n, g.adj.length);
  if (g.n < executor.minSize) {
    const out = new Int32Array(g.n);
    orderSubgraph(ws, st, rootSubgraph(g), out, 0, plainAlloc, null);
    return out;
  }
  const shared = (len: number) => executor.shared(len);
  const out = shared(g.n);
  if (meanwhile) return leadNestedDissection(g, st, ws, executor, out, meanwhile);
  const jobs = splitTop(ws, st, rootSubgraph(g), executor.depth, out, shared, null);
  const control = shared(CONTROL_LENGTH), state = shared(Math.max(1, jobs.length));
  const batch: NdBatch = { jobs, out, control, state, settings: st };
  const wait = jobs.length > 1 || !(executor.callerOrders ?? true) ? executor.start(batch) : null;
  if (executor.callerOrders ?? true) runJobs(batch, ws, false);
  if (wait !== null && !wait()) {
    // a thread failed or stalled: order what it left open here (same result)
    for (let j = 0; j < jobs.length; j++) {
      if (Atomics.load(state, j) !== JOB_DONE) orderSubgraph(ws, st, jobs[j]!.sub, out, jobs[j]!.at, plainAlloc, null);
    }
  }
  return out.slice();
}

/** {@link parallelNestedDissection} with a lead split and the caller's `meanwhile`. */
function leadNestedDissection(g: AdjacencyGraph, st: NdSettings, ws: NdWorkspace, executor: OrderingExecutor, out: Int32Array, meanwhile: () => void): Int32Array {
  const depth = executor.depth;
  const pool = executor.shared(leadPoolSize(g, depth));
  pool.set(g.xadj, 0);
  pool.set(g.adj, g.n + 1);
  const root: Subgraph = { n: g.n, xadj: pool.subarray(0, g.n + 1), adj: pool.subarray(g.n + 1, g.n + 1 + g.adj.length), deg: null, gid: null };
  const lead: NdLead = { root, depth, pool, free: g.n + 1 + g.adj.length, table: executor.shared(1 + TABLE_STRIDE * 2 ** depth) };
  const control = executor.shared(CONTROL_LENGTH), state = executor.shared(2 ** depth);
  const batch: NdBatch = { jobs: [], out, control, state, settings: st, lead };
  const wait = executor.start(batch);
  try {
    meanwhile();
  } catch (e) {
    Atomics.compareExchange(control, C_SPLIT, SPLIT_OPEN, SPLIT_ABANDONED); // a thread that has not split yet leaves the batch
    throw e;
  }
  let jobs: NdJob[];
  if (Atomics.compareExchange(control, C_SPLIT, SPLIT_OPEN, SPLIT_TAKEN) === SPLIT_OPEN) {
    try {
      jobs = leadSplit(batch, ws);
    } catch (e) {
      Atomics.store(control, C_SPLIT, SPLIT_ABANDONED); // threads waiting for the parts leave the batch
      Atomics.notify(control, C_SPLIT);
      throw e;
    }
  } else if (wait(true)) jobs = leadJobs(batch);
  else {
    // the thread that took the split failed or stalled: the whole graph here (same result)
    orderSubgraph(ws, st, rootSubgraph(g), out, 0, plainAlloc, null);
    return out.slice();
  }
  const full: NdBatch = { ...batch, jobs };
  if (executor.callerOrders ?? true) runJobs(full, ws, false);
  if (!wait()) {
    for (let j = 0; j < jobs.length; j++) {
      if (Atomics.load(state, j) !== JOB_DONE) orderSubgraph(ws, st, jobs[j]!.sub, out, jobs[j]!.at, plainAlloc, null);
    }
  }
  return out.slice();
}
