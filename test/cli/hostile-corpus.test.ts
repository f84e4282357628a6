/**
 * A corpus of hostile files: the reported defects (binary PLY with double
 * coordinates in a pooled buffer, a UTF-8 byte-order mark, huge ascii PLY
 * list lengths, a gzip bomb, `.gz` outputs, unsafe `-o` targets) plus
 * truncations at many offsets and seeded random byte flips of valid OBJ, ascii
 * PLY, binary PLY (both byte orders) and gzip files.
 *
 * Every run must end with a correct result or a documented refusal: an
 * OrthodromeError (INPUT, LIMIT or NUMERIC; exit 2, or the LIMIT exit code)
 * whose one-line message starts with the file name; never NaN, never a stack
 * trace, never a stray temporary file. "Correct" is checked against theorems
 * that hold on any mesh: the source is at distance 0 and geodesic distance is
 * 1-Lipschitz, so |d(i) − d(j)| ≤ |ij| along every edge (triangle
 * inequality); and a file that still holds the original mesh gives exactly
 * the original distances. Robust readers are common practice; the mutations
 * (truncation, byte flips) are the usual fuzzing moves.
 *
 * Most cases run in-process through the library (parse, build, exact solve);
 * a sample runs through the real CLI for exit codes and stderr.
 */
import { describe, expect, it, afterAll } from 'vitest';
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { gunzipSync, gzipSync } from 'node:zlib';
import { parseMesh } from '../../src/io/sniff.js';
import { gunzipIfNeeded, readMeshFile } from '../../src/io/read-mesh.js';
import { writeObj } from '../../src/io/write-obj.js';
import { writePly } from '../../src/io/write-ply.js';
import type { MeshData } from '../../src/io/mesh-data.js';
import { surfaceFromMeshData, isManifold } from '../../src/mesh/surface.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { prepareDistance } from '../../src/geodesic/solver.js';
import { next } from '../../src/mesh/topology.js';
import { isOrthodromeError, limitError, numericError, usageError } from '../../src/errors.js';
import * as run from '../../cli/run.js';
import { terrain, rng } from '../fixtures/shapes.js';

