/**
 * CSV text (RFC 4180 quoting): a generic table writer and a per-vertex column
 * writer. Numbers are printed as the shortest decimal that reads back to the
 * same double (ECMAScript Number-to-String); non-finite numbers and `null`
 * become an empty field, so a spreadsheet sees "no value", not `Infinity`.
 */
import { usageError } from '../errors.js';

/** One named column of numbers, one value per row. */
export interface CsvColumn {
  name: string;
  values: ArrayLike<number>;
}

/** Options of the CSV writers. */
export interface CsvOptions {
  /** Line ending (default `\n`; RFC 4180 specifies `\r\n`). */
  newline?: '\n' | '\r\n';
}

/** A field as CSV text: quoted when it holds a comma, quote, CR or LF. */
function field(v: number | string | null): string {
  if (v === null) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  return /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

/** A header line and one line per row. Rows may be ragged; nothing is padded. */
export function toCsv(header: string[], rows: (number | string | null)[][], opts: CsvOptions = {}): string {
  const nl = opts.newline ?? '\n';
  const lines: string[] = [header.map(field).join(',')];
  for (const r of rows) lines.push(r.map(field).join(','));
  return lines.join(nl) + nl;
}

/**
 * A header of column names and one row per vertex. Throws `USAGE` when the
 * columns differ in length.
 */
export function writeVertexCsv(columns: CsvColumn[], opts: CsvOptions = {}): string {
  const nl = opts.newline ?? '\n';
  const n = columns.length ? columns[0]!.values.length : 0;
  for (const c of columns) {
    if (c.values.length !== n) throw usageError(`column '${c.name}' has ${c.values.length} values, expected ${n}`);
  }
  const chunks: string[] = [columns.map((c) => field(c.name)).join(',')];
  let row = '';
  for (let i = 0; i < n; i++) {
    row = '';
    for (let j = 0; j < columns.length; j++) {
      const v = columns[j]!.values[i]!;
      if (j > 0) row += ',';
      if (Number.isFinite(v)) row += String(v);
    }
    chunks.push(row);
  }
  return chunks.join(nl) + nl;
}
