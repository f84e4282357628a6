/**
 * How a user metric's broken faces are repaired (`repair` / `--metric-repair`:
 * src/metric/user/repair.ts, shorten.ts): `auto` refuses a large
 * mollification, `shorten` sets edges to the shortest path along edges
 * (Gilbert & Jain 2017), and without a broken face the three agree bit for
 * bit. The large case is issue 14's walking times on steep ground
 * (test/fixtures/walking-time.ts; user-walking.test.ts measures what
 * mollification does to them).
 *
 * Sources of the bounds:
 * - a polyhedral distance is at most the length of any chain of edges
 *   between the two points (definition of a length metric; common
 *   practice), so the exact distance is at most the edge-graph distance of
 *   the repaired lengths;
 * - the decrease-only repair never lengthens an edge and the margin adds
 *   ε to each, so a chain's repaired length is at most its given length plus
 *   ε per edge (shorten.ts, proved in its header);
 * - each repaired edge is the shortest-path distance of the given lengths:
 *   checked against Dijkstra's algorithm of the graph method, an independent
 *   code path (src/geodesic/graph.ts);
 * - `travel` (Tobler's hiking function by direction, Steiner points: the
 *   project's walking-time command) models the same walk differently (by
 *   direction, straight segments inside faces), so its time is a yardstick,
 *   not a bound: the factor allowed is this project's choice, stated below.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openSurface, measureDistances, travelField } from '../../src/index.js';
import {
  attachMetric, attachedMetric, parseMetricSpec, metricCautions, triangleInequalityViolations, intrinsicDelaunay,
  intrinsicFromPositions, type MetricRepair,
} from '../../src/api/metric.js';
import { edgeCotanSum } from '../../src/metric/delaunay.js';
import { isOrthodromeError } from '../../src/errors.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { lengthsFromCsv } from '../../src/metric/user/lengths-file.js';
import { prepareDistance } from '../../src/geodesic/solver.js';
import { next } from '../../src/mesh/topology.js';
import { objText } from '../fixtures/shapes.js';
import { walkingTerrain, walkingTimeCsv, nearFlatFaces, meanAbsAngleDefect } from '../fixtures/walking-time.js';
import { runCli } from '../cli/run-cli.js';

const n = 40; // 1681 vertices, 3200 faces
const source = (n / 4) * (n + 1) + n / 4; // (250 m, 250 m)
const corner = (n + 1) * (n + 1) - 1; // (1000 m, 1000 m), the far corner
const from = { points: [{ kind: 'vertex' as const, vertex: source }], curves: [] };
const shape = walkingTerrain(n, 1);
const csv = walkingTimeCsv(shape);
const walkSurface = () => openSurface(meshFromTriangles(shape.positions, shape.triangles, 'walk'));
const walkSpec = () => parseMetricSpec('lengths:walk.csv', { readText: () => csv });

/**
 * A sliver: A, B, C on one line (B between), D above; faces ABD, BCD and the
 * flat ACB. Its lengths as written to three decimals (AB 0.4004 → 0.400,
 * BC 0.6004 → 0.600, AC 1.0008 → 1.001) break ACB by 0.001: a rounding-level
 * violation. `exact` writes AB 0.4, BC 0.6, AC 1 (0.4 + 0.6 = 1 in binary64:
 * a face with equality, not broken).
 */
const sliver = { positions: new Float64Array([0, 0, 0, 0.4004, 0, 0, 1.0008, 0, 0, 0.5, 1, 0]), triangles: new Uint32Array([0, 1, 3, 1, 2, 3, 0, 2, 1]) };
function sliverCsv(exact: boolean): string {
  const P = sliver.positions, rows = ['a,b,length'];
  for (const [a, b] of [[0, 1], [1, 2], [0, 2], [0, 3], [1, 3], [2, 3]] as const) {
    const d = Math.hypot(P[3 * a]! - P[3 * b]!, P[3 * a + 1]! - P[3 * b + 1]!);
    rows.push(`${a},${b},${exact && b !== 3 ? [0.4, 0.6, 1][a + b - 1] : d.toFixed(3)}`);
  }
  return rows.join('\n') + '\n';
}

