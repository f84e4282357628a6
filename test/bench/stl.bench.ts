/**
 * STL reading benchmark: binary STL of a terrain grid (every facet stores its
 * own three corners, as exporters write them) parsed and welded by
 * `parseStl`, at 200k and 2M facets (`--quick`: 200k), and an ASCII STL at
 * 200k facets. Baseline in the same run: the same mesh as binary PLY (shared
 * vertices, nothing to weld) read by `parsePly`, so `stl_over_ply` is the
 * cost of a soup and its weld over an indexed file. Also the weld alone
 * (`weldPoints` on the corners) and the peak RSS.
 */
import { emit, peakRssMB, quick, timeMedian } from './harness.js';
import { terrain } from '../fixtures/shapes.js';
import type { Shape } from '../fixtures/shapes.js';
import { parseStl } from '../../src/io/stl.js';
import { parsePly } from '../../src/io/ply.js';
import { writePly } from '../../src/io/write-ply.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { weldPoints } from '../../src/io/weld.js';

const BENCH = 'stl';

function hills(x: number, y: number): number {
  return 30 * Math.sin(x / 97) * Math.cos(y / 61);
}

/** Binary STL bytes of a shape (float32 corners, normals left zero). */
function binaryStl(s: Shape): Uint8Array {
  const nf = s.triangles.length / 3;
  const out = new Uint8Array(84 + 50 * nf);
  const dv = new DataView(out.buffer);
  dv.setUint32(80, nf, true);
  for (let f = 0; f < nf; f++) {
    const o = 84 + 50 * f + 12;
    for (let j = 0; j < 3; j++) {
      const v = s.triangles[3 * f + j]!;
      for (let c = 0; c < 3; c++) dv.setFloat32(o + 12 * j + 4 * c, s.positions[3 * v + c]!, true);
    }
  }
  return out;
}

/** ASCII STL bytes of a shape. */
function asciiStl(s: Shape): Uint8Array {
  const L: string[] = ['solid bench'];
  for (let f = 0; f < s.triangles.length / 3; f++) {
    L.push('  facet normal 0 0 0', '    outer loop');
    for (let j = 0; j < 3; j++) {
      const v = s.triangles[3 * f + j]!;
      L.push(`      vertex ${Math.fround(s.positions[3 * v]!)} ${Math.fround(s.positions[3 * v + 1]!)} ${Math.fround(s.positions[3 * v + 2]!)}`);
    }
    L.push('    endloop', '  endfacet');
  }
  L.push('endsolid bench', '');
  return new TextEncoder().encode(L.join('\n'));
}

async function main(): Promise<void> {
  const sides = quick() ? [316] : [316, 1000];
  for (const k of sides) {
    const s = terrain(k, k, 1000, 1000, hills);
    const facets = s.triangles.length / 3;
    const c = `terrain-${facets}`;
    const stl = binaryStl(s);
    const ply = writePly(meshFromTriangles(s.positions, s.triangles, 'bench'), { format: 'binary' });
    const runs = k > 500 ? 3 : 5;
    const a = await timeMedian(() => parseStl(stl, 'bench.stl'), runs, 1);
    if (a.result.positions.length !== s.positions.length) throw new Error('weld lost or kept extra vertices');
    const b = await timeMedian(() => parsePly(ply, 'bench.ply'), runs, 1);
    const corners = new Float64Array(9 * facets);
    for (let i = 0; i < 3 * facets; i++) for (let d = 0; d < 3; d++) corners[3 * i + d] = Math.fround(s.positions[3 * s.triangles[i]! + d]!);
    const w = await timeMedian(() => weldPoints(corners), runs, 1);
    emit({ bench: BENCH, case: c, metric: 'parse_binary', value: a.ms, unit: 'ms', facets, mb: stl.length / 1e6 });
    emit({ bench: BENCH, case: c, metric: 'weld', value: w.ms, unit: 'ms', corners: 3 * facets });
    emit({ bench: BENCH, case: c, metric: 'ply_baseline', value: b.ms, unit: 'ms', mb: ply.length / 1e6 });
    emit({ bench: BENCH, case: c, metric: 'stl_over_ply', value: a.ms / b.ms, unit: 'ratio', baseline: 'parsePly, binary' });
    if (k <= 500) {
      const text = asciiStl(s);
      const t = await timeMedian(() => parseStl(text, 'bench.stl'), 3, 1);
      emit({ bench: BENCH, case: c, metric: 'parse_ascii', value: t.ms, unit: 'ms', mb: text.length / 1e6 });
      emit({ bench: BENCH, case: c, metric: 'ascii_throughput', value: text.length / 1e3 / t.ms, unit: 'MB/s' });
    }
    emit({ bench: BENCH, case: c, metric: 'peak-rss', value: peakRssMB(), unit: 'MB' });
  }
}

await main();
