/**
 * `orthodrome path MESH --from POINT --to POINT [--via POINT...] [--closed]`:
 * the exact shortest path on the surface through waypoints.
 */
import { Option, type Command } from 'commander';
import { loadSurface, maxInputSizeOption } from '../load.js';
import { memoryBudgetBytes, memoryBudgetOption } from '../memory-budget.js';
import { checkOutput, outputFormat } from '../output.js';
import { action, fmt, fmtCoord, since, toJson } from '../run.js';
import { TERRAIN_CAUTION, MACHINING_CAUTION } from '../cautions.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { PointResolver } from '../../src/query/resolve.js';
import { formatSurfacePoint } from '../../src/query/surface-point.js';
import { shortestPathThrough, AUTO_FLIP_FACES, FLIP_VERIFY_FACES, type PathMethod } from '../../src/geodesic/waypoints.js';
import { pathPolyline } from '../../src/geodesic/path.js';
import { coverPathThrough, orientationCover } from '../../src/geodesic/cover.js';
import { writeObjPolyline } from '../../src/io/write-obj.js';
import { toCsv } from '../../src/io/csv.js';
import { writeFileAtomic } from '../../src/io/atomic.js';
import { usageError } from '../../src/errors.js';

const PATH_FORMATS = ['.obj', '.csv', '.geojson', '.json'];
const collect = (v: string, prev: string[] = []) => [...prev, v];
const METHOD_TEXT: Record<string, string> = {
  windows: 'windows (window propagation: the shortest path)',
  flip: 'flip (edge flips from the edge-graph shortest route)',
  mixed: 'mixed (see the legs)',
};

interface PathCliOptions {
  from: string;
  to?: string;
  via?: string[];
  closed?: boolean;
  output?: string;
  json?: boolean;
  splitNonmanifold?: boolean;
  maxInputSize?: string;
  memoryBudget?: string;
  pathMethod?: PathMethod;
  proveLimit?: string;
}

