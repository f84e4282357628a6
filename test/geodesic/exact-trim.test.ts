/**
 * Window trimming on one edge against a brute-force oracle: wherever a
 * window is cut away, the other window must be no worse there (sampled
 * comparison of the two distance functions σ + |x − I|; common practice).
 */
import { describe, it, expect } from 'vitest';
import { trimInterval, trimBoth } from '../../src/geodesic/exact/trim.js';
import { rng } from '../fixtures/shapes.js';

function violations(seed: number, n: number, equalSigma: boolean): number {
  const r = rng(seed);
  const out = new Float64Array(2);
  let bad = 0;
  for (let it = 0; it < n; it++) {
    const lo = r(), hi = lo + r();
    const oLo = r() * 1.5 - 0.2, oHi = oLo + r();
    const a = r() * 3 - 1, b = -r() * 2, sN = r() * 2;
    const c = r() * 3 - 1, d = -r() * 2, sO = equalSigma ? sN : r() * 2;
    const ok = trimInterval(lo, hi, a, b, sN, oLo, oHi, c, d, sO, out);
    const fN = (x: number) => sN + Math.hypot(x - a, b), fO = (x: number) => sO + Math.hypot(x - c, d);
    for (let k = 0; k <= 100; k++) {
      const x = lo + ((hi - lo) * k) / 100;
      const cut = !ok || x < out[0]! - 1e-12 || x > out[1]! + 1e-12;
      if (cut && (!(x >= oLo && x <= oHi) || fN(x) < fO(x) - 1e-9)) { bad++; break; }
    }
  }
  return bad;
}

describe('trimInterval', () => {
  it('never cuts a stretch where the window is better (random σ and equal σ)', () => {
    expect(violations(1, 20000, false)).toBe(0);
    expect(violations(2, 20000, true)).toBe(0);
  });

  it('cuts at the bisector when both σ are equal (regression: a double root lost to rounding cut the whole overlap)', () => {
    const out = new Float64Array(2);
    const ok = trimInterval(0, 0.3246455633596055, -1.186122643021593, -1.377074021058592, 0,
      0.25312889675612377, 0.6052358027393436, -0.8966660628742013, -1.6323151824458966, 0, out);
    expect(ok).toBe(true);
    // zero of hypot(x − a, b) = hypot(x − c, d): x = (c² + d² − a² − b²) / (2(c − a))
    const [a, b, c, d] = [-1.186122643021593, -1.377074021058592, -0.8966660628742013, -1.6323151824458966];
    expect(out[0]).toBe(0);
    expect(out[1]).toBeCloseTo((c * c + d * d - a * a - b * b) / (2 * (c - a)), 12);
  });

  it('a window worse everywhere on its interval is dropped; one better everywhere is kept whole', () => {
    const out = new Float64Array(2);
    expect(trimInterval(0, 1, 0.5, -1, 1, 0, 1, 0.5, -1, 0, out)).toBe(false);
    expect(trimInterval(0, 1, 0.5, -1, 0, 0, 1, 0.5, -1, 1, out)).toBe(true);
    expect([...out]).toEqual([0, 1]);
  });

  it('trimBoth: neither window loses a stretch where it is the better one (sampled oracle)', () => {
    const r = rng(7);
    const out = new Float64Array(4);
    let bad = 0;
    for (let it = 0; it < 20000; it++) {
      const lo = r(), hi = lo + r(), oLo = r() * 1.5 - 0.2, oHi = oLo + r();
      const a = r() * 3 - 1, b = -r() * 2, sN = r() * 2, c = r() * 3 - 1, d = -r() * 2;
      const sO = it % 3 === 0 ? sN : r() * 2;
      const res = trimBoth(lo, hi, a, b, sN, oLo, oHi, c, d, sO, true, out);
      const fN = (x: number) => sN + Math.hypot(x - a, b), fO = (x: number) => sO + Math.hypot(x - c, d);
      for (let k = 0; k <= 60; k++) {
        const x = lo + ((hi - lo) * k) / 60;
        if ((res & 1 || x < out[0]! - 1e-12 || x > out[1]! + 1e-12) && (!(x >= oLo && x <= oHi) || fN(x) < fO(x) - 1e-9)) { bad++; break; }
        const y = oLo + ((oHi - oLo) * k) / 60;
        if ((res & 2 || y < out[2]! - 1e-12 || y > out[3]! + 1e-12) && (!(y >= lo && y <= hi) || fO(y) < fN(y) - 1e-9)) { bad++; break; }
      }
    }
    expect(bad).toBe(0);
  });
});
