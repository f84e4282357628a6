/**
 * One mesh, every way of spelling it on disk, read to the same positions and
 * faces: OBJ, ascii PLY, binary PLY (little and big endian, float and double
 * coordinates), each gzip-compressed, with a UTF-8 byte-order mark, with CRLF
 * line ends (CR only for OBJ), and handed over as a view into a larger (pooled) buffer.
 *
 * Sources: the PLY format description (Turk, "The PLY Polygon File Format",
 * 1994: header grammar, binary scalar types and byte orders); the Wavefront
 * OBJ specification (`v`/`f` statements); RFC 1952 (gzip); the Unicode
 * Standard, section 23.8, and RFC 3629 section 6 (a UTF-8 BOM is EF BB BF and
 * is not part of the text); Node.js Buffer documentation (small buffers are
 * slices of a shared pool, so `.buffer` is not the data).
 */
import { describe, expect, it, afterAll } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { parseMesh } from '../../src/io/sniff.js';
import { parseObj } from '../../src/io/obj.js';
import { parsePly } from '../../src/io/ply.js';
import { writeObj } from '../../src/io/write-obj.js';
import { writePly } from '../../src/io/write-ply.js';
import { readMeshFile, readMeshFileSync, gunzipIfNeeded } from '../../src/io/read-mesh.js';
import type { MeshData } from '../../src/io/mesh-data.js';
import { terrain } from '../fixtures/shapes.js';

