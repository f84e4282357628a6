/**
 * The metrics `score` can compute, by group: their names (the CSV columns,
 * JSON keys and what rules name), units and meaning. A name not listed here
 * is an error wherever it is used, never a silent pass.
 *
 * | group       | cost                                   | what                                                  |
 * |-------------|----------------------------------------|-------------------------------------------------------|
 * | `health`    | linear (the `inspect` report)          | counts, topology, repairs, zero-area / sliver faces   |
 * | `quality`   | linear                                 | aspect-ratio quantiles, non-Delaunay edges            |
 * | `curvature` | linear                                 | Gaussian and mean curvature statistics                |
 * | `landmarks` | one exact solve per distinct start     | landmark distances against nominal values            |
 * | `diameter`  | two exact whole-mesh solves            | a lower bound of the geodesic diameter (two sweeps)   |
 * | `heat`      | heat factorisation + exact solves      | sampled heat-method error against the exact method   |
 *
 * The default set ({@link DEFAULT_GROUPS}) is the linear groups plus
 * landmarks (which cost nothing when a mesh has none).
 */

/** A group of metrics computed together. */
export type MetricGroup = 'health' | 'quality' | 'curvature' | 'landmarks' | 'diameter' | 'heat';

/** Every group, in column order. */
export const METRIC_GROUPS: readonly MetricGroup[] = ['health', 'quality', 'curvature', 'landmarks', 'diameter', 'heat'];

/** The groups computed when none are named. */
export const DEFAULT_GROUPS: readonly MetricGroup[] = ['health', 'quality', 'curvature', 'landmarks'];

/** One metric: its group, kind, unit and meaning. */
export interface MetricInfo {
  name: string;
  group: MetricGroup;
  kind: 'number' | 'boolean';
  /** Unit: `count`, `units` (mesh units), `units²`, `deg`, `rad`, `1/units²`, `1/units`, `fraction`, `ratio`, `vertex` or `''`. */
  unit: string;
  description: string;
}

const m = (group: MetricGroup, name: string, unit: string, description: string, kind: 'number' | 'boolean' = 'number'): MetricInfo => ({
  name, group, kind, unit, description,
});

