/**
 * OBJ reader checks. The statement forms follow the published Wavefront OBJ
 * description (Wavefront Technologies, "Appendix B1. Object Files (.obj)",
 * Advanced Visualizer manual; title and chapter from memory): `v x y z [w]`, `f v`, `f v/vt`, `f v//vn`,
 * `f v/vt/vn`, negative indices count back from the latest vertex (-1 is the
 * last one), `#` starts a comment, `\` at the end of a line continues it.
 */
import { describe, expect, it } from 'vitest';
import { fc, test as fcTest } from '@fast-check/vitest';
import { parseObj } from '../../src/io/obj.js';
import { ScanCursor, scanReal } from '../../src/io/decimal.js';
import { OrthodromeError } from '../../src/errors.js';

const enc = new TextEncoder();
const obj = (s: string) => parseObj(enc.encode(s), 'test.obj');

describe('parseObj statements', () => {
  it('reads v and every f corner form (Wavefront OBJ description)', () => {
    const m = obj(['v 0 0 0', 'v 1 0 0', 'v 1 1 0', 'v 0 1 0', 'vt 0 0', 'vn 0 0 1', 'f 1 2 3', 'f 1/1 3/1 4/1', 'f 1//1 2//1 4//1', 'f 2/1/1 3/1/1 4/1/1', ''].join('\n'));
    expect(Array.from(m.positions)).toEqual([0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0]);
    expect(Array.from(m.faceOffsets)).toEqual([0, 3, 6, 9, 12]);
    expect(Array.from(m.faceIndices)).toEqual([0, 1, 2, 0, 2, 3, 0, 1, 3, 1, 2, 3]);
  });

  it('resolves negative indices against the vertices read so far (Wavefront OBJ description)', () => {
    const m = obj('v 0 0 0\nv 1 0 0\nv 0 1 0\nf -3 -2 -1\nv 5 5 5\nf -4 -1 -2\n');
    expect(Array.from(m.faceIndices)).toEqual([0, 1, 2, 0, 3, 2]);
  });

  it('keeps polygons as polygons, skips comments and ignorable statements', () => {
    const text = [
      '# a pentagon', 'mtllib scene.mtl', 'o part', 'g group1', 's off', 'usemtl stone',
      'v 0 0 0', 'v 2 0 0', 'v 3 1 0', 'v 1 2 0', 'v -1 1 0 # trailing comment',
      'vp 0.5', 'l 1 2', 'p 3', 'f 1 2 3 4 5', 'cstype bspline', '',
    ].join('\r\n');
    const m = obj(text);
    expect(m.positions.length).toBe(15);
    expect(Array.from(m.faceOffsets)).toEqual([0, 5]);
    expect(Array.from(m.faceIndices)).toEqual([0, 1, 2, 3, 4]);
  });

  it('joins lines ending in a backslash (Wavefront OBJ description) and counts lines through them', () => {
    const m = obj('v 0 0 \\\n 0\nv 1 0 0\nv 0 1 0\nf 1 \\\n2 3\n');
    expect(Array.from(m.positions)).toEqual([0, 0, 0, 1, 0, 0, 0, 1, 0]);
    expect(Array.from(m.faceIndices)).toEqual([0, 1, 2]);
    expect(() => obj('v 0 0 \\\n 0\nv 1 0 0\nv 0 1 0\nf 1 \\\n2 x\n')).toThrow("test.obj:6: malformed vertex index 'x'");
  });

  it('accepts the optional w and keeps r g b colours when every vertex has them (common practice)', () => {
    expect(obj('v 0 0 0 1\nv 1 0 0 1\nv 0 1 0 1\nf 1 2 3').vertexProps).toEqual([]);
    const m = obj('v 0 0 0 1 0 0\nv 1 0 0 0 1 0\nv 0 1 0 0 0 0.5\nf 1 2 3\n');
    expect(m.vertexProps.map((c) => c.name)).toEqual(['red', 'green', 'blue']);
    expect(Array.from(m.vertexProps[2]!.values)).toEqual([0, 0, 0.5]);
    expect(obj('v 0 0 0 1 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 3\n').vertexProps).toEqual([]);
  });

  it('keeps map-sized coordinates in float64, equal to the correctly rounded value (IEEE 754 via Number())', () => {
    const xs = ['512000.123456789', '4200000.000001', '-0.1', '6.02214076e23', '1e-300', '123456789012345678'];
    const m = obj(`v ${xs[0]} ${xs[1]} ${xs[2]}\nv ${xs[3]} ${xs[4]} ${xs[5]}\nv 0 0 0\nf 1 2 3\n`);
    expect(Array.from(m.positions.subarray(0, 6))).toEqual(xs.map(Number));
    // float32 would lose the millimetres: 512000.123456789 → 512000.125
    expect(m.positions[0]).not.toBe(Math.fround(512000.123456789));
  });

  it('keeps degenerate faces (the topology builder drops them)', () => {
    const m = obj('v 0 0 0\nv 1 0 0\nv 0 1 0\nf 1 1 2\nf 1 2 3\n');
    expect(Array.from(m.faceIndices)).toEqual([0, 0, 1, 0, 1, 2]);
  });

  it('reports the physical line of the problem (common practice)', () => {
    const e = (() => { try { obj('v 0 0 0\n\n# c\nv 1 0 0\nv 0 1 zz\nf 1 2 3\n'); } catch (x) { return x; } })();
    expect(e).toBeInstanceOf(OrthodromeError);
    expect((e as OrthodromeError).code).toBe('INPUT');
    expect((e as OrthodromeError).location).toBe('test.obj:5');
  });
});

