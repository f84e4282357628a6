/**
 * The `--metric SPEC`, `--metric-tolerance TOL` and `--metric-repair MODE` options, shared by every
 * command that measures: the spec is parsed (files it names are read here),
 * the surface's edge lengths are computed in that metric, checked and
 * repaired, and attached to the surface (the library's `attachMetric`), so
 * the command's solvers and reports all measure in it. What was found and
 * repaired is reported beside the results (`metric` in JSON, a line of
 * text).
 */
import { readFileSync } from 'node:fs';
import { Option } from 'commander';
import { pointLocator, shortestPath, type Surface } from '../src/index.js';
import { attachMetric, parseMetricSpec, metricCautions, METRIC_REPAIRS, type MetricReport, type MetricRepair } from '../src/api/metric.js';
import { inputError, usageError } from '../src/errors.js';
import { fmt } from './run.js';

/** The `--metric` option. */
export function metricOption(): Option {
  return new Option(
    '--metric <spec>',
    "measure in a metric of your own: tensor:XX,XY,XZ,YY,YZ,ZZ (or tensor:FILE.json), conformal:EXPR (scale factor of x,y,z), form:E;F;G (first fundamental form over the mesh's x,y as u,v), field:NAME (per-vertex PLY properties NAME_xx…NAME_zz, NAME_xx,NAME_xy,NAME_yy or NAME), lengths:FILE.csv (A,B,LENGTH per edge)",
  );
}

/** The `--metric-tolerance` option. */
export function metricToleranceOption(): Option {
  return new Option('--metric-tolerance <tol>', '--metric: relative accuracy of each edge length (Gauss–Legendre quadrature, default 1e-10)');
}

/** The `--metric-repair` option. */
export function metricRepairOption(): Option {
  return new Option(
    '--metric-repair <mode>',
    "--metric: how faces that break the triangle inequality are repaired: auto (add one small length to every edge; refuse, exit 2, when it would exceed 5% of the mean edge), mollify (add it however large), shorten (first shorten edges to the shortest path along edges)",
  ).choices([...METRIC_REPAIRS]);
}

/** The text of a file a metric spec names; unreadable is an `INPUT` error naming it. */
function readText(path: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (e) {
    throw inputError(`cannot read the metric file (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`, path);
  }
}

/**
 * Applies `--metric` (if given) to `surface`: returns the report, or null
 * when no metric was given (lengths of the embedding).
 */
export function applyMetricOption(surface: Surface, spec: string | undefined, tolerance: string | undefined, repair?: string): MetricReport | null {
  if (spec === undefined) {
    if (tolerance !== undefined) throw usageError('--metric-tolerance works with --metric');
    if (repair !== undefined) throw usageError('--metric-repair works with --metric');
    return null;
  }
  const tol = tolerance === undefined ? undefined : Number(tolerance);
  if (tol !== undefined && !(tol > 0 && tol < 1)) throw usageError(`--metric-tolerance must be a number in (0, 1), got '${tolerance}'`);
  const metric = parseMetricSpec(spec, { readText });
  const report = attachMetric(surface, metric, { ...(tol === undefined ? {} : { tolerance: tol }), ...(repair === undefined ? {} : { repair: repair as MetricRepair }) });
  for (const c of metricCautions(report)) process.stderr.write(`orthodrome: caution: ${c.message}\n`); // the repair caution: every command
  return report;
}

/**
 * Under a user metric, the cautions that concern `method` alone (the heat
 * method: a metric too rough for the mesh, or any varying metric), one line
 * each on stderr; the repair caution was given by {@link applyMetricOption}.
 */
export function warnMetricMethod(r: MetricReport | null | undefined, method: string): void {
  if (!r) return;
  for (const c of metricCautions(r, method)) if (c.kind !== 'repair') process.stderr.write(`orthodrome: caution: ${c.message}\n`);
}

/**
 * The `metric` entries of a JSON report: `euclidean`, or the spec with what
 * was found and repaired and the cautions it calls for (the stderr lines of
 * {@link applyMetricOption} and {@link warnMetricMethod}; those about
 * `method` only when it is given).
 */
