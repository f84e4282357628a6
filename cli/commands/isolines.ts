/**
 * `orthodrome isolines MESH (--from SOURCE... | --field NAME|FILE.csv[:COLUMN])
 * (--every D | --levels D1,D2,...) [--bands]`: level sets of the distance
 * field (or of a per-vertex field from the mesh file or a CSV file),
 * chained into polylines, and the bands between them.
 */
import { readFile } from 'node:fs/promises';
import { Command, Option } from 'commander';
import { type MeshLoadFlags, loadSurface, maxInputSizeOption, weldToleranceOption } from '../load.js';
import { metricOption, metricToleranceOption, metricRepairOption, metricJson, metricLines, warnMetricMethod } from '../metric-option.js';
import { heatCheckJson, warnHeatCheck } from '../heat-caution.js';
import { checkOutput } from '../output.js';
import { action, fmt, toJson } from '../run.js';
import { TERRAIN_CAUTION } from '../cautions.js';
import { memoryBudgetBytes, memoryBudgetOption } from '../memory-budget.js';
import { factorThreads, orderingThreads, warmHeatThreads } from '../jobs.js';
import { boundarySources, measureDistances, pointLocator, surfaceIsolines, writeCurves, writeFileAtomic, type Band, type CurvePolygon, type DistanceMethod, type PointResolver, type SourceSet, type Surface } from '../../src/index.js';
import { readPolylines, polylineSources, distanceScalarField, fieldFromCsv, vertexProperty, toTopologyVertices, DEFAULT_MAX_LEVELS, type ScalarField, type SurfaceCurve } from '../../src/curves/index.js';
import { curveFormatOf, CURVE_FORMATS } from '../../src/api/io.js';
import { usageError } from '../../src/errors.js';

/** Options shared by `isolines` and `offset`. */
export interface CurveCliOptions extends MeshLoadFlags {
  from?: string[];
  fromCurve?: string[];
  fromPolyline?: string[];
  method: DistanceMethod;
  output?: string;
  json?: boolean;
  memoryBudget?: string;
}

interface IsolinesCliOptions extends CurveCliOptions {
  field?: string;
  every?: string;
  levels?: string;
  bands?: boolean;
  maxLevels?: string;
}

const collect = (v: string, prev: string[] = []) => [...prev, v];

/** The `--from` help shared by `isolines` and `offset`. */
export const FROM_HELP =
  "source: v:INDEX, e:INDEX:T, f:INDEX:B0,B1,B2, p:X,Y,Z (nearest surface point), p:X,Y (the surface point straight below or above), 'boundary' (all boundary loops), loop:ID (one boundary loop, ids as 'inspect' lists them), loop@X,Y,Z or loop@X,Y (the loop nearest the point); repeat for several";
/** The `--from-curve` help. */
export const FROM_CURVE_HELP = "a curve source, e.g. a trim line: point specs separated by ';', each consecutive pair on a common face (e.g. 'v:3;e:17:0.5;v:9'); repeat for several";

/** A number option: finite, and positive when `positive`; `USAGE` naming the option otherwise. */
export function numberOption(text: string, name: string, positive = false): number {
  const x = Number(text);
  if (text.trim() === '' || !Number.isFinite(x) || (positive && !(x > 0))) throw usageError(`${name} must be a ${positive ? 'positive ' : ''}number, got '${text}'`);
  return x;
}

/** The `--from-polyline` help. */
export const FROM_POLYLINE_HELP =
  'a curve source from a file: a polyline in 3D (.csv with x,y,z columns, one polyline per value of a curve column if any; or .obj v and l lines), each point snapped to the surface and consecutive points joined by the shortest path on it; repeat for several';

/** True when any source option is given. */
export function hasSources(o: CurveCliOptions): boolean {
  return (o.from?.length ?? 0) + (o.fromCurve?.length ?? 0) + (o.fromPolyline?.length ?? 0) > 0;
}

