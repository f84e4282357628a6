/**
 * `orthodrome travel MESH --from POINT [--to POINT] [--via POINT...]`:
 * walking times on terrain (a mesh file or a DEM GeoTIFF): the fastest
 * route with its time, distance, ascent, descent and profile, or the
 * travel-time field from the sources with isochrones; outputs by extension.
 */
import { open, readFile, stat } from 'node:fs/promises';
import { Option, type Command } from 'commander';
import { type MeshLoadFlags, loadSurface, maxInputSizeOption, parseByteSize, weldToleranceOption } from '../load.js';
import { checkOutput, outputFormat, writeVertexColumns } from '../output.js';
import { action, fmt, since, toJson } from '../run.js';
import { WALKING_CAUTION } from '../cautions.js';
import { memoryBudgetBytes } from '../memory-budget.js';
import {
  openTerrain, travelField, travelRoute, surfaceIsolines, pointLocator, formatSurfacePoint, writeFileAtomic,
  type Surface, type TravelOptions, type TravelField, type TravelRouteResult, type IsolineResult,
} from '../../src/index.js';
import { routeConvergence, parsePaceTable, parseUpAxis, PACE_MODELS, MAX_STEINER_K } from '../../src/api/geodesic.js';
import {
  toInputVertices, parseEpsg, toWgs84, travelGeoJson, routeGpx, routeProfileCsv, writeFieldTiff, formatDuration, type DemGrid, type MapCrs, type LonLat,
} from '../../src/api/io.js';
import { DEFAULT_MAX_INPUT_BYTES } from '../../src/api/node.js';
import { inputError, limitError, usageError } from '../../src/errors.js';

const FORMATS = ['.geojson', '.gpx', '.csv', '.tif', '.tiff', '.ply', '.json'];
const collect = (v: string, prev: string[] = []) => [...prev, v];
const MODEL_TEXT: Record<string, string> = {
  tobler: "Tobler's hiking function (1993)",
  naismith: "Naismith's rule (1892) with Langmuir's descent corrections",
  table: 'speed table',
};

interface TravelCliOptions extends Omit<MeshLoadFlags, 'metric' | 'metricTolerance' | 'metricRepair'> {
  from: string[];
  to?: string;
  via?: string[];
  model: string;
  speedTable?: string;
  maxSlope?: string;
  up: string;
  steiner: string;
  spacing: 'uniform' | 'geometric';
  metersPerUnit?: string;
  faceCost?: string;
  isochrones?: string;
  maxTime?: string;
  output?: string[];
  crs?: string;
  crsDef?: string;
  wgs84?: boolean;
  convergence?: boolean;
  json?: boolean;
  memoryBudget?: string;
}