describe("repair 'auto' (the default)", () => {
  it('refuses the walking times on steep ground: INPUT naming the file, the broken faces, ε absolute and × the mean edge, and what to do', () => {
    const mollified = attachMetric(walkSurface(), walkSpec(), { repair: 'mollify' });
    let err: unknown = null;
    try {
      attachMetric(walkSurface(), walkSpec());
    } catch (e) {
      err = e;
    }
    expect(isOrthodromeError(err) && err.code).toBe('INPUT');
    const m = (err as Error).message;
    // 1412 broken faces: counted from the CSV itself in user-walking.test.ts; ε and the ratio: those mollification applies when asked
    const eps = mollified.mollifyEpsilon.toPrecision(3), k = (mollified.mollifyEpsilon / mollified.meanEdgeLengthBeforeRepair).toPrecision(3);
    expect(m).toBe(
      `walk.csv: 1412 of 3200 faces break the triangle inequality; mollification would add ${eps} to every edge, ${k}× the mean edge length ` +
        "(more than the 5% repair 'auto' accepts), so distances would be mostly a count of the edges crossed. Shorten the long edges to the " +
        "shortest path along edges (repair 'shorten', --metric-repair shorten), or accept the change (--metric-repair mollify); for walking times use the travel command",
    );
    expect(k).toBe('23.6'); // 36.6 min on every edge against a mean of 1.55 (measured)
  });

  it('mollifies a rounding-level violation without a word: ε ≈ 0.001, no caution', () => {
    const s = openSurface(meshFromTriangles(sliver.positions, sliver.triangles, 'sliver'));
    const rep = attachMetric(s, parseMetricSpec('lengths:round.csv', { readText: () => sliverCsv(false) }));
    expect(rep.triangleInequalityViolations).toBe(1); // ACB: 1.001 > 0.400 + 0.600 (by construction)
    expect(rep.mollifyEpsilon).toBeGreaterThan(0.001 - 1e-12); // the mollification formula: the deficit 0.001 plus the margin δ (mollify.ts)
    expect(rep.mollifyEpsilon).toBeLessThan(0.001 + 1e-4);
    expect(metricCautions(rep, 'exact')).toEqual([]);
    expect(triangleInequalityViolations(attachedMetric(s)!.mesh)).toBe(0);
  });
});

describe("without a broken face, 'auto', 'mollify' and 'shorten' give the same bits", () => {
  const same = (mk: () => ReturnType<typeof walkSurface>, spec: () => ReturnType<typeof walkSpec>, src: typeof from) => {
    const runs = (['auto', 'mollify', 'shorten'] as MetricRepair[]).map((repair) => {
      const s = mk();
      const rep = attachMetric(s, spec(), { repair });
      return { rep, L: attachedMetric(s)!.mesh.edgeLength, d: measureDistances(s, src, { method: 'exact' }).field.distance };
    });
    for (const r of runs.slice(1)) {
      expect(Buffer.from(r.L.buffer).equals(Buffer.from(runs[0]!.L.buffer))).toBe(true);
      expect(Buffer.from(r.d.buffer).equals(Buffer.from(runs[0]!.d.buffer))).toBe(true);
      expect(r.rep.edgesShortened).toBe(0);
    }
    return runs[0]!.rep;
  };
  it('walking times on gentle ground (relief × 0.2: no face broken, user-walking.test.ts)', () => {
    const g = walkingTerrain(12, 1, 0.2), gcsv = walkingTimeCsv(g);
    const rep = same(() => openSurface(meshFromTriangles(g.positions, g.triangles, 'g')), () => parseMetricSpec('lengths:g.csv', { readText: () => gcsv }), { points: [{ kind: 'vertex', vertex: 0 }], curves: [] });
    expect(rep.triangleInequalityViolations).toBe(0);
  });
  it('a face with equality (0.4 + 0.6 = 1): not broken, the margin δ added alike', () => {
    const rep = same(() => openSurface(meshFromTriangles(sliver.positions, sliver.triangles, 'sliver')), () => parseMetricSpec('lengths:eq.csv', { readText: () => sliverCsv(true) }), { points: [{ kind: 'vertex', vertex: 0 }], curves: [] });
    expect(rep.triangleInequalityViolations).toBe(0);
    expect(rep.mollifyEpsilon).toBeGreaterThan(0); // the margin δ of mollify.ts on the flat face
  });
});

