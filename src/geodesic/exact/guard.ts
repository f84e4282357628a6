/**
 * A guarantee that an exact run ends, whatever makes it go wrong.
 *
 * The memory budget (budget.ts) bounds the windows a run stores, but not
 * its time: each new window is trimmed against the windows already on its
 * edge (trim.ts), so windows piling up on a few edges cost time quadratic in
 * their number, and a run that keeps making them at a standing queue key
 * looks endless long before the budget is reached (the winding windows of
 * winding.ts did exactly that: 24,000 turns round a spike, six edges). Two
 * bounds that a correct run cannot reach end such a run with a NUMERIC error
 * that suggests the heat or graph method, never a wrong number:
 *
 * - Windows on one half-edge: {@link MAX_PER_HALF_EDGE}. Correct runs make
 *   few, and not more on larger meshes: at most 10–65 on any half-edge over
 *   jittered and rough terrains of 10k–100k faces and a bumpy sphere of 80k
 *   faces, 46–202 on terrain blocks with long thin sides from 900 to 206k
 *   faces (measured for this file; every window made counts, trimmed ones
 *   too). Window propagation allows O(n) windows per edge in the worst case
 *   (Mitchell, Mount & Papadimitriou 1987, from memory), so the cap is a
 *   practical bound, twenty times anything measured; reaching it costs a
 *   few seconds at most (the trimming scans are quadratic in it).
 * - Events against windows: every event pops a queue entry that a window
 *   creation, a merge or a strict decrease of a vertex bound pushed. There
 *   is one entry per window, at most two merges per propagated window plus
 *   one per emitted pseudo-source window (at most one per half-edge), and
 *   one bound decrease per propagated window plus one per half-edge from
 *   settled vertices and a few per source: under 4·windows + 9·faces + a
 *   few per root. A run past twice that ({@link eventBound}) is looping
 *   without making windows, which no part of the solver should ever do; the
 *   check guards against such a defect in any future change.
 */
import { numericError } from '../../errors.js';
import type { OrthodromeError } from '../../errors.js';
import { next } from '../../mesh/topology.js';
import type { ExactState } from './state.js';

/** Windows made on one half-edge beyond which a run is stopped as diverging (see the module comment). */
export const MAX_PER_HALF_EDGE = 1 << 12;

/** Events a run may process with `windows` made (see the module comment); past it the run is looping. */
export function eventBound(s: ExactState): number {
  return 2 * (4 * s.win.count + 9 * s.t.nf + 16 * (s.nRoots + s.pointRoots.length)) + 4096;
}

/** The NUMERIC error of a run stopped by one of the bounds (`s.diverged`). */
export function divergedError(s: ExactState, events: number): OrthodromeError {
  const t = s.t, h = s.divergedAt;
  const what = s.diverged === 'edge'
    ? `${MAX_PER_HALF_EDGE} windows on the edge between vertices ${t.tri[h]} and ${t.tri[next(h)]}, where correct runs make at most a few hundred`
    : `${events} events for ${s.win.count} windows, more than a correct run can take`;
  return numericError(
    `exact geodesics: the window propagation does not converge on this mesh (${what}); ` +
      'its faces are probably too close to degenerate (needles, a very tall spike): use the heat method (--method heat) or the graph method (--method graph)',
  );
}
