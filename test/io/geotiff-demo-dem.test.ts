/**
 * The bundled demo DEM (meshes/ostrel-moor.tif) is what its seeded
 * generator (meshes/make-dem.ts) writes, byte for byte, and reads back
 * through the DEM reader on its grid: 120 × 90 pixels of 30 m, the pixel
 * centres at the map positions of the GeoTIFF raster space (PixelIsArea,
 * OGC GeoTIFF 1.1 §B.2), float32 heights.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { makeMoor, MOOR } from '../../meshes/make-dem.js';
import { parseDem, pixelPosition } from '../../src/io/geotiff.js';

describe('the bundled Ostrel Moor DEM', () => {
  it('is reproduced by its generator and reads back on its grid', async () => {
    const bundled = new Uint8Array(readFileSync(join(import.meta.dirname, '../../meshes/ostrel-moor.tif')));
    expect(bundled.length).toBeLessThan(1 << 20); // kept small (the brief: ≤ 1 MB)
    expect(Buffer.from(await makeMoor()).equals(Buffer.from(bundled))).toBe(true);
    const dem = await parseDem(bundled, 'ostrel-moor.tif');
    expect([dem.grid.width, dem.grid.height, dem.grid.resX, dem.grid.resY]).toEqual([MOOR.width, MOOR.height, MOOR.res, -MOOR.res]);
    expect(dem.data.positions.length / 3).toBe(MOOR.width * MOOR.height);
    // the south-west pixel's centre: half a pixel in from the west and south edges
    expect(pixelPosition(dem.grid, 0, MOOR.height - 1)).toEqual([MOOR.west + MOOR.res / 2, MOOR.north - (MOOR.height - 0.5) * MOOR.res]);
  });
});
