/**
 * `--memory-budget SIZE`: the memory the exact method may use, and its
 * default on this machine.
 *
 * SIZE is read by `parseByteSize` (load.ts): bytes with an optional unit K,
 * M, G or T (powers of 1024), e.g. `512M`, `2G`. The default is a quarter of
 * the memory this process may use (the container's limit when there is one,
 * else the machine's), at most 2 GiB. The windows live in typed arrays
 * outside V8's heap, so Node's heap limit
 * (`v8.getHeapStatistics().heap_size_limit`, about 4 GiB here) does not cap
 * the budget; what a run keeps on the heap is small (test/cli/limits.test.ts
 * runs a solve whose windows exceed a 32 MB heap limit).
 */
import { Option } from 'commander';
import { totalmem } from 'node:os';
import { formatBytes } from '../src/errors.js';
import { parseByteSize } from './load.js';

/** Default budget of the exact method: a quarter of the memory available to this process, at most 2 GiB. */
export function defaultMemoryBudget(): number {
  const constrained = typeof process.constrainedMemory === 'function' ? process.constrainedMemory() : 0;
  const total = totalmem();
  const avail = constrained && constrained > 0 && constrained < total ? constrained : total;
  return Math.min(2 ** 31, Math.floor(avail / 4));
}

/** The `--memory-budget` option of `distance` and `path`. */
export function memoryBudgetOption(): Option {
  return new Option(
    '--memory-budget <size>',
    `exact method: memory a solve may use, e.g. 512M or 4G (K/M/G = powers of 1024; default here ${formatBytes(defaultMemoryBudget())}: ` +
      'a quarter of the memory, at most 2 GiB); a run that would need more stops with exit 3',
  );
}

/** The budget in bytes: `--memory-budget` when given, else the default. */
export function memoryBudgetBytes(text: string | undefined): number {
  return text === undefined ? defaultMemoryBudget() : parseByteSize(text, '--memory-budget');
}
