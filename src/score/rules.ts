/**
 * Gates for `score`: a rules file (JSON) of conditions on metrics, validated
 * with a schema (zod), so a typo in a rule is an error naming the rule, never
 * a silent pass. Format:
 *
 * ```json
 * { "rules": [
 *   { "name": "closed",    "metric": "genus",       "op": "==",      "value": 0 },
 *   { "name": "angles",    "metric": "minAngleDeg", "op": ">=",      "value": 10 },
 *   { "name": "size",      "metric": "triangles",   "op": "between", "value": [100, 200000] },
 *   { "name": "round",     "metric": "area",        "op": "==",      "value": 6, "tolerance": 1e-6 },
 *   { "name": "oriented",  "metric": "orientable",  "op": "==",      "value": true },
 *   { "name": "nominals",  "landmarks": { "tolerance": 0.05 } }
 * ] }
 * ```
 *
 * - `metric` is a name from catalog.ts (unknown names are errors, with the
 *   closest known name as a hint); `op` is `<=`, `>=`, `==` or `between`
 *   (`value` then `[LOW, HIGH]`, both ends included); `==` on a number may
 *   carry a `tolerance` (|measured − value| ≤ tolerance); true/false compare
 *   with `==` only.
 * - A landmark rule checks every landmark pair of a mesh: `tolerance`
 *   (mesh units) or `relative` (a fraction of the nominal), exactly one; a
 *   pair's own tolerance from the manifest takes the place of `tolerance`.
 *   A mesh without landmark pairs fails it unless `"missing": "pass"`.
 * - `name` (optional; letters, digits, `_ . -`) names the CSV column
 *   `gate:NAME`; without it the rule's text is its name. Names are unique.
 * - A value the mesh does not have (null: genus of a non-orientable surface)
 *   fails every rule on it.
 */
import type { z } from 'zod';
import { inputError } from '../errors.js';
import { metricInfo, closestMetric, type MetricGroup, type Metrics, type MetricValue } from './catalog.js';
import type { LandmarkResult } from './landmarks.js';

/** A condition on one metric. */
export interface MetricRule {
  kind: 'metric';
  name: string;
  metric: string;
  op: '<=' | '>=' | '==' | 'between';
  value: number | boolean | [number, number];
  tolerance?: number;
}

/** A tolerance on every landmark pair of a mesh. */
export interface LandmarkRule {
  kind: 'landmarks';
  name: string;
  tolerance?: number;
  relative?: number;
  missing: 'fail' | 'pass';
}

/** One gate. */
export type Rule = MetricRule | LandmarkRule;

/** A rule checked on one mesh. */
export interface GateOutcome {
  rule: Rule;
  pass: boolean;
  /** The measured value (landmarks: the worst pair's |deviation|), null when the mesh has none. */
  measured: MetricValue;
  /** How far past the bound (0 when it passes; Infinity when there is no value): ranks the worst offenders. */
  excess: number;
  /** One short phrase on a failure ("measured 3.2, needs >= 10"), empty on a pass. */
  detail: string;
}

const NAME = /^[A-Za-z_][\w.-]*$/;

/** The schemas, made on the first rules file: zod is loaded then, not with this module (worker threads never load it). */
async function makeSchemas() {
  const { z } = await import('zod');
  const num = z.number().refine(Number.isFinite, 'must be a finite number');

  const metricRule = z.strictObject({
    name: z.string().regex(NAME, 'letters, digits, _ . - only, starting with a letter or _').optional(),
    metric: z.string(),
    op: z.enum(['<=', '>=', '==', 'between']),
    value: z.union([num, z.boolean(), z.tuple([num, num])]),
    tolerance: num.nonnegative().optional(),
  });
  const landmarkRule = z.strictObject({
    name: z.string().regex(NAME, 'letters, digits, _ . - only, starting with a letter or _').optional(),
    landmarks: z.strictObject({
      tolerance: num.nonnegative().optional(),
      relative: num.nonnegative().optional(),
      missing: z.enum(['fail', 'pass']).optional(),
    }),
  });
  const rulesFile = z.strictObject({
    description: z.string().optional(),
    rules: z.array(z.unknown()),
  });
  return { metricRule, landmarkRule, rulesFile };
}
let schemas: ReturnType<typeof makeSchemas> | undefined;

