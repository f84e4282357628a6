/**
 * `orthodrome/metric`: the intrinsic metric (one length per edge) and what
 * is computed from lengths alone: triangle angles, areas and cotangents,
 * curvature, the intrinsic Delaunay triangulation, mollification.
 *
 * @packageDocumentation
 */
export type { IntrinsicMesh } from '../metric/intrinsic.js';
export { intrinsicFromPositions, intrinsicFromLengths, edgeLengthsFromPositions, meanEdgeLength, triangleInequalityViolations } from '../metric/intrinsic.js';
export {
  triangleArea, angleOpposite, cotOpposite, faceAreas, cornerAngles, halfedgeCotans, edgeCotanWeights,
  COT_LIMIT, anglesOfSides,
} from '../metric/triangle.js';
export { barycentricVertexAreas, mixedVoronoiVertexAreas } from '../metric/vertex-areas.js';
export { gaussianCurvature, meanCurvature, gaussBonnetResidual, type Curvature } from '../metric/curvature.js';
export { intrinsicDelaunay, type DelaunayOptions, type DelaunayResult } from '../metric/delaunay.js';
export { mollify, type Mollified } from '../metric/mollify.js';
// user metrics (`--metric`): edge lengths in a metric of the user's, attached to a surface so every solver and report uses them
export {
  parseMetricSpec, attachMetric, attachedMetric, metricName, metricLengths, surfaceIntrinsic, compileExpression, gaussLegendre, quadratureEdgeLengths,
  METRIC_KINDS, FIELD_LAYOUTS, DEFAULT_LENGTH_TOLERANCE, metricCautions, isConstantMetric, ROUGH_SPEED_RATIO, ROUGH_EDGE_SHARE, LARGE_REPAIR, type MetricCaution,
  METRIC_REPAIRS, AUTO_REPAIR_LIMIT, shortenToEdgePaths, type MetricRepair, type Shortened,
  type UserMetric, type ParseMetricOptions, type MetricReport, type MetricLengthOptions, type AppliedMetric, type MetricTarget, type CompiledExpression,
} from '../metric/user/index.js';
