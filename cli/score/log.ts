/**
 * The results file of a `score` run as an append-only log, and its plan.
 *
 * While the run goes, each mesh's record is appended whole and flushed to
 * disk (write, then fsync) before the next is written; the writes go one
 * after another on libuv's thread pool, so the main thread hands the
 * workers their next meshes while a record is being flushed (`close` waits
 * for the last). A run killed at any moment, even
 * by SIGKILL, leaves every finished mesh on disk and at most one torn last
 * record, which `--resume` recognises (no line end), cuts off and scores
 * again. (The project's temp-file-and-rename rule is for whole-file outputs;
 * an append log is the right shape here, and a flushed record is as durable.)
 * When every mesh of the run has its record, the file is rewritten once,
 * atomically (temporary file and rename), sorted by file, so an interrupted
 * and resumed run ends with the same bytes as an uninterrupted one.
 *
 * The plan (`OUT.plan.json`, written atomically at the start) lists the
 * meshes of the run (of its shard) with their settings hashes, the shard and
 * a hash of the whole input list: `score merge` reads it to prove that no
 * mesh is missing or duplicated.
 */
import { closeSync, existsSync, fsync, fsyncSync, ftruncateSync, openSync, readFileSync, write, writeSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { writeFileAtomic } from '../../src/api/node.js';
import { readResults, csvHeader, sortRows, encodeRow, type ReadRow, type ResultFormat, type ScoreRow } from '../../src/score/index.js';
import { usageError } from '../../src/errors.js';

/** The plan of a run (see the module comment). */
export interface ScorePlan {
  orthodrome: 'score-plan';
  version: 1;
  /** The results' columns. */
  columns: string[];
  /** Hash of the run's settings (groups, rules, options that change values). */
  settings: string;
  /** Meshes in the whole input list (every shard). */
  inputs: number;
  /** SHA-256 of the whole input list (sorted files, one per line). */
  inputsHash: string;
  shard: { index: number; count: number };
  /** The meshes of this shard, sorted, with the settings hash their rows must carry. */
  files: { file: string; settings: string }[];
}

/** Where the plan of results file `out` is kept. */
export const planPath = (out: string): string => `${out}.plan.json`;

/** SHA-256 hex of a list of files (sorted, one per line). */
export function listHash(files: string[]): string {
  return createHash('sha256').update([...files].sort().join('\n'), 'utf8').digest('hex');
}

/** Reads a plan (`INPUT` error naming it when absent or malformed). */
export function readPlan(out: string): ScorePlan {
  const p = planPath(out);
  let plan: ScorePlan;
  try {
    plan = JSON.parse(readFileSync(p, 'utf8')) as ScorePlan;
  } catch (e) {
    throw usageError(`cannot read the plan of '${out}' (${(e as Error).message.split('\n')[0]}); score merge needs the .plan.json that score writes beside each part`, p);
  }
  if (plan?.orthodrome !== 'score-plan' || plan.version !== 1 || !Array.isArray(plan.files) || !Array.isArray(plan.columns)) throw usageError('not a score plan (version 1)', p);
  return plan;
}

/** The text of a whole results file: header (CSV) and records sorted by file. */
export function resultsText(columns: string[], format: ResultFormat, records: { file: string; raw: string }[]): string {
  return (format === 'csv' ? csvHeader(columns) : '') + sortRows(records).map((r) => r.raw).join('');
}

/** An open results log. */
export class ResultLog {
  private readonly fd: number;
  /** Bytes in the file: records are written at this offset. */
  private size: number;
  /** Records kept from an earlier run (`--resume`), by file. */
  readonly kept = new Map<string, ReadRow>();
  /** Records written by this run, by file. */
  private readonly fresh = new Map<string, { file: string; raw: string }>();

  /**
   * Opens `out` for the run of `plan`. Without `resume` the file starts
   * empty. With it, the records of an earlier run whose settings hash is the
   * one the plan expects for their file are kept (error records too, unless
   * `retryErrors`), a torn last record is cut off, and the rest is scored
   * again; a file with other columns (other groups or rules) is refused.
   */
  constructor(readonly out: string, readonly format: ResultFormat, readonly plan: ScorePlan, resume: boolean, retryErrors: boolean) {
    const expected = new Map(plan.files.map((f) => [f.file, f.settings]));
    if (resume && existsSync(out)) {
      const text = readFileSync(out, 'utf8');
      const r = readResults(text, format, out);
      if (r.columns && r.columns.join('\x00') !== plan.columns.join('\x00')) {
        throw usageError(`--resume: '${out}' has other columns (other metric groups or rules than this run); score to a new file, or leave out --resume to start it afresh`);
      }
      for (const row of r.rows) {
        if (expected.get(row.file) === row.settings && (row.status !== 'error' || !retryErrors)) this.kept.set(row.file, row);
        else this.kept.delete(row.file);
      }
      this.fd = openSync(out, 'r+');
      this.size = Buffer.byteLength(text.slice(0, r.completeLength), 'utf8');
      ftruncateSync(this.fd, this.size); // a torn last record goes
      if (r.columns === null && format === 'csv') {
        ftruncateSync(this.fd, 0);
        this.size = 0;
        this.append(csvHeader(plan.columns));
      }
    } else {
      this.fd = openSync(out, 'w');
      this.size = 0;
      if (format === 'csv') this.append(csvHeader(plan.columns));
    }
  }

  /** Writes `text` at the end and flushes it to disk. */
  private append(text: string): void {
    const b = Buffer.from(text, 'utf8');
    let off = 0;
    while (off < b.length) off += writeSync(this.fd, b, off, b.length - off, this.size + off);
    this.size += b.length;
    fsyncSync(this.fd);
  }

  /** The queued appends: each starts when the one before has been written and flushed. */
  private pending: Promise<void> = Promise.resolve();
  /** The first failed append (reported by `close`; later records are not written). */
  private failure: Error | null = null;

  /** Writes `b` at `pos` and flushes it, off the main thread. */
  private appendAsync(b: Buffer, pos: number): Promise<void> {
    return new Promise<void>((resolve, reject) => {
      const step = (off: number): void => {
        if (off >= b.length) {
          fsync(this.fd, (e) => (e ? reject(e) : resolve()));
          return;
        }
        write(this.fd, b, off, b.length - off, pos + off, (e, n) => (e ? reject(e) : step(off + n)));
      };
      step(0);
    });
  }

  /**
   * Appends one mesh's record and flushes it to disk: queued behind the
   * records before it (see the module comment), so this returns at once.
   */
  write(row: ScoreRow): void {
    const raw = encodeRow(row, this.plan.columns, this.format);
    const b = Buffer.from(raw, 'utf8');
    const pos = this.size;
    this.size += b.length;
    this.pending = this.pending.then(() => (this.failure ? undefined : this.appendAsync(b, pos))).catch((e: Error) => {
      this.failure ??= e;
    });
    this.fresh.set(row.file, { file: row.file, raw });
  }

  /** Waits until every record written so far is on disk; throws the first write error. */
  async flush(): Promise<void> {
    await this.pending;
    if (this.failure) throw this.failure; // as the synchronous write would have thrown it
  }

  /** Records for the final file: the kept and the fresh ones, one per planned file (fresh wins). */
  records(): { file: string; raw: string }[] {
    const out: { file: string; raw: string }[] = [];
    for (const f of this.plan.files) {
      const r = this.fresh.get(f.file) ?? this.kept.get(f.file);
      if (r) out.push({ file: f.file, raw: r.raw });
    }
    return out;
  }

  /** Closes the log; when `complete`, rewrites the file sorted and whole (atomically). */
  async close(complete: boolean): Promise<void> {
    try {
      await this.flush();
    } finally {
      closeSync(this.fd);
    }
    if (complete) await writeFileAtomic(this.out, resultsText(this.plan.columns, this.format, this.records()));
  }
}