/** Registers the command. */
export function registerTravel(program: Command): void {
  program
    .command('travel')
    .description('walking times on terrain: the fastest route between points, or times from the sources to everywhere with isochrones (slope- and direction-aware)')
    .argument('<mesh>', 'terrain: a DEM GeoTIFF (.tif) or an OBJ, PLY or STL mesh (optionally .gz) in metres (see --meters-per-unit)')
    .requiredOption('--from <point>', 'start: v:INDEX, e:INDEX:T, f:INDEX:B0,B1,B2, p:X,Y,Z or p:X,Y (map coordinates, dropped vertically onto the ground); repeat for several sources of a field', collect)
    .option('--to <point>', 'end point: the fastest route from --from')
    .option('--via <point>', 'waypoint visited in order between --from and --to; repeat for several', collect)
    .addOption(new Option('--model <name>', "speed model: tobler (Tobler's hiking function), naismith (Naismith's rule with Langmuir's descent corrections) or table (--speed-table)").choices([...PACE_MODELS]).default('tobler'))
    .option('--speed-table <file.csv>', 'speed against slope, linearly interpolated: a header naming slope_deg, grade or slope_percent and speed_kmh, one row per slope (negative downhill); implies --model table')
    .option('--max-slope <degrees>', 'steepest passable slope; steeper steps are blocked in both directions (default: no limit)')
    .option('--up <axis>', 'the up direction: +z, -y, … or A,B,C', '+z')
    .option('--steiner <k>', `Steiner points per edge, 0–${MAX_STEINER_K} (more: closer to the model's optimum, slower)`, '3')
    .addOption(new Option('--spacing <kind>', 'Steiner points evenly spaced, or geometric (denser towards the vertices)').choices(['uniform', 'geometric']).default('uniform'))
    .option('--meters-per-unit <x>', 'metres per mesh unit, horizontal and vertical (default 1; a DEM in feet is scaled from its GeoKeys)')
    .option('--face-cost <property>', 'time multiplier per face from a PLY face property (e.g. 1 track, 1.67 off-path, 0 impassable)')
    .option('--isochrones <minutes>', 'isochrones every M minutes (lines and the bands between them) from the field')
    .option('--max-time <minutes>', 'stop the field at this time (places beyond it count as not reached)')
    .option('-o, --output <file>', 'write by extension: .geojson (route, isochrones, bands; with the CRS), .gpx (route, needs a known CRS), .csv (route profile, or the field per vertex), .tif (field on the DEM grid), .ply or .json (field per vertex); repeat for several', collect)
    .option('--crs <epsg>', 'the map coordinate system of a mesh file, e.g. EPSG:32633 (a DEM states its own)')
    .option('--crs-def <proj>', "a PROJ definition of the coordinate system (e.g. '+proj=utm +zone=33 +datum=WGS84'), for codes proj4 does not know")
    .option('--wgs84', 'GeoJSON in WGS 84 longitude/latitude (RFC 7946) instead of map coordinates')
    .option('--convergence', 'also the route time at 2k+1 and 4k+3 Steiner points per edge (how close the discretisation is)')
    .option('--json', 'print the result as JSON')
    .option('--split-nonmanifold', 'cut non-manifold edges and split non-manifold vertices instead of refusing the mesh')
    .addOption(maxInputSizeOption())
    .addOption(weldToleranceOption())
    .option('--memory-budget <size>', 'memory the Steiner graph and its search may use, e.g. 512M or 4G (default: a quarter of the memory, at most 2 GiB; at most 45 bytes per vertex and Steiner point, 24 more per vertex and 32 per edge); a run that would need more stops with exit 3')
    .addHelpText('after', `
Times print as h:mm:ss. Each step's time depends on its own slope, so A→B and
B→A differ. Routes are real routes on the mesh (straight steps inside faces):
their times are upper bounds of the model's optimum, within the Steiner spacing
(see --convergence). Lengths of a mesh file are taken as metres.
${WALKING_CAUTION}`)
    .action(action(async (mesh: string, o: TravelCliOptions) => runTravel(mesh, o)));
}

function num(text: string | undefined, name: string, min = -Infinity, max = Infinity): number | undefined {
  if (text === undefined) return undefined;
  const x = text.trim() === '' ? NaN : Number(text);
  if (!(x >= min && x <= max) || !Number.isFinite(x)) throw usageError(`${name} must be a number in [${min}, ${max}], got '${text}'`);
  return x;
}

