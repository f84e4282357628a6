/**
 * Duplicate polygons: the hashed bucketing must agree with the definition
 * (same size, same vertex set; the earliest copy is the one kept), checked
 * against a plain map of sorted vertex lists (common practice).
 */
import { expect } from 'vitest';
import { fc, test } from '@fast-check/vitest';
import { findDuplicatePolygons } from '../../src/mesh/duplicates.js';

test.prop([fc.array(fc.array(fc.nat(6), { minLength: 3, maxLength: 5 }), { minLength: 1, maxLength: 60 })])(
  'same answers as a map of sorted vertex lists',
  (polys) => {
    const offsets = Uint32Array.from([0, ...polys.map((_, i) => polys.slice(0, i + 1).reduce((a, p) => a + p.length, 0))]);
    const indices = Uint32Array.from(polys.flat());
    const got = findDuplicatePolygons(offsets, indices);
    const first = new Map<string, number>();
    polys.forEach((p, f) => {
      const k = `${p.length}:${[...p].sort((x, y) => x - y).join(',')}`;
      const want = p.length > 3 ? (first.get(k) ?? -1) : -1; // triangles are left to the build
      if (!first.has(k)) first.set(k, f);
      expect(got[f]).toBe(want);
    });
  },
);
