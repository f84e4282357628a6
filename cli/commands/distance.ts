/**
 * `orthodrome distance MESH --from POINT... [--to POINT...] [--method M]`:
 * geodesic distance from a set of sources to every vertex and to chosen
 * target points.
 */
import { Command, Option } from 'commander';
import { type MeshLoadFlags, loadSurface, maxInputSizeOption, weldToleranceOption } from '../load.js';
import { checkFieldOutput, writeVertexColumns } from '../output.js';
import { action, fmt, fmtCoord, toJson } from '../run.js';
import { TERRAIN_CAUTION, MACHINING_CAUTION } from '../cautions.js';
import {
  boundarySources, formatSurfacePoint, pointLocator,
  type DistanceMethod, type DistanceOptions, type DistanceResult, type PointResolver, type SourceSet, type Surface, type SurfacePoint,
} from '../../src/index.js';
import { TIME_SCALE_RANGE, checkHeatField } from '../../src/api/geodesic.js';
import { usageError } from '../../src/errors.js';
import { factorThreads, orderingThreads, solveSets, type SolvedSets, warmHeatThreads } from '../jobs.js';
import { ProgressLine } from '../progress.js';
import { metricOption, metricToleranceOption, metricRepairOption, metricJson, metricLines, warnMetricMethod } from '../metric-option.js';
import { heatCheckJson, warnHeatCheck } from '../heat-caution.js';
import { memoryBudgetBytes, memoryBudgetOption } from '../memory-budget.js';
import { describeField, summarizeField, type FieldSummary } from '../field-summary.js';

interface DistanceCliOptions extends MeshLoadFlags {
  from?: string[];
  fromCurve?: string[];
  to?: string[];
  each?: boolean;
  method: DistanceMethod;
  output?: string;
  json?: boolean;
  ascii?: boolean;
  maxDistance?: string;
  timeScale?: string;
  heatBoundary?: 'average' | 'neumann' | 'dirichlet';
  intrinsicDelaunay: boolean;
  mollify: boolean;
  refine: boolean;
  memoryBudget?: string;
  jobs?: string;
}

const collect = (v: string, prev: string[] = []) => [...prev, v];
const withCurves = (set: SourceSet, curves: SurfacePoint[][]): SourceSet => ({ points: set.points, curves: [...set.curves, ...curves] });

function positiveNumber(text: string | undefined, name: string): number | undefined {
  if (text === undefined) return undefined;
  const x = Number(text);
  if (!(x > 0) || !Number.isFinite(x)) throw usageError(`${name} must be a positive number, got '${text}'`);
  return x;
}

/** Registers the command. */
export function registerDistance(program: Command): void {
  program
    .command('distance')
    .description('geodesic distance on the surface from sources to every vertex and to target points')
    .argument('<mesh>', 'OBJ, PLY or STL file (optionally .gz)')
    .option('--from <point>', "source: v:INDEX, e:INDEX:T, f:INDEX:B0,B1,B2, p:X,Y,Z (nearest surface point in 3D), p:X,Y (the surface point straight below or above, along +z), 'boundary' (all boundary loops), loop:ID (one boundary loop, ids as 'inspect' lists them), loop@X,Y,Z or loop@X,Y (the boundary loop nearest the point, in 3D or in plan); repeat for several", collect)
    .option('--from-curve <points>', "a curve source: point specs separated by ';', each consecutive pair on a common face (e.g. 'v:3;e:17:0.5;v:9'); repeat for several", collect)
    .option('--to <point>', 'target point whose distance is printed; repeat for several', collect)
    .option('--each', 'treat each --from as its own source set (one field per source, one prepared solver)')
    .option('--jobs <n>', '--each: solve the source sets in N worker threads sharing the mesh (default 1; --memory-budget is shared among them)')
    .addOption(new Option('--method <method>', 'exact (window propagation), heat (heat method, approximate) or graph (along edges)').choices(['exact', 'heat', 'graph']).default('exact'))
    .option('-o, --output <file>', 'write the per-vertex distances: .ply (binary, coloured), .csv or .json; add .gz to compress')
    .option('--ascii', 'write PLY output as ascii instead of binary')
    .option('--json', 'print the result as JSON')
    .option('--max-distance <d>', 'exact and graph: stop at this distance (mesh units); farther vertices get no distance')
    .option('--time-scale <m>', `heat: time step t = m·h², h the mean edge length (default 1, from ${TIME_SCALE_RANGE[0]} to ${TIME_SCALE_RANGE[1]})`)
    .addOption(new Option('--heat-boundary <mode>', 'heat: boundary condition of the heat step').choices(['average', 'neumann', 'dirichlet']))
    .option('--no-intrinsic-delaunay', 'heat: build the Laplacian on the input triangles instead of the intrinsic Delaunay triangulation')
    .option('--no-mollify', 'heat: do not mollify near-degenerate triangles')
    .option('--no-refine', 'heat: do not split long edges, nor boundary edges facing an obtuse corner, of the intrinsic triangulation (added vertices cost time and memory; without them the heat method can be far off on meshes of long thin triangles)')
    .option('--split-nonmanifold', 'cut non-manifold edges and split non-manifold vertices instead of refusing the mesh')
    .addOption(maxInputSizeOption())
    .addOption(weldToleranceOption())
    .addOption(metricOption()).addOption(metricToleranceOption()).addOption(metricRepairOption())
    .addOption(memoryBudgetOption())
    .addHelpText('after', `\nDistances are in the mesh's own units; unreachable points get null (JSON) or an empty field (CSV).\n${TERRAIN_CAUTION}\n${MACHINING_CAUTION}`)
    .action(action(async (mesh: string, o: DistanceCliOptions) => runDistance(mesh, o)));
}

