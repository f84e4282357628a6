/**
 * Wavefront OBJ reader: bytes in, {@link MeshData} out, float64 end to end.
 *
 * Read: `v x y z [w]`, `v x y z r g b` (colours kept when every vertex has
 * them), `f` with `i`, `i/t`, `i//n`, `i/t/n` corners, negative (relative)
 * indices, polygons, `#` comments and `\` line continuations. Every other
 * statement (vt, vn, vp, o, g, s, usemtl, mtllib, l, p, ...) is skipped.
 *
 * The scan works on the bytes directly: no string per line, numbers are
 * read by {@link scanReal} (decimal.ts, the one number scanner), growable
 * typed buffers.
 * Vertex indices are those of the file (1-based there, 0-based here). A
 * leading UTF-8 byte-order mark is ignored; LF, CRLF and CR-only line ends
 * are all read.
 */
import { inputError } from '../errors.js';
import type { MeshData, PropertyColumn } from './mesh-data.js';
import { ScanCursor, scanReal, latin1, stripBom } from './decimal.js';

/**
 * A larger copy of a typed buffer keeping its first `used` entries. The new
 * size extrapolates the fill rate to the whole file (`used · n / p`, as far as
 * byte `p` of `n`), bounded to 1.5×..4× the old size, so a big file grows a
 * few times instead of doubling from small.
 */
function grow<T extends Float64Array | Uint32Array>(a: T, used: number, p: number, n: number): T {
  const guess = p > 0 ? Math.ceil((used * n) / p * 1.05) + 64 : 0;
  const size = Math.max(Math.ceil(1.5 * a.length) + 64, Math.min(4 * a.length, guess));
  const g = new (a.constructor as new (n: number) => T)(size);
  g.set(a.subarray(0, used));
  return g;
}

/** The first `k` entries; shared with `a` when the spare room is small (< 1/8). */
function trim<T extends Float64Array | Uint32Array>(a: T, k: number): T {
  return (k >= a.length - (a.length >> 3) ? a.subarray(0, k) : a.slice(0, k)) as T;
}

/** A short, printable excerpt of the token at `p` for messages. */
function tokenAt(b: Uint8Array, p: number): string {
  let q = p;
  while (q < b.length && q - p < 24 && b[q] !== 10 && b[q] !== 13 && b[q] !== 32 && b[q] !== 9) q++;
  const s = latin1(b, p, q).replace(/[^\x20-\x7e]/g, '?');
  return q > p ? `'${s}'` : 'end of line';
}

/**
 * Scan state of one file. The readers below each take a run of statements of
 * one kind and are ordinary functions, so the engine optimizes them as whole
 * calls; a single function holding the whole loop would be optimized
 * mid-loop and thrown back at its never-run epilogue on every file.
 */
class ObjScan {
  pos: Float64Array;
  idx: Uint32Array;
  off: Uint32Array;
  rgb: Float64Array | null = null;
  nv = 0;
  ni = 0;
  nf = 0;
  colored = 0;
  /** Where the last number scanned ended (decimal.ts). */
  readonly cursor = new ScanCursor();
  /** Largest positive 0-based index seen, and the byte offset of its token. */
  maxIdx = -1;
  maxAt = 0;
  /**
   * Starting sizes from the file length n: a triangle mesh with V vertices
   * takes about 35 bytes per `v` line and 22 per `f` line (F ≈ 2V), so
   * n ≈ 80·V: about n/26 coordinates, n/13 corners and n/40 faces. Start a
   * little above that (n/24, n/12, n/36), so a typical file never grows and
   * the spare room of an atypical one is under n bytes in all.
   */
  constructor(
    readonly b: Uint8Array,
    readonly name: string,
  ) {
    this.pos = new Float64Array(Math.max(3072, Math.floor(b.length / 24)));
    this.idx = new Uint32Array(Math.max(4096, Math.floor(b.length / 12)));
    this.off = new Uint32Array(Math.max(1024, Math.floor(b.length / 36)));
  }
}

/**
 * Parses an OBJ file. Throws an `INPUT` {@link OrthodromeError} located at
 * `name:line` for malformed numbers, non-finite coordinates, index 0,
 * out-of-range or too-far-back relative indices, faces with fewer than three
 * corners, and files without vertices or faces. Degenerate faces (a repeated
 * vertex) are kept; the topology builder drops and counts them.
 */
