/**
 * STL reader (binary and ASCII), for manufactured parts.
 *
 * An STL file is a list of facets, each a stored normal and three corners;
 * corners are not shared between facets. Binary layout (little-endian):
 *
 * ```
 *   80-byte header (free text; may itself begin with "solid")
 *   uint32 facet count n
 *   n × 50 bytes: float32 normal[3], float32 corner[3][3], uint16 attribute
 * ```
 *
 * so a binary file has exactly 84 + 50·n bytes. ASCII:
 *
 * ```
 *   solid NAME
 *     facet normal nx ny nz
 *       outer loop
 *         vertex x y z      (three times)
 *       endloop
 *     endfacet
 *   endsolid NAME
 * ```
 *
 * (keywords in any case, any whitespace between tokens, several solids one
 * after the other). The encoding is decided by the content, never the name:
 * the size rule first (a binary header may begin with "solid"), then the
 * keyword `solid` followed by text. Truncated or padded binary files,
 * malformed ASCII, missing `endsolid`, non-finite corner coordinates and
 * files without facets are `INPUT` errors naming the file and the facet or
 * line.
 *
 * Corners are welded into shared vertices (io/weld.ts: tolerance scaled to
 * the part by default). The stored normals are kept only as a check: a facet
 * whose stored normal points against the normal of its winding (corners
 * counter-clockwise seen from outside, the right-hand rule) is counted. The
 * result's `stl` field reports both. (Format: the common description of
 * the STL format, from memory.)
 */
import { inputError, usageError } from '../errors.js';
import type { MeshData, StlReport } from './mesh-data.js';
import { latin1, ScanCursor, scanReal, stripBom } from './decimal.js';
import { weldPoints } from './weld.js';

/** Options of {@link parseStl}. */
export interface StlOptions {
  /**
   * Corners closer than this (mesh units) become one vertex. Default:
   * 1e-9 × the bounding-box diagonal (`WELD_RELATIVE_TOLERANCE`); 0 welds
   * exact copies only.
   */
  weldTolerance?: number;
}

const HEADER = 80;
const FACET_BYTES = 50;

/** True when the bytes have the size of a binary STL with the facet count stored at byte 80 (84 + 50·n). */
export function isBinaryStl(b: Uint8Array): boolean {
  if (b.length < HEADER + 4) return false;
  const n = new DataView(b.buffer, b.byteOffset, b.byteLength).getUint32(HEADER, true);
  return b.length === HEADER + 4 + FACET_BYTES * n;
}

/**
 * True when the bytes begin (after blanks) with the keyword `solid` and the
 * first 512 bytes hold no control byte other than blanks (UTF-8 text, such
 * as a solid name with accents, passes): an ASCII STL. A binary file whose
 * header says "solid" has control bytes in its facet count or facets (the
 * high byte of any count below 16.7 million is 0; float32 data has zero
 * bytes), and its size is checked first anyway.
 */
export function looksLikeAsciiStl(b: Uint8Array): boolean {
  let p = 0;
  while (p < b.length && p < 4096 && isBlank(b[p]!)) p++;
  if (!matchesWord(b, p, 'solid')) return false;
  const end = Math.min(b.length, p + 512);
  for (let q = p; q < end; q++) {
    const c = b[q]!;
    if ((c < 32 && !isBlank(c)) || c === 127) return false;
  }
  return true;
}

/**
 * Parses STL bytes (binary or ASCII, by content) into {@link MeshData} with
 * welded vertices and an {@link StlReport} in its `stl` field. Bad input is
 * an `INPUT` error naming `name` and the facet or line; a tolerance that is
 * not a finite number ≥ 0 is a `USAGE` error.
 */
export function parseStl(bytes: Uint8Array, name: string, opts: StlOptions = {}): MeshData {
  const tol = opts.weldTolerance;
  if (tol !== undefined && !(Number.isFinite(tol) && tol >= 0)) {
    throw usageError(`weld tolerance must be a finite number ≥ 0 in mesh units, got ${tol}`);
  }
  const text = stripBom(bytes); // a UTF-8 byte-order mark before 'solid' is ignored
  const binary = isBinaryStl(bytes) || !looksLikeAsciiStl(text);
  const soup = binary ? readBinary(bytes, name) : readAscii(text, name);
  const nf = soup.corners.length / 9;
  if (nf === 0) throw inputError('no facets', name);
  const w = weldPoints(soup.corners, tol);
  const faceOffsets = new Uint32Array(nf + 1);
  for (let f = 0; f <= nf; f++) faceOffsets[f] = 3 * f;
  const stl: StlReport = {
    encoding: binary ? 'binary' : 'ascii',
    facets: nf,
    weldTolerance: w.tolerance,
    mergedVertices: w.merged,
    nearPairRadius: w.nearRadius,
    nearPairs: w.nearPairs,
    firstNearPair: w.firstNearPair,
    ...checkNormals(soup.corners, soup.normals),
  };
  return { positions: w.positions, faceOffsets, faceIndices: w.index, vertexProps: [], faceProps: [], name, stl };
}

