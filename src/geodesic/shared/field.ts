/**
 * Distance fields: the common result type of every distance solver.
 */
import type { SurfacePoint } from '../../mesh/surface-point.js';

/** Name of a distance method. */
export type DistanceMethod = 'heat' | 'exact' | 'graph';

/** Per-vertex distances from a set of sources. */
export interface DistanceField {
  /** Method that produced the field. */
  method: DistanceMethod;
  /** Distance per topology vertex in mesh units; `Infinity` where no source is reachable. */
  distance: Float64Array;
  /** The sources, as surface points. */
  sources: SurfacePoint[];
}

/** Min, max and mean over the reachable (finite) values of a field, and how many are unreachable. */
export function fieldStats(d: Float64Array): { min: number; max: number; mean: number; unreachable: number } {
  let min = Infinity, max = -Infinity, sum = 0, n = 0, unreachable = 0;
  for (let i = 0; i < d.length; i++) {
    const x = d[i]!;
    if (!Number.isFinite(x)) { unreachable++; continue; }
    if (x < min) min = x;
    if (x > max) max = x;
    sum += x;
    n++;
  }
  return n ? { min, max, mean: sum / n, unreachable } : { min: 0, max: 0, mean: 0, unreachable };
}

/** A path on the surface: the surface points it passes through, in order, and its length. */
export interface SurfacePath {
  /** Points in order: the ends, edge crossings and vertices passed through. Consecutive points share a face. */
  points: SurfacePoint[];
  /** Length in mesh units (sum of the straight segments inside faces). */
  length: number;
}