/** The numeric options, checked before any work. */
interface RunOptions {
  maxDistance: number | undefined;
  timeScale: number | undefined;
  memoryBudget: number;
  jobs: number;
}

/** One source set as given on the command line. */
interface NamedSet {
  /** The specs that make it (a curve as `curve(SPEC)`). */
  specs: string[];
  set: SourceSet;
}

/** One solved set, ready to print. */
interface SetResult {
  sources: string[];
  result: DistanceResult;
  targets: { point: string; surfacePoint: string; distance: number }[];
  /** Per topology vertex, split vertices folded to the nearest copy. */
  field: Float64Array;
  summary: FieldSummary;
}

async function runDistance(mesh: string, o: DistanceCliOptions): Promise<number> {
  if (o.output) checkFieldOutput(o.output, [mesh]);
  const run = checkOptions(o);
  if (o.method === 'heat') warmHeatThreads(mesh); // large files: the threads load while the mesh is read
  const { surface, loadMs, metric } = await loadSurface(mesh, { requireManifold: true, allowSplit: o.splitNonmanifold, maxInputSize: o.maxInputSize, weldTolerance: o.weldTolerance, metric: o.metric, metricTolerance: o.metricTolerance, metricRepair: o.metricRepair });
  warnMetricMethod(metric, o.method); // the heat method under a varying or rough metric: a caution on stderr
  const resolver = await pointLocator(surface, [...(o.from ?? []), ...(o.fromCurve ?? []), ...(o.to ?? [])]); // snapping code only for p: points
  const picks = new Map<string, number>(); // loop@ spec → id of the loop it picked
  const sets = sourceSets(mesh, surface, resolver, o, picks);
  const targets: SurfacePoint[] = (o.to ?? []).map((s) => resolver.resolve(s, '--to'));
  // only -o needs every vertex; --json reports what was computed (machine output never changes the work)
  const fieldNeeded = Boolean(o.output) || !o.to || o.to.length === 0;
  const solved = await solveAll(surface, resolver, o, run, sets.map((s) => s.set), targets, fieldNeeded);
  const results = sets.map(({ specs }, i) => setResult(specs, solved.results[i]!, targets, resolver, o, run, fieldNeeded));
  const checks = o.method === 'heat' ? results.map((r, i) => (r.result.complete ? checkHeatField(surface, r.result.field.distance, sets[i]!.set) : null)) : [];
  checks.forEach((c, i) => warnHeatCheck(c, checks.length > 1 ? `field of set ${i + 1}` : undefined)); // a suspect heat field: a caution on stderr, exit 0
  if (o.output) {
    await writeVertexColumns(
      o.output,
      surface,
      results.map((r, i) => ({ name: results.length > 1 ? `distance_${i}` : 'distance', unit: 'mesh units', values: r.field, plyFill: -1 })),
      { plyAscii: o.ascii },
    );
  }
  const solveMs = results.reduce((a, r) => a + r.result.solveMs, 0);
  const timings = { load: loadMs, prepare: Math.round(solved.prepareMs * 100) / 100, solve: Math.round(solveMs * 100) / 100 };
  process.stdout.write((o.json ? jsonReport(mesh, o, resolver, results, timings, solved, picks, { ...metricJson(metric, o.method), ...(checks.length > 1 ? { heatChecks: checks } : heatCheckJson(checks[0])) }) : [textReport(mesh, o, surface, resolver, results, timings, run, picks), ...metricLines(metric)].join('\n')) + '\n');
  return 0;
}