/** Facet corners (9 per facet) and stored normals (3 per facet). */
interface Soup {
  corners: Float64Array;
  normals: Float64Array;
}

/** Binary STL: the size must be exactly 84 + 50·n for the n in the header. */
function readBinary(b: Uint8Array, name: string): Soup {
  if (b.length === 0) throw inputError('empty file', name);
  if (b.length < HEADER + 4) {
    throw inputError(`${b.length} bytes: too short for a binary STL (80-byte header and a facet count) and not an ASCII STL (no 'solid' keyword)`, name);
  }
  const dv = new DataView(b.buffer, b.byteOffset, b.byteLength);
  const n = dv.getUint32(HEADER, true);
  const expected = HEADER + 4 + FACET_BYTES * n;
  if (b.length < expected) {
    const k = Math.floor((b.length - HEADER - 4) / FACET_BYTES);
    throw inputError(
      `binary STL truncated: the header declares ${n} facets (${expected} bytes) but the file has ${b.length} bytes; it ends inside facet ${k}`,
      `${name}: facet ${k}`,
    );
  }
  if (b.length > expected) {
    throw inputError(`binary STL has ${b.length - expected} bytes after the ${n} facets its header declares (expected ${expected} bytes in all)`, name);
  }
  const corners = new Float64Array(9 * n);
  const normals = new Float64Array(3 * n);
  for (let f = 0, o = HEADER + 4; f < n; f++, o += FACET_BYTES) {
    for (let k = 0; k < 3; k++) normals[3 * f + k] = dv.getFloat32(o + 4 * k, true);
    for (let k = 0; k < 9; k++) {
      const x = dv.getFloat32(o + 12 + 4 * k, true);
      if (!Number.isFinite(x)) throw inputError(`non-finite vertex coordinate ${x}`, `${name}: facet ${f}`);
      corners[9 * f + k] = x;
    }
  }
  return { corners, normals };
}

function isBlank(c: number): boolean {
  return c === 32 || c === 9 || c === 10 || c === 13 || c === 11 || c === 12;
}

/** True when `word` (lower case) stands at p, in any case, followed by a blank or the end. */
function matchesWord(b: Uint8Array, p: number, word: string): boolean {
  if (p + word.length > b.length) return false;
  for (let i = 0; i < word.length; i++) if ((b[p + i]! | 0x20) !== word.charCodeAt(i)) return false;
  return p + word.length === b.length || isBlank(b[p + word.length]!);
}

/** Token-by-token reader of ASCII STL, with the line for messages. */
class AsciiReader {
  p = 0;
  line = 1;
  facet = 0;
  readonly cursor = new ScanCursor();
  constructor(
    readonly b: Uint8Array,
    readonly name: string,
  ) {}

  fail(msg: string): never {
    throw inputError(`${msg} (facet ${this.facet})`, `${this.name}:${this.line}`);
  }

  /** Skips blanks, counting lines; true when bytes remain. */
  skipBlanks(): boolean {
    const b = this.b;
    let p = this.p;
    while (p < b.length && isBlank(b[p]!)) if (b[p++] === 10) this.line++;
    this.p = p;
    return p < b.length;
  }

  /** The token at the current position (after blanks), quoted, for messages. */
  found(): string {
    if (!this.skipBlanks()) return 'the end of the file';
    let q = this.p;
    while (q < this.b.length && q - this.p < 24 && !isBlank(this.b[q]!)) q++;
    return `'${latin1(this.b, this.p, q).replace(/[^\x20-\x7e]/g, '?')}'`;
  }

  /** Consumes `word` (any case) if it is the next token. */
  keyword(word: string): boolean {
    if (!this.skipBlanks() || !matchesWord(this.b, this.p, word)) return false;
    this.p += word.length;
    return true;
  }

  expect(word: string): void {
    if (!this.keyword(word)) this.fail(`expected '${word}', found ${this.found()}`);
  }