type Issue = z.core.$ZodIssue;
const say = (issues: Issue[]): string =>
  issues.map((i) => `${i.path.length ? i.path.join('.') + ': ' : ''}${i.message}`).join('; ');

/** Line and column of character `pos` in `text`. */
function lineCol(text: string, pos: number): string {
  const before = text.slice(0, pos).split('\n');
  return `${before.length}:${before[before.length - 1]!.length + 1}`;
}

/**
 * Reads and validates a rules file's text (see the module comment). `file`
 * names it in errors: an `INPUT` error naming the file and the rule (its
 * number from 1 and its name) for anything that does not fit. Async because
 * the schema library is loaded on the first call.
 */
export async function parseRules(text: string, file: string): Promise<Rule[]> {
  const { metricRule, landmarkRule, rulesFile } = await (schemas ??= makeSchemas());
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    const msg = e instanceof Error ? e.message : String(e);
    const pos = /position (\d+)/.exec(msg);
    throw inputError(`not valid JSON: ${msg.split('\n')[0]}`, pos ? `${file}:${lineCol(text, Number(pos[1]))}` : file);
  }
  const top = rulesFile.safeParse(json);
  if (!top.success) throw inputError(`expected { "rules": [ … ] }: ${say(top.error.issues)}`, file);
  const rules: Rule[] = [];
  for (const [i, raw] of top.data.rules.entries()) {
    const label = (name?: unknown) => `rule ${i + 1}${typeof name === 'string' ? ` ('${name}')` : ''}`;
    const rawName = raw && typeof raw === 'object' ? (raw as { name?: unknown }).name : undefined;
    const fail = (why: string) => inputError(`${label(rawName)}: ${why}`, file);
    if (!raw || typeof raw !== 'object' || Array.isArray(raw)) throw fail('expected an object such as { "metric": "genus", "op": "==", "value": 0 }');
    if ('landmarks' in raw) {
      const r = landmarkRule.safeParse(raw);
      if (!r.success) throw fail(say(r.error.issues));
      const l = r.data.landmarks;
      if ((l.tolerance === undefined) === (l.relative === undefined)) throw fail('a landmark rule needs exactly one of "tolerance" (mesh units) or "relative" (fraction of the nominal)');
      const name = r.data.name ?? (l.tolerance !== undefined ? `landmarks±${l.tolerance}` : `landmarks±${l.relative}rel`);
      rules.push({ kind: 'landmarks', name, ...(l.tolerance !== undefined ? { tolerance: l.tolerance } : {}), ...(l.relative !== undefined ? { relative: l.relative } : {}), missing: l.missing ?? 'fail' });
      continue;
    }
    const r = metricRule.safeParse(raw);
    if (!r.success) throw fail(say(r.error.issues));
    const { metric, op, value, tolerance } = r.data;
    const info = metricInfo(metric);
    if (!info) {
      const hint = closestMetric(metric);
      throw fail(`unknown metric '${metric}'${hint ? ` (did you mean '${hint}'?)` : ''}; 'orthodrome score --list-metrics' lists them`);
    }
    if (op === 'between' && !(Array.isArray(value) && value[0] <= value[1])) throw fail('"between" needs "value": [LOW, HIGH] with LOW <= HIGH');
    if (op !== 'between' && Array.isArray(value)) throw fail(`"${op}" needs one value; [LOW, HIGH] goes with "between"`);
    if (info.kind === 'boolean' && (typeof value !== 'boolean' || op !== '==')) throw fail(`'${metric}' is true/false: use "op": "==" with true or false`);
    if (info.kind === 'number' && typeof value === 'boolean') throw fail(`'${metric}' is a number; the value is true/false`);
    if (tolerance !== undefined && op !== '==') throw fail('"tolerance" goes with "==" only');
    const text = `${metric} ${op} ${Array.isArray(value) ? `[${value.join(', ')}]` : value}${tolerance !== undefined ? ` ±${tolerance}` : ''}`;
    rules.push({ kind: 'metric', name: r.data.name ?? text, metric, op, value, ...(tolerance !== undefined ? { tolerance } : {}) });
  }
  const seen = new Set<string>();
  for (const [i, r] of rules.entries()) {
    if (seen.has(r.name)) throw inputError(`rule ${i + 1} ('${r.name}'): another rule has this name; give each a unique "name"`, file);
    seen.add(r.name);
  }
  return rules;
}

