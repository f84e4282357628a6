/**
 * The heat method against the exact method under a user metric given as
 * edge lengths: issue 14's walking-time case (walking times by Tobler's
 * hiking function, Tobler 1993, the mean of both directions, fed as
 * `lengths:`; test/fixtures/walking-time.ts), on steep ground (relief 1:
 * about half the faces break the triangle inequality) repaired both ways
 * (`mollify`: one ε on every edge; `shorten`: edges to the shortest path
 * along edges, Gilbert & Jain 2017, then a margin), and on gentle ground
 * (relief 0.2: no repair), beside the same terrain measured in the lengths
 * of its embedding (heat's usual error at that size). Mean and worst
 * relative error over the vertices at least two mean edge lengths from the
 * source, as in heat-accuracy.bench.ts.
 *
 * Records per case and size: `meanRelError`, `maxRelError` (ratios), with
 * faces, the broken faces, the repair's ε over the mean edge length before
 * repair and the edges shortened; for the walking-time cases `farCorner`,
 * the exact distance to the corner opposite the origin (minutes), beside
 * `travelCorner`, the `travel` command's walking time there (Tobler by
 * direction, k = 7 Steiner points) and `chainCorner`, the user's own times
 * along edges (the edge-graph distance); `repairCpuMs`, the CPU time of
 * attaching the metric (quadrature-free: reading the CSV, counting, repair).
 * `--quick` runs 40 × 40 cells only; the full run adds 80 and 299 (the
 * issue's 178,802 faces).
 *
 * Why heat is off after `shorten` (issue 14; figures per case, metric
 * `triangulation`): `nearFlatFaces` (largest angle within 0.01 rad of π)
 * before and after the intrinsic Delaunay flips (Bobenko & Springborn 2007;
 * src/metric/delaunay.ts: a face with an angle near π makes the edge opposite
 * it non-Delaunay, so the flips remove it unless that edge is on the
 * boundary), the flips made and skipped, the interior edges left
 * non-Delaunay, and `meanAbsAngleDefect`, the mean |2π − angle sum| over
 * interior vertices (src/metric/curvature.ts): how far the lengths are from
 * a smooth surface at the scale of the edges (on a smooth surface it shrinks
 * like h²). And for 40 and 80 cells, metric `refinedHeat*`: heat on the same
 * repaired polyhedron, its triangulation refined intrinsically (Rivara
 * bisection to a quarter of the mean edge, metric/refine.ts, then flips) with
 * time scale 0.25: whether heat converges on that polyhedron at all.
 */
import { emit, quick } from './harness.js';
import { openSurface, measureDistances, travelField } from '../../src/index.js';
import { attachMetric, parseMetricSpec, meanEdgeLength, intrinsicFromPositions, type MetricRepair } from '../../src/api/metric.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { lengthsFromCsv } from '../../src/metric/user/lengths-file.js';
import { prepareDistance } from '../../src/geodesic/solver.js';
import { walkingTerrain, walkingTimeCsv, nearFlatFaces, meanAbsAngleDefect } from '../fixtures/walking-time.js';
import { surfaceIntrinsic } from '../../src/metric/user/surface-metric.js';
import { intrinsicDelaunay, edgeCotanSum } from '../../src/metric/delaunay.js';
import { refineLongEdges } from '../../src/metric/refine.js';
import { HeatSolver } from '../../src/geodesic/heat.js';
import type { IntrinsicMesh } from '../../src/metric/intrinsic.js';

const BENCH = 'metric-accuracy';

/** The figures of the module comment's `triangulation` record. */
function triangulationFigures(m: IntrinsicMesh): Record<string, number> {
  const before = nearFlatFaces(m);
  const d = intrinsicDelaunay(m);
  const after = nearFlatFaces(d.mesh);
  const t = d.mesh.topology;
  let nonDelaunay = 0;
  for (let e = 0; e < t.ne; e++) if (edgeCotanSum(t, d.mesh.edgeLength, t.edgeHalfedge[e]!) < -1e-9) nonDelaunay++;
  return {
    nearFlatFaces: before.faces, nearFlatAfterFlips: after.faces, nearFlatAfterFlipsOnBoundary: after.onBoundary,
    flips: d.flips, flipsSkipped: d.skipped, nonDelaunayAfterFlips: nonDelaunay, meanAbsAngleDefect: meanAbsAngleDefect(m),
  };
}

