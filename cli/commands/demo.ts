/**
 * `orthodrome demo [--out DIR]`: the main job on the bundled demo meshes of
 * the invented scenario (the Ostrel Knoll hillside scan and the PX-7 drawn
 * cup), printing a readable summary and writing its outputs to a folder.
 */
import type { Command } from 'commander';
import { mkdirSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadSurface } from '../load.js';
import {
  boundarySources, curvatureSummary, encodeRoute, fieldStats, inspectSurface, pointLocator, prepareDistances, shortestPath, writeFileAtomic,
  surfaceIsolines, surfaceOffset, writeCurves,
} from '../../src/index.js';
import { distanceScalarField } from '../../src/curves/index.js';
import { writeVertexColumns } from '../output.js';
import { action, fmt } from '../run.js';
import { formatInspect } from './inspect.js';
import { TERRAIN_CAUTION, MACHINING_CAUTION } from '../cautions.js';
import { demoClimbingMetric } from '../metric-option.js';
import { demoWalkingTimes, demoMoorIsochrones } from './travel-demo.js';
import { demoScore } from '../score/demo.js';


function meshDir(): string {
  const here = dirname(fileURLToPath(import.meta.url));
  const fromDist = resolve(here, '../../../meshes');
  return here.includes(`${'/'}dist${'/'}`) ? fromDist : resolve(here, '../../meshes');
}

/** Loads a demo mesh (refusing non-manifold input), prints its health and returns it with its curvature. */
async function healthAndCurvature(file: string, title: string, say: (s: string) => void) {
  const { surface } = await loadSurface(file, { requireManifold: true });
  say(`== ${title}: mesh health`);
  say(formatInspect(inspectSurface(surface)));
  return { surface, curvature: curvatureSummary(surface) };
}

