/**
 * STL reading and welding, checked against outside facts:
 * - the STL layout (80-byte header, uint32 facet count, 50 bytes per facet;
 *   ASCII `solid`/`facet normal`/`outer loop`/`vertex`/`endloop`/`endfacet`/
 *   `endsolid`): the common description of the format, from memory;
 * - a closed cube: Euler characteristic V − E + F = 8 − 18 + 12 = 2 (Euler's
 *   polyhedron formula), 8 vertices from 36 facet corners;
 * - geodesic distances on the unit cube from a corner (closed forms by
 *   unfolding): 1 along an edge, √2 across a face, √5 to the opposite corner
 *   (two faces unfolded into a 1 × 2 rectangle);
 * - the same cube read from OBJ gives the same distances (the OBJ path is
 *   checked against closed forms in its own suites);
 * - welding against its definition (io/weld.ts: each point joins the
 *   nearest earlier kept vertex within the tolerance, ties to the lower
 *   index), computed by brute force over all pairs.
 */
import { describe, expect, it } from 'vitest';
import { fc, test as fcTest } from '@fast-check/vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { parseStl, isBinaryStl, looksLikeAsciiStl } from '../../src/io/stl.js';
import { parseMesh, sniffMesh } from '../../src/io/sniff.js';
import { readMeshFile } from '../../src/io/read-mesh.js';
import { weldPoints, NEAR_FACTOR, WELD_RELATIVE_TOLERANCE } from '../../src/io/weld.js';
import { openSurface, inspectSurface, measureDistances, isOrthodromeError } from '../../src/index.js';
import { objText } from '../fixtures/shapes.js';
import { runCli } from '../cli/run-cli.js';

type P3 = [number, number, number];
type Facet = { n: P3; v: [P3, P3, P3] };

/** Unit cube corners: vertex i has x = bit 0, y = bit 1, z = bit 2. */
const CUBE_POS: P3[] = Array.from({ length: 8 }, (_, i) => [i & 1, (i >> 1) & 1, (i >> 2) & 1] as P3);
/** Two triangles per side, counter-clockwise seen from outside. */
const CUBE_TRIS = [
  [0, 2, 3], [0, 3, 1], // z = 0
  [4, 5, 7], [4, 7, 6], // z = 1
  [0, 1, 5], [0, 5, 4], // y = 0
  [2, 6, 7], [2, 7, 3], // y = 1
  [0, 4, 6], [0, 6, 2], // x = 0
  [1, 3, 7], [1, 7, 5], // x = 1
];

function cross(a: P3, b: P3, c: P3): P3 {
  const u = [b[0] - a[0], b[1] - a[1], b[2] - a[2]], v = [c[0] - a[0], c[1] - a[1], c[2] - a[2]];
  return [u[1]! * v[2]! - u[2]! * v[1]!, u[2]! * v[0]! - u[0]! * v[2]!, u[0]! * v[1]! - u[1]! * v[0]!];
}

/** The cube's facets with outward unit normals (the cross product of the winding, normalised). */
function cubeFacets(): Facet[] {
  return CUBE_TRIS.map(([a, b, c]) => {
    const v: [P3, P3, P3] = [CUBE_POS[a!]!, CUBE_POS[b!]!, CUBE_POS[c!]!];
    const w = cross(...v);
    const l = Math.hypot(...w);
    return { n: [w[0] / l, w[1] / l, w[2] / l], v };
  });
}

/** Binary STL bytes (little-endian float32), with the given 80-byte header text. */
function binaryStl(facets: Facet[], header = 'orthodrome test part', count = facets.length): Uint8Array {
  const out = new Uint8Array(84 + 50 * facets.length);
  out.set(new TextEncoder().encode(header.padEnd(80, ' ').slice(0, 80)));
  const dv = new DataView(out.buffer);
  dv.setUint32(80, count, true);
  facets.forEach((f, i) => {
    const o = 84 + 50 * i;
    f.n.forEach((x, k) => dv.setFloat32(o + 4 * k, x, true));
    f.v.forEach((p, j) => p.forEach((x, k) => dv.setFloat32(o + 12 + 12 * j + 4 * k, x, true)));
  });
  return out;
}