export function parseObj(bytes: Uint8Array, name: string): MeshData {
  bytes = stripBom(bytes);
  // Classic Mac OS line ends (CR only): read as LF, so line numbers hold too.
  if (bytes.indexOf(10) < 0 && bytes.indexOf(13) >= 0) bytes = bytes.map((c) => (c === 13 ? 10 : c));
  const s = new ObjScan(bytes, name);
  scanStatements(s);
  const { nv, nf, ni, rgb } = s;
  if (nv === 0) throw inputError('no vertices', name);
  if (nf === 0) throw inputError('no faces', name);
  if (s.maxIdx >= nv) fail(bytes, s.maxAt, name, `vertex index ${s.maxIdx + 1} out of range (the file has ${nv} vertices)`);
  const vertexProps: PropertyColumn[] = [];
  if (rgb !== null && s.colored === nv) {
    const names = ['red', 'green', 'blue'];
    for (let ch = 0; ch < 3; ch++) {
      const values = new Float64Array(nv);
      for (let v = 0; v < nv; v++) values[v] = rgb[3 * v + ch]!;
      vertexProps.push({ name: names[ch]!, type: 'float64' as const, values });
    }
  }
  return {
    positions: trim(s.pos, 3 * nv),
    faceOffsets: trim(s.off, nf + 1),
    faceIndices: trim(s.idx, ni),
    vertexProps,
    faceProps: [],
    name,
  };
}

/** Walks the statements: `v` and `f` are read, everything else skipped. */
function scanStatements(s: ObjScan): void {
  const b = s.b, n = b.length;
  let p = 0;
  while (p < n) {
    const c = b[p]!;
    if (c === 32 || c === 9 || c === 13 || c === 10 || c === 11 || c === 12) { p++; continue; }
    const c1 = b[p + 1];
    // A keyword ends at a blank, a newline or the end of the file.
    const kwEnd = c1 === 32 || c1 === 9 || c1 === 10 || c1 === 13 || c1 === undefined;
    if (c === 118 && kwEnd) p = vertexRun(s, p + 1);
    else if (c === 102 && kwEnd) p = faceRun(s, p + 1);
    else { p = skipLine(b, p); continue; }
    if (p < n && b[p] !== 10) p = skipLine(b, p);
    else p++;
  }
}

/**
 * Reads `v` statements (`x y z [w]` or `x y z r g b`) from `p` (just after
 * the keyword) for as long as the next line starts with `v `; returns the
 * offset where the last statement ends.
 */
function vertexRun(s: ObjScan, p: number): number {
  const b = s.b, n = b.length, cur = s.cursor;
  let nv = s.nv, pos = s.pos;
  for (;;) {
    if (3 * nv + 3 > pos.length) pos = s.pos = grow(pos, 3 * nv, p, n);
    let k = 0, r = 0, g = 0, bl = 0;
    for (;;) {
      if (b[p] === 32) p++;
      if (b[p]! < 33 || b[p] === 92) p = skipBlank(b, p);
      if (p >= n || b[p] === 10 || b[p] === 35 || b[p] === 13) break;
      const v = scanReal(b, p, cur);
      if (cur.bad) fail(b, p, s.name, `malformed number ${tokenAt(b, p)}`);
      if (!Number.isFinite(v)) fail(b, p, s.name, `non-finite coordinate ${tokenAt(b, p)}`);
      p = cur.pos;
      if (k < 3) pos[3 * nv + k] = v;
      else if (k === 3) r = v;
      else if (k === 4) g = v;
      else if (k === 5) bl = v;
      k++;
    }
    if (k !== 3 && k !== 4 && k !== 6) fail(b, p - 1, s.name, `vertex has ${k} numbers (expected 3, 4 or 6)`);
    if (k === 6) {
      let rgb = s.rgb;
      if (rgb === null || rgb.length < pos.length) {
        const t = new Float64Array(pos.length);
        if (rgb !== null) t.set(rgb);
        s.rgb = rgb = t;
      }
      rgb[3 * nv] = r; rgb[3 * nv + 1] = g; rgb[3 * nv + 2] = bl;
      s.colored++;
    }
    nv++;
    const q = b[p] === 13 ? p + 1 : p;
    if (b[q] === 10 && b[q + 1] === 118 && (b[q + 2] === 32 || b[q + 2] === 9)) p = q + 2;
    else break;
  }
  s.nv = nv;
  return p;
}