const dir = mkdtempSync(join(tmpdir(), 'orthodrome-spellings-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/**
 * A bumpy 69 × 69-cell grid (4,900 vertices, like the reported 4,800-vertex
 * file) whose coordinates are multiples of 1/64 below 2^10, so every value
 * is exact in float32 as well as float64 (24-bit significand, IEEE 754).
 */
function mesh(): MeshData {
  const s = terrain(69, 69, 69, 69, (x, y) => Math.round(64 * (3 * Math.sin(x / 7) * Math.cos(y / 5))) / 64);
  for (let i = 0; i < s.positions.length; i++) s.positions[i] = Math.round(s.positions[i]! * 64) / 64 + (i % 3 === 0 ? 512 : 0);
  const nf = s.triangles.length / 3;
  return {
    positions: s.positions,
    faceOffsets: Uint32Array.from({ length: nf + 1 }, (_, f) => 3 * f),
    faceIndices: s.triangles,
    vertexProps: [],
    faceProps: [],
    name: 'grid',
  };
}

/** Binary PLY with `float` (4-byte) coordinates, written here by hand from the format description. */
function plyFloat(m: MeshData, little: boolean): Uint8Array {
  const nv = m.positions.length / 3, nf = m.faceOffsets.length - 1;
  const head = new TextEncoder().encode(
    `ply\nformat binary_${little ? 'little' : 'big'}_endian 1.0\nelement vertex ${nv}\nproperty float x\nproperty float y\nproperty float z\nelement face ${nf}\nproperty list uchar int vertex_indices\nend_header\n`,
  );
  const out = new Uint8Array(head.length + 12 * nv + 13 * nf);
  out.set(head);
  const dv = new DataView(out.buffer);
  let o = head.length;
  for (let i = 0; i < 3 * nv; i++, o += 4) dv.setFloat32(o, m.positions[i]!, little);
  for (let f = 0; f < nf; f++) {
    dv.setUint8(o++, 3);
    for (let k = 0; k < 3; k++, o += 4) dv.setInt32(o, m.faceIndices[3 * f + k]!, little);
  }
  return out;
}

const crlf = (b: Uint8Array): Uint8Array => new TextEncoder().encode(new TextDecoder('latin1').decode(b).replace(/\n/g, '\r\n'));
const bom = (b: Uint8Array): Uint8Array => Uint8Array.from([0xef, 0xbb, 0xbf, ...b]);
/** `b` as a view at an odd offset inside a larger buffer full of other bytes. */
function embedded(b: Uint8Array): Uint8Array {
  const big = Buffer.alloc(b.length + 40, 0x7f);
  big.set(b, 13);
  return big.subarray(13, 13 + b.length);
}
/** The PLY header (up to and including `end_header\n`) with CRLF line ends; the body untouched. */
function crlfHeader(b: Uint8Array): Uint8Array {
  const end = Buffer.from(b).indexOf('end_header\n') + 'end_header\n'.length;
  return Uint8Array.from([...crlf(b.subarray(0, end)), ...b.subarray(end)]);
}

const M = mesh();
const spellings: [string, Uint8Array][] = [];
{
  const base: [string, Uint8Array][] = [
    ['mesh.obj', writeObj(M)],
    ['mesh.ply', writePly(M, { format: 'ascii' })],
    ['mesh.ply', writePly(M, { format: 'binary' })],
    ['mesh.ply', writePly(M, { format: 'binary', littleEndian: false })],
    ['mesh.ply', plyFloat(M, true)],
    ['mesh.ply', plyFloat(M, false)],
  ];
  for (const [name, b] of base) {
    const text = name.endsWith('.obj') || b.indexOf(0) < 0;
    spellings.push([name, b], [name, bom(b)], [name, embedded(b)], [`${name}.gz`, gzipSync(b)], [`${name}.gz`, gzipSync(bom(b))]);
    spellings.push([name, text ? crlf(b) : crlfHeader(b)]);
    // CR-only line ends (classic Mac OS text), OBJ only.
    if (name.endsWith('.obj')) spellings.push([name, b.map((c) => (c === 10 ? 13 : c))]);
  }
}

function expectSame(m: MeshData): void {
  // Exact equality: every coordinate is exact in both float widths (see mesh()).
  expect(m.positions.length).toBe(M.positions.length);
  expect(Array.from(m.positions)).toEqual(Array.from(M.positions));
  expect(Array.from(m.faceOffsets)).toEqual(Array.from(M.faceOffsets));
  expect(Array.from(m.faceIndices)).toEqual(Array.from(M.faceIndices));
}

describe('every spelling of one mesh reads alike', () => {
  it.each(spellings.map(([n, b], i) => [i, n, b] as const))('spelling %i (%s) in memory', (_i, name, bytes) => {
    expectSame(parseMesh(gunzipIfNeeded(bytes, name), name));
  });

  it('every spelling read from disk, async and sync', async () => {
    for (const [i, [name, bytes]] of spellings.entries()) {
      const path = join(dir, `${i}-${name}`);
      writeFileSync(path, bytes);
      expectSame(await readMeshFile(path));
      expectSame(readMeshFileSync(path));
    }
  });

  it('binary double PLY in a small pooled Node Buffer (Buffer.from copies small data into the shared pool)', () => {
    const tiny: MeshData = {
      positions: Float64Array.from([0.5, -1.25, 3, 2, 0, 1e-300, 1, 7.75, -2]),
      faceOffsets: Uint32Array.from([0, 3]),
      faceIndices: Uint32Array.from([0, 1, 2]),
      vertexProps: [],
      faceProps: [],
      name: 'tiny',
    };
    for (const littleEndian of [true, false]) {
      // Allocate something first so the pool offset is not 0 or a multiple of 8.
      Buffer.from('xyz');
      const pooled = Buffer.from(writePly(tiny, { format: 'binary', littleEndian }));
      expect(pooled.buffer.byteLength).toBeGreaterThan(pooled.length); // precondition: really a pool slice
      const m = parsePly(pooled, 'tiny.ply');
      expect(Array.from(m.positions)).toEqual(Array.from(tiny.positions));
      expect(Array.from(m.faceIndices)).toEqual([0, 1, 2]);
    }
  });

  it('a BOM before OBJ does not drop the first vertex (indices would shift by one)', () => {
    const text = 'v 0 0 0\nv 1 0 0\nv 0 1 0\nv 5 5 5\nf 1 2 3\n';
    const plain = parseObj(new TextEncoder().encode(text), 'a.obj');
    const marked = parseObj(bom(new TextEncoder().encode(text)), 'a.obj');
    expect(Array.from(marked.positions)).toEqual(Array.from(plain.positions));
    expect(Array.from(marked.positions.subarray(0, 3))).toEqual([0, 0, 0]);
    expect(Array.from(marked.faceIndices)).toEqual([0, 1, 2]);
    // A message after the BOM keeps its line number (the mark is not a line).
    expect(() => parseObj(bom(new TextEncoder().encode('v 0 0 0\nv 1 0 0\nf 1 2 9\n')), 'b.obj')).toThrow('b.obj:3: vertex index 9 out of range');
  });

  it('UTF-16 text is refused with a one-line INPUT error naming the file', () => {
    const utf16 = Uint8Array.from([0xff, 0xfe, ...Array.from(new TextEncoder().encode('v 0 0 0\n'), (c) => [c, 0]).flat()]);
    expect(() => parseMesh(utf16, 'w.obj')).toThrow(/^w\.obj: UTF-16 text is not supported/);
  });
});
