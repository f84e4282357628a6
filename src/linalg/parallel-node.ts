/**
 * A {@link FactorExecutor} on Node worker threads (Node only: the
 * `orthodrome/node` subpath, src/api/node.ts, exports it; src/core.ts never
 * reaches it). The symbolic structure is
 * copied once per analysis into SharedArrayBuffers, C's values and L's
 * blocks live in shared memory too, so a job message carries views only.
 *
 * Two kinds of work: a task run (`join`: multifrontal-parallel.ts, how
 * `CholeskyFactor.factorMany` uses it), where the workers run the same
 * task loop as the caller over one plan, and whole factorizations (`start`,
 * below; used for factorizations with pivot floors).
 *
 * The caller waits synchronously (Atomics.wait; allowed on Node's main
 * thread), so `CholeskyFactor.factorMany` keeps a synchronous API. Each
 * job has four status words: state, failed column, heartbeat (the
 * supernode being factored + 1, multifrontal.ts) and a spare. A job still
 * PENDING when the caller is free is taken back and factored by the caller
 * (work stealing: result bad = −2, the job's storage untouched), so three
 * factorizations on two threads cost about two. A worker that fails, or
 * whose heartbeat stops for `stallMs`, is given up (bad = −3): the caller
 * then factors that matrix itself, in fresh storage.
 *
 * Workers start on `warm()` (the heat method calls it before its remesh) or
 * the first job, and stay (unref'd, so they never keep the process alive)
 * until {@link NodeFactorExecutor.close}.
 */
import type { Worker } from 'node:worker_threads';
import { WorkerSet } from './worker-start-node.js';
import { availableParallelism } from 'node:os';
import type { CholeskySymbolic } from './symbolic.js';
import type { SupernodalStructure } from './supernodes.js';
import type { FactorExecutor, FactorJob, FactorJobResult, TaskJob } from './executor.js';
import { C_FAILED, C_REMOTE } from './multifrontal-tasks.js';

/** Status word indices of a job (shared by the worker). */
export const S_STATE = 0, S_BAD = 1, S_HEARTBEAT = 2;
/** Job states in the status word's S_STATE slot: queued, taken by a worker, done, failed, taken back by the calling thread. */
export const PENDING = 0, RUNNING = 1, DONE = 2, FAILED = 3, CLAIMED_HERE = 4;

/** What a worker receives: views on shared memory only. */
export interface JobMessage {
  n: number;
  sn: SupernodalStructure;
  cColPtr: Int32Array;
  cRowIdx: Int32Array;
  cx: Float64Array;
  lx: Float64Array;
  minPivot: Float64Array | null;
  simd: boolean;
  unscale: number;
  status: Int32Array;
  pivot: Float64Array;
}

/** What a worker receives to join a task run (multifrontal-tasks.ts). */
export interface TaskMessage {
  n: number;
  sn: SupernodalStructure;
  cColPtr: Int32Array;
  cRowIdx: Int32Array;
  run: TaskJob['run'];
  simd: boolean;
  stallMs: number;
}

/** Options of {@link NodeFactorExecutor}. */
export interface NodeFactorExecutorOptions {
  /** Smallest matrix order sent to a thread; default {@link DEFAULT_MIN_SIZE}. */
  minSize?: number;
  /** Most worker threads; default the machine's available parallelism. */
  threads?: number;
  /** A worker whose job shows no progress for this long is given up; default 120 000 ms. */
  stallMs?: number;
  /** Take back jobs no worker has started when the caller is free (default true; false for tests). */
  steal?: boolean;
}

/** How the jobs of an executor went. */
export interface ExecutorCounts {
  /** Jobs a worker factored. */
  remote: number;
  /** Jobs taken back by the caller before a worker started them. */
  takenBack: number;
  /** Jobs given up (worker failed or stalled) and factored by the caller. */
  failed: number;
}

/**
 * Default size threshold: below ~200k unknowns one factorization takes a
 * few hundred ms or less, and a worker's start-up eats most of the gain
 * (measured on a loaded 2-core machine: 0.17–0.26 s from built JavaScript,
 * 0.8–1.1 s from source, where the worker loads the TypeScript loader).
 */
export const DEFAULT_MIN_SIZE = 200_000;

type SharedStructure = Pick<JobMessage, 'n' | 'sn' | 'cColPtr' | 'cRowIdx'>;

/** Factorizations on worker threads; see the module comment. */
export class NodeFactorExecutor implements FactorExecutor {
  readonly minSize: number;
  readonly #threads: number;
  readonly #stallMs: number;
  readonly #steal: boolean;
  /** Running totals. */
  readonly counts: ExecutorCounts = { remote: 0, takenBack: 0, failed: 0 };
  readonly #pool = new WorkerSet(import.meta.url, 'factor-worker');
  readonly #structures = new WeakMap<CholeskySymbolic, SharedStructure>();
  #next = 0;

