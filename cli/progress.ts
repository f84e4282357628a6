/**
 * A progress line on stderr for runs longer than about a second, only when
 * stderr is a terminal (never in pipes, files or tests): one line rewritten
 * in place — carriage return, the text, then "erase to end of line"
 * (ESC [ K, EL in ECMA-48 §8.3.41) — and erased when the run ends, so the
 * command's own output and any error message start on a clean line.
 *
 * The solvers never print: they call a progress callback
 * (`DistanceOptions.progress`), and this module decides whether and how often
 * to show it. {@link formatProgress} is the pure part.
 */

/** What a progress line says. */
export interface ProgressState {
  /** What is running, e.g. "exact distance" or "heat: preparing". */
  label: string;
  /** Share done in [0, 1], when known. */
  share?: number;
  /** Source set being solved and how many there are (`--each`), when more than one. */
  set?: [number, number];
  /** Milliseconds since the run started. */
  elapsedMs: number;
}

/** The text of a progress line, at most `width` characters (e.g. "exact distance: set 2 of 6, 43%, 12.3 s"). */
export function formatProgress(s: ProgressState, width = 80): string {
  const parts: string[] = [];
  if (s.set && s.set[1] > 1) parts.push(`set ${s.set[0]} of ${s.set[1]}`);
  if (s.share !== undefined && Number.isFinite(s.share)) parts.push(`${Math.floor(100 * Math.min(1, Math.max(0, s.share)))}%`);
  parts.push(`${(s.elapsedMs / 1000).toFixed(1)} s`);
  const text = `${s.label}: ${parts.join(', ')}`;
  return text.length > width ? text.slice(0, Math.max(0, width - 1)) + '…' : text;
}

/** The stream a {@link ProgressLine} writes to (process.stderr, or a fake in tests). */
export interface ProgressStream {
  isTTY?: boolean;
  columns?: number;
  write(text: string): unknown;
}

/** Options of {@link ProgressLine}. */
export interface ProgressLineOptions {
  /** Show nothing before this many ms (default 1000). */
  delayMs?: number;
  /** At most one update per this many ms (default 100). */
  intervalMs?: number;
  /** Clock in ms (default performance.now). */
  now?: () => number;
}

/** A progress line on a terminal stream; does nothing when the stream is not a TTY. */
export class ProgressLine {
  /** Whether anything will ever be written (the stream is a terminal). */
  readonly enabled: boolean;
  private readonly t0: number;
  private last = -Infinity;
  private shown = false;
  private state: Omit<ProgressState, 'elapsedMs'> = { label: '' };
  private readonly delayMs: number;
  private readonly intervalMs: number;
  private readonly now: () => number;

  constructor(private readonly stream: ProgressStream, opts: ProgressLineOptions = {}) {
    this.enabled = stream.isTTY === true;
    this.delayMs = opts.delayMs ?? 1000;
    this.intervalMs = opts.intervalMs ?? 100;
    this.now = opts.now ?? (() => performance.now());
    this.t0 = this.now();
  }

  /** Updates what the line says (fields given replace the old ones) and redraws it when due. */
  update(s: Partial<Omit<ProgressState, 'elapsedMs'>>): void {
    if (!this.enabled) return;
    this.state = { ...this.state, ...s };
    const t = this.now();
    if (t - this.t0 < this.delayMs || t - this.last < this.intervalMs) return;
    this.last = t;
    this.shown = true;
    const width = Math.max(20, (this.stream.columns || 80) - 1); // 0 or unknown: 80
    this.stream.write(`\r${formatProgress({ ...this.state, elapsedMs: t - this.t0 }, width)}\x1b[K`);
  }

  /** Erases the line if it was shown (call when the run ends, however it ends). */
  done(): void {
    if (this.shown) this.stream.write('\r\x1b[K');
    this.shown = false;
  }
}
