/**
 * The core runs in a browser: src/core.ts is bundled for the browser with
 * esbuild (which fails on any `node:` import), served from 127.0.0.1, and run
 * in headless Chromium driven by playwright-core (CHROMIUM_PATH, a system
 * chromium, or the one shipped by the dev dependency @sparticuz/chromium: see
 * launch.ts; no browser at all fails the test). The
 * page computes heat and exact distances on a sphere; they must equal the
 * values computed in Node by the same code, and the exact ones must be close to
 * the great-circle distance R·acos(n1·n2) (do Carmo 1976).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { build } from 'esbuild';
import { createServer, type Server } from 'node:http';
import { join, resolve, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Browser } from 'playwright-core';
import { launchChromium } from './launch.js';
import { icosphere } from '../fixtures/shapes.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { HeatSolver } from '../../src/geodesic/heat.js';
import { exactDistance } from '../../src/geodesic/exact/index.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
let server: Server;
let browser: Browser;
let url = '';

beforeAll(async () => {
  const bundle = await build({
    entryPoints: [join(root, 'src/core.ts')],
    bundle: true,
    format: 'esm',
    platform: 'browser',
    target: 'es2022',
    write: false,
    logLevel: 'silent',
  });
  const js = bundle.outputFiles[0]!.text;
  const html = '<!doctype html><meta charset="utf-8"><title>orthodrome core</title><script type="module">import * as o from "./core.js"; window.orthodrome = o; document.title = "ready";</script>';
  server = createServer((req, res) => {
    if (req.url === '/core.js') {
      res.writeHead(200, { 'content-type': 'text/javascript' });
      res.end(js);
    } else {
      res.writeHead(200, { 'content-type': 'text/html' });
      res.end(html);
    }
  });
  await new Promise<void>((ok) => server.listen(0, '127.0.0.1', ok));
  const addr = server.address();
  url = `http://127.0.0.1:${typeof addr === 'object' && addr ? addr.port : 0}/`;
}, 60_000);

afterAll(async () => {
  await browser?.close();
  await new Promise<void>((ok) => (server ? server.close(() => ok()) : ok()));
});

describe('core in the browser', () => {
  it('bundles without Node modules and gives the same distances as Node', async () => {
    // launched here, not in beforeAll, so that a missing browser is a failed test rather than a skipped one
    const launched = await launchChromium();
    browser = launched.browser;
    console.log(`browser: ${launched.source} (${launched.executable}), Chromium ${browser.version()}`);
    const s = icosphere(3, 2);
    const page = await browser.newPage();
    await page.goto(url);
    await page.waitForFunction(() => document.title === 'ready');
    const inPage = await page.evaluate(
      ({ positions, triangles }) => {
        const o = (window as unknown as { orthodrome: typeof import('../../src/core.js') }).orthodrome;
        const data = o.meshFromTriangles(Float64Array.from(positions), triangles, 'sphere');
        const surface = o.surfaceFromMeshData(data);
        const mesh = o.intrinsicFromPositions(surface.topology, surface.positions);
        const src = { points: [{ kind: 'vertex' as const, vertex: 0 }], curves: [] };
        const heat = o.HeatSolver.prepare(mesh).distance(src).distance;
        const exact = o.exactDistance(mesh, src).field.distance;
        return { heat: Array.from(heat), exact: Array.from(exact) };
      },
      { positions: Array.from(s.positions), triangles: Array.from(s.triangles) },
    );
    await page.close();

    const { topology: t } = buildTopology(s.triangles, s.positions.length / 3);
    const mesh = intrinsicFromPositions(t, s.positions);
    const src = { points: [{ kind: 'vertex' as const, vertex: 0 }], curves: [] };
    const heat = HeatSolver.prepare(mesh).distance(src).distance;
    const exact = exactDistance(mesh, src).field.distance;
    expect(inPage.heat).toHaveLength(t.nv);
    for (let v = 0; v < t.nv; v++) {
      expect(Math.abs(inPage.heat[v]! - heat[v]!)).toBeLessThan(1e-9);
      expect(Math.abs(inPage.exact[v]! - exact[v]!)).toBeLessThan(1e-9);
      // great circle on the sphere of radius 2; the exact polyhedral distance is within a few % at level 3
      const p = [s.positions[3 * v]! / 2, s.positions[3 * v + 1]! / 2, s.positions[3 * v + 2]! / 2];
      const q = [s.positions[0]! / 2, s.positions[1]! / 2, s.positions[2]! / 2];
      const gc = 2 * Math.acos(Math.min(1, Math.max(-1, p[0]! * q[0]! + p[1]! * q[1]! + p[2]! * q[2]!)));
      expect(Math.abs(inPage.exact[v]! - gc)).toBeLessThan(0.03 * 2 + 1e-9);
    }
  }, 60_000);
});
