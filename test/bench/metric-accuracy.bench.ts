/**
 * The heat method against the exact method under a user metric given as
 * edge lengths: issue 14's walking-time case (walking times by Tobler's
 * hiking function, Tobler 1993, the mean of both directions, fed as
 * `lengths:`; test/fixtures/walking-time.ts), on steep ground (relief 1:
 * about half the faces break the triangle inequality and are repaired by
 * mollification) and on gentle ground (relief 0.2: no repair), beside the
 * same terrain measured in the lengths of its embedding (heat's usual error
 * at that size). Mean and worst relative error over the vertices at least
 * two mean edge lengths from the source, as in heat-accuracy.bench.ts.
 *
 * Records per case and size: `meanRelError`, `maxRelError` (ratios), with
 * faces, the broken faces and the repair's ε over the mean edge length.
 * `--quick` runs 40 × 40 cells only; the full run adds 80 and 299 (the
 * issue's 178,802 faces).
 */
import { emit, quick } from './harness.js';
import { openSurface, measureDistances } from '../../src/index.js';
import { attachMetric, parseMetricSpec, meanEdgeLength, intrinsicFromPositions } from '../../src/api/metric.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { walkingTerrain, walkingTimeCsv } from '../fixtures/walking-time.js';

const BENCH = 'metric-accuracy';

for (const n of quick() ? [40] : [40, 80, 299]) {
  const from = { points: [{ kind: 'vertex' as const, vertex: (Math.round(n / 4)) * (n + 1) + Math.round(n / 4) }], curves: [] };
  for (const relief of [1, 0.2]) {
    const shape = walkingTerrain(n, 1, relief);
    const csv = walkingTimeCsv(shape);
    for (const lengths of ['embedding', 'walking-time'] as const) {
      const s = openSurface(meshFromTriangles(shape.positions, shape.triangles, 'walk'));
      const rep = lengths === 'walking-time' ? attachMetric(s, parseMetricSpec('lengths:walk.csv', { readText: () => csv })) : null;
      const h = rep ? rep.meanEdgeLength : meanEdgeLength(intrinsicFromPositions(s.topology, s.positions));
      const exact = measureDistances(s, from, { method: 'exact' }).field.distance;
      const heat = measureDistances(s, from, { method: 'heat' }).field.distance;
      let sum = 0, cnt = 0, max = 0;
      for (let v = 0; v < exact.length; v++) {
        if (!(exact[v]! >= 2 * h && exact[v]! < Infinity)) continue;
        const e = Math.abs(heat[v]! - exact[v]!) / exact[v]!;
        sum += e; cnt++;
        if (e > max) max = e;
      }
      const extra = {
        faces: s.topology.nf, relief,
        brokenFaces: rep?.triangleInequalityViolations ?? 0,
        epsilonOverMeanEdge: rep && rep.mollifyEpsilon > 0 ? rep.mollifyEpsilon / (rep.meanEdgeLength - rep.mollifyEpsilon) : 0,
      };
      const name = `${relief === 1 ? 'steep' : 'gentle'}-${lengths}`;
      emit({ bench: BENCH, case: name, metric: 'meanRelError', value: sum / cnt, unit: 'ratio', ...extra });
      emit({ bench: BENCH, case: name, metric: 'maxRelError', value: max, unit: 'ratio', ...extra });
    }
  }
}
