/**
 * Heat-method accuracy by mesh kind, against the exact method (window
 * propagation, exact on the polyhedron): mean and max relative error over
 * the vertices at least two mean edge lengths from the source, at two
 * resolutions, default options. Records: `meanRelError` and `maxRelError`
 * (ratios) per case, with nv and the time scale.
 *
 * `--quick` runs the coarse resolution only. `--time-scale=M` sets m.
 */
import { emit, quick } from './harness.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { HeatSolver } from '../../src/geodesic/heat.js';
import { prepareDistance } from '../../src/geodesic/solver.js';
import { boundaryCurves, type SourceSet } from '../../src/geodesic/shared/sources.js';
import { icosphere, flatGrid, terrain, fanDisc, rng, type Shape } from '../fixtures/shapes.js';
import { twoHolePlate } from '../fixtures/holed-plates.js';
import { terrainBlock } from '../fixtures/blocks.js';

const BENCH = 'heat-accuracy';
const timeScale = Number(process.argv.find((a) => a.startsWith('--time-scale='))?.slice(13) ?? 1);

function meshOf(s: Shape): IntrinsicMesh {
  const { topology } = buildTopology(s.triangles, s.positions.length / 3);
  return intrinsicFromPositions(topology, s.positions);
}

const hills = (x: number, y: number): number => 0.8 * Math.sin(x / 1.7) * Math.cos(y / 2.3) + 0.4 * Math.sin((x + y) / 3.1);

function noisyTerrain(n: number): Shape {
  const s = terrain(n, n, 10, 10, hills);
  const r = rng(7), cell = 10 / n;
  for (let i = 2; i < s.positions.length; i += 3) s.positions[i]! += 0.3 * cell * (r() - 0.5);
  return s;
}

interface Kind { name: string; make: (level: 0 | 1) => Shape; source: (m: IntrinsicMesh, s: Shape) => SourceSet }

const nearest = (s: Shape, x: number, y: number, z = 0): SourceSet => {
  let best = 0, bd = Infinity;
  for (let v = 0; v < s.positions.length / 3; v++) {
    const d = Math.hypot(s.positions[3 * v]! - x, s.positions[3 * v + 1]! - y, s.positions[3 * v + 2]! - z);
    if (d < bd) { bd = d; best = v; }
  }
  return { points: [{ kind: 'vertex', vertex: best }], curves: [] };
};

const kinds: Kind[] = [
  { name: 'sphere', make: (l) => icosphere(4 + l, 1), source: () => ({ points: [{ kind: 'vertex', vertex: 0 }], curves: [] }) },
  { name: 'flat-square', make: (l) => flatGrid(40 * 2 ** l, 40 * 2 ** l, 1, 1, 0.2, 3), source: (_m, s) => nearest(s, 0.25, 0.25) },
  { name: 'smooth-terrain', make: (l) => terrain(40 * 2 ** l, 40 * 2 ** l, 10, 10, hills), source: (_m, s) => nearest(s, 2.5, 2.5) },
  { name: 'noisy-terrain', make: (l) => noisyTerrain(40 * 2 ** l), source: (_m, s) => nearest(s, 2.5, 2.5) },
  { name: 'terrain-long-edge-sides', make: (l) => terrainBlock(40 * 2 ** l, hills), source: (_m, s) => nearest(s, 2.5, 2.5, 1) },
  { name: 'high-valence-fan', make: (l) => fanDisc(400 * 2 ** l), source: () => ({ points: [{ kind: 'vertex', vertex: 1 }], curves: [] }) },
  { name: 'plate-two-holes-point', make: (l) => twoHolePlate(10, 10 / (30 * 2 ** l)), source: (_m, s) => nearest(s, 0, 5) },
  { name: 'plate-two-holes-boundary', make: (l) => twoHolePlate(10, 10 / (30 * 2 ** l)), source: (m) => ({ points: [], curves: boundaryCurves(m.topology) }) },
];

for (const level of quick() ? [0] as const : [0, 1] as const) {
  for (const k of kinds) {
    const s = k.make(level);
    const m = meshOf(s);
    const src = k.source(m, s);
    const exact = prepareDistance(m, 'exact').solve(src).field.distance;
    const solver = HeatSolver.prepare(m, { timeScale });
    const heat = solver.distance(src).distance;
    const h = solver.stats.meanEdgeLength;
    let sum = 0, n = 0, max = 0;
    for (let v = 0; v < exact.length; v++) {
      const g = exact[v]!;
      if (!(g >= 2 * h && g < Infinity)) continue;
      const e = Math.abs(heat[v]! - g) / g;
      sum += e; n++;
      if (e > max) max = e;
    }
    const extra = { nv: m.topology.nv, nf: m.topology.nf, level, timeScale, flips: solver.stats.flips };
    emit({ bench: BENCH, case: k.name, metric: 'meanRelError', value: sum / n, unit: 'ratio', ...extra });
    emit({ bench: BENCH, case: k.name, metric: 'maxRelError', value: max, unit: 'ratio', ...extra });
  }
}
