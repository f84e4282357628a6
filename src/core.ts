/**
 * The browser-safe core of orthodrome: everything in the public API except
 * the Node file adapters. Nothing reachable from here imports a `node:`
 * module (a test bundles this file for the browser and runs it in Chromium).
 *
 * @packageDocumentation
 */

// errors
export { OrthodromeError, isOrthodromeError, type ErrorCode } from './errors.js';

// reading and writing
export type { MeshData, PropertyColumn, ScalarType } from './io/mesh-data.js';
export { meshFromTriangles, vertexCount, faceCount } from './io/mesh-data.js';
export { parseObj } from './io/obj.js';
export { parsePly } from './io/ply.js';
export { parseMesh, sniffMesh, isGzip } from './io/sniff.js';
export { writePly, type PlyMeshInput, type WritePlyOptions } from './io/write-ply.js';
export { writeObj, writeObjPolyline, type ObjMeshInput, type WriteObjOptions } from './io/write-obj.js';
export { writeVertexCsv, toCsv, type CsvColumn, type CsvOptions } from './io/csv.js';
export { colorize, rampColor, type ColorizeOptions } from './io/colormap.js';
export {
  writeCurves, curvesToObj, curvesToGeoJson, curvesToCsv, curvesToJson, curveFormatOf, curvePointCount, CURVE_FORMATS,
  type Curve, type CurvePoints, type CurvePolygon, type CurveProperty, type CurveFormat, type CurveWriteOptions,
} from './io/write-curves.js';

// the half-edge mesh
export type { Topology } from './mesh/topology.js';
export { next, prev, faceOf, tail, tip, isBoundaryVertex, isBoundaryEdge, forEachOutgoing } from './mesh/topology.js';
export { buildTopology, type BuildReport, type BuildOptions, type BuiltMesh, type NonManifoldEdge, type DuplicateFace } from './mesh/build.js';
export { glueSeams, type GluedVertices } from './mesh/seams.js';
export { triangulate, type Triangulation } from './mesh/triangulate.js';
export { boundaryLoops, boundaryVertexMask, namedBoundaryLoops, LOOP_LENGTH_TIE, type NamedLoop } from './mesh/boundary.js';
export { components, type Components, type ComponentInfo } from './mesh/components.js';
export { surfaceFromMeshData, isManifold, type Surface } from './mesh/surface.js';

// the metric
export type { IntrinsicMesh } from './metric/intrinsic.js';
export { intrinsicFromPositions, intrinsicFromLengths, edgeLengthsFromPositions, meanEdgeLength, triangleInequalityViolations } from './metric/intrinsic.js';
export {
  triangleArea, angleOpposite, cotOpposite, faceAreas, cornerAngles, halfedgeCotans, edgeCotanWeights,
  barycentricVertexAreas, mixedVoronoiVertexAreas, COT_LIMIT, anglesOfSides,
} from './metric/triangle.js';
export { gaussianCurvature, meanCurvature, gaussBonnetResidual, type Curvature } from './metric/curvature.js';
export { intrinsicDelaunay, type DelaunayOptions, type DelaunayResult } from './metric/delaunay.js';
export { mollify, type Mollified } from './metric/mollify.js';

// sparse linear algebra
export { TripletMatrix, analyzeCholesky, CholeskyFactor, type CscMatrix, type Ordering, type CholeskySymbolic } from './linalg/index.js';

// geodesics
export type { DistanceField, DistanceMethod, SurfacePath } from './geodesic/field.js';
export { fieldStats } from './geodesic/field.js';
export { pointSources, boundaryCurves, type SourceSet } from './geodesic/sources.js';
export { HeatSolver, TIME_SCALE_RANGE, type HeatOptions, type HeatStats } from './geodesic/heat.js';
export { graphDistance, graphValueAt, type GraphOptions } from './geodesic/graph.js';
export { orientationCover, prepareCoverDistance, coverPathThrough, type OrientationCover } from './geodesic/cover.js';
export { throughPinches, DEFAULT_MAX_PINCH_SOLVES, type PinchOptions } from './geodesic/pinch.js';
export { exactDistance, DEFAULT_MEMORY_BUDGET, type ExactOptions, type ExactResult } from './geodesic/exact/index.js';
export type { WindowUsage } from './geodesic/exact/usage.js';
export { prepareExactGeometry, type ExactGeometry } from './geodesic/exact/geometry.js';
export { pathPolyline, pathLength } from './geodesic/path.js';
export {
  prepareDistance, checkEdgeLengths, MAX_LENGTH, type DistanceSolver, type DistanceResult, type DistanceOptions, type SolveOptions, type SolveProgress,
} from './geodesic/solver.js';

// points on the surface
export {
  parsePointSpec, formatSurfacePoint, checkSurfacePoint, canonicalSurfacePoint, surfacePointPosition, SNAP_TOLERANCE, BARY_SUM_TOLERANCE,
  type SurfacePoint, type PointSpec,
} from './query/surface-point.js';
export { SurfaceLocator, closestOnTriangle, type SnapResult } from './query/snap.js';
export { PointResolver, type Landing } from './query/resolve.js';
export { isLoopSpec, parseLoopSpec, selectLoop, loopCurves, resolveLoopSpec, type LoopSpec, type LoopSurface } from './query/loop-spec.js';

// reports
export { inspectSurface, inspectProblems, type InspectReport } from './report/inspect.js';
export { curvatureSummary, type CurvatureResult } from './report/curvature.js';
export { parseRequirement, checkRequirements, checkableKeys, type Requirement, type RequirementResult, type Comparison } from './report/require.js';
export { shortestPathThrough, AUTO_FLIP_FACES, FLIP_VERIFY_FACES, type WaypointPath, type WaypointOptions, type PathMethod } from './geodesic/waypoints.js';
export { flipGeodesicPath, BEND_TOLERANCE, type FlipPathResult } from './geodesic/flip/index.js';
export { verifyShortest, type VerifyResult } from './geodesic/flip/verify.js';