const root = resolve(__dirname, '../..');
const dir = mkdtempSync(join(tmpdir(), 'orthodrome-hostile-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Exit code of a LIMIT error (3, cli/run.ts). */
const EXIT_LIMIT = run.EXIT_LIMIT;

// ---- the seed mesh and its spellings ----

function seedMesh(): MeshData {
  const s = terrain(6, 5, 12.5, 10, (x, y) => 0.75 * Math.sin(x / 3) + 0.125 * y);
  const nf = s.triangles.length / 3;
  return { positions: s.positions, faceOffsets: Uint32Array.from({ length: nf + 1 }, (_, f) => 3 * f), faceIndices: s.triangles, vertexProps: [], faceProps: [], name: 'seed' };
}
const SEED = seedMesh();
const bom = (b: Uint8Array) => Uint8Array.from([0xef, 0xbb, 0xbf, ...b]);
const SEEDS: [string, Uint8Array][] = [
  ['seed.obj', writeObj(SEED)],
  ['seed.ply', writePly(SEED, { format: 'ascii' })],
  ['seed.ply', writePly(SEED, { format: 'binary' })],
  ['seed.ply', writePly(SEED, { format: 'binary', littleEndian: false })],
  ['seed.obj.gz', gzipSync(writeObj(SEED))],
  ['seed.ply.gz', gzipSync(writePly(SEED, { format: 'binary' }))],
  ['bom.obj', bom(writeObj(SEED))],
];

// ---- one in-process run: what the CLI's distance command does, minus printing ----

type Outcome = { ok: true; d: Float64Array; same: boolean } | { ok: false; code: string; message: string };
const LIMIT_BYTES = 1 << 20;

function solveFile(name: string, bytes: Uint8Array): Outcome {
  try {
    const data = parseMesh(gunzipIfNeeded(bytes, name, { maxInputBytes: LIMIT_BYTES }), name);
    const s = surfaceFromMeshData(data);
    if (!isManifold(s)) return { ok: false, code: 'INPUT', message: `${name}: not manifold (the CLI refuses it)` };
    const im = intrinsicFromPositions(s.topology, s.positions);
    const d = prepareDistance(im, 'exact').solve({ points: [{ kind: 'vertex', vertex: 0 }], curves: [] }).field.distance;
    checkField(im.topology, im.edgeLength, d, name);
    const same = sameMesh(data);
    return { ok: true, d, same };
  } catch (e) {
    if (!isOrthodromeError(e)) throw new Error(`${name}: not an OrthodromeError: ${e instanceof Error ? e.stack : String(e)}`);
    return { ok: false, code: e.code, message: e.message };
  }
}

function sameMesh(m: MeshData): boolean {
  const eq = (a: ArrayLike<number>, b: ArrayLike<number>) => a.length === b.length && Array.from(a).every((x, i) => x === b[i]);
  return eq(m.positions, SEED.positions) && eq(m.faceIndices, SEED.faceIndices) && eq(m.faceOffsets, SEED.faceOffsets);
}

/** No NaN, d(source) = 0, and |d(i) − d(j)| ≤ |ij| on every edge with both ends reached (triangle inequality). */
function checkField(t: { ne: number; tri: Uint32Array; edgeHalfedge: Int32Array }, len: Float64Array, d: Float64Array, name: string): void {
  for (let v = 0; v < d.length; v++) {
    if (Number.isNaN(d[v]!) || d[v]! < 0) throw new Error(`${name}: distance ${d[v]} at vertex ${v}`);
  }
  if (d[0] !== 0) throw new Error(`${name}: source at distance ${d[0]}`);
  let scale = 0;
  for (let e = 0; e < t.ne; e++) if (Number.isFinite(len[e]!)) scale = Math.max(scale, len[e]!);
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!;
    const a = d[t.tri[h]!]!, b = d[t.tri[next(h)]!]!;
    if (Number.isFinite(a) !== Number.isFinite(b)) throw new Error(`${name}: edge ${e} joins a reached and an unreached vertex`);
    if (Number.isFinite(a) && Math.abs(a - b) > len[e]! + 1e-9 * Math.max(scale, a, b)) throw new Error(`${name}: |d| jumps ${Math.abs(a - b)} across edge ${e} of length ${len[e]}`);
  }
}

function expectRefusal(o: Outcome, name: string): void {
  if (o.ok) return;
  expect(['INPUT', 'LIMIT', 'NUMERIC']).toContain(o.code);
  expect(o.message.startsWith(name)).toBe(true);
  expect(o.message).not.toMatch(/\n/);
}

const REFERENCE = (() => {
  const r = solveFile('seed.obj', SEEDS[0]![1]);
  if (!r.ok) throw new Error('seed mesh does not solve');
  return r.d;
})();

function expectCorrect(o: Outcome): void {
  if (o.ok && o.same) expect(Array.from(o.d)).toEqual(Array.from(REFERENCE));
}

// ---- in-process corpus ----

describe('hostile corpus, in-process (parse, build, exact solve)', () => {
  it('every seed spelling gives the reference distances', () => {
    for (const [name, bytes] of SEEDS) {
      const o = solveFile(name, bytes);
      expect(o.ok && o.same).toBe(true);
      expectCorrect(o);
    }
  });

  it('truncations at many offsets of every seed', () => {
    let refused = 0, total = 0;
    for (const [name, bytes] of SEEDS) {
      const L = bytes.length;
      const cuts = new Set<number>([0, 1, 2, 3, 10, L - 1, L - 2, L - 3, L - 10, L - 24]);
      for (let k = 1; k < 40; k++) cuts.add(Math.floor((k * L) / 40));
      for (const c of cuts) {
        if (c < 0 || c >= L) continue;
        const o = solveFile(name, bytes.subarray(0, c));
        expectRefusal(o, name);
        expectCorrect(o);
        total++;
        if (!o.ok) refused++;
      }
    }
    // Binary and gzip truncations cannot pass unnoticed; only text can end early at a line break.
    expect(refused).toBeGreaterThan(total / 2);
  });

  it('seeded random byte flips of every seed (1 to 3 bytes each)', () => {
    const r = rng(20261203);
    for (const [name, bytes] of SEEDS) {
      for (let k = 0; k < 50; k++) {
        const b = bytes.slice();
        const flips = 1 + Math.floor(3 * r());
        for (let f = 0; f < flips; f++) b[Math.floor(r() * b.length)] = Math.floor(256 * r());
        const o = solveFile(name, b);
        expectRefusal(o, name);
        expectCorrect(o);
      }
    }
  });

  it('reported defects: pooled-buffer double PLY, BOM, list-length bomb, gzip bomb, UTF-16', () => {
    // Double coordinates in a view at an odd offset of a larger buffer.
    const ply = writePly(SEED, { format: 'binary' });
    const big = Buffer.alloc(ply.length + 21, 0x41);
    big.set(ply, 5);
    const o1 = solveFile('pooled.ply', big.subarray(5, 5 + ply.length));
    expect(o1.ok && o1.same).toBe(true);
    expectCorrect(o1);
    // BOM before OBJ (indices would shift by one).
    const o2 = solveFile('bom.obj', bom(writeObj(SEED)));
    expect(o2.ok && o2.same).toBe(true);
    // A list count of 2^32 − 1 in ascii PLY.
    const text = new TextDecoder().decode(writePly(SEED, { format: 'ascii' }));
    const listBomb = text.replace(/\n3 (\d+ \d+ \d+)\n/, '\n4294967295 $1\n').replace('property list uchar', 'property list uint');
    const o3 = solveFile('list.ply', new TextEncoder().encode(listBomb));
    expect(o3.ok).toBe(false);
    if (!o3.ok) expect(o3.message).toBe('list.ply: face 0: list of 4294967295 items is longer than the rest of the file can hold');
    // 4 MiB of comment behind the mesh, packed to a few KiB: over the 1 MiB bound.
    const bomb = gzipSync(Buffer.concat([writeObj(SEED), Buffer.alloc(4 << 20, 0x23)]));
    const o4 = solveFile('bomb.obj.gz', bomb);
    expect(o4.ok ? 'ok' : o4.code).toBe('LIMIT');
    // UTF-16 text.
    const o5 = solveFile('wide.obj', Uint8Array.from([0xfe, 0xff, 0, 0x76, 0, 0x20, 0, 0x30]));
    expect(o5.ok ? 'ok' : o5.message).toBe('wide.obj: UTF-16 text is not supported (save the file as UTF-8 or ASCII)');
  });
});

describe('refusals from the solvers name the mesh file (cli/run.ts action)', () => {
  it('a NUMERIC or LIMIT error without a location gets the command\'s mesh; others are left alone', async () => {
    const lines: string[] = [];
    const write = process.stderr.write;
    const before = process.exitCode;
    process.stderr.write = ((s: string) => (lines.push(s), true)) as typeof process.stderr.write;
    try {
      await run.action(async (_mesh: string, _o: object) => { throw numericError('matrix is not positive definite (pivot -3 at column 34)'); })('hill.obj', {});
      await run.action(async (_mesh: string, _o: object) => { throw limitError('window cap reached'); })('hill.obj', {});
      await run.action(async (_mesh: string, _o: object) => { throw numericError('bad', 'hill.obj: face 3'); })('other.obj', {});
      await run.action(async (_mesh: string, _o: object) => { throw usageError('give at least one --from'); })('hill.obj', {});
    } finally {
      process.stderr.write = write;
      process.exitCode = before;
    }
    expect(lines).toEqual([
      'orthodrome: hill.obj: matrix is not positive definite (pivot -3 at column 34)\n',
      'orthodrome: hill.obj: window cap reached\n',
      'orthodrome: hill.obj: face 3: bad\n',
      'orthodrome: give at least one --from\n',
    ]);
  });
});

// ---- a sample through the real CLI ----

interface Run { code: number; stdout: string; stderr: string }
function cli(args: string[]): Promise<Run> {
  return new Promise((done) => {
    const p = spawn(process.execPath, ['--import', 'tsx', join(root, 'cli/orthodrome.ts'), ...args], { cwd: root, env: { ...process.env, ORTHODROME_DEBUG: '' } });
    let stdout = '', stderr = '';
    p.stdout.on('data', (c) => (stdout += c));
    p.stderr.on('data', (c) => (stderr += c));
    p.on('close', (code) => done({ code: code ?? -1, stdout, stderr }));
  });
}
/** Runs the jobs at most `k` at a time (the machine has 2 cores). */
async function pool<T>(jobs: (() => Promise<T>)[], k: number): Promise<T[]> {
  const out: T[] = new Array(jobs.length);
  let i = 0;
  await Promise.all(Array.from({ length: k }, async () => {
    while (i < jobs.length) { const j = i++; out[j] = await jobs[j]!(); }
  }));
  return out;
}
const put = (name: string, bytes: Uint8Array | string) => { const p = join(dir, name); writeFileSync(p, bytes); return p; };

describe('hostile corpus, a sample through the CLI', () => {
  it('exit codes, one stderr line naming the file, no NaN, no stack, no stray temp file', async () => {
    const objText = writeObj(SEED);
    const plyBin = writePly(SEED, { format: 'binary' });
    const r = rng(7);
    const flipped = plyBin.slice();
    for (let f = 0; f < 3; f++) flipped[Math.floor(r() * flipped.length)] = Math.floor(256 * r());
    const files = {
      obj: put('ok.obj', objText),
      bom: put('bom.obj', bom(objText)),
      dbl: put('double.ply', plyBin),
      cut: put('cut.ply', plyBin.subarray(0, plyBin.length - 7)),
      cutgz: put('cut.ply.gz', gzipSync(plyBin).subarray(0, 100)),
      bomb: put('bomb.obj.gz', gzipSync(Buffer.concat([objText, Buffer.alloc(1 << 20, 0x23)]))),
      list: put('list.ply', new TextDecoder().decode(writePly(SEED, { format: 'ascii' })).replace(/\n3 (\d+ \d+ \d+)\n/, '\n4294967295 $1\n').replace('property list uchar', 'property list uint')),
      flip: put('flip.ply', flipped),
      wide: put('wide.obj', Uint8Array.from([0xff, 0xfe, 0x76, 0, 0x20, 0])),
    };
    const inputBefore = readFileSync(files.dbl);
    type Case = { args: string[]; code: number | 'any'; file?: string; stderr?: RegExp; out?: string };
    const to = ['--to', 'v:29', '--json'];
    const cases: Case[] = [
      { args: ['distance', files.obj, '--from', 'v:0', ...to, '-o', join(dir, 'ok.ply.gz')], code: 0, out: 'ok.ply.gz' },
      { args: ['distance', files.bom, '--from', 'v:0', ...to, '-o', join(dir, 'bom.csv.gz')], code: 0, out: 'bom.csv.gz' },
      { args: ['distance', files.dbl, '--from', 'v:0', ...to, '-o', join(dir, 'dbl.json.gz')], code: 0, out: 'dbl.json.gz' },
      { args: ['distance', files.cut, '--from', 'v:0', ...to, '-o', join(dir, 'cut.csv')], code: run.EXIT_INPUT, file: files.cut, out: 'cut.csv' },
      { args: ['inspect', files.cutgz], code: run.EXIT_INPUT, file: files.cutgz, stderr: /corrupt gzip data/ },
      { args: ['inspect', files.bomb, '--max-input-size', '256K'], code: EXIT_LIMIT, file: files.bomb, stderr: /input size limit of 256 KiB \(raise it with --max-input-size/ },
      { args: ['curvature', files.list, '-o', join(dir, 'list-out.ply')], code: run.EXIT_INPUT, file: files.list, stderr: /face 0: list of 4294967295 items/, out: 'list-out.ply' },
      { args: ['distance', files.flip, '--from', 'v:0', ...to, '-o', join(dir, 'flip.csv')], code: 'any', file: files.flip, out: 'flip.csv' },
      { args: ['inspect', files.wide], code: run.EXIT_INPUT, file: files.wide, stderr: /UTF-16/ },
      // Unsafe outputs, refused before any work: missing folder, the input itself, unknown format.
      { args: ['distance', files.dbl, '--from', 'v:0', '-o', join(dir, 'no/such/folder/d.csv')], code: run.EXIT_INPUT, file: join(dir, 'no/such/folder/d.csv'), stderr: /output folder '[^']*no\/such\/folder' does not exist/ },
      { args: ['curvature', files.dbl, '-o', files.dbl], code: run.EXIT_INPUT, file: files.dbl, stderr: /output is the input mesh/ },
      { args: ['path', files.dbl, '--from', 'v:0', '--to', 'v:29', '-o', join(dir, 'p.txt')], code: run.EXIT_INPUT, file: join(dir, 'p.txt'), stderr: /unsupported output format '\.txt'/ },
      { args: ['path', files.obj, '--from', 'v:0', '--to', 'v:29', '-o', join(dir, 'p.geojson.gz')], code: 0, out: 'p.geojson.gz' },
    ];
    const runs = await pool(cases.map((c) => () => cli(c.args)), 3);
    const distances: number[] = [];
    cases.forEach((c, i) => {
      const res = runs[i]!;
      const what = `${c.args.join(' ')} → ${res.code}: ${res.stderr}`;
      if (c.code !== 'any') expect(res.code, what).toBe(c.code);
      expect([0, run.EXIT_INPUT, EXIT_LIMIT], what).toContain(res.code);
      expect(res.stdout).not.toMatch(/NaN/);
      expect(res.stderr, what).not.toMatch(/\n\s+at |internal error/);
      if (res.code === 0) {
        expect(res.stderr).toBe('');
        if (c.args[0] === 'distance') distances.push(JSON.parse(res.stdout).targets[0].distance);
      } else {
        const lines = res.stderr.split('\n').filter(Boolean);
        expect(lines, what).toHaveLength(1);
        expect(lines[0]!.startsWith(`orthodrome: ${c.file}`), what).toBe(true);
        if (c.stderr) expect(lines[0], what).toMatch(c.stderr);
        if (c.out) expect(existsSync(join(dir, c.out)), what).toBe(false);
      }
    });
    // Same distance from every good spelling (exact method; the reference is the in-process run).
    for (const d of distances.slice(0, 3)) expect(d).toBe(REFERENCE[29]);
    // Compressed outputs read back: PLY through the reader, CSV and JSON through gunzip.
    const back = await readMeshFile(join(dir, 'ok.ply.gz'));
    expect(Array.from(back.positions)).toEqual(Array.from(SEED.positions));
    expect(back.vertexProps.find((c) => c.name === 'distance')!.values[29]).toBe(REFERENCE[29]);
    const csv = gunzipSync(readFileSync(join(dir, 'bom.csv.gz'))).toString('utf8').split('\n');
    expect(csv[0]).toBe('vertex,x,y,z,distance');
    expect(Number(csv[30]!.split(',')[4])).toBe(REFERENCE[29]);
    expect(JSON.parse(gunzipSync(readFileSync(join(dir, 'dbl.json.gz'))).toString('utf8')).distance[29]).toBe(REFERENCE[29]);
    expect(JSON.parse(gunzipSync(readFileSync(join(dir, 'p.geojson.gz'))).toString('utf8')).geometry.type).toBe('LineString');
    // The input was not overwritten, and no temporary file is left anywhere.
    expect(readFileSync(files.dbl).equals(inputBefore)).toBe(true);
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  }, 120_000);
});
