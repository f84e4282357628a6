/**
 * End-to-end checks of `isolines`: the JSON contract, curve files, a field
 * from CSV and from a PLY vertex property, and one-line errors (exit 2).
 * Known answers: on a flat square the distance from a corner is Euclidean,
 * so its isolines are quarter circles of length πr/2 (elementary); a linear
 * field x has straight isolines (elementary).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './run-cli.js';
import { flatGrid, objText } from '../fixtures/shapes.js';

let dir = '';
const n = 20, W = 10;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-iso-'));
  const s = flatGrid(n, n, W, W);
  writeFileSync(join(dir, 'square.obj'), objText(s));
  const rows = ['vertex,x,y,z,height'];
  for (let v = 0; v < s.positions.length / 3; v++) rows.push(`${v},${s.positions[3 * v]},${s.positions[3 * v + 1]},0,${s.positions[3 * v]}`);
  writeFileSync(join(dir, 'field.csv'), rows.join('\n') + '\n');
  const ply = ['ply', 'format ascii 1.0', `element vertex ${(n + 1) ** 2}`, 'property double x', 'property double y', 'property double z', 'property double quality',
    `element face ${s.triangles.length / 3}`, 'property list uchar int vertex_indices', 'end_header'];
  for (let v = 0; v < s.positions.length / 3; v++) ply.push(`${s.positions[3 * v]} ${s.positions[3 * v + 1]} 0 ${s.positions[3 * v + 1]}`);
  for (let f = 0; f < s.triangles.length; f += 3) ply.push(`3 ${s.triangles[f]} ${s.triangles[f + 1]} ${s.triangles[f + 2]}`);
  writeFileSync(join(dir, 'square.ply'), ply.join('\n') + '\n');
});

describe('isolines command', () => {
  it('distance from a corner every 2.5: quarter circles and quarter-annulus bands, --json has the documented keys', () => {
    const r = runCli(['isolines', join(dir, 'square.obj'), '--from', 'v:0', '--every', '2.5', '--bands', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j).toHaveProperty('timings');
    expect(j.levels).toEqual([2.5, 5, 7.5, 10, 12.5]);
    for (const c of j.curves) for (const k of ['level', 'closed', 'length', 'points']) expect(c).toHaveProperty(k);
    // levels up to W lie inside the square as whole quarter circles of radius r (length πr/2);
    // chords of a polyline inscribed in the arc: relative error ≤ (h/r)²/8·… → 1% is loose (common practice)
    for (const L of [2.5, 5, 7.5, 10]) {
      const cs = j.curves.filter((c: { level: number }) => c.level === L);
      expect(cs.length).toBe(1);
      expect(cs[0].closed).toBe(false);
      expect(Math.abs(cs[0].length - (Math.PI * L) / 2) / ((Math.PI * L) / 2)).toBeLessThan(0.01);
      for (const p of cs[0].points) expect(Math.abs(Math.hypot(p[0], p[1]) - L)).toBeLessThan(1e-10 * 30); // on the exact level (crossings and points bent inside faces), within 1e-10 of the mesh size
    }
    // closed form: quarter annuli of area π(r2² − r1²)/4 inside the square (elementary); all the bands tile the square, area W²
    const b1 = j.bands.find((b: { lower: number }) => b.lower === 2.5);
    expect(Math.abs(b1.area - (Math.PI * (25 - 6.25)) / 4) / b1.area).toBeLessThan(0.01);
    expect(b1.planArea).toBeCloseTo(b1.area, 9);
    const sum = j.bands.reduce((a: number, b: { area: number }) => a + b.area, 0);
    expect(Math.abs(sum - W * W)).toBeLessThan(1e-9 * W * W);
    for (const b of j.bands) for (const p of b.polygons) expect(p).toHaveProperty('outer');
  });

  it('a field from CSV and from a PLY vertex property: straight lines', () => {
    // closed form: the level set x = L (resp. y = L) of a linear field on the square is a segment of length W
    const a = JSON.parse(runCli(['isolines', join(dir, 'square.obj'), '--field', `${join(dir, 'field.csv')}:height`, '--levels', '3.3', '--json']).stdout);
    expect(a.curves.length).toBe(1);
    expect(a.curves[0].length).toBeCloseTo(W, 9);
    for (const p of a.curves[0].points) expect(p[0]).toBeCloseTo(3.3, 9);
    const b = JSON.parse(runCli(['isolines', join(dir, 'square.ply'), '--field', 'quality', '--levels', '4,6', '--json']).stdout);
    expect(b.curves.length).toBe(2);
    for (const c of b.curves) for (const p of c.points) expect(p[1]).toBeCloseTo(c.level, 9);
  });

  it('writes curve files by extension (GeoJSON with band polygons)', () => {
    const g = join(dir, 'iso.geojson');
    expect(runCli(['isolines', join(dir, 'square.obj'), '--from', 'v:0', '--levels', '3,6', '--bands', '-o', g]).code).toBe(0);
    const fc = JSON.parse(readFileSync(g, 'utf8'));
    expect(fc.type).toBe('FeatureCollection');
    expect(fc.features.filter((f: { geometry: { type: string } }) => f.geometry.type === 'LineString').length).toBe(2);
    expect(fc.features.filter((f: { geometry: { type: string } }) => f.geometry.type === 'Polygon').length).toBe(1);
  });

  it('bad input: one line, exit 2', () => {
    const cases: string[][] = [
      ['isolines', join(dir, 'square.obj'), '--from', 'v:9999', '--every', '1'],
      ['isolines', join(dir, 'square.obj'), '--field', 'nope', '--every', '1'],
      ['isolines', join(dir, 'square.obj'), '--field', join(dir, 'missing.csv'), '--every', '1'],
    ];
    for (const args of cases) {
      const r = runCli(args);
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.stderr.trim().split('\n').length).toBe(1);
      expect(r.stderr).toMatch(/^orthodrome: /);
    }
  });

  it('too many levels is a limit (exit 3) naming --max-levels', () => {
    const r = runCli(['isolines', join(dir, 'square.obj'), '--from', 'v:0', '--every', '0.001']);
    expect(r.code).toBe(3);
    expect(r.stderr).toMatch(/--max-levels/);
  });
});
