/**
 * `orthodrome/points`: points on a surface: the text form of surface points
 * and its parser, canonical spellings, positions, snapping a position to the
 * nearest surface point (three.js and three-mesh-bvh: this subpath loads
 * them), the point resolver, split-vertex copies and named boundary loops.
 *
 * @packageDocumentation
 */
export {
  parsePointSpec, formatSurfacePoint, checkSurfacePoint, canonicalSurfacePoint, surfacePointPosition, SNAP_TOLERANCE, BARY_SUM_TOLERANCE,
  type SurfacePoint, type PointSpec,
} from '../mesh/surface-point.js';
export { SurfaceLocator, closestOnTriangle, type SnapResult } from '../query/snap.js';
export { PointResolver, type Landing } from '../query/resolve.js';
export { splitGroups, vertexCopies } from '../query/copies.js';
export { isLoopSpec, parseLoopSpec, selectLoop, loopCurves, resolveLoopSpec, type LoopSpec, type LoopSurface } from '../query/loop-spec.js';