/** Registers the command. */
export function registerPath(program: Command): void {
  program
    .command('path')
    .description('exact shortest path on the surface from a point to another, through optional waypoints')
    .argument('<mesh>', 'OBJ or PLY file (optionally .gz)')
    .requiredOption('--from <point>', 'start: v:INDEX, e:INDEX:T, f:INDEX:B0,B1,B2, p:X,Y,Z (nearest surface point in 3D) or p:X,Y (straight below or above, along +z)')
    .option('--to <point>', 'end point (required unless --closed)')
    .option('--via <point>', 'waypoint visited in order between --from and --to; repeat for several', collect)
    .option('--closed', 'return to the start after the last point (a closed loop)')
    .option('-o, --output <file>', 'write the path: .obj (polyline), .csv (x,y,z,length,face), .geojson (LineString with z, mesh coordinates) or .json; add .gz to compress')
    .option('--json', 'print the result as JSON')
    .option('--split-nonmanifold', 'cut non-manifold edges and split non-manifold vertices instead of refusing the mesh')
    .addOption(maxInputSizeOption())
    .addOption(memoryBudgetOption())
    .addOption(new Option('--path-method <method>', `windows (window propagation: the shortest path, proven), flip (edge flips from the edge-graph shortest route: a geodesic, much faster on large meshes; two points off the vertices on one face, and split vertices, use windows) or auto (flip from ${AUTO_FLIP_FACES} faces up)`).choices(['auto', 'flip', 'windows']).default('auto'))
    .option('--prove-limit <faces>', `largest region (faces within the ellipsoid that holds every shorter path) on which window propagation proves a flip leg shortest or finds the shorter one; 0 skips the proof (default: ${FLIP_VERIFY_FACES} with flip, none with auto)`)
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
  const { surface, loadMs } = await loadSurface(mesh, { requireManifold: true, allowSplit: o.splitNonmanifold, maxInputSize: o.maxInputSize });
  const t = surface.topology;
  const resolver = new PointResolver(t, surface.positions);
  // a non-orientable surface was cut along seams to build it: trace on its double cover (paths cross the seams)
  const seams = surface.report.orientationSeams;
  const cover = seams.length ? orientationCover(t, surface.positions, seams) : null;
  const specs = [o.from, ...(o.via ?? []), ...(o.to ? [o.to] : [])];
  const labels = ['--from', ...(o.via ?? []).map(() => '--via'), ...(o.to ? ['--to'] : [])];
  const stops = specs.map((s, i) => resolver.resolveAll(s, labels[i])); // a split vertex: every copy
  if (o.closed) stops.push(stops[0]!);
  if (stops.length < 2) throw usageError('a path needs at least two points');

  const proveLimit = o.proveLimit === undefined ? undefined : Number(o.proveLimit);
  if (proveLimit !== undefined && !(Number.isInteger(proveLimit) && proveLimit >= 0)) throw usageError(`--prove-limit must be a whole number of faces, got '${o.proveLimit}'`);
  const t0 = performance.now();
  const route = cover ? coverPathThrough(cover, stops, { memoryBudget }) : shortestPathThrough(intrinsicFromPositions(t, surface.positions), stops, { memoryBudget, pinches: resolver.splitGroups(), method: o.pathMethod ?? 'auto', positions: surface.positions, ...(proveLimit !== undefined ? { verifyFaces: proveLimit } : {}) });
  const solveMs = since(t0);
  const legMethods = route.legs.map((l) => l.method ?? 'windows');
  const method = legMethods.every((x) => x === legMethods[0]) ? legMethods[0]! : 'mixed';
  const legProven = route.legs.map((l) => l.proven ?? true);
  const proven = legProven.every(Boolean);
  if (!Number.isFinite(route.length)) {
    const leg = route.legs.findIndex((l) => !Number.isFinite(l.length));
    throw usageError(`no path on the surface from ${specs[leg] ?? o.from} to ${specs[leg + 1] ?? o.from}: the points lie on different components`, mesh);
  }
  const xyz = pathPolyline(route.path, t, surface.positions);
  const n = route.path.points.length;
  const points: [number, number, number][] = [];
  for (let i = 0; i < n; i++) points.push([xyz[3 * i]!, xyz[3 * i + 1]!, xyz[3 * i + 2]!]);

  if (o.output) {
    const ext = outputFormat(o.output);
    if (ext === '.obj') {
      await writeFileAtomic(o.output, writeObjPolyline(xyz, 'shortest_path'));
    } else if (ext === '.csv') {
      const rows = points.map((p, i) => [p[0], p[1], p[2], route.cumulative[i]!, route.faces[i]!]);
      await writeFileAtomic(o.output, toCsv(['x', 'y', 'z', 'length', 'face'], rows));
    } else if (ext === '.geojson') {
      const gj = {
        type: 'Feature',
        properties: { length: route.length, unit: 'mesh units', closed: Boolean(o.closed), waypoints: specs },
        geometry: { type: 'LineString', coordinates: points },
      };
      await writeFileAtomic(o.output, toJson(gj, 0) + '\n');
    } else {
      await writeFileAtomic(o.output, toJson(resultJson(), 0) + '\n');
    }
  }
  function resultJson() {
    return {
      length: route.length,
      unit: 'mesh units',
      points,
      surfacePoints: route.path.points.map(formatSurfacePoint),
      method,
      proven,
      legs: route.legs.map((l, i) => ({ from: specs[i] ?? specs[0], to: specs[i + 1] ?? specs[0], length: l.length, method: legMethods[i], proven: legProven[i] })),
      snapped: resolver.landings.map((l) => ({ point: l.spec, surfacePoint: formatSurfacePoint(l.point), position: l.position, moved: l.distance })),
      timings: { load: loadMs, solve: solveMs },
    };
  }
  if (o.json) {
    process.stdout.write(toJson({ mesh, ...resultJson(), output: o.output ?? null }) + '\n');
  } else {
    const what = proven ? 'shortest path' : 'geodesic path (locally shortest, not proven shortest: see the legs)';
    const L = [`${mesh}: ${what} ${fmt(route.length, 9)} mesh units, ${n} points, ${route.legs.length} leg(s), method ${METHOD_TEXT[method]}`];
    for (const l of resolver.landings) L.push(`  ${l.spec} landed on ${formatSurfacePoint(l.point)} at (${l.position.map(fmtCoord).join(', ')}), moved ${fmt(l.distance, 4)} mesh units`);
    route.legs.forEach((l, i) => L.push(`  leg ${i + 1}: ${specs[i] ?? specs[0]} → ${specs[i + 1] ?? specs[0]}: ${fmt(l.length, 9)} (${legMethods[i]}${legProven[i] ? '' : `; a shorter path could run through more than --prove-limit ${proveLimit ?? FLIP_VERIFY_FACES} faces: not checked`})`));
    L.push(`  timings: load ${fmt(loadMs, 4)} ms, solve ${fmt(solveMs, 4)} ms`);
    if (o.output) L.push(`  wrote ${o.output}`);
    process.stdout.write(L.join('\n') + '\n');
  }
  return 0;
}