/** The metric groups the rules read. */
export function groupsOfRules(rules: Rule[]): MetricGroup[] {
  return [...new Set(rules.map((r) => (r.kind === 'landmarks' ? 'landmarks' : metricInfo(r.metric)!.group)))];
}

/** A rule as text ("minAngleDeg >= 10", "landmarks within 0.05 units"). */
export function ruleText(r: Rule): string {
  if (r.kind === 'landmarks') return r.tolerance !== undefined ? `every landmark within ${r.tolerance} units of nominal` : `every landmark within ${r.relative} × nominal`;
  const v = Array.isArray(r.value) ? `[${r.value.join(', ')}]` : String(r.value);
  return `${r.metric} ${r.op} ${v}${r.tolerance !== undefined ? ` ±${r.tolerance}` : ''}`;
}

const show = (x: MetricValue) => (x === null ? 'none' : String(x));

function metricGate(r: MetricRule, x: MetricValue): GateOutcome {
  const fail = (excess: number): GateOutcome => ({ rule: r, pass: false, measured: x, excess, detail: `measured ${show(x)}, needs ${ruleText(r).slice(r.metric.length + 1)}` });
  if (x === null || (typeof x === 'number' && Number.isNaN(x))) return fail(Infinity);
  if (typeof r.value === 'boolean' || typeof x === 'boolean') return x === r.value ? ok(r, x) : fail(1);
  let excess: number;
  if (r.op === 'between') {
    const [lo, hi] = r.value as [number, number];
    excess = Math.max(lo - x, x - hi, 0);
  } else {
    const v = r.value as number;
    excess = r.op === '<=' ? x - v : r.op === '>=' ? v - x : Math.abs(x - v) - (r.tolerance ?? 0);
  }
  return excess > 0 ? fail(excess) : ok(r, x);
}

const ok = (rule: Rule, measured: MetricValue): GateOutcome => ({ rule, pass: true, measured, excess: 0, detail: '' });

function landmarkGate(r: LandmarkRule, ls: LandmarkResult[]): GateOutcome {
  if (ls.length === 0) {
    return r.missing === 'pass' ? ok(r, null) : { rule: r, pass: false, measured: null, excess: Infinity, detail: 'no landmark pairs given for this mesh' };
  }
  let worst: LandmarkResult | null = null, worstExcess = -Infinity, worstDev: number | null = 0;
  for (const l of ls) {
    const allowed = l.tolerance ?? (r.tolerance !== undefined ? r.tolerance : r.relative! * l.nominal);
    const excess = l.deviation === null ? Infinity : Math.abs(l.deviation) - allowed;
    if (excess > worstExcess) { worstExcess = excess; worst = l; }
    if (worstDev !== null) worstDev = l.deviation === null ? null : Math.max(worstDev, Math.abs(l.deviation));
  }
  if (worstExcess <= 0) return ok(r, worstDev);
  const w = worst!;
  const detail = w.measured === null
    ? `${w.name} (${w.from}>${w.to}): ${w.to} cannot be reached from ${w.from}`
    : `${w.name} (${w.from}>${w.to}): measured ${w.measured}, nominal ${w.nominal}, deviation ${w.deviation}`;
  return { rule: r, pass: false, measured: worstDev, excess: worstExcess, detail };
}

/** Checks every rule on one mesh's metrics and landmark pairs. */
export function checkGates(rules: Rule[], metrics: Metrics, landmarks: LandmarkResult[]): GateOutcome[] {
  return rules.map((r) => (r.kind === 'landmarks' ? landmarkGate(r, landmarks) : metricGate(r, metrics[r.metric] ?? null)));
}