for (const n of quick() ? [40] : [40, 80, 299]) {
  const source = Math.round(n / 4) * (n + 1) + Math.round(n / 4);
  const corner = (n + 1) * (n + 1) - 1;
  const from = { points: [{ kind: 'vertex' as const, vertex: source }], curves: [] };
  for (const relief of [1, 0.2]) {
    const shape = walkingTerrain(n, 1, relief);
    const csv = walkingTimeCsv(shape);
    const cases: (MetricRepair | 'embedding')[] = relief === 1 ? ['embedding', 'mollify', 'shorten'] : ['embedding', 'auto'];
    let travelCorner = NaN, chainCorner = NaN;
    if (relief === 1) {
      const plain = openSurface(meshFromTriangles(shape.positions, shape.triangles, 'walk'));
      travelCorner = travelField(plain, [{ kind: 'vertex', vertex: source }], { k: 7 }).seconds[corner]! / 60;
      const raw = { topology: plain.topology, edgeLength: lengthsFromCsv(plain.topology, csv, 'walk.csv') };
      chainCorner = prepareDistance(raw, 'graph').solve(from).field.distance[corner]!;
    }
    for (const lengths of cases) {
      const s = openSurface(meshFromTriangles(shape.positions, shape.triangles, 'walk'));
      const c0 = process.cpuUsage();
      const rep = lengths === 'embedding' ? null : attachMetric(s, parseMetricSpec('lengths:walk.csv', { readText: () => csv }), { repair: lengths });
      const cpu = process.cpuUsage(c0);
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
        epsilonOverMeanEdge: rep ? rep.mollifyEpsilon / rep.meanEdgeLengthBeforeRepair : 0,
        edgesShortened: rep?.edgesShortened ?? 0,
      };
      const name = `${relief === 1 ? 'steep' : 'gentle'}-${lengths === 'embedding' ? 'embedding' : `walking-time-${lengths}`}`;
      emit({ bench: BENCH, case: name, metric: 'meanRelError', value: sum / cnt, unit: 'ratio', ...extra });
      emit({ bench: BENCH, case: name, metric: 'maxRelError', value: max, unit: 'ratio', ...extra });
      if (rep) emit({ bench: BENCH, case: name, metric: 'repairCpuMs', value: (cpu.user + cpu.system) / 1000, unit: 'ms', ...extra });
      const mesh = surfaceIntrinsic(s);
      emit({ bench: BENCH, case: name, metric: 'triangulation', value: 0, unit: 'figures', ...triangulationFigures(mesh), ...extra });
      if (n <= 80 && relief === 1 && lengths !== 'mollify') {
        const fine = refineLongEdges(intrinsicDelaunay(mesh).mesh, 0.25 * meanEdgeLength(mesh), 1e8);
        const refined = HeatSolver.prepare(intrinsicDelaunay(fine.mesh).mesh, { timeScale: 0.25 }).distance(from).distance;
        let rs = 0, rc = 0, rm = 0;
        for (let v = 0; v < exact.length; v++) {
          if (!(exact[v]! >= 2 * h && exact[v]! < Infinity)) continue;
          const e = Math.abs(refined[v]! - exact[v]!) / exact[v]!;
          rs += e; rc++;
          if (e > rm) rm = e;
        }
        const more = { refinedFaces: fine.mesh.topology.nf, refineTo: 0.25, timeScale: 0.25, ...extra };
        emit({ bench: BENCH, case: name, metric: 'refinedHeatMeanRelError', value: rs / rc, unit: 'ratio', ...more });
        emit({ bench: BENCH, case: name, metric: 'refinedHeatMaxRelError', value: rm, unit: 'ratio', ...more });
      }
      if (rep && relief === 1) {
        emit({ bench: BENCH, case: name, metric: 'farCorner', value: exact[corner]!, unit: 'min', heatFarCorner: heat[corner]!, travelCorner, chainCorner, ...extra });
      }
    }
  }
}