describe('scanReal against Number() (ECMAScript StringToNumber, correctly rounded)', () => {
  const scan = (s: string) => {
    const b = enc.encode(s);
    const cur = new ScanCursor();
    const v = scanReal(b, 0, cur);
    return { v, bad: cur.bad, pos: cur.pos };
  };

  fcTest.prop([fc.double({ noNaN: true, noDefaultInfinity: true })], { numRuns: 500 })('shortest repr of any double reads back bit-exactly', (x) => {
    const r = scan(String(x));
    expect(r.bad).toBe(false);
    expect(Object.is(r.v, x) || (x === 0 && r.v === 0)).toBe(true);
  });

  fcTest.prop(
    [fc.stringMatching(/^[+-]?(\d{1,20}(\.\d{0,20})?|\.\d{1,20})([eE][+-]?\d{1,3})?$/)],
    { numRuns: 500 },
  )('decimal strings match Number()', (s) => {
    const r = scan(s);
    expect(r.bad).toBe(false);
    expect(r.pos).toBe(s.length);
    expect(r.v).toBe(Number(s));
  });

  fcTest.prop(
    [fc.array(fc.oneof(fc.double({ noNaN: true, noDefaultInfinity: true }).map(String), fc.stringMatching(/^-?(\d{1,18}(\.\d{0,24})?|\.\d{1,24})$/)), { minLength: 3, maxLength: 3 })],
    { numRuns: 500 },
  )('coordinates read by parseObj (inline fast path and fallback) match Number()', (xs) => {
    const m = parseObj(enc.encode(`v ${xs.join(' ')}\nv 0 0 0\nv 1 1 1\nf 1 2 3\n`), 'p.obj');
    expect(Array.from(m.positions.subarray(0, 3))).toEqual(xs.map(Number));
  });

  it('rejects malformed tokens and reads nan/inf words', () => {
    for (const s of ['1.2.3', '1e', '1e+', '-', '.', 'abc', '+.', '.nan', '1x']) expect(scan(s).bad, s).toBe(true);
    expect(Number.isNaN(scan('nan').v)).toBe(true);
    expect(scan('-inf').v).toBe(-Infinity);
    expect(scan('Infinity').v).toBe(Infinity);
    expect(scan('1e999').v).toBe(Infinity);
  });
});