/** Registers the command. */
export function registerDemo(program: Command): void {
  program
    .command('demo')
    .description('run the main job on the bundled demo meshes (Ostrel Knoll hillside scan, PX-7 drawn cup) and write the results to a folder')
    .option('--out <dir>', 'output folder', 'out/demo')
    .action(
      action(async (opts: { out: string }) => {
        const dir = meshDir();
        const rel = (p: string) => relative(process.cwd(), p);
        const out = resolve(opts.out);
        mkdirSync(out, { recursive: true });
        const say = (s: string) => process.stdout.write(s + '\n');
        say('orthodrome demo — invented scenario: the Ostrel Knoll hillside scan (metres) and the PX-7 drawn cup (millimetres)');
        say(`outputs go to ${rel(out) || '.'}\n`);

        // 1. hillside: health and curvature
        const knoll = await healthAndCurvature(rel(join(dir, 'ostrel-knoll.obj')), 'Ostrel Knoll hillside', say);
        const kc = knoll.curvature;
        const kFile = join(out, 'knoll-curvature.ply');
        await writeVertexColumns(kFile, knoll.surface, [
          { name: 'gaussianCurvature', unit: '1/m²', values: kc.gaussianCurvature },
          { name: 'meanCurvature', unit: '1/m', values: kc.meanCurvature },
        ]);
        say(`  curvature: Gaussian ${fmt(kc.summary.gaussian.min, 3)} … ${fmt(kc.summary.gaussian.max, 3)} 1/m², mean ${fmt(kc.summary.mean.min, 3)} … ${fmt(kc.summary.mean.max, 3)} 1/m → ${rel(kFile)}`);

        // 2. hillside: walking distance on the ground from the trailhead car park
        const kt = knoll.surface.topology;
        const kPoints = await pointLocator(knoll.surface);
        const trailhead = kPoints.resolve('p:431212,6170412,230', 'trailhead');
        const summit = kPoints.resolve('p:431280,6170470,260', 'summit cairn');
        const saddle = kPoints.resolve('p:431322,6170483,240', 'saddle');
        const exact = prepareDistances(knoll.surface, 'exact').solve({ points: [trailhead], curves: [] });
        const heatSolver = prepareDistances(knoll.surface, 'heat');
        const heat = heatSolver.solve({ points: [trailhead], curves: [] });
        let diff = 0, n = 0;
        for (let v = 0; v < kt.nv; v++) {
          const e = exact.field.distance[v]!, h = heat.field.distance[v]!;
          if (Number.isFinite(e) && e > 0) { diff += Math.abs(h - e) / e; n++; }
        }
        const kdFile = join(out, 'knoll-distance.ply');
        await writeVertexColumns(kdFile, knoll.surface, [
          { name: 'distance', unit: 'm', values: exact.field.distance, plyFill: -1 },
          { name: 'heatDistance', unit: 'm', values: heat.field.distance, plyFill: -1 },
        ]);
        const ks = fieldStats(exact.field.distance);
        say('== Ostrel Knoll: distance on the ground from the trailhead car park');
        say(`  exact (window propagation): to the summit cairn ${fmt(exact.at(summit), 6)} m, to the saddle ${fmt(exact.at(saddle), 6)} m; farthest point of the scan ${fmt(ks.max, 6)} m`);
        say(`  heat method: to the summit cairn ${fmt(heat.at(summit), 6)} m (mean difference from exact ${fmt((100 * diff) / Math.max(n, 1), 3)}%), prepared in ${fmt(heatSolver.prepareMs, 3)} ms, solved in ${fmt(heat.solveMs, 3)} ms`);
        say(`  → ${rel(kdFile)}`);
        const iso = surfaceIsolines(knoll.surface, distanceScalarField(exact, knoll.surface, { points: [trailhead], curves: [] }), { every: 25, bands: true }); // exact: every crossing, curves bent in faces
        const kiFile = join(out, 'knoll-isolines-25m.geojson');
        const bandPolys = iso.bands!.flatMap((b) => b.polygons.map((p) => ({ rings: [p.outer, ...p.holes], properties: { levelFrom: b.lower, levelTo: b.upper, area: b.area, planArea: b.planArea } })));
        await writeFileAtomic(kiFile, writeCurves('geojson', iso.curves, { units: 'm', polygons: bandPolys }));
        say(`  isolines every 25 m of walking distance: ${iso.curves.length} curves at ${iso.levels.join(', ')} m, bands with plan areas ${iso.bands!.map((b) => fmt(b.planArea, 4)).join(', ')} m² → ${rel(kiFile)}`);
        await demoClimbingMetric((metric) => loadSurface(rel(join(dir, 'ostrel-knoll.obj')), { requireManifold: true, metric }), 'p:431220,6170440', 'p:431300,6170540', say); // a user metric (--metric): west gate → north stile
        await demoWalkingTimes(rel(join(dir, 'ostrel-knoll.obj')), rel(out), say); // walking times, isochrones, route as GeoJSON and GPX (travel)
        await demoMoorIsochrones(rel(join(dir, 'ostrel-moor.tif')), rel(out), say); // a DEM GeoTIFF: 10-minute isochrones, the field as a GeoTIFF, a route
        say('  (planning aid only: see the terrain caution below)\n');

        // 3. part: health and curvature
        const cup = await healthAndCurvature(rel(join(dir, 'px7-cup.ply')), 'PX-7 drawn cup', say);
        const cc = cup.curvature;
        const cFile = join(out, 'cup-curvature.csv');
        await writeVertexColumns(cFile, cup.surface, [
          { name: 'angleDefect', unit: 'rad', values: cc.angleDefect },
          { name: 'gaussianCurvature', unit: '1/mm²', values: cc.gaussianCurvature },
          { name: 'meanCurvature', unit: '1/mm', values: cc.meanCurvature },
        ]);
        say(`  curvature: mean curvature ${fmt(cc.summary.mean.min, 3)} … ${fmt(cc.summary.mean.max, 3)} 1/mm; Gauss–Bonnet residual ${fmt(cc.summary.gaussBonnetResidual, 3)} rad → ${rel(cFile)}`);

        // 4. part: on-surface distance from the part's edges, and an exact cut path
        const cPoints = await pointLocator(cup.surface);
        const edges = prepareDistances(cup.surface, 'exact').solve({ points: [], curves: boundarySources(cup.surface) });
        const ceFile = join(out, 'cup-edge-distance.csv');
        await writeVertexColumns(ceFile, cup.surface, [{ name: 'distanceFromEdge', unit: 'mm', values: edges.field.distance }]);
        const es = fieldStats(edges.field.distance);
        say('== PX-7 cup: on-surface distance from the hole and flange edges, and a cut path');
        say(`  distance from the nearest edge: up to ${fmt(es.max, 5)} mm (mean ${fmt(es.mean, 4)} mm) → ${rel(ceFile)}`);
        const stops = ['p:6,0,0', 'p:0,30,26', 'p:-46,0,26'].map((x, i) => cPoints.resolve(x, ['hole edge', 'wall top', 'flange rim'][i]));
        const route = shortestPath(cup.surface, stops);
        const cpFile = join(out, 'cup-cut-path.obj');
        await writeFileAtomic(cpFile, encodeRoute(route, 'obj', 'px7_cut_path'));
        const trim = surfaceOffset(cup.surface, { points: [], curves: cPoints.resolveLoop('loop@-46,0,26', 'flange rim') }, 8);
        const ctFile = join(out, 'cup-trim-line-8mm.obj');
        await writeFileAtomic(ctFile, writeCurves('obj', trim.curves, { units: 'mm', comment: 'PX-7 trim line 8 mm inside the flange rim (planning estimate)' }));
        say(`  trim line 8 mm on the surface inside the flange rim: ${trim.curves.map((c) => `${c.closed ? 'closed' : 'open'}, ${fmt(c.length, 6)} mm`).join('; ')} → ${rel(ctFile)}`);
        say(`  exact shortest cut path hole edge → wall top → flange rim: ${fmt(route.length, 6)} mm (legs ${route.legs.map((l) => fmt(l.length, 5)).join(' + ')} mm), ${route.path.points.length} points → ${rel(cpFile)}`);
        await demoScore(rel(join(dir, 'score-demo')), rel(out), say); // 5. batch scoring of four parts with gates: one fails (exit 1 reported, not passed on)
        say(TERRAIN_CAUTION);
        say(MACHINING_CAUTION);
      }),
    );
}