describe("repair 'shorten' on the walking times", () => {
  const s = walkSurface();
  const rep = attachMetric(s, walkSpec(), { repair: 'shorten' });
  const L = attachedMetric(s)!.mesh.edgeLength;
  const raw = { topology: s.topology, edgeLength: lengthsFromCsv(s.topology, csv, 'walk.csv') };
  const eps = rep.mollifyEpsilon;
  let solved: { exact: Float64Array; heat: Float64Array } | null = null;
  const fields = () => (solved ??= {
    exact: measureDistances(s, from, { method: 'exact' }).field.distance,
    heat: measureDistances(s, from, { method: 'heat' }).field.distance,
  });

  it('sets every edge to the shortest path along edges under the given times (checked by the graph method\'s Dijkstra), then adds the margin', () => {
    const t = s.topology;
    let shortened = 0, largest = 0;
    for (let e = 0; e < t.ne; e++) {
      expect(L[e]! - eps).toBeLessThanOrEqual(raw.edgeLength[e]! * (1 + 1e-12)); // decrease-only, then + ε
      if (L[e]! - eps < raw.edgeLength[e]! * (1 - 1e-12)) { shortened++; largest = Math.max(largest, 1 - (L[e]! - eps) / raw.edgeLength[e]!); }
    }
    expect(rep.edgesShortened).toBe(shortened); // 1117 of 4880 (measured)
    expect(Math.abs(rep.largestShortening - largest)).toBeLessThan(1e-9); // 88% (measured)
    // every edge at 40 sample vertices against Dijkstra from that vertex
    const graph = prepareDistance(raw, 'graph');
    for (let u = 0; u < t.nv; u += 43) {
      const d = graph.solve({ points: [{ kind: 'vertex', vertex: u }], curves: [] }).field.distance;
      for (let e = 0; e < t.ne; e++) {
        const h = t.edgeHalfedge[e]!, a = t.tri[h]!, b = t.tri[next(h)]!;
        if (a !== u && b !== u) continue;
        const w = a === u ? b : a;
        expect(Math.abs(L[e]! - eps - Math.min(raw.edgeLength[e]!, d[w]!))).toBeLessThanOrEqual(1e-12 * raw.edgeLength[e]!);
      }
    }
    expect(triangleInequalityViolations(attachedMetric(s)!.mesh)).toBe(0);
    expect(rep.repair).toBe('shorten');
    expect(rep.mollifyEpsilon / rep.meanEdgeLengthBeforeRepair).toBeLessThan(1e-4); // only the margin δ (1e-5 of the mean edge) is added
  });

  it('exact distances are at most Dijkstra over the repaired lengths, which is at most the user\'s own times along edges plus ε per edge', () => {
    const { exact } = fields();
    const repairedGraph = prepareDistance(attachedMetric(s)!.mesh, 'graph').solve(from).field.distance;
    const chain = prepareDistance(raw, 'graph').solve(from).field.distance;
    for (let v = 0; v < exact.length; v++) {
      expect(exact[v]!).toBeLessThanOrEqual(repairedGraph[v]! * (1 + 1e-9));
      expect(repairedGraph[v]!).toBeLessThanOrEqual(chain[v]! + s.topology.nv * eps); // a shortest chain has fewer than nv edges
    }
    expect(exact[corner]!).toBeLessThan(0.75 * chain[corner]!); // 16.0 min against 23.7 along edges (measured)
  });

  it('the far corner is within a factor of 1.5 of the travel command\'s walking time', () => {
    const { exact } = fields();
    const walk = travelField(walkSurface(), [{ kind: 'vertex', vertex: source }], { k: 7 }).seconds[corner]! / 60;
    // measured: travel 15.7 min (k = 7), shorten 16.05 (+2%; mollified: 1132, 72×); there and back averaged, travel gives 19.0. The factor 1.5 is
    // this project's choice: the models differ (times averaged over both directions along edges vs by direction inside faces)
    expect(exact[corner]! / walk).toBeGreaterThan(1 / 1.5);
    expect(exact[corner]! / walk).toBeLessThan(1.5);
  });

  it('the flat faces it leaves do not survive the intrinsic Delaunay flips (no guard blocks them); the cone points at the vertices do', () => {
    const m = attachedMetric(s)!.mesh, t = m.topology;
    const before = nearFlatFaces(m);
    expect(before.faces).toBeGreaterThan(0.3 * t.nf); // 1114 of 3200 (measured): a shortened edge is the sum of the two others
    // Bobenko & Springborn 2007 (Discrete Comput. Geom. 38): the flip algorithm ends at an intrinsic Delaunay triangulation, where
    // every interior edge has α + β ≤ π; an angle within 0.01 of π leaves the other one at most 0.01, so a nearly flat face survives
    // only beside the boundary (its long side is a boundary edge: no flip) or beside a needle; only degenerate flips may be skipped
    const d = intrinsicDelaunay(m), dt = d.mesh.topology;
    let nonDelaunay = 0;
    for (let e = 0; e < dt.ne; e++) if (edgeCotanSum(dt, d.mesh.edgeLength, dt.edgeHalfedge[e]!) < -1e-9) nonDelaunay++;
    expect(d.capped).toBe(false);
    expect(nonDelaunay).toBeLessThanOrEqual(d.skipped);
    expect(d.skipped).toBeLessThan(0.005 * t.ne); // 6 of 4880 (measured)
    const after = nearFlatFaces(d.mesh);
    expect(after.faces).toBeLessThan(0.02 * t.nf); // 38 (measured), 25 of them with a boundary side
    expect(after.faces - after.onBoundary).toBeLessThan(0.01 * t.nf); // 13 without a boundary side (measured)
    // what stays: curvature at the vertices. On a smooth surface sampled at spacing h an angle defect is about K·(vertex area), O(h²)
    // (discrete Gauss–Bonnet; common practice): the terrain's own geometry has 0.0099 rad on average (measured); the shortened walking
    // times 0.70 rad (measured; 0.75 at 12,800 faces, metric-accuracy bench), cone points at every vertex, which the flips do not change
    expect(meanAbsAngleDefect(intrinsicFromPositions(s.topology, s.positions))).toBeLessThan(0.02);
    expect(meanAbsAngleDefect(m)).toBeGreaterThan(0.4);
  });

  it('heat against exact after this repair: not within heat\'s usual error either (the issue\'s check does not hold; the rough caution stays)', () => {
    const { exact, heat } = fields();
    let sum = 0, cnt = 0, worst = 0;
    for (let v = 0; v < exact.length; v++) {
      expect(Number.isFinite(heat[v]!)).toBe(true);
      if (!(exact[v]! >= 2 * rep.meanEdgeLength)) continue;
      const r = Math.abs(heat[v]! - exact[v]!) / exact[v]!;
      sum += r; cnt++;
      if (r > worst) worst = r;
    }
    // usual error on this terrain's own geometry: 1.61% mean, 7.9% worst (user-walking.test.ts; README table, noisy terrain: 1.81%, 9.6%).
    // The cause is the curvature at the vertices (the test above), not flat faces: heat smooths over √t = h, the spacing of the cones
    expect(sum / cnt).toBeGreaterThan(0.03); // 4.6% mean (measured)
    expect(sum / cnt).toBeLessThan(0.07);
    expect(worst).toBeLessThan(0.35); // 26% (measured)
    expect(Math.abs(heat[corner]! / exact[corner]! - 1)).toBeLessThan(0.05); // 16.27 against 16.05 (measured)
    expect(metricCautions(rep, 'heat').map((c) => c.kind)).toEqual(['repair', 'rough']);
    // the cause (the test above) is not fixed by refining the input: 7.8% at 12,800 faces, 10% at 178,802 (metric-accuracy bench)
    expect(metricCautions(rep, 'heat')[1]!.message).toMatch(/needed a large repair: too rough for the heat method on this mesh .*; use --method exact \(refining the mesh does not help: the shortened lengths put cone points at the vertices at every resolution\)$/);
    expect(metricCautions(rep)[0]!.message).toMatch(/shortened 1117 of 4880 edges to the shortest path along edges \(by up to 88%\) and added [\d.e-]+ to every edge/);
  });
});

