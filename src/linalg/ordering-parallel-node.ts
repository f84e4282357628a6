/**
 * An {@link OrderingExecutor} on Node worker threads (Node only: the
 * `orthodrome/node` subpath exports it; src/core.ts never reaches it). The
 * parts of a nested dissection live in SharedArrayBuffers, so a batch
 * message carries views only; each worker claims parts through the batch's
 * shared counter (ordering-executor.ts, runJobs) and writes their order into
 * the shared permutation; a batch with a lead split (the caller busy with
 * other work meanwhile) is split by the first worker free.
 *
 * The caller orders parts too and then waits synchronously (Atomics.wait;
 * allowed on Node's main thread), so `analyzeCholesky` stays synchronous.
 * A worker that is still loading when the caller has claimed every part
 * costs nothing: the caller does not wait for it. A worker that fails, or
 * whose heartbeat (subgraphs split) stops for `stallMs`, is given up and the
 * caller orders the parts it left open (the permutation is the same).
 *
 * Workers start on `warm()` or the first batch and stay (unref'd, so they
 * never keep the process alive) until {@link NodeOrderingExecutor.close}.
 */
import { WorkerSet } from './worker-start-node.js';
import { availableParallelism } from 'node:os';
import { C_BEAT, C_DONE, C_FAILED, C_REMOTE, C_SPLIT, SPLIT_DONE } from './ordering-executor.js';
import type { NdBatch, OrderingExecutor } from './ordering-executor.js';

/** Options of {@link NodeOrderingExecutor}. */
export interface NodeOrderingExecutorOptions {
  /** Smallest graph (vertices) ordered with the threads; default {@link DEFAULT_ORDERING_MIN_SIZE}. */
  minSize?: number;
  /** Worker threads; default the machine's available parallelism − 1 (at least 1). */
  threads?: number;
  /**
   * Levels split by the caller before the parts become jobs; default 1 (two
   * parts). Measured on the 1M-vertex flipped terrain with one worker (CPU
   * time of the busier thread, the critical path): depth 1: 2.35–2.49 s,
   * 2: 2.46–2.54 s, 3: 2.64–2.66 s, serial 4.1 s: each level the caller
   * splits alone costs more than the finer parts gain in balance. With the
   * heat method's assembly overlapping (a lead split on the worker), the
   * same terrain's analysis took 2.93–3.02 s at depth 1 and 3.12–3.47 s at
   * depth 2 (four parts of unequal size end unevenly).
   */
  depth?: number;
  /** A worker whose part shows no progress for this long is given up; default 120 000 ms. */
  stallMs?: number;
  /** The calling thread orders parts too (default true; false for tests: every part on a worker). */
  callerOrders?: boolean;
}

/**
 * Default size threshold. With a warm worker, ordering + analysis of the
 * 100k-vertex flipped terrain took 321–397 ms on one thread and 257–274 ms
 * with one worker, but in the heat benchmark's single cold run from source
 * (the worker still loading and compiling during the ordering) 633–1024 ms
 * against 560–574 ms alone; at 1M 3.9 s against 5.2–5.5 s. So threads from
 * 200k vertices only.
 */
export const DEFAULT_ORDERING_MIN_SIZE = 200_000;

/** Nested dissection parts on worker threads; see the module comment. */
export class NodeOrderingExecutor implements OrderingExecutor {
  readonly minSize: number;
  readonly depth: number;
  readonly callerOrders: boolean;
  readonly #threads: number;
  readonly #stallMs: number;
  readonly #pool = new WorkerSet(import.meta.url, 'ordering-worker');
  /** Batches given to the workers, parts the workers ordered, and batches whose open parts the caller had to order (a worker failed or stalled). */
  readonly counts = { batches: 0, remoteJobs: 0, failed: 0 };

  constructor(opts: NodeOrderingExecutorOptions = {}) {
    this.minSize = opts.minSize ?? DEFAULT_ORDERING_MIN_SIZE;
    this.depth = Math.max(1, opts.depth ?? 1);
    this.#threads = Math.max(1, opts.threads ?? availableParallelism() - 1);
    this.#stallMs = opts.stallMs ?? 120_000;
    this.callerOrders = opts.callerOrders ?? true;
  }

  /** Starts the workers now (they load while the caller works); returns at once. */
  warm(): void {
    while (this.#pool.list.length < this.#threads) this.#pool.spawn();
  }

  /** Resolves when every started worker has loaded its module. */
  async ready(): Promise<void> {
    await this.#pool.ready();
  }

  shared(length: number): Int32Array {
    return new Int32Array(new SharedArrayBuffer(4 * Math.max(1, length)), 0, length);
  }

  start(batch: NdBatch): (splitOnly?: boolean) => boolean {
    this.warm();
    this.counts.batches++;
    for (const w of this.#pool.list) w.postMessage(batch);
    return (splitOnly = false) => this.#wait(batch, splitOnly);
  }

  /** Stops the workers (they are unref'd, so a process may also just exit). */
  async close(): Promise<void> {
    await this.#pool.close();
  }

  /** Blocks until every job is done, or with `splitOnly` the lead split (true), or a worker failed or stalled (false). */
  #wait(batch: NdBatch, splitOnly: boolean): boolean {
    const { control, jobs, lead } = batch;
    let beat = Atomics.load(control, C_BEAT), since = performance.now();
    for (;;) {
      const done = Atomics.load(control, C_DONE);
      // a lead batch's jobs are known once it is split (a thread notifies C_DONE then)
      const split = !lead || Atomics.load(control, C_SPLIT) === SPLIT_DONE;
      if (split && splitOnly) return true;
      if (split && done >= (lead ? lead.table[0]! : jobs.length)) {
        this.counts.remoteJobs += Atomics.load(control, C_REMOTE);
        return true;
      }
      if (Atomics.load(control, C_FAILED) > 0 || this.#pool.list.length === 0) {
        this.counts.failed++;
        return false;
      }
      Atomics.wait(control, C_DONE, done, 250);
      const b = Atomics.load(control, C_BEAT);
      if (b !== beat) {
        beat = b;
        since = performance.now();
      } else if (performance.now() - since > this.#stallMs) {
        for (const w of this.#pool.list.splice(0)) void w.terminate();
        this.counts.failed++;
        return false;
      }
    }
  }
}
