/**
 * Catalogue of bad mesh files and the exact message each one gets. What is
 * "bad" follows the published Wavefront OBJ description (indices start at 1,
 * negative ones count back from the latest vertex) and the PLY polygon format
 * description (header grammar, type names, element counts, typed bodies);
 * the wording and locations (`file:line`, `file: header line N`,
 * `file: vertex I`, `file: face I`, 0-based items) are this project's own.
 */
import { describe, expect, it } from 'vitest';
import { parseMesh } from '../../src/io/sniff.js';
import { OrthodromeError } from '../../src/errors.js';

const enc = new TextEncoder();
const TRI = 'v 0 0 0\nv 1 0 0\nv 0 1 0\n';
const plyAscii = (body: string[], vertexCount = 3) =>
  ['ply', 'format ascii 1.0', `element vertex ${vertexCount}`, 'property float x', 'property float y', 'property float z',
    'element face 1', 'property list uchar int vertex_indices', 'end_header', ...body].join('\n') + '\n';
const HEAD_BIN = ['ply', 'format binary_little_endian 1.0', 'element vertex 3', 'property float x', 'property float y', 'property float z',
  'element face 1', 'property list uchar int vertex_indices', 'end_header', ''].join('\n');

/** A binary little-endian triangle with vertex 1's y replaced and the face list given. */
function plyBinary(y1: number, face: number[], cut = 0): Uint8Array {
  const h = enc.encode(HEAD_BIN);
  const out = new Uint8Array(h.length + 36 + 1 + 4 * (face.length - 1));
  out.set(h);
  const dv = new DataView(out.buffer);
  const v = [0, 0, 0, 1, y1, 0, 0, 1, 0];
  v.forEach((x, i) => dv.setFloat32(h.length + 4 * i, x, true));
  dv.setUint8(h.length + 36, face[0]!);
  face.slice(1).forEach((x, i) => dv.setInt32(h.length + 37 + 4 * i, x, true));
  return out.subarray(0, out.length - cut);
}

