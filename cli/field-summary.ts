/**
 * What `distance` says about a per-vertex field: statistics over the
 * vertices that got a distance, how many did, and why the others did not
 * (unreachable, not computed because the run stopped once the targets were
 * final, or farther than --max-distance). One place for the JSON and the
 * text, so both say what actually happened.
 */
import { fmt } from './run.js';

/** Why an incomplete run stopped. */
export type StopReason = 'targets' | 'maxDistance' | null;

/** The `field` object of `distance --json`. */
export interface FieldSummary {
  /** Vertices in the field. */
  vertices: number;
  /** Vertices with a distance. */
  computedVertices: number;
  /** Smallest, largest and mean distance over the computed vertices (null when none). */
  min: number | null;
  max: number | null;
  mean: number | null;
  /** Vertices proven unreachable (a complete run); null when the run stopped early and cannot tell. */
  unreachableVertices: number | null;
  /** Vertices without a distance because the run stopped early (0 for a complete run). */
  notComputedVertices: number;
  /** Why the run stopped early: `targets` (every target was final) or `maxDistance`; null when it covered everything. */
  stoppedBy: StopReason;
}

/**
 * Summarises field `d` of a solve. `complete` and `stoppedBy` come from the
 * solver; `maxDistance` is the --max-distance given (the graph method
 * reports complete runs even when it stopped there).
 */
export function summarizeField(d: ArrayLike<number>, complete: boolean, stoppedBy: StopReason | undefined, maxDistance: number | undefined, targetsOnly: boolean): FieldSummary {
  let n = 0, min = Infinity, max = -Infinity, sum = 0;
  for (let i = 0; i < d.length; i++) {
    const x = d[i]!;
    if (!Number.isFinite(x)) continue;
    n++;
    sum += x;
    if (x < min) min = x;
    if (x > max) max = x;
  }
  const missing = d.length - n;
  let why: StopReason = null;
  if (!complete) why = stoppedBy ?? (targetsOnly ? 'targets' : 'maxDistance');
  else if (maxDistance !== undefined && missing > 0) why = 'maxDistance';
  return {
    vertices: d.length,
    computedVertices: n,
    min: n ? min : null,
    max: n ? max : null,
    mean: n ? sum / n : null,
    unreachableVertices: why === null ? missing : null,
    notComputedVertices: why === null ? 0 : missing,
    stoppedBy: why,
  };
}

/** One line (after "from SOURCES: ") saying what the run computed. */
export function describeField(s: FieldSummary, maxDistance: number | undefined): string {
  const stats = s.computedVertices ? `min ${fmt(s.min!)}, mean ${fmt(s.mean!)}, max ${fmt(s.max!)}` : '';
  const N = s.vertices, C = s.computedVertices;
  if (s.stoppedBy === null) {
    if (C === 0) return `no vertex reachable (${N} vertices unreachable)`;
    return `${stats}${s.unreachableVertices ? ` over ${C} reachable vertices; ${s.unreachableVertices} of ${N} vertices unreachable` : ''}`;
  }
  if (s.stoppedBy === 'targets') {
    if (C === N) return `stopped once the targets were final, with all ${N} vertices computed: ${stats}`;
    return `stopped once the targets were final: ${C} of ${N} vertices computed${C ? ` (${stats} over those)` : ''}; give -o for every vertex`;
  }
  const D = maxDistance !== undefined ? fmt(maxDistance) : '?';
  if (C === N) return `all ${N} vertices within --max-distance ${D}: ${stats}`;
  if (C === 0) return `no vertex within --max-distance ${D} (${N} vertices farther or unreachable)`;
  return `stopped at --max-distance ${D}: ${C} of ${N} vertices within it (${stats}); ${N - C} farther or unreachable, with no distance`;
}
