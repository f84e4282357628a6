/** `orthodrome inspect MESH [--json]`: mesh health summary. */
import type { Command } from 'commander';
import { loadSurface, maxInputSizeOption, weldToleranceOption } from '../load.js';
import { inspectSurface, inspectProblems, type InspectReport } from '../../src/index.js';
import { action, fmt, fmtCoord, toJson } from '../run.js';
import { requireOption, parseRequirements, runGates, formatGates, failOnGates } from '../gates.js';
import { metricOption, metricToleranceOption, metricRepairOption, metricJson, metricLines } from '../metric-option.js';

/** Human-readable lines of an inspect report. */
export function formatInspect(r: InspectReport): string {
  const deg = (x: number) => `${fmt(x, 4)}°`;
  const L: string[] = [];
  L.push(`${r.file}`);
  L.push(`  vertices ${r.vertices}, faces ${r.faces} (${r.triangles} triangles), edges ${r.edges}`);
  if (r.stl) L.push(formatStl(r.stl));
  L.push(
    `  components ${r.components}, boundary loops ${r.boundaryLoops}, Euler characteristic ${r.eulerCharacteristic}, genus ${r.genus ?? 'n/a (not orientable)'}`,
  );
  L.push(...formatLoops(r));
  const probs = inspectProblems(r);
  L.push(`  problems: ${probs.length ? probs.join('; ') : 'none'}`);
  L.push(`  area ${fmt(r.area)} units², bounding box [${r.boundingBox.min.map(fmtCoord).join(', ')}] – [${r.boundingBox.max.map(fmtCoord).join(', ')}]`);
  L.push(`  edge length min ${fmt(r.edgeLength.min)} / mean ${fmt(r.edgeLength.mean)} / max ${fmt(r.edgeLength.max)} units`);
  L.push(`  angles min ${deg(r.minAngleDeg)}, max ${deg(r.maxAngleDeg)}; obtuse triangles ${fmt(100 * r.obtuseFraction, 3)}%`);
  L.push(
    `  total angle defect ${fmt(r.totalAngleDefect)} rad, boundary turning ${fmt(r.totalBoundaryTurning)} rad, Gauss–Bonnet residual ${fmt(r.gaussBonnetResidual, 3)} rad`,
  );
  return L.join('\n');
}

/** The STL line: facets, the weld and the stored-normal check. */
function formatStl(s: NonNullable<InspectReport['stl']>): string {
  const near = s.nearPairs === null
    ? `near pairs not checked (too dense within ${fmt(s.nearPairRadius)} units)`
    : `${s.nearPairs} near pair(s) left apart within ${fmt(s.nearPairRadius)} units${s.firstNearPair ? ` (first: vertices ${s.firstNearPair.a} and ${s.firstNearPair.b}, ${fmt(s.firstNearPair.distance)} units apart)` : ''}`;
  const normals = `${s.normalsDisagreeing} stored normal(s) against the winding${s.firstNormalDisagreeing !== null ? ` (first: facet ${s.firstNormalDisagreeing})` : ''}, ${s.normalsUnchecked} not checked`;
  return `  STL (${s.encoding}): ${s.facets} facets, ${s.mergedVertices} corners welded (tolerance ${fmt(s.weldTolerance)} units), ${near}; ${normals}`;
}

/** How many boundary loops the text report lists (--json lists more, with their vertices). */
const LOOPS_IN_TEXT = 20;

/** One line per boundary loop, as `loop:ID` source specs name them; coordinates exact. */
function formatLoops(r: InspectReport): string[] {
  const xyz = (p: number[]) => `(${p.map(fmtCoord).join(', ')})`;
  const L = r.boundaryLoopList.slice(0, LOOPS_IN_TEXT).map(
    (l) => `  loop:${l.id}: ${l.vertices} vertices, length ${fmt(l.length, 9)} units, box ${xyz(l.boundingBox.min)} – ${xyz(l.boundingBox.max)}, through v:${l.point.vertex} at ${xyz(l.point.position)}`,
  );
  if (r.boundaryLoops > L.length && L.length) L.push(`  … ${r.boundaryLoops - L.length} more boundary loop(s) (--json lists ${r.boundaryLoopList.length}, with their vertices)`);
  return L;
}

/** Registers the command. */
export function registerInspect(program: Command): void {
  program
    .command('inspect')
    .description('mesh health: counts, components, boundary, Euler characteristic and genus, manifold and orientation problems, angles, Gauss–Bonnet check')
    .argument('<mesh>', 'OBJ, PLY or STL file (optionally .gz)')
    .option('--json', 'print the report as JSON (keys documented in the README)')
    .addOption(maxInputSizeOption())
    .addOption(weldToleranceOption())
    .addOption(metricOption()).addOption(metricToleranceOption()).addOption(metricRepairOption())
    .addOption(requireOption())
    .action(
      action(async (mesh: string, opts: { json?: boolean; maxInputSize?: string; weldTolerance?: string; require?: string[]; metric?: string; metricTolerance?: string; metricRepair?: string }) => {
        const reqs = parseRequirements(opts.require); // a typo is exit 2 before any work
        const { surface, metric } = await loadSurface(mesh, { maxInputSize: opts.maxInputSize, weldTolerance: opts.weldTolerance, metric: opts.metric, metricTolerance: opts.metricTolerance, metricRepair: opts.metricRepair });
        const r = inspectSurface(surface);
        const gates = runGates(r, reqs);
        process.stdout.write((opts.json ? toJson({ ...r, ...metricJson(metric), ...(reqs.length ? { requirements: gates } : {}) }) : [formatInspect(r), ...metricLines(metric)].join('\n') + formatGates(gates)) + '\n');
        failOnGates(gates); // exit 1, each failed requirement with its measured value
      }),
    );
}
