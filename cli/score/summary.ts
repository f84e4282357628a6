/**
 * The summary a `score` run (or `score merge`) prints on stdout: counts of
 * meshes passed, failed and in error, and per gate how many failed and the
 * worst offenders (ranked by how far past the bound; without the rules, as
 * after a merge, in file order), then the first errors.
 */
import { checkGates, ruleText, type ReadRow, type Rule, type Metrics } from '../../src/score/index.js';

/** How many offenders per gate, and errors, are listed. */
export const WORST = 3;

/** Counts of a set of rows. */
export function countRows(rows: ReadRow[]): { pass: number; fail: number; error: number } {
  const c = { pass: 0, fail: 0, error: 0 };
  for (const r of rows) c[r.status]++;
  return c;
}

/** How far `row` is past `rule` (for ranking); Infinity when it has no value. */
function excess(rule: Rule, row: ReadRow): number {
  const metrics = row.values as Metrics;
  if (rule.kind === 'landmarks') {
    const x = rule.relative !== undefined ? metrics.landmarkMaxRelDeviation : metrics.landmarkMaxAbsDeviation;
    return typeof x === 'number' ? x : Infinity;
  }
  return checkGates([rule], metrics, [])[0]!.excess;
}

/** Summary lines (see the module comment); `columns` gives the gates (`gate:NAME`). */
export function summaryLines(rows: ReadRow[], columns: string[], rules: Rule[] = []): string[] {
  const L: string[] = [];
  const byName = new Map(rules.map((r) => [r.name, r]));
  for (const col of columns.filter((c) => c.startsWith('gate:'))) {
    const name = col.slice(5);
    const failed = rows.filter((r) => typeof r.values[col] === 'string' && r.values[col] !== '');
    const rule = byName.get(name);
    const what = rule ? ` (${ruleText(rule)})` : '';
    if (!failed.length) {
      L.push(`  gate ${name}${what}: all ${rows.filter((r) => r.status !== 'error').length} scored meshes pass`);
      continue;
    }
    const ranked = rule ? [...failed].sort((a, b) => excess(rule, b) - excess(rule, a) || (a.file < b.file ? -1 : 1)) : failed;
    L.push(`  gate ${name}${what}: ${failed.length} failed; worst: ${ranked.slice(0, WORST).map((r) => `${r.file} (${String(r.values[col])})`).join('; ')}`);
  }
  const errors = rows.filter((r) => r.status === 'error');
  if (errors.length) {
    L.push(`  errors: ${errors.length}${errors.length > WORST ? ` (first ${WORST})` : ''}`);
    for (const r of errors.slice(0, WORST)) L.push(`    ${String(r.values.error)}`);
  }
  return L;
}
