/**
 * The `--metric SPEC` and `--metric-tolerance TOL` options, shared by every
 * command that measures: the spec is parsed (files it names are read here),
 * the surface's edge lengths are computed in that metric, checked and
 * repaired, and attached to the surface (the library's `attachMetric`), so
 * the command's solvers and reports all measure in it. What was found and
 * repaired is reported beside the results (`metric` in JSON, a line of
 * text).
 */
import { readFileSync } from 'node:fs';
import { Option } from 'commander';
import type { Surface } from '../src/index.js';
import { attachMetric, parseMetricSpec, type MetricReport } from '../src/api/metric.js';
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
export function applyMetricOption(surface: Surface, spec: string | undefined, tolerance: string | undefined): MetricReport | null {
  if (spec === undefined) {
    if (tolerance !== undefined) throw usageError('--metric-tolerance works with --metric');
    return null;
  }
  const tol = tolerance === undefined ? undefined : Number(tolerance);
  if (tol !== undefined && !(tol > 0 && tol < 1)) throw usageError(`--metric-tolerance must be a number in (0, 1), got '${tolerance}'`);
  const metric = parseMetricSpec(spec, { readText });
  return attachMetric(surface, metric, tol === undefined ? {} : { tolerance: tol });
}

/** The `metric` entry of a JSON report: `euclidean`, or the spec with what was found and repaired. */
export function metricJson(r: MetricReport | null | undefined): { metric: string; metricReport?: MetricReport } {
  return r ? { metric: r.metric, metricReport: r } : { metric: 'euclidean' };
}

/** The text line about the metric (empty without one). */
export function metricLines(r: MetricReport | null | undefined): string[] {
  if (!r) return [];
  const q = r.toleranceReached === null
    ? 'lengths as given'
    : `edge lengths by Gauss–Legendre quadrature to ${fmt(r.toleranceReached, 2)} relative (asked ${fmt(r.toleranceAsked!, 2)}${r.edgesAboveTolerance ? `; ${r.edgesAboveTolerance} edge(s) above it` : ''})`;
  const repair = r.triangleInequalityViolations
    ? `${r.triangleInequalityViolations} triangle(s) failed the triangle inequality: repaired by mollification, ${fmt(r.mollifyEpsilon, 4)} mesh units added to every edge (up to ${fmt(100 * r.largestRelativeChange, 3)}% of an edge)`
    : r.mollifyEpsilon > 0
      ? `near-degenerate triangles: ${fmt(r.mollifyEpsilon, 4)} mesh units added to every edge (mollification)`
      : 'every triangle satisfies the triangle inequality';
  return [`  metric ${r.metric}: ${q}; ${repair}`];
}
