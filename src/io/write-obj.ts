/**
 * Wavefront OBJ writers: a polygon mesh (`v` and `f` statements, 1-based
 * indices) and a polyline (`v` and one `l` statement). Coordinates are printed
 * as the shortest decimal that reads back to the same double, so a write and
 * a read give the same bits.
 */
import { usageError } from '../errors.js';

/** What {@link writeObj} needs from a mesh (a {@link MeshData} fits). */
export interface ObjMeshInput {
  positions: Float64Array;
  faceOffsets: Uint32Array;
  faceIndices: Uint32Array;
}

/** Options of {@link writeObj}. */
export interface WriteObjOptions {
  /** r, g, b per vertex (0..255), written as `v x y z r g b` with r/255 etc. */
  colors?: Uint8Array;
  /** A comment for the first line (no newlines). */
  comment?: string;
}

/** Joins text lines into bytes in chunks (no single huge string). */
class LineSink {
  private readonly enc = new TextEncoder();
  private readonly parts: Uint8Array[] = [];
  private lines: string[] = [];

  push(line: string): void {
    this.lines.push(line);
    if (this.lines.length >= 8192) this.flush();
  }

  private flush(): void {
    if (this.lines.length === 0) return;
    this.parts.push(this.enc.encode(this.lines.join('\n') + '\n'));
    this.lines = [];
  }

  bytes(): Uint8Array {
    this.flush();
    let size = 0;
    for (const q of this.parts) size += q.length;
    const out = new Uint8Array(size);
    let o = 0;
    for (const q of this.parts) { out.set(q, o); o += q.length; }
    return out;
  }
}

function finite(v: number): string {
  if (!Number.isFinite(v)) throw usageError(`cannot write the non-finite coordinate ${v} to OBJ`);
  return String(v);
}

/** Writes a polygon mesh as OBJ text bytes. Throws `USAGE` on non-finite coordinates. */
export function writeObj(mesh: ObjMeshInput, opts: WriteObjOptions = {}): Uint8Array {
  const P = mesh.positions, FO = mesh.faceOffsets, FI = mesh.faceIndices;
  const nv = P.length / 3, nf = FO.length - 1;
  const col = opts.colors;
  if (col && col.length !== 3 * nv) throw usageError(`colors has ${col.length} values, expected ${3 * nv}`);
  const out = new LineSink();
  if (opts.comment) out.push(`# ${opts.comment.replace(/[\r\n]+/g, ' ')}`);
  for (let v = 0; v < nv; v++) {
    let s = `v ${finite(P[3 * v]!)} ${finite(P[3 * v + 1]!)} ${finite(P[3 * v + 2]!)}`;
    if (col) s += ` ${col[3 * v]! / 255} ${col[3 * v + 1]! / 255} ${col[3 * v + 2]! / 255}`;
    out.push(s);
  }
  for (let f = 0; f < nf; f++) {
    let s = 'f';
    for (let k = FO[f]!; k < FO[f + 1]!; k++) s += ' ' + (FI[k]! + 1);
    out.push(s);
  }
  return out.bytes();
}

/**
 * Writes a polyline (x, y, z per point) as OBJ: one `v` per point and one
 * `l 1 2 ... n` statement, optionally in a named object (`o name`).
 */
export function writeObjPolyline(points: Float64Array, name?: string): Uint8Array {
  const n = Math.floor(points.length / 3);
  if (n < 2) throw usageError(`a polyline needs at least 2 points, got ${n}`);
  const out = new LineSink();
  if (name) out.push(`o ${name.replace(/\s+/g, '_')}`);
  for (let i = 0; i < n; i++) out.push(`v ${finite(points[3 * i]!)} ${finite(points[3 * i + 1]!)} ${finite(points[3 * i + 2]!)}`);
  const idx: string[] = ['l'];
  for (let i = 1; i <= n; i++) idx.push(String(i));
  out.push(idx.join(' '));
  return out.bytes();
}
