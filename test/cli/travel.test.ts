/**
 * End-to-end checks of `travel` on a DEM GeoTIFF written by the `geotiff`
 * package: a uniform incline (10 % grade eastwards) in UTM zone 33
 * (EPSG:32633). The route along a pixel row takes the closed-form time of
 * Tobler's hiking function (Tobler 1993) in each direction; the JSON keys of
 * the contract; GeoJSON in WGS 84 (RFC 7946) and GPX 1.1 whose
 * positions lie near the zone's central meridian (15° E at easting
 * 500 000 m: common practice); the field as a GeoTIFF on the DEM's grid;
 * one-line refusals with exit 2.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fromArrayBuffer, writeArrayBuffer } from 'geotiff';
import { runCli } from './run-cli.js';
import { objText } from '../fixtures/shapes.js';
import { flatGrid } from '../fixtures/shapes.js';

const W = 21, H = 11, X0 = 499900, Y0 = 5413500, RES = 10;
let dir = '';
/** Tobler 1993: seconds over horizontal dx rising dh. */
const tobler = (dx: number, dh: number) => dx / ((6 * Math.exp(-3.5 * Math.abs(dh / dx + 0.05))) / 3.6);
/** Map position of pixel (c, r): its centre (PixelIsArea, GeoTIFF §B.2). */
const px = (c: number, r: number) => [X0 + (c + 0.5) * RES, Y0 - (r + 0.5) * RES];

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-travel-'));
  const z = new Float32Array(W * H);
  for (let r = 0; r < H; r++) for (let c = 0; c < W; c++) z[r * W + c] = 300 + 0.1 * RES * c; // 10 % grade eastwards
  const tif = writeArrayBuffer(z, { width: W, height: H, ModelPixelScale: [RES, RES, 0], ModelTiepoint: [0, 0, 0, X0, Y0, 0], ProjectedCSTypeGeoKey: 32633, GTModelTypeGeoKey: 1, GTRasterTypeGeoKey: 1, GDAL_NODATA: '-9999' } as never);
  writeFileSync(join(dir, 'slope.tif'), new Uint8Array(tif));
  writeFileSync(join(dir, 'flat.obj'), objText(flatGrid(4, 4, 40, 40)));
});