async function runTravel(mesh: string, o: TravelCliOptions): Promise<number> {
  // options, then outputs, before any work
  const outputs = o.output ?? [];
  for (const out of outputs) checkOutput(out, FORMATS, [mesh]);
  const route = o.to !== undefined;
  if (!route && o.via?.length) throw usageError('--via needs --to');
  if (route && o.from.length > 1) throw usageError('a route has one --from (add stops with --via)');
  const k = num(o.steiner, '--steiner', 0, MAX_STEINER_K)!;
  if (!Number.isInteger(k)) throw usageError(`--steiner must be a whole number, got '${o.steiner}'`);
  const every = num(o.isochrones, '--isochrones', 1e-6);
  const maxMinutes = num(o.maxTime, '--max-time', 0);
  if (o.convergence && !route) throw usageError('--convergence needs a route (--to)');
  for (const out of outputs) {
    const ext = outputFormat(out);
    if (ext === '.gpx' && !route) throw usageError('a .gpx output needs a route (--to)', out);
  }
  const model = o.speedTable ? 'table' : o.model;
  const opts: TravelOptions = {
    model, k, spacing: o.spacing, up: parseUpAxis(o.up),
    ...(o.maxSlope !== undefined ? { maxSlopeDeg: num(o.maxSlope, '--max-slope', 1e-9, 90)! } : {}),
    ...(o.faceCost ? { faceMultipliers: o.faceCost } : {}),
    memoryBudget: memoryBudgetBytes(o.memoryBudget),
  };
  if (o.speedTable) opts.table = parsePaceTable(await readText(o.speedTable), o.speedTable);
  else if (model === 'table') throw usageError('--model table needs --speed-table FILE.csv');

  const t0 = performance.now();
  const { surface, grid } = await loadTerrain(mesh, o);
  const loadMs = since(t0);
  for (const out of outputs) if (/^\.tiff?$/.test(outputFormat(out)) && !grid) throw usageError('a .tif field needs a DEM GeoTIFF input (the raster grid)', out);
  opts.metersPerUnit = num(o.metersPerUnit, '--meters-per-unit', 1e-12) ?? (grid?.linearUnit === 9002 ? 0.3048 : grid?.linearUnit === 9003 ? 1200 / 3937 : 1);
  const crs: MapCrs | null = o.crs || o.crsDef || grid?.epsg
    ? { epsg: o.crs ? parseEpsg(o.crs) : (grid?.epsg ?? null), proj: o.crsDef ?? null }
    : null;
  const needLonLat = o.wgs84 || outputs.some((p) => outputFormat(p) === '.gpx');
  const lonLat: LonLat | null = needLonLat ? await toWgs84(crs ?? { epsg: null, proj: null }) : null;

  const specs = [...o.from, ...(o.via ?? []), ...(route ? [o.to!] : [])];
  const labels = [...o.from.map(() => '--from'), ...(o.via ?? []).map(() => '--via'), ...(route ? ['--to'] : [])];
  // p:X,Y is dropped along the mesh's z axis: with another up axis that would be a sideways point, so it is refused
  const up = opts.up!;
  if (!(up[0] === 0 && up[1] === 0 && up[2] === 1)) {
    specs.forEach((sp, i) => {
      if (/^p:[^,]*,[^,]*$/.test(sp.trim())) throw usageError(`'${sp}' is dropped along z, but --up is ${o.up}: give the point as p:X,Y,Z (or v:, e:, f:)`, labels[i]);
    });
  }
  const resolver = await pointLocator(surface, specs);
  const points = specs.map((s, i) => resolver.resolve(s, labels[i]));

  const r: TravelRouteResult | null = route ? travelRoute(surface, points, opts) : null;
  const convergence = route && o.convergence ? routeConvergence(surface, points, opts, [2 * k + 1, 4 * k + 3]) : null;
  const wantsField = !route || every !== undefined || outputs.some((p) => ['.tif', '.tiff', '.ply', '.json'].includes(outputFormat(p)));
  const field: TravelField | null = wantsField
    ? travelField(surface, route ? [points[0]!] : points, { ...opts, ...(maxMinutes !== undefined ? { maxSeconds: 60 * maxMinutes } : {}) })
    : null;
  const iso: IsolineResult | null = field && every !== undefined
    ? surfaceIsolines(surface, { values: field.seconds, alongEdge: field.alongEdge }, { every: 60 * every, bands: true })
    : null;

  for (const out of outputs) await writeOutput(out, surface, grid, r, field, iso, crs, o.wgs84 ? lonLat : null, lonLat, specs);

  const facts = {
    mesh, model: { ...(r ?? field)!.model, text: MODEL_TEXT[model] }, approximation: (r ?? field)!.approximation,
    metersPerUnit: opts.metersPerUnit, crs: crs ? (crs.epsg !== null ? `EPSG:${crs.epsg}` : crs.proj) : null,
    points: resolver.landings.map((l) => ({ point: l.spec, surfacePoint: formatSurfacePoint(l.point), position: l.position, moved: l.distance })),
  };
  const timings = { load: loadMs, graph: round((r ?? field)!.timings.graph + (r && field ? field.timings.graph : 0)), search: round((r?.timings.search ?? 0) + (field?.timings.search ?? 0)), isochrones: round(iso?.ms ?? 0) };
  if (o.json) {
    process.stdout.write(toJson({
      ...facts,
      ...(r ? {
        seconds: r.seconds, duration: formatDuration(r.seconds), meters: r.meters, horizontalMeters: r.horizontalMeters, ascent: r.ascent, descent: r.descent,
        steepest: r.steepest, steepestSustained: r.steepestSustained, legs: r.legs, points: r.points, cumulativeSeconds: r.cumulativeSeconds, convergence: convergence ? [{ k, seconds: r.seconds }, ...convergence] : null,
      } : {}),
      ...(field ? { field: fieldStats(field.seconds) } : {}),
      ...(iso ? { isochrones: isoJson(iso) } : {}),
      snapped: facts.points, outputs, timings,
    }) + '\n');
    return 0;
  }
  const L: string[] = [`${mesh}: walking times, ${facts.model.text} (${fmt(facts.model.flatKmh, 4)} km/h on the flat${facts.model.maxSlopeDeg < 90 ? `, slopes over ${facts.model.maxSlopeDeg}° blocked` : ''}), ${k} Steiner point(s) per edge (${o.spacing})`];
  for (const l of resolver.landings) L.push(`  ${l.spec} landed on ${formatSurfacePoint(l.point)}, moved ${fmt(l.distance, 4)} mesh units`);
  if (r) {
    L.push(`  route ${specs.join(' → ')}: ${formatDuration(r.seconds)} (${fmt(r.seconds, 6)} s), ${fmt(r.meters, 6)} m on the ground (${fmt(r.horizontalMeters, 6)} m in plan), ascent ${fmt(r.ascent, 5)} m, descent ${fmt(r.descent, 5)} m`);
    const dir = (d: number) => (d >= 0 ? 'uphill' : 'downhill');
    if (r.steepestSustained) L.push(`  steepest stretch ${fmt(Math.abs(r.steepestSustained.degrees), 3)}° ${dir(r.steepestSustained.degrees)} on average over ${fmt(r.steepestSustained.meters, 4)} m from ${fmt(r.steepestSustained.at, 5)} m; steepest single step ${fmt(Math.abs(r.steepest!.degrees), 3)}° ${dir(r.steepest!.degrees)} (${fmt(r.steepest!.meters, 3)} m)`);
    if (r.legs.length > 1) r.legs.forEach((l, i) => L.push(`  leg ${i + 1}: ${formatDuration(l.seconds)}, ${fmt(l.meters, 6)} m`));
    if (convergence) L.push(`  convergence: ${[{ k, seconds: r.seconds }, ...convergence].map((c) => `k=${c.k} ${formatDuration(c.seconds)} (${fmt(c.seconds, 7)} s)`).join(', ')}`);
  }
  if (field) {
    const st = fieldStats(field.seconds);
    L.push(`  field from ${route ? specs[0] : specs.join(', ')}: ${st.reached} vertices reached, ${st.unreached} not; times ${formatDuration(st.minSeconds)} to ${formatDuration(st.maxSeconds)}, mean ${formatDuration(st.meanSeconds)}`);
  }
  if (iso) for (const b of iso.bands ?? []) L.push(`  ${formatDuration(b.lower)}–${formatDuration(b.upper)}: ${fmt(b.planArea, 6)} m² in plan`);
  const a = facts.approximation;
  L.push(`  approximation: Steiner gap ≤ ${fmt(a.relativeGap, 4)} of an edge (≤ ${fmt(a.maxGapMeters, 4)} m), ${a.nodes} nodes; times are of real routes on the mesh (upper bounds)`);
  L.push(`  timings: load ${fmt(timings.load, 4)} ms, graph ${fmt(timings.graph, 4)} ms, search ${fmt(timings.search, 4)} ms`);
  for (const out of outputs) L.push(`  wrote ${out}`);
  process.stdout.write(L.join('\n') + '\n');
  return 0;
}

