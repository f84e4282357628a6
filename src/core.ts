/**
 * The browser-safe entry of orthodrome (`orthodrome/browser`): the facade a
 * user reaches for first, without the Node file adapters. Nothing reachable
 * from here imports a `node:` module, and three.js (for snapping `p:` points)
 * is loaded only when {@link pointLocator} is called (a test bundles this
 * file for the browser and runs it in Chromium; `npm run size` prints its
 * bundle size).
 *
 * The internals are in documented subpaths, each with an index in `src/api/`:
 * `orthodrome/io`, `/mesh`, `/metric`, `/linalg`, `/geodesic`, `/points`,
 * `/report`, `/errors` and (Node only) `/node`.
 *
 * @packageDocumentation
 */

// errors
export { OrthodromeError, isOrthodromeError, type ErrorCode } from './errors.js';

// a surface from bytes
export { openSurface, isManifold, type OpenOptions, type Surface } from './api/surface.js';
export type { MeshData } from './io/mesh-data.js';

// reports
export { inspectSurface, inspectProblems, type InspectReport } from './report/inspect.js';
export { curvatureSummary, type CurvatureResult } from './report/curvature.js';

// points on the surface
export type { SurfacePoint } from './mesh/surface-point.js';
export { formatSurfacePoint } from './mesh/surface-point.js';
export { pointLocator, type PointResolver, type Landing } from './api/locate.js';

// distances
export type { SourceSet } from './geodesic/shared/sources.js';
export type { DistanceField, DistanceMethod } from './geodesic/shared/field.js';
export { fieldStats } from './geodesic/shared/field.js';
export type { DistanceSolver, DistanceResult, DistanceOptions, SolveOptions, SolveProgress } from './geodesic/solver.js';
export type { HeatOptions } from './geodesic/heat.js';
export {
  boundarySources, prepareDistances, measureDistances, type PrepareOptions, type MeasureOptions, type Measurement, type SolvableSurface,
  type HeatCheck,
} from './api/distance.js';

// paths
export type { PathMethod } from './geodesic/waypoints.js';
export { shortestPath, type PathOptions, type SurfaceRoute } from './api/path.js';
export { straightestLine, type StraightestOptions, type StraightestLine, type StraightSurface } from './curves/straightest.js';

// curves on the surface: isolines, bands, offsets (the rest: `orthodrome/curves`, src/curves/index.ts)
export { surfaceIsolines, type IsolineOptions, type IsolineResult } from './curves/extract.js';
export { surfaceOffset, type OffsetOptions, type OffsetResult } from './curves/offset.js';
export type { SurfaceCurve, ScalarField, LevelOptions } from './curves/isolines.js';
export type { Band, BandPolygon } from './curves/bands.js';

// result files
export { encodeVertexColumns, encodeRoute, type VertexColumn, type VertexFileOptions } from './api/write.js';
export { writeCurves, type Curve, type CurvePolygon, type CurveFormat } from './io/write-curves.js';
