/**
 * Progress of a `score` run on stderr. On a terminal: one bar rewritten in
 * place (carriage return, the text, erase to end of line: ESC [ K, ECMA-48
 * §8.3.41) with meshes done, rate, ETA and failures so far, at most ten times
 * a second, erased at the end. Otherwise (a pipe, a file, a cluster log):
 * one plain line per mesh, so a log shows what happened to each.
 */
import type { RowStatus } from '../../src/score/index.js';

/** Counts so far. */
export interface ScoreCounts {
  done: number;
  total: number;
  pass: number;
  fail: number;
  error: number;
}

/** Seconds as text: `42 s`, `3 min 5 s`, `2 h 10 min`. */
export function formatDuration(s: number): string {
  if (!Number.isFinite(s) || s < 0) return '?';
  if (s < 60) return `${Math.round(s)} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${Math.round(s % 60)} s`;
  return `${Math.floor(s / 3600)} h ${Math.round((s % 3600) / 60)} min`;
}

/** The bar's text (pure): `[#####-----] 45/200 meshes, 12.3/s, ETA 13 s, 2 failed, 1 error`. */
export function formatBar(c: ScoreCounts, elapsedMs: number, width = 80): string {
  const share = c.total ? c.done / c.total : 1;
  const rate = elapsedMs > 0 ? (1000 * c.done) / elapsedMs : 0;
  const eta = rate > 0 ? (c.total - c.done) / rate : NaN;
  const tail = ` ${c.done}/${c.total} meshes, ${rate >= 10 ? rate.toFixed(0) : rate.toFixed(1)}/s, ETA ${c.done ? formatDuration(eta) : '?'}, ${c.fail} failed, ${c.error} error${c.error === 1 ? '' : 's'}`;
  const barWidth = Math.max(10, Math.min(30, width - tail.length - 3));
  const full = Math.round(share * barWidth);
  const text = `[${'#'.repeat(full)}${'-'.repeat(barWidth - full)}]${tail}`;
  return text.length > width ? text.slice(0, Math.max(0, width - 1)) + '…' : text;
}

/** The stream progress goes to. */
export interface BarStream {
  isTTY?: boolean;
  columns?: number;
  write(text: string): unknown;
}

/** Progress of a run (see the module comment). */
export class ScoreProgress {
  private last = -Infinity;
  private shown = false;
  private readonly t0 = performance.now();
  readonly counts: ScoreCounts;

  constructor(private readonly stream: BarStream, total: number, private readonly quiet = false) {
    this.counts = { done: 0, total, pass: 0, fail: 0, error: 0 };
  }

  /** Elapsed ms. */
  elapsed(): number {
    return performance.now() - this.t0;
  }

  private timer: ReturnType<typeof setInterval> | undefined;

  /** On a terminal, redraws the bar every second too, so rate and ETA move while a long mesh runs. */
  start(): void {
    if (this.quiet || !this.stream.isTTY) return;
    this.timer = setInterval(() => this.draw(true), 1000);
    this.timer.unref();
  }

  private draw(force: boolean): void {
    const t = performance.now();
    if (!force && t - this.last < 100 && this.counts.done < this.counts.total) return;
    this.last = t;
    this.shown = true;
    this.stream.write(`\r${formatBar(this.counts, this.elapsed(), Math.max(20, (this.stream.columns || 80) - 1))}\x1b[K`);
  }

  /** One mesh finished. */
  record(file: string, status: RowStatus, note: string): void {
    const c = this.counts;
    c.done++;
    c[status]++;
    if (this.quiet) return;
    if (this.stream.isTTY) {
      this.draw(false);
    } else {
      this.stream.write(`score ${c.done}/${c.total} ${status} ${file}${note ? `: ${note}` : ''}\n`);
    }
  }

  /** Erases the bar (call however the run ends). */
  done(): void {
    if (this.timer) clearInterval(this.timer);
    this.timer = undefined;
    if (this.shown) this.stream.write('\r\x1b[K');
    this.shown = false;
  }
}
