/**
 * PLY polygon file reader (ascii, binary_little_endian, binary_big_endian).
 *
 * Layout of a file, as in the published PLY description:
 *
 *   ply
 *   format binary_little_endian 1.0
 *   element vertex 8            <- count, then its properties in body order
 *   property float x            <- scalar: type name
 *   property list uchar int vertex_indices   <- list: count type, item type
 *   end_header
 *   <body: elements in header order, items in order, properties in order>
 *
 * `vertex` needs scalar x, y, z; `face` needs a list `vertex_indices` (or
 * `vertex_index`). Every other scalar property of vertex and face is kept as
 * a {@link PropertyColumn} with its declared type; list properties other than
 * the face's index list, and other elements, are skipped.
 *
 * Before anything scales with a header count, the counts are checked against
 * what the remaining bytes can hold (each item needs at least its scalars and
 * list counts), so a short file claiming billions of items fails at once.
 * The header itself is parsed in ply-header.ts, binary columns and face
 * lists are read by ply-binary.ts.
 */
import { inputError } from '../errors.js';
import type { MeshData, PropertyColumn } from './mesh-data.js';
import { latin1, ScanCursor, scanReal, stripBom } from './decimal.js';
import { parsePlyHeader, SCALAR_TYPES, TYPE_SIZES } from './ply-header.js';
import { rd, readColumn, readFaceLists, type FaceLists } from './ply-binary.js';
import type { PlyElement } from './ply-header.js';

/** True on little-endian hosts (typed arrays use host byte order). */
const HOST_LE = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;
const LO = [-128, 0, -32768, 0, -2147483648, 0, -Infinity, -Infinity];
const HI = [127, 255, 32767, 65535, 2147483647, 4294967295, Infinity, Infinity];

/** The token at `p` (up to 24 bytes, non-printable bytes as `?`), quoted. */
function excerpt(b: Uint8Array, p: number): string {
  let q = p;
  while (q < b.length && q - p < 24 && b[q] !== 32 && b[q] !== 9 && b[q] !== 10 && b[q] !== 13) q++;
  return `'${latin1(b, p, q).replace(/[^\x20-\x7e]/g, '?')}'`;
}

/** Where each scalar value of an element goes: `dst[i * stride + base]`, or nowhere. */
interface Sink { dst: Float64Array | null; stride: number; base: number }

/**
 * Reads one value at a time from the body: an ascii token or a binary scalar.
 * `elName` and `item` name the place for messages.
 */
class ItemReader {
  readonly dv: DataView;
  elName = '';
  item = 0;
  /** Where the last ascii number ended (decimal.ts). */
  readonly cursor = new ScanCursor();
  constructor(
    readonly b: Uint8Array,
    public p: number,
    readonly le: boolean,
    readonly ascii: boolean,
    readonly name: string,
  ) {
    this.dv = new DataView(b.buffer, b.byteOffset, b.byteLength);
  }

  fail(msg: string): never {
    throw inputError(msg, `${this.name}: ${this.elName} ${this.item}`);
  }

  /** The next value of type code `t`; integer types must hold an integer in range. */
  value(t: number): number {
    const b = this.b, n = b.length;
    let p = this.p;
    if (this.ascii) {
      while (p < n && (b[p] === 32 || b[p] === 9 || b[p] === 13 || b[p] === 10)) p++;
      if (p >= n) this.fail('file ends early');
      const v = scanReal(b, p, this.cursor);
      if (this.cursor.bad) this.fail(`malformed number ${excerpt(b, p)}`);
      this.p = this.cursor.pos;
      if (t < 6 && !(Number.isInteger(v) && v >= LO[t]! && v <= HI[t]!)) this.fail(`value ${v} does not fit its type ${SCALAR_TYPES[t]}`);
      return v;
    }
    const sz = TYPE_SIZES[t]!;
    if (p + sz > n) this.fail('file ends inside this item');
    this.p = p + sz;
    return rd(this.dv, p, t, this.le);
  }
}

/**
 * Reads every item of `el` value by value (ascii, or binary with lists):
 * scalars into their sinks, the face index list (property `fi`, -1 if none)
 * into `st`, other lists skipped.
 */