/** ASCII STL text; `eol` and `indent` vary the whitespace, `upper` the keyword case. */
function asciiStl(facets: Facet[], o: { eol?: string; indent?: string; upper?: boolean; name?: string } = {}): string {
  const eol = o.eol ?? '\n', ind = o.indent ?? '  ';
  const k = (s: string) => (o.upper ? s.toUpperCase() : s);
  const L = [`${k('solid')} ${o.name ?? 'px7 bracket'}`];
  for (const f of facets) {
    L.push(`${ind}${k('facet normal')} ${f.n.join(' ')}`, `${ind}${ind}${k('outer loop')}`);
    for (const p of f.v) L.push(`${ind}${ind}${ind}${k('vertex')}   ${p.join('\t ')}`);
    L.push(`${ind}${ind}${k('endloop')}`, `${ind}${k('endfacet')}`);
  }
  L.push(`${k('endsolid')} ${o.name ?? 'px7 bracket'}`);
  return L.join(eol) + eol;
}

function cubeObj(): string {
  return objText({ positions: Float64Array.from(CUBE_POS.flat()), triangles: Uint32Array.from(CUBE_TRIS.flat()) });
}

/** The INPUT error thrown by fn, or fail. */
function inputErr(fn: () => unknown): { code: string; message: string } {
  try {
    fn();
  } catch (e) {
    if (isOrthodromeError(e)) return { code: e.code, message: e.message };
    throw e;
  }
  throw new Error('expected an error');
}

