/**
 * `orthodrome path MESH --from POINT --to POINT [--via POINT...] [--closed]`:
 * the exact shortest path on the surface through waypoints.
 */
import { Option, type Command } from 'commander';
import { type MeshLoadFlags, loadSurface, maxInputSizeOption, weldToleranceOption } from '../load.js';
import { metricOption, metricToleranceOption, metricRepairOption, metricJson, metricLines } from '../metric-option.js';
import { memoryBudgetBytes, memoryBudgetOption } from '../memory-budget.js';
import { checkOutput, outputFormat } from '../output.js';
import { action, fmt, fmtCoord, since, toJson } from '../run.js';
import { TERRAIN_CAUTION, MACHINING_CAUTION } from '../cautions.js';
import { encodeRoute, formatSurfacePoint, pointLocator, shortestPath, writeFileAtomic, type PathMethod, type PointResolver, type SurfaceRoute } from '../../src/index.js';
import { AUTO_FLIP_FACES, AUTO_PROVE_FACES, FLIP_VERIFY_FACES } from '../../src/api/geodesic.js';
import { usageError } from '../../src/errors.js';

const PATH_FORMATS = ['.obj', '.csv', '.geojson', '.json'];
const collect = (v: string, prev: string[] = []) => [...prev, v];
const METHOD_TEXT: Record<string, string> = {
  windows: 'windows (window propagation: the shortest path)',
  flip: 'flip (edge flips from the edge-graph shortest route)',
  mixed: 'mixed (see the legs)',
};

interface PathCliOptions extends MeshLoadFlags {
  from: string;
  to?: string;
  via?: string[];
  closed?: boolean;
  output?: string;
  json?: boolean;
  memoryBudget?: string;
  pathMethod?: PathMethod;
  proveLimit?: string;
}

/** Registers the command. */
export function registerPath(program: Command): void {
  program
    .command('path')
    .description('exact shortest path on the surface from a point to another, through optional waypoints')
    .argument('<mesh>', 'OBJ, PLY or STL file (optionally .gz)')
    .requiredOption('--from <point>', 'start: v:INDEX, e:INDEX:T, f:INDEX:B0,B1,B2, p:X,Y,Z (nearest surface point in 3D) or p:X,Y (straight below or above, along +z)')
    .option('--to <point>', 'end point (required unless --closed)')
    .option('--via <point>', 'waypoint visited in order between --from and --to; repeat for several', collect)
    .option('--closed', 'return to the start after the last point (a closed loop)')
    .option('-o, --output <file>', 'write the path: .obj (polyline), .csv (x,y,z,length,face), .geojson (LineString with z, mesh coordinates) or .json; add .gz to compress')
    .option('--json', 'print the result as JSON')
    .option('--split-nonmanifold', 'cut non-manifold edges and split non-manifold vertices instead of refusing the mesh')
    .addOption(maxInputSizeOption())
    .addOption(weldToleranceOption())
    .addOption(metricOption()).addOption(metricToleranceOption()).addOption(metricRepairOption())
    .addOption(memoryBudgetOption())
    .addOption(new Option('--path-method <method>', `windows (window propagation: the shortest path, proven), flip (edge flips from the edge-graph shortest route: a geodesic, much faster on large meshes; two points off the vertices on one face, and split vertices, use windows) or auto (flip from ${AUTO_FLIP_FACES} faces up)`).choices(['auto', 'flip', 'windows']).default('auto'))
    .option('--prove-limit <faces>', `largest region (faces within the ellipsoid that holds every shorter path) on which window propagation proves a flip leg shortest or finds the shorter one; past it the leg is reported with a certified bound on how much longer than the shortest it can be; 0 skips the proof (default: ${FLIP_VERIFY_FACES} with flip, ${AUTO_PROVE_FACES} with auto)`)
    .addHelpText(
      'after',
      `\nLengths are in the mesh's own units. GeoJSON coordinates are the mesh's own coordinates (RFC 7946 expects\nWGS 84 longitude/latitude; use the file only where another system is agreed).\n${TERRAIN_CAUTION}\n${MACHINING_CAUTION}`,
    )
    .action(action(async (mesh: string, o: PathCliOptions) => runPath(mesh, o)));
}

async function runPath(mesh: string, o: PathCliOptions): Promise<number> {
  if (o.output) checkOutput(o.output, PATH_FORMATS, [mesh]);
  if (!o.to && !o.closed) throw usageError('give --to, or --closed to return to the start');
  const memoryBudget = memoryBudgetBytes(o.memoryBudget);
  const { surface, loadMs, metric } = await loadSurface(mesh, { requireManifold: true, allowSplit: o.splitNonmanifold, maxInputSize: o.maxInputSize, weldTolerance: o.weldTolerance, metric: o.metric, metricTolerance: o.metricTolerance, metricRepair: o.metricRepair });
  const specs = [o.from, ...(o.via ?? []), ...(o.to ? [o.to] : [])];
  const resolver = await pointLocator(surface, specs); // snapping code only for p: points
  const labels = ['--from', ...(o.via ?? []).map(() => '--via'), ...(o.to ? ['--to'] : [])];
  const stops = specs.map((s, i) => resolver.resolveAll(s, labels[i])); // a split vertex: every copy
  if (o.closed) stops.push(stops[0]!);
  if (stops.length < 2) throw usageError('a path needs at least two points');

  const proveLimit = o.proveLimit === undefined ? undefined : Number(o.proveLimit);
  if (proveLimit !== undefined && !(Number.isInteger(proveLimit) && proveLimit >= 0)) throw usageError(`--prove-limit must be a whole number of faces, got '${o.proveLimit}'`);
  const t0 = performance.now();
  // a non-orientable surface is traced on its double cover (paths cross the seams): the library's shortestPath
  const route = shortestPath(surface, stops, { memoryBudget, method: o.pathMethod ?? 'auto', ...(proveLimit !== undefined ? { verifyFaces: proveLimit } : {}) });
  const solveMs = since(t0);
  if (!Number.isFinite(route.length)) {
    const leg = route.legs.findIndex((l) => !Number.isFinite(l.length));
    throw usageError(`no path on the surface from ${specs[leg] ?? o.from} to ${specs[leg + 1] ?? o.from}: the points lie on different components`, mesh);
  }
  const facts = { ...metricJson(metric), ...routeFacts(route, specs, resolver, loadMs, solveMs) };
  if (o.output) await writeRoute(o.output, route, facts, specs, Boolean(o.closed));
  if (o.json) {
    process.stdout.write(toJson({ mesh, ...facts, output: o.output ?? null }) + '\n');
  } else {
    process.stdout.write([textReport(mesh, o, route, facts, resolver, proveLimit), ...metricLines(metric)].join('\n') + '\n');
  }
  return 0;
}

