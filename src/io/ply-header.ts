/**
 * PLY header parser: the `ply` magic, the format line and the element and
 * property declarations up to `end_header` (layout in ply.ts). Every error
 * is an `INPUT` error located at `name: header line N`.
 */
import { inputError } from '../errors.js';
import type { ScalarType } from './mesh-data.js';
import { latin1 } from './decimal.js';

/** Type codes 0..7 in {@link SCALAR_TYPES} order; both PLY spellings accepted. */
const TYPE_CODES: Record<string, number> = {
  char: 0, int8: 0, uchar: 1, uint8: 1, short: 2, int16: 2, ushort: 3, uint16: 3,
  int: 4, int32: 4, uint: 5, uint32: 5, float: 6, float32: 6, double: 7, float64: 7,
};
/** Byte size of each type code. */
export const TYPE_SIZES = [1, 1, 2, 2, 4, 4, 4, 8];
/** {@link ScalarType} of each type code. */
export const SCALAR_TYPES: ScalarType[] = ['int8', 'uint8', 'int16', 'uint16', 'int32', 'uint32', 'float32', 'float64'];

/** One property of a PLY element; `countType` is -1 for a scalar. */
export interface PlyProperty {
  /** Property name as in the header. */
  name: string;
  /** Type code of the value (of each item, for a list). */
  type: number;
  /** Type code of a list's length, or -1 for a scalar. */
  countType: number;
}

/** One element declared in a PLY header. */
export interface PlyElement {
  /** Element name (`vertex`, `face`, `edge`, ...). */
  name: string;
  /** Number of items declared. */
  count: number;
  /** Properties in body order. */
  props: PlyProperty[];
  /** 1-based header line of the `element` statement. */
  line: number;
}

/** A parsed PLY header. */
export interface PlyHeader {
  /** Body encoding. */
  format: 'ascii' | 'binary_little_endian' | 'binary_big_endian';
  /** Elements in body order. */
  elements: PlyElement[];
  /** Offset of the first body byte. */
  bodyStart: number;
}

/** Parses the header; throws `INPUT` located at `name: header line N`. */
export function parsePlyHeader(b: Uint8Array, name: string): PlyHeader {
  let p = 0, line = 0;
  let format: PlyHeader['format'] | null = null;
  const elements: PlyElement[] = [];
  for (;;) {
    const q = b.indexOf(10, p);
    line++;
    if (q < 0) throw inputError('missing end_header', `${name}: header line ${line}`);
    if (q - p > 4096) throw inputError('header line longer than 4096 bytes (missing end_header?)', `${name}: header line ${line}`);
    const text = latin1(b, p, q > p && b[q - 1] === 13 ? q - 1 : q);
    p = q + 1;
    const w = text.trim().split(/[ \t]+/);
    const at = `${name}: header line ${line}`;
    if (line === 1) {
      if (text.trim() !== 'ply') throw inputError("not a PLY file (first line must be 'ply')", at);
      continue;
    }
    const kw = w[0]!;
    if (kw === 'end_header') break;
    if (kw === 'comment' || kw === 'obj_info' || kw === '') continue;
    if (kw === 'format') {
      if (format !== null) throw inputError('second format line', at);
      if (w[1] !== 'ascii' && w[1] !== 'binary_little_endian' && w[1] !== 'binary_big_endian') {
        throw inputError(`unknown format '${w[1] ?? ''}'`, at);
      }
      if (w[2] !== '1.0') throw inputError(`unsupported PLY version '${w[2] ?? ''}'`, at);
      format = w[1];
    } else if (kw === 'element') {
      if (w.length !== 3 || !/^\d{1,10}$/.test(w[2]!) || Number(w[2]) > 4294967295) {
        throw inputError(`malformed element line '${text.trim()}'`, at);
      }
      if (elements.some((e) => e.name === w[1])) throw inputError(`second element '${w[1]}'`, at);
      elements.push({ name: w[1]!, count: Number(w[2]), props: [], line });
    } else if (kw === 'property') {
      const el = elements[elements.length - 1];
      if (el === undefined) throw inputError('property before any element', at);
      const list = w[1] === 'list';
      if (w.length !== (list ? 5 : 3)) throw inputError(`malformed property line '${text.trim()}'`, at);
      const t = TYPE_CODES[w[list ? 3 : 1]!];
      const ct = list ? TYPE_CODES[w[2]!] : -1;
      if (t === undefined) throw inputError(`unknown property type '${w[list ? 3 : 1]}'`, at);
      if (ct === undefined) throw inputError(`unknown list count type '${w[2]}'`, at);
      if (list && ct! >= 6) throw inputError(`list count type '${w[2]}' is not an integer type`, at);
      el.props.push({ name: w[list ? 4 : 2]!, type: t, countType: ct! });
    } else {
      throw inputError(`unknown header keyword '${kw.slice(0, 40)}'`, at);
    }
  }
  if (format === null) throw inputError('no format line', `${name}: header`);
  return { format, elements, bodyStart: p };
}
