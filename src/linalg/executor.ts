/**
 * Numeric factorizations on other threads: the interface the solver sees.
 * It stays free of any platform API (src/ runs in a browser); the Node
 * implementation with worker threads is parallel-node.ts, which only the
 * Node entry (src/index.ts) reaches.
 *
 * Matrices that share one symbolic analysis are independent factorizations,
 * so they can run at the same time (the heat method's two or three), and so
 * are disjoint subtrees of one factorization: with `join` the threads share
 * the tasks of all of them (multifrontal-parallel.ts). Other threads run the
 * same multifrontal kernel on the same structure and values, in the same
 * order for every entry, so the factors are bit-identical to the serial ones.
 */
import type { CholeskySymbolic } from './symbolic.js';
import type { TaskRun } from './multifrontal-tasks.js';

/** One factorization handed to an executor; `cx`, `lx` and `minPivot` come from {@link FactorExecutor.shared}. */
export interface FactorJob {
  /** The analysis (supernodal). */
  readonly sym: CholeskySymbolic;
  /** C's values in the analysed order (symbolic.ts, valueMap). */
  readonly cx: Float64Array;
  /** Receives L's supernode blocks (length valPtr[nsuper]). */
  readonly lx: Float64Array;
  /** Pivot floors in the permuted numbering, or null (floor 0). */
  readonly minPivot: Float64Array | null;
  /** Use the WebAssembly SIMD kernel where the platform has it (as FactorOptions.simd). */
  readonly simd: boolean;
  /** 2^−k when cx holds 4^k·C (exponent-shift.ts), else 1: L's blocks are stored times it. */
  readonly unscale: number;
}

/**
 * Outcome of a job: bad = −1 (done), the permuted column of a failed pivot
 * (with its value), −2 when the job was taken back before any thread
 * started it (its storage untouched), or −3 when the thread failed or
 * stalled (its storage may still be written). For −2 and −3 the caller
 * factors the matrix itself.
 */
export interface FactorJobResult {
  readonly bad: number;
  readonly pivot: number;
}

/** Runs factorizations on other threads (parallel-node.ts). */
export interface FactorExecutor {
  /** Smallest matrix order worth a thread (smaller ones are factored in place). */
  readonly minSize: number;
  /** A Float64Array of `length` zeros that the executor's threads can write. */
  shared(length: number): Float64Array;
  /** Starts a job; the returned function blocks until it is done. */
  start(job: FactorJob): () => FactorJobResult;
  /** Starts the threads ahead of the first job (optional), so they load while the caller works. */
  warm?(): void;
  /**
   * Lets the executor's threads join a task run (multifrontal-tasks.ts) that
   * the caller runs too; returns at once. `hold`: the caller should let a
   * worker take the first task (tests); `done()` is called by the caller
   * once the run is over (finished or failed), for the executor's counts.
   * Optional: without it the executor takes whole factorizations (`start`).
   */
  join?(job: TaskJob): { hold: boolean; done: () => void };
}

/** A task run handed to {@link FactorExecutor.join}: the structure comes from `sym`, the rest is shared or read-only. */
export interface TaskJob {
  readonly sym: CholeskySymbolic;
  readonly run: Omit<TaskRun, 'sn' | 'cp' | 'ci'>;
  /** Use the WebAssembly SIMD kernel where the platform has it. */
  readonly simd: boolean;
}
