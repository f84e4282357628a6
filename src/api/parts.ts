/**
 * What the facade derives from a surface once and reuses: the intrinsic
 * mesh (edge lengths), the orientation double cover of a non-orientable
 * surface, and the groups of topology copies of split vertices. Kept in a
 * WeakMap beside the surface object, so a surface stays plain data and the
 * derived parts go away with it.
 */
import type { Topology } from '../mesh/topology.js';
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import { surfaceIntrinsic, attachedMetric } from '../metric/user/surface-metric.js';
import { orientationCover, type OrientationCover } from '../geodesic/cover.js';
import { splitGroups } from '../query/copies.js';

/** What the solvers need of a surface (a whole `Surface` will do). */
export interface SolvableSurface {
  /** Half-edge connectivity. */
  topology: Topology;
  /** x, y, z per topology vertex. */
  positions: Float64Array;
  /** The build report's seams: edges cut to orient the surface (empty: orientable). */
  report: { orientationSeams: Int32Array };
}

interface Parts {
  mesh?: IntrinsicMesh;
  cover?: OrientationCover | null;
  groups?: number[][];
}

const cache = new WeakMap<SolvableSurface, Parts>();

function partsOf(s: SolvableSurface): Parts {
  let p = cache.get(s);
  if (!p) cache.set(s, (p = {}));
  return p;
}

/** The intrinsic mesh of `s` (edge lengths of its attached user metric, else from its positions), made once; `given` is adopted when it is for this topology. */
export function intrinsicOf(s: SolvableSurface, given?: IntrinsicMesh): IntrinsicMesh {
  const p = partsOf(s);
  if (given && given.topology === s.topology) p.mesh ??= given;
  return (p.mesh ??= surfaceIntrinsic(s));
}

/**
 * The orientation double cover of `s`, or null when `s` is orientable (no seams); made once. Its lengths are
 * those of `given` (e.g. a worker's shared lengths) or of an attached user metric, else of the positions.
 */
export function coverOf(s: SolvableSurface, given?: IntrinsicMesh): OrientationCover | null {
  const p = partsOf(s);
  if (p.cover === undefined) {
    const seams = s.report.orientationSeams;
    const lengths = (given && given.topology === s.topology ? given : attachedMetric(s)?.mesh)?.edgeLength;
    p.cover = seams.length ? orientationCover(s.topology, s.positions, seams, lengths) : null;
  }
  return p.cover;
}

/** {@link splitGroups} of `s`, made once. */
export function groupsOf(s: SolvableSurface): number[][] {
  const p = partsOf(s);
  return (p.groups ??= splitGroups(s.topology));
}
