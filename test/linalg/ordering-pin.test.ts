/**
 * Regression pins for the fill-reducing orderings: the exact permutation that
 * approximate minimum degree (Amestoy, Davis & Duff 1996) and nested
 * dissection (George 1973) produce on fixed graphs, as an FNV-1a hash, with
 * nnz(L) of the symbolic analysis. The values were recorded from the code as
 * it stood before its functions were split by phase (issue #10); they are a
 * pin of behaviour, not an outside source: a refactor must keep them, and a
 * deliberate change of the ordering must update them with its reason. Each
 * permutation is also checked to be one (every vertex exactly once), and the
 * fill to be far below the dense bound n(n + 1)/2 (the point of a
 * fill-reducing ordering; common practice).
 */
import { describe, expect, it } from 'vitest';
import { adjacencyFromLower, analyzeCholesky, approximateMinimumDegree, nestedDissection } from '../../src/linalg/index.js';
import type { AdjacencyGraph, NestedDissectionOptions } from '../../src/linalg/index.js';
import { TripletMatrix } from '../../src/linalg/triplet.js';
import { icosphere } from '../fixtures/shapes.js';
import { gridLaplacianLower, randomSpdLower, isPermutation } from './helpers.js';

/** FNV-1a (32-bit) over the permutation's entries, each as four little-endian bytes. */
function fnv1a(p: Int32Array): string {
  let h = 0x811c9dc5;
  for (const v of p) {
    for (let s = 0; s < 32; s += 8) {
      h ^= (v >>> s) & 0xff;
      h = Math.imul(h, 0x01000193) >>> 0;
    }
  }
  return h.toString(16).padStart(8, '0');
}

/** Lower triangle (unit off-diagonals, diagonal degree + 1) of a triangle mesh's vertex graph. */
function meshLower(nv: number, tris: Uint32Array): ReturnType<TripletMatrix['toCsc']> {
  const seen = new Set<number>();
  const T = new TripletMatrix(nv);
  const deg = new Float64Array(nv);
  for (let f = 0; f < tris.length; f += 3) {
    for (let k = 0; k < 3; k++) {
      const a = tris[f + k]!, b = tris[f + ((k + 1) % 3)]!;
      const i = Math.max(a, b), j = Math.min(a, b), key = i * nv + j;
      if (seen.has(key)) continue;
      seen.add(key);
      T.add(i, j, -1);
      deg[a]!++;
      deg[b]!++;
    }
  }
  for (let v = 0; v < nv; v++) T.add(v, v, deg[v]! + 1);
  return T.toCsc();
}

/** A 60×60 grid whose vertex 0 is joined to every other vertex: a dense row (set aside by AMD, a star for ND). */
function gridWithHub(): ReturnType<TripletMatrix['toCsc']> {
  const G = gridLaplacianLower(60, 60, 1);
  const n = G.n;
  const T = new TripletMatrix(n);
  for (let j = 0; j < n; j++) {
    for (let p = G.colPtr[j]!; p < G.colPtr[j + 1]!; p++) {
      const i = G.rowIdx[p]!;
      if (j === 0 && i !== 0) continue; // the hub's own grid edges are replaced below
      T.add(i, j, G.values[p]!);
    }
  }
  for (let v = 1; v < n; v++) T.add(v, 0, -0.01);
  T.add(0, 0, n);
  return T.toCsc();
}

const CASES = {
  'grid 150×150 with diagonals': () => gridLaplacianLower(150, 150, 1),
  'icosphere level 4': () => {
    const s = icosphere(4);
    return meshLower(s.positions.length / 3, s.triangles);
  },
  'random sparse, 4000 vertices': () => randomSpdLower(4000, 3, 7),
  'grid 60×60 with a hub': gridWithHub,
};

type CaseName = keyof typeof CASES;

/** [hash of perm, nnz(L) with that ordering] per case, recorded before the refactor. */
const AMD_PINS: Record<CaseName, [string, number]> = {
  'grid 150×150 with diagonals': ['dea1fa89', 483444],
  'icosphere level 4': ['e75d06fc', 81866],
  'random sparse, 4000 vertices': ['c9a3b235', 1193634],
  'grid 60×60 with a hub': ['ff16c6ed', 56939],
};
const ND_PINS: Record<CaseName, [string, number]> = {
  'grid 150×150 with diagonals': ['6c628419', 493986],
  'icosphere level 4': ['8f8569b0', 79304],
  'random sparse, 4000 vertices': ['64c60185', 1624178],
  'grid 60×60 with a hub': ['e40708cd', 68307],
};
/** nestedDissection with small leaves (more separators) and both leaf orders, on the 150×150 grid. */
const ND_OPTION_PINS: [NestedDissectionOptions, string][] = [
  [{ leafSize: 16 }, 'cf22983d'],
  [{ leafSize: 64, leafOrder: 'bfs' }, '7914bda9'],
];

describe('ordering pins (regression, recorded before the refactor of issue #10)', () => {
  for (const name of Object.keys(CASES) as CaseName[]) {
    it(`AMD and ND on ${name}`, () => {
      const A = CASES[name]();
      const g: AdjacencyGraph = adjacencyFromLower(A);
      const amd = approximateMinimumDegree(g);
      const nd = nestedDissection(g);
      expect(isPermutation(amd, A.n)).toBe(true);
      expect(isPermutation(nd, A.n)).toBe(true);
      const amdFill = analyzeCholesky(A, { ordering: 'amd' }).nnzL;
      const ndFill = analyzeCholesky(A, { ordering: 'nd' }).nnzL;
      expect(amdFill).toBeLessThan(A.n * (A.n + 1) / 8);
      expect(ndFill).toBeLessThan(A.n * (A.n + 1) / 8);
      expect([fnv1a(amd), amdFill]).toEqual(AMD_PINS[name]);
      expect([fnv1a(nd), ndFill]).toEqual(ND_PINS[name]);
    });
  }
  it('ND options on the 150×150 grid', () => {
    const g = adjacencyFromLower(CASES['grid 150×150 with diagonals']());
    for (const [opts, hash] of ND_OPTION_PINS) {
      const p = nestedDissection(g, opts);
      expect(isPermutation(p, g.n)).toBe(true);
      expect(fnv1a(p)).toBe(hash);
    }
  });
});
