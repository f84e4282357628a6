/**
 * Writers, colour ramp, format sniffing and the Node adapters (gzip reading,
 * atomic writes). Sources are named beside each check.
 */
import { describe, expect, it, afterAll } from 'vitest';
import { fc, test as fcTest } from '@fast-check/vitest';
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { OBJLoader } from 'three/examples/jsm/loaders/OBJLoader.js';
import type { BufferGeometry, Mesh, LineSegments } from 'three';
import { toCsv, writeVertexCsv } from '../../src/io/csv.js';
import { colorize, rampColor, NO_VALUE_RGB, RAMP_STOPS } from '../../src/io/colormap.js';
import { writeObj, writeObjPolyline } from '../../src/io/write-obj.js';
import { writePly } from '../../src/io/write-ply.js';
import { sniffMesh, parseMesh } from '../../src/io/sniff.js';
import { readMeshFile, readMeshFileSync } from '../../src/io/read-mesh.js';
import { writeFileAtomic, writeFileAtomicSync } from '../../src/io/atomic.js';
import { OrthodromeError } from '../../src/errors.js';

const dir = mkdtempSync(join(tmpdir(), 'orthodrome-io-test-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const dec = new TextDecoder();
const tri = { positions: Float64Array.from([512000.125, 4200000.5, 300.25, 512001, 4200000.5, 301, 512000.125, 4200001.75, 299]), faceOffsets: Uint32Array.from([0, 3]), faceIndices: Uint32Array.from([0, 1, 2]) };

async function inputErrorOf(p: Promise<unknown> | (() => unknown)): Promise<OrthodromeError> {
  try {
    if (typeof p === 'function') p();
    else await p;
  } catch (e) {
    expect(e).toBeInstanceOf(OrthodromeError);
    expect((e as OrthodromeError).code).toBe('INPUT');
    return e as OrthodromeError;
  }
  throw new Error('expected an INPUT error');
}

describe('CSV (RFC 4180 quoting; ECMA-262 Number::toString shortest round trip)', () => {
  it('quotes fields with commas, quotes and newlines; null and non-finite are empty', () => {
    expect(toCsv(['name', 'note'], [['a,b', 'say "hi"'], ['x\ny', null], [Infinity, NaN], [-0.5, 2]])).toBe(
      'name,note\n"a,b","say ""hi"""\n"x\ny",\n,\n-0.5,2\n',
    );
    expect(toCsv(['a'], [[1]], { newline: '\r\n' })).toBe('a\r\n1\r\n');
  });

  fcTest.prop([fc.array(fc.double(), { minLength: 1, maxLength: 50 })], { numRuns: 100 })('vertex columns read back exactly', (xs) => {
    const text = writeVertexCsv([{ name: 'vertex', values: xs.map((_, i) => i) }, { name: 'distance', values: Float64Array.from(xs) }]);
    const lines = text.split('\n');
    expect(lines[0]).toBe('vertex,distance');
    expect(lines.length).toBe(xs.length + 2);
    xs.forEach((x, i) => {
      const [id, d] = lines[i + 1]!.split(',');
      expect(Number(id)).toBe(i);
      if (Number.isFinite(x)) expect(Number(d)).toBe(x === 0 ? 0 : x);
      else expect(d).toBe('');
    });
  });

  it('refuses columns of different lengths', () => {
    expect(() => writeVertexCsv([{ name: 'a', values: [1, 2] }, { name: 'b', values: [1] }])).toThrow("column 'b' has 1 values, expected 2");
  });
});

describe('colour ramp', () => {
  // CIE 1976 L* from sRGB (IEC 61966-2-1 transfer curve, Rec. 709 luminance weights).
  const lin = (c: number) => (c / 255 <= 0.04045 ? c / 255 / 12.92 : ((c / 255 + 0.055) / 1.055) ** 2.4);
  const Lstar = (r: number, g: number, b: number) => {
    const Y = 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
    return Y > 216 / 24389 ? 116 * Math.cbrt(Y) - 16 : (Y * 24389) / 27;
  };

  it('lightness rises monotonically along the ramp (perceptual ordering)', () => {
    const c = new Uint8Array(3);
    let prev = -1;
    for (let k = 0; k <= 600; k++) {
      rampColor(k / 600, c);
      const L = Lstar(c[0]!, c[1]!, c[2]!);
      expect(L).toBeGreaterThanOrEqual(prev - 0.3); // 8-bit rounding
      prev = L;
    }
    rampColor(0, c);
    const first = Lstar(c[0]!, c[1]!, c[2]!);
    expect(prev - first).toBeGreaterThan(75);
  });

  it('maps min/max to the ends, clamps outside, greys out NaN and Infinity', () => {
    const out = colorize(Float64Array.from([5, 10, NaN, Infinity, -Infinity, 0, 20]), { min: 5, max: 10 });
    const at = (i: number) => Array.from(out.subarray(3 * i, 3 * i + 3));
    expect(at(0)).toEqual(RAMP_STOPS.slice(0, 3));
    expect(at(1)).toEqual(RAMP_STOPS.slice(-3));
    for (const i of [2, 3, 4]) expect(at(i)).toEqual([...NO_VALUE_RGB]);
    expect(at(5)).toEqual(at(0));
    expect(at(6)).toEqual(at(1));
    // no ramp colour is the no-value grey (every stop is chromatic)
    const c = new Uint8Array(3);
    for (let k = 0; k <= 100; k++) {
      rampColor(k / 100, c);
      expect(Math.max(c[0]!, c[1]!, c[2]!) - Math.min(c[0]!, c[1]!, c[2]!)).toBeGreaterThan(20);
    }
  });

  it('defaults to the finite data range; a constant field takes the start colour', () => {
    const out = colorize([3, Infinity, 7]);
    expect(Array.from(out.subarray(0, 3))).toEqual(RAMP_STOPS.slice(0, 3));
    expect(Array.from(out.subarray(6, 9))).toEqual(RAMP_STOPS.slice(-3));
    expect(Array.from(colorize([2, 2]).subarray(3, 6))).toEqual(RAMP_STOPS.slice(0, 3));
  });
});

describe('OBJ output read by three OBJLoader (general-purpose reference library)', () => {
  it('mesh: same triangle corners (float32)', () => {
    const group = new OBJLoader().parse(dec.decode(writeObj(tri)));
    const g = (group.children[0] as Mesh).geometry as BufferGeometry;
    expect(Array.from(g.getAttribute('position').array)).toEqual(Array.from(tri.positions, Math.fround));
  });

  it('polyline: v + l gives n − 1 segments through the points (Wavefront OBJ `l` statement)', () => {
    const pts = Float64Array.from([0, 0, 0, 1, 0, 0, 1, 1, 0, 2, 1, 0.5]);
    const text = dec.decode(writeObjPolyline(pts, 'ridge walk'));
    expect(text).toBe('o ridge_walk\nv 0 0 0\nv 1 0 0\nv 1 1 0\nv 2 1 0.5\nl 1 2 3 4\n');
    const line = new OBJLoader().parse(text).children[0] as LineSegments;
    expect(line.type).toBe('LineSegments');
    expect(Array.from(line.geometry.getAttribute('position').array)).toEqual([0, 0, 0, 1, 0, 0, 1, 0, 0, 1, 1, 0, 1, 1, 0, 2, 1, 0.5]);
    expect(() => writeObjPolyline(Float64Array.from([1, 2, 3]))).toThrow('at least 2 points');
  });
});

describe('sniffing (PLY magic line `ply`; gzip magic 1f 8b, RFC 1952)', () => {
  const enc = new TextEncoder();
  it('tells formats from bytes, uses the name only as a hint', () => {
    expect(sniffMesh(enc.encode('ply\nformat ascii 1.0\n'), 'x.obj')).toEqual({ format: 'ply', gzip: false });
    expect(sniffMesh(enc.encode('ply\r\n'), '')).toEqual({ format: 'ply', gzip: false });
    expect(sniffMesh(enc.encode('\n# scan\nv 1 2 3\n'), 'noext')).toEqual({ format: 'obj', gzip: false });
    expect(sniffMesh(enc.encode('mtllib a.mtl\n'), '')).toEqual({ format: 'obj', gzip: false });
    expect(sniffMesh(enc.encode('hello'), 'a.obj')).toEqual({ format: 'obj', gzip: false });
    expect(sniffMesh(enc.encode('hello'), 'a.bin')).toEqual({ format: 'unknown', gzip: false });
    expect(sniffMesh(gzipSync(enc.encode('v')), 'a.PLY.gz')).toEqual({ format: 'ply', gzip: true });
    expect(parseMesh(writePly({ ...tri }), 'no-extension').faceIndices.length).toBe(3);
  });
});

describe('readMeshFile (Node adapter)', () => {
  it('reads plain and gzip files, by magic bytes whatever the name', async () => {
    const obj = writeObj(tri);
    writeFileSync(join(dir, 'a.obj'), obj);
    writeFileSync(join(dir, 'a.obj.gz'), gzipSync(obj));
    writeFileSync(join(dir, 'b.ply.gz'), gzipSync(writePly(tri)));
    writeFileSync(join(dir, 'misnamed.obj'), gzipSync(writePly(tri)));
    for (const f of ['a.obj', 'a.obj.gz', 'b.ply.gz', 'misnamed.obj']) {
      const m = await readMeshFile(join(dir, f));
      expect(Array.from(m.positions), f).toEqual(Array.from(tri.positions));
      expect(Array.from(readMeshFileSync(join(dir, f)).faceIndices)).toEqual([0, 1, 2]);
    }
  });

  it('names the path in errors: missing file, directory, corrupt gzip, bad content', async () => {
    const missing = join(dir, 'nope.obj');
    expect((await inputErrorOf(readMeshFile(missing))).message).toBe(`${missing}: file not found`);
    expect((await inputErrorOf(() => readMeshFileSync(missing))).message).toBe(`${missing}: file not found`);
    expect((await inputErrorOf(readMeshFile(dir))).message).toBe(`${dir}: is a directory, not a file`);
    const bad = join(dir, 'bad.obj.gz');
    writeFileSync(bad, Uint8Array.from([0x1f, 0x8b, 8, 0, 0, 0, 0, 0, 0, 3, 1, 2, 3]));
    expect((await inputErrorOf(readMeshFile(bad))).message).toMatch(new RegExp(`^${bad.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}: corrupt gzip data`));
    const gzBad = join(dir, 'c.obj.gz');
    writeFileSync(gzBad, gzipSync(new TextEncoder().encode('v 0 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 7\n')));
    expect((await inputErrorOf(readMeshFile(gzBad))).message).toBe(`${gzBad}:4: vertex index 7 out of range (the file has 3 vertices)`);
  });
});

describe('writeFileAtomic (temp file + fsync + rename, POSIX rename(2) atomicity)', () => {
  it('writes bytes and strings, replaces an existing file, leaves no temp file', async () => {
    const p = join(dir, 'out', 'field.csv');
    mkdirSync(join(dir, 'out'));
    await writeFileAtomic(p, 'a,b\n1,2\n');
    expect(readFileSync(p, 'utf8')).toBe('a,b\n1,2\n');
    await writeFileAtomic(p, Uint8Array.from([65, 66]));
    expect(readFileSync(p, 'utf8')).toBe('AB');
    writeFileAtomicSync(p, 'sync');
    expect(readFileSync(p, 'utf8')).toBe('sync');
    expect(readdirSync(join(dir, 'out'))).toEqual(['field.csv']);
  });

  it('fails with INPUT naming the path and leaves neither the target nor a temp file', async () => {
    const noDir = join(dir, 'missing-folder', 'x.ply');
    expect((await inputErrorOf(writeFileAtomic(noDir, 'x'))).location).toBe(noDir);
    // target is a non-empty directory: the rename fails after the temp file was written
    const target = join(dir, 'occupied');
    mkdirSync(target);
    writeFileSync(join(target, 'keep'), 'k');
    expect((await inputErrorOf(writeFileAtomic(target, 'data'))).location).toBe(target);
    expect((await inputErrorOf(() => writeFileAtomicSync(target, 'data'))).location).toBe(target);
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
    expect(readdirSync(target)).toEqual(['keep']);
  });
});
