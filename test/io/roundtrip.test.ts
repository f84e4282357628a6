/**
 * Round trips between our writers and readers: OBJ → PLY (ascii, binary LE,
 * binary BE) → OBJ keeps every coordinate bit for bit and every index; PLY in
 * one encoding → another keeps every extra vertex/face property value and
 * declared type. Bit-exact text round trips rely on ECMAScript Number-to-String
 * printing the shortest decimal that reads back to the same double
 * (ECMA-262, Number::toString), and on the PLY description's typed scalars.
 */
import { describe, expect, it } from 'vitest';
import { fc, test as fcTest } from '@fast-check/vitest';
import { parseObj } from '../../src/io/obj.js';
import { parsePly } from '../../src/io/ply.js';
import { writePly, type WritePlyOptions } from '../../src/io/write-ply.js';
import { writeObj } from '../../src/io/write-obj.js';
import type { MeshData, PropertyColumn, ScalarType } from '../../src/io/mesh-data.js';

const ENCODINGS: WritePlyOptions[] = [{ format: 'ascii' }, { format: 'binary' }, { format: 'binary', littleEndian: false }];

/** Same bits, NaN and -0 included. */
function sameBits(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  const x = new Uint8Array(a.buffer, a.byteOffset, a.byteLength), y = new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  return x.every((v, i) => v === y[i]);
}

const TYPES: ScalarType[] = ['int8', 'uint8', 'int16', 'uint16', 'int32', 'uint32', 'float32', 'float64'];

/** A value generator that fits type t exactly. */
function valueOf(t: ScalarType): fc.Arbitrary<number> {
  switch (t) {
    case 'int8': return fc.integer({ min: -128, max: 127 });
    case 'uint8': return fc.integer({ min: 0, max: 255 });
    case 'int16': return fc.integer({ min: -32768, max: 32767 });
    case 'uint16': return fc.integer({ min: 0, max: 65535 });
    case 'int32': return fc.integer({ min: -2147483648, max: 2147483647 });
    case 'uint32': return fc.integer({ min: 0, max: 4294967295 });
    case 'float32': return fc.float({ noNaN: true, noDefaultInfinity: true }).map(Math.fround);
    default: return fc.double({ noNaN: true, noDefaultInfinity: true });
  }
}

function columns(count: number, prefix: string): fc.Arbitrary<PropertyColumn[]> {
  return fc.array(fc.constantFrom(...TYPES), { maxLength: 4 }).chain((types) =>
    fc.tuple(...types.map((t) => fc.array(valueOf(t), { minLength: count, maxLength: count }))).map((vals) =>
      types.map((t, k) => ({ name: `${prefix}${k}`, type: t, values: Float64Array.from(vals[k]!) })),
    ),
  );
}

/** Random valid polygon meshes: any finite coordinates, faces of 3..6 corners. */
const meshArb: fc.Arbitrary<MeshData> = fc.integer({ min: 1, max: 30 }).chain((nv) =>
  fc
    .record({
      coords: fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { minLength: 3 * nv, maxLength: 3 * nv }),
      faces: fc.array(fc.array(fc.integer({ min: 0, max: nv - 1 }), { minLength: 3, maxLength: 6 }), { minLength: 1, maxLength: 20 }),
    })
    .chain(({ coords, faces }) =>
      fc.record({ vertexProps: columns(nv, 'vp'), faceProps: columns(faces.length, 'fp') }).map(({ vertexProps, faceProps }) => {
        const faceOffsets = new Uint32Array(faces.length + 1);
        faces.forEach((f, i) => (faceOffsets[i + 1] = faceOffsets[i]! + f.length));
        return { positions: Float64Array.from(coords), faceOffsets, faceIndices: Uint32Array.from(faces.flat()), vertexProps, faceProps, name: 'r' };
      }),
    ),
);

function expectSameMesh(a: MeshData, b: MeshData, props: boolean): void {
  expect(sameBits(a.positions, b.positions)).toBe(true);
  expect(Array.from(b.faceOffsets)).toEqual(Array.from(a.faceOffsets));
  expect(Array.from(b.faceIndices)).toEqual(Array.from(a.faceIndices));
  if (!props) return;
  for (const [x, y] of [[a.vertexProps, b.vertexProps], [a.faceProps, b.faceProps]] as const) {
    expect(y.map((c) => [c.name, c.type])).toEqual(x.map((c) => [c.name, c.type]));
    x.forEach((c, k) => expect(sameBits(c.values, y[k]!.values), c.name).toBe(true));
  }
}

describe('round trips (property-based)', () => {
  fcTest.prop([meshArb], { numRuns: 60 })('OBJ → PLY (all encodings) → OBJ keeps coordinates bit-exactly and indices', (m) => {
    // -0 prints as "0" in text (ECMA-262 Number::toString), so compare the value read back from OBJ.
    const fromObj = parseObj(writeObj(m), 'r.obj');
    expect(Array.from(fromObj.positions)).toEqual(Array.from(m.positions, (x) => (x === 0 ? 0 : x)));
    for (const opts of ENCODINGS) {
      const viaPly = parsePly(writePly(fromObj, opts), 'r.ply');
      expectSameMesh(fromObj, viaPly, false);
      expectSameMesh(fromObj, parseObj(writeObj(viaPly), 'r2.obj'), false);
    }
  });

  fcTest.prop([meshArb], { numRuns: 60 })('PLY in each encoding keeps every property value and type', (m) => {
    const bin = parsePly(writePly(m, { format: 'binary' }), 'r.ply');
    expectSameMesh(m, bin, true);
    for (const opts of ENCODINGS) {
      const again = parsePly(writePly(bin, opts), 'r.ply');
      if (opts.format === 'ascii') {
        // text cannot carry the sign of zero; everything else is exact
        expect(Array.from(again.positions)).toEqual(Array.from(bin.positions, (x) => (x === 0 ? 0 : x)));
        expect(Array.from(again.faceIndices)).toEqual(Array.from(bin.faceIndices));
        expect(again.vertexProps.map((c) => [c.name, c.type, Array.from(c.values)])).toEqual(bin.vertexProps.map((c) => [c.name, c.type, Array.from(c.values, (x) => (x === 0 ? 0 : x))]));
        expect(again.faceProps.map((c) => [c.name, c.type, Array.from(c.values)])).toEqual(bin.faceProps.map((c) => [c.name, c.type, Array.from(c.values, (x) => (x === 0 ? 0 : x))]));
      } else {
        expectSameMesh(bin, again, true);
      }
    }
  });
});

