/**
 * Worker thread of parallel-node.ts (Node only): runs the multifrontal
 * factorization (multifrontal.ts) of each job it is sent, on the shared
 * structure and values, writing L into shared memory, and reports through
 * the job's status words (parallel-node.ts, JobMessage). It never prints;
 * a failure is reported as state FAILED.
 */
import { parentPort } from 'node:worker_threads';
import { multifrontalFactor, multifrontalWork } from './multifrontal.js';
import { DONE, FAILED, PENDING, RUNNING, S_BAD, S_HEARTBEAT, S_STATE, type JobMessage } from './parallel-node.js';

parentPort!.on('message', (m: JobMessage) => {
  const { status } = m;
  // the main thread may have taken the job back while it waited here
  if (Atomics.compareExchange(status, S_STATE, PENDING, RUNNING) !== PENDING) return;
  let state = FAILED;
  try {
    const sn = m.sn;
    const work = multifrontalWork(m.n, sn, m.simd);
    const bad = multifrontalFactor(sn, m.cColPtr, m.cRowIdx, m.cx, m.lx, work, m.pivot, m.minPivot, status.subarray(S_HEARTBEAT, S_HEARTBEAT + 1));
    status[S_BAD] = bad;
    state = DONE;
  } catch {
    state = FAILED;
  }
  Atomics.store(status, S_STATE, state);
  Atomics.notify(status, S_STATE);
});
parentPort!.postMessage('ready');