function readItems(r: ItemReader, el: PlyElement, sinks: Sink[], fi: number, nv: number, offsets: Uint32Array, st: FaceLists): void {
  const np = el.props.length, n = r.b.length;
  let ni = st.ni, idx = st.idx;
  for (let item = 0; item < el.count; item++) {
    r.item = item;
    for (let j = 0; j < np; j++) {
      const q = el.props[j]!, s = sinks[j]!;
      if (q.countType < 0) {
        const v = r.value(q.type);
        if (s.dst !== null) s.dst[item * s.stride + s.base] = v;
        continue;
      }
      const k = r.value(q.countType);
      if (k < 0) r.fail(`negative list length ${k}`);
      const size = TYPE_SIZES[q.type]!;
      // Checked before anything is sized by k: an ascii item takes at least a
      // digit and a separator (binary lists are checked against their size below).
      if (r.ascii && 2 * k > n - r.p + 1) r.fail(`list of ${k} items is longer than the rest of the file can hold`);
      if (j === fi) {
        if (k < 3) r.fail(`face has ${k} ${k === 1 ? 'vertex' : 'vertices'} (at least 3 needed)`);
        if (!r.ascii && r.p + k * size > n) r.fail('file ends inside this item');
        if (ni + k > idx.length) {
          const g = new Uint32Array(Math.max(2 * idx.length, ni + k));
          g.set(idx.subarray(0, ni));
          idx = g;
        }
        for (let c = 0; c < k; c++) {
          const v = r.value(q.type);
          if (!(v >= 0 && v < nv && Number.isInteger(v))) r.fail(`vertex index ${v} out of range (the file has ${nv} vertices)`);
          idx[ni++] = v;
        }
        offsets[item + 1] = ni;
      } else if (r.ascii) {
        for (let c = 0; c < k; c++) r.value(q.type);
      } else {
        if (r.p + k * size > n) r.fail('file ends inside this item');
        r.p += k * size;
      }
    }
  }
  st.ni = ni;
  st.idx = idx;
}

/** The elements a mesh needs: vertex, face, and the face's index list property. */
interface MeshElements {
  vEl: PlyElement;
  fEl: PlyElement;
  /** Index of the face's vertex index list among its properties. */
  fi: number;
}

/** What the body is read into; `positions` and `faceIndices` may be replaced (fast path, growth). */
interface PlyBody {
  positions: Float64Array;
  vertexProps: PropertyColumn[];
  faceProps: PropertyColumn[];
  faceOffsets: Uint32Array;
  faceIndices: Uint32Array;
  /** Face indices used so far. */
  ni: number;
}

/** Parses a PLY file (any of the three encodings; a UTF-8 byte-order mark before `ply` is ignored) into {@link MeshData}. */
export function parsePly(bytes: Uint8Array, name: string): MeshData {
  const b = stripBom(bytes);
  const h = parsePlyHeader(b, name);
  const ascii = h.format === 'ascii';
  const le = h.format === 'binary_little_endian';
  const els = meshElements(h.elements, name);
  checkCountsFit(h.elements, els, b.length - h.bodyStart, ascii, name);
  const nv = els.vEl.count;
  const body: PlyBody = {
    positions: new Float64Array(3 * nv),
    vertexProps: [],
    faceProps: [],
    faceOffsets: new Uint32Array(els.fEl.count + 1),
    faceIndices: new Uint32Array(3 * els.fEl.count),
    ni: 0,
  };
  const r = new ItemReader(b, h.bodyStart, le, ascii, name);
  for (const el of h.elements) readElement(r, el, els, body);
  const { positions, ni, faceIndices } = body;
  for (let k = 0; k < 3 * nv; k++) {
    if (!Number.isFinite(positions[k]!)) throw inputError('non-finite coordinate', `${name}: vertex ${Math.floor(k / 3)}`);
  }
  return {
    positions,
    faceOffsets: body.faceOffsets,
    faceIndices: ni === faceIndices.length ? faceIndices : faceIndices.slice(0, ni),
    vertexProps: body.vertexProps,
    faceProps: body.faceProps,
    name,
  };
}

/** Finds the vertex element (with scalar x, y, z) and the face element (with its index list), or throws INPUT. */
function meshElements(elements: PlyElement[], name: string): MeshElements {
  const vEl = elements.find((e) => e.name === 'vertex');
  const fEl = elements.find((e) => e.name === 'face');
  if (vEl === undefined || vEl.count === 0) throw inputError('no vertices', name);
  if (fEl === undefined || fEl.count === 0) throw inputError('no faces', name);
  for (const axis of ['x', 'y', 'z']) {
    const pr = vEl.props.find((q) => q.name === axis);
    if (pr === undefined || pr.countType >= 0) throw inputError(`vertex element has no scalar '${axis}'`, `${name}: header line ${vEl.line}`);
  }
  const fi = fEl.props.findIndex((q) => q.countType >= 0 && (q.name === 'vertex_indices' || q.name === 'vertex_index'));
  if (fi < 0) throw inputError('face element has no vertex_indices list', `${name}: header line ${fEl.line}`);
  return { vEl, fEl, fi };
}

/**
 * Checks every declared count against the `bodyBytes` left after the header,
 * before anything is sized by a count. Smallest body an element can have: its
 * scalars and list counts (binary), or one digit and one separator per value
 * (ascii). A binary face list needs 3 items (fewer is an error anyway).
 */
