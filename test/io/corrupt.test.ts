/**
 * Random corruptions of valid files (byte flips, truncation, inserted
 * garbage, repeated header bytes) must give either an `INPUT`
 * OrthodromeError or a valid mesh: finite coordinates, indices below the
 * vertex count, non-decreasing face offsets, faces of at least 3 corners.
 * Never another exception, a hang (vitest's timeout) or NaN. The robustness
 * requirement is common practice for file readers; the corruptions are the
 * usual fuzzing mutations.
 */
import { describe, expect } from 'vitest';
import { fc, test as fcTest } from '@fast-check/vitest';
import { parseMesh } from '../../src/io/sniff.js';
import { writePly } from '../../src/io/write-ply.js';
import { writeObj } from '../../src/io/write-obj.js';
import { OrthodromeError } from '../../src/errors.js';
import type { MeshData } from '../../src/io/mesh-data.js';

const base: MeshData = {
  positions: Float64Array.from([512000.5, 4200000.25, 300, 512001, 4200000.25, 301.5, 512001, 4200001, 299, 512000.5, 4200001, 300.125, 512002, 4200002, 298]),
  faceOffsets: Uint32Array.from([0, 3, 7, 10]),
  faceIndices: Uint32Array.from([0, 1, 2, 0, 2, 3, 1, 3, 2, 4]),
  vertexProps: [{ name: 'quality', type: 'float32', values: Float64Array.from([0.5, 1, 2, 3, 4]) }],
  faceProps: [{ name: 'cost', type: 'int16', values: Float64Array.from([-3, 7, 1]) }],
  name: 'seed',
};

const SEEDS: [string, Uint8Array][] = [
  ['seed.obj', writeObj(base)],
  ['seed.ply', writePly(base, { format: 'ascii' })],
  ['seed.ply', writePly(base, { format: 'binary' })],
  ['seed.ply', writePly(base, { format: 'binary', littleEndian: false })],
];

type Mutation =
  | { kind: 'flip'; at: number; byte: number }
  | { kind: 'cut'; at: number }
  | { kind: 'insert'; at: number; bytes: number[] }
  | { kind: 'repeat'; at: number; len: number };

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant('flip' as const), at: fc.nat(), byte: fc.integer({ min: 0, max: 255 }) }),
  fc.record({ kind: fc.constant('cut' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), bytes: fc.array(fc.integer({ min: 0, max: 255 }), { minLength: 1, maxLength: 12 }) }),
  fc.record({ kind: fc.constant('repeat' as const), at: fc.nat(), len: fc.integer({ min: 1, max: 40 }) }),
);

function mutate(src: Uint8Array, ms: Mutation[]): Uint8Array {
  let b = src.slice();
  for (const m of ms) {
    const at = b.length ? m.at % (b.length + 1) : 0;
    if (m.kind === 'flip' && b.length) b[at % b.length] = m.byte;
    else if (m.kind === 'cut') b = b.slice(0, at);
    else if (m.kind === 'insert') b = Uint8Array.from([...b.subarray(0, at), ...m.bytes, ...b.subarray(at)]);
    else if (m.kind === 'repeat') b = Uint8Array.from([...b.subarray(0, at), ...b.subarray(at, at + m.len), ...b.subarray(at)]);
  }
  return b;
}

function outcome(name: string, bytes: Uint8Array): 'error' | 'mesh' {
  let m: MeshData;
  try {
    m = parseMesh(bytes, name);
  } catch (e) {
    expect(e).toBeInstanceOf(OrthodromeError);
    expect((e as OrthodromeError).code).toBe('INPUT');
    return 'error';
  }
  const nv = m.positions.length / 3;
  expect(nv).toBeGreaterThan(0);
  expect(m.positions.every(Number.isFinite)).toBe(true);
  const nf = m.faceOffsets.length - 1;
  expect(nf).toBeGreaterThan(0);
  expect(m.faceOffsets[0]).toBe(0);
  for (let f = 0; f < nf; f++) expect(m.faceOffsets[f + 1]! - m.faceOffsets[f]!).toBeGreaterThanOrEqual(3);
  expect(m.faceOffsets[nf]).toBe(m.faceIndices.length);
  expect(m.faceIndices.every((i) => i < nv)).toBe(true);
  for (const c of [...m.vertexProps, ...m.faceProps]) expect(c.values.length).toBe(c === m.vertexProps.find((x) => x === c) ? nv : nf);
  return 'mesh';
}

describe('corrupted files: INPUT error or a valid mesh, nothing else', () => {
  SEEDS.forEach(([name, seed], k) => {
    fcTest.prop([fc.array(mutation, { minLength: 1, maxLength: 4 })], { numRuns: 300 })(`seed ${k} (${name})`, (ms) => {
      outcome(name, mutate(seed, ms));
    });
  });

  fcTest.prop([fc.uint8Array({ maxLength: 300 }), fc.constantFrom('x.obj', 'x.ply', 'x.bin')], { numRuns: 300 })('random bytes', (bytes, name) => {
    outcome(name, bytes);
  });

  fcTest.prop([fc.uint8Array({ maxLength: 200 })], { numRuns: 300 })('random bytes after a PLY header line', (tail) => {
    outcome('x.ply', Uint8Array.from([...new TextEncoder().encode('ply\nformat binary_big_endian 1.0\nelement vertex 2\n'), ...tail]));
  });
});
