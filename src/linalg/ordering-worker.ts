/**
 * Worker thread of ordering-parallel-node.ts (Node only): claims parts of
 * each nested-dissection batch it is sent and orders them into the shared
 * permutation (ordering-executor.ts, runJobs). It never prints; a failure is
 * counted in the batch's C_FAILED slot so the caller orders the open parts.
 */
import { parentPort } from 'node:worker_threads';
import { C_DONE, C_FAILED, runJobs, type NdBatch } from './ordering-executor.js';
import { ndWorkspace } from './ordering-nd.js';

parentPort!.on('message', (batch: NdBatch) => {
  try {
    let n = 0, nnz = 0;
    for (const j of batch.jobs) {
      n = Math.max(n, j.sub.n);
      nnz = Math.max(nnz, j.sub.adj.length);
    }
    // a workspace per batch (tens of MB at 1M vertices: not kept between batches)
    runJobs(batch, ndWorkspace(n, nnz), true);
  } catch {
    Atomics.add(batch.control, C_FAILED, 1);
    Atomics.notify(batch.control, C_DONE);
  }
});
parentPort!.postMessage('ready');
