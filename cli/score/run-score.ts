/**
 * `orthodrome score`: the run. Options are checked and the rules and inputs
 * read before any mesh is scored (a bad argument, rules file or manifest is
 * exit 2 with one line); then the shard's meshes not already scored
 * (`--resume`) go to the worker pool, each finished mesh is checked against
 * the gates, appended to the results and shown in the progress; at the end
 * the results file is rewritten sorted and the summary printed.
 *
 * Exit 0 when every mesh of the run passes, 1 when any fails a gate or
 * cannot be scored, 2 for bad arguments, rules or manifests.
 */
import { readFileSync, statSync } from 'node:fs';
import { availableParallelism, totalmem } from 'node:os';
import { createHash } from 'node:crypto';
import { writeFileAtomic } from '../../src/api/node.js';
import {
  parseRules, groupsOfRules, orderGroups, checkGates, encodeRow, resultColumns, resultFormatOf, readResults, formatLandmarks,
  METRIC_GROUPS, DEFAULT_GROUPS, DEFAULT_HEAT_SAMPLES, METRICS,
  type MetricGroup, type Rule, type ScoreRow, type ResultFormat,
} from '../../src/score/index.js';
import { DEFAULT_MAX_INPUT_BYTES } from '../../src/api/node.js';
import { formatBytes, inputError, usageError } from '../../src/errors.js';
import { parseByteSize } from '../load.js';
import { checkOutput } from '../output.js';
import { expandInputs, type ScoreInput } from './inputs.js';
import { parseShard, shardOf, type Shard } from './shard.js';
import { ResultLog, listHash, planPath, resultsText, type ScorePlan } from './log.js';
import { ScorePool } from './pool.js';
import { ScoreProgress, formatDuration } from './progress.js';
import { countRows, summaryLines } from './summary.js';
import type { ScoreTask } from './worker.js';

/** Options of `score` as commander gives them. */
export interface ScoreOpts {
  rules?: string;
  output?: string;
  metrics?: string;
  jobs?: string;
  shard?: string;
  resume?: boolean;
  retryErrors?: boolean;
  timeLimit?: string;
  meshMemory?: string;
  heatSamples?: string;
  maxInputSize?: string;
  quiet?: boolean;
}

/** Version of the settings hash and the results layout. */
const SCORE_FORMAT = 1;
/** Smallest meshes each worker thread scores first, to warm its code up (see where the order is made). */
const WARM_UP_MESHES = 4;
/** Default per-mesh time limit, seconds. */
export const DEFAULT_TIME_LIMIT_S = 600;

function wholeNumber(text: string, option: string, min: number): number {
  const n = Number(text);
  if (!/^\s*\d+\s*$/.test(text) || !(n >= min)) throw usageError(`${option} must be a whole number of at least ${min}, got '${text}'`);
  return n;
}

/** `--metrics`: a comma list of groups, or `all`. */
export function parseGroups(text: string | undefined): MetricGroup[] {
  if (text === undefined) return [...DEFAULT_GROUPS];
  const names = text.split(',').map((s) => s.trim()).filter(Boolean);
  if (names.length === 1 && names[0] === 'all') return [...METRIC_GROUPS];
  for (const n of names) {
    if (!(METRIC_GROUPS as readonly string[]).includes(n)) throw usageError(`--metrics: unknown group '${n}' (groups: ${METRIC_GROUPS.join(', ')}, or all)`);
  }
  if (!names.length) throw usageError(`--metrics: name at least one group (${METRIC_GROUPS.join(', ')}, or all)`);
  return orderGroups(names as MetricGroup[]);
}

/** The default per-mesh memory limit: 80% of the machine's memory shared by the workers. */
export function defaultMeshMemory(jobs: number): number {
  return Math.floor((0.8 * totalmem()) / jobs);
}

/** Text listing the metrics by group (`--list-metrics`). */
export function metricList(): string {
  const L: string[] = [];
  for (const g of METRIC_GROUPS) {
    L.push(`${g}${DEFAULT_GROUPS.includes(g) ? ' (default)' : ''}:`);
    for (const m of METRICS.filter((x) => x.group === g)) L.push(`  ${m.name}${m.unit ? ` [${m.unit}]` : ''}: ${m.description}`);
  }
  return L.join('\n') + '\n';
}