/** Parses and checks the numeric options (`USAGE` errors naming the option). */
function checkOptions(o: DistanceCliOptions): RunOptions {
  const maxDistance = positiveNumber(o.maxDistance, '--max-distance');
  const timeScale = positiveNumber(o.timeScale, '--time-scale');
  if (timeScale !== undefined && !(timeScale >= TIME_SCALE_RANGE[0] && timeScale <= TIME_SCALE_RANGE[1])) {
    throw usageError(`--time-scale must lie in [${TIME_SCALE_RANGE[0]}, ${TIME_SCALE_RANGE[1]}], got '${o.timeScale}'`);
  }
  const memoryBudget = memoryBudgetBytes(o.memoryBudget);
  const jobs = o.jobs === undefined ? 1 : Number(o.jobs);
  if (!Number.isInteger(jobs) || jobs < 1 || jobs > 256) throw usageError(`--jobs must be a whole number from 1 to 256, got '${o.jobs}'`);
  if (jobs > 1 && !o.each) throw usageError('--jobs works with --each (one source set per --from)');
  return { maxDistance, timeScale, memoryBudget, jobs };
}

/** The source sets: one for all of --from and --from-curve, or one per --from with --each. */
function sourceSets(mesh: string, surface: Surface, resolver: PointResolver, o: DistanceCliOptions, picks: Map<string, number>): NamedSet[] {
  const specs: string[] = o.from ?? [];
  const curveSpecs: string[] = o.fromCurve ?? [];
  if (specs.length === 0 && curveSpecs.length === 0) throw usageError('give at least one --from or --from-curve');
  if (o.each && curveSpecs.length) throw usageError('--each works with --from only');
  const curves = curveSpecs.map((c) => resolver.resolveCurve(c, '--from-curve'));
  const toSet = (list: string[]): SourceSet => {
    const set: SourceSet = { points: [], curves: [] };
    for (const s of list) {
      if (s.trim() === 'boundary') {
        const loops = boundarySources(surface);
        if (loops.length === 0) throw usageError('--from boundary: the mesh has no boundary', mesh);
        set.curves.push(...loops);
      } else if (resolver.isLoop(s)) {
        const picked = resolver.resolveLoopNamed(s, '--from', mesh); // one boundary loop
        set.curves.push(...picked.curves);
        if (!/^loop:/.test(s.trim())) picks.set(s, picked.id); // which loop a loop@ spec picked, for the report
      } else set.points.push(...resolver.resolveAll(s, '--from')); // every copy of a split vertex
    }
    return set;
  };
  return o.each
    ? specs.map((s) => ({ specs: [s], set: toSet([s]) }))
    : [{ specs: [...specs, ...curveSpecs.map((c) => `curve(${c})`)], set: withCurves(toSet(specs), curves) }];
}

/** The solver's options from the command line. */
function solverOptions(o: DistanceCliOptions, run: RunOptions): DistanceOptions {
  const opts: DistanceOptions = { memoryBudget: run.memoryBudget };
  if (run.maxDistance !== undefined) opts.maxDistance = run.maxDistance;
  if (o.method === 'heat') {
    // factorizations on worker threads from FACTOR_THREADS_MIN_SIZE unknowns (jobs.ts drops it for --jobs workers)
    opts.heat = { intrinsicDelaunay: o.intrinsicDelaunay, mollify: o.mollify, refine: o.refine, factorExecutor: factorThreads(), orderingExecutor: orderingThreads() };
    if (run.timeScale !== undefined) opts.heat.timeScale = run.timeScale;
    if (o.heatBoundary) opts.heat.boundary = o.heatBoundary;
  }
  return opts;
}

/**
 * Solves every set: the library's `prepareDistances` (a non-orientable surface on its double cover,
 * paths through split vertices), --each sets in `jobs` worker threads sharing the mesh (jobs.ts),
 * with a progress line on stderr for runs over a second, only on a terminal (progress.ts).
 */
