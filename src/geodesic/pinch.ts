/**
 * Distances through pinch points: vertices where several sheets of the
 * surface as given meet at a single point (bow-ties, a vertex shared by two
 * otherwise separate fans). Building the half-edge topology splits such a
 * vertex into copies, one per fan, so a solver sees the sheets as separate:
 * a path through the pinch is lost.
 *
 * A shortest path on the surface as given passes each pinch point at most
 * once and, between pinch points, is a path on the split surface. So the
 * distance is found by a Dijkstra over the pinch points (Dijkstra, Numer.
 * Math. 1, 1959) on top of the solver: with d the field from the sources,
 * repeatedly take the unprocessed pinch point g with the least
 * m_g = min over its copies of d, solve once from all its copies (field
 * D_g), and lower d to min(d, m_g + D_g). When g is taken, m_g is final: any
 * path reaching g through another pinch point h has length ≥ m_h ≥ m_g. One
 * extra solve per pinch point that the sources reach.
 */
import type { SurfacePoint } from '../mesh/surface-point.js';
import type { SourceSet } from './shared/sources.js';
import { limitError } from '../errors.js';
import type { DistanceResult, DistanceSolver, SolveOptions } from './solver.js';

/** Default cap on the extra solves of {@link throughPinches}. */
export const DEFAULT_MAX_PINCH_SOLVES = 256;

/** Options of {@link throughPinches}. */
export interface PinchOptions {
  /** The solver's `maxDistance`, if any: values beyond it stay Infinity. */
  maxDistance?: number;
  /** Most extra solves (pinch points reached) before a `LIMIT` error (default {@link DEFAULT_MAX_PINCH_SOLVES}). */
  maxPinchSolves?: number;
}

/**
 * Wraps `solver` so that paths pass through the pinch points `groups` (each
 * group: the topology copies of one input vertex, as from
 * `PointResolver.splitGroups`). Per-vertex values and `at` are on the split
 * topology; every copy of a pinch point gets the same value. With no groups
 * it returns `solver` itself.
 */
export function throughPinches(solver: DistanceSolver, groups: number[][], opts: PinchOptions = {}): DistanceSolver {
  if (groups.length === 0) return solver;
  const maxD = opts.maxDistance ?? Infinity, cap = opts.maxPinchSolves ?? DEFAULT_MAX_PINCH_SOLVES;
  return {
    method: solver.method,
    prepareMs: solver.prepareMs,
    prepareDetails: solver.prepareDetails,
    solve(sources: SourceSet, so: SolveOptions = {}): DistanceResult {
      // every value is needed to see which pinch points are reached
      const base = solver.solve(sources, { ...so, fieldNeeded: true });
      const d = base.field.distance.slice();
      const relays: { offset: number; r: DistanceResult }[] = [];
      const done = new Uint8Array(groups.length);
      let solveMs = base.solveMs;
      for (;;) {
        let g = -1, m = Infinity;
        groups.forEach((copies, i) => {
          if (done[i]) return;
          for (const v of copies) if (d[v]! < m) { m = d[v]!; g = i; }
        });
        if (g < 0 || !(m <= maxD)) break;
        if (relays.length >= cap) {
          throw limitError(
            `the sources reach more than ${cap} pinch points (vertices split where sheets meet); ` +
              'raise maxPinchSolves, set maxDistance, or repair the mesh',
            'pinch points',
          );
        }
        done[g] = 1;
        const pts: SurfacePoint[] = groups[g]!.map((vertex) => ({ kind: 'vertex', vertex }));
        const r = solver.solve({ points: pts, curves: [] }, { fieldNeeded: true });
        solveMs += r.solveMs;
        relays.push({ offset: m, r });
        const D = r.field.distance;
        for (let v = 0; v < d.length; v++) if (m + D[v]! < d[v]! && m + D[v]! <= maxD) d[v] = m + D[v]!;
      }
      return {
        ...base,
        field: { ...base.field, distance: d },
        at(p) {
          let best = base.at(p);
          for (const { offset, r } of relays) if (offset + r.at(p) <= maxD) best = Math.min(best, offset + r.at(p));
          return best;
        },
        solveMs,
        details: { ...base.details, pinchSolves: relays.length },
      };
    },
  };
}
