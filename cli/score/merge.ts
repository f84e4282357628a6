/**
 * `orthodrome score merge PARTS… -o OUT`: joins the results of the shards
 * of one run into one report, and proves it whole. Each part's plan
 * (`PART.plan.json`, written by `score`) says which meshes the part was to
 * score; merge refuses (exit 2, one line naming the part and the mesh):
 * parts of different runs (another input list, shard count, settings or
 * columns), a shard given twice or missing, a mesh scored in two parts, a
 * planned mesh without its row (the shard did not finish: run it again with
 * `--resume`), a row no plan asked for, or a row made with other settings.
 *
 * The merged report is sorted by file and written atomically, with a plan
 * of its own (shard 0 of 1), so it is byte for byte what one unsharded run
 * of the same inputs writes. Exit 1 when any mesh failed or is in error,
 * like the run itself.
 */
import { readFileSync } from 'node:fs';
import { writeFileAtomic } from '../../src/index.js';
import { readResults, resultFormatOf, type ReadRow } from '../../src/score/index.js';
import { inputError, usageError } from '../../src/errors.js';
import { planPath, readPlan, resultsText, type ScorePlan } from './log.js';
import { countRows, summaryLines } from './summary.js';
import { checkOutput } from '../output.js';

/** Merges `parts` into `out` (see the module comment); returns the exit code. */
export async function runMerge(parts: string[], out: string | undefined): Promise<number> {
  if (out === undefined) throw usageError('score merge: name the merged report with -o OUT.csv or -o OUT.jsonl');
  if (parts.length === 0) throw usageError('score merge: name the parts to merge');
  const format = resultFormatOf(out, '-o');
  checkOutput(out, ['.csv', '.jsonl'], parts);
  const seenPart = new Set<string>();
  let first: ScorePlan | null = null, firstPart = '';
  const byShard = new Map<number, string>();
  const rows = new Map<string, { row: ReadRow; part: string }>();
  const files: { file: string; settings: string }[] = [];
  for (const part of parts) {
    if (seenPart.has(part)) throw usageError(`'${part}' is named twice`, 'score merge');
    seenPart.add(part);
    if (resultFormatOf(part, part) !== format) throw usageError(`'${part}' is not a .${format} file like ${out}: merge parts of one format`, 'score merge');
    const plan = readPlan(part);
    if (!first) { first = plan; firstPart = part; }
    const other = (what: string) => usageError(`'${part}' is not a shard of the same run as '${firstPart}': other ${what}`, 'score merge');
    if (plan.inputsHash !== first.inputsHash || plan.inputs !== first.inputs) throw other('input list');
    if (plan.shard.count !== first.shard.count) throw other(`shard count (${plan.shard.count}, not ${first.shard.count})`);
    if (plan.settings !== first.settings) throw other('settings (metric groups, rules or options)');
    if (plan.columns.join('\x00') !== first.columns.join('\x00')) throw other('columns');
    const dup = byShard.get(plan.shard.index);
    if (dup !== undefined) throw usageError(`shard ${plan.shard.index}/${plan.shard.count} is given twice: '${dup}' and '${part}'`, 'score merge');
    byShard.set(plan.shard.index, part);

    let text: string;
    try {
      text = readFileSync(part, 'utf8');
    } catch (e) {
      throw inputError(`cannot read: ${(e as Error).message.split('\n')[0]}`, part);
    }
    const r = readResults(text, format, part);
    if (r.completeLength !== text.length) throw inputError('the last record is torn (the run was killed): run that shard again with --resume', part);
    if (r.columns && r.columns.join('\x00') !== plan.columns.join('\x00')) throw inputError(`the columns are not those of its plan (${planPath(part)})`, part);
    const want = new Map(plan.files.map((f) => [f.file, f.settings]));
    const got = new Set<string>();
    for (const row of r.rows) {
      const elsewhere = rows.get(row.file);
      if (elsewhere) throw inputError(`mesh '${row.file}' is in two parts: '${elsewhere.part}' and '${part}'`, part);
      if (got.has(row.file)) throw inputError(`mesh '${row.file}' has two rows`, part);
      const s = want.get(row.file);
      if (s === undefined) throw inputError(`mesh '${row.file}' is not in the plan of this part (${planPath(part)})`, part);
      if (s !== row.settings) throw inputError(`mesh '${row.file}' was scored with other settings (hash ${row.settings}, the plan says ${s})`, part);
      got.add(row.file);
      rows.set(row.file, { row, part });
    }
    const missing = plan.files.filter((f) => !got.has(f.file));
    if (missing.length) {
      throw inputError(`${missing.length} planned mesh(es) have no row (first: '${missing[0]!.file}'): the shard did not finish; run it again with --resume`, part);
    }
    files.push(...plan.files);
  }
  const plan = first!;
  const absent = Array.from({ length: plan.shard.count }, (_, i) => i).filter((i) => !byShard.has(i));
  if (absent.length) throw usageError(`shard(s) ${absent.map((i) => `${i}/${plan.shard.count}`).join(', ')} missing: ${plan.inputs} meshes were planned, the parts hold ${files.length}`, 'score merge');
  if (files.length !== plan.inputs) throw usageError(`the parts plan ${files.length} meshes, the input list has ${plan.inputs}`, 'score merge');

  const records = [...rows.values()].map((x) => ({ file: x.row.file, raw: x.row.raw }));
  const merged: ScorePlan = { ...plan, shard: { index: 0, count: 1 }, files: [...files].sort((a, b) => (a.file < b.file ? -1 : a.file > b.file ? 1 : 0)) };
  await writeFileAtomic(out, resultsText(plan.columns, format, records));
  await writeFileAtomic(planPath(out), JSON.stringify(merged, null, 2) + '\n');
  const all = [...rows.values()].map((x) => x.row);
  const c = countRows(all);
  const L = [`score merge: ${parts.length} part(s), ${all.length} mesh(es), none missing or duplicated: ${c.pass} pass, ${c.fail} fail, ${c.error} error`];
  L.push(...summaryLines([...all].sort((a, b) => (a.file < b.file ? -1 : 1)), plan.columns));
  L.push(`  results: ${out} (plan: ${planPath(out)})`);
  process.stdout.write(L.join('\n') + '\n');
  return c.fail + c.error > 0 ? 1 : 0;
}
