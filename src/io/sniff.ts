/**
 * Which mesh format a byte buffer holds, and parsing by that guess. Bytes
 * decide; the file name only breaks ties. Browser-safe (gzip is unpacked by
 * the Node adapter in read-mesh.ts, or by the caller).
 */
import { inputError } from '../errors.js';
import type { MeshData } from './mesh-data.js';
import { parseObj } from './obj.js';
import { parsePly } from './ply.js';
import { isBinaryStl, looksLikeAsciiStl, parseStl } from './stl.js';
import { hasUtf16Bom, stripBom } from './decimal.js';

/** Options of {@link parseMesh} that apply to some formats only. */
export interface ParseOptions {
  /** STL: corners closer than this (mesh units) are welded into one vertex (default 1e-9 × the bounding-box diagonal). */
  weldTolerance?: number;
}

/** What {@link sniffMesh} found. */
export interface Sniffed {
  /** `obj`, `ply`, `stl`, or `unknown` (gzip hides the format until unpacked). */
  format: 'obj' | 'ply' | 'stl' | 'unknown';
  /** True when the bytes start with the gzip magic 1f 8b. */
  gzip: boolean;
}

/** True when the bytes start with the gzip magic number 1f 8b (RFC 1952). */
export function isGzip(b: Uint8Array): boolean {
  return b.length >= 2 && b[0] === 0x1f && b[1] === 0x8b;
}

/** The name without a trailing `.gz`, lower case. */
function baseName(name: string): string {
  return name.toLowerCase().replace(/\.gz$/, '');
}

/**
 * Guesses the format (after a UTF-8 byte-order mark, if any): PLY files start with `ply` and a newline;
 * bytes of exactly the size a binary STL header declares (84 + 50·n; a text file would need over 500 million
 * facets for that), or beginning with the STL keyword `solid`, are STL; text whose first statement is an OBJ
 * keyword (or any text named `.obj`) is OBJ. The name decides only when the bytes do not (`.stl`: a truncated
 * binary STL is then reported as such).
 */
export function sniffMesh(b: Uint8Array, name = ''): Sniffed {
  const gzip = isGzip(b);
  const base = baseName(name);
  if (gzip) return { format: base.endsWith('.obj') ? 'obj' : base.endsWith('.ply') ? 'ply' : base.endsWith('.stl') ? 'stl' : 'unknown', gzip };
  const raw = b;
  b = stripBom(b);
  if (b.length >= 4 && b[0] === 0x70 && b[1] === 0x6c && b[2] === 0x79 && (b[3] === 10 || b[3] === 13)) {
    return { format: 'ply', gzip };
  }
  if (isBinaryStl(raw)) return { format: 'stl', gzip };
  if (looksLikeAsciiStl(b) || startsWithSolid(b)) return { format: 'stl', gzip };
  // First non-blank bytes of the text.
  let p = 0;
  while (p < b.length && p < 4096 && (b[p] === 32 || b[p] === 9 || b[p] === 10 || b[p] === 13)) p++;
  let q = p;
  while (q < b.length && q - p < 16 && b[q]! > 32 && b[q]! < 127) q++;
  let word = '';
  for (let i = p; i < q; i++) word += String.fromCharCode(b[i]!);
  const objWords = ['#', 'v', 'vt', 'vn', 'vp', 'f', 'o', 'g', 's', 'l', 'p', 'mtllib', 'usemtl'];
  if (objWords.includes(word) || word.startsWith('#') || base.endsWith('.obj')) return { format: 'obj', gzip };
  if (base.endsWith('.ply')) return { format: 'ply', gzip };
  if (base.endsWith('.stl')) return { format: 'stl', gzip };
  return { format: 'unknown', gzip };
}

/** True when the first five bytes are `solid` (any case): an STL, ASCII or a binary one whose header says so. */
function startsWithSolid(b: Uint8Array): boolean {
  if (b.length < 5) return false;
  for (let i = 0; i < 5; i++) if ((b[i]! | 0x20) !== 'solid'.charCodeAt(i)) return false;
  return true;
}

/**
 * Parses OBJ, PLY or STL bytes (format from {@link sniffMesh}; STL corners
 * are welded, see `opts`). Throws `INPUT` naming `name` for gzip data (unpack
 * it first) and unknown formats.
 */
export function parseMesh(bytes: Uint8Array, name: string, opts: ParseOptions = {}): MeshData {
  const s = sniffMesh(bytes, name);
  if (s.gzip) throw inputError('gzip-compressed data: decompress before parsing', name);
  if (s.format === 'stl') return parseStl(bytes, name, opts.weldTolerance !== undefined ? { weldTolerance: opts.weldTolerance } : {});
  if (hasUtf16Bom(bytes)) throw inputError('UTF-16 text is not supported (save the file as UTF-8 or ASCII)', name);
  if (s.format === 'ply') return parsePly(bytes, name);
  if (s.format === 'obj') return parseObj(bytes, name);
  throw inputError('unrecognised mesh format (expected OBJ, PLY or STL)', name);
}