describe('--metric-repair through the CLI', () => {
  let dir = '';
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'orthodrome-repair-'));
    writeFileSync(join(dir, 'walk.obj'), objText(shape));
    writeFileSync(join(dir, 'walk.csv'), csv);
    writeFileSync(join(dir, 'sliver.obj'), objText(sliver));
    writeFileSync(join(dir, 'round.csv'), sliverCsv(false));
  });
  const walkArgs = () => ['distance', join(dir, 'walk.obj'), '--from', `v:${source}`, '--to', `v:${corner}`, '--metric', `lengths:${join(dir, 'walk.csv')}`];

  it('auto refuses the walking times: exit 2, one line naming the file and what to do, no stack trace, no output file', () => {
    const out = join(dir, 'refused.csv');
    const r = runCli([...walkArgs(), '-o', out]);
    expect(r.code).toBe(2);
    expect(r.stderr.endsWith('\n') && r.stderr.split('\n').length).toBe(2);
    expect(r.stderr).toMatch(new RegExp(`^orthodrome: ${join(dir, 'walk.csv').replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}: 1412 of 3200 faces break the triangle inequality; mollification would add 36\\.6 to every edge, 23\\.6× the mean edge length .*--metric-repair shorten.*--metric-repair mollify.*travel command\\n$`));
    expect(r.stdout).toBe('');
    expect(existsSync(out)).toBe(false);
    expect(readdirSync(dir).sort()).toEqual(['round.csv', 'sliver.obj', 'walk.csv', 'walk.obj']); // no temporary file left either
  });

  it('--metric-repair shorten answers, with the repair in metricReport and on the caution line', () => {
    const r = runCli([...walkArgs(), '--metric-repair', 'shorten', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.metricReport).toMatchObject({ repair: 'shorten', triangleInequalityViolations: 1412, edgesShortened: 1117 });
    expect(j.metricReport.largestShortening).toBeCloseTo(0.883, 3); // measured, as in the library above
    expect(Math.abs(j.targets[0].distance - 16.0457)).toBeLessThan(1e-3); // the library's exact distance to the corner (measured above: 16.0457 min)
    expect(r.stderr).toMatch(/^orthodrome: caution: the repair of the metric lengths:.* shortened 1117 of 4880 edges to the shortest path along edges \(by up to 88%\) and added [\d.e-]+ to every edge: results are those of the repaired lengths, at most the metric's cost along any chain of edges \(plus that margin per edge\)\n$/);
  });

  it('a rounding-level violation under auto: exit 0, nothing on stderr; --metric-repair without --metric is a usage error', () => {
    const r = runCli(['distance', join(dir, 'sliver.obj'), '--from', 'v:0', '--to', 'v:3', '--metric', `lengths:${join(dir, 'round.csv')}`, '--json']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toBe('');
    expect(JSON.parse(r.stdout).metricReport).toMatchObject({ repair: 'auto', triangleInequalityViolations: 1, edgesShortened: 0 });
    const u = runCli(['distance', join(dir, 'sliver.obj'), '--from', 'v:0', '--to', 'v:3', '--metric-repair', 'shorten']);
    expect(u.code).toBe(2);
    expect(u.stderr).toBe('orthodrome: --metric-repair works with --metric\n');
  });
});
