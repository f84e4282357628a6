/**
 * The core runs in a browser: src/core.ts (the `orthodrome/browser` entry) is
 * bundled for the browser with esbuild (which fails on any `node:` import),
 * with code splitting, so three.js (snapping `p:` points) sits in a chunk of
 * its own that the page loads only when it calls `pointLocator`. The bundle
 * is served from 127.0.0.1 and run in headless Chromium driven by
 * playwright-core (CHROMIUM_PATH, a system chromium, or the one shipped by the
 * dev dependency @sparticuz/chromium: see launch.ts; no browser at all fails
 * the test). The page opens a sphere from OBJ bytes and computes heat and
 * exact distances through the facade; they must equal the values computed in
 * Node by the same code, and the exact ones must be close to the great-circle
 * distance R·acos(n1·n2) (do Carmo 1976).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { build } from 'esbuild';
import { createServer, type Server } from 'node:http';
import { basename, join, resolve, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Browser } from 'playwright-core';
import { launchChromium } from './launch.js';
import { icosphere, objText } from '../fixtures/shapes.js';
import { formatSurfacePoint, measureDistances, openSurface, pointLocator } from '../../src/index.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
let server: Server;
let browser: Browser;
let url = '';
/** The bundle's files by name: core.js and its chunks. */
const served = new Map<string, string>();

beforeAll(async () => {
  const bundle = await build({
    entryPoints: { core: join(root, 'src/core.ts') },
    bundle: true,
    splitting: true,
    format: 'esm',
    platform: 'browser',
    target: 'es2022',
    outdir: join(root, 'out/browser-test'),
    write: false,
    logLevel: 'silent',
  });
  for (const f of bundle.outputFiles) if (f.path.endsWith('.js')) served.set(`/${basename(f.path)}`, f.text);
  const html = '<!doctype html><meta charset="utf-8"><title>orthodrome core</title><script type="module">import * as o from "./core.js"; window.orthodrome = o; document.title = "ready";</script>';
  server = createServer((req, res) => {
    const js = served.get(req.url ?? '');
    if (js !== undefined) {
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
  it('bundles without Node modules, keeps three.js out of the entry chunk', () => {
    const entry = served.get('/core.js')!;
    expect(served.size).toBeGreaterThan(1); // the lazy chunk(s) of the dynamic import
    // three.js announces its revision in a global it sets when loaded (three/src/Three.Core.js: __THREE__)
    expect(entry.includes('__THREE__')).toBe(false);
    expect([...served.values()].some((js) => js.includes('__THREE__'))).toBe(true);
  });

  it('gives the same distances as Node, and snaps a point after loading three.js on demand', async () => {
    // launched here, not in beforeAll, so that a missing browser is a failed test rather than a skipped one
    const launched = await launchChromium();
    browser = launched.browser;
    console.log(`browser: ${launched.source} (${launched.executable}), Chromium ${browser.version()}`);
    const s = icosphere(3, 2);
    const obj = objText(s);
    const page = await browser.newPage();
    const loaded: string[] = [];
    page.on('request', (r) => loaded.push(new URL(r.url()).pathname));
    await page.goto(url);
    await page.waitForFunction(() => document.title === 'ready');
    const chunksBefore = loaded.filter((p) => p.endsWith('.js')).length;
    const inPage = await page.evaluate(
      async ({ obj }) => {
        const o = (window as unknown as { orthodrome: typeof import('../../src/core.js') }).orthodrome;
        const surface = o.openSurface(new TextEncoder().encode(obj), 'sphere.obj');
        const src = { points: [{ kind: 'vertex' as const, vertex: 0 }], curves: [] };
        const heat = o.measureDistances(surface, src, { method: 'heat' }).field.distance;
        const exact = o.measureDistances(surface, src, { method: 'exact' }).field.distance;
        const locator = await o.pointLocator(surface);
        const snapped = o.formatSurfacePoint(locator.resolve('p:0,0,5', 'probe'));
        return { heat: Array.from(heat), exact: Array.from(exact), snapped, moved: locator.landings[0]!.distance };
      },
      { obj },
    );
    const chunksAfter = loaded.filter((p) => p.endsWith('.js')).length;
    await page.close();
    expect(chunksAfter).toBeGreaterThan(chunksBefore); // pointLocator fetched the snapping chunk

    const surface = openSurface(new TextEncoder().encode(obj), 'sphere.obj');
    const t = surface.topology;
    const src = { points: [{ kind: 'vertex' as const, vertex: 0 }], curves: [] };
    const heat = measureDistances(surface, src, { method: 'heat' }).field.distance;
    const exact = measureDistances(surface, src, { method: 'exact' }).field.distance;
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
    // the same point snapped in Node by the same code
    expect(inPage.snapped).toBe(formatSurfacePoint((await pointLocator(surface)).resolve('p:0,0,5', 'probe')));
    // (0,0,5) is 3 from the sphere of radius 2 (closed form); the inscribed icosphere lies inside it, at most
    // its sagitta 2(1 − cos(θ/2)) < 0.01 deeper for edges of θ < 0.2 rad at level 3
    expect(inPage.moved).toBeGreaterThanOrEqual(3 - 1e-9);
    expect(inPage.moved).toBeLessThan(3.01);
  }, 60_000);
});
