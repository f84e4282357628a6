/**
 * End-to-end checks of `distance` and `path`. Known answers: on a flat square
 * the geodesic distance is the Euclidean one (elementary); on a cylinder of
 * radius R, sqrt((R·Δθ)² + Δz²) (developable surface, elementary).
 * Invariants: exact ≤ graph (the graph path is one surface path among many —
 * common practice); path length = distance to the end point.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync, readFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './run-cli.js';
import { flatGrid, cylinder, objText } from '../fixtures/shapes.js';

let dir = '';

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-dist-'));
  writeFileSync(join(dir, 'square.obj'), objText(flatGrid(10, 10, 10, 10, 0.15, 3)));
  writeFileSync(join(dir, 'tube.obj'), objText(cylinder(48, 8, 2, 4)));
  // two separate triangles: the second is unreachable from the first
  writeFileSync(join(dir, 'two.obj'), 'v 0 0 0\nv 1 0 0\nv 0 1 0\nv 5 0 0\nv 6 0 0\nv 5 1 0\nf 1 2 3\nf 4 5 6\n');
});

describe('distance', () => {
  it('flat square: exact equals Euclidean distance; JSON has the documented keys', () => {
    // corners: v:0 = (0,0), v:120 = (10,10) on an 11×11 vertex grid
    const r = runCli(['distance', join(dir, 'square.obj'), '--from', 'v:0', '--to', 'v:120', '--to', 'p:3,4,0', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    for (const k of ['method', 'sources', 'targets', 'timings', 'field']) expect(j).toHaveProperty(k);
    for (const k of ['load', 'prepare', 'solve']) expect(j.timings).toHaveProperty(k);
    expect(j.method).toBe('exact');
    expect(Math.abs(j.targets[0].distance - Math.SQRT2 * 10)).toBeLessThan(1e-9);
    expect(Math.abs(j.targets[1].distance - 5)).toBeLessThan(1e-9);
  });
  it('exact ≤ graph, heat within 3% on the flat square', () => {
    const get = (m: string) => JSON.parse(runCli(['distance', join(dir, 'square.obj'), '--from', 'v:0', '--to', 'v:120', '--method', m, '--json']).stdout).targets[0].distance;
    const exact = get('exact'), graph = get('graph'), heat = get('heat');
    expect(exact).toBeLessThanOrEqual(graph + 1e-12);
    expect(Math.abs(heat - exact) / exact).toBeLessThan(0.03);
  });
  it('cylinder: unrolled distance sqrt((R·Δθ)² + Δz²)', () => {
    // v:0 at θ = 0, z = 0; vertex 12 of ring 8 at θ = π/2, z = 4 (48 segments, 8 rings)
    const r = runCli(['distance', join(dir, 'tube.obj'), '--from', 'v:0', '--to', `v:${8 * 48 + 12}`, '--json']);
    const d = JSON.parse(r.stdout).targets[0].distance;
    // the polygon has chord length 2R·sin(π/48) per segment: unroll the prism, not the cylinder
    const arc = 12 * 2 * 2 * Math.sin(Math.PI / 48);
    expect(Math.abs(d - Math.hypot(arc, 4))).toBeLessThan(1e-9);
  });
  it('unreachable vertices are null in JSON and empty in CSV, never NaN', () => {
    const out = join(dir, 'two.csv');
    const r = runCli(['distance', join(dir, 'two.obj'), '--from', 'v:0', '--to', 'v:4', '--json', '-o', out]);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.targets[0].distance).toBeNull();
    expect(j.field.unreachableVertices).toBe(3);
    const rows = readFileSync(out, 'utf8').trim().split('\n');
    expect(rows[0]).toBe('vertex,x,y,z,distance');
    expect(rows[5]!.endsWith(',')).toBe(true);
    expect(readFileSync(out, 'utf8')).not.toMatch(/NaN|Infinity/);
  });
  it('--each gives one field per source from one prepared solver', () => {
    const out = join(dir, 'each.json');
    const r = runCli(['distance', join(dir, 'square.obj'), '--from', 'v:0', '--from', 'v:120', '--each', '--method', 'heat', '-o', out, '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.sets).toHaveLength(2);
    const f = JSON.parse(readFileSync(out, 'utf8'));
    expect(f.distance_0[0]).toBe(0);
    expect(f.distance_1[120]).toBe(0);
  });
  it('--from boundary measures from the edge of the part', () => {
    const j = JSON.parse(runCli(['distance', join(dir, 'square.obj'), '--from', 'boundary', '--to', 'p:5,5,0', '--json']).stdout);
    expect(Math.abs(j.targets[0].distance - 5)).toBeLessThan(1e-9);
  });
  it('--from-curve: distance from a polyline along the bottom edge is the height above it', () => {
    // v:0, v:1, v:2 lie on y = 0 (boundary vertices are not jittered)
    const j = JSON.parse(runCli(['distance', join(dir, 'square.obj'), '--from-curve', 'v:0;v:1;v:2', '--to', 'p:1,5,0', '--json']).stdout);
    expect(Math.abs(j.targets[0].distance - 5)).toBeLessThan(1e-9);
    const bad = runCli(['distance', join(dir, 'square.obj'), '--from-curve', 'v:0;v:5']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/share no face/);
  });
  it('bad point specs and out-of-range indices: exit 2 with one line naming the option', () => {
    for (const args of [['--from', 'q:1'], ['--from', 'v:99999'], ['--from', 'v:0', '--to', 'f:1:1,1']]) {
      const r = runCli(['distance', join(dir, 'square.obj'), ...args]);
      expect(r.code).toBe(2);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).toMatch(/--(from|to)/);
    }
  });
  it('help shows the route and machining cautions', () => {
    const r = runCli(['distance', '--help']);
    expect(r.stdout).toMatch(/not safety\s+assessments/);
    expect(r.stdout).toMatch(/qualified person must approve/);
  });
});

describe('path', () => {
  it('flat square: the path is the straight segment; length equals the distance; every format is written', () => {
    const base = ['path', join(dir, 'square.obj'), '--from', 'v:0', '--to', 'v:120'];
    const j = JSON.parse(runCli([...base, '--json']).stdout);
    expect(Math.abs(j.length - Math.SQRT2 * 10)).toBeLessThan(1e-9);
    expect(j.points[0]).toEqual([0, 0, 0]);
    expect(j.points.at(-1)).toEqual([10, 10, 0]);
    for (const p of j.points) expect(Math.abs(p[0] - p[1])).toBeLessThan(1e-9);
    for (const ext of ['obj', 'csv', 'geojson', 'json']) {
      const out = join(dir, `path.${ext}`);
      expect(runCli([...base, '-o', out]).code).toBe(0);
      expect(existsSync(out)).toBe(true);
    }
    expect(readFileSync(join(dir, 'path.obj'), 'utf8')).toMatch(/^l /m);
    const csv = readFileSync(join(dir, 'path.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toBe('x,y,z,length,face');
    expect(Number(csv.at(-1)!.split(',')[3])).toBeCloseTo(Math.SQRT2 * 10, 9);
    const gj = JSON.parse(readFileSync(join(dir, 'path.geojson'), 'utf8'));
    expect(gj.geometry.type).toBe('LineString');
    expect(gj.geometry.coordinates[0]).toHaveLength(3);
  });
  it('waypoints and --closed: a closed triangle tour on the flat square has the perimeter length', () => {
    const j = JSON.parse(runCli(['path', join(dir, 'square.obj'), '--from', 'v:0', '--via', 'v:10', '--to', 'v:120', '--closed', '--json']).stdout);
    expect(j.legs).toHaveLength(3);
    expect(Math.abs(j.length - (10 + 10 + Math.SQRT2 * 10))).toBeLessThan(1e-9);
  });
  it('points on different components: exit 2 with a clear message', () => {
    const r = runCli(['path', join(dir, 'two.obj'), '--from', 'v:0', '--to', 'v:4']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/different components/);
  });
});