/**
 * Reads `f` statements from `p` (just after the keyword) for as long as the
 * next line starts with `f `, keeping the buffers in locals meanwhile;
 * returns the offset where the last statement ends.
 */
function faceRun(s: ObjScan, p: number): number {
  const b = s.b, n = b.length, nv = s.nv;
  let ni = s.ni, idx = s.idx, nf = s.nf, off = s.off, maxIdx = s.maxIdx, maxAt = s.maxAt;
  for (;;) {
    let k = 0;
    for (;;) {
      // c is always b[p]: one load per byte.
      let c = b[p]!;
      if (c === 32) c = b[++p]!;
      if (c < 33 || c === 92) { p = skipBlank(b, p); c = b[p]!; }
      if (p >= n || c === 10 || c === 35 || c === 13) break;
      const t0 = p;
      const neg = c === 45;
      if (neg) c = b[++p]!;
      // Digits as an integer; past 2^53 it is inexact but far out of range anyway.
      let v = 0;
      const d0 = p;
      while (c >= 48 && c <= 57) { v = v * 10 + (c - 48); c = b[++p]!; }
      if (p === d0) fail(b, t0, s.name, `malformed vertex index ${tokenAt(b, t0)}`);
      if (v > 4294967295) fail(b, t0, s.name, `vertex index ${tokenAt(b, t0)} out of range`);
      // Texture and normal references: `/t`, `//n`, `/t/n`; checked for form only.
      for (let part = 0; part < 2 && c === 47; part++) {
        c = b[++p]!;
        if (c === 45) c = b[++p]!;
        while (c >= 48 && c <= 57) c = b[++p]!;
      }
      if (p < n && !(c === 32 || c === 9 || c === 13 || c === 10 || c === 35 || c === 92 || c === 11 || c === 12)) {
        fail(b, t0, s.name, `malformed face corner ${tokenAt(b, t0)}`);
      }
      let i: number;
      if (v === 0) fail(b, t0, s.name, 'vertex index 0 (OBJ indices start at 1)');
      if (neg) {
        i = nv - v;
        if (i < 0) fail(b, t0, s.name, `relative vertex index -${v} reaches before the first vertex (${nv} so far)`);
      } else {
        i = v - 1;
        if (i > maxIdx) { maxIdx = i; maxAt = t0; }
      }
      if (ni >= idx.length) idx = grow(idx, ni, p, n);
      idx[ni++] = i;
      k++;
    }
    if (k < 3) fail(b, p - 1, s.name, `face has ${k} ${k === 1 ? 'vertex' : 'vertices'} (at least 3 needed)`);
    if (nf + 2 > off.length) off = grow(off, nf + 1, p, n);
    off[++nf] = ni;
    const q = b[p] === 13 ? p + 1 : p;
    if (b[q] === 10 && b[q + 1] === 102 && (b[q + 2] === 32 || b[q + 2] === 9)) p = q + 2;
    else break;
  }
  s.ni = ni; s.idx = idx; s.nf = nf; s.off = off; s.maxIdx = maxIdx; s.maxAt = maxAt;
  return p;
}

/**
 * Throws the `INPUT` error for byte offset `at`. Line numbers are counted only
 * here (1 + newlines before `at`), so the scan itself never tracks them.
 */
function fail(b: Uint8Array, at: number, name: string, msg: string): never {
  let line = 1;
  for (let q = b.indexOf(10); q >= 0 && q < at; q = b.indexOf(10, q + 1)) line++;
  throw inputError(msg, `${name}:${line}`);
}

/** Skips blanks and `\`-newline continuations inside a statement. */
function skipBlank(b: Uint8Array, p: number): number {
  for (;;) {
    const c = b[p];
    if (c === 32 || c === 9 || c === 11 || c === 12) p++;
    else if (c === 13 && b[p + 1] !== 10) p++;
    else if (c === 92 && (b[p + 1] === 10 || (b[p + 1] === 13 && b[p + 2] === 10))) p += b[p + 1] === 10 ? 2 : 3;
    else return p;
  }
}

/** Offset after the newline ending the statement at `p` (continuations followed). */
function skipLine(b: Uint8Array, p: number): number {
  for (;;) {
    const q = b.indexOf(10, p);
    if (q < 0) return b.length;
    let r = q - 1;
    if (r >= p && b[r] === 13) r--;
    if (!(r >= p && b[r] === 92)) return q + 1;
    p = q + 1;
  }
}
