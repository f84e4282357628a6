/**
 * Result rows of `score` and their two file forms, written and read back
 * (for `--resume` and `score merge`).
 *
 * Columns, in this order and stable for given groups and rules: `file`,
 * `status` (pass / fail / error), `settings` (hash of the settings that
 * produced the row), `tag`, `units`, `error` (the message of an error row),
 * the metrics of the groups in catalogue order, `landmarks` (the pairs as
 * text, when the landmarks group is on), then `gate:NAME` for every rule
 * (empty when it passed, a short phrase when it failed).
 *
 * CSV (RFC 4180: a header line, then one record per mesh; numbers as the
 * shortest decimal that reads back to the same double, true/false, an empty
 * field for none) or JSON Lines (one object per mesh with the same keys; none
 * is null; `landmarks` is an array of objects).
 *
 * A results file is an append-only log: each record is written whole and
 * flushed, so after a crash only the last record can be torn, and it is
 * recognised by its missing line end ({@link readResults} reports where the
 * complete records end).
 */
import { inputError } from '../errors.js';
import { csvField, csvRecords } from '../io/csv.js';
import { metricInfo, metricsOf, type MetricGroup, type Metrics, type MetricValue } from './catalog.js';
import type { LandmarkResult } from './landmarks.js';
import type { Rule } from './rules.js';

/** Outcome of one mesh. */
export type RowStatus = 'pass' | 'fail' | 'error';

/** One result row. */
export interface ScoreRow {
  file: string;
  status: RowStatus;
  settings: string;
  tag: string;
  units: string;
  /** Error message (error rows), else empty. */
  error: string;
  metrics: Metrics;
  landmarks: LandmarkResult[];
  /** Failed gates: rule name → phrase. */
  failed: Record<string, string>;
}

/** Results file format. */
export type ResultFormat = 'csv' | 'jsonl';

const FIXED = ['file', 'status', 'settings', 'tag', 'units', 'error'];

/** The columns for the given groups and rules (see the module comment). */
export function resultColumns(groups: readonly MetricGroup[], rules: Rule[]): string[] {
  const cols = [...FIXED, ...metricsOf(groups).map((m) => m.name)];
  if (groups.includes('landmarks')) cols.push('landmarks');
  for (const r of rules) cols.push(`gate:${r.name}`);
  return cols;
}

/** The format of a results file by its extension (`.csv`, `.jsonl`); a `USAGE`-like `INPUT` error otherwise. */
export function resultFormatOf(path: string, label: string): ResultFormat {
  if (/\.csv$/i.test(path)) return 'csv';
  if (/\.jsonl$/i.test(path)) return 'jsonl';
  throw inputError(`results go to a .csv or .jsonl file, not '${path}'`, label);
}

/** Landmark pairs as one text cell: `NAME FROM>TO measured M nominal N deviation D; …`. */
export function landmarkCell(ls: LandmarkResult[]): string {
  return ls.map((l) => `${l.name} ${l.from}>${l.to} measured ${l.measured ?? 'unreachable'} nominal ${l.nominal} deviation ${l.deviation ?? 'none'}`).join('; ');
}

function value(row: ScoreRow, col: string): MetricValue | string {
  switch (col) {
    case 'file': return row.file;
    case 'status': return row.status;
    case 'settings': return row.settings;
    case 'tag': return row.tag;
    case 'units': return row.units;
    case 'error': return row.error;
    case 'landmarks': return landmarkCell(row.landmarks);
  }
  if (col.startsWith('gate:')) return row.failed[col.slice(5)] ?? null;
  return row.metrics[col] ?? null;
}

/** The CSV header line (with its line end). */
export function csvHeader(columns: string[]): string {
  return columns.map(csvField).join(',') + '\n';
}