/** What is reported of a route (the JSON report and the .json file). */
function routeFacts(route: SurfaceRoute, specs: string[], resolver: PointResolver, loadMs: number, solveMs: number) {
  const xyz = route.polyline;
  const points: [number, number, number][] = [];
  for (let i = 0; i < xyz.length / 3; i++) points.push([xyz[3 * i]!, xyz[3 * i + 1]!, xyz[3 * i + 2]!]);
  const legMethods = route.legs.map((l) => l.method ?? 'windows');
  const legProven = route.legs.map((l) => l.proven ?? true);
  return {
    length: route.length,
    unit: 'mesh units',
    points,
    surfacePoints: route.path.points.map(formatSurfacePoint),
    method: legMethods.every((x) => x === legMethods[0]) ? legMethods[0]! : 'mixed',
    proven: legProven.every(Boolean),
    // certified bound on the relative excess over the shortest path (0: proven; null: unknown)
    excessBound: finiteOrNull(route.excessBound ?? 0),
    legs: route.legs.map((l, i) => ({ from: specs[i] ?? specs[0], to: specs[i + 1] ?? specs[0], length: l.length, method: legMethods[i], proven: legProven[i], excessBound: finiteOrNull(l.excessBound ?? (legProven[i] ? 0 : Infinity)) })),
    snapped: resolver.landings.map((l) => ({ point: l.spec, surfacePoint: formatSurfacePoint(l.point), position: l.position, moved: l.distance })),
    timings: { load: loadMs, solve: solveMs },
  };
}

type RouteFacts = ReturnType<typeof routeFacts>;

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);
/** A certified relative excess as text: "at most 0.0312% longer than the shortest". */
const excessText = (x: number | null): string => (x === null ? 'no bound on how much longer than the shortest' : `at most ${fmt(100 * x, 3)}% longer than the shortest (certified: the straight 3D distance is a lower bound)`);

/** Writes the route by extension: .obj polyline, .csv table, .geojson LineString or .json report. */
async function writeRoute(path: string, route: SurfaceRoute, facts: RouteFacts, waypoints: string[], closed: boolean): Promise<void> {
  const ext = outputFormat(path);
  if (ext === '.obj' || ext === '.csv') {
    const user = 'metric' in facts && facts.metric !== 'euclidean' ? `# metric: ${String(facts.metric)}\n` : ''; // lengths in a --metric say so
    await writeFileAtomic(path, ext === '.csv' ? user + (encodeRoute(route, 'csv') as string) : encodeRoute(route, 'obj'));
  } else if (ext === '.geojson') {
    const gj = {
      type: 'Feature',
      properties: { length: route.length, unit: 'mesh units', ...('metric' in facts ? { metric: facts.metric } : {}), closed, waypoints },
      geometry: { type: 'LineString', coordinates: facts.points },
    };
    await writeFileAtomic(path, toJson(gj, 0) + '\n');
  } else {
    await writeFileAtomic(path, toJson(facts, 0) + '\n');
  }
}

/** The text report. */
function textReport(mesh: string, o: PathCliOptions, route: SurfaceRoute, facts: RouteFacts, resolver: PointResolver, proveLimit: number | undefined): string {
  const what = facts.proven ? 'shortest path' : `geodesic path (locally shortest, not proven shortest; ${excessText(facts.excessBound)})`;
  const L = [`${mesh}: ${what} ${fmt(route.length, 9)} mesh units, ${facts.points.length} points, ${route.legs.length} leg(s), method ${METHOD_TEXT[facts.method]}`];
  for (const l of resolver.landings) L.push(`  ${l.spec} landed on ${formatSurfacePoint(l.point)} at (${l.position.map(fmtCoord).join(', ')}), moved ${fmt(l.distance, 4)} mesh units`);
  facts.legs.forEach((l, i) => L.push(`  leg ${i + 1}: ${l.from} → ${l.to}: ${fmt(l.length, 9)} (${l.method}${l.proven ? '' : l.excessBound === null ? '; not proven: the edge lengths are not those of the coordinates (a metric of your own), so the straight-line check does not apply; use --path-method windows for the shortest path' : `; not proven: a shorter path could run through more than --prove-limit ${proveLimit ?? (o.pathMethod === 'flip' ? FLIP_VERIFY_FACES : AUTO_PROVE_FACES)} faces; ${excessText(l.excessBound)}`})`));
  L.push(`  timings: load ${fmt(facts.timings.load, 4)} ms, solve ${fmt(facts.timings.solve, 4)} ms`);
  if (o.output) L.push(`  wrote ${o.output}`);
  return L.join('\n');
}
