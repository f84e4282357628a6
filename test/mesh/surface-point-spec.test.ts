/**
 * Coordinates in point and loop specs (src/mesh/surface-point.ts,
 * specCoordinates, shared by parsePointSpec and parseLoopSpec). 1e999 is
 * beyond the largest double (≈ 1.798e308, IEEE 754 binary64), so it reads
 * as Infinity and must be refused, not measured.
 */
import { describe, expect, it } from 'vitest';
import { parsePointSpec } from '../../src/mesh/surface-point.js';
import { parseLoopSpec } from '../../src/query/loop-spec.js';
import { isOrthodromeError } from '../../src/errors.js';

function usageOf(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    if (isOrthodromeError(e) && e.code === 'USAGE') return e.message;
    throw e;
  }
  throw new Error('no error');
}

describe('spec coordinates', () => {
  it('p:X,Y,Z and p:X,Y read their numbers as written', () => {
    expect(parsePointSpec('p:1.5,-2,3e2')).toEqual({ kind: 'position', xyz: [1.5, -2, 300] });
    expect(parsePointSpec('p:-.25,4')).toEqual({ kind: 'column', xy: [-0.25, 4] });
    expect(parseLoopSpec('loop@1,2,3')).toEqual({ kind: 'loop-near', xyz: [1, 2, 3] });
    expect(parseLoopSpec('loop@1,2')).toEqual({ kind: 'loop-near-plan', xy: [1, 2] });
  });

  it('an overflowing coordinate is a USAGE error naming the spec and the option, in every spelling', () => {
    expect(usageOf(() => parsePointSpec('p:1e999,0,0', '--from'))).toMatch(/--from: coordinates must be finite in 'p:1e999,0,0'/);
    expect(usageOf(() => parsePointSpec('p:0,-1e999', '--to'))).toMatch(/--to: coordinates must be finite in 'p:0,-1e999'/);
    expect(usageOf(() => parseLoopSpec('loop@0,0,1e999', '--from'))).toMatch(/--from: coordinates must be finite in 'loop@0,0,1e999'/);
  });
});
