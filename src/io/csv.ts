/**
 * CSV text (RFC 4180 quoting): a generic table writer, a per-vertex column
 * writer, and the reader of records (with quoted fields) that manifests and
 * results files are read back with. Numbers are printed as the shortest decimal that reads back to the
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

/**
 * A field as CSV text (the one home of the quoting rule): quoted when it
 * holds a comma, quote, CR or LF; none and non-finite numbers empty;
 * true/false as words.
 */
export function csvField(v: number | string | boolean | null): string {
  if (v === null) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  if (typeof v === 'boolean') return String(v);
  return /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}
const field = csvField;

/** One CSV record read back: its fields (unquoted) and where its text starts and ends (line end included). */
export interface CsvRecord {
  fields: string[];
  start: number;
  end: number;
}

/**
 * The CSV records of `text` (RFC 4180: quoted fields may hold commas, quotes
 * as `""`, CR and LF; records end with LF, CR LF or CR). A last record
 * without its line end is left out, so a reader of an append-only file sees
 * a torn tail as missing, never as a short record.
 */
export function csvRecords(text: string): CsvRecord[] {
  const out: CsvRecord[] = [];
  let fields: string[] = [], cur = '', quoted = false, start = 0, i = 0, fieldStarted = false;
  while (i < text.length) {
    const c = text[i]!;
    if (quoted) {
      if (c === '"') {
        if (text[i + 1] === '"') { cur += '"'; i += 2; continue; }
        quoted = false;
      } else cur += c;
      i++;
      continue;
    }
    if (c === '"' && !fieldStarted) { quoted = true; fieldStarted = true; i++; continue; }
    if (c === ',') { fields.push(cur); cur = ''; fieldStarted = false; i++; continue; }
    if (c === '\n' || c === '\r') {
      fields.push(cur);
      const end = c === '\r' && text[i + 1] === '\n' ? i + 2 : i + 1;
      out.push({ fields, start, end });
      fields = []; cur = ''; fieldStarted = false; start = end; i = end;
      continue;
    }
    cur += c;
    fieldStarted = true;
    i++;
  }
  return out;
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
