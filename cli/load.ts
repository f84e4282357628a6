/**
 * Loading a mesh file for a command: read, parse, triangulate, build the
 * topology (the library's `loadSurface`), and refuse non-manifold input for
 * solvers unless splitting is allowed.
 */
import { Option } from 'commander';
import { loadSurface as openFile, isManifold, type Surface } from '../src/index.js';
import { DEFAULT_MAX_INPUT_BYTES } from '../src/api/node.js';
import { formatBytes, inputError, usageError } from '../src/errors.js';
import { since } from './run.js';
import { applyMetricOption } from './metric-option.js';
import type { MetricReport } from '../src/api/metric.js';

/** A loaded surface and how long it took. */
export interface Loaded {
  surface: Surface;
  loadMs: number;
  /** The `--metric` applied (edge lengths in it, attached to the surface), or null: lengths of the embedding. */
  metric: MetricReport | null;
}

/** The flags every command that loads a mesh takes (read by {@link loadSurface} and the metric option). */
export interface MeshLoadFlags {
  splitNonmanifold?: boolean;
  maxInputSize?: string;
  weldTolerance?: string;
  metric?: string;
  metricTolerance?: string;
  metricRepair?: string;
}

/**
 * A byte size as typed on the command line: a whole number of bytes with an
 * optional binary unit K, M, G or T (also KB/KiB, …, any case): `1500000`,
 * `512M`, `2G`. Throws `USAGE` naming `option` otherwise.
 */
export function parseByteSize(text: string, option: string): number {
  const m = /^\s*(\d+(?:\.\d+)?)\s*(?:([kmgt])(?:i?b)?|b)?\s*$/i.exec(text);
  const n = m ? Number(m[1]) * 1024 ** (m[2] ? 'kmgt'.indexOf(m[2].toLowerCase()) + 1 : 0) : NaN;
  if (!(n >= 1) || !Number.isFinite(n)) throw usageError(`${option} must be a size such as 800M or 2G, got '${text}'`);
  return Math.floor(n);
}

/** The `--max-input-size` option, for every command that reads a mesh. */
export function maxInputSizeOption(): Option {
  return new Option(
    '--max-input-size <size>',
    `largest mesh input accepted, on disk and after gzip unpacking (bytes, or with K/M/G; default ${formatBytes(DEFAULT_MAX_INPUT_BYTES)})`,
  );
}

/** The `--weld-tolerance` option, for every command that reads a mesh (STL input only). */
export function weldToleranceOption(): Option {
  return new Option(
    '--weld-tolerance <length>',
    'STL input: weld facet corners closer than this, in mesh units (default 1e-9 × the bounding-box diagonal; 0 welds exact copies only)',
  );
}

/** A `--weld-tolerance` value: a finite number ≥ 0, else `USAGE`. */
function parseWeldTolerance(text: string): number {
  const t = text.trim() === '' ? NaN : Number(text);
  if (!(Number.isFinite(t) && t >= 0)) throw usageError(`--weld-tolerance must be a length ≥ 0 in mesh units, got '${text}'`);
  return t;
}

/** Where a surface is not a manifold: the first problem, for the refusal message. */
function firstProblem(s: Surface): string {
  const r = s.report;
  if (r.nonManifoldEdgeCount > 0) {
    const e = r.nonManifoldEdges[0]!;
    return `${r.nonManifoldEdgeCount} non-manifold edge(s), first between vertices ${e.a} and ${e.b} (faces ${e.faces.join(', ')})`;
  }
  if (r.nonManifoldVertexCount > 0) return `${r.nonManifoldVertexCount} non-manifold vertex(es), first vertex ${r.nonManifoldVertices[0]}`;
  return `${r.orientationCuts} edge(s) where the surface cannot be oriented consistently`;
}

/**
 * Loads `path`. With `requireManifold`, a mesh that needed cutting or
 * splitting is refused (exit 2) with the first location, unless
 * `allowSplit` is set. `maxInputSize` is the `--max-input-size` text, if
 * given (input over it is a `LIMIT` error); `weldTolerance` the
 * `--weld-tolerance` text, if given; `metric` and `metricTolerance` the
 * `--metric` options (and `metricRepair`), if given (cli/metric-option.ts).
 */
export async function loadSurface(
  path: string,
  opts: { requireManifold?: boolean; allowSplit?: boolean; maxInputSize?: string; weldTolerance?: string; metric?: string; metricTolerance?: string; metricRepair?: string } = {},
): Promise<Loaded> {
  const t0 = performance.now();
  const maxInputBytes = opts.maxInputSize === undefined ? DEFAULT_MAX_INPUT_BYTES : parseByteSize(opts.maxInputSize, '--max-input-size');
  const weld = opts.weldTolerance === undefined ? {} : { weldTolerance: parseWeldTolerance(opts.weldTolerance) };
  const surface = await openFile(path, { maxInputBytes, ...weld });
  if (opts.requireManifold && !opts.allowSplit && !isManifold(surface)) {
    throw inputError(`${firstProblem(surface)}; see 'orthodrome inspect', or pass --split-nonmanifold to cut the mesh there`, path);
  }
  const metric = applyMetricOption(surface, opts.metric, opts.metricTolerance, opts.metricRepair); // --metric: every measurement on `surface` uses it
  return { surface, loadMs: since(t0), metric };
}