const round = (x: number) => Math.round(x * 100) / 100;

async function readText(file: string): Promise<string> {
  try {
    return await readFile(file, 'utf8');
  } catch (e) {
    throw usageError(`cannot read the file (${(e as NodeJS.ErrnoException).code ?? 'error'})`, file);
  }
}

/** A DEM GeoTIFF (by its first bytes) through openTerrain, anything else through the common loader. */
async function loadTerrain(path: string, o: TravelCliOptions): Promise<{ surface: Surface; grid: DemGrid | null }> {
  let head: Uint8Array;
  try {
    const fh = await open(path, 'r');
    head = new Uint8Array(4);
    await fh.read(head, 0, 4, 0);
    await fh.close();
  } catch (e) {
    throw inputError(`cannot read the file (${(e as NodeJS.ErrnoException).code ?? 'error'})`, path);
  }
  const tiff = (head[0] === 0x49 && head[1] === 0x49) || (head[0] === 0x4d && head[1] === 0x4d);
  if (!tiff) {
    const { surface } = await loadSurface(path, { requireManifold: true, allowSplit: o.splitNonmanifold, maxInputSize: o.maxInputSize, weldTolerance: o.weldTolerance });
    return { surface, grid: null };
  }
  const max = o.maxInputSize === undefined ? DEFAULT_MAX_INPUT_BYTES : parseByteSize(o.maxInputSize, '--max-input-size');
  const size = (await stat(path)).size;
  if (size > max) throw limitError(`the DEM is ${size} bytes, over the input limit of ${max} bytes; raise it with --max-input-size`, path);
  // a DEM whose nodata pixels touch diagonally has pinch vertices: they are split (a walker does not squeeze through a point)
  return openTerrain(new Uint8Array(await readFile(path)), path);
}

