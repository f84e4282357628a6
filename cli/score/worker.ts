/**
 * Worker thread of `orthodrome score` (run by the pool in pool.ts): loads
 * one mesh, checks the memory estimate against the per-mesh limit, and
 * computes its metrics. It never throws for a bad mesh: errors come back as
 * data (the message, and whether a limit was reached), so one mesh's failure
 * is one error row and the worker goes on to the next.
 */
// the narrow subpaths (orthodrome/node, /score, /errors), not the root: a worker thread loads only what scoring needs
// (the solvers come on first use, score-mesh.ts), which is start-up paid once per thread
import { loadSurface } from '../../src/api/node.js';
import { scoreSurface, estimateScoreBytes, type MetricGroup, type LandmarkSpec, type Metrics, type LandmarkResult } from '../../src/score/index.js';
import { formatBytes, isOrthodromeError } from '../../src/errors.js';

/** One mesh to score. */
export interface ScoreTask {
  /** Path to read. */
  path: string;
  /** The path as the results name it (errors are prefixed with it). */
  file: string;
  groups: MetricGroup[];
  landmarks: LandmarkSpec[];
  heatSamples: number;
  /** Per-mesh memory limit, bytes (the estimate is checked against it; exact solves get it as their budget). */
  memoryLimit: number;
  maxInputBytes: number;
}

/** The worker's answer. */
export type ScoreReply =
  | { ok: true; metrics: Metrics; landmarks: LandmarkResult[] }
  | { ok: false; error: string; limit: boolean };

/** One line of an error, the file name in front unless it is there already. */
function message(e: unknown, file: string): { error: string; limit: boolean } {
  const limit = isOrthodromeError(e) && e.code === 'LIMIT';
  let text = e instanceof Error ? e.message : String(e);
  text = text.replace(/\s*\n\s*/g, ' ');
  if (e instanceof RangeError && /allocation failed|Array buffer allocation|Invalid (typed )?array length/i.test(text)) {
    return { error: `${file}: out of memory while scoring (${text}); lower --jobs or raise --mesh-memory only if the machine has the memory`, limit: true };
  }
  // the exact method's budget is --mesh-memory here, not distance's --memory-budget
  if (limit && /--memory-budget/.test(text)) text = text.replace(/--memory-budget/g, '--mesh-memory');
  return { error: text.includes(file) ? text : `${file}: ${text}`, limit };
}

/** Scores one mesh (the pool calls this in a worker thread). */
export default async function scoreTask(task: ScoreTask): Promise<ScoreReply> {
  try {
    const s = await loadSurface(task.path, { maxInputBytes: task.maxInputBytes });
    const need = estimateScoreBytes(s.topology.nf, task.groups, task.landmarks.length);
    if (need > task.memoryLimit) {
      return {
        ok: false,
        limit: true,
        error: `${task.file}: memory estimate ${formatBytes(need)} for ${s.topology.nf} triangles (groups ${task.groups.join(',')}) is over the per-mesh limit of ${formatBytes(task.memoryLimit)}; raise it with --mesh-memory or leave out the costly groups (--metrics)`,
      };
    }
    const r = await scoreSurface(s, { groups: task.groups, landmarks: task.landmarks, heatSamples: task.heatSamples, memoryBudget: task.memoryLimit });
    return { ok: true, metrics: r.metrics, landmarks: r.landmarks };
  } catch (e) {
    return { ok: false, ...message(e, task.file) };
  }
}
