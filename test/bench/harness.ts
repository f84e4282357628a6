/**
 * Benchmark harness: medians of repeated runs, JSON lines on stdout, ratios
 * against a baseline measured in the same run (the machine is noisy, so only
 * ratios from one run are compared).
 *
 * Each record: {"bench", "case", "metric", "value", "unit", ...extra}.
 */
import { performance } from 'node:perf_hooks';

/** One JSON-lines record. */
export interface BenchRecord {
  bench: string;
  case: string;
  metric: string;
  value: number;
  unit: string;
  [extra: string]: unknown;
}

/** Prints one record as a JSON line. */
export function emit(r: BenchRecord): void {
  process.stdout.write(JSON.stringify(r) + '\n');
}

/** Median of a list of numbers. */
export function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
}

/**
 * Runs `fn` `runs` times (after `warmup` unrecorded runs) and returns the
 * median wall time in milliseconds and the last result.
 */
export async function timeMedian<T>(
  fn: () => T | Promise<T>,
  runs = 5,
  warmup = 1,
): Promise<{ ms: number; all: number[]; result: T }> {
  let result!: T;
  for (let i = 0; i < warmup; i++) result = await fn();
  const all: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    result = await fn();
    all.push(performance.now() - t0);
  }
  return { ms: median(all), all, result };
}

/** Peak resident set size so far, in MB (process-wide high-water mark). */
export function peakRssMB(): number {
  return process.resourceUsage().maxRSS / 1024;
}

/** Current heap + external + array buffers, in MB. */
export function memoryMB(): number {
  const m = process.memoryUsage();
  return (m.heapUsed + m.external + m.arrayBuffers) / (1024 * 1024);
}

/** `--quick` on the command line (or BENCH_QUICK=1) selects the small sizes only. */
export function quick(): boolean {
  return process.argv.includes('--quick') || process.env.BENCH_QUICK === '1';
}
