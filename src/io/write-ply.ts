/**
 * PLY writer: a polygon mesh with any per-vertex and per-face scalar columns
 * (and optional 8-bit colours) to bytes, binary little-endian by default.
 * A {@link MeshData} can be passed as is; columns without a type are `double`.
 *
 * Positions are written as `double`, so coordinates survive bit for bit.
 * Each column is written in its declared {@link ScalarType}; integer columns
 * are rounded and clamped to their range (non-finite values become 0), float
 * columns are stored as given (`float` rounds to float32). ASCII output prints
 * the shortest decimal that reads back to the same double.
 */
import { usageError } from '../errors.js';
import type { ScalarType } from './mesh-data.js';

/** A column to write: like a `PropertyColumn`, but the type may be left out (then `float64`, PLY `double`). */
export interface PlyColumnInput {
  /** Property name (no spaces). */
  name: string;
  /** One value per vertex or face. */
  values: ArrayLike<number>;
  /** Storage type (default `float64`). */
  type?: ScalarType;
}

/** What {@link writePly} needs from a mesh (a {@link MeshData} fits). */
export interface PlyMeshInput {
  /** x, y, z per vertex. */
  positions: Float64Array;
  /** Face `f` is `faceIndices[faceOffsets[f] .. faceOffsets[f+1])`. */
  faceOffsets: Uint32Array;
  /** Concatenated 0-based vertex indices of all faces. */
  faceIndices: Uint32Array;
  /** Extra per-vertex scalar columns. */
  vertexProps?: PlyColumnInput[];
  /** Extra per-face scalar columns. */
  faceProps?: PlyColumnInput[];
}

/** A column with its type settled. */
interface Column {
  name: string;
  values: ArrayLike<number>;
  type: ScalarType;
}

/** Options of {@link writePly}. */
export interface WritePlyOptions {
  /** `binary` (default) or `ascii`. */
  format?: 'binary' | 'ascii';
  /** Byte order of binary output (default true: little-endian). */
  littleEndian?: boolean;
  /** r, g, b per vertex (0..255), written as uchar `red`, `green`, `blue`. */
  colors?: Uint8Array;
  /** One comment line for the header (no newlines). */
  comment?: string;
}

const PLY_NAME: Record<ScalarType, string> = {
  int8: 'char', uint8: 'uchar', int16: 'short', uint16: 'ushort',
  int32: 'int', uint32: 'uint', float32: 'float', float64: 'double',
};
const SIZE: Record<ScalarType, number> = {
  int8: 1, uint8: 1, int16: 2, uint16: 2, int32: 4, uint32: 4, float32: 4, float64: 8,
};
const RANGE: Record<ScalarType, [number, number]> = {
  int8: [-128, 127], uint8: [0, 255], int16: [-32768, 32767], uint16: [0, 65535],
  int32: [-2147483648, 2147483647], uint32: [0, 4294967295], float32: [-Infinity, Infinity], float64: [-Infinity, Infinity],
};

/** A value as stored in a column of type `t` (integers rounded and clamped). */
function storable(v: number, t: ScalarType): number {
  if (t === 'float64') return v;
  if (t === 'float32') return Math.fround(v);
  if (!Number.isFinite(v)) return 0;
  const [lo, hi] = RANGE[t];
  return Math.min(hi, Math.max(lo, Math.round(v)));
}

/** Text of a value: shortest round-trip decimal; `nan`, `inf`, `-inf` otherwise. */
function text(v: number): string {
  if (Number.isFinite(v)) return String(v);
  return Number.isNaN(v) ? 'nan' : v > 0 ? 'inf' : '-inf';
}

function put(dv: DataView, o: number, v: number, t: ScalarType, le: boolean): number {
  switch (t) {
    case 'int8': dv.setInt8(o, v); break;
    case 'uint8': dv.setUint8(o, v); break;
    case 'int16': dv.setInt16(o, v, le); break;
    case 'uint16': dv.setUint16(o, v, le); break;
    case 'int32': dv.setInt32(o, v, le); break;
    case 'uint32': dv.setUint32(o, v, le); break;
    case 'float32': dv.setFloat32(o, v, le); break;
    default: dv.setFloat64(o, v, le);
  }
  return o + SIZE[t];
}

/**
 * Writes `mesh` as a PLY file. Throws `USAGE` when a column length does not
 * match the vertex or face count, or when two properties share a name.
 */
