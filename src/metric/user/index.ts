/**
 * User-supplied metrics (`--metric SPEC`): the spec's text → a metric →
 * edge lengths (quadrature, checked, repaired) → attached to a surface, so
 * every solver and report measures in it. See `spec.ts` for the spec forms.
 *
 * @packageDocumentation
 */
export { parseMetricSpec, METRIC_KINDS, type UserMetric, type ParseMetricOptions } from './spec.js';
export { compileExpression, EXPRESSION_FUNCTIONS, type CompiledExpression } from './expression.js';
export { gaussLegendre, type GaussRule } from './gauss-legendre.js';
export { quadratureEdgeLengths, DEFAULT_LENGTH_TOLERANCE, type QuadratureResult } from './edge-lengths.js';
export { FIELD_LAYOUTS } from './field.js';
export {
  metricLengths, attachMetric, attachedMetric, surfaceIntrinsic, metricName,
  type MetricTarget, type MetricLengthOptions, type MetricReport, type AppliedMetric,
} from './surface-metric.js';
export { shortenToEdgePaths, type Shortened } from './shorten.js';
export { repairLengths, METRIC_REPAIRS, AUTO_REPAIR_LIMIT, type MetricRepair, type Repaired } from './repair.js';
export { metricCautions, isConstantMetric, ROUGH_SPEED_RATIO, ROUGH_EDGE_SHARE, LARGE_REPAIR, type MetricCaution } from './roughness.js';