describe('round trips (fixed cases)', () => {
  it('terrain-sized coordinates survive OBJ and PLY unchanged (x ≈ 512000, sub-millimetre)', () => {
    const positions = Float64Array.from([512000.0001, 4200000.0009, 301.123456789, 512000.1 + 0.2, 4200000.3, 0.1 + 0.2, 512001, 4200001.7, 299]);
    const m: MeshData = { positions, faceOffsets: Uint32Array.from([0, 3]), faceIndices: Uint32Array.from([2, 0, 1]), vertexProps: [], faceProps: [], name: 't' };
    expectSameMesh(m, parseObj(writeObj(m), 't.obj'), false);
    for (const o of ENCODINGS) expectSameMesh(m, parsePly(writePly(m, o), 't.ply'), false);
  });

  it('optional colours come back as uchar red/green/blue (PLY) and r/255 floats (OBJ)', () => {
    const m: MeshData = { positions: Float64Array.from([0, 0, 0, 1, 0, 0, 0, 1, 0]), faceOffsets: Uint32Array.from([0, 3]), faceIndices: Uint32Array.from([0, 1, 2]), vertexProps: [], faceProps: [], name: 'c' };
    const colors = Uint8Array.from([255, 0, 0, 0, 128, 0, 1, 2, 3]);
    const p = parsePly(writePly(m, { colors }), 'c.ply');
    expect(p.vertexProps.map((c) => [c.name, c.type, Array.from(c.values)])).toEqual([
      ['red', 'uint8', [255, 0, 1]], ['green', 'uint8', [0, 128, 2]], ['blue', 'uint8', [0, 0, 3]],
    ]);
    const o = parseObj(writeObj(m, { colors }), 'c.obj');
    expect(Array.from(o.vertexProps[1]!.values)).toEqual([0, 128 / 255, 2 / 255]);
  });

  it('integer columns are rounded and clamped to their declared type, non-finite to 0 (documented writer rule)', () => {
    const m: MeshData = {
      positions: Float64Array.from([0, 0, 0, 1, 0, 0, 0, 1, 0]), faceOffsets: Uint32Array.from([0, 3]), faceIndices: Uint32Array.from([0, 1, 2]),
      vertexProps: [{ name: 'q', type: 'uint8', values: Float64Array.from([300, -4, NaN]) }],
      faceProps: [{ name: 'd', type: 'float64', values: Float64Array.from([Infinity]) }], name: 'k',
    };
    for (const o of ENCODINGS) {
      const p = parsePly(writePly(m, o), 'k.ply');
      expect(Array.from(p.vertexProps[0]!.values)).toEqual([255, 0, 0]);
      expect(p.faceProps[0]!.values[0]).toBe(Infinity);
    }
  });

  it('a polygon of more than 255 corners gets a uint list count (PLY description: typed list counts)', () => {
    const n = 300;
    const positions = new Float64Array(3 * n);
    for (let k = 0; k < n; k++) positions.set([Math.cos((2 * Math.PI * k) / n), Math.sin((2 * Math.PI * k) / n), 0], 3 * k);
    const m: MeshData = { positions, faceOffsets: Uint32Array.from([0, n]), faceIndices: Uint32Array.from({ length: n }, (_, i) => i), vertexProps: [], faceProps: [], name: 'big' };
    for (const o of ENCODINGS) {
      const b = writePly(m, o);
      expect(new TextDecoder().decode(b.subarray(0, 300))).toContain('property list uint uint vertex_indices');
      expectSameMesh(m, parsePly(b, 'big.ply'), false);
    }
  });

  it('columns without a type are written as double and plain arrays are accepted', () => {
    const m = { positions: new Float64Array(9), faceOffsets: Uint32Array.from([0, 3]), faceIndices: Uint32Array.from([0, 1, 2]) };
    const p = parsePly(writePly({ ...m, vertexProps: [{ name: 'distance', values: [0, 0.1, Infinity] }] }), 'd.ply');
    expect(p.vertexProps.map((c) => [c.name, c.type, Array.from(c.values)])).toEqual([['distance', 'float64', [0, 0.1, Infinity]]]);
  });

  it('the writer refuses mismatched or clashing columns with USAGE', () => {
    const m = { positions: new Float64Array(9), faceOffsets: Uint32Array.from([0, 3]), faceIndices: Uint32Array.from([0, 1, 2]) };
    expect(() => writePly({ ...m, vertexProps: [{ name: 'q', type: 'float64', values: new Float64Array(2) }] })).toThrow("vertex property 'q' has 2 values, expected 3");
    expect(() => writePly({ ...m, vertexProps: [{ name: 'x', type: 'float64', values: new Float64Array(3) }] })).toThrow("vertex property name 'x' is repeated or has spaces");
    expect(() => writePly({ ...m, faceProps: [{ name: 'a b', type: 'int8', values: new Float64Array(1) }] })).toThrow("face property name 'a b' is repeated or has spaces");
  });
});
