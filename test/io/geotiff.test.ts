/**
 * DEM GeoTIFF in and out. Rasters are written by the `geotiff` package
 * (the reference reader/writer here), read into a mesh by parseDem, and
 * fields written back by writeFieldTiff are read again by `geotiff`:
 * heights, map coordinates (pixel centres for PixelIsArea, grid points for
 * PixelIsPoint: OGC GeoTIFF 1.1 §B.2, from memory), nodata and the EPSG
 * code must survive.
 */
import { describe, expect, it } from 'vitest';
import { fromArrayBuffer, writeArrayBuffer } from 'geotiff';
import { isTiff, parseDem, writeFieldTiff } from '../../src/io/geotiff.js';
import { openSurface } from '../../src/api/surface.js';
import { boundaryEdgeCount } from '../../src/mesh/topology.js';

const W = 6, H = 5, X0 = 512345.25, Y0 = 5413398.75, RES = 10;
const height = (c: number, r: number) => 400 + 3.3 * c - 1.7 * r + 0.01 * c * r;

function demBytes(opts: { pointRaster?: boolean; geographic?: boolean; hole?: boolean } = {}): Uint8Array {
  const z = new Float32Array(W * H);
  for (let r = 0; r < H; r++) for (let c = 0; c < W; c++) z[r * W + c] = height(c, r);
  if (opts.hole !== false) z[2 * W + 2] = -9999;
  const meta: Record<string, unknown> = { width: W, height: H, ModelPixelScale: [RES, RES, 0], ModelTiepoint: [0, 0, 0, X0, Y0, 0], GDAL_NODATA: '-9999' };
  if (!opts.geographic) Object.assign(meta, { ProjectedCSTypeGeoKey: 32633, GTModelTypeGeoKey: 1, GTRasterTypeGeoKey: opts.pointRaster ? 2 : 1 });
  return new Uint8Array(writeArrayBuffer(z, meta as never));
}

describe('DEM GeoTIFF', () => {
  it('a DEM becomes a grid mesh: pixel centres in float64 map coordinates, heights as stored, the nodata pixel a hole', async () => {
    const bytes = demBytes();
    expect(isTiff(bytes)).toBe(true);
    const { data, grid } = await parseDem(bytes, 'dem.tif');
    expect(grid.epsg).toBe(32633);
    expect(data.positions.length / 3).toBe(W * H - 1);
    for (let r = 0; r < H; r++) {
      for (let c = 0; c < W; c++) {
        const v = grid.pixelVertex[r * W + c]!;
        if (r === 2 && c === 2) { expect(v).toBe(-1); continue; }
        // PixelIsArea: the tie point is the raster's corner, values at pixel centres (GeoTIFF §B.2)
        expect(data.positions[3 * v]).toBe(X0 + (c + 0.5) * RES);
        expect(data.positions[3 * v + 1]).toBe(Y0 - (r + 0.5) * RES);
        expect(data.positions[3 * v + 2]).toBe(Math.fround(height(c, r)));
      }
    }
    const s = openSurface(data, 'dem.tif');
    // 20 cells: 16 whole (2 triangles), 4 round the hole with 3 pixels (1 triangle)
    expect(s.topology.nf).toBe(36);
    // outer boundary 2·(W−1) + 2·(H−1) edges, plus the diamond round the hole (Euler: the hole is a boundary loop)
    expect(boundaryEdgeCount(s.topology)).toBe(2 * (W - 1) + 2 * (H - 1) + 4);
  });

  it('PixelIsPoint rasters put vertices on the grid points', async () => {
    const { data, grid } = await parseDem(demBytes({ pointRaster: true }), 'p.tif');
    const v = grid.pixelVertex[1 * W + 3]!;
    expect([data.positions[3 * v], data.positions[3 * v + 1]]).toEqual([X0 + 3 * RES, Y0 - 1 * RES]);
  });

  it('a field written on the DEM grid round-trips values, coordinates, nodata and the EPSG code', async () => {
    const { data, grid } = await parseDem(demBytes(), 'dem.tif');
    const nv = data.positions.length / 3;
    const field = Float64Array.from({ length: nv }, (_, v) => v / 3 + 0.1); // not representable in float32
    field[0] = Infinity; // unreachable → nodata
    const out = await writeFieldTiff(grid, field);
    const image = await (await fromArrayBuffer(out.buffer.slice(out.byteOffset, out.byteOffset + out.byteLength) as ArrayBuffer)).getImage();
    expect(image.getOrigin().slice(0, 2)).toEqual([X0, Y0]);
    expect(image.getResolution().slice(0, 2)).toEqual([RES, -RES]);
    expect(image.getGeoKeys()?.ProjectedCSTypeGeoKey).toBe(32633);
    expect(image.getGDALNoData()).toBe(-9999);
    const r = (await image.readRasters())[0] as Float64Array;
    expect(r).toBeInstanceOf(Float64Array);
    for (let p = 0; p < W * H; p++) {
      const v = grid.pixelVertex[p]!;
      expect(r[p]).toBe(v < 0 || v === 0 ? -9999 : field[v]);
    }
    // the written raster read as a DEM gives back the same map coordinates
    const again = await parseDem(out, 'field.tif');
    const v = again.grid.pixelVertex[3 * W + 4]!, w = grid.pixelVertex[3 * W + 4]!;
    expect(again.data.positions[3 * v]).toBe(data.positions[3 * w]);
    expect(again.data.positions[3 * v + 1]).toBe(data.positions[3 * w + 1]);
    // float32 output keeps float32 samples
    const f32 = await writeFieldTiff(grid, field, { sampleType: 'float32' });
    const r32 = (await (await (await fromArrayBuffer(f32.buffer as ArrayBuffer)).getImage()).readRasters())[0];
    expect(r32).toBeInstanceOf(Float32Array);
  });

  it('refuses a raster in degrees and bytes that are not a GeoTIFF, naming the file', async () => {
    await expect(parseDem(demBytes({ geographic: true }), 'geo.tif')).rejects.toThrow(/geo\.tif.*degrees/);
    const junk = new Uint8Array([0x49, 0x49, 42, 0, 1, 2, 3]);
    await expect(parseDem(junk, 'junk.tif')).rejects.toThrow(/junk\.tif.*not a readable GeoTIFF/);
  });
});