export function writePly(mesh: PlyMeshInput, opts: WritePlyOptions = {}): Uint8Array {
  const nv = mesh.positions.length / 3;
  const nf = mesh.faceOffsets.length - 1;
  const le = opts.littleEndian !== false;
  const ascii = opts.format === 'ascii';
  const vcols: Column[] = (mesh.vertexProps ?? []).map((c) => ({ name: c.name, values: c.values, type: c.type ?? 'float64' }));
  if (opts.colors) {
    if (opts.colors.length !== 3 * nv) throw usageError(`colors has ${opts.colors.length} values, expected ${3 * nv}`);
    ['red', 'green', 'blue'].forEach((name, ch) => {
      const values = new Float64Array(nv);
      for (let v = 0; v < nv; v++) values[v] = opts.colors![3 * v + ch]!;
      vcols.push({ name, type: 'uint8', values });
    });
  }
  const fcols: Column[] = (mesh.faceProps ?? []).map((c) => ({ name: c.name, values: c.values, type: c.type ?? 'float64' }));
  const seen = new Set(['x', 'y', 'z']);
  for (const c of vcols) {
    if (c.values.length !== nv) throw usageError(`vertex property '${c.name}' has ${c.values.length} values, expected ${nv}`);
    if (seen.has(c.name) || !/^\S+$/.test(c.name)) throw usageError(`vertex property name '${c.name}' is repeated or has spaces`);
    seen.add(c.name);
  }
  seen.clear();
  seen.add('vertex_indices');
  for (const c of fcols) {
    if (c.values.length !== nf) throw usageError(`face property '${c.name}' has ${c.values.length} values, expected ${nf}`);
    if (seen.has(c.name) || !/^\S+$/.test(c.name)) throw usageError(`face property name '${c.name}' is repeated or has spaces`);
    seen.add(c.name);
  }
  let maxDeg = 0;
  for (let f = 0; f < nf; f++) maxDeg = Math.max(maxDeg, mesh.faceOffsets[f + 1]! - mesh.faceOffsets[f]!);
  const countType: ScalarType = maxDeg <= 255 ? 'uint8' : 'uint32';

  const head = ['ply', `format ${ascii ? 'ascii' : le ? 'binary_little_endian' : 'binary_big_endian'} 1.0`];
  if (opts.comment) head.push(`comment ${opts.comment.replace(/[\r\n]+/g, ' ')}`);
  head.push(`element vertex ${nv}`, 'property double x', 'property double y', 'property double z');
  for (const c of vcols) head.push(`property ${PLY_NAME[c.type]} ${c.name}`);
  head.push(`element face ${nf}`, `property list ${PLY_NAME[countType]} uint vertex_indices`);
  for (const c of fcols) head.push(`property ${PLY_NAME[c.type]} ${c.name}`);
  head.push('end_header', '');
  const header = new TextEncoder().encode(head.join('\n'));
  const P = mesh.positions, FO = mesh.faceOffsets, FI = mesh.faceIndices;

  if (ascii) return asciiBody(header, mesh, vcols, fcols);

  let vstride = 24, fextra = SIZE[countType];
  for (const c of vcols) vstride += SIZE[c.type];
  for (const c of fcols) fextra += SIZE[c.type];
  const size = header.length + nv * vstride + nf * fextra + 4 * (FO[nf]! - FO[0]!);
  const out = new Uint8Array(size);
  out.set(header);
  const dv = new DataView(out.buffer);
  let o = header.length;
  for (let v = 0; v < nv; v++) {
    dv.setFloat64(o, P[3 * v]!, le);
    dv.setFloat64(o + 8, P[3 * v + 1]!, le);
    dv.setFloat64(o + 16, P[3 * v + 2]!, le);
    o += 24;
    for (const c of vcols) o = put(dv, o, storable(c.values[v]!, c.type), c.type, le);
  }
  for (let f = 0; f < nf; f++) {
    const s = FO[f]!, e = FO[f + 1]!;
    o = put(dv, o, e - s, countType, le);
    for (let k = s; k < e; k++, o += 4) dv.setUint32(o, FI[k]!, le);
    for (const c of fcols) o = put(dv, o, storable(c.values[f]!, c.type), c.type, le);
  }
  return out;
}

/** ASCII body, built in chunks of lines so no single huge string is needed. */
function asciiBody(header: Uint8Array, mesh: PlyMeshInput, vcols: Column[], fcols: Column[]): Uint8Array {
  const enc = new TextEncoder();
  const parts: Uint8Array[] = [header];
  let lines: string[] = [];
  const flush = (force: boolean): void => {
    if (lines.length >= 8192 || (force && lines.length > 0)) {
      parts.push(enc.encode(lines.join('\n') + '\n'));
      lines = [];
    }
  };
  const P = mesh.positions, FO = mesh.faceOffsets, FI = mesh.faceIndices;
  const nv = P.length / 3, nf = FO.length - 1;
  for (let v = 0; v < nv; v++) {
    let s = `${text(P[3 * v]!)} ${text(P[3 * v + 1]!)} ${text(P[3 * v + 2]!)}`;
    for (const c of vcols) s += ' ' + text(storable(c.values[v]!, c.type));
    lines.push(s);
    flush(false);
  }
  for (let f = 0; f < nf; f++) {
    let s = String(FO[f + 1]! - FO[f]!);
    for (let k = FO[f]!; k < FO[f + 1]!; k++) s += ' ' + FI[k]!;
    for (const c of fcols) s += ' ' + text(storable(c.values[f]!, c.type));
    lines.push(s);
    flush(false);
  }
  flush(true);
  let size = 0;
  for (const q of parts) size += q.length;
  const out = new Uint8Array(size);
  let o = 0;
  for (const q of parts) { out.set(q, o); o += q.length; }
  return out;
}
