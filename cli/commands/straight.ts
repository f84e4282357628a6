/**
 * `orthodrome straight MESH --from POINT (--heading DEG | --toward X,Y,Z) --length L`:
 * walk straight on the surface from a point (the straightest line of
 * Polthier & Schmies 1998, `src/curves/straightest.ts`).
 */
import type { Command } from 'commander';
import { type MeshLoadFlags, loadSurface, maxInputSizeOption, weldToleranceOption } from '../load.js';
import { metricOption, metricToleranceOption, metricRepairOption } from '../metric-option.js';
import { checkOutput } from '../output.js';
import { action, fmt, fmtCoord, since, toJson } from '../run.js';
import { TERRAIN_CAUTION, MACHINING_CAUTION } from '../cautions.js';
import { OrthodromeError, formatSurfacePoint, isManifold, pointLocator, straightestLine, writeFileAtomic, type StraightestLine } from '../../src/index.js';
import { DEFAULT_REFERENCE } from '../../src/curves/index.js';
import { writeCurves, curveFormatOf, CURVE_FORMATS } from '../../src/api/io.js';

interface StraightCliOptions extends MeshLoadFlags {
  from: string;
  heading?: string;
  plan?: boolean;
  toward?: string;
  length: string;
  reference?: string;
  maxSteps?: string;
  output?: string;
  json?: boolean;
}

const usage = (detail: string, location?: string) => new OrthodromeError('USAGE', detail, location);

