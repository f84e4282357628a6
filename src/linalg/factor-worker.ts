/**
 * Worker thread of parallel-node.ts (Node only): runs the multifrontal
 * factorization (multifrontal.ts) of each job it is sent, on the shared
 * structure and values, writing L into shared memory, and reports through
 * the job's status words (parallel-node.ts, JobMessage); or joins a task run
 * (TaskMessage: multifrontal-tasks.ts, the same loop as the caller's). It
 * never prints; a failure is reported as state FAILED (a job) or as the
 * run's FAILED word (a task run).
 */
import { parentPort } from 'node:worker_threads';
import { multifrontalFactor, multifrontalWork } from './multifrontal.js';
import { C_DONE, C_FAILED, runFactorTasks, taskWorkspace } from './multifrontal-tasks.js';
import { DONE, FAILED, PENDING, RUNNING, S_BAD, S_HEARTBEAT, S_STATE, type JobMessage, type TaskMessage } from './parallel-node.js';

parentPort!.on('message', (m: JobMessage | TaskMessage) => {
  if ('run' in m) {
    const { sn } = m;
    try {
      runFactorTasks({ sn, cp: m.cColPtr, ci: m.cRowIdx, ...m.run }, taskWorkspace(m.n, sn, m.simd), { worker: true, stallMs: m.stallMs });
    } catch {
      // a task it claimed will never finish: the run is given up at once (the caller factors serially)
      Atomics.store(m.run.ctl, C_FAILED, 2);
      Atomics.notify(m.run.ctl, C_DONE);
    }
    return;
  }
  const { status } = m;
  // the main thread may have taken the job back while it waited here
  if (Atomics.compareExchange(status, S_STATE, PENDING, RUNNING) !== PENDING) return;
  let state = FAILED;
  try {
    const sn = m.sn;
    const work = multifrontalWork(m.n, sn, m.simd);
    const bad = multifrontalFactor(sn, m.cColPtr, m.cRowIdx, m.cx, m.lx, work, m.pivot, m.minPivot, status.subarray(S_HEARTBEAT, S_HEARTBEAT + 1), 0, sn.nsuper, m.unscale);
    status[S_BAD] = bad;
    state = DONE;
  } catch {
    state = FAILED;
  }
  Atomics.store(status, S_STATE, state);
  Atomics.notify(status, S_STATE);
});
parentPort!.postMessage('ready');
