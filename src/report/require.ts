/**
 * Gates on a plain-data report (the `inspect --json` object): requirements
 * written `KEY OP VALUE`, checked against the measured values.
 *
 * - KEY is a key of the report; nested values are reached with dots
 *   (`edgeLength.min`, `boundingBox.max.2`). It must name a number or a
 *   true/false value; anything else is a `USAGE` error listing the keys that
 *   can be checked, so a typo never passes silently.
 * - OP is one of `<=`, `>=`, `==`, `<`, `>`; `==` compares exactly (meant
 *   for counts and true/false; use `<=`/`>=` for measured quantities).
 * - VALUE is a number (`20`, `-1e-3`) or `true` / `false` (only with `==`).
 *
 * A value the report cannot give (`genus` is null on a non-orientable
 * surface, or a NaN) fails every requirement on it.
 */
import { usageError } from '../errors.js';

/** A comparison operator of a requirement. */
export type Comparison = '<=' | '>=' | '==' | '<' | '>';

/** One parsed requirement. */
export interface Requirement {
  /** As typed. */
  text: string;
  /** Dotted key path. */
  key: string;
  /** Operator. */
  op: Comparison;
  /** The bound. */
  value: number | boolean;
}

/** A requirement with its measured value and outcome. */
export interface RequirementResult extends Requirement {
  /** The report's value (null when the report has none for this surface). */
  measured: number | boolean | null;
  /** Whether the requirement holds. */
  pass: boolean;
}

const SYNTAX = /^\s*([A-Za-z_][\w.]*)\s*(<=|>=|==|<|>)\s*(\S+)\s*$/;

/** Parses `KEY OP VALUE`; a `USAGE` error naming `option` and the text when it does not fit. */
export function parseRequirement(text: string, option = '--require'): Requirement {
  const m = SYNTAX.exec(text);
  const how = 'expected KEY OP VALUE with OP one of <=, >=, ==, <, > (e.g. genus==0, minAngleDeg>=10)';
  if (!m) throw usageError(`cannot read requirement '${text}': ${how}`, option);
  const [, key, op, raw] = m as unknown as [string, string, Comparison, string];
  let value: number | boolean;
  if (raw === 'true' || raw === 'false') {
    if (op !== '==') throw usageError(`requirement '${text}': true/false compare only with ==`, option);
    value = raw === 'true';
  } else {
    value = Number(raw);
    if (!Number.isFinite(value) || !/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(raw)) {
      throw usageError(`requirement '${text}': '${raw}' is not a number or true/false (${how})`, option);
    }
  }
  return { text: text.trim(), key, op, value };
}

/** Dotted paths of the report's leaves that a requirement can check (numbers, true/false, null), arrays left out. */
export function checkableKeys(report: object): string[] {
  const out: string[] = [];
  const walk = (o: object, prefix: string) => {
    for (const [k, v] of Object.entries(o)) {
      const path = prefix + k;
      if (typeof v === 'number' || typeof v === 'boolean' || v === null) out.push(path);
      else if (v && typeof v === 'object' && !Array.isArray(v) && !ArrayBuffer.isView(v)) walk(v, path + '.');
    }
  };
  walk(report, '');
  return out;
}

function lookup(report: object, key: string): { found: boolean; value: unknown } {
  let cur: unknown = report;
  for (const part of key.split('.')) {
    if (cur === null || typeof cur !== 'object' || !Object.prototype.hasOwnProperty.call(cur, part)) return { found: false, value: undefined };
    cur = (cur as Record<string, unknown>)[part];
  }
  return { found: true, value: cur };
}

/**
 * Checks each requirement against `report`. Throws `USAGE` (naming the
 * requirement and listing the checkable keys) for a key the report does not
 * have or that is not a number or true/false, and for a true/false bound on
 * a number key or the reverse.
 */
export function checkRequirements(report: object, reqs: Requirement[], option = '--require'): RequirementResult[] {
  return reqs.map((r) => {
    const { found, value } = lookup(report, r.key);
    const isLeaf = typeof value === 'number' || typeof value === 'boolean' || value === null;
    if (!found || !isLeaf) {
      const what = found ? 'is not a number or true/false' : 'is not a key of the report';
      throw usageError(`requirement '${r.text}': '${r.key}' ${what}; keys: ${checkableKeys(report).join(', ')}`, option);
    }
    if (value !== null && typeof value !== typeof r.value) {
      throw usageError(`requirement '${r.text}': '${r.key}' is ${typeof value === 'boolean' ? 'true/false' : 'a number'}, the bound is not`, option);
    }
    const measured = value as number | boolean | null;
    return { ...r, measured, pass: holds(measured, r.op, r.value) };
  });
}

function holds(x: number | boolean | null, op: Comparison, v: number | boolean): boolean {
  if (x === null || (typeof x === 'number' && Number.isNaN(x))) return false;
  switch (op) {
    case '==': return x === v;
    case '<=': return x <= v;
    case '>=': return x >= v;
    case '<': return x < v;
    case '>': return x > v;
  }
}
