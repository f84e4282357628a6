/**
 * PLY reader checks against files assembled here byte by byte, following the
 * published PLY polygon file format description (Greg Turk, "The PLY Polygon
 * File Format", 1994; author and year from memory): header lines `ply`, `format <ascii|binary_little_endian|
 * binary_big_endian> 1.0`, `element <name> <count>`, `property <type> <name>`,
 * `property list <count type> <item type> <name>`, `end_header`; the body holds
 * the elements in header order; types char uchar short ushort int uint float
 * double (1, 1, 2, 2, 4, 4, 4, 8 bytes), also spelled int8 … float64.
 * three's PLYLoader (a general-purpose reference library) reads our output.
 */
import { describe, expect, it } from 'vitest';
import { PLYLoader } from 'three/examples/jsm/loaders/PLYLoader.js';
import { parsePly } from '../../src/io/ply.js';
import { writePly } from '../../src/io/write-ply.js';

const enc = new TextEncoder();

/** Builds a binary body from [type, value] pairs (independent of our writer). */
function binary(header: string, values: [string, number][], le: boolean): Uint8Array {
  const size: Record<string, number> = { char: 1, uchar: 1, short: 2, ushort: 2, int: 4, uint: 4, float: 4, double: 8 };
  const h = enc.encode(header);
  let n = h.length;
  for (const [t] of values) n += size[t]!;
  const out = new Uint8Array(n);
  out.set(h);
  const dv = new DataView(out.buffer);
  let o = h.length;
  for (const [t, v] of values) {
    if (t === 'char') dv.setInt8(o, v);
    else if (t === 'uchar') dv.setUint8(o, v);
    else if (t === 'short') dv.setInt16(o, v, le);
    else if (t === 'ushort') dv.setUint16(o, v, le);
    else if (t === 'int') dv.setInt32(o, v, le);
    else if (t === 'uint') dv.setUint32(o, v, le);
    else if (t === 'float') dv.setFloat32(o, v, le);
    else dv.setFloat64(o, v, le);
    o += size[t]!;
  }
  return out;
}

const HEADER = (fmt: string) => [
  'ply', `format ${fmt} 1.0`, 'comment made by hand', 'obj_info test',
  'element vertex 4', 'property float x', 'property double y', 'property int16 z', 'property uchar quality', 'property char flag',
  'element edge 1', 'property int vertex1', 'property list uchar int tags',
  'element face 2', 'property list uint8 uint32 vertex_indices', 'property ushort cost', 'property float64 weight',
  'end_header', '',
].join('\n');

// x (float), y (double), z (short), quality (uchar), flag (char)
const VERTS: [number, number, number, number, number][] = [
  [0.5, 4200000.123456789, -3, 200, -5],
  [1.25, 2, 7, 0, 127],
  [-2, 1e-7, 32767, 255, -128],
  [3, -1.5, -32768, 17, 0],
];

function values(): [string, number][] {
  const v: [string, number][] = [];
  for (const [x, y, z, q, fl] of VERTS) v.push(['float', x], ['double', y], ['short', z], ['uchar', q], ['char', fl]);
  v.push(['int', 9], ['uchar', 2], ['int', 5], ['int', 6]); // the edge and its tag list, skipped
  v.push(['uchar', 3], ['uint', 0], ['uint', 1], ['uint', 2], ['ushort', 65535], ['double', 0.1]);
  v.push(['uchar', 4], ['uint', 0], ['uint', 2], ['uint', 3], ['uint', 1], ['ushort', 7], ['double', -2.5]);
  return v;
}

function checkParsed(name: string, bytes: Uint8Array): void {
  const m = parsePly(bytes, name);
  expect(Array.from(m.positions)).toEqual(VERTS.flatMap(([x, y, z]) => [x, y, z]));
  expect(Array.from(m.faceOffsets)).toEqual([0, 3, 7]);
  expect(Array.from(m.faceIndices)).toEqual([0, 1, 2, 0, 2, 3, 1]);
  expect(m.vertexProps.map((c) => [c.name, c.type, Array.from(c.values)])).toEqual([
    ['quality', 'uint8', VERTS.map((v) => v[3])],
    ['flag', 'int8', VERTS.map((v) => v[4])],
  ]);
  expect(m.faceProps.map((c) => [c.name, c.type, Array.from(c.values)])).toEqual([
    ['cost', 'uint16', [65535, 7]],
    ['weight', 'float64', [0.1, -2.5]],
  ]);
}