/** Runs `score` (see the module comment); returns the exit code. */
export async function runScore(args: string[], o: ScoreOpts): Promise<number> {
  // everything that can be wrong with the arguments is found before any work
  const jobs = o.jobs !== undefined ? wholeNumber(o.jobs, '--jobs', 1) : availableParallelism();
  const timeLimitS = o.timeLimit !== undefined ? Number(o.timeLimit) : DEFAULT_TIME_LIMIT_S;
  if (!(timeLimitS >= 0) || !Number.isFinite(timeLimitS)) throw usageError(`--time-limit must be seconds (0 for none), got '${o.timeLimit}'`);
  const memoryLimit = o.meshMemory !== undefined ? parseByteSize(o.meshMemory, '--mesh-memory') : defaultMeshMemory(jobs);
  const heatSamples = o.heatSamples !== undefined ? wholeNumber(o.heatSamples, '--heat-samples', 1) : DEFAULT_HEAT_SAMPLES;
  const maxInputBytes = o.maxInputSize !== undefined ? parseByteSize(o.maxInputSize, '--max-input-size') : DEFAULT_MAX_INPUT_BYTES;
  const shard: Shard = o.shard !== undefined ? parseShard(o.shard, process.env) : { index: 0, count: 1, source: '' };
  const out = o.output?.replace(/\{shard\}/g, String(shard.index));
  const format: ResultFormat | null = out !== undefined ? resultFormatOf(out, '-o') : null;
  if (o.resume && out === undefined) throw usageError('--resume needs -o: the results file to continue');
  const rules: Rule[] = o.rules !== undefined ? await parseRules(readText(o.rules), o.rules) : [];
  const groups = orderGroups([...parseGroups(o.metrics), ...groupsOfRules(rules)]);
  if (args.length === 0) throw usageError('score: name the meshes: files, folders, globs, - (a list on standard input) or a manifest .csv');
  const inputs = expandInputs(args, process.cwd(), () => readFileSync(0, 'utf8'));
  // the results file: its folder exists and is writable, and it is none of the inputs named (a manifest, say)
  if (out !== undefined) checkOutput(out, ['.csv', '.jsonl'], args.filter((a) => a !== '-' && !/[*?[\]{}]/.test(a)));

  // the plan: this shard's meshes, each with the hash of the settings that make its row
  const settings = { format: SCORE_FORMAT, groups, heatSamples: groups.includes('heat') ? heatSamples : null, rules };
  const globalHash = createHash('sha256').update(JSON.stringify(settings)).digest('hex').slice(0, 16);
  const rowHash = (x: ScoreInput): string =>
    createHash('sha256').update(JSON.stringify([globalHash, formatLandmarks(x.landmarks), x.units, x.tag])).digest('hex').slice(0, 16);
  const mine = inputs.filter((x) => shard.count === 1 || shardOf(x.file, shard.count) === shard.index).sort((a, b) => (a.file < b.file ? -1 : a.file > b.file ? 1 : 0));
  const columns = resultColumns(groups, rules);
  const plan: ScorePlan = {
    orthodrome: 'score-plan', version: 1, columns, settings: globalHash,
    inputs: inputs.length, inputsHash: listHash(inputs.map((x) => x.file)),
    shard: { index: shard.index, count: shard.count },
    files: mine.map((x) => ({ file: x.file, settings: rowHash(x) })),
  };
  const log = out !== undefined && format ? new ResultLog(out, format, plan, o.resume === true, o.retryErrors === true) : null;
  if (out !== undefined) await writeFileAtomic(planPath(out), JSON.stringify(plan, null, 2) + '\n');
  const memory = new Map<string, { file: string; raw: string }>();
  // the order meshes are handed out in (the results are sorted by file at the end, so it changes no output): a few
  // of the smallest files first, so that each worker thread's code is optimized by V8 on cheap meshes (big meshes
  // handed out first run unoptimized much longer: 200 meshes of 2k-50k faces took about 1 s more CPU), then the
  // rest largest first (longest processing time first, Graham 1969), so the workers finish together instead of
  // one waiting on a big mesh handed out last
  const bytes = (f: string): number => {
    try {
      return statSync(f).size;
    } catch {
      return 0; // missing: its error row comes from the worker
    }
  };
  const bySize = mine.filter((x) => !log?.kept.has(x.file)).map((x) => ({ x, size: bytes(x.file) }))
    .sort((a, b) => a.size - b.size || (a.x.file < b.x.file ? -1 : a.x.file > b.x.file ? 1 : 0)).map((e) => e.x);
  const warm = Math.min(bySize.length, WARM_UP_MESHES * jobs);
  const todo = [...bySize.slice(0, warm), ...bySize.slice(warm).reverse()];

  const progress = new ScoreProgress(process.stderr, mine.length, o.quiet === true);
  progress.start();
  const threads = Math.max(1, Math.min(jobs, todo.length));
  const pool = todo.length ? new ScorePool(threads, timeLimitS * 1000, memoryLimit) : null;
  const settingsOf = new Map(plan.files.map((f) => [f.file, f.settings]));
  try {
    for (const row of log?.kept.values() ?? []) progress.record(row.file, row.status, 'scored before (--resume)');
    let next = 0;
    const lane = async (): Promise<void> => {
      while (next < todo.length) {
        const x = todo[next++]!;
        const task: ScoreTask = { path: x.file, file: x.file, groups, landmarks: x.landmarks, heatSamples, memoryLimit, maxInputBytes };
        const reply = await pool!.run(task);
        const row: ScoreRow = { file: x.file, status: 'pass', settings: settingsOf.get(x.file)!, tag: x.tag, units: x.units, error: '', metrics: {}, landmarks: [], failed: {} };
        let note = '';
        if (!reply.ok) {
          row.status = 'error';
          row.error = reply.error;
          note = reply.error;
        } else {
          row.metrics = reply.metrics;
          row.landmarks = reply.landmarks;
          const gates = checkGates(rules, reply.metrics, reply.landmarks).filter((g) => !g.pass);
          for (const g of gates) row.failed[g.rule.name] = g.detail;
          if (gates.length) {
            row.status = 'fail';
            note = gates.map((g) => `${g.rule.name}: ${g.detail}`).join('; ');
          }
        }
        if (log) log.write(row);
        else memory.set(row.file, { file: row.file, raw: encodeRow(row, columns, 'csv') });
        progress.record(x.file, row.status, note);
      }
    };
    await Promise.all(Array.from({ length: threads }, lane));
  } finally {
    progress.done();
    await pool?.close();
  }
  await log?.close(true);

  // the summary, from the records as they stand in the results (kept and fresh alike)
  const records = log ? log.records() : [...memory.values()];
  const fmt = format ?? 'csv';
  const rows = readResults(resultsText(columns, fmt, records), fmt, out ?? 'results').rows;
  const c = countRows(rows);
  const secs = progress.elapsed() / 1000;
  const fresh = todo.length;
  const say: string[] = [];
  say.push(
    `score: ${rows.length} mesh(es)${shard.count > 1 ? ` (shard ${shard.index}/${shard.count} of ${inputs.length})` : ''}: ${c.pass} pass, ${c.fail} fail, ${c.error} error; ` +
      `${fresh} scored in ${formatDuration(secs)}${fresh && secs > 0 ? ` (${(fresh / secs).toFixed(fresh / secs >= 10 ? 0 : 2)} meshes/s, ${threads} worker${threads === 1 ? '' : 's'})` : ''}` +
      `${log && log.kept.size ? `, ${log.kept.size} kept from before (--resume)` : ''}`,
  );
  say.push(`  metric groups: ${groups.join(', ')}; per-mesh limits: time ${timeLimitS ? `${timeLimitS} s` : 'none'} (--time-limit), memory estimate ${formatBytes(memoryLimit)} (--mesh-memory)`);
  say.push(...summaryLines(rows, columns, rules));
  if (out !== undefined) say.push(`  results: ${out} (plan: ${planPath(out)})`);
  process.stdout.write(say.join('\n') + '\n');
  return c.fail + c.error > 0 ? 1 : 0;
}

/** A text file named by an option; an `INPUT` error naming it when it cannot be read. */
function readText(path: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (e) {
    throw inputError(`cannot read the rules file: ${(e as Error).message.split('\n')[0]}`, path);
  }
}
