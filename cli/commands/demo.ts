/**
 * `orthodrome demo [--out DIR]`: the main job on the bundled demo meshes of
 * the invented scenario (the Ostrel Knoll hillside scan and the PX-7 drawn
 * cup), printing a readable summary and writing its outputs to a folder.
 */
import type { Command } from 'commander';
import { mkdirSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadSurface } from '../load.js';
import { inspectSurface } from '../../src/report/inspect.js';
import { curvatureSummary } from '../../src/report/curvature.js';
import { writeVertexColumns } from '../output.js';
import { action, fmt } from '../run.js';
import { formatInspect } from './inspect.js';


function meshDir(): string {
  const here = dirname(fileURLToPath(import.meta.url));
  const fromDist = resolve(here, '../../../meshes');
  return here.includes(`${'/'}dist${'/'}`) ? fromDist : resolve(here, '../../meshes');
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
        const out = resolve(opts.out);
        mkdirSync(out, { recursive: true });
        const say = (s: string) => process.stdout.write(s + '\n');
        say('orthodrome demo — invented scenario: the Ostrel Knoll hillside scan (metres) and the PX-7 drawn cup (millimetres)');
        say(`outputs go to ${out}\n`);

        // 1. hillside: health and curvature
        const knoll = await loadSurface(join(dir, 'ostrel-knoll.obj'), { requireManifold: true });
        say('== Ostrel Knoll hillside: mesh health');
        say(formatInspect(inspectSurface(knoll.surface)));
        const kc = curvatureSummary(knoll.surface);
        const kFile = join(out, 'knoll-curvature.ply');
        await writeVertexColumns(kFile, knoll.surface, [
          { name: 'gaussianCurvature', unit: '1/m²', values: kc.gaussianCurvature },
          { name: 'meanCurvature', unit: '1/m', values: kc.meanCurvature },
        ]);
        say(`  curvature: Gaussian ${fmt(kc.summary.gaussian.min, 3)} … ${fmt(kc.summary.gaussian.max, 3)} 1/m², mean ${fmt(kc.summary.mean.min, 3)} … ${fmt(kc.summary.mean.max, 3)} 1/m → ${kFile}\n`);

        // 2. part: health and curvature
        const cup = await loadSurface(join(dir, 'px7-cup.ply'), { requireManifold: true });
        say('== PX-7 drawn cup: mesh health');
        say(formatInspect(inspectSurface(cup.surface)));
        const cc = curvatureSummary(cup.surface);
        const cFile = join(out, 'cup-curvature.csv');
        await writeVertexColumns(cFile, cup.surface, [
          { name: 'angleDefect', unit: 'rad', values: cc.angleDefect },
          { name: 'gaussianCurvature', unit: '1/mm²', values: cc.gaussianCurvature },
          { name: 'meanCurvature', unit: '1/mm', values: cc.meanCurvature },
        ]);
        say(`  curvature: mean curvature ${fmt(cc.summary.mean.min, 3)} … ${fmt(cc.summary.mean.max, 3)} 1/mm; Gauss–Bonnet residual ${fmt(cc.summary.gaussBonnetResidual, 3)} rad → ${cFile}`);
      }),
    );
}
