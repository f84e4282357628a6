/**
 * End-to-end checks of `offset`: a trim line round a square hole, the JSON
 * contract, curve files, the caution in the help, and one-line errors.
 * Closed form: the outer parallel curve at D of a square of side a has
 * length 4a + 2πD (Steiner's formula for parallel sets, e.g. Santaló,
 * Integral Geometry and Geometric Probability, 1976, §I.1).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './run-cli.js';
import { gridTriangles, objText } from '../fixtures/shapes.js';

let dir = '';
const n = 24, W = 30, a = 10; // plate [−30, 30]² in mm, hole of side 10 mm on grid lines (cell 2.5 mm)

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-off-'));
  const positions = new Float64Array(3 * (n + 1) * (n + 1));
  for (let j = 0; j <= n; j++) for (let i = 0; i <= n; i++) {
    positions[3 * (j * (n + 1) + i)] = -W + (2 * W * i) / n;
    positions[3 * (j * (n + 1) + i) + 1] = -W + (2 * W * j) / n;
  }
  const all = gridTriangles(n, n), kept: number[] = [];
  for (let k = 0; k < all.length; k += 3) {
    const cx = (positions[3 * all[k]!]! + positions[3 * all[k + 1]!]! + positions[3 * all[k + 2]!]!) / 3;
    const cy = (positions[3 * all[k]! + 1]! + positions[3 * all[k + 1]! + 1]! + positions[3 * all[k + 2]! + 1]!) / 3;
    if (Math.abs(cx) < a / 2 && Math.abs(cy) < a / 2) continue;
    kept.push(all[k]!, all[k + 1]!, all[k + 2]!);
  }
  writeFileSync(join(dir, 'plate.obj'), objText({ positions, triangles: Uint32Array.from(kept) }));
});

describe('offset command', () => {
  it('the hole rim (loop@0,0,0) offset by 5 mm: one closed curve of length 4a + 2πD, --json keys', () => {
    const D = 5;
    const r = runCli(['offset', join(dir, 'plate.obj'), '--from', 'loop@0,0,0', '--distance', String(D), '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j).toHaveProperty('timings');
    expect(j.curves.length).toBe(1);
    const c = j.curves[0];
    for (const k of ['level', 'closed', 'length', 'points']) expect(c).toHaveProperty(k);
    expect(c.closed).toBe(true);
    expect(c.level).toBe(D);
    expect(c.points[0]).toEqual(c.points[c.points.length - 1]);
    const want = 4 * a + 2 * Math.PI * D;
    expect(Math.abs(c.length - want) / want).toBeLessThan(0.01);
    // every point at distance D from the square (exact crossings; plane geometry)
    for (const p of c.points) expect(Math.hypot(Math.max(0, Math.abs(p[0]) - a / 2), Math.max(0, Math.abs(p[1]) - a / 2))).toBeCloseTo(D, 8); // within 5e-9: 1e-10 of the 60 mm plate
  });

  it('--from-polyline: the rim given as a CSV or OBJ polyline of its corners gives the same trim line', () => {
    // the shortest path on the plate between consecutive corners of the convex hole is its side
    // (plane geometry), so the source is the rim itself: length 4a + 2πD as above
    const corners = [[-5, -5], [5, -5], [5, 5], [-5, 5], [-5, -5]];
    writeFileSync(join(dir, 'rim.csv'), 'x,y,z\n' + corners.map(([x, y]) => `${x},${y},0`).join('\n') + '\n');
    const want = 4 * a + 2 * Math.PI * 5;
    for (const f of ['rim.csv']) { // the OBJ form is read by the same parser (test/curves/offset.test.ts)
      const r = runCli(['offset', join(dir, 'plate.obj'), '--from-polyline', join(dir, f), '--distance', '5', '--json']);
      expect(r.code, r.stderr).toBe(0);
      const j = JSON.parse(r.stdout);
      expect(j.curves.length).toBe(1);
      expect(Math.abs(j.curves[0].length - want) / want).toBeLessThan(0.01);
    }
  });

  it('writes a curve file; the help carries the caution', () => {
    const js = join(dir, 'trim.json');
    expect(runCli(['offset', join(dir, 'plate.obj'), '--from', 'loop@0,0,0', '--distance', '5', '-o', js]).code).toBe(0);
    expect(JSON.parse(readFileSync(js, 'utf8')).curves.length).toBe(1);
    const help = runCli(['offset', '--help']).stdout;
    expect(help).toMatch(/estimates for planning/);
    expect(help).toMatch(/verify/i);
    expect(help).toMatch(/licensed practice/);
  });

  it('bad input: one line, exit 2', () => {
    for (const args of [
      ['offset', join(dir, 'plate.obj'), '--distance', '5'],
      ['offset', join(dir, 'plate.obj'), '--from', 'loop:7', '--distance', '5'],
    ]) {
      const r = runCli(args);
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.stderr.trim().split('\n').length).toBe(1);
    }
  });
});

describe('distance from a loop picked by a point', () => {
  it('loop@0,0,0 picks the hole (loop 1; loop 0 is the longest, the outer rim), says so, and measures as loop:1', () => {
    const run = (spec: string) => runCli(['distance', join(dir, 'plate.obj'), '--from', spec, '--to', 'p:30,30', '--json']);
    const a = run('loop@0,0,0'), b = run('loop:1');
    expect(a.code).toBe(0);
    expect(b.code).toBe(0);
    const ja = JSON.parse(a.stdout), jb = JSON.parse(b.stdout);
    expect(ja.loopsPicked).toEqual([{ spec: 'loop@0,0,0', loop: 1 }]);
    expect(jb.loopsPicked).toEqual([]); // loop:ID names its loop already
    // plane geometry: the plate corner (30, 30) is √(25² + 25²) from the hole's nearest corner (5, 5)
    expect(ja.targets[0].distance).toBeCloseTo(Math.hypot(25, 25), 9);
    expect(jb.targets[0].distance).toBe(ja.targets[0].distance);
    const text = runCli(['distance', join(dir, 'plate.obj'), '--from', 'loop@0,0,0', '--to', 'p:30,30']);
    expect(text.stdout).toContain("loop@0,0,0 picked boundary loop 1 (loop:1, as 'inspect' lists them)");
  });
});