const CASES: [string, string | Uint8Array, string][] = [
  // OBJ
  ['hill.obj', TRI + 'f 1 2 0\n', 'hill.obj:4: vertex index 0 (OBJ indices start at 1)'],
  ['hill.obj', TRI + 'f 1 2 4\n', 'hill.obj:4: vertex index 4 out of range (the file has 3 vertices)'],
  ['hill.obj', TRI + 'f 1 2 99999999999999999999\n', "hill.obj:4: vertex index '99999999999999999999' out of range"],
  ['hill.obj', TRI + 'f 1 2 -4\n', 'hill.obj:4: relative vertex index -4 reaches before the first vertex (3 so far)'],
  ['hill.obj', 'v 0 0 0\nv 1 0 0\nv 0 1 nan\nf 1 2 3\n', "hill.obj:3: non-finite coordinate 'nan'"],
  ['hill.obj', 'v 0 0 0\nv 1 0 -inf\nv 0 1 0\nf 1 2 3\n', "hill.obj:2: non-finite coordinate '-inf'"],
  ['hill.obj', 'v 0 0 0\nv 1 0 1e400\nv 0 1 0\nf 1 2 3\n', "hill.obj:2: non-finite coordinate '1e400'"],
  ['hill.obj', 'v 0 0 0\nv 1 0 1.2.3\nv 0 1 0\nf 1 2 3\n', "hill.obj:2: malformed number '1.2.3'"],
  ['hill.obj', 'v . 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 3\n', "hill.obj:1: malformed number '.'"],
  ['hill.obj', 'v -. 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 3\n', "hill.obj:1: malformed number '-.'"],
  ['hill.obj', 'v 0 0 0\nv 1,5 0 0\nv 0 1 0\nf 1 2 3\n', "hill.obj:2: malformed number '1,5'"],
  ['hill.obj', 'v 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 3\n', 'hill.obj:1: vertex has 2 numbers (expected 3, 4 or 6)'],
  ['hill.obj', TRI + 'f 1 2\n', 'hill.obj:4: face has 2 vertices (at least 3 needed)'],
  ['hill.obj', TRI + 'f\n', 'hill.obj:4: face has 0 vertices (at least 3 needed)'],
  ['hill.obj', TRI + 'f 1 2 3x\n', "hill.obj:4: malformed face corner '3x'"],
  ['hill.obj', TRI + 'f 1 2 /3\n', "hill.obj:4: malformed vertex index '/3'"],
  ['hill.obj', '# only a comment\n', 'hill.obj: no vertices'],
  ['hill.obj', TRI, 'hill.obj: no faces'],
  ['hill.obj', '', 'hill.obj: no vertices'],
  // PLY header
  ['part.ply', 'ply\nformat ascii 1.0\nelement vertex 3\nproperty float128 x\nend_header\n', "part.ply: header line 4: unknown property type 'float128'"],
  ['part.ply', 'ply\nformat ascii 1.0\nelement vertex 3\nproperty list float int idx\nend_header\n', "part.ply: header line 4: list count type 'float' is not an integer type"],
  ['part.ply', 'ply\nformat ascii 1.0\nelement vertex 3\nproperty float x\n', 'part.ply: header line 5: missing end_header'],
  ['part.ply', 'ply\nformat ascii 1.0\ncomment ' + 'x'.repeat(5000) + '\nend_header\n', 'part.ply: header line 3: header line longer than 4096 bytes (missing end_header?)'],
  ['part.ply', 'ply\nformat ascii 2.0\nend_header\n', "part.ply: header line 2: unsupported PLY version '2.0'"],
  ['part.ply', 'ply\nformat text 1.0\nend_header\n', "part.ply: header line 2: unknown format 'text'"],
  ['part.ply', 'ply\nelement vertex 3\nend_header\n', 'part.ply: header: no format line'],
  ['part.ply', 'ply\nformat ascii 1.0\nproperty float x\nend_header\n', 'part.ply: header line 3: property before any element'],
  ['part.ply', 'ply\nformat ascii 1.0\nelement vertex -3\nend_header\n', "part.ply: header line 3: malformed element line 'element vertex -3'"],
  ['part.ply', 'ply\nformat ascii 1.0\nelemnt vertex 3\nend_header\n', "part.ply: header line 3: unknown header keyword 'elemnt'"],
  ['part.ply', 'ply\nformat ascii 1.0\nelement vertex 0\nproperty float x\nend_header\n', 'part.ply: no vertices'],
  ['part.ply', 'ply\nformat ascii 1.0\nelement vertex 1\nproperty float x\nproperty float y\nproperty float z\nend_header\n0 0 0\n', 'part.ply: no faces'],
  ['part.ply', 'ply\nformat ascii 1.0\nelement vertex 1\nproperty float x\nproperty float y\nelement face 1\nproperty list uchar int vertex_indices\nend_header\n0 0\n3 0 0 0\n', "part.ply: header line 3: vertex element has no scalar 'z'"],
  ['part.ply', 'ply\nformat ascii 1.0\nelement vertex 1\nproperty float x\nproperty float y\nproperty float z\nelement face 1\nproperty list uchar int corners\nend_header\n0 0 0\n3 0 0 0\n', 'part.ply: header line 7: face element has no vertex_indices list'],
  // PLY counts that the file cannot hold: fail before allocating
  ['part.ply', HEAD_BIN.replace('element vertex 3', 'element vertex 4000000000') + 'x'.repeat(100), "part.ply: header line 3: element 'vertex' declares 4000000000 items but the rest of the file can hold at most 8"],
  ['part.ply', plyAscii(['0 0 0', '1 0 0', '0 1 0', '3 0 1 2'], 4294967295), "part.ply: header line 3: element 'vertex' declares 4294967295 items but the rest of the file can hold at most 4"],
  ['part.ply', plyAscii(['0 0 0', '1 0 0', '0 1 0']), "part.ply: header line 7: element 'face' declares 1 item but the rest of the file can hold at most 0"],
  // PLY bodies
  ['part.ply', plyAscii(['0 0 0', '1 0 0', '0 1 0', '3 0 1 9']), 'part.ply: face 0: vertex index 9 out of range (the file has 3 vertices)'],
  ['part.ply', plyAscii(['0 0 0', '1 0 0', '0 1 0', '3 0 1 -1']), 'part.ply: face 0: vertex index -1 out of range (the file has 3 vertices)'],
  ['part.ply', plyAscii(['0 0 0', '1 0 0', '0 1 0', '3 0 1 1.5']), 'part.ply: face 0: value 1.5 does not fit its type int32'],
  ['part.ply', plyAscii(['0 0 0', '1 0 0', '0 1 nan', '3 0 1 2']), 'part.ply: vertex 2: non-finite coordinate'],
  ['part.ply', plyAscii(['0 0 0', '1 0 0', '0 1 x', '3 0 1 2']), "part.ply: vertex 2: malformed number 'x'"],
  ['part.ply', plyAscii(['0 0 0', '1 0 0', '0 1 0', '2 0 1']), 'part.ply: face 0: face has 2 vertices (at least 3 needed)'],
  ['part.ply', plyAscii(['0 0 0', '1 0 0', '0 1 0', '300 0 1 2']), 'part.ply: face 0: value 300 does not fit its type uint8'],
  ['part.ply', plyAscii(['0 0 0', '1 0 0', '0 1 0', '4 0 1 2']), 'part.ply: face 0: file ends early'],
  ['part.ply', plyBinary(NaN, [3, 0, 1, 2]), 'part.ply: vertex 1: non-finite coordinate'],
  ['part.ply', plyBinary(Infinity, [3, 0, 1, 2]), 'part.ply: vertex 1: non-finite coordinate'],
  ['part.ply', plyBinary(0, [3, 0, 1, 3]), 'part.ply: face 0: vertex index 3 out of range (the file has 3 vertices)'],
  ['part.ply', plyBinary(0, [3, 0, 1, 2], 2), "part.ply: header line 7: element 'face' declares 1 item but the rest of the file can hold at most 0"],
  ['part.ply', plyBinary(0, [4, 0, 1, 2]), 'part.ply: face 0: file ends inside this item'],
  ['part.ply', plyBinary(0, [1, 0, 0, 0]), 'part.ply: face 0: face has 1 vertex (at least 3 needed)'],
  // neither format
  ['blob.bin', new Uint8Array([0, 1, 2, 3, 255]), 'blob.bin: unrecognised mesh format (expected OBJ, PLY or STL)'],
  ['part.ply.gz', new Uint8Array([0x1f, 0x8b, 8, 0]), 'part.ply.gz: gzip-compressed data: decompress before parsing'],
];