  /** The next number; `finite` demands a finite value. */
  number(what: string, finite: boolean): number {
    if (!this.skipBlanks()) this.fail(`file ends inside a facet (expected ${what})`);
    const v = scanReal(this.b, this.p, this.cursor);
    if (this.cursor.bad) this.fail(`malformed ${what} ${this.found()}`);
    if (finite && !Number.isFinite(v)) this.fail(`non-finite ${what} ${v}`);
    this.p = this.cursor.pos;
    return v;
  }

  /** Skips the rest of a `solid` / `endsolid` line (the name), stopping early at a keyword. */
  skipName(): void {
    const b = this.b;
    for (;;) {
      while (this.p < b.length && (b[this.p] === 32 || b[this.p] === 9)) this.p++;
      if (this.p >= b.length || b[this.p] === 10 || b[this.p] === 13) return;
      if (matchesWord(b, this.p, 'facet') || matchesWord(b, this.p, 'endsolid')) return;
      while (this.p < b.length && !isBlank(b[this.p]!)) this.p++;
    }
  }
}

/** ASCII STL: one or more solids of facets. */
function readAscii(b: Uint8Array, name: string): Soup {
  const r = new AsciiReader(b, name);
  let corners = new Float64Array(9 * 1024);
  let normals = new Float64Array(3 * 1024);
  let nf = 0;
  r.expect('solid');
  r.skipName();
  for (;;) {
    if (!r.skipBlanks()) r.fail(nf === 0 ? "file ends before any facet and without 'endsolid'" : "file ends without 'endsolid' (truncated?)");
    if (r.keyword('endsolid')) {
      r.skipName();
      if (!r.skipBlanks()) break;
      r.expect('solid'); // another solid follows
      r.skipName();
      continue;
    }
    if (!r.keyword('facet')) r.fail(`expected 'facet' or 'endsolid', found ${r.found()}`);
    r.facet = nf;
    if (9 * nf + 9 > corners.length) {
      const c = new Float64Array(2 * corners.length);
      c.set(corners);
      corners = c;
      const m = new Float64Array(2 * normals.length);
      m.set(normals);
      normals = m;
    }
    r.expect('normal');
    for (let k = 0; k < 3; k++) normals[3 * nf + k] = r.number('normal component', false);
    r.expect('outer');
    r.expect('loop');
    for (let k = 0; k < 3; k++) {
      if (!r.keyword('vertex')) {
        if (r.keyword('endloop')) r.fail(`facet has ${k} ${k === 1 ? 'vertex' : 'vertices'} (STL facets are triangles)`);
        r.fail(`expected 'vertex', found ${r.found()}`);
      }
      for (let d = 0; d < 3; d++) corners[9 * nf + 3 * k + d] = r.number('vertex coordinate', true);
    }
    if (r.keyword('vertex')) r.fail('facet has more than 3 vertices (STL facets are triangles)');
    r.expect('endloop');
    r.expect('endfacet');
    nf++;
  }
  return { corners: corners.slice(0, 9 * nf), normals: normals.slice(0, 3 * nf) };
}

/**
 * Compares each stored normal with the normal of the facet's winding,
 * (b − a) × (c − a): against it (negative dot product) is a disagreement; a
 * zero or non-finite stored normal, a facet without area, or a normal in the
 * facet's plane is not checked.
 */
function checkNormals(corners: Float64Array, normals: Float64Array): Pick<StlReport, 'normalsDisagreeing' | 'normalsUnchecked' | 'firstNormalDisagreeing'> {
  let disagreeing = 0, unchecked = 0;
  let first: number | null = null;
  const nf = normals.length / 3;
  for (let f = 0; f < nf; f++) {
    const o = 9 * f;
    const ux = corners[o + 3]! - corners[o]!, uy = corners[o + 4]! - corners[o + 1]!, uz = corners[o + 5]! - corners[o + 2]!;
    const vx = corners[o + 6]! - corners[o]!, vy = corners[o + 7]! - corners[o + 1]!, vz = corners[o + 8]! - corners[o + 2]!;
    const wx = uy * vz - uz * vy, wy = uz * vx - ux * vz, wz = ux * vy - uy * vx;
    const dot = wx * normals[3 * f]! + wy * normals[3 * f + 1]! + wz * normals[3 * f + 2]!;
    if (!Number.isFinite(dot) || dot === 0) unchecked++;
    else if (dot < 0) {
      disagreeing++;
      if (first === null) first = f;
    }
  }
  return { normalsDisagreeing: disagreeing, normalsUnchecked: unchecked, firstNormalDisagreeing: first };
}
