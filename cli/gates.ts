/**
 * `--require KEY OP VALUE` gates for a command's report (src/report/require.ts
 * does the parsing and checking): the option, the lines printed, and exit 1
 * when any requirement fails.
 */
import { Option } from 'commander';
import { parseRequirement, checkRequirements, type Requirement, type RequirementResult } from '../src/api/report.js';
import { fmt, GateFailure } from './run.js';

/** The repeatable `--require` option. */
export function requireOption(): Option {
  return new Option(
    '--require <check>',
    "gate on a --json key: KEY<=VALUE, KEY>=VALUE, KEY==VALUE, KEY<VALUE or KEY>VALUE (quote it: 'minAngleDeg>=10'); " +
      'nested keys with dots (edgeLength.min); repeat for several; exit 1 when any fails',
  ).argParser((v: string, prev: string[] | undefined) => [...(prev ?? []), v]);
}

/** Parses every `--require` (USAGE error on the first that does not read), before any work is done. */
export function parseRequirements(texts: string[] | undefined): Requirement[] {
  return (texts ?? []).map((t) => parseRequirement(t));
}

/** Checks the requirements against the report (USAGE error for a key it does not have). */
export function runGates(report: object, reqs: Requirement[]): RequirementResult[] {
  return checkRequirements(report, reqs);
}

const show = (x: number | boolean | null) => (x === null ? 'none (not defined for this surface)' : typeof x === 'number' ? fmt(x, 9) : String(x));

/** Text lines for the report: one per requirement, with the measured value. */
export function formatGates(results: RequirementResult[]): string {
  if (!results.length) return '';
  const failed = results.filter((r) => !r.pass).length;
  const L = [`  requirements: ${results.length - failed} of ${results.length} passed`];
  for (const r of results) L.push(`    ${r.pass ? 'pass' : 'FAIL'} ${r.text}: measured ${show(r.measured)}`);
  return '\n' + L.join('\n');
}

/** Ends the command with exit 1 (one line on stderr listing each failed requirement) when any failed. */
export function failOnGates(results: RequirementResult[]): void {
  const failed = results.filter((r) => !r.pass);
  if (!failed.length) return;
  const list = failed.map((r) => `${r.text} (measured ${show(r.measured)})`).join('; ');
  throw new GateFailure(`${failed.length} of ${results.length} requirement(s) failed: ${list}`);
}