/** One source set from every --from, --from-curve and --from-polyline (`USAGE` naming the bad spec, `INPUT` naming a bad file). */
export async function sourceSet(mesh: string, surface: Surface, resolver: PointResolver, o: CurveCliOptions): Promise<SourceSet> {
  const set: SourceSet = { points: [], curves: [] };
  for (const s of o.from ?? []) {
    if (s.trim() === 'boundary') {
      const loops = boundarySources(surface);
      if (loops.length === 0) throw usageError('--from boundary: the mesh has no boundary', mesh);
      set.curves.push(...loops);
    } else if (resolver.isLoop(s)) set.curves.push(...resolver.resolveLoop(s, '--from', mesh));
    else set.points.push(...resolver.resolveAll(s, '--from'));
  }
  for (const c of o.fromCurve ?? []) set.curves.push(resolver.resolveCurve(c, '--from-curve'));
  for (const file of o.fromPolyline ?? []) {
    const format = /\.csv$/i.test(file) ? 'csv' : /\.obj$/i.test(file) ? 'obj' : null;
    if (!format) throw usageError('a polyline file must be .csv or .obj', file);
    let text: string;
    try {
      text = await readFile(file, 'utf8');
    } catch (e) {
      throw usageError(`cannot read the polyline file (${(e as NodeJS.ErrnoException).code ?? 'error'})`, file);
    }
    set.curves.push(...(await polylineSources(surface, readPolylines(text, file, format))));
  }
  return set;
}

/** Checks `-o` (a curve format, writable, not the mesh) before any work. */
export function checkCurveOutput(path: string, mesh: string): void {
  checkOutput(path, CURVE_FORMATS, [mesh]);
}

/** Writes curves (and band polygons, GeoJSON only) to `path` by extension, atomically. */
export async function writeCurveFile(path: string, curves: SurfaceCurve[], polygons: CurvePolygon[] = [], metric?: string): Promise<void> {
  const format = curveFormatOf(path)!;
  // under --metric the levels and curve lengths are measured in it, the coordinates are those of the embedding: the file says so
  const plain = curves.map((c) => ({ level: c.level, closed: c.closed, length: c.length, points: c.points, ...(metric ? { properties: { metric } } : {}) }));
  const units = metric ? `mesh units (levels and lengths measured in the metric ${metric}; coordinates of the embedding)` : 'mesh units';
  await writeFileAtomic(path, writeCurves(format, plain, { units, ...(format === 'geojson' ? { polygons } : {}) }));
}

/** A curve as `--json` prints it. */
export function curveJson(c: SurfaceCurve) {
  return { level: c.level, closed: c.closed, length: c.length, points: c.points };
}

/** The source options `isolines` and `offset` share: --from, --from-curve, --from-polyline. */
export function addSourceOptions(cmd: Command): Command {
  return cmd
    .option('--from <source>', FROM_HELP, collect)
    .option('--from-curve <points>', FROM_CURVE_HELP, collect)
    .option('--from-polyline <file>', FROM_POLYLINE_HELP, collect);
}

/** The output and mesh-loading options `isolines` and `offset` share (after their own). */
export function addCurveRunOptions(cmd: Command): Command {
  return cmd
    .option('--json', 'print the result as JSON')
    .option('--split-nonmanifold', 'cut non-manifold edges and split non-manifold vertices instead of refusing the mesh (curves end at the cuts)')
    .addOption(maxInputSizeOption())
    .addOption(weldToleranceOption())
    .addOption(metricOption()).addOption(metricToleranceOption()).addOption(metricRepairOption())
    .addOption(memoryBudgetOption());
}

