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
import type { Surface } from '../src/mesh/surface.js';
import { writePly } from '../src/io/write-ply.js';
import { writeVertexCsv } from '../src/io/csv.js';
import { colorize } from '../src/io/colormap.js';
import { writeFileAtomic } from '../src/io/atomic.js';
import { usageError } from '../src/errors.js';
import { toJson } from './run.js';

/** A named per-vertex column with its unit. */
export interface VertexColumn {
  name: string;
  unit: string;
  values: Float64Array;
  /** Integer flag columns are written as uint8 in PLY. */
  flag?: boolean;
  /**
   * Value written in PLY for a non-finite entry (PLY has no null). CSV writes
   * an empty field and JSON writes null instead. Default 0.
   */
  plyFill?: number;
}

/** Output formats chosen by extension. */
export const FIELD_FORMATS = ['.ply', '.csv', '.json'];

/** Maps per-topology-vertex values to per-input-vertex values (non-finite where the input vertex has no face). */
export function toInputVertices(s: Surface, values: Float64Array): Float64Array {
  const n = s.data.positions.length / 3;
  const out = new Float64Array(n).fill(NaN);
  const o = s.topology.vertexOrigin;
  for (let v = s.topology.nv - 1; v >= 0; v--) out[o[v]!] = values[v]!;
  return out;
}

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
 * .json).
 */
export async function writeVertexColumns(
  path: string,
  s: Surface,
  columns: VertexColumn[],
  opts: { plyAscii?: boolean; comment?: string; colorBy?: string } = {},
): Promise<void> {
  checkFieldOutput(path);
  const ext = outputFormat(path);
  const cols = columns.map((c) => ({ ...c, values: toInputVertices(s, c.values) }));
  const P = s.data.positions;
  const n = P.length / 3;
  if (ext === '.ply') {
    const vertexProps = cols.map((c) => ({
      name: c.name,
      type: c.flag ? ('uint8' as const) : ('float64' as const),
      values: c.values.map((x) => (Number.isFinite(x) ? x : (c.plyFill ?? 0))),
    }));
    // the file's own vertex properties (e.g. a scanner's quality) are kept, unless a new column has the name
    const names = new Set(cols.map((c) => c.name));
    const kept = s.data.vertexProps.filter((c) => !names.has(c.name) && !['red', 'green', 'blue', 'alpha'].includes(c.name));
    const colorCol = cols.find((c) => c.name === opts.colorBy) ?? cols[0];
    const colors = colorCol ? colorize(colorCol.values) : undefined;
    const bytes = writePly(
      { positions: P, faceOffsets: s.data.faceOffsets, faceIndices: s.data.faceIndices, vertexProps: [...kept, ...vertexProps], faceProps: s.data.faceProps },
      {
        format: opts.plyAscii ? 'ascii' : 'binary',
        ...(colors ? { colors } : {}),
        comment: opts.comment ?? `orthodrome: ${cols.map((c) => `${c.name} [${c.unit}]`).join(', ')}; colours from ${colorCol?.name ?? 'none'}`,
      },
    );
    await writeFileAtomic(path, bytes);
  } else if (ext === '.csv') {
    const x = new Float64Array(n), y = new Float64Array(n), z = new Float64Array(n), id = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      id[i] = i;
      x[i] = P[3 * i]!;
      y[i] = P[3 * i + 1]!;
      z[i] = P[3 * i + 2]!;
    }
    const text = writeVertexCsv([
      { name: 'vertex', values: id },
      { name: 'x', values: x },
      { name: 'y', values: y },
      { name: 'z', values: z },
      ...cols.map((c) => ({ name: c.name, values: c.values })),
    ]);
    await writeFileAtomic(path, text);
  } else {
    const obj: Record<string, unknown> = { vertices: n, units: Object.fromEntries(cols.map((c) => [c.name, c.unit])) };
    for (const c of cols) obj[c.name] = c.values;
    await writeFileAtomic(path, toJson(obj, 0) + '\n');
  }
}
