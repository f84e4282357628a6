/**
 * `npm run bench`: runs every `*.bench.ts` in this folder in its own process
 * (so peak memory is per benchmark), in name order, passing the arguments on.
 * `npm run bench -- --quick` runs the small sizes only; `npm run bench -- io`
 * runs the benchmarks whose file name contains `io`.
 */
import { readdirSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const args = process.argv.slice(2);
const filters = args.filter((a) => !a.startsWith('-'));
const flags = args.filter((a) => a.startsWith('-'));
const files = readdirSync(here)
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => filters.length === 0 || filters.some((x) => f.includes(x)))
  .sort();
let failed = 0;
for (const f of files) {
  process.stderr.write(`# ${f}\n`);
  const r = spawnSync(process.execPath, ['--expose-gc', '--max-old-space-size=12000', '--import', 'tsx', join(here, f), ...flags], {
    stdio: 'inherit',
  });
  if (r.status !== 0) {
    failed++;
    process.stderr.write(`# ${f} failed with exit ${r.status}\n`);
  }
}
process.exit(failed ? 1 : 0);
