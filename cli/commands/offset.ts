/**
 * `orthodrome offset MESH --from SOURCE... --distance D`: the curves at
 * on-surface distance D from a boundary loop, points or a curve on the
 * surface (a trim line at D from a part's edge, a margin round a hazard).
 */
import { Command, Option } from 'commander';
import { loadSurface } from '../load.js';
import { metricJson, metricLines, warnMetricMethod } from '../metric-option.js';
import { heatCheckJson, warnHeatCheck } from '../heat-caution.js';
import { action, fmt, toJson } from '../run.js';
import { MACHINING_CAUTION, TERRAIN_CAUTION } from '../cautions.js';
import { memoryBudgetBytes } from '../memory-budget.js';
import { factorThreads, orderingThreads, warmHeatThreads } from '../jobs.js';
import { pointLocator, surfaceOffset } from '../../src/index.js';
import { usageError } from '../../src/errors.js';
import {
  addCurveRunOptions, addSourceOptions, checkCurveOutput, curveJson, hasSources, numberOption, sourceSet, writeCurveFile, type CurveCliOptions,
} from './isolines.js';

interface OffsetCliOptions extends CurveCliOptions {
  distance?: string;
}

/** Registers the command. */
export function registerOffset(program: Command): void {
  const cmd = program
    .command('offset')
    .description('the curves at on-surface distance D from a boundary loop, points or a curve on the surface (trim lines, margins)')
    .argument('<mesh>', 'OBJ, PLY or STL file (optionally .gz)');
  addSourceOptions(cmd)
    .option('--distance <d>', 'the on-surface distance D, mesh units')
    .addOption(new Option('--method <method>', 'exact (window propagation; exact crossings along edges), heat (heat method, approximate) or graph (along edges, an upper bound)').choices(['exact', 'heat', 'graph']).default('exact'))
    .option('-o, --output <file>', 'write the curves: .obj (l polylines), .geojson, .csv or .json; add .gz to compress');
  addCurveRunOptions(cmd)
    .addHelpText('after', `
The offset is the level set at D of the on-surface distance from the sources, measured on the mesh
as given; curves are open where they reach the boundary or a cut, closed otherwise (a closed curve
repeats its first point). Offsets are estimates for planning: verify a trim line on the machine
before cutting, and defer to the shop's procedures and licensed practice.
${MACHINING_CAUTION}
${TERRAIN_CAUTION}`)
    .action(action(async (mesh: string, o: OffsetCliOptions) => runOffset(mesh, o)));
}

async function runOffset(mesh: string, o: OffsetCliOptions): Promise<number> {
  if (o.output) checkCurveOutput(o.output, mesh);
  if (o.distance === undefined) throw usageError('give the offset distance with --distance D');
  const D = numberOption(o.distance, '--distance', true);
  if (!hasSources(o)) throw usageError('give at least one --from, --from-curve or --from-polyline');
  const memoryBudget = memoryBudgetBytes(o.memoryBudget);
  if (o.method === 'heat') warmHeatThreads(mesh); // large files: the threads load while the mesh is read
  const { surface, loadMs, metric } = await loadSurface(mesh, { requireManifold: true, allowSplit: o.splitNonmanifold, maxInputSize: o.maxInputSize, weldTolerance: o.weldTolerance, metric: o.metric, metricTolerance: o.metricTolerance, metricRepair: o.metricRepair });
  warnMetricMethod(metric, o.method); // the heat method under a varying or rough metric: a caution on stderr
  const resolver = await pointLocator(surface);
  const r = surfaceOffset(surface, await sourceSet(mesh, surface, resolver, o), D, { method: o.method, memoryBudget, ...(o.method === 'heat' ? { heat: { factorExecutor: factorThreads(), orderingExecutor: orderingThreads() } } : {}) });
  warnHeatCheck(r.measurement.heatCheck); // a suspect heat field: a caution on stderr, exit 0
  if (o.output) await writeCurveFile(o.output, r.curves, [], metric?.metric);
  const round = (x: number) => Math.round(x * 100) / 100;
  const timings = { load: loadMs, prepare: round(r.timings.prepare), solve: round(r.timings.solve), curves: round(r.timings.curves) };
  if (o.json) {
    process.stdout.write(toJson({ mesh, method: o.method, unit: 'mesh units', ...metricJson(metric, o.method), ...heatCheckJson(r.measurement.heatCheck), distance: D, curves: r.curves.map(curveJson), belowResolution: r.belowResolution, untracedFaces: r.untracedFaces, output: o.output ?? null, timings }) + '\n');
    return 0;
  }
  const L: string[] = [`${mesh}: offset at ${fmt(D, 9)} mesh units (${o.method} distance): ${r.curves.length} curve(s)`];
  for (const l of resolver.landings) L.push(`  ${l.spec} landed at (${l.position.join(', ')}), moved ${fmt(l.distance, 4)} mesh units`);
  r.curves.forEach((c, k) => L.push(`  curve ${k}: ${c.closed ? 'closed' : 'open'}, ${c.points.length} points, length ${fmt(c.length, 9)} mesh units`));
  if (r.belowResolution !== null) {
    L.push(`  the distance is below the ${o.method} field's resolution near a source (its nearest vertex is ${fmt(r.belowResolution, 6)} mesh units away): no curve is drawn round it; --method exact finds it`);
  }
  if (r.untracedFaces.length > 0) {
    L.push(`  not traced: a curve lying wholly inside face(s) ${r.untracedFaces.join(', ')} round several sources there (or a source curve inside one face)`);
  }
  if (r.curves.length === 0 && r.belowResolution === null && r.untracedFaces.length === 0) L.push('  nothing on the surface lies at that distance from the sources');
  L.push(`  timings: load ${fmt(timings.load, 4)} ms, prepare ${fmt(timings.prepare, 4)} ms, solve ${fmt(timings.solve, 4)} ms, curves ${fmt(timings.curves, 4)} ms`);
  if (o.output) L.push(`  wrote ${o.output}`);
  L.push(...metricLines(metric), ...(metric ? ['  the offset distance and curve lengths are in the metric; points are positions of the embedding'] : []));
  L.push('  estimates for planning: verify on the machine before cutting; follow the shop\'s procedures and licensed practice');
  process.stdout.write(L.join('\n') + '\n');
  return 0;
}