describe('bad files give an INPUT error with an exact message (table)', () => {
  it.each(CASES.map(([name, data, msg]) => ({ name, data, msg, label: msg.slice(0, 70) })))('$label', ({ name, data, msg }) => {
    const bytes = typeof data === 'string' ? enc.encode(data) : data;
    let err: unknown;
    try {
      parseMesh(bytes, name);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(OrthodromeError);
    expect((err as OrthodromeError).code).toBe('INPUT');
    expect((err as OrthodromeError).message).toBe(msg);
  });

  it('the sound versions of the files above parse (so each case fails for its own reason)', () => {
    expect(parseMesh(enc.encode(TRI + 'f 1 2 3\n'), 'hill.obj').faceIndices.length).toBe(3);
    expect(parseMesh(enc.encode(plyAscii(['0 0 0', '1 0 0', '0 1 0', '3 0 1 2'])), 'part.ply').faceIndices.length).toBe(3);
    expect(Array.from(parseMesh(plyBinary(0, [3, 0, 1, 2]), 'part.ply').positions)).toEqual([0, 0, 0, 1, 0, 0, 0, 1, 0]);
  });

  it('an element without properties takes no bytes, however large its count (no hang)', () => {
    const text = plyAscii(['0 0 0', '1 0 0', '0 1 0', '3 0 1 2']).replace('end_header', 'element marker 4294967295\nend_header');
    expect(parseMesh(enc.encode(text), 'part.ply').faceIndices.length).toBe(3);
  });
});