describe('binary and ASCII STL cube', () => {
  const facets = cubeFacets();
  it('the fixture is wound outward (normal · (centroid − centre) > 0)', () => {
    for (const f of facets) {
      const c = [0, 1, 2].map((k) => (f.v[0][k]! + f.v[1][k]! + f.v[2][k]!) / 3 - 0.5);
      expect(f.n[0] * c[0]! + f.n[1] * c[1]! + f.n[2] * c[2]!).toBeGreaterThan(0);
    }
  });

  const variants: [string, Uint8Array][] = [
    ['binary', binaryStl(facets)],
    ['binary with a header starting "solid"', binaryStl(facets, 'solid cube exported as binary')],
    ['ASCII', new TextEncoder().encode(asciiStl(facets))],
    ['ASCII, CRLF, tabs, upper case', new TextEncoder().encode(asciiStl(facets, { eol: '\r\n', indent: '\t \t', upper: true }))],
    ['ASCII with blank lines, no name, BOM', new TextEncoder().encode('\ufeff' + asciiStl(facets, { eol: '\n\n', name: '' }))],
    ['ASCII with a UTF-8 solid name', new TextEncoder().encode(asciiStl(facets, { name: 'Träger PX-7 Ø12' }))],
    ['ASCII, two solids one after the other', new TextEncoder().encode(asciiStl(facets.slice(0, 5), { name: 'a' }) + asciiStl(facets.slice(5), { name: 'b' }))],
  ];
  for (const [label, bytes] of variants) {
    it(`${label}: welds to 8 vertices, χ = 2, no boundary, normals agree`, () => {
      expect(sniffMesh(bytes, 'part.bin').format).toBe('stl');
      const m = parseMesh(bytes, 'cube.stl');
      expect(m.positions.length / 3).toBe(8);
      expect(m.stl).toMatchObject({ facets: 12, mergedVertices: 36 - 8, nearPairs: 0, normalsDisagreeing: 0, normalsUnchecked: 0 });
      expect(m.stl!.encoding).toBe(label.startsWith('binary') ? 'binary' : 'ascii');
      // default tolerance: 1e-9 × the diagonal √3
      expect(m.stl!.weldTolerance).toBeCloseTo(WELD_RELATIVE_TOLERANCE * Math.sqrt(3), 20);
      const r = inspectSurface(openSurface(bytes, 'cube.stl'));
      expect(r.stl).toEqual(m.stl);
      expect(r.eulerCharacteristic).toBe(2);
      expect(r.boundaryLoops).toBe(0);
      expect(r.edges).toBe(18);
      expect(r.flippedFaces).toBe(0);
    });
  }

  it('distances from a corner equal the OBJ cube\'s and the closed forms 1, √2, √5', () => {
    const stl = openSurface(binaryStl(facets), 'cube.stl');
    const obj = openSurface(new TextEncoder().encode(cubeObj()), 'cube.obj');
    const pos = (s: typeof stl, v: number) => [0, 1, 2].map((k) => s.positions[3 * v + k]!).join(',');
    const at = (s: typeof stl, key: string) => [...Array(s.topology.nv).keys()].find((v) => pos(s, v) === key)!;
    const src = (s: typeof stl) => ({ points: [{ kind: 'vertex' as const, vertex: at(s, '0,0,0') }], curves: [] });
    const ds = measureDistances(stl, src(stl), { method: 'exact' }).field.distance;
    const dobj = measureDistances(obj, src(obj), { method: 'exact' }).field.distance;
    for (let i = 0; i < 8; i++) {
      const key = CUBE_POS[i]!.join(',');
      const ones = CUBE_POS[i]!.reduce((a, b) => a + b, 0);
      const closed = [0, 1, Math.SQRT2, Math.sqrt(5)][ones]!;
      expect(Math.abs(ds[at(stl, key)]! - dobj[at(obj, key)]!)).toBeLessThan(1e-12);
      expect(Math.abs(ds[at(stl, key)]! - closed)).toBeLessThan(1e-12);
    }
  });

  it('.stl.gz is read through the file reader like the plain file', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'orthodrome-stl-'));
    try {
      const bytes = binaryStl(facets);
      writeFileSync(join(dir, 'cube.stl.gz'), gzipSync(bytes));
      writeFileSync(join(dir, 'cube-misnamed.bin'), gzipSync(new TextEncoder().encode(asciiStl(facets))));
      for (const f of ['cube.stl.gz', 'cube-misnamed.bin']) {
        const m = await readMeshFile(join(dir, f));
        expect(m.positions.length / 3).toBe(8);
        expect(m.stl!.facets).toBe(12);
      }
      const m = await readMeshFile(join(dir, 'cube.stl.gz'), { weldTolerance: 0 });
      expect(m.stl!.weldTolerance).toBe(0);
      expect(m.positions.length / 3).toBe(8); // exact copies weld at tolerance 0
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('the command on STL (exit codes: 0 done, 2 bad input or usage; common practice of this CLI, cli/run.ts)', () => {
  it('inspect reports the weld; a truncated file and a negative tolerance exit 2 with one line', () => {
    const dir = mkdtempSync(join(tmpdir(), 'orthodrome-stl-cli-'));
    try {
      const bytes = binaryStl(cubeFacets(), 'solid cube');
      writeFileSync(join(dir, 'cube.stl'), bytes);
      writeFileSync(join(dir, 'cut.stl'), bytes.subarray(0, 300));
      const ok = runCli(['inspect', join(dir, 'cube.stl'), '--json', '--weld-tolerance', '0.001']);
      expect(ok.code).toBe(0);
      const r = JSON.parse(ok.stdout);
      expect(r.stl).toMatchObject({ encoding: 'binary', facets: 12, mergedVertices: 28, weldTolerance: 0.001 });
      expect(r.eulerCharacteristic).toBe(2);
      const cut = runCli(['inspect', join(dir, 'cut.stl')]);
      expect(cut.code).toBe(2);
      expect(cut.stderr.trim().split('\n')).toHaveLength(1);
      expect(cut.stderr).toContain(`${join(dir, 'cut.stl')}: facet 4: binary STL truncated`);
      const neg = runCli(['inspect', join(dir, 'cube.stl'), '--weld-tolerance', '-1']);
      expect(neg.code).toBe(2);
      expect(neg.stderr).toContain("--weld-tolerance must be a length ≥ 0 in mesh units, got '-1'");
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('near-coincident corners', () => {
  it('a copy 1e-7 away stays apart at the default tolerance, is reported, and welds at a larger one', () => {
    const facets = cubeFacets();
    // move one copy of corner (1,1,1) by 1e-7 × the diagonal along x (float64 ASCII keeps it exactly enough)
    const d = 1e-7 * Math.sqrt(3);
    const f = facets.findIndex((t) => t.v.some((p) => p.join() === '1,1,1'));
    const j = facets[f]!.v.findIndex((p) => p.join() === '1,1,1');
    facets[f]!.v[j] = [1 + d, 1, 1];
    const bytes = new TextEncoder().encode(asciiStl(facets));
    const m = parseMesh(bytes, 'gap.stl');
    expect(m.positions.length / 3).toBe(9);
    expect(m.stl!.nearPairs).toBe(1);
    // the bounding box grew by d along x
    expect(m.stl!.nearPairRadius).toBeCloseTo(NEAR_FACTOR * WELD_RELATIVE_TOLERANCE * Math.hypot(1 + d, 1, 1), 20);
    expect(Math.abs(m.stl!.firstNearPair!.distance - d)).toBeLessThan(1e-15);
    // the open seam shows as boundary: the cube is no longer closed
    const r = inspectSurface(openSurface(bytes, 'gap.stl'));
    expect(r.boundaryLoops).toBeGreaterThan(0);
    const welded = parseMesh(bytes, 'gap.stl', { weldTolerance: 2 * d });
    expect(welded.positions.length / 3).toBe(8);
    expect(welded.stl!.nearPairs).toBe(0);
    expect(inspectSurface(openSurface(welded)).eulerCharacteristic).toBe(2);
  });
});

describe('stored normals as a check', () => {
  it('counts facets whose normal points against the winding, and zero normals as unchecked', () => {
    const facets = cubeFacets();
    facets[5]!.n = [-facets[5]!.n[0], -facets[5]!.n[1], -facets[5]!.n[2]];
    facets[7]!.n = [0, 0, 0];
    const m = parseStl(binaryStl(facets), 'flipped.stl');
    expect(m.stl).toMatchObject({ normalsDisagreeing: 1, firstNormalDisagreeing: 5, normalsUnchecked: 1 });
    // the geometry is unaffected: winding decides orientation
    expect(inspectSurface(openSurface(m)).eulerCharacteristic).toBe(2);
  });
});

describe('bad STL input: one INPUT error naming the file and where', () => {
  const good = binaryStl(cubeFacets());
  it('truncated binary names the facet it ends in', () => {
    const e = inputErr(() => parseMesh(good.subarray(0, 84 + 50 * 7 + 20), 'cut.stl'));
    expect(e.code).toBe('INPUT');
    expect(e.message).toMatch(/^cut\.stl: facet 7: binary STL truncated: the header declares 12 facets/);
  });
  it('truncated binary whose header starts with "solid" is still reported as a truncated binary', () => {
    const b = binaryStl(cubeFacets(), 'solid part');
    const e = inputErr(() => parseMesh(b.subarray(0, b.length - 10), 'cut.dat'));
    expect(e.message).toMatch(/^cut\.dat: facet 11: binary STL truncated/);
  });
  it('trailing bytes after the declared facets', () => {
    const b = new Uint8Array(good.length + 3);
    b.set(good);
    expect(inputErr(() => parseMesh(b, 'pad.stl')).message).toMatch(/^pad\.stl: binary STL has 3 bytes after the 12 facets/);
  });
  it('empty file and header-only file', () => {
    expect(inputErr(() => parseMesh(new Uint8Array(0), 'empty.stl')).message).toBe('empty.stl: empty file');
    expect(inputErr(() => parseMesh(binaryStl([]), 'none.stl')).message).toBe('none.stl: no facets');
    expect(inputErr(() => parseMesh(new TextEncoder().encode('solid x\nendsolid x\n'), 'none.stl')).message).toBe('none.stl: no facets');
  });
  it('NaN coordinates: binary names the facet, ASCII the line', () => {
    const f = cubeFacets();
    f[3]!.v[1] = [NaN, 0, 0];
    expect(inputErr(() => parseMesh(binaryStl(f), 'nan.stl')).message).toBe('nan.stl: facet 3: non-finite vertex coordinate NaN');
    // "vertex   NaN\t 0\t 0": after the solid line and 3 facets of 7 lines, facet 3's second vertex is its 4th line
    const text = asciiStl(f);
    const e = inputErr(() => parseMesh(new TextEncoder().encode(text), 'nan.stl'));
    expect(e.code).toBe('INPUT');
    expect(e.message).toBe(`nan.stl:${1 + 3 * 7 + 4}: non-finite vertex coordinate NaN (facet 3)`);
  });
  it('ASCII: missing endsolid, a 4-vertex facet, a misspelt keyword', () => {
    const t = asciiStl(cubeFacets());
    const cut = t.slice(0, t.indexOf('endsolid'));
    expect(inputErr(() => parseMesh(new TextEncoder().encode(cut), 'cut.stl')).message).toMatch(/^cut\.stl:\d+: file ends without 'endsolid'/);
    const quad = t.replace('endloop', 'vertex 0 0 0\n endloop');
    expect(inputErr(() => parseMesh(new TextEncoder().encode(quad), 'quad.stl')).message).toBe('quad.stl:7: facet has more than 3 vertices (STL facets are triangles) (facet 0)');
    const typo = t.replace('outer loop', 'outer lop');
    expect(inputErr(() => parseMesh(new TextEncoder().encode(typo), 'typo.stl')).message).toBe("typo.stl:3: expected 'loop', found 'lop' (facet 0)");
  });
  it('a negative or non-finite weld tolerance is a USAGE error', () => {
    for (const t of [-1, NaN, Infinity]) expect(inputErr(() => parseStl(good, 'c.stl', { weldTolerance: t })).code).toBe('USAGE');
  });
  it('sniffing: the size rule and the solid keyword, not the name', () => {
    expect(isBinaryStl(good)).toBe(true);
    expect(looksLikeAsciiStl(good)).toBe(false);
    expect(looksLikeAsciiStl(new TextEncoder().encode(' \r\n solid\n'))).toBe(true);
    expect(sniffMesh(new TextEncoder().encode('v 0 0 0\n'), 'x.stl').format).toBe('obj');
    expect(sniffMesh(good, 'x.obj').format).toBe('stl');
  });
});

/** Welding by definition: each point joins the nearest earlier kept vertex within r (ties to the lower index). */
function bruteWeld(p: Float64Array, r: number): { index: number[]; kept: number[] } {
  const kept: number[] = [], index: number[] = [];
  for (let i = 0; i < p.length / 3; i++) {
    let best = -1, bestD = Infinity;
    kept.forEach((k, v) => {
      const d = Math.hypot(p[3 * k]! - p[3 * i]!, p[3 * k + 1]! - p[3 * i + 1]!, p[3 * k + 2]! - p[3 * i + 2]!);
      if (d <= r && d < bestD) {
        best = v;
        bestD = d;
      }
    });
    if (best < 0) {
      best = kept.length;
      kept.push(i);
    }
    index.push(best);
  }
  return { index, kept };
}

describe('weldPoints against the definition (brute force over all pairs)', () => {
  fcTest.prop([
    fc.array(fc.tuple(fc.integer({ min: 0, max: 5 }), fc.integer({ min: 0, max: 5 }), fc.integer({ min: 0, max: 5 })), { minLength: 1, maxLength: 12 }),
    fc.array(fc.tuple(fc.nat(), fc.double({ min: -1.5, max: 1.5, noNaN: true }), fc.nat(2)), { maxLength: 60 }),
    fc.double({ min: 0.01, max: 0.3, noNaN: true }),
  ], { numRuns: 300 })('same vertices, same index, same near pairs', (bases, copies, r) => {
    // base points on a coarse lattice near 1000 (an offset origin), copies jittered by up to 1.5 r along one axis
    const pts: number[] = bases.flatMap(([x, y, z]) => [1000 + 0.37 * x, -20 + 0.41 * y, 3 + 0.43 * z]);
    for (const [which, t, axis] of copies) {
      const b = (which % bases.length) * 3;
      const q = [pts[b]!, pts[b + 1]!, pts[b + 2]!];
      q[axis]! += t * r;
      pts.push(...q);
    }
    const p = Float64Array.from(pts);
    const w = weldPoints(p, r);
    const ref = bruteWeld(p, r);
    expect(Array.from(w.index)).toEqual(ref.index);
    expect(w.merged).toBe(p.length / 3 - ref.kept.length);
    let near = 0;
    const R = NEAR_FACTOR * r;
    for (let a = 0; a < ref.kept.length; a++) {
      for (let b = a + 1; b < ref.kept.length; b++) {
        const i = ref.kept[a]!, j = ref.kept[b]!;
        const d = Math.hypot(p[3 * i]! - p[3 * j]!, p[3 * i + 1]! - p[3 * j + 1]!, p[3 * i + 2]! - p[3 * j + 2]!);
        if (d > r && d <= R) near++;
      }
    }
    expect(w.nearPairs).toBe(near);
  });
});
