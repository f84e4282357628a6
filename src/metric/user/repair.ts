/**
 * How the lengths of a user metric are repaired when faces break the
 * triangle inequality, and when the repair is refused.
 *
 * - `mollify`: intrinsic mollification (Sharp & Crane, "A Laplacian for
 *   Nonmanifold Triangle Meshes", CGF 39(5), 2020, §4.5; `metric/mollify.ts`):
 *   one ε added to every edge. A distance that crosses k edges grows by
 *   about k·ε, so it grows by about ε / h of itself (h: the mean edge).
 * - `shorten`: the decrease-only repair (Gilbert & Jain 2017;
 *   `shorten.ts`): every edge set to the shortest path along edges between
 *   its ends, then mollified with the usual margin δ for strict inequality.
 *   Distances never exceed the user's own cost along any chain of edges.
 * - `auto` (the default): mollify when ε is at most {@link AUTO_REPAIR_LIMIT}
 *   of h; beyond it, refuse with an `INPUT` error that says how much the
 *   repair would add and what to do. Nothing is measured in lengths that
 *   would put every distance ε / h off without the user asking for it.
 *
 * The limit, measured (`test/metric/user-repair.test.ts`, the cases of
 * `roughness.ts`): a sliver's lengths rounded to three digits break it at
 * rounding level, ε/h ≈ 1e-3; a per-vertex cost of 1 or 8 at random,
 * ε/h = 0.66–0.70; walking times on steep ground (user-walking.test.ts),
 * ε/h = 24–67; a lengths file with one edge set far too long
 * (test/cli/metric.test.ts), 14.8. None of these lies between 1% and 50%,
 * so the limit only has to part rounding from real breakage. At 5% a
 * distance is at most about 5% long, between the heat method's mean and
 * worst errors in the README accuracy table (≤ 2%, ≤ 10%); a repair
 * above 1% of an edge (LARGE_REPAIR) still gets the repair caution.
 */
import { inputError } from '../../errors.js';
import type { IntrinsicMesh } from '../intrinsic.js';
import { meanEdgeLength, triangleInequalityViolations } from '../intrinsic.js';
import { mollify } from '../mollify.js';
import { shortenToEdgePaths } from './shorten.js';

/** The repairs a user metric's lengths can take (see the module comment). */
export const METRIC_REPAIRS = ['auto', 'mollify', 'shorten'] as const;

/** One of {@link METRIC_REPAIRS}. */
export type MetricRepair = (typeof METRIC_REPAIRS)[number];

/** Under `auto`, the largest mollification ε accepted, as a fraction of the mean edge length before repair. */
export const AUTO_REPAIR_LIMIT = 0.05;

/** What {@link repairLengths} did. */
export interface Repaired {
  /** The repaired lengths (`raw` itself when nothing changed). */
  mesh: IntrinsicMesh;
  /** Faces failing the triangle inequality before repair. */
  violations: number;
  /** Mean edge length before repair. */
  meanBefore: number;
  /** ε added to every edge by the final mollification (0: none). */
  epsilon: number;
  /** The margin δ asked of every face, mesh units. */
  delta: number;
  /** Edges shortened (`shorten` only). */
  edgesShortened: number;
  /** Largest relative shortening of an edge (`shorten` only; 0: none). */
  largestShortening: number;
  /** Largest |repaired − raw| / raw over the edges. */
  largestRelativeChange: number;
}

const num = (x: number) => (x >= 1000 ? x.toFixed(0) : x.toPrecision(3));

/**
 * Repairs `raw` under `mode` (mollification margin δ = `relativeDelta` × the
 * mean edge). The refusal of `auto` names `where`, the file (the lengths
 * file of a `lengths:` metric, else the mesh), and `label`, the metric's spec,
 * when given (a metric that is not a file of its own).
 */
export function repairLengths(raw: IntrinsicMesh, mode: MetricRepair, relativeDelta: number, where: string, label?: string): Repaired {
  const violations = triangleInequalityViolations(raw);
  const meanBefore = meanEdgeLength(raw);
  let base = raw, edgesShortened = 0, largestShortening = 0;
  // "if it ain't broke, don't fix it": without a broken face, every mode is the same mollification (bit for bit)
  if (mode === 'shorten' && violations > 0) {
    const s = shortenToEdgePaths(raw.topology, raw.edgeLength);
    base = { topology: raw.topology, edgeLength: s.lengths };
    edgesShortened = s.edgesShortened;
    largestShortening = s.largestShortening;
  }
  const m = mollify(base, relativeDelta);
  if (mode === 'auto' && violations > 0 && m.epsilon > AUTO_REPAIR_LIMIT * meanBefore) {
    const nf = raw.topology.nf, k = m.epsilon / meanBefore;
    const effect = k >= 1 ? 'distances would be mostly a count of the edges crossed' : `distances would grow by about ${Math.round(100 * k)}%`;
    throw inputError(
      `${label ? `under the metric ${label}, ` : ''}${violations} of ${nf} faces break the triangle inequality; mollification would add ${num(m.epsilon)} to every edge, ` +
        `${num(k)}× the mean edge length (more than the ${100 * AUTO_REPAIR_LIMIT}% repair 'auto' accepts), ` +
        `so ${effect}. Shorten the long edges to the shortest path along edges ` +
        `(repair 'shorten', --metric-repair shorten), or accept the change (--metric-repair mollify); for walking times use the travel command`,
      where,
    );
  }
  const L0 = raw.edgeLength, L1 = m.mesh.edgeLength;
  let largestRelativeChange = 0;
  if (L1 !== L0) {
    for (let e = 0; e < L0.length; e++) {
      const c = L0[e]! > 0 ? Math.abs(L1[e]! - L0[e]!) / L0[e]! : L1[e] === L0[e] ? 0 : Infinity;
      if (c > largestRelativeChange) largestRelativeChange = c;
    }
  }
  return { mesh: m.mesh, violations, meanBefore, epsilon: m.epsilon, delta: m.delta, edgesShortened, largestShortening, largestRelativeChange };
}
