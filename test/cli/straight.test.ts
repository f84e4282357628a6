/**
 * End-to-end checks of `straight`. Known answers on a flat square (a
 * straight segment, elementary) and on an open cylinder (a line at angle α
 * from the axis rises L·cos α: the cylinder unrolls into the plane,
 * elementary); the JSON keys and curve files of the contract; one-line
 * refusals with exit 2, the step limit with exit 3.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './run-cli.js';
import { flatGrid, cylinder, objText as meshText } from '../fixtures/shapes.js';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-straight-'));
  // a 10 × 10 square at map coordinates (offset 431200, 6170400): full float64 digits must survive
  const sq = flatGrid(10, 10, 10, 10, 0.15, 3);
  for (let i = 0; i < sq.positions.length; i += 3) { sq.positions[i]! += 431200; sq.positions[i + 1]! += 6170400; }
  writeFileSync(join(dir, 'square.obj'), meshText(sq));
  writeFileSync(join(dir, 'tube.obj'), meshText(cylinder(48, 8, 2, 4)));
});

describe('straight', () => {
  it('flat square, --json: the documented keys, an exact straight segment at map coordinates (elementary)', () => {
    const r = runCli(['straight', join(dir, 'square.obj'), '--from', 'p:431203.25,6170402.5', '--heading', '30', '--length', '5', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    for (const k of ['length', 'points', 'stoppedAtBoundary', 'timings']) expect(j).toHaveProperty(k);
    expect(j.length).toBe(5);
    expect(Math.abs(j.planBearing - 30)).toBeLessThan(1e-9); // on a level plane the map bearing is the heading
    expect(j.stoppedAtBoundary).toBe(false);
    const a = j.points[0], b = j.points[j.points.length - 1];
    expect(a).toEqual([431203.25, 6170402.5, 0]);
    // heading 30° clockwise from +y: (sin 30°, cos 30°) (compass bearing, common practice)
    expect(Math.abs(b[0] - (431203.25 + 2.5))).toBeLessThan(1e-8);
    expect(Math.abs(b[1] - (6170402.5 + 5 * Math.cos(Math.PI / 6)))).toBeLessThan(1e-8);
  });

  it('open cylinder, reference along the axis: stops at the rim after (H − z0)/cos α, and writes GeoJSON and OBJ curve files', () => {
    const geo = join(dir, 'line.geojson'), obj = join(dir, 'line.obj');
    const r = runCli(['straight', join(dir, 'tube.obj'), '--from', 'p:2,0,1', '--heading', '60', '--reference', '0,0,1', '--length', '50', '-o', geo, '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.stoppedAtBoundary).toBe(true);
    const z0 = j.points[0][2];
    expect(Math.abs(z0 - 1)).toBeLessThan(1e-12);
    expect(Math.abs(j.length - (4 - z0) / Math.cos(Math.PI / 3))).toBeLessThan(1e-9);
    const g = JSON.parse(readFileSync(geo, 'utf8'));
    expect(g.features[0].geometry.type).toBe('LineString');
    expect(g.features[0].geometry.coordinates).toEqual(j.points);
    expect(g.features[0].properties.stoppedAtBoundary).toBe(true);
    expect(runCli(['straight', join(dir, 'tube.obj'), '--from', 'p:2,0,1', '--heading', '60', '--reference', '0,0,1', '--length', '50', '-o', obj]).code).toBe(0);
    const objText = readFileSync(obj, 'utf8');
    expect(objText).toMatch(/^l 1 2 3/m);
    expect(objText.match(/^v /gm)).toHaveLength(j.points.length);
  });

  it('refusals: one line, exit 2; the step limit: exit 3 naming --max-steps', () => {
    const sq = join(dir, 'square.obj');
    const cases: [string[], RegExp][] = [
      [['--from', 'v:5', '--length', '1'], /exactly one of --heading and --toward/],
      [['--from', 'v:5', '--toward', '1,2', '--length', '1'], /--toward must be three numbers/],
      [['--from', 'v:60', '--heading', '10', '--reference', '0,0,1', '--length', '1'], /--reference.*normal to the surface/],
      [['--from', 'v:60', '--heading', '10', '--reference', '0.05,0,1', '--length', '1'], /--reference.*nearly normal to the surface at the start \(2.9° from the normal/], // atan 0.05 = 2.86° (elementary)
      [['--from', 'v:5', '--heading', '180', '--length', '1'], /leaves the surface at once/], // v:5 lies on the side y = 0
    ];
    for (const [args, msg] of cases) {
      const r = runCli(['straight', sq, ...args]);
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).toMatch(msg);
    }
    const lim = runCli(['straight', join(dir, 'tube.obj'), '--from', 'p:2,0,1', '--heading', '85', '--reference', '0,0,1', '--length', '50', '--max-steps', '5']);
    expect(lim.code).toBe(3);
    expect(lim.stderr).toMatch(/--max-steps/);
  });

  it('help carries the cautions for terrain and machining', () => {
    const r = runCli(['straight', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Caution for route and terrain use/);
    expect(r.stdout).toMatch(/Caution for cutting and machining/);
  });
});
