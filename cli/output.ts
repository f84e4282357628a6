/**
 * Writing per-vertex results by file extension (.ply, .csv, .json, each
 * optionally .gz for gzip). Values are per topology vertex; they are mapped
 * back to the file's vertices (a split vertex reports its first copy), so
 * indices match the input file. Every file is written to a temporary name
 * and renamed (src/io/atomic.ts, which also compresses `.gz` targets), and
 * {@link checkOutput} vets an output path before any work is done.
 */
import { accessSync, constants as fsConstants, statSync, type Stats } from 'node:fs';
import { basename, dirname, extname, resolve } from 'node:path';
import { encodeVertexColumns, writeFileAtomic, type Surface, type VertexColumn, type VertexFileOptions } from '../src/index.js';
import { usageError } from '../src/errors.js';

export type { VertexColumn };

/** Output formats chosen by extension. */
export const FIELD_FORMATS = ['.ply', '.csv', '.json'];

/** The format extension of an output path, lower case, ignoring a trailing `.gz`: `out.PLY.gz` → `.ply`. */
export function outputFormat(path: string): string {
  return extname(path.replace(/\.gz$/i, '')).toLowerCase();
}

/**
 * Checks an output path before any work is done, so a run never ends with
 * results it cannot write: the extension is one of `formats` (each also
 * accepted with `.gz`, which writes gzip), the folder exists and is
 * writable, the target is not a folder, and it is not the same file as any
 * of `inputs` (same device and inode, so links count too). Throws `USAGE`
 * naming the path. Every command that writes calls this right after parsing
 * its options.
 */
export function checkOutput(path: string, formats: readonly string[], inputs: readonly string[] = []): void {
  const ext = outputFormat(path);
  if (!formats.includes(ext)) {
    throw usageError(`unsupported output format '${ext || basename(path)}' (use ${formats.join(', ')}, optionally with .gz)`, path);
  }
  const dir = dirname(resolve(path));
  let d: Stats;
  try {
    d = statSync(dir);
  } catch {
    throw usageError(`output folder '${dirname(path)}' does not exist`, path);
  }
  if (!d.isDirectory()) throw usageError(`'${dirname(path)}' is not a folder`, path);
  try {
    accessSync(dir, fsConstants.W_OK | fsConstants.X_OK);
  } catch {
    throw usageError(`output folder '${dirname(path)}' is not writable`, path);
  }
  let out: Stats | undefined;
  try {
    out = statSync(path);
  } catch {
    out = undefined; // a new file
  }
  if (out === undefined) return;
  if (out.isDirectory()) throw usageError('output is a folder, not a file', path);
  for (const input of inputs) {
    let i: Stats;
    try {
      i = statSync(input);
    } catch {
      continue; // a missing input is reported when it is read
    }
    if (i.dev === out.dev && i.ino === out.ino) throw usageError(`output is the input mesh ${input} (choose another output name)`, path);
  }
}

/** {@link checkOutput} for per-vertex fields (.ply, .csv, .json). */
export function checkFieldOutput(path: string, inputs: readonly string[] = []): void {
  checkOutput(path, FIELD_FORMATS, inputs);
}

/**
 * Writes per-vertex columns to `path` (.ply with the mesh and colours from the
 * first column, binary unless `plyAscii`; .csv with vertex,x,y,z,columns…; or
 * .json): the library's `encodeVertexColumns`, stored atomically.
 */
export async function writeVertexColumns(path: string, s: Surface, columns: VertexColumn[], opts: VertexFileOptions = {}): Promise<void> {
  checkFieldOutput(path);
  const format = outputFormat(path).slice(1) as 'ply' | 'csv' | 'json';
  await writeFileAtomic(path, encodeVertexColumns(s, columns, format, opts));
}