/** Registers the command. */
export function registerIsolines(program: Command): void {
  const cmd = program
    .command('isolines')
    .description('level sets of the distance field (or of a per-vertex field) chained into polylines, and the bands between them')
    .argument('<mesh>', 'OBJ, PLY or STL file (optionally .gz)');
  addSourceOptions(cmd)
    .option('--field <name>', "instead of distances: x, y or z (z: contour lines of height), a vertex property of the mesh file (PLY), or FILE.csv[:COLUMN] (a header row; one row per vertex, or a 'vertex' column; empty = missing)")
    .option('--every <d>', 'a level at every multiple of D')
    .option('--levels <list>', 'levels listed, separated by commas (D1,D2,...)')
    .option('--bands', 'also the bands between consecutive levels: polygons, area on the surface and in plan view (xy)')
    .option('--max-levels <n>', `most levels allowed (default ${DEFAULT_MAX_LEVELS})`)
    .addOption(new Option('--method <method>', 'distances: exact (window propagation; exact crossings along edges), heat (heat method) or graph (along edges)').choices(['exact', 'heat', 'graph']).default('exact'))
    .option('-o, --output <file>', 'write the curves: .obj (l polylines), .geojson (with the band polygons), .csv or .json; add .gz to compress');
  addCurveRunOptions(cmd)
    .addHelpText('after', `
A vertex exactly on a level counts as above it. Curves are open where they reach the boundary,
a cut, or a face with a missing value, closed otherwise; closed curves repeat their first point.
Plan-view areas are areas projected on the xy-plane. Lengths and areas are in mesh units.
${TERRAIN_CAUTION}`)
    .action(action(async (mesh: string, o: IsolinesCliOptions) => runIsolines(mesh, o)));
}

async function runIsolines(mesh: string, o: IsolinesCliOptions): Promise<number> {
  if (o.output) checkCurveOutput(o.output, mesh);
  if ((o.every === undefined) === (o.levels === undefined)) throw usageError('give either --every D or --levels D1,D2,...');
  const every = o.every !== undefined ? numberOption(o.every, '--every', true) : undefined;
  const levels = o.levels !== undefined ? o.levels.split(',').map((x) => numberOption(x, '--levels')) : undefined;
  const maxLevels = o.maxLevels !== undefined ? numberOption(o.maxLevels, '--max-levels', true) : undefined;
  if (hasSources(o) === (o.field !== undefined)) throw usageError('give either --from/--from-curve/--from-polyline (distances) or --field (a per-vertex field)');
  const memoryBudget = memoryBudgetBytes(o.memoryBudget);
  if (o.method === 'heat') warmHeatThreads(mesh); // large files: the threads load while the mesh is read
  const { surface, loadMs, metric } = await loadSurface(mesh, { requireManifold: true, allowSplit: o.splitNonmanifold, maxInputSize: o.maxInputSize, weldTolerance: o.weldTolerance, metric: o.metric, metricTolerance: o.metricTolerance, metricRepair: o.metricRepair });
  if (o.field === undefined) warnMetricMethod(metric, o.method); // the heat method under a varying or rough metric: a caution on stderr

  let field: ScalarField;
  let heatCheck: Parameters<typeof heatCheckJson>[0]; // the heat method's a-posteriori check (heat-caution.ts)
  let solveMs = 0, prepareMs = 0;
  let resolver: PointResolver | null = null;
  if (o.field !== undefined) {
    field = { values: toTopologyVertices(surface.topology, await readField(o.field, surface)) };
  } else {
    resolver = await pointLocator(surface);
    const set = await sourceSet(mesh, surface, resolver, o);
    const m = measureDistances(surface, set, { method: o.method, memoryBudget, ...(o.method === 'heat' ? { heat: { factorExecutor: factorThreads(), orderingExecutor: orderingThreads() } } : {}) });
    heatCheck = m.heatCheck;
    warnHeatCheck(heatCheck); // a suspect heat field: a caution on stderr, exit 0
    field = distanceScalarField(m, surface, set); // exact: every crossing, curves bent in faces (exact-level.ts)
    solveMs = m.solveMs;
    prepareMs = m.prepareMs;
  }
  const r = surfaceIsolines(surface, field, {
    ...(every !== undefined ? { every } : { levels: levels! }),
    ...(maxLevels !== undefined ? { maxLevels } : {}),
    bands: Boolean(o.bands),
  });
  if (o.output) await writeCurveFile(o.output, r.curves, (r.bands ?? []).flatMap(bandPolygons), metric?.metric);
  const timings = { load: loadMs, prepare: round(prepareMs), solve: round(solveMs), curves: round(r.ms) };
  if (o.json) {
    process.stdout.write(toJson({
      mesh, field: o.field ?? 'distance', method: o.field !== undefined ? null : o.method, unit: 'mesh units', ...metricJson(metric, o.field !== undefined ? undefined : o.method), ...heatCheckJson(heatCheck), levels: r.levels,
      curves: r.curves.map(curveJson),
      ...(r.bands ? { bands: r.bands.map((b) => ({ lower: b.lower, upper: b.upper, area: b.area, planArea: b.planArea, polygons: b.polygons })) } : {}),
      output: o.output ?? null, timings,
    }) + '\n');
    return 0;
  }
  const L: string[] = [`${mesh}: isolines of ${o.field !== undefined ? `field ${o.field}` : `${o.method} distance`} (mesh units), ${r.levels.length} level(s), ${r.curves.length} curve(s)`];
  for (const l of resolver?.landings ?? []) L.push(`  ${l.spec} landed at (${l.position.join(', ')}), moved ${fmt(l.distance, 4)} mesh units`);
  for (const level of r.levels) {
    const cs = r.curves.filter((c) => c.level === level);
    const untraced = r.untraced.filter((u) => u.level === level).map((u) => u.face);
    if (untraced.length > 0) L.push(`  level ${fmt(level, 9)}: not traced: a curve lying wholly inside face(s) ${untraced.join(', ')} round several sources there (or a source curve inside one face)`);
    if (cs.length === 0) {
      // heat and graph fields are linear in each face: a level closer to a source than its nearest vertex is not seen
      const why = o.field === undefined && o.method !== 'exact' ? `the ${o.method} field does not cross it; it cannot show a level closer to a source than the source's nearest vertex: --method exact can` : 'the field does not cross it';
      if (levels && untraced.length === 0) L.push(`  level ${fmt(level, 9)}: no curve (${why})`);
      continue;
    }
    const closed = cs.filter((c) => c.closed).length;
    L.push(`  level ${fmt(level, 9)}: ${cs.length} curve(s) (${closed} closed, ${cs.length - closed} open), length ${fmt(cs.reduce((a, c) => a + c.length, 0), 9)}`);
  }
  for (const b of r.bands ?? []) {
    L.push(`  band [${fmt(b.lower, 9)}, ${fmt(b.upper, 9)}): area ${fmt(b.area, 9)}, plan area ${fmt(b.planArea, 9)} (mesh units²), ${b.polygons.length} polygon(s)`);
  }
  L.push(`  timings: load ${fmt(timings.load, 4)} ms, prepare ${fmt(timings.prepare, 4)} ms, solve ${fmt(timings.solve, 4)} ms, curves ${fmt(timings.curves, 4)} ms`);
  if (o.output) L.push(`  wrote ${o.output}`);
  L.push(...metricLines(metric), ...(metric ? ['  levels and curve lengths are in the metric; band areas are of the embedding (mesh coordinates)'] : []));
  process.stdout.write(L.join('\n') + '\n');
  return 0;
}