function fieldStats(s: Float64Array) {
  let reached = 0, sum = 0, lo = Infinity, hi = -Infinity;
  for (const x of s) {
    if (!Number.isFinite(x)) continue;
    reached++; sum += x;
    if (x < lo) lo = x;
    if (x > hi) hi = x;
  }
  return { reached, unreached: s.length - reached, minSeconds: reached ? lo : null, maxSeconds: reached ? hi : null, meanSeconds: reached ? sum / reached : null, unit: 's' } as
    { reached: number; unreached: number; minSeconds: number; maxSeconds: number; meanSeconds: number; unit: string };
}

function isoJson(iso: IsolineResult) {
  return {
    levelsMinutes: iso.levels.map((l) => l / 60),
    curves: iso.curves.map((c) => ({ minutes: c.level / 60, closed: c.closed, length: c.length, points: c.points.length })),
    bands: (iso.bands ?? []).map((b) => ({ fromMinutes: b.lower / 60, toMinutes: b.upper / 60, area: b.area, planArea: b.planArea })),
  };
}

async function writeOutput(
  out: string, s: Surface, grid: DemGrid | null, r: TravelRouteResult | null, field: TravelField | null, iso: IsolineResult | null,
  crs: MapCrs | null, geoLonLat: LonLat | null, lonLat: LonLat | null, specs: string[],
): Promise<void> {
  const ext = outputFormat(out);
  if (ext === '.geojson') return writeFileAtomic(out, travelGeoJson({ route: r, isochrones: iso?.curves ?? [], bands: iso?.bands ?? [] }, { crs, lonLat: geoLonLat }));
  if (ext === '.gpx') {
    return writeFileAtomic(out, routeGpx(r!, lonLat!, `route ${specs.join(' → ')}`, stopsOf(r!, specs)));
  }
  if (ext === '.csv' && r) return writeFileAtomic(out, routeProfileCsv(r));
  if (ext === '.tif' || ext === '.tiff') return writeFileAtomic(out, await writeFieldTiff(grid!, toInputVertices(s, field!.seconds)));
  return writeVertexColumns(out, s, [{ name: 'seconds', unit: 's', values: field!.seconds, plyFill: -1 }]);
}

/** The stops of a route as GPX waypoints, named by their specs. */
function stopsOf(r: TravelRouteResult, specs: string[]) {
  return r.stopIndex.map((p, i) => ({ x: r.points[p]![0], y: r.points[p]![1], ele: r.elevation[p]!, name: specs[i] ?? `stop ${i}` }));
}