describe('travel', () => {
  it('a route up and down a DEM incline: closed-form times (Tobler), the JSON keys, GeoJSON in WGS 84, GPX 1.1, the profile', () => {
    const [xa, y] = px(2, 5), [xb] = px(18, 5);
    const up = runCli(['travel', join(dir, 'slope.tif'), '--from', `p:${xa},${y}`, '--to', `p:${xb},${y}`, '--json', '--wgs84',
      '-o', join(dir, 'route.geojson'), '-o', join(dir, 'route.gpx'), '-o', join(dir, 'profile.csv')]);
    expect(up.stderr).toBe('');
    expect(up.code).toBe(0);
    const j = JSON.parse(up.stdout);
    for (const k of ['seconds', 'meters', 'ascent', 'descent', 'points', 'timings']) expect(j).toHaveProperty(k);
    const dx = xb! - xa!, dh = 0.1 * dx;
    expect(j.seconds).toBeCloseTo(tobler(dx, dh), 6); // uphill along the row: grade +0.1
    expect(j.meters).toBeCloseTo(Math.hypot(dx, dh), 6);
    expect(j.ascent).toBeCloseTo(dh, 6);
    expect(j.descent).toBeCloseTo(0, 9);
    expect(j.crs).toBe('EPSG:32633');
    const g = JSON.parse(readFileSync(join(dir, 'route.geojson'), 'utf8'));
    expect(g.mapCoordinateSystem.epsg).toBe(4326);
    const line = g.features.find((f: { properties: { kind: string } }) => f.properties.kind === 'route');
    for (const [lon, lat] of line.geometry.coordinates) {
      expect(Math.abs(lon - 15)).toBeLessThan(0.01); // within ~1 km of the central meridian at 49° N
      expect(lat).toBeGreaterThan(48.8);
      expect(lat).toBeLessThan(48.9);
    }
    const gpx = readFileSync(join(dir, 'route.gpx'), 'utf8');
    expect(gpx).toMatch(/<gpx version="1\.1"[^>]* xmlns="http:\/\/www\.topografix\.com\/GPX\/1\/1"/);
    const trkpts = [...gpx.matchAll(/<trkpt lat="([-\d.]+)" lon="([-\d.]+)"><ele>([-\d.]+)<\/ele><\/trkpt>/g)];
    expect(trkpts.length).toBe(j.points.length);
    expect(Number(trkpts[0]![3])).toBeCloseTo(j.points[0][2], 3);
    const rows = readFileSync(join(dir, 'profile.csv'), 'utf8').trim().split('\n');
    expect(rows[0]).toBe('point,distance_m,elevation_m,seconds,duration,x,y,z');
    expect(Number(rows.at(-1)!.split(',')[3])).toBeCloseTo(j.seconds, 9);

    const down = runCli(['travel', join(dir, 'slope.tif'), '--from', `p:${xb},${y}`, '--to', `p:${xa},${y}`]);
    expect(down.code).toBe(0);
    const s = tobler(dx, -dh); // downhill, grade −0.1 (Tobler 1993): not the uphill time
    const hms = `${Math.floor(s / 3600)}:${String(Math.floor((s % 3600) / 60)).padStart(2, '0')}:${String(Math.round(s % 60)).padStart(2, '0')}`;
    expect(down.stdout).toContain(`: ${hms} (`);
    expect(down.stdout).toContain('descent 16 m');
  });

  it('a field from a point: statistics, isochrones in map coordinates with the CRS, the field as a GeoTIFF on the DEM grid', async () => {
    const [x, y] = px(10, 5);
    const r = runCli(['travel', join(dir, 'slope.tif'), '--from', `p:${x},${y}`, '--isochrones', '0.5', '--json',
      '-o', join(dir, 'field.tif'), '-o', join(dir, 'iso.geojson')]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.field.reached).toBe(W * H);
    expect(j.field.minSeconds).toBe(0);
    expect(j.isochrones.levelsMinutes[0]).toBe(0.5);
    const g = JSON.parse(readFileSync(join(dir, 'iso.geojson'), 'utf8'));
    expect(g.mapCoordinateSystem.name).toBe('EPSG:32633');
    expect(g.features.some((f: { properties: { kind: string } }) => f.properties.kind === 'band')).toBe(true);
    const bytes = readFileSync(join(dir, 'field.tif'));
    const image = await (await fromArrayBuffer(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer)).getImage();
    expect(image.getOrigin().slice(0, 2)).toEqual([X0, Y0]);
    expect(image.getGeoKeys()?.ProjectedCSTypeGeoKey).toBe(32633);
    const v = (await image.readRasters())[0] as Float64Array;
    expect(v[5 * W + 10]).toBe(0); // the source pixel
    // along the row eastwards (uphill, 100 m): at least Tobler's straight-line time, within the Steiner gap of it
    expect(v[5 * W + 20]!).toBeGreaterThanOrEqual(tobler(100, 10) * (1 - 1e-12));
    expect(v[5 * W + 20]!).toBeLessThan(tobler(100, 10) * 1.001);
  });

  it('refusals: one line, exit 2, naming the option or the file', () => {
    const a = runCli(['travel', join(dir, 'flat.obj'), '--from', 'v:0', '-o', join(dir, 'x.gpx')]);
    expect(a.code).toBe(2);
    expect(a.stderr.trim().split('\n')).toHaveLength(1);
    expect(a.stderr).toMatch(/\.gpx output needs a route/);
    const b = runCli(['travel', join(dir, 'flat.obj'), '--from', 'v:0', '--to', 'v:24', '--wgs84', '-o', join(dir, 'y.geojson')]);
    expect(b.code).toBe(2);
    expect(b.stderr).toMatch(/--crs/);
    const c = runCli(['travel', join(dir, 'flat.obj'), '--from', 'v:0', '--max-slope', '95']);
    expect(c.code).toBe(2);
    expect(c.stderr).toMatch(/--max-slope/);
  });

  it('p:X,Y is dropped along z: with another --up it is refused (no sideways point), p:X,Y,Z and +z still work', () => {
    // flat.obj lies in z = 0; with --up +y a drop along z would meet it at a point the up axis does not stand over (common practice: refuse, not guess)
    const d = runCli(['travel', join(dir, 'flat.obj'), '--from', 'p:10,10', '--to', 'v:24', '--up', '+y']);
    expect(d.code).toBe(2);
    expect(d.stderr.trim().split('\n')).toHaveLength(1);
    expect(d.stderr).toMatch(/--from.*p:10,10.*dropped along z.*--up is \+y.*p:X,Y,Z/);
    const e = runCli(['travel', join(dir, 'flat.obj'), '--from', 'p:10,10,0', '--to', 'v:24', '--up', '0,0,1', '--json']);
    expect(e.code).toBe(0);
    const f = runCli(['travel', join(dir, 'flat.obj'), '--from', 'p:10,10', '--to', 'v:24', '--json']);
    expect(f.code).toBe(0);
    expect(JSON.parse(e.stdout).seconds).toBeCloseTo(JSON.parse(f.stdout).seconds, 9); // the same point either way when z is up
  });
});
