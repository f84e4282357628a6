/**
 * The worker pool of `score` (tinypool: worker threads, one mesh per task):
 * N threads started once, so a run pays Node's start-up once, not once per
 * mesh. At most N tasks are in flight, so each task starts as soon as it is
 * handed over and its time limit counts its own work only: past the limit
 * the task is aborted, which ends its thread (tinypool terminates a worker
 * whose task is aborted and starts a fresh one), and the mesh becomes an
 * error row naming the limit. A thread that dies (out of memory) is an
 * error row too; the run goes on.
 *
 * Run from source (tsx), a worker thread on Node 20 does not inherit the
 * TypeScript loader: the pool then loads a small module that registers
 * tsx's hooks in the thread before importing worker.ts (as cli/jobs.ts does).
 */
import Tinypool from 'tinypool';
import type { ScoreReply, ScoreTask } from './worker.js';

/** The worker module for the pool: worker.js, or from source a loader module that registers tsx first. */
function workerFilename(): string {
  const here = import.meta.url;
  const url = new URL(here.endsWith('.ts') ? './worker.ts' : './worker.js', here);
  if (!here.endsWith('.ts')) return url.href;
  const boot =
    `const ready = import(${JSON.stringify(import.meta.resolve('tsx/esm/api'))}).then((m) => { m.register(); return import(${JSON.stringify(url.href)}); });\n` +
    'export default async function (task) { return (await ready).default(task); }\n';
  return `data:text/javascript,${encodeURIComponent(boot)}`;
}

/** A pool of `threads` scoring workers with a per-task time limit (ms; 0 = none). */
export class ScorePool {
  private readonly pool: Tinypool;

  /**
   * @param threads - worker threads
   * @param timeLimitMs - per-task time limit (0: none)
   * @param memoryLimit - per-mesh memory limit, bytes: each thread's JavaScript heap is capped at it (within
   *   256 MiB … 4 GiB), so a heap that runs away ends that thread (an error row), not the whole run
   * @param heapMb - that cap in MiB instead (tests give a small one to run a thread out of heap for real)
   */
  constructor(readonly threads: number, private readonly timeLimitMs: number, memoryLimit: number, heapMb?: number) {
    this.heapMb = heapMb ?? Math.round(Math.min(4096, Math.max(256, memoryLimit / 2 ** 20)));
    // isolateWorkers false and no recycling by memory: each thread scores mesh after mesh, so its module loading and
    // JIT warm-up are paid once per run (a 200-mesh run measured one thread per worker from start to end)
    this.pool = new Tinypool({
      filename: workerFilename(), minThreads: threads, maxThreads: threads, idleTimeout: 60_000, isolateWorkers: false,
      resourceLimits: { maxOldGenerationSizeMb: this.heapMb },
    });
  }

  /** Each thread's JavaScript heap cap (old generation), MiB. */
  readonly heapMb: number;

  /** Scores one mesh; never rejects: a timeout or a dead thread is an error reply. */
  async run(task: ScoreTask): Promise<ScoreReply> {
    const ctl = new AbortController();
    const timer = this.timeLimitMs > 0 ? setTimeout(() => ctl.abort(), this.timeLimitMs) : undefined;
    try {
      return (await this.pool.run(task, { signal: ctl.signal })) as ScoreReply;
    } catch (e) {
      if (ctl.signal.aborted) {
        return { ok: false, limit: true, error: `${task.file}: over the per-mesh time limit of ${this.timeLimitMs / 1000} s; raise it with --time-limit (seconds, 0 for none) or leave out the costly groups (--metrics)` };
      }
      const code = (e as { code?: unknown }).code;
      const oom = code === 'ERR_WORKER_OUT_OF_MEMORY';
      const msg = e instanceof Error ? e.message.split('\n')[0] : String(e);
      // the thread that ran out is gone; tinypool starts a fresh one for the next mesh
      const why = oom
        ? `the worker thread ran out of JavaScript heap (capped at ${this.heapMb} MiB per thread by --mesh-memory); raise --mesh-memory if the machine has the memory (and lower --jobs to make room)`
        : `the worker thread stopped: ${msg}`;
      return { ok: false, limit: oom, error: `${task.file}: ${why}` };
    } finally {
      if (timer) clearTimeout(timer);
    }
  }

  /** Stops every thread. */
  async close(): Promise<void> {
    await this.pool.destroy();
  }
}
