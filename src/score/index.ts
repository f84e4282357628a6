/**
 * Batch scoring of meshes (`orthodrome score`): metrics by group, gates from
 * a rules file, result rows and their files, manifests and landmark pairs.
 * Browser-safe (no `node:` import); exported from the Node entry
 * (`src/index.ts`) only, so the browser bundle does not carry the rules
 * schema library.
 *
 * @packageDocumentation
 */
export {
  METRICS, METRIC_GROUPS, DEFAULT_GROUPS, metricInfo, metricsOf, orderGroups, closestMetric,
  type MetricGroup, type MetricInfo, type MetricValue, type Metrics,
} from './catalog.js';
export { scoreSurface, DEFAULT_HEAT_SAMPLES, type ScoreOptions, type SurfaceScore } from './score-mesh.js';
export { triangleQuality, nearestRank, DELAUNAY_TOLERANCE, type TriangleQuality } from './quality.js';
export { radiusRatio } from '../metric/triangle.js';
export { twoSweepDiameter, heatError, mainComponentVertices, sampleVertices, type DiameterEstimate, type HeatError } from './sweeps.js';
export { parseLandmarks, formatLandmarks, measureLandmarks, landmarkExtremes, type LandmarkSpec, type LandmarkResult } from './landmarks.js';
export { parseRules, checkGates, groupsOfRules, ruleText, type Rule, type MetricRule, type LandmarkRule, type GateOutcome } from './rules.js';
export {
  resultColumns, resultFormatOf, encodeRow, csvHeader, readResults, sortRows, landmarkCell,
  type ScoreRow, type RowStatus, type ResultFormat, type ReadRow, type ReadResults,
} from './table.js';
export { parseManifest, type ManifestEntry } from './manifest.js';
// the CSV field and record reader live in io/csv.ts (their one home); re-exported here for the results' readers
export { csvField, csvRecords, type CsvRecord } from '../io/csv.js';
export { estimateScoreBytes, BYTES_PER_TRIANGLE } from './estimate.js';