  constructor(opts: NodeFactorExecutorOptions = {}) {
    this.minSize = opts.minSize ?? DEFAULT_MIN_SIZE;
    this.#threads = Math.max(1, opts.threads ?? availableParallelism());
    this.#stallMs = opts.stallMs ?? 120_000;
    this.#steal = opts.steal ?? true;
  }

  /**
   * Starts the workers now (they load their modules while the caller does
   * other work, such as the ordering); returns at once.
   */
  warm(): void {
    while (this.#pool.list.length < this.#threads) this.#pool.spawn();
  }

  /** Resolves when every started worker has loaded its module. */
  async ready(): Promise<void> {
    await this.#pool.ready();
  }

  shared(length: number): Float64Array {
    return new Float64Array(new SharedArrayBuffer(8 * Math.max(1, length)), 0, length);
  }

  start(job: FactorJob): () => FactorJobResult {
    const status = new Int32Array(new SharedArrayBuffer(16));
    const pivot = this.shared(1);
    const msg: JobMessage = { ...this.#structure(job.sym), cx: job.cx, lx: job.lx, minPivot: job.minPivot, simd: job.simd, unscale: job.unscale, status, pivot };
    const worker = this.#worker();
    worker.postMessage(msg);
    return () => this.#wait(worker, msg);
  }

  /**
   * Workers join the task run (multifrontal-tasks.ts): as many as the
   * machine has cores besides the caller's (at least one), since the caller
   * runs the tasks too. A run in which
   * a worker took a task counts as `remote`, else as `takenBack`; a stalled
   * run as `failed`, and its workers are stopped (new ones start on the next
   * job).
   */
  join(job: TaskJob): { hold: boolean; done: () => void } {
    this.warm();
    const msg: TaskMessage = { ...this.#structure(job.sym), run: job.run, simd: job.simd, stallMs: this.#stallMs };
    for (const w of this.#pool.list.slice(0, Math.max(1, availableParallelism() - 1))) w.postMessage(msg);
    const ctl = job.run.ctl;
    return {
      hold: !this.#steal,
      done: () => {
        if (Atomics.load(ctl, C_FAILED) === 2) {
          this.counts.failed++;
          for (const w of this.#pool.list.splice(0)) void w.terminate();
        } else if (Atomics.load(ctl, C_REMOTE) > 0) this.counts.remote++;
        else this.counts.takenBack++;
      },
    };
  }

  /** Stops the workers (they are unref'd, so a process may also just exit). */
  async close(): Promise<void> {
    await this.#pool.close();
  }

  #worker(): Worker {
    if (this.#pool.list.length < this.#threads) return this.#pool.spawn();
    return this.#pool.list[this.#next++ % this.#pool.list.length]!;
  }

  #wait(worker: Worker, msg: JobMessage): FactorJobResult {
    const { status, pivot } = msg;
    // not started yet: take it back (the worker skips a job it cannot claim)
    if (this.#steal && Atomics.compareExchange(status, S_STATE, PENDING, CLAIMED_HERE) === PENDING) {
      this.counts.takenBack++;
      return { bad: -2, pivot: 0 };  // never touched: the caller may use its storage
    }
    let beat = Atomics.load(status, S_HEARTBEAT), since = performance.now();
    for (;;) {
      const state = Atomics.load(status, S_STATE);
      if (state === DONE) {
        this.counts.remote++;
        return { bad: Atomics.load(status, S_BAD), pivot: pivot[0]! };
      }
      if (state === FAILED) {
        this.counts.failed++;
        return { bad: -3, pivot: 0 };
      }
      Atomics.wait(status, S_STATE, state, 250);
      const b = Atomics.load(status, S_HEARTBEAT);
      if (b !== beat) {
        beat = b;
        since = performance.now();
      } else if (performance.now() - since > this.#stallMs) {
        this.#pool.drop(worker);
        void worker.terminate();
        this.counts.failed++;
        return { bad: -3, pivot: 0 }; // the thread may still write to the job's storage
      }
    }
  }

  /** The analysis' structure in shared memory, copied once. */
  #structure(sym: CholeskySymbolic): SharedStructure {
    let s = this.#structures.get(sym);
    if (!s) {
      const sn = sym.supernodal!;
      s = {
        n: sym.n,
        sn: {
          nsuper: sn.nsuper, superStart: sharedInt(sn.superStart), superParent: sharedInt(sn.superParent), childCount: sharedInt(sn.childCount),
          rowPtr: sharedInt(sn.rowPtr), rows: sharedInt(sn.rows), valPtr: sharedInt(sn.valPtr), maxRows: sn.maxRows, stackSize: sn.stackSize,
        },
        cColPtr: sharedInt(sym.cColPtr),
        cRowIdx: sharedInt(sym.cRowIdx),
      };
      this.#structures.set(sym, s);
    }
    return s;
  }
}

function sharedInt(a: Int32Array): Int32Array {
  const b = new Int32Array(new SharedArrayBuffer(4 * Math.max(1, a.length)), 0, a.length);
  b.set(a);
  return b;
}
