/**
 * A manifest of meshes to score: CSV (RFC 4180) with a header line and one
 * mesh per record.
 *
 * | column      | required | meaning                                                        |
 * |-------------|----------|----------------------------------------------------------------|
 * | `path`      | yes      | mesh file; relative paths are relative to the manifest's folder |
 * | `landmarks` | no       | landmark pairs, `[NAME=]FROM>TO=NOMINAL[±TOL]; …` (landmarks.ts) |
 * | `units`     | no       | the mesh's length unit, a label carried into the results (`mm`) |
 * | `tag`       | no       | any label carried into the results (a batch, a supplier code)   |
 *
 * Columns may come in any order; any other column is an error (a typo in
 * `landmarks` must not drop the checks silently). Blank records are skipped.
 */
import { inputError } from '../errors.js';
import { csvRecords } from '../io/csv.js';
import { parseLandmarks, type LandmarkSpec } from './landmarks.js';

/** One mesh of a manifest. */
export interface ManifestEntry {
  /** The path as written. */
  path: string;
  landmarks: LandmarkSpec[];
  units: string;
  tag: string;
  /** Where it was read (`file:line`). */
  where: string;
}

const KNOWN = ['path', 'landmarks', 'units', 'tag'];

/** Parses a manifest's text; `file` names it in `INPUT` errors (with the line). */
export function parseManifest(text: string, file: string): ManifestEntry[] {
  const body = text.replace(/^\uFEFF/, '');
  const recs = csvRecords(body.endsWith('\n') || body.endsWith('\r') ? body : body + '\n');
  if (recs.length === 0) throw inputError('empty manifest: expected a header line with a path column', file);
  const lineOf = (offset: number) => body.slice(0, offset).split('\n').length;
  const header = recs[0]!.fields.map((h) => h.trim());
  for (const h of header) {
    if (!KNOWN.includes(h)) throw inputError(`unknown manifest column '${h}' (columns: ${KNOWN.join(', ')})`, `${file}:1`);
  }
  if (new Set(header).size !== header.length) throw inputError('a column is named twice', `${file}:1`);
  const col = (name: string) => header.indexOf(name);
  if (col('path') < 0) throw inputError(`no 'path' column (columns: ${KNOWN.join(', ')})`, `${file}:1`);
  const out: ManifestEntry[] = [];
  for (const r of recs.slice(1)) {
    const where = `${file}:${lineOf(r.start)}`;
    if (r.fields.every((f) => f.trim() === '')) continue;
    if (r.fields.length !== header.length) throw inputError(`${r.fields.length} fields, the header has ${header.length}`, where);
    const get = (name: string) => (col(name) >= 0 ? r.fields[col(name)]!.trim() : '');
    const path = get('path');
    if (!path) throw inputError('empty path', where);
    out.push({ path, landmarks: parseLandmarks(get('landmarks'), where), units: get('units'), tag: get('tag'), where });
  }
  return out;
}
