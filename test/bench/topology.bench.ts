/**
 * Topology building benchmark: `buildTopology` on a fan (a disc fanned from
 * one centre vertex, faces in random order: the worst case for any grouping
 * that sorts per vertex bucket) and, as the baseline in the same run, on a
 * grid with the same number of triangles (valence ≤ 8), faces shuffled the same
 * way. A linear build keeps the ratio fan / grid near 1 at every size.
 *
 * Records per size: build time of each (median ms) and their ratio.
 */
import { emit, quick, timeMedian } from './harness.js';
import { buildTopology } from '../../src/mesh/build.js';
import { fanDisc, flatGrid, rng } from '../fixtures/shapes.js';

const BENCH = 'topology';

function shuffledFaces(tri: Uint32Array, seed: number): Uint32Array {
  const out = tri.slice();
  const r = rng(seed);
  for (let f = out.length / 3 - 1; f > 0; f--) {
    const g = Math.floor(r() * (f + 1));
    const a = out.slice(3 * f, 3 * f + 3);
    out.copyWithin(3 * f, 3 * g, 3 * g + 3);
    out.set(a, 3 * g);
  }
  return out;
}

const sizes = quick() ? [40_000] : [40_000, 400_000];
for (const n of sizes) {
  const fan = fanDisc(n);
  const fanTri = shuffledFaces(fan.triangles, 7);
  const side = Math.round(Math.sqrt(n / 2));
  const grid = flatGrid(side, side);
  const gridNv = (side + 1) * (side + 1);
  const tf = await timeMedian(() => buildTopology(fanTri, n + 1), 5, 1);
  const gridTri = shuffledFaces(grid.triangles, 7);
  const tg = await timeMedian(() => buildTopology(gridTri, gridNv), 5, 1);
  const c = `fan-${n}`;
  emit({ bench: BENCH, case: c, metric: 'build_ms', value: tf.ms, unit: 'ms', triangles: n });
  emit({ bench: BENCH, case: c, metric: 'grid_build_ms', value: tg.ms, unit: 'ms', triangles: grid.triangles.length / 3 });
  emit({ bench: BENCH, case: c, metric: 'fan_over_grid', value: tf.ms / tg.ms, unit: 'ratio' });
}
