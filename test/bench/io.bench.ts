/**
 * Mesh reading benchmark: a terrain-like triangle grid at map coordinates
 * (x ≈ 512000, y ≈ 4200000, ~1M faces; `--quick`: ~100k) is written as OBJ
 * text and as binary little-endian PLY to a temp folder, read back, and
 * parsed from memory by our readers and, in the same run, by three's
 * OBJLoader (from the decoded text) and PLYLoader (from the ArrayBuffer).
 *
 * Records: parse time (median) and throughput (MB/s) per reader and file,
 * and our throughput over three's (goals: OBJ ≥ 20×, binary PLY ≥ 5×), timed
 * as a sandwich (ours, three's, ours; see {@link sandwich}).
 * Case `ply-binary` is our writer's layout (double x, y, z); `ply-binary-float`
 * is a scanner-style layout (float x, y, z, a quality and colours).
 * Cases `triangulate-*` time the all-triangle fast path and ear clipping of
 * the same grid as quads. Case `obj-shortest` is the same mesh written by our OBJ writer (shortest
 * round-trip decimals, up to 17 digits, which take the slow exact path).
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { OBJLoader } from 'three/examples/jsm/loaders/OBJLoader.js';
import { PLYLoader } from 'three/examples/jsm/loaders/PLYLoader.js';
import { performance } from 'node:perf_hooks';
import { emit, median, peakRssMB, quick, timeMedian } from './harness.js';
import { parseObj } from '../../src/io/obj.js';
import { parsePly } from '../../src/io/ply.js';
import { writePly } from '../../src/io/write-ply.js';
import { writeObj } from '../../src/io/write-obj.js';
import { meshFromTriangles, type MeshData } from '../../src/io/mesh-data.js';
import { triangulate } from '../../src/mesh/triangulate.js';

const BENCH = 'io';

/** n×n vertex grid, 0.5 m spacing at map offsets, gently rolling heights. */
function terrainGrid(n: number): { positions: Float64Array; triangles: Uint32Array } {
  const positions = new Float64Array(3 * n * n);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const k = 3 * (j * n + i);
      positions[k] = 512000 + 0.5 * i;
      positions[k + 1] = 4200000 + 0.5 * j;
      positions[k + 2] = 310 + 12 * Math.sin(i / 37) * Math.cos(j / 53) + 0.8 * Math.sin((i + 2 * j) / 5);
    }
  }
  const triangles = new Uint32Array(6 * (n - 1) * (n - 1));
  let t = 0;
  for (let j = 0; j + 1 < n; j++) {
    for (let i = 0; i + 1 < n; i++) {
      const a = j * n + i, b = a + 1, c = a + n, d = c + 1;
      triangles.set([a, b, d, a, d, c], t);
      t += 6;
    }
  }
  return { positions, triangles };
}

/** OBJ text as a scanner export would print it: millimetres, 3 decimals. */
function fixedObj(positions: Float64Array, triangles: Uint32Array): string {
  const lines: string[] = ['# terrain tile, map coordinates in metres'];
  for (let k = 0; k < positions.length; k += 3) {
    lines.push(`v ${positions[k]!.toFixed(3)} ${positions[k + 1]!.toFixed(3)} ${positions[k + 2]!.toFixed(3)}`);
  }
  for (let t = 0; t < triangles.length; t += 3) lines.push(`f ${triangles[t]! + 1} ${triangles[t + 1]! + 1} ${triangles[t + 2]! + 1}`);
  return lines.join('\n') + '\n';
}

/**
 * Medians of `a` (ours) and `b` (the baseline) timed in a sandwich: `runs`
 * of a, `runs` of b, `runs` of a again, after `warmup` untimed runs of each.
 * Blocks keep one reader's garbage from being collected on the other's
 * clock (three's readers leave many JS arrays and strings; ours a few typed
 * arrays); timing a before and after b evens out drifting machine load.
 */
function sandwich<A, B>(a: () => A, b: () => B, runs: number, warmup = 3): { msA: number; msB: number; resultA: A } {
  let resultA = a();
  for (let w = 0; w < warmup; w++) {
    resultA = a();
    b();
  }
  const ta: number[] = [], tb: number[] = [];
  const block = (f: () => unknown, into: number[]) => {
    for (let r = 0; r < runs; r++) {
      const t0 = performance.now();
      f();
      into.push(performance.now() - t0);
    }
  };
  block(() => (resultA = a()), ta);
  block(b, tb);
  block(() => (resultA = a()), ta);
  return { msA: median(ta), msB: median(tb), resultA };
}

/**
 * The same mesh as a scanner would write it: `float x y z`, a `float quality`
 * and `uchar red green blue` per vertex, `list uchar int vertex_indices`.
 * Assembled here with a DataView (our writer always stores double x, y, z).
 */
function scannerPly(positions: Float64Array, triangles: Uint32Array): Uint8Array {
  const nv = positions.length / 3, nf = triangles.length / 3;
  const header = new TextEncoder().encode(
    ['ply', 'format binary_little_endian 1.0', `element vertex ${nv}`, 'property float x', 'property float y', 'property float z',
      'property float quality', 'property uchar red', 'property uchar green', 'property uchar blue',
      `element face ${nf}`, 'property list uchar int vertex_indices', 'end_header', ''].join('\n'),
  );
  const out = new Uint8Array(header.length + 19 * nv + 13 * nf);
  out.set(header);
  const dv = new DataView(out.buffer);
  let o = header.length;
  for (let v = 0; v < nv; v++, o += 19) {
    for (let c = 0; c < 3; c++) dv.setFloat32(o + 4 * c, positions[3 * v + c]!, true);
    dv.setFloat32(o + 12, (v % 97) / 97, true);
    out[o + 16] = v & 255; out[o + 17] = (v >> 8) & 255; out[o + 18] = 128;
  }
  for (let f = 0; f < nf; f++, o += 13) {
    out[o] = 3;
    for (let c = 0; c < 3; c++) dv.setInt32(o + 1 + 4 * c, triangles[3 * f + c]!, true);
  }
  return out;
}

