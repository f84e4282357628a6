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
 */
import type { AdjacencyGraph } from './graph.js';
import { extractParts, ndSettings, ndWorkspace, orderSubgraph, splitSubgraph } from './ordering-nd.js';
import type { NdSettings, NdWorkspace, NestedDissectionOptions } from './ordering-nd.js';
import { rootSubgraph } from './ordering-subgraph.js';
import type { Subgraph } from './ordering-subgraph.js';

/** One part to order: a subgraph in shared memory and where its order starts in the permutation. */
export interface NdJob {
  readonly sub: Subgraph;
  readonly at: number;
}

/** Slots of {@link NdBatch.control}. */
export const C_DONE = 0, C_FAILED = 1, C_BEAT = 2, C_REMOTE = 3;
/** Length of {@link NdBatch.control}. */
export const CONTROL_LENGTH = 4;
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
   * Lets the threads claim jobs of `batch` (as {@link runJobs} does); the
   * returned function blocks until every job is done (true), or until the
   * threads failed or stalled (false: the caller orders the open jobs itself).
   */
  start(batch: NdBatch): () => boolean;
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
    orderSubgraph(ws, settings, job.sub, out, job.at, (len) => new Int32Array(len), beat);
    Atomics.store(state, j, JOB_DONE);
    if (remote) Atomics.add(control, C_REMOTE, 1);
    Atomics.add(control, C_DONE, 1);
    Atomics.notify(control, C_DONE);
  }
}

/**
 * Nested dissection (ordering-nd.ts) with the parts below the top
 * `executor.depth` levels ordered by the executor's threads and the calling
 * thread together; the same permutation as {@link nestedDissection}. Graphs
 * below `executor.minSize` vertices are ordered on the calling thread alone.
 */
export function parallelNestedDissection(g: AdjacencyGraph, opts: NestedDissectionOptions, executor: OrderingExecutor): Int32Array {
  const st = ndSettings(opts);
  const ws = ndWorkspace(g.n, g.adj.length);
  if (g.n < executor.minSize) {
    const out = new Int32Array(g.n);
    orderSubgraph(ws, st, rootSubgraph(g), out, 0, (len) => new Int32Array(len), null);
    return out;
  }
  const shared = (len: number) => executor.shared(len);
  const out = shared(g.n);
  // the top levels, breadth first: every part of the last level becomes a job
  let level: NdJob[] = [{ sub: rootSubgraph(g), at: 0 }];
  const jobs: NdJob[] = [];
  for (let d = 0; d < executor.depth && level.length > 0; d++) {
    const next: NdJob[] = [];
    for (const { sub, at } of level) {
      const split = splitSubgraph(ws, st, sub, out, at);
      if (split === null) continue; // a leaf: already ordered
      const [a, b] = extractParts(ws, sub, split, shared);
      next.push({ sub: a, at }, { sub: b, at: at + split.na });
    }
    level = next;
  }
  jobs.push(...level);
  jobs.sort((x, y) => y.sub.n - x.sub.n || x.at - y.at);
  const control = shared(CONTROL_LENGTH), state = shared(Math.max(1, jobs.length));
  const batch: NdBatch = { jobs, out, control, state, settings: st };
  const wait = jobs.length > 1 || !(executor.callerOrders ?? true) ? executor.start(batch) : null;
  if (executor.callerOrders ?? true) runJobs(batch, ws, false);
  if (wait !== null && !wait()) {
    // a thread failed or stalled: order what it left open here (same result)
    for (let j = 0; j < jobs.length; j++) {
      if (Atomics.load(state, j) !== JOB_DONE) orderSubgraph(ws, st, jobs[j]!.sub, out, jobs[j]!.at, (len) => new Int32Array(len), null);
    }
  }
  return out.slice();
}
