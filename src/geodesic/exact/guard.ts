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
 * - Windows made on one half-edge: {@link maxPerHalfEdge}, the larger of
 *   {@link MIN_PER_HALF_EDGE} and the number of vertices. Window propagation
 *   puts O(n) windows on an edge in the worst case (Mitchell, Mount &
 *   Papadimitriou 1987, from memory), so the cap grows with the mesh.
 *   Measured maxima (every window made counts, trimmed ones too): 10–65 on
 *   jittered and rough terrains of 10k–100k faces and a bumpy sphere of 80k
 *   faces; 46–202 on terrain blocks with long thin sides from 900 to 206k
 *   faces; 52–420 on smooth and fractal heightfields of 200k faces; 3,891 on
 *   a scan-like Delaunay terrain of 200k faces (100k vertices); a CAD-like
 *   part of 200k faces with thin triangles and fans passed 4,096 (after
 *   46 million windows and ten minutes: a hard mesh, not known to diverge).
 *   On small meshes the floor decides, and reaching it costs a few seconds
 *   (the trimming scans are quadratic in it); on large meshes the cap only
 *   bounds the run, and the memory budget usually ends a runaway first.
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
import type { Topology } from '../../mesh/topology.js';
import type { WindowStore } from './windows.js';

/**
 * The parts of a run the guard reads (an `ExactState` has them; named here
 * so that state.ts, which reads {@link maxPerHalfEdge}, and this file do not
 * import each other).
 */
export interface GuardedRun {
  /** The mesh's topology. */
  readonly t: Topology;
  /** The run's windows. */
  readonly win: WindowStore;
  /** Roots registered so far. */
  readonly nRoots: number;
  /** Point and segment roots. */
  readonly pointRoots: readonly unknown[];
  /** Which bound the run passed ('' while it has passed none). */
  readonly diverged: '' | 'edge' | 'events';
  /** The half-edge that passed its window cap. */
  readonly divergedAt: number;
}

/** Floor of the per-half-edge window cap (see the module comment). */
export const MIN_PER_HALF_EDGE = 1 << 12;

/** Windows made on one half-edge beyond which a run on a mesh of `nv` vertices is stopped as diverging. */
export function maxPerHalfEdge(nv: number): number {
  return Math.max(MIN_PER_HALF_EDGE, nv);
}

/** Events a run may process with `windows` made (see the module comment); past it the run is looping. */
export function eventBound(s: GuardedRun): number {
  return 2 * (4 * s.win.count + 9 * s.t.nf + 16 * (s.nRoots + s.pointRoots.length)) + 4096;
}

/** The NUMERIC error of a run stopped by one of the bounds (`s.diverged`). */
export function divergedError(s: GuardedRun, events: number): OrthodromeError {
  const t = s.t, h = s.divergedAt;
  const what = s.diverged === 'edge'
    ? `${s.win.heCount[h]} windows on the edge between vertices ${t.tri[h]} and ${t.tri[next(h)]}, more than a correct run makes on one edge`
    : `${events} events for ${s.win.count} windows, more than a correct run can take`;
  return numericError(
    `exact geodesics: the window propagation does not converge on this mesh (${what}); ` +
      'its faces are probably too close to degenerate (needles, a very tall spike): use the heat method (--method heat) or the graph method (--method graph)',
  );
}