export function metricJson(r: MetricReport | null | undefined, method?: string): { metric: string; metricReport?: MetricReport; metricCautions?: string[] } {
  return r ? { metric: r.metric, metricReport: r, metricCautions: metricCautions(r, method).map((c) => c.message) } : { metric: 'euclidean' };
}

/** The text line about the metric (empty without one). */
export function metricLines(r: MetricReport | null | undefined): string[] {
  if (!r) return [];
  const q = r.toleranceReached === null
    ? 'lengths as given'
    : r.toleranceReached === 0 && r.evaluations === r.edges
      ? 'edge lengths exact (the metric is constant along each edge)'
      : `edge lengths by Gauss–Legendre quadrature to ${fmt(r.toleranceReached, 2)} relative (asked ${fmt(r.toleranceAsked!, 2)}${r.edgesAboveTolerance ? `; ${r.edgesAboveTolerance} edge(s) above it` : ''})`;
  const repair = r.triangleInequalityViolations && r.edgesShortened
    ? `${r.triangleInequalityViolations} triangle(s) failed the triangle inequality: repaired by shortening ${r.edgesShortened} edge(s) to the shortest path along edges (by up to ${fmt(100 * r.largestShortening, 3)}%), then ${fmt(r.mollifyEpsilon, 4)} mesh units added to every edge`
    : r.triangleInequalityViolations
    ? `${r.triangleInequalityViolations} triangle(s) failed the triangle inequality: repaired by mollification, ${fmt(r.mollifyEpsilon, 4)} mesh units added to every edge (up to ${fmt(100 * r.largestRelativeChange, 3)}% of an edge)`
    : r.mollifyEpsilon > 0
      ? `near-degenerate triangles: ${fmt(r.mollifyEpsilon, 4)} mesh units added to every edge (mollification)`
      : 'every triangle satisfies the triangle inequality';
  return [`  metric ${r.metric}: ${q}; ${repair}`];
}

/** The demo's climbing metric: a metre of height counts as four metres of ground (ds² = dx² + dy² + 16 dz²). */
export const CLIMB_METRIC = 'tensor:1,0,0,1,0,16';

/**
 * The demo's user-metric case, on the hillside: the route from `from` to
 * `to` measured plainly and in {@link CLIMB_METRIC}, with the 3D length and
 * the height climbed of each, printed through `say`. A planner reads off
 * how much longer the gentler route is and how much climbing it saves.
 * `load` loads the hillside with the `--metric` spec given (none: plain).
 */
export async function demoClimbingMetric(
  load: (metric: string | undefined) => Promise<{ surface: Surface; metric: MetricReport | null }>, from: string, to: string, say: (s: string) => void,
): Promise<void> {
  const route = async (metric: string | undefined) => {
    const { surface, metric: report } = await load(metric);
    const points = await pointLocator(surface);
    const r = shortestPath(surface, [points.resolve(from, 'start'), points.resolve(to, 'end')]);
    const P = r.polyline;
    let length = 0, climb = 0, effort = 0;
    for (let k = 3; k < P.length; k += 3) {
      const dx = P[k]! - P[k - 3]!, dy = P[k + 1]! - P[k - 2]!, dz = P[k + 2]! - P[k - 1]!;
      length += Math.hypot(dx, dy, dz);
      climb += Math.max(0, dz);
      effort += Math.hypot(dx, dy, 4 * dz); // each segment lies in one face: its length in the constant tensor
    }
    return { cost: r.length, length, climb, effort, report };
  };
  const plain = await route(undefined), steep = await route(CLIMB_METRIC);
  say(`== Ostrel Knoll: west gate → north stile where climbing counts more (--metric ${CLIMB_METRIC}: a metre up or down costs four on the level)`);
  say(`  shortest on the ground: ${fmt(plain.length, 6)} m long, ${fmt(plain.climb, 4)} m of climbing (${fmt(plain.effort, 6)} effort-metres)`);
  say(`  least effort: ${fmt(steep.length, 6)} m long, ${fmt(steep.climb, 4)} m of climbing (${fmt(steep.cost, 6)} effort-metres)`);
  for (const l of metricLines(steep.report)) say(l);
}