async function solveAll(
  surface: Surface, resolver: PointResolver, o: DistanceCliOptions, run: RunOptions, sets: SourceSet[], targets: SurfacePoint[], fieldNeeded: boolean,
): Promise<SolvedSets> {
  const opts = solverOptions(o, run);
  const line = new ProgressLine(process.stderr);
  if (line.enabled) {
    opts.progress = (p) => line.update(p.stage === 'prepare' ? { label: `${o.method}: preparing`, share: undefined } : { label: `${o.method} distance`, share: p.share });
  }
  try {
    const solved = await solveSets({ surface, method: o.method, opts }, sets, { targets, fieldNeeded }, targets.flatMap((p) => resolver.copies(p)), run.jobs, line);
    // heat: how many factorizations ran on another thread (JSON `prepare.factorThreadJobs`)
    if (opts.heat?.factorExecutor) solved.prepareDetails = { ...solved.prepareDetails, factorThreadJobs: factorThreads().counts.remote };
    // and how many parts of the nested dissection (JSON `prepare.orderingThreadJobs`)
    if (opts.heat?.orderingExecutor) solved.prepareDetails = { ...solved.prepareDetails, orderingThreadJobs: orderingThreads().counts.remoteJobs };
    return solved;
  } finally {
    line.done();
  }
}

/** A solved set with its target distances (the nearest copy of a split vertex) and field summary. */
function setResult(
  specs: string[], r: DistanceResult, targets: SurfacePoint[], resolver: PointResolver, o: DistanceCliOptions, run: RunOptions, fieldNeeded: boolean,
): SetResult {
  const field = resolver.foldCopies(r.field.distance); // a split file vertex: the nearest of its copies
  return {
    sources: specs,
    result: r,
    targets: targets.map((p, i) => ({ point: o.to![i]!, surfacePoint: formatSurfacePoint(p), distance: Math.min(...resolver.copies(p).map((q) => r.at(q))) })),
    field,
    summary: summarizeField(field, r.complete, r.stoppedBy, run.maxDistance, !fieldNeeded),
  };
}

/** The `--json` report. */
function jsonReport(
  mesh: string, o: DistanceCliOptions, resolver: PointResolver, results: SetResult[], timings: Record<string, number>, solved: SolvedSets, picks: Map<string, number>,
  metric: ReturnType<typeof metricJson>,
): string {
  const one = (r: SetResult) => ({
    sources: r.sources,
    targets: r.targets,
    field: r.summary,
    complete: r.result.complete && r.summary.stoppedBy === null, // graph reports complete at --max-distance too
    details: r.result.details,
  });
  const base = { method: o.method, unit: 'mesh units', ...metric, mesh, output: o.output ?? null };
  const snapped = resolver.landings.map((l) => ({ point: l.spec, surfacePoint: formatSurfacePoint(l.point), position: l.position, moved: l.distance }));
  const loopsPicked = [...picks].map(([spec, loop]) => ({ spec, loop }));
  const body = { ...(results.length === 1 ? { ...base, ...one(results[0]!) } : { ...base, sets: results.map(one) }), snapped, loopsPicked };
  return toJson({ ...body, timings, prepare: solved.prepareDetails });
}

/** The text report. */
function textReport(
  mesh: string, o: DistanceCliOptions, surface: Surface, resolver: PointResolver, results: SetResult[], timings: Record<string, number>, run: RunOptions,
  picks: Map<string, number>,
): string {
  const L: string[] = [`${mesh}: ${o.method} distances (mesh units), ${surface.topology.nv} vertices`];
  for (const [spec, id] of picks) L.push(`  ${spec} picked boundary loop ${id} (loop:${id}, as 'inspect' lists them)`);
  for (const l of resolver.landings) L.push(`  ${l.spec} landed on ${formatSurfacePoint(l.point)} at (${l.position.map(fmtCoord).join(', ')}), moved ${fmt(l.distance, 4)} mesh units`);
  for (const r of results) {
    L.push(`  from ${r.sources.join(' ')}: ${describeField(r.summary, run.maxDistance)}`);
    for (const tg of r.targets) L.push(`    to ${tg.point}: ${Number.isFinite(tg.distance) ? fmt(tg.distance, 9) : 'unreachable'}`);
  }
  L.push(`  timings: load ${fmt(timings.load!, 4)} ms, prepare ${fmt(timings.prepare!, 4)} ms, solve ${fmt(timings.solve!, 4)} ms`);
  if (o.output) L.push(`  wrote ${o.output}`);
  return L.join('\n');
}
