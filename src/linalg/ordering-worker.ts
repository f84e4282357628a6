/**
 * Worker thread of ordering-parallel-node.ts (Node only): claims parts of
 * each nested-dissection batch it is sent and orders them into the shared
 * permutation (ordering-executor.ts, runBatch: the lead split first when the
 * batch has one and no other thread took it). It never prints; a failure is
 * counted in the batch's C_FAILED slot so the caller orders the open parts.
 */
import { parentPort } from 'node:worker_threads';
import { C_DONE, C_FAILED, C_SPLIT, runBatch, type NdBatch } from './ordering-executor.js';

parentPort!.on('message', (batch: NdBatch) => {
  try {
    runBatch(batch);
  } catch {
    Atomics.add(batch.control, C_FAILED, 1);
    Atomics.notify(batch.control, C_DONE);
    Atomics.notify(batch.control, C_SPLIT);
  }
});
parentPort!.postMessage('ready');