/** One row as a record of the file (with its line end). */
export function encodeRow(row: ScoreRow, columns: string[], format: ResultFormat): string {
  if (format === 'csv') return columns.map((c) => csvField(value(row, c))).join(',') + '\n';
  const o: Record<string, unknown> = {};
  for (const c of columns) {
    const v = c === 'landmarks' ? row.landmarks : value(row, c);
    o[c] = typeof v === 'number' && !Number.isFinite(v) ? null : v;
  }
  return JSON.stringify(o) + '\n';
}

/** A record read back: its key fields, its values and its text as written. */
export interface ReadRow {
  file: string;
  status: RowStatus;
  settings: string;
  /** Values by column (numbers and true/false restored for metric columns; none is null). */
  values: Record<string, unknown>;
  /** The record's text, line end included. */
  raw: string;
}

/** What {@link readResults} found. */
export interface ReadResults {
  /** CSV: the header's columns; JSON Lines: the first record's keys (null when there is none). */
  columns: string[] | null;
  rows: ReadRow[];
  /** Length of the text up to the end of the last complete record (a torn last record lies beyond). */
  completeLength: number;
}

function typed(col: string, text: string): unknown {
  if (text === '') return col.startsWith('gate:') || metricInfo(col) ? null : '';
  const info = metricInfo(col);
  if (!info) return text;
  if (info.kind === 'boolean') return text === 'true';
  return Number(text);
}

function keyFields(values: Record<string, unknown>, where: string): Pick<ReadRow, 'file' | 'status' | 'settings'> {
  const { file, status, settings } = values;
  if (typeof file !== 'string' || !file) throw inputError('a record without a file', where);
  if (status !== 'pass' && status !== 'fail' && status !== 'error') throw inputError(`status '${String(status)}' is not pass, fail or error`, where);
  if (typeof settings !== 'string') throw inputError('a record without a settings hash', where);
  return { file, status, settings };
}

/**
 * Reads a results file's text (see the module comment). A torn last record
 * (no line end: a run killed while writing) is not returned; anything else
 * that does not read is an `INPUT` error naming `name` and the line.
 */
export function readResults(text: string, format: ResultFormat, name: string): ReadResults {
  const rows: ReadRow[] = [];
  if (format === 'jsonl') {
    let columns: string[] | null = null, pos = 0, line = 0;
    while (pos < text.length) {
      const nl = text.indexOf('\n', pos);
      if (nl < 0) break; // torn tail
      line++;
      const raw = text.slice(pos, nl + 1);
      pos = nl + 1;
      if (!raw.trim()) continue;
      let values: Record<string, unknown>;
      try {
        values = JSON.parse(raw) as Record<string, unknown>;
      } catch {
        throw inputError('not a JSON object', `${name}:${line}`);
      }
      if (!values || typeof values !== 'object' || Array.isArray(values)) throw inputError('not a JSON object', `${name}:${line}`);
      columns ??= Object.keys(values);
      rows.push({ ...keyFields(values, `${name}:${line}`), values, raw });
    }
    return { columns, rows, completeLength: pos };
  }
  const recs = csvRecords(text);
  if (recs.length === 0) return { columns: null, rows, completeLength: 0 };
  const columns = recs[0]!.fields;
  for (const [k, r] of recs.slice(1).entries()) {
    if (r.fields.length === 1 && r.fields[0] === '') continue; // blank line
    const where = `${name}: record ${k + 1}`;
    if (r.fields.length !== columns.length) throw inputError(`${r.fields.length} fields, the header has ${columns.length}`, where);
    const values: Record<string, unknown> = {};
    columns.forEach((c, j) => (values[c] = typed(c, r.fields[j]!)));
    rows.push({ ...keyFields(values, where), values, raw: text.slice(r.start, r.end) });
  }
  return { columns, rows, completeLength: recs[recs.length - 1]!.end };
}

/** Rows sorted by file (UTF-16 code units, so every machine agrees). */
export function sortRows<T extends { file: string }>(rows: T[]): T[] {
  return [...rows].sort((a, b) => (a.file < b.file ? -1 : a.file > b.file ? 1 : 0));
}
