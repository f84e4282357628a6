/**
 * Mesh reading benchmark: a terrain-like triangle grid at map coordinates
 * (x ≈ 512000, y ≈ 4200000, ~1M faces; `--quick`: ~100k) is written as OBJ
 * text and as binary little-endian PLY to a temp folder, read back, and
 * parsed from memory by our readers and, in the same run, by three's
 * OBJLoader (from the decoded text) and PLYLoader (from the ArrayBuffer).
 *
 * Records: parse time (median) and throughput (MB/s) per reader and file,
 * and our throughput over three's (goals: OBJ ≥ 20×, binary PLY ≥ 5×).
 * Case `obj-shortest` is the same mesh written by our OBJ writer (shortest
 * round-trip decimals, up to 17 digits, which take the slow exact path).
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { OBJLoader } from 'three/examples/jsm/loaders/OBJLoader.js';
import { PLYLoader } from 'three/examples/jsm/loaders/PLYLoader.js';
import { emit, peakRssMB, quick, timeMedian } from './harness.js';
import { parseObj } from '../../src/io/obj.js';
import { parsePly } from '../../src/io/ply.js';
import { writePly } from '../../src/io/write-ply.js';
import { writeObj } from '../../src/io/write-obj.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';

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
    const size = `${faces} faces`;
    const runsOurs = 5, runsThree = quick() ? 3 : 2;

    for (const file of ['terrain.obj', 'terrain-shortest.obj']) {
      const bytes = new Uint8Array(readFileSync(join(dir, file)));
      const mb = bytes.length / 1e6;
      const ours = await timeMedian(() => parseObj(bytes, file), runsOurs);
      if (ours.result.faceOffsets.length - 1 !== faces) throw new Error('face count mismatch');
      const caseName = file === 'terrain.obj' ? 'obj' : 'obj-shortest';
      emit({ bench: BENCH, case: caseName, metric: 'parse', value: ours.ms, unit: 'ms', reader: 'parseObj', size, mb });
      emit({ bench: BENCH, case: caseName, metric: 'throughput', value: mb / (ours.ms / 1000), unit: 'MB/s', reader: 'parseObj', size });
      if (caseName !== 'obj') continue;
      const text = new TextDecoder().decode(bytes);
      const three = await timeMedian(() => new OBJLoader().parse(text), runsThree);
      emit({ bench: BENCH, case: caseName, metric: 'parse', value: three.ms, unit: 'ms', reader: 'three OBJLoader', size, mb });
      emit({ bench: BENCH, case: caseName, metric: 'throughput', value: mb / (three.ms / 1000), unit: 'MB/s', reader: 'three OBJLoader', size });
      emit({ bench: BENCH, case: caseName, metric: 'speedup', value: three.ms / ours.ms, unit: 'x', baseline: 'three OBJLoader', goal: 20 });
    }

    const plyBytes = new Uint8Array(readFileSync(join(dir, 'terrain.ply')));
    const mb = plyBytes.length / 1e6;
    const ours = await timeMedian(() => parsePly(plyBytes, 'terrain.ply'), runsOurs);
    if (ours.result.faceOffsets.length - 1 !== faces) throw new Error('face count mismatch');
    emit({ bench: BENCH, case: 'ply-binary', metric: 'parse', value: ours.ms, unit: 'ms', reader: 'parsePly', size, mb });
    emit({ bench: BENCH, case: 'ply-binary', metric: 'throughput', value: mb / (ours.ms / 1000), unit: 'MB/s', reader: 'parsePly', size });
    const ab = plyBytes.buffer.slice(plyBytes.byteOffset, plyBytes.byteOffset + plyBytes.byteLength);
    const three = await timeMedian(() => new PLYLoader().parse(ab as ArrayBuffer), runsThree);
    emit({ bench: BENCH, case: 'ply-binary', metric: 'parse', value: three.ms, unit: 'ms', reader: 'three PLYLoader', size, mb });
    emit({ bench: BENCH, case: 'ply-binary', metric: 'throughput', value: mb / (three.ms / 1000), unit: 'MB/s', reader: 'three PLYLoader', size });
    emit({ bench: BENCH, case: 'ply-binary', metric: 'speedup', value: three.ms / ours.ms, unit: 'x', baseline: 'three PLYLoader', goal: 5 });
    emit({ bench: BENCH, case: 'all', metric: 'peak-rss', value: peakRssMB(), unit: 'MB', size });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

await main();
