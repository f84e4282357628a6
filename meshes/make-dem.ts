/**
 * Makes the bundled demo DEM of the project's invented scenario:
 *
 * - `ostrel-moor.tif` — a terrain model of Ostrel Moor, the upland of the
 *   invented Ostrel estate above the Ostrel Knoll hillside: 3.6 km × 2.7 km
 *   on the estate's survey grid (easting/northing in metres, the same grid
 *   as `ostrel-knoll.obj`), 30 m pixels (120 × 90), float32 heights in
 *   metres. A broad fell top, a lower shoulder, a stream valley and gentle
 *   rough ground, so that walking times from the trailhead in the south-west
 *   corner reach an hour and 10-minute isochrones show several bands. A
 *   GeoTIFF (projected, user-defined CRS, PixelIsArea, tie point at the
 *   north-west corner) written by the project's own field writer.
 *
 * Deterministic: `npx tsx meshes/make-dem.ts` rewrites the same bytes.
 */
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { rng } from './rng.js';
import { writeFieldTiff, type DemGrid } from '../src/io/geotiff.js';

const here = dirname(fileURLToPath(import.meta.url));

/** Pixels per row and rows, pixel size (m), and the map position of the raster's north-west corner. */
export const MOOR = { width: 120, height: 90, res: 30, west: 428000, north: 6173000 } as const;

/** Height of the moor (m) at local coordinates (m east and north of the south-west corner). */
export function moorHeight(x: number, y: number, noise: (x: number, y: number) => number): number {
  const g = (cx: number, cy: number, sx: number, sy: number, h: number) => h * Math.exp(-(((x - cx) / sx) ** 2) - ((y - cy) / sy) ** 2);
  let z = 205 + 0.012 * x + 0.02 * y; // the estate rises north-east
  z += g(2300, 1900, 700, 520, 160); // the fell top
  z += g(1100, 1500, 420, 360, 70); // the western shoulder
  z -= g(1700, 900, 1400, 90, 28); // the stream valley, running east–west
  return z + noise(x, y);
}

/** Smooth rough ground: a few sine waves of random phase and direction, ±4 m. */
function roughGround(seed: number): (x: number, y: number) => number {
  const r = rng(seed), waves: [number, number, number, number][] = [];
  for (let i = 0; i < 6; i++) {
    const a = 2 * Math.PI * r(), wl = 150 + 250 * r();
    waves.push([Math.cos(a) / wl, Math.sin(a) / wl, 2 * Math.PI * r(), 0.5 + 0.5 * r()]);
  }
  return (x, y) => waves.reduce((s, [kx, ky, ph, amp]) => s + amp * Math.sin(2 * Math.PI * (kx * x + ky * y) + ph), 0);
}

/** The DEM's bytes. */
export async function makeMoor(): Promise<Uint8Array> {
  const { width, height, res, west, north } = MOOR;
  const noise = roughGround(11);
  const z = new Float64Array(width * height);
  for (let r = 0; r < height; r++) {
    for (let c = 0; c < width; c++) {
      const x = (c + 0.5) * res, y = (height - r - 0.5) * res; // pixel centre, from the south-west corner
      z[r * width + c] = Math.fround(moorHeight(x, y, noise));
    }
  }
  const grid: DemGrid = {
    width, height, originX: west, originY: north, resX: res, resY: -res, pixelIsPoint: false,
    epsg: null, linearUnit: 9001, noData: -9999, pixelVertex: Int32Array.from({ length: width * height }, (_, i) => i),
  };
  return writeFieldTiff(grid, z, { sampleType: 'float32' });
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  writeFileSync(join(here, 'ostrel-moor.tif'), await makeMoor());
}
