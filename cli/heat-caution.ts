/**
 * The heat method's a-posteriori check on the command line (beside
 * `warnMetricMethod` of metric-option.ts): a one-line caution on stderr when
 * a heat field's check is `suspect`, and the figures for `--json`. The field
 * is still printed and written, and the exit code stays 0: the check grades
 * the field, it does not prove every suspect field wrong.
 */
import type { HeatCheck } from '../src/index.js';

/** Writes the caution for a suspect check (nothing for `ok`, null or undefined); `what` names the field (e.g. `field of set 2`). */
export function warnHeatCheck(c: HeatCheck | null | undefined, what = 'distance field'): void {
  if (!c || c.verdict === 'ok') return;
  process.stderr.write(`orthodrome: caution: the heat method's ${what} fails its check (${c.reasons.join('; ')}): it may be far off on this mesh; --method exact measures it exactly (exit code 0: the field is returned)\n`);
}

/** The `heatCheck` entry of a JSON report (empty without a check). */
export function heatCheckJson(c: HeatCheck | null | undefined): { heatCheck?: HeatCheck } {
  return c ? { heatCheck: { ...c } } : {};
}