describe('parsePly on hand-assembled files (PLY format description)', () => {
  it('binary little-endian', () => checkParsed('le.ply', binary(HEADER('binary_little_endian'), values(), true)));
  it('binary big-endian', () => checkParsed('be.ply', binary(HEADER('binary_big_endian'), values(), false)));
  it('ascii (one item per line)', () => {
    const body = [
      ...VERTS.map((v) => v.join(' ')),
      '9 2 5 6',
      '3 0 1 2 65535 0.1',
      '4 0 2 3 1 7 -2.5',
    ].join('\n');
    checkParsed('a.ply', enc.encode(HEADER('ascii') + body + '\n'));
  });

  it('accepts vertex_index, CRLF header lines and every scalar type for x, y, z', () => {
    for (const t of ['char', 'uchar', 'short', 'ushort', 'int', 'uint', 'float', 'double']) {
      const header = ['ply', 'format binary_little_endian 1.0', 'element vertex 3', `property ${t} x`, `property ${t} y`, `property ${t} z`,
        'element face 1', 'property list ushort int vertex_index', 'end_header', ''].join('\r\n');
      const m = parsePly(binary(header, [[t, 0], [t, 0], [t, 0], [t, 1], [t, 0], [t, 0], [t, 0], [t, 1], [t, 0], ['ushort', 3], ['int', 0], ['int', 1], ['int', 2]], true), 't.ply');
      expect(Array.from(m.positions), t).toEqual([0, 0, 0, 1, 0, 0, 0, 1, 0]);
      expect(Array.from(m.faceIndices), t).toEqual([0, 1, 2]);
    }
  });
});

describe('list properties other than the face index list are skipped (PLY description: typed lists)', () => {
  const header = (fmt: string) => ['ply', `format ${fmt} 1.0`, 'element vertex 3', 'property float x', 'property list uchar float uv', 'property float y', 'property float z',
    'element face 1', 'property list uchar float texcoord', 'property list ushort uint vertex_indices', 'property short id', 'end_header', ''].join('\n');
  const check = (b: Uint8Array) => {
    const m = parsePly(b, 'l.ply');
    expect(Array.from(m.positions)).toEqual([0, 0, 0, 1, 0, 0, 0, 1, 0]);
    expect(Array.from(m.faceIndices)).toEqual([2, 0, 1]);
    expect(m.vertexProps).toEqual([]);
    expect(m.faceProps.map((c) => [c.name, c.type, Array.from(c.values)])).toEqual([['id', 'int16', [-9]]]);
  };
  it('binary big-endian', () => {
    check(binary(header('binary_big_endian'), [
      ['float', 0], ['uchar', 2], ['float', 0.5], ['float', 0.5], ['float', 0], ['float', 0],
      ['float', 1], ['uchar', 0], ['float', 0], ['float', 0],
      ['float', 0], ['uchar', 1], ['float', 7], ['float', 1], ['float', 0],
      ['uchar', 6], ['float', 0], ['float', 0], ['float', 1], ['float', 0], ['float', 0], ['float', 1],
      ['ushort', 3], ['uint', 2], ['uint', 0], ['uint', 1], ['short', -9],
    ], false));
  });
  it('ascii', () => {
    check(enc.encode(header('ascii') + '0 2 0.5 0.5 0 0\n1 0 0 0\n0 1 7 1 0\n6 0 0 1 0 0 1 3 2 0 1 -9\n'));
  });
});

describe('fixed-size elements other than vertex and face are skipped in place (PLY description: body in header order)', () => {
  const header = (fmt: string) => ['ply', `format ${fmt} 1.0`, 'element vertex 3', 'property double x', 'property double y', 'property double z',
    'element material 2', 'property float shine', 'property uchar alpha', 'element face 1', 'property list uchar int vertex_indices', 'end_header', ''].join('\n');
  const values: [string, number][] = [
    ['double', 0], ['double', 0], ['double', 0], ['double', 1], ['double', 0], ['double', 0], ['double', 0], ['double', 1], ['double', 0],
    ['float', 0.5], ['uchar', 9], ['float', 2], ['uchar', 3],
    ['uchar', 3], ['int', 0], ['int', 1], ['int', 2],
  ];
  for (const [fmt, le] of [['binary_little_endian', true], ['binary_big_endian', false]] as const) {
    it(fmt, () => {
      const m = parsePly(binary(header(fmt), values, le), 'm.ply');
      expect(Array.from(m.positions)).toEqual([0, 0, 0, 1, 0, 0, 0, 1, 0]);
      expect(Array.from(m.faceIndices)).toEqual([0, 1, 2]);
    });
  }
  it('ascii', () => {
    const m = parsePly(enc.encode(header('ascii') + '0 0 0\n1 0 0\n0 1 0\n0.5 9\n2 3\n3 0 1 2\n'), 'm.ply');
    expect(Array.from(m.faceIndices)).toEqual([0, 1, 2]);
  });
});

describe('our PLY output read by three PLYLoader (general-purpose reference library)', () => {
  it('gives the same indices and float32-rounded positions, in both byte orders and ascii', () => {
    const positions = Float64Array.from([512000.25, 4200000.5, 301.125, 512001.75, 4200000.5, 302, 512000.25, 4200002, 299.5, 512002, 4200003, 300]);
    const mesh = { positions, faceOffsets: Uint32Array.from([0, 3, 6]), faceIndices: Uint32Array.from([0, 1, 2, 1, 3, 2]) };
    for (const opts of [{ format: 'binary' as const }, { format: 'binary' as const, littleEndian: false }, { format: 'ascii' as const }]) {
      const b = writePly(mesh, opts);
      const g = new PLYLoader().parse(b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer);
      expect(Array.from(g.index!.array)).toEqual([0, 1, 2, 1, 3, 2]);
      expect(Array.from(g.getAttribute('position').array)).toEqual(Array.from(positions, Math.fround));
    }
  });
});
