/**
 * Walking times on terrain against closed forms: Tobler's hiking function
 * (Tobler 1993) on flat ground and on a uniform incline in both directions,
 * Naismith's rule (1892) with Langmuir's descent corrections, a route held
 * to a slope limit on a plane steeper than the limit, face multipliers, and
 * convergence as the Steiner density grows.
 */
import { describe, expect, it } from 'vitest';
import { openSurface } from '../../src/api/surface.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { naismithSecondsPerMeter, paceModel, parsePaceTable, parseUpAxis, routeConvergence, steinerParams, toblerKmh, travelField, travelRoute } from '../../src/travel/index.js';
import { terrain } from '../fixtures/shapes.js';
import type { SurfacePoint } from '../../src/mesh/surface-point.js';
import { SteinerGraph } from '../../src/travel/steiner-graph.js';
import { pointFrame, pointSeeds, runTravelSearch, travelState } from '../../src/travel/travel-time.js';

const v = (vertex: number): SurfacePoint => ({ kind: 'vertex', vertex });
/** Tobler 1993: seconds to walk horizontal distance dx rising dh. */
const toblerSeconds = (dx: number, dh: number) => dx === 0 ? 0 : dx / ((6 * Math.exp(-3.5 * Math.abs(dh / dx + 0.05))) / 3.6);

function hill(n: number, size: number, height: (x: number, y: number) => number, faceProp?: (f: number) => number) {
  const s = terrain(n, n, size, size, height);
  const data = meshFromTriangles(s.positions, s.triangles, 'hill');
  if (faceProp) data.faceProps.push({ name: 'cost', type: 'float32', values: Float64Array.from({ length: s.triangles.length / 3 }, (_, f) => faceProp(f)) });
  return openSurface(data, 'hill');
}
const vid = (n: number, i: number, j: number) => j * (n + 1) + i;

describe('pace models', () => {
  it("Tobler's function: 5.036 km/h on the flat, 6 km/h at a 5 % descent", () => {
    // Tobler 1993: W = 6·exp(−3.5·|dh/dx + 0.05|); flat = 6·e^−0.175
    expect(toblerKmh(0)).toBeCloseTo(5.03674, 5); // 6 × 0.839457 (e^−0.175)
    expect(toblerKmh(-0.05)).toBe(6);
    const m = paceModel('tobler');
    expect(m.seconds(1000, 0)).toBeCloseTo(3600 / 5.03674, 1);
    expect(m.seconds(100, 10)).not.toBeCloseTo(m.seconds(100, -10), 3); // uphill ≠ downhill (Tobler 1993)
  });

  it("Naismith's rule: 5 km/h plus 1 h per 600 m of ascent; Langmuir's descent corrections", () => {
    const m = paceModel('naismith');
    // Naismith 1892: 5 km and 600 m of ascent take 1 h + 1 h
    expect(m.seconds(5000, 600)).toBeCloseTo(7200, 9);
    expect(m.seconds(5000, 0)).toBeCloseTo(3600, 9);
    // Langmuir (from memory): 5°–12° descents −10 min per 300 m, steeper +10 min per 300 m, gentler as flat
    const g8 = Math.tan((8 * Math.PI) / 180), g20 = Math.tan((20 * Math.PI) / 180), g3 = Math.tan((3 * Math.PI) / 180);
    expect(naismithSecondsPerMeter(-g8) * 1000).toBeCloseTo(720 - (600 / 300) * 1000 * g8, 9);
    expect(naismithSecondsPerMeter(-g20) * 1000).toBeCloseTo(720 + (600 / 300) * 1000 * g20, 9);
    expect(naismithSecondsPerMeter(-g3)).toBeCloseTo(0.72, 12);
  });

  it('a speed table is interpolated linearly and is impassable outside its range', () => {
    const rows = parsePaceTable('slope_percent,speed_kmh\n-20,3\n0,5\n20,2\n', 't.csv');
    const m = paceModel('table', { table: rows });
    // linear interpolation (common practice): 10 % → 3.5 km/h
    expect(m.seconds(1000, 100)).toBeCloseTo(3600 / 3.5, 9);
    expect(m.seconds(1000, 300)).toBe(Infinity);
    expect(() => parsePaceTable('slope_deg,speed_kmh\n0,abc\n', 'bad.csv')).toThrow(/bad\.csv:2/);
  });

  it('a slope limit blocks steeper steps both ways; no NaN for a vertical or empty step', () => {
    const m = paceModel('tobler', { maxSlopeDeg: 30 });
    expect(m.seconds(100, 60)).toBe(Infinity); // 31° (tan 31° ≈ 0.60)
    expect(m.seconds(100, -60)).toBe(Infinity);
    expect(Number.isFinite(m.seconds(100, 55))).toBe(true); // 28.8°
    expect(m.seconds(0, 0)).toBe(0);
    expect(m.seconds(0, 1)).toBe(Infinity);
    expect(parseUpAxis('-y')).toEqual([0, -1, 0]);
    expect(() => parseUpAxis('0,0,0')).toThrow(/--up/);
  });

  it('Steiner parameters: uniform j/(k+1) (Lanthier et al. 2001); geometric, doubling from the ends towards the middle (our rule)', () => {
    expect([...steinerParams(3, 'uniform')]).toEqual([0.25, 0.5, 0.75]);
    expect([...steinerParams(5, 'geometric')]).toEqual([0.125, 0.25, 0.5, 0.75, 0.875]);
    const even = [...steinerParams(4, 'geometric')];
    [1 / 6, 1 / 3, 2 / 3, 5 / 6].forEach((x, i) => expect(even[i]).toBeCloseTo(x, 15));
  });
});

