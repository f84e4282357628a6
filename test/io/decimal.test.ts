/**
 * The one decimal scanner (src/io/decimal.ts) and both readers that use it,
 * checked against Number.parseFloat, which ECMAScript requires to return the
 * correctly rounded double of a decimal string (ECMA-262, StringToNumber /
 * RoundMVResult). The hard cases are the ones where a mantissa of 16–17
 * significant digits crosses 2^53 (9007199254740992): a scanner that
 * accumulates digits in a double silently rounds 9007199254740993 to
 * 9007199254740992 and then takes an "exact" fast path.
 */
import { describe, expect, it } from 'vitest';
import { fc, test as fcTest } from '@fast-check/vitest';
import { ScanCursor, scanReal } from '../../src/io/decimal.js';
import { parseObj } from '../../src/io/obj.js';
import { parsePly } from '../../src/io/ply.js';

const enc = new TextEncoder();

function scan(s: string): number {
  const cur = new ScanCursor();
  const v = scanReal(enc.encode(s), 0, cur);
  expect(cur.bad, s).toBe(false);
  expect(cur.pos, s).toBe(s.length);
  return v;
}

/** Reads the three numbers as the first vertex of an OBJ file. */
function viaObj(xs: string[]): number[] {
  const m = parseObj(enc.encode(`v ${xs.join(' ')}\nv 0 0 0\nv 1 1 1\nf 1 2 3\n`), 'r.obj');
  return Array.from(m.positions.subarray(0, 3));
}

/** Reads the three numbers as the first vertex of an ASCII PLY file. */
function viaPly(xs: string[]): number[] {
  const text = ['ply', 'format ascii 1.0', 'element vertex 3', 'property double x', 'property double y', 'property double z',
    'element face 1', 'property list uchar int vertex_indices', 'end_header', xs.join(' '), '0 0 0', '1 1 1', '3 0 1 2', ''].join('\n');
  return Array.from(parsePly(enc.encode(text), 'r.ply').positions.subarray(0, 3));
}

/** Bit-exact equality (keeps −0 apart from 0). */
function same(a: number, b: number): boolean {
  return Object.is(a, b);
}

/**
 * Decimal spellings whose correct reading needs more than a double's worth of
 * digits: neighbours of 2^53 written as 0.d…d, 17 significant digits, and
 * halfway cases (from the definition of round-to-nearest-even, IEEE 754-2008 §4.3.1).
 */
const HARD = [
  '0.9007199254740993', // the case: 9007199254740993 is not a double
  '0.9007199254740992', '0.9007199254740991', '0.9007199254740994', '0.9007199254740995',
  '9007199254740993', '9007199254740993.0', '-9007199254740993', '9007199254740995',
  '90071992547409930e-1', '900719925474099.3', '9.007199254740993e15',
  '0.30000000000000004', '0.1000000000000000055511151231257827', // 0.1's exact value to 34 digits
  '1.7976931348623157e308', '4.9406564584124654e-324', '2.2250738585072011e-308', '2.2250738585072014e-308',
  '2.4703282292062328e-324', // just above half the smallest subnormal: rounds up to it
  '123456789012345678', '0.000000000000000000001', '1e22', '1e23', '9.999999999999999e22',
];

describe('scanReal: correctly rounded, as Number.parseFloat (ECMA-262)', () => {
  it('reads 0.9007199254740993 as 0.9007199254740993, not 0.9007199254740992 (issue #10)', () => {
    expect(scan('0.9007199254740993')).toBe(Number.parseFloat('0.9007199254740993'));
    expect(scan('0.9007199254740993')).not.toBe(0.9007199254740992);
  });

  it('hard spellings near 2^53, 17 significant digits, subnormals and the largest double match Number.parseFloat', () => {
    for (const s of HARD) for (const t of [s, s.startsWith('-') ? s.slice(1) : `-${s}`]) expect(same(scan(t), Number.parseFloat(t)), t).toBe(true);
  });

  it('reads through both readers the same way (OBJ and ASCII PLY use this scanner)', () => {
    for (let i = 0; i + 2 < HARD.length; i += 3) {
      const xs = HARD.slice(i, i + 3);
      const want = xs.map((x) => Number.parseFloat(x));
      expect(viaObj(xs), xs.join(' ')).toEqual(want);
      expect(viaPly(xs), xs.join(' ')).toEqual(want);
    }
  });

  fcTest.prop([fc.double({ noNaN: true, noDefaultInfinity: true })], { numRuns: 2000 })(
    'any double written with 17 significant digits reads back bit-exactly (17 digits identify a double: IEEE 754-2008 §5.12.2)',
    (x) => {
      const s = x.toPrecision(17);
      expect(same(scan(s), Number.parseFloat(s)), s).toBe(true);
      expect(scan(s) === x || (x === 0 && scan(s) === 0), s).toBe(true);
    },
  );

  fcTest.prop([fc.double({ noNaN: true, noDefaultInfinity: true })], { numRuns: 2000 })(
    'any double in exponent form (toExponential) and in plain form reads as Number.parseFloat does',
    (x) => {
      for (const s of [x.toExponential(), x.toExponential(16), String(x)]) expect(same(scan(s), Number.parseFloat(s)), s).toBe(true);
    },
  );

  fcTest.prop(
    [fc.integer({ min: 0, max: 2 ** 52 - 1 }), fc.integer({ min: -1074, max: -1022 })],
    { numRuns: 1000 },
  )('subnormals and the smallest normals, written in full and rounded, match Number.parseFloat', (mant, exp) => {
    const x = mant * 2 ** exp;
    for (const s of [x.toPrecision(17), x.toPrecision(21), x.toExponential(3)]) expect(same(scan(s), Number.parseFloat(s)), s).toBe(true);
  });

  fcTest.prop(
    [fc.bigInt({ min: 9007199254740000n, max: 9007199254750000n }), fc.integer({ min: 0, max: 30 })],
    { numRuns: 1000 },
  )('mantissas just around 2^53 at every decimal scale match Number.parseFloat', (m, k) => {
    const digits = m.toString();
    const s = k === 0 ? digits : `${digits.slice(0, Math.max(1, digits.length - k))}.${digits.slice(Math.max(1, digits.length - k))}`;
    for (const t of [s, `0.${digits}`, `${digits}e-${k}`]) expect(same(scan(t), Number.parseFloat(t)), t).toBe(true);
  });

  it('cursors of interleaved scans do not disturb each other (no module state)', () => {
    const a = enc.encode('1.5 2.5'), b = enc.encode('abc 7');
    const ca = new ScanCursor(), cb = new ScanCursor();
    expect(scanReal(a, 0, ca)).toBe(1.5);
    scanReal(b, 0, cb);
    expect(cb.bad).toBe(true);
    expect(ca.bad).toBe(false);
    expect(ca.pos).toBe(3);
    expect(scanReal(a, ca.pos + 1, ca)).toBe(2.5);
  });
});
