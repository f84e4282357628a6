/**
 * Input bounds: the file size and the unpacked size of gzip input are limited
 * by `maxInputBytes` (a LIMIT error naming the file, the limit and how to
 * raise it), and ascii PLY list lengths are checked before anything is sized
 * by them. Bounding decompressed size against "zip bombs" is common
 * practice; zlib's `maxOutputLength` is documented in the Node.js zlib API.
 */
import { describe, expect, it, afterAll } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { readMeshFile, readMeshFileSync, gunzipIfNeeded, DEFAULT_MAX_INPUT_BYTES, formatBytes } from '../../src/io/read-mesh.js';
import { parsePly } from '../../src/io/ply.js';
import { parseByteSize } from '../../cli/load.js';
import { OrthodromeError } from '../../src/errors.js';

const dir = mkdtempSync(join(tmpdir(), 'orthodrome-limits-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function errorOf(f: () => unknown): OrthodromeError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(OrthodromeError);
    return e as OrthodromeError;
  }
  throw new Error('expected an OrthodromeError');
}
async function asyncErrorOf(p: Promise<unknown>): Promise<OrthodromeError> {
  try {
    await p;
  } catch (e) {
    expect(e).toBeInstanceOf(OrthodromeError);
    return e as OrthodromeError;
  }
  throw new Error('expected an OrthodromeError');
}

const obj = new TextEncoder().encode('v 0 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 3\n');

describe('input size bound (maxInputBytes, CLI --max-input-size)', () => {
  it('a gzip "bomb" stops at the bound with a LIMIT error, not after inflating everything', () => {
    // 16 MiB of blanks after a valid mesh packs into about 16 KiB (deflate's
    // longest match is 258 bytes, so at most ~1032:1; RFC 1951).
    const body = Buffer.concat([obj, Buffer.alloc(16 * 1024 * 1024, 0x20)]);
    const gz = gzipSync(body);
    expect(gz.length).toBeLessThan(body.length / 500);
    const e = errorOf(() => gunzipIfNeeded(gz, 'bomb.obj.gz', { maxInputBytes: 1024 * 1024 }));
    expect(e.code).toBe('LIMIT');
    expect(e.message).toBe('bomb.obj.gz: unpacked gzip data exceeds the input size limit of 1 MiB (raise it with --max-input-size; library option maxInputBytes)');
    // Raised above the unpacked size, the same data reads.
    expect(gunzipIfNeeded(gz, 'bomb.obj.gz', { maxInputBytes: body.length }).length).toBe(body.length);
  });

  it('the bound is inclusive: exactly the limit passes, one byte less fails (gzip and plain files)', async () => {
    const gzPath = join(dir, 'tri.obj.gz');
    const long = Buffer.concat([obj, Buffer.from(`# ${'x'.repeat(4000)}\n`)]);
    writeFileSync(gzPath, gzipSync(long));
    expect((await readMeshFile(gzPath, { maxInputBytes: long.length })).faceIndices.length).toBe(3);
    expect((await asyncErrorOf(readMeshFile(gzPath, { maxInputBytes: long.length - 1 }))).message).toMatch(/unpacked gzip data exceeds the input size limit of 3\.9\d+ KiB/);

    const path = join(dir, 'tri.obj');
    writeFileSync(path, obj);
    expect(readMeshFileSync(path, { maxInputBytes: obj.length }).positions.length).toBe(9);
    const e = errorOf(() => readMeshFileSync(path, { maxInputBytes: obj.length - 1 }));
    expect(e.code).toBe('LIMIT');
    expect(e.message).toBe(`${path}: file size ${obj.length} bytes exceeds the input size limit of ${obj.length - 1} bytes (raise it with --max-input-size; library option maxInputBytes)`);
    expect((await asyncErrorOf(readMeshFile(path, { maxInputBytes: 10 }))).code).toBe('LIMIT');
  });

  it('the default is 1 GiB and a non-positive bound is a USAGE error', () => {
    expect(DEFAULT_MAX_INPUT_BYTES).toBe(2 ** 30);
    expect(formatBytes(DEFAULT_MAX_INPUT_BYTES)).toBe('1 GiB');
    expect(errorOf(() => gunzipIfNeeded(gzipSync(obj), 'x.gz', { maxInputBytes: 0 })).code).toBe('USAGE');
  });

  it('--max-input-size text: bytes or binary K/M/G/T units; anything else is USAGE naming the option', () => {
    // Binary multiples (IEC 80000-13: Ki = 2^10, Mi = 2^20, Gi = 2^30).
    expect(parseByteSize('1500000', '--max-input-size')).toBe(1500000);
    expect(parseByteSize('512M', '--max-input-size')).toBe(512 * 2 ** 20);
    expect(parseByteSize('2g', '--max-input-size')).toBe(2 * 2 ** 30);
    expect(parseByteSize('1.5KiB', '--max-input-size')).toBe(1536);
    expect(parseByteSize('64kb', '--max-input-size')).toBe(65536);
    for (const bad of ['', 'abc', '0', '-5M', '1e9', '2 GB extra', 'NaN']) {
      const e = errorOf(() => parseByteSize(bad, '--max-input-size'));
      expect(e.code).toBe('USAGE');
      expect(e.message).toMatch(/^--max-input-size must be a size/);
    }
  });
});

describe('ascii PLY list lengths are checked before anything is sized by them', () => {
  const head = (countType: string) =>
    `ply\nformat ascii 1.0\nelement vertex 3\nproperty float x\nproperty float y\nproperty float z\nelement face 1\nproperty list ${countType} int vertex_indices\nend_header\n0 0 0\n1 0 0\n0 1 0\n`;
  it.each([
    ['uint', '4294967295 0 1 2\n', 'list of 4294967295 items is longer than the rest of the file can hold'],
    ['int', '2147483647 0 1 2\n', 'list of 2147483647 items is longer than the rest of the file can hold'],
    ['uint', '5 0 1 2\n', 'list of 5 items is longer than the rest of the file can hold'],
    ['uchar', '4 0 1 2\n', 'file ends early'],
  ])('count type %s, face line %j', (ct, line, msg) => {
    const e = errorOf(() => parsePly(new TextEncoder().encode(head(ct) + line), 'l.ply'));
    expect(e.code).toBe('INPUT');
    expect(e.message).toBe(`l.ply: face 0: ${msg}`);
  });

  it('a list that just fits still reads (the bound is not too tight)', () => {
    const m = parsePly(new TextEncoder().encode(head('uint') + '3 0 1 2'), 'ok.ply');
    expect(Array.from(m.faceIndices)).toEqual([0, 1, 2]);
  });

  it('other list properties too (an extra list on the vertex element)', () => {
    const text =
      'ply\nformat ascii 1.0\nelement vertex 3\nproperty float x\nproperty float y\nproperty float z\nproperty list uint float extra\nelement face 1\nproperty list uchar int vertex_indices\nend_header\n0 0 0 4000000000 1\n1 0 0 0\n0 1 0 0\n3 0 1 2\n';
    const e = errorOf(() => parsePly(new TextEncoder().encode(text), 'v.ply'));
    expect(e.message).toBe('v.ply: vertex 0: list of 4000000000 items is longer than the rest of the file can hold');
  });
});
