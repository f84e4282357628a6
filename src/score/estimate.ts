/**
 * A memory estimate for scoring one mesh, from its size and the metric
 * groups, checked before the work starts so that a mesh too large for the
 * per-mesh limit becomes an error row naming the limit instead of a worker
 * that runs the machine out of memory.
 *
 * Bytes per triangle, by group (an estimate on the high side; typed arrays
 * dominate: the half-edge arrays and positions, angles and areas per corner,
 * the exact method's windows — tens per edge on meshes with sharp features —
 * and the heat method's Cholesky factor on its refined triangulation):
 */
import type { MetricGroup } from './catalog.js';

/** Bytes per triangle by group; `base` is the loaded surface itself. */
export const BYTES_PER_TRIANGLE: Readonly<Record<MetricGroup | 'base', number>> = {
  base: 400,
  health: 300,
  quality: 100,
  curvature: 250,
  landmarks: 3000,
  diameter: 3000,
  heat: 6000,
};

/**
 * Estimated peak bytes to score a mesh of `triangles` triangles with `groups`
 * and `landmarkPairs` landmark pairs (exact-method groups share one solver;
 * the landmarks group without pairs solves nothing).
 */
export function estimateScoreBytes(triangles: number, groups: readonly MetricGroup[], landmarkPairs = 0): number {
  const g = new Set(groups);
  let per = BYTES_PER_TRIANGLE.base;
  for (const x of ['health', 'quality', 'curvature', 'heat'] as const) if (g.has(x)) per += BYTES_PER_TRIANGLE[x];
  // landmarks and diameter use the same exact solver; one solve's windows are live at a time
  if ((g.has('landmarks') && landmarkPairs > 0) || g.has('diameter') || g.has('heat')) per += BYTES_PER_TRIANGLE.diameter;
  return triangles * per;
}