const round = (x: number) => Math.round(x * 100) / 100;

/** A band's polygons for GeoJSON: rings outer first, with the band's levels and areas. */
function bandPolygons(b: Band): CurvePolygon[] {
  return b.polygons.map((p) => ({
    rings: [p.outer, ...p.holes],
    properties: { levelFrom: b.lower, levelTo: b.upper, area: b.area, planArea: b.planArea },
  }));
}

/** `--field`: FILE.csv[:COLUMN] or a vertex property of the mesh file; values per file vertex. */
async function readField(spec: string, surface: Surface): Promise<Float64Array> {
  const m = /^(.*\.csv)(?::([^:]+))?$/i.exec(spec);
  if (!m) {
    const axis = ['x', 'y', 'z'].indexOf(spec);
    if (axis >= 0 && !surface.data.vertexProps.some((c) => c.name === spec)) {
      const P = surface.data.positions; // a coordinate: contour lines of height with --field z
      return Float64Array.from({ length: P.length / 3 }, (_, v) => P[3 * v + axis]!);
    }
    return vertexProperty(surface.data, spec);
  }
  let text: string;
  try {
    text = await readFile(m[1]!, 'utf8');
  } catch (e) {
    throw usageError(`cannot read the field file (${(e as NodeJS.ErrnoException).code ?? 'error'})`, m[1]!);
  }
  return fieldFromCsv(text, m[1]!, surface.data.positions.length / 3, m[2]);
}
