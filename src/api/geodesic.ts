/**
 * `orthodrome/geodesic`: the distance and path solvers on an intrinsic mesh:
 * the one front for every method (`prepareDistance`), the heat method, exact
 * window propagation, the edge graph, the orientation double cover, pinch
 * points, waypoint paths and paths by edge flips.
 *
 * @packageDocumentation
 */
export type { DistanceField, DistanceMethod, SurfacePath } from '../geodesic/shared/field.js';
export { fieldStats } from '../geodesic/shared/field.js';
export { pointSources, boundaryCurves, type SourceSet } from '../geodesic/shared/sources.js';
export { HeatSolver, TIME_SCALE_RANGE, type HeatOptions, type HeatStats, type HeatSolveStats } from '../geodesic/heat.js';
export { graphDistance, graphValueAt, type GraphOptions } from '../geodesic/graph.js';
export { orientationCover, prepareCoverDistance, coverPathThrough, type OrientationCover } from '../geodesic/cover.js';
export { throughPinches, DEFAULT_MAX_PINCH_SOLVES, type PinchOptions } from '../geodesic/pinch.js';
export { exactDistance, DEFAULT_MEMORY_BUDGET, type ExactOptions, type ExactResult } from '../geodesic/exact/index.js';
export type { WindowUsage } from '../geodesic/exact/usage.js';
export { prepareExactGeometry, type ExactGeometry } from '../geodesic/exact/geometry.js';
export { pathPolyline, pathLength } from '../geodesic/path.js';
export { checkDistanceField, HEAT_CHECK_LIMITS, CHORD_MIN_EDGES, CHORD_MAX_SOURCES, type ChordBound, type HeatCheck } from '../geodesic/heat-check.js';
export { checkHeatField } from './distance.js';
export {
  prepareDistance, checkEdgeLengths, MAX_LENGTH, type DistanceSolver, type DistanceResult, type DistanceOptions, type SolveOptions, type SolveProgress,
} from '../geodesic/solver.js';
export { shortestPathThrough, AUTO_FLIP_FACES, FLIP_VERIFY_FACES, AUTO_PROVE_FACES, type WaypointPath, type WaypointOptions, type PathMethod } from '../geodesic/waypoints.js';
export { flipGeodesicPath, BEND_TOLERANCE, type FlipPathResult } from '../geodesic/flip/index.js';
export { verifyShortest, type VerifyResult } from '../geodesic/flip/verify.js';
// walking time on terrain (src/travel): pace models, the Steiner graph, fields, routes and their convergence
export * from '../travel/index.js';
