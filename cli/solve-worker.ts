/**
 * Worker thread of `distance --each --jobs N` (see jobs.ts): prepares the
 * solver once on the shared mesh, then solves the source sets it is given,
 * one message each, and sends back the field (transferred, not copied) and
 * the values at the requested points. Errors go back as data; the worker
 * never prints.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { errorData, prepareSolver, specFromInit, type WorkerInit, type WorkerReply, type WorkerTask } from './jobs.js';

const port = parentPort!;
const send = (m: WorkerReply, transfer: ArrayBuffer[] = []): void => port.postMessage(m, transfer);

try {
  const t0 = performance.now();
  const solver = prepareSolver(specFromInit(workerData as WorkerInit));
  send({ kind: 'ready', prepareMs: performance.now() - t0, prepareDetails: solver.prepareDetails });
  port.on('message', (task: WorkerTask) => {
    try {
      const r = solver.solve(task.set, task.solve);
      const distance = r.field.distance.slice(); // a copy: a solver may keep its own buffer
      send(
        { kind: 'done', id: task.id, distance, at: task.atPoints.map((p) => r.at(p)), solveMs: r.solveMs, complete: r.complete, stoppedBy: r.stoppedBy ?? null, details: r.details },
        [distance.buffer as ArrayBuffer],
      );
    } catch (e) {
      send({ kind: 'error', id: task.id, error: errorData(e) });
    }
  });
} catch (e) {
  send({ kind: 'error', id: -1, error: errorData(e) });
}