function checkCountsFit(elements: PlyElement[], { fEl, fi }: MeshElements, bodyBytes: number, ascii: boolean, name: string): void {
  let budget = bodyBytes + (ascii ? 1 : 0);
  for (const el of elements) {
    let min = 0;
    el.props.forEach((q, j) => {
      if (ascii) min += 2;
      else min += q.countType >= 0 ? TYPE_SIZES[q.countType]! + (el === fEl && j === fi ? 3 * TYPE_SIZES[q.type]! : 0) : TYPE_SIZES[q.type]!;
    });
    if (min > 0 && el.count > Math.floor(budget / min)) {
      throw inputError(
        `element '${el.name}' declares ${el.count} ${el.count === 1 ? 'item' : 'items'} but the rest of the file can hold at most ${Math.max(0, Math.floor(budget / min))}`,
        `${name}: header line ${el.line}`,
      );
    }
    budget -= el.count * min;
  }
}

/**
 * Where each property of `el` goes: positions for the vertex's x, y, z, a new
 * column for other scalars of vertex and face, nowhere for lists and for
 * other elements.
 */
function elementSinks(el: PlyElement, { vEl, fEl }: MeshElements, body: PlyBody): Sink[] {
  return el.props.map((q) => {
    if (q.countType >= 0) return { dst: null, stride: 0, base: 0 };
    if (el === vEl && (q.name === 'x' || q.name === 'y' || q.name === 'z')) {
      return { dst: body.positions, stride: 3, base: q.name.charCodeAt(0) - 120 };
    }
    if (el !== vEl && el !== fEl) return { dst: null, stride: 0, base: 0 };
    const col: PropertyColumn = { name: q.name, type: SCALAR_TYPES[q.type]!, values: new Float64Array(el.count) };
    (el === vEl ? body.vertexProps : body.faceProps).push(col);
    return { dst: col.values, stride: 1, base: 0 };
  });
}

/**
 * Reads the items of one element from r.p on and advances r.p past them,
 * by the fastest path its layout allows: skipped, one block copy (host-order
 * double x, y, z), column by column (fixed-size binary items), a tight loop
 * (binary faces with only their index list), or value by value.
 */
function readElement(r: ItemReader, el: PlyElement, els: MeshElements, body: PlyBody): void {
  const { vEl, fEl, fi } = els;
  const { b, ascii, le, dv } = r;
  r.elName = el.name;
  let p = r.p;
  const sinks = elementSinks(el, els, body);
  const np = el.props.length;
  let stride = 0;
  for (const q of el.props) stride += q.countType < 0 ? TYPE_SIZES[q.type]! : 0;
  const fixed = !ascii && el !== fEl && el.props.every((q) => q.countType < 0);
  if (np === 0) {
    // items without properties occupy no bytes
  } else if (fixed && el !== vEl && sinks.every((s) => s.dst === null)) {
    p += stride * el.count;
  } else if (fixed && el === vEl && le === HOST_LE && stride === 24 && el.props.every((q, j) => q.type === 7 && q.name === 'xyz'[j])) {
    // Exactly `double x, y, z` in host byte order: the block is the array.
    // Copied into an array of its own: `b` may be a view into a larger
    // (pooled) buffer at any byte offset, so its `.buffer` is not the file.
    body.positions = new Float64Array(3 * el.count);
    new Uint8Array(body.positions.buffer).set(b.subarray(p, p + 24 * el.count));
    p += 24 * el.count;
  } else if (fixed) {
    // Fixed-size items: bounds were checked above, read column by column.
    let o = p;
    for (let j = 0; j < np; j++) {
      const q = el.props[j]!, s = sinks[j]!;
      if (s.dst !== null) readColumn(dv, o, stride, el.count, q.type, le, s.dst, s.stride, s.base);
      o += TYPE_SIZES[q.type]!;
    }
    p += stride * el.count;
  } else if (!ascii && el === fEl && np === 1) {
    // Faces with only their index list: the common case, its own tight loop.
    const st: FaceLists = { p, ni: body.ni, idx: body.faceIndices };
    readFaceLists(dv, b, st, el.count, el.props[0]!, le, vEl.count, body.faceOffsets, r.name);
    p = st.p;
    body.ni = st.ni;
    body.faceIndices = st.idx;
  } else {
    const st: FaceLists = { p, ni: body.ni, idx: body.faceIndices };
    readItems(r, el, sinks, el === fEl ? fi : -1, vEl.count, body.faceOffsets, st);
    p = r.p;
    body.ni = st.ni;
    body.faceIndices = st.idx;
  }
  r.p = p;
}