/** Every metric, in column order. */
export const METRICS: readonly MetricInfo[] = [
  m('health', 'vertices', 'count', 'vertices in the file'),
  m('health', 'faces', 'count', 'faces (polygons) in the file'),
  m('health', 'triangles', 'count', 'triangles after triangulation and repairs'),
  m('health', 'edges', 'count', 'edges of the surface'),
  m('health', 'components', 'count', 'connected components'),
  m('health', 'boundaryLoops', 'count', 'boundary loops (holes and open rims)'),
  m('health', 'eulerCharacteristic', 'count', 'V − E + F'),
  m('health', 'genus', 'count', 'genus (empty when the surface is not orientable)'),
  m('health', 'orientable', '', 'whether the surface can be oriented consistently', 'boolean'),
  m('health', 'flippedFaces', 'count', 'faces whose winding was turned to agree with their neighbours'),
  m('health', 'nonManifoldEdges', 'count', 'edges with more than two faces'),
  m('health', 'nonManifoldVertices', 'count', 'vertices whose faces form more than one fan'),
  m('health', 'degenerateFacesDropped', 'count', 'faces dropped for repeating a corner'),
  m('health', 'duplicateFacesDropped', 'count', 'faces dropped for repeating an earlier face'),
  m('health', 'zeroAreaTriangles', 'count', 'triangles of zero area (inspect)'),
  m('health', 'capTriangles', 'count', 'cap triangles (an angle ≥ 160°)'),
  m('health', 'needleTriangles', 'count', 'needle triangles (an angle ≤ 5°, not caps)'),
  m('health', 'sliverTriangles', 'count', 'cap plus needle triangles'),
  m('health', 'zeroLengthEdges', 'count', 'edges whose ends coincide'),
  m('health', 'zeroAreaVertices', 'count', 'interior vertices of zero area'),
  m('health', 'isolatedVertices', 'count', 'vertices used by no face'),
  m('health', 'problems', 'count', 'problems inspect lists (0 for a healthy mesh)'),
  m('health', 'area', 'units²', 'surface area'),
  m('health', 'boundingBoxDiagonal', 'units', 'length of the bounding-box diagonal'),
  m('health', 'edgeLengthMin', 'units', 'shortest edge'),
  m('health', 'edgeLengthMean', 'units', 'mean edge length'),
  m('health', 'edgeLengthMax', 'units', 'longest edge'),
  m('health', 'minAngleDeg', 'deg', 'smallest triangle angle'),
  m('health', 'maxAngleDeg', 'deg', 'largest triangle angle'),
  m('health', 'obtuseFraction', 'fraction', 'share of triangles with an obtuse angle'),
  m('health', 'totalAngleDefect', 'rad', 'sum of interior angle defects'),
  m('health', 'totalBoundaryTurning', 'rad', 'sum of boundary turning angles'),
  m('health', 'gaussBonnetResidual', 'rad', 'defect + turning − 2πχ (rounding only on a sound mesh)'),
  m('quality', 'aspectRatioP50', 'ratio', 'median aspect ratio R/(2r) of triangles with area (1 = equilateral)'),
  m('quality', 'aspectRatioP90', 'ratio', '90th percentile aspect ratio'),
  m('quality', 'aspectRatioP99', 'ratio', '99th percentile aspect ratio'),
  m('quality', 'aspectRatioMax', 'ratio', 'largest aspect ratio of a triangle with area'),
  m('quality', 'nonDelaunayEdges', 'count', 'interior edges whose opposite angles sum to more than π'),
  m('quality', 'nonDelaunayFraction', 'fraction', 'non-Delaunay share of interior edges'),
  m('curvature', 'gaussianCurvatureMin', '1/units²', 'smallest Gaussian curvature (interior vertices)'),
  m('curvature', 'gaussianCurvatureMean', '1/units²', 'mean Gaussian curvature (interior vertices)'),
  m('curvature', 'gaussianCurvatureMax', '1/units²', 'largest Gaussian curvature (interior vertices)'),
  m('curvature', 'meanCurvatureMin', '1/units', 'smallest mean curvature (interior vertices)'),
  m('curvature', 'meanCurvatureMean', '1/units', 'mean of the mean curvature (interior vertices)'),
  m('curvature', 'meanCurvatureMax', '1/units', 'largest mean curvature (interior vertices)'),
  m('curvature', 'interiorVertices', 'count', 'interior vertices'),
  m('curvature', 'boundaryVertices', 'count', 'boundary vertices'),
  m('landmarks', 'landmarkCount', 'count', 'landmark pairs given for the mesh'),
  m('landmarks', 'landmarkMaxAbsDeviation', 'units', 'largest |measured − nominal| of a landmark pair (exact method)'),
  m('landmarks', 'landmarkMaxRelDeviation', 'fraction', 'largest |measured − nominal| / nominal of a landmark pair'),
  m('diameter', 'diameterLowerBound', 'units', 'geodesic diameter estimate by two exact sweeps: a lower bound'),
  m('diameter', 'diameterFrom', 'vertex', 'file vertex at one end of the two-sweep estimate'),
  m('diameter', 'diameterTo', 'vertex', 'file vertex at the other end'),
  m('heat', 'heatSamples', 'count', 'sources sampled for the heat-versus-exact error'),
  m('heat', 'heatErrorMax', 'fraction', 'largest |heat − exact| over vertices, over the sample, divided by the exact eccentricity of the source'),
  m('heat', 'heatErrorMean', 'fraction', 'mean |heat − exact| / exact eccentricity over vertices and sources'),
];

const BY_NAME = new Map(METRICS.map((x) => [x.name, x]));

/** The metric named `name`, or undefined. */
export function metricInfo(name: string): MetricInfo | undefined {
  return BY_NAME.get(name);
}

/** Metrics of the given groups, in column order. */
export function metricsOf(groups: readonly MetricGroup[]): MetricInfo[] {
  const g = new Set(groups);
  return METRICS.filter((x) => g.has(x.group));
}

/** Groups in column order, without repeats. */
export function orderGroups(groups: Iterable<MetricGroup>): MetricGroup[] {
  const g = new Set(groups);
  return METRIC_GROUPS.filter((x) => g.has(x));
}

/** The closest known metric name to `name` (edit distance at most 3), for "did you mean" hints. */
export function closestMetric(name: string): string | undefined {
  let best: string | undefined, bestD = 4;
  for (const x of METRICS) {
    const d = editDistance(name.toLowerCase(), x.name.toLowerCase());
    if (d < bestD) { bestD = d; best = x.name; }
  }
  return best;
}

/** Levenshtein distance (Levenshtein 1966), two rows. */
function editDistance(a: string, b: string): number {
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const cur = [i];
    for (let j = 1; j <= b.length; j++) cur[j] = Math.min(prev[j]! + 1, cur[j - 1]! + 1, prev[j - 1]! + (a[i - 1] === b[j - 1] ? 0 : 1));
    prev = cur;
  }
  return prev[b.length]!;
}

/** A metric value: a number, true/false, or null when the mesh has none (genus of a non-orientable surface). */
export type MetricValue = number | boolean | null;

/** Metric values by name. */
export type Metrics = Record<string, MetricValue>;
