/** `orthodrome curvature MESH -o OUT`: angle defect, Gaussian and mean curvature per vertex. */
import type { Command } from 'commander';
import { loadSurface, maxInputSizeOption, weldToleranceOption } from '../load.js';
import { writeVertexColumns, checkFieldOutput } from '../output.js';
import { action, fmt, toJson } from '../run.js';
import { curvatureSummary } from '../../src/index.js';
import { metricOption, metricToleranceOption, metricRepairOption, metricJson, metricLines } from '../metric-option.js';

/** Registers the command. */
export function registerCurvature(program: Command): void {
  program
    .command('curvature')
    .description('angle defect, Gaussian curvature (defect / mixed-Voronoi area) and mean curvature (cotangent Laplacian) per vertex')
    .argument('<mesh>', 'OBJ, PLY or STL file (optionally .gz)')
    .option('-o, --output <file>', 'write per-vertex values: .ply (binary, with colours), .csv or .json; add .gz to compress')
    .option('--ascii', 'write PLY output as ascii instead of binary')
    .option('--json', 'print the summary as JSON')
    .option('--split-nonmanifold', 'cut non-manifold edges and split non-manifold vertices instead of refusing the mesh')
    .addOption(maxInputSizeOption())
    .addOption(weldToleranceOption())
    .addOption(metricOption()).addOption(metricToleranceOption()).addOption(metricRepairOption())
    .action(
      action(async (mesh: string, opts: { output?: string; json?: boolean; ascii?: boolean; splitNonmanifold?: boolean; maxInputSize?: string; weldTolerance?: string; metric?: string; metricTolerance?: string; metricRepair?: string }) => {
        if (opts.output) checkFieldOutput(opts.output, [mesh]);
        const { surface, metric } = await loadSurface(mesh, { requireManifold: true, allowSplit: opts.splitNonmanifold, maxInputSize: opts.maxInputSize, weldTolerance: opts.weldTolerance, metric: opts.metric, metricTolerance: opts.metricTolerance, metricRepair: opts.metricRepair });
        const c = curvatureSummary(surface);
        if (opts.output) {
          await writeVertexColumns(opts.output, surface, [
            { name: 'angleDefect', unit: 'rad', values: c.angleDefect },
            { name: 'gaussianCurvature', unit: '1/units²', values: c.gaussianCurvature },
            // mean curvature belongs to the embedding: not written under a user metric
            ...(metric ? [] : [{ name: 'meanCurvature', unit: '1/units', values: c.meanCurvature }]),
            { name: 'boundary', unit: 'flag', values: Float64Array.from(c.boundary), flag: true },
          ], { plyAscii: opts.ascii, colorBy: metric ? 'gaussianCurvature' : 'meanCurvature' });
        }
        const s = c.summary;
        if (opts.json) {
          process.stdout.write(toJson({ file: mesh, output: opts.output ?? null, ...metricJson(metric), ...s, ...(metric ? { mean: null } : {}) }) + '\n');
        } else {
          const L = [
            `${mesh}: ${s.interiorVertices} interior and ${s.boundaryVertices} boundary vertices`,
            `  Gaussian curvature (1/units²): min ${fmt(s.gaussian.min)}, mean ${fmt(s.gaussian.mean)}, max ${fmt(s.gaussian.max)}`,
            metric ? '  mean curvature: not defined by a user metric (it belongs to the embedding)' : `  mean curvature (1/units): min ${fmt(s.mean.min)}, mean ${fmt(s.mean.mean)}, max ${fmt(s.mean.max)}`,
            `  total angle defect ${fmt(s.totalAngleDefect)} rad + boundary turning ${fmt(s.totalBoundaryTurning)} rad = 2π·χ with χ = ${s.eulerCharacteristic} (residual ${fmt(s.gaussBonnetResidual, 3)} rad)`,
          ];
          if (s.zeroAreaVertices) L.push(`  ${s.zeroAreaVertices} interior vertex(es) of zero area: Gaussian and mean curvature are not defined there (written as empty / null)`);
          if (opts.output) L.push(`  wrote ${opts.output}`);
          L.push(...metricLines(metric));
          process.stdout.write(L.join('\n') + '\n');
        }
      }),
    );
}