/** A finite number typed for `option`, else a USAGE error naming it. */
function parseNumber(text: string, option: string, what: string): number {
  const x = /^\s*[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?\s*$/.test(text) ? Number(text) : NaN;
  if (!Number.isFinite(x)) throw usage(`${option} must be ${what}, got '${text}'`);
  return x;
}

/** `X,Y,Z` typed for `option`. */
function parseVector(text: string, option: string): [number, number, number] {
  const parts = text.split(',');
  if (parts.length !== 3) throw usage(`${option} must be three numbers X,Y,Z, got '${text}'`);
  return parts.map((p) => parseNumber(p, option, 'three numbers X,Y,Z')) as [number, number, number];
}

/** Registers the command. */
export function registerStraight(program: Command): void {
  program
    .command('straight')
    .description('walk straight on the surface from a point, on a bearing or toward a point, for a given length (a straightest line)')
    .argument('<mesh>', 'OBJ, PLY or STL file (optionally .gz)')
    .requiredOption('--from <point>', 'start: v:INDEX, e:INDEX:T, f:INDEX:B0,B1,B2, p:X,Y,Z (nearest surface point in 3D) or p:X,Y (straight below or above, along +z)')
    .option('--heading <degrees>', 'bearing of the first step in degrees, clockwise from the reference direction as seen from the side the surface normal points to (with +y as north and normals up: 90 is east, +x); measured in the tangent plane, so on a slope it is not the map bearing (see --plan)')
    .option('--plan', 'measure --heading on the map instead: clockwise from the reference\'s horizontal direction seen from above (+z), like a compass bearing; the first step is the tangent direction straight above or below it')
    .option('--toward <x,y,z>', 'first step toward this point: the chord from the start projected onto the tangent plane at the start')
    .requiredOption('--length <length>', 'length to walk on the surface, in mesh units')
    .option('--reference <x,y,z>', 'direction of heading 0, projected onto the tangent plane at the start (default 0,1,0: +y); refused within 10° of the surface normal there')
    .option('--max-steps <faces>', 'most faces the line may cross (default: 64 + 8 × length / shortest edge, at most 10000000)')
    .option('-o, --output <file>', 'write the line as a curve file: .obj (l polyline), .geojson (LineString with z, mesh coordinates; properties length, requestedLength, stoppedAtBoundary, heading), .csv (curve,level,closed,length,point,x,y,z) or .json ({"units", "curves"}); add .gz to compress')
    .option('--json', 'print the result as JSON')
    .option('--split-nonmanifold', 'cut non-manifold edges and split non-manifold vertices instead of refusing the mesh (the line then stops at a cut as at the boundary)')
    .addOption(maxInputSizeOption())
    .addOption(weldToleranceOption())
    .addOption(metricOption().hideHelp()).addOption(metricToleranceOption().hideHelp()).addOption(metricRepairOption().hideHelp()) // accepted only to refuse them with a reason
    .addHelpText(
      'after',
      `
The line is straight in every face, crosses every edge at equal angles on
both sides, and leaves a vertex whose faces have total angle θ with θ/2 on
each side (Polthier & Schmies 1998). It stops at the boundary (the report
says so) or after --length. The tangent plane at the start is the face's
plane, on an edge the plane through it with the mean normal of its two faces,
at a vertex the plane normal to the angle-weighted vertex normal. Unlike a
shortest path, a straightest line depends on its start and bearing only;
two lines from nearby starts may part where they pass either side of a
vertex. It goes over whatever lies on its bearing (cliffs, ridges, a part's
edges): it is not a route. Lengths are in the mesh's own units; GeoJSON coordinates are the
mesh's own coordinates (RFC 7946 expects WGS 84 longitude/latitude).
${TERRAIN_CAUTION}
${MACHINING_CAUTION}`,
    )
    .action(action(async (mesh: string, o: StraightCliOptions) => runStraight(mesh, o)));
}

async function runStraight(mesh: string, o: StraightCliOptions): Promise<number> {
  if (o.output) checkOutput(o.output, CURVE_FORMATS, [mesh]);
  if ((o.heading === undefined) === (o.toward === undefined)) throw usage('give exactly one of --heading and --toward');
  const heading = o.heading === undefined ? undefined : parseNumber(o.heading, '--heading', 'a number of degrees');
  const toward = o.toward === undefined ? undefined : parseVector(o.toward, '--toward');
  const length = parseNumber(o.length, '--length', 'a positive length in mesh units');
  if (!(length > 0)) throw usage(`--length must be a positive length in mesh units, got '${o.length}'`);
  const reference = o.reference === undefined ? undefined : parseVector(o.reference, '--reference');
  let maxSteps: number | undefined;
  if (o.maxSteps !== undefined) {
    maxSteps = parseNumber(o.maxSteps, '--max-steps', 'a whole number of faces ≥ 1');
    if (!(Number.isInteger(maxSteps) && maxSteps >= 1)) throw usage(`--max-steps must be a whole number of faces ≥ 1, got '${o.maxSteps}'`);
  }

  const { surface, loadMs } = await loadSurface(mesh, { requireManifold: true, allowSplit: o.splitNonmanifold, maxInputSize: o.maxInputSize, weldTolerance: o.weldTolerance, metric: o.metric, metricTolerance: o.metricTolerance, metricRepair: o.metricRepair });
  const resolver = await pointLocator(surface);
  const start = resolver.resolve(o.from, '--from');
  const t0 = performance.now();
  let line: StraightestLine;
  try {
    line = straightestLine(surface, start, {
      length, ...(heading !== undefined ? { heading, plan: Boolean(o.plan) } : {}), ...(toward ? { toward } : {}), ...(reference ? { reference } : {}), ...(maxSteps !== undefined ? { maxSteps } : {}),
    });
  } catch (e) {
    // name the option the library's refusal is about
    if (e instanceof OrthodromeError && e.code === 'USAGE' && (e.location === 'reference' || e.location === 'toward' || e.location === 'start')) {
      throw usage(e.detail, e.location === 'start' ? `${mesh}: --from ${o.from}` : `--${e.location}`);
    }
    throw e;
  }
  const walkMs = since(t0);
  if (line.length === 0) {
    throw usage(`the line leaves the surface at once: the start ${formatSurfacePoint(line.start)} lies on the boundary and the direction points off the mesh`, `${mesh}: --from ${o.from}`);
  }
  const n = line.points.length / 3;
  const points: [number, number, number][] = [];
  for (let i = 0; i < n; i++) points.push([line.points[3 * i]!, line.points[3 * i + 1]!, line.points[3 * i + 2]!]);
  const cut = o.splitNonmanifold && !isManifold(surface);

  if (o.output) {
    const format = curveFormatOf(o.output)!;
    const text = writeCurves(format, [{
      closed: false, length: line.length, points: line.points,
      properties: { requestedLength: length, stoppedAtBoundary: line.stoppedAtBoundary, heading: line.heading ?? null, planBearing: line.planBearing ?? null, from: o.from },
    }], { comment: `orthodrome straight ${mesh} --from ${o.from}` });
    await writeFileAtomic(o.output, text);
  }
  if (o.json) {
    process.stdout.write(toJson({
      mesh,
      length: line.length,
      requestedLength: length,
      unit: 'mesh units',
      points,
      stoppedAtBoundary: line.stoppedAtBoundary,
      start: formatSurfacePoint(line.start),
      end: formatSurfacePoint(line.end),
      heading: line.heading ?? null,
      planBearing: line.planBearing ?? null,
      reference: reference ?? [...DEFAULT_REFERENCE],
      direction: line.direction,
      normal: line.normal,
      vertexPassages: line.vertexPassages,
      snapped: resolver.landings.map((l) => ({ point: l.spec, surfacePoint: formatSurfacePoint(l.point), position: l.position, moved: l.distance })),
      timings: { load: loadMs, walk: walkMs },
      output: o.output ?? null,
    }) + '\n');
    return 0;
  }
  const v3 = (a: ArrayLike<number>) => `(${Array.from(a, fmtCoord).join(', ')})`;
  const L = [`${mesh}: straightest line ${fmt(line.length, 9)} mesh units${line.stoppedAtBoundary ? ` of ${fmt(length, 9)} asked: stopped at the boundary${cut ? ' (or at a cut made by --split-nonmanifold)' : ''}` : ''}, ${n} points, ${line.vertexPassages} vertex passage(s)`];
  for (const l of resolver.landings) L.push(`  ${l.spec} landed on ${formatSurfacePoint(l.point)} at ${v3(l.position)}, moved ${fmt(l.distance, 4)} mesh units`);
  const ref = reference ?? DEFAULT_REFERENCE;
  const tangentBearing = line.heading === undefined ? '' : `bearing ${fmt(line.heading, 9)}° clockwise from (${ref.join(', ')}) projected on the tangent plane`;
  const mapBearing = line.planBearing === undefined ? '' : `map bearing ${fmt(line.planBearing, 9)}° from (${ref.join(', ')}) seen from above`;
  const bearing = [o.plan ? mapBearing : tangentBearing, o.plan ? tangentBearing : mapBearing].filter(Boolean).join('; ');
  L.push(`  from ${formatSurfacePoint(line.start)} at ${v3(points[0]!)}, ${toward ? `toward ${v3(toward)}${bearing ? ` (${bearing})` : ''}` : bearing}`);
  L.push(`  first direction ${v3(line.direction.map((x) => Number(x.toPrecision(9))))}, tangent-plane normal ${v3(line.normal.map((x) => Number(x.toPrecision(9))))}`);
  L.push(`  to ${formatSurfacePoint(line.end)} at ${v3(points[n - 1]!)}`);
  L.push(`  timings: load ${fmt(loadMs, 4)} ms, walk ${fmt(walkMs, 4)} ms`);
  if (o.output) L.push(`  wrote ${o.output}`);
  process.stdout.write(L.join('\n') + '\n');
  return 0;
}