describe('routes and fields', () => {
  const n = 10, size = 100;

  it('flat ground: time = distance / 5.036 km/h (Tobler), along a grid row and across the grid', () => {
    const s = hill(n, size, () => 0);
    const r = travelRoute(s, [v(vid(n, 0, 3)), v(vid(n, 10, 3))]);
    expect(r.seconds).toBeCloseTo(toblerSeconds(100, 0), 6);
    expect(r.meters).toBeCloseTo(100, 9);
    expect(r.ascent).toBe(0);
    // off the grid lines: the graph route is a real route, so never faster than the straight line (triangle inequality)
    const d = Math.hypot(100, 30);
    const diag = travelRoute(s, [v(vid(n, 0, 0)), v(vid(n, 10, 3))], { k: 7 });
    expect(diag.seconds).toBeGreaterThanOrEqual(toblerSeconds(d, 0) * (1 - 1e-12));
    expect(diag.seconds).toBeLessThan(toblerSeconds(d, 0) * 1.01);
  });

  it('a uniform incline: the straight route matches the closed form both ways, and uphill ≠ downhill', () => {
    const s = hill(n, size, (x) => 0.1 * x); // 10 % grade along x
    const up = travelRoute(s, [v(vid(n, 0, 5)), v(vid(n, 10, 5))]);
    const down = travelRoute(s, [v(vid(n, 10, 5)), v(vid(n, 0, 5))]);
    expect(up.seconds).toBeCloseTo(toblerSeconds(100, 10), 6); // Tobler 1993, dh/dx = +0.1
    expect(down.seconds).toBeCloseTo(toblerSeconds(100, -10), 6); // dh/dx = −0.1
    expect(up.seconds).toBeGreaterThan(down.seconds * 1.3);
    expect(up.ascent).toBeCloseTo(10, 9);
    expect(down.descent).toBeCloseTo(10, 9);
    expect(up.meters).toBeCloseTo(Math.hypot(100, 10), 9);
    expect(up.steepest!.degrees).toBeCloseTo((Math.atan(0.1) * 180) / Math.PI, 9);
    expect(up.steepestSustained!.degrees).toBeCloseTo((Math.atan(0.1) * 180) / Math.PI, 9); // a uniform grade: every stretch has it
    expect(up.steepestSustained!.meters).toBeGreaterThanOrEqual(10);
    expect(down.steepestSustained!.degrees).toBeCloseTo(-(Math.atan(0.1) * 180) / Math.PI, 9);
  });

  it('above the slope limit the route zig-zags, every step within the limit, no faster than the limit slope allows', () => {
    const s = hill(20, 100, (x) => 0.5 * x); // 26.6° along x
    const limit = 15;
    const r = travelRoute(s, [v(vid(20, 0, 10)), v(vid(20, 8, 10))], { maxSlopeDeg: limit, k: 5 });
    const rise = 0.5 * 40;
    for (let i = 1; i < r.points.length; i++) {
      const a = r.points[i - 1]!, b = r.points[i]!;
      const deg = (Math.atan2(Math.abs(b[2] - a[2]), Math.hypot(b[0] - a[0], b[1] - a[1])) * 180) / Math.PI;
      expect(deg).toBeLessThanOrEqual(limit + 1e-9);
    }
    // closed form: climbing Δh at grade tan 15° takes Δh / tan 15° of horizontal walking at W(tan 15°)
    const g = Math.tan((limit * Math.PI) / 180);
    const best = toblerSeconds(rise / g, rise);
    expect(r.seconds).toBeGreaterThanOrEqual(best * (1 - 1e-9));
    expect(r.seconds).toBeLessThan(best * 1.25);
    expect(r.horizontalMeters).toBeGreaterThan(rise / g - 1e-6);
  });

  it('times only fall and settle as k grows (nested uniform points), towards the straight line on flat ground', () => {
    const s = hill(n, size, () => 0);
    const c = routeConvergence(s, [v(vid(n, 0, 0)), v(vid(n, 10, 7))], { k: 1 });
    expect(c.map((x) => x.k)).toEqual([1, 3, 7]);
    const exact = toblerSeconds(Math.hypot(100, 70), 0); // straight line on a plane (triangle inequality)
    for (let i = 1; i < c.length; i++) expect(c[i]!.seconds).toBeLessThanOrEqual(c[i - 1]!.seconds + 1e-9);
    const err = c.map((x) => x.seconds / exact - 1);
    expect(err[2]!).toBeLessThan(err[0]!);
    expect(err[2]!).toBeLessThan(0.01);
  });

  it('face multipliers: 2 everywhere doubles the time; an impassable band forces a detour or blocks', () => {
    const s2 = hill(n, size, () => 0, () => 2);
    const r = travelRoute(s2, [v(vid(n, 0, 3)), v(vid(n, 10, 3))], { faceMultipliers: 'cost' });
    expect(r.seconds).toBeCloseTo(2 * toblerSeconds(100, 0), 6);
    // faces of column i = 5 (6 per row: 2 per cell) impassable on rows j < 9: the route goes round through row 9
    const wall = hill(n, size, () => 0, (f) => (Math.floor(f / 2) % n === 5 && Math.floor(f / 2 / n) < 9 ? 0 : 1));
    const d = travelRoute(wall, [v(vid(n, 0, 0)), v(vid(n, 10, 0))], { faceMultipliers: 'cost' });
    expect(d.seconds).toBeGreaterThan(toblerSeconds(100, 0) * 1.5);
    const full = hill(n, size, () => 0, (f) => (Math.floor(f / 2) % n === 5 ? 0 : 1));
    expect(() => travelRoute(full, [v(vid(n, 0, 0)), v(vid(n, 10, 0))], { faceMultipliers: 'cost', k: 0 })).toThrow(/no passable route/);
    expect(() => travelRoute(s2, [v(0), v(5)], { faceMultipliers: 'nope' })).toThrow(/no face property 'nope'/);
  });

  it('the field: vertex times on flat ground are the straight-line time within the discretisation, never below it', () => {
    const s = hill(n, size, () => 0);
    const f = travelField(s, [v(vid(n, 5, 5))], { k: 5 });
    let worst = 0;
    for (let j = 0; j <= n; j++) {
      for (let i = 0; i <= n; i++) {
        const exact = toblerSeconds(Math.hypot(10 * (i - 5), 10 * (j - 5)), 0); // straight line on a plane
        const got = f.seconds[vid(n, i, j)]!;
        expect(got).toBeGreaterThanOrEqual(exact * (1 - 1e-12));
        worst = Math.max(worst, exact > 0 ? got / exact - 1 : 0);
      }
    }
    expect(worst).toBeLessThan(0.02);
    expect(f.approximation.relativeGap).toBeCloseTo(1 / 6, 12);
    // along an edge the field is linear between its nodes
    expect(Number.isFinite(f.alongEdge(0, 0.3))).toBe(true);
  });

  it('waypoints: the route visits them in order and the legs add up', () => {
    const s = hill(n, size, (x, y) => 0.05 * x + 0.02 * y);
    const r = travelRoute(s, [v(vid(n, 0, 0)), v(vid(n, 10, 0)), v(vid(n, 10, 10))]);
    expect(r.legs).toHaveLength(2);
    expect(r.legs[0]!.seconds + r.legs[1]!.seconds).toBeCloseTo(r.seconds, 9);
    expect(r.legs[0]!.meters + r.legs[1]!.meters).toBeCloseTo(r.meters, 9);
    expect(r.legs[0]!.seconds).toBeCloseTo(toblerSeconds(100, 5), 6); // along the row: grade 0.05 (Tobler 1993)
    expect(r.cumulativeSeconds.at(-1)).toBeCloseTo(r.seconds, 9);
    expect(r.stopIndex).toHaveLength(3);
    expect(r.points[r.stopIndex[1]!]).toEqual([100, 0, 5]); // the waypoint v(10, 0): x = 100, z = 0.05·100
    expect(r.cumulativeSeconds[r.stopIndex[1]!]).toBeCloseTo(r.legs[0]!.seconds, 9);
  });

  it('A* with the plan-distance bound gives the times of plain Dijkstra (Hart, Nilsson & Raphael 1968), settling fewer nodes', () => {
    const s = hill(16, 160, (x, y) => 8 * Math.sin(x / 23) * Math.cos(y / 17) + 0.02 * x, (f) => 1 + (f % 7) / 4);
    const mult = Float64Array.from(s.data.faceProps[0]!.values);
    for (const model of ['tobler', 'naismith'] as const) {
      const pace = paceModel(model, { maxSlopeDeg: 25 });
      const g = new SteinerGraph(s.topology, s.positions, { k: 3, faceMultipliers: mult });
      const st = travelState(g);
      const a: SurfacePoint = { kind: 'face', face: 3, bary: [0.2, 0.3, 0.5] }, b: SurfacePoint = { kind: 'edge', edge: 700, t: 0.4 };
      const plain = runTravelSearch(g, pace, st, pointSeeds(g, pace, a, true), pointSeeds(g, pace, b, false));
      const settledPlain = st.settled;
      const goal = pointFrame(g, b);
      const star = runTravelSearch(g, pace, st, pointSeeds(g, pace, a, true), pointSeeds(g, pace, b, false), Infinity, [goal[0], goal[1]]);
      expect(Number.isFinite(plain.seconds)).toBe(true);
      expect(Math.abs(star.seconds - plain.seconds)).toBeLessThanOrEqual(1e-9 * plain.seconds);
      expect(st.settled).toBeLessThan(settledPlain);
    }
  });

  it('a graph over the memory budget is a LIMIT error naming the options, before any allocation', () => {
    const s = hill(n, size, () => 0);
    let err: unknown;
    try { travelField(s, [v(0)], { k: 5, memoryBudget: 1000 }); } catch (e) { err = e; }
    expect((err as { code?: string }).code).toBe('LIMIT'); // common practice: a resource limit is not bad input
    expect(String(err)).toMatch(/--memory-budget.*--steiner/);
  });

  it('the up axis: the incline turned so that +y is up gives the same times with up = +y (rotation invariance)', () => {
    const s = hill(n, size, (x, y) => 0.1 * x + 0.03 * y);
    const P = s.data.positions, R = new Float64Array(P.length);
    for (let i = 0; i < P.length; i += 3) { R[i] = P[i]!; R[i + 1] = P[i + 2]!; R[i + 2] = -P[i + 1]!; } // rotation by −90° about x: +z → +y
    const turned = openSurface(meshFromTriangles(R, s.data.faceIndices, 'turned'), 'turned');
    const stops = [v(vid(n, 1, 2)), v(vid(n, 9, 8))];
    const a = travelRoute(s, stops, { k: 3 }), b = travelRoute(turned, stops, { k: 3, up: [0, 1, 0] });
    expect(b.seconds).toBeCloseTo(a.seconds, 6);
    expect(b.ascent).toBeCloseTo(a.ascent, 6);
    expect(travelRoute(turned, stops, { k: 3 }).seconds).not.toBeCloseTo(a.seconds, 1); // with +z up the ground is a wall
  });

  it('face multipliers from a PLY face property: a 1 × 2 strip whose second square is marked 2 (off-path) takes 1 + 2 times as long', () => {
    // ASCII PLY with a face property after the index list (the PLY format, common practice): two 10 m squares, two triangles each
    const ply = [
      'ply', 'format ascii 1.0', 'element vertex 6', 'property double x', 'property double y', 'property double z',
      'element face 4', 'property list uchar int vertex_indices', 'property float cost', 'end_header',
      '0 0 0', '10 0 0', '20 0 0', '0 10 0', '10 10 0', '20 10 0',
      '3 0 1 4 1', '3 0 4 3 1', '3 1 2 5 2', '3 1 5 4 2', '',
    ].join('\n');
    const s = openSurface(new TextEncoder().encode(ply), 'strip.ply');
    // along the bottom edge y = 0: 10 m at ×1, then 10 m at ×2 (boundary edges belong to one face each)
    const r = travelRoute(s, [v(0), v(2)], { faceMultipliers: 'cost', k: 3 });
    expect(r.seconds).toBeCloseTo(3 * toblerSeconds(10, 0), 6);
  });
});