async function main(): Promise<void> {
  const n = quick() ? 225 : 708;
  const g = terrainGrid(n);
  const faces = g.triangles.length / 3;
  const dir = mkdtempSync(join(tmpdir(), 'orthodrome-io-bench-'));
  try {
    const mesh = meshFromTriangles(g.positions, g.triangles, 'terrain');
    writeFileSync(join(dir, 'terrain.obj'), fixedObj(g.positions, g.triangles));
    writeFileSync(join(dir, 'terrain-shortest.obj'), writeObj(mesh));
    writeFileSync(join(dir, 'terrain.ply'), writePly(mesh, { format: 'binary' }));
    writeFileSync(join(dir, 'terrain-scanner.ply'), scannerPly(g.positions, g.triangles));
    const size = `${faces} faces`;
    const runs = quick() ? 7 : 5;

    const objBytes = new Uint8Array(readFileSync(join(dir, 'terrain.obj')));
    const objMB = objBytes.length / 1e6;
    const text = new TextDecoder().decode(objBytes);
    const o = sandwich(() => parseObj(objBytes, 'terrain.obj'), () => new OBJLoader().parse(text), runs);
    if (o.resultA.faceOffsets.length - 1 !== faces) throw new Error('face count mismatch');
    for (const [reader, ms] of [['parseObj', o.msA], ['three OBJLoader', o.msB]] as const) {
      emit({ bench: BENCH, case: 'obj', metric: 'parse', value: ms, unit: 'ms', reader, size, mb: objMB });
      emit({ bench: BENCH, case: 'obj', metric: 'throughput', value: objMB / (ms / 1000), unit: 'MB/s', reader, size });
    }
    emit({ bench: BENCH, case: 'obj', metric: 'speedup', value: o.msB / o.msA, unit: 'x', baseline: 'three OBJLoader', goal: 20 });

    const shortBytes = new Uint8Array(readFileSync(join(dir, 'terrain-shortest.obj')));
    const short = await timeMedian(() => parseObj(shortBytes, 'terrain-shortest.obj'), 5, 3);
    const shortMB = shortBytes.length / 1e6;
    emit({ bench: BENCH, case: 'obj-shortest', metric: 'parse', value: short.ms, unit: 'ms', reader: 'parseObj', size, mb: shortMB });
    emit({ bench: BENCH, case: 'obj-shortest', metric: 'throughput', value: shortMB / (short.ms / 1000), unit: 'MB/s', reader: 'parseObj', size });

    for (const [file, caseName] of [['terrain.ply', 'ply-binary'], ['terrain-scanner.ply', 'ply-binary-float']] as const) {
      const plyBytes = new Uint8Array(readFileSync(join(dir, file)));
      const mb = plyBytes.length / 1e6;
      const ab = plyBytes.buffer.slice(plyBytes.byteOffset, plyBytes.byteOffset + plyBytes.byteLength) as ArrayBuffer;
      const q = sandwich(() => parsePly(plyBytes, file), () => new PLYLoader().parse(ab), runs);
      if (q.resultA.faceOffsets.length - 1 !== faces) throw new Error('face count mismatch');
      for (const [reader, ms] of [['parsePly', q.msA], ['three PLYLoader', q.msB]] as const) {
        emit({ bench: BENCH, case: caseName, metric: 'parse', value: ms, unit: 'ms', reader, size, mb });
        emit({ bench: BENCH, case: caseName, metric: 'throughput', value: mb / (ms / 1000), unit: 'MB/s', reader, size });
      }
      emit({ bench: BENCH, case: caseName, metric: 'speedup', value: q.msB / q.msA, unit: 'x', baseline: 'three PLYLoader', goal: 5 });
    }
    // Triangulation: the all-triangle fast path, and ear clipping of the same grid as quads.
    const tri = await timeMedian(() => triangulate(mesh), 5, 1);
    emit({ bench: BENCH, case: 'triangulate-triangles', metric: 'time', value: tri.ms, unit: 'ms', size });
    const quadOffsets = new Uint32Array(faces / 2 + 1);
    const quadIndices = new Uint32Array(2 * faces);
    for (let f = 0; f < faces / 2; f++) {
      const t = 6 * f; // triangles (a, b, d) and (a, d, c) of one cell → quad a, b, d, c
      quadIndices.set([g.triangles[t]!, g.triangles[t + 1]!, g.triangles[t + 2]!, g.triangles[t + 5]!], 4 * f);
      quadOffsets[f + 1] = 4 * (f + 1);
    }
    const quads: MeshData = { ...mesh, faceOffsets: quadOffsets, faceIndices: quadIndices };
    const ear = await timeMedian(() => triangulate(quads), 3, 1);
    emit({ bench: BENCH, case: 'triangulate-quads', metric: 'time', value: ear.ms, unit: 'ms', size: `${faces / 2} quads` });
    emit({ bench: BENCH, case: 'triangulate-quads', metric: 'ratio', value: ear.ms / tri.ms, unit: 'x', baseline: 'triangle fast path' });
    emit({ bench: BENCH, case: 'all', metric: 'peak-rss', value: peakRssMB(), unit: 'MB', size });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

await main();
