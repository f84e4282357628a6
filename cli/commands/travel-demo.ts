/**
 * The demo's walking-time cases (called by `demo`): the Ostrel Knoll
 * hillside mesh (1-minute isochrones, a route and its profile) and the
 * Ostrel Moor DEM GeoTIFF (10-minute isochrones, the field as a GeoTIFF, a
 * route), both in the project's invented scenario.
 */
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { loadSurface } from '../load.js';
import { fmt } from '../run.js';
import { openTerrain, travelField, travelRoute, surfaceIsolines, pointLocator, writeFileAtomic } from '../../src/index.js';
import { toInputVertices, toWgs84, travelGeoJson, routeGpx, routeProfileCsv, writeFieldTiff, formatDuration, type MapCrs } from '../../src/api/io.js';

/**
 * The invented Ostrel estate grid of the demo as a PROJ definition: a
 * transverse Mercator of its own, chosen so that GPX positions fall in the
 * open ocean (no real place).
 */
export const OSTREL_GRID = '+proj=tmerc +lat_0=-60 +lon_0=-140 +k=1 +x_0=500000 +y_0=0 +ellps=WGS84 +units=m +no_defs';

/**
 * The demo's walking times on the Ostrel Knoll hillside (called by `demo`):
 * the fastest route from the trailhead car park to the summit cairn with
 * Tobler's function (and Naismith's rule for comparison), 1-minute
 * isochrones from the trailhead (the scan is a few minutes' walk across),
 * the route as GeoJSON, GPX and a profile CSV.
 */
export async function demoWalkingTimes(mesh: string, out: string, say: (s: string) => void): Promise<void> {
  const { surface } = await loadSurface(mesh, { requireManifold: true });
  const points = await pointLocator(surface);
  const trailhead = points.resolve('p:431212,6170412,230', 'trailhead'), summit = points.resolve('p:431280,6170470,260', 'summit cairn');
  const r = travelRoute(surface, [trailhead, summit], { k: 3 });
  const back = travelRoute(surface, [summit, trailhead], { k: 3 });
  const naismith = travelRoute(surface, [trailhead, summit], { k: 3, model: 'naismith' });
  const field = travelField(surface, [trailhead], { k: 3 });
  const iso = surfaceIsolines(surface, { values: field.seconds, alongEdge: field.alongEdge }, { every: 60, bands: true });
  const crs: MapCrs = { epsg: null, proj: OSTREL_GRID };
  const lonLat = await toWgs84(crs);
  const files = { route: join(out, 'knoll-walk-route.geojson'), gpx: join(out, 'knoll-walk-route.gpx'), profile: join(out, 'knoll-walk-profile.csv'), iso: join(out, 'knoll-walk-isochrones-1min.geojson') };
  await writeFileAtomic(files.route, travelGeoJson({ route: r }, { crs }));
  await writeFileAtomic(files.gpx, routeGpx(r, lonLat, 'Ostrel Knoll: trailhead to summit cairn', [
    { x: r.points[0]![0], y: r.points[0]![1], ele: r.elevation[0]!, name: 'trailhead car park' },
    { x: r.points.at(-1)![0], y: r.points.at(-1)![1], ele: r.elevation.at(-1)!, name: 'summit cairn' },
  ]));
  await writeFileAtomic(files.profile, routeProfileCsv(r));
  await writeFileAtomic(files.iso, travelGeoJson({ isochrones: iso.curves, bands: iso.bands ?? [] }, { crs }));
  say('== Ostrel Knoll: walking times from the trailhead car park (Tobler\'s hiking function, 3 Steiner points per edge)');
  say(`  to the summit cairn ${formatDuration(r.seconds)} (${fmt(r.meters, 5)} m, ascent ${fmt(r.ascent, 4)} m, descent ${fmt(r.descent, 4)} m); back down ${formatDuration(back.seconds)}; Naismith's rule says ${formatDuration(naismith.seconds)}`);
  say(`  isochrones every minute: ${iso.levels.map((l) => formatDuration(l)).join(', ')}; the farthest corner of the scan ${formatDuration(Math.max(...field.seconds.filter(Number.isFinite)))}`);
  say(`  → ${files.route}, ${files.gpx}, ${files.profile}, ${files.iso}`);
}

/**
 * The demo's 10-minute isochrone map from a DEM (called by `demo`): the
 * Ostrel Moor GeoTIFF (meshes/make-dem.ts, 3.6 km × 2.7 km) read as a
 * terrain, walking times from the moor trailhead with 10-minute isochrones
 * and bands, the route to the fell-top cairn, both points given as map
 * coordinates dropped onto the ground (p:X,Y); the field as a GeoTIFF on
 * the DEM's grid, the route as GeoJSON and GPX.
 */
export async function demoMoorIsochrones(dem: string, out: string, say: (s: string) => void): Promise<void> {
  const { surface, grid } = await openTerrain(new Uint8Array(await readFile(dem)), dem);
  const points = await pointLocator(surface, ['p:428315,6170585', 'p:430415,6172235']);
  const trailhead = points.resolve('p:428315,6170585', 'moor trailhead'), cairn = points.resolve('p:430415,6172235', 'fell-top cairn');
  const r = travelRoute(surface, [trailhead, cairn], { k: 3 });
  const field = travelField(surface, [trailhead], { k: 3 });
  const iso = surfaceIsolines(surface, { values: field.seconds, alongEdge: field.alongEdge }, { every: 600, bands: true });
  const crs: MapCrs = { epsg: null, proj: OSTREL_GRID };
  const lonLat = await toWgs84(crs);
  const files = {
    iso: join(out, 'moor-walk-isochrones-10min.geojson'), minutes: join(out, 'moor-walk-seconds.tif'),
    route: join(out, 'moor-walk-route.geojson'), gpx: join(out, 'moor-walk-route.gpx'),
  };
  await writeFileAtomic(files.iso, travelGeoJson({ isochrones: iso.curves, bands: iso.bands ?? [] }, { crs }));
  await writeFileAtomic(files.minutes, await writeFieldTiff(grid!, toInputVertices(surface, field.seconds)));
  await writeFileAtomic(files.route, travelGeoJson({ route: r }, { crs }));
  await writeFileAtomic(files.gpx, routeGpx(r, lonLat, 'Ostrel Moor: trailhead to fell-top cairn', [
    { x: r.points[0]![0], y: r.points[0]![1], ele: r.elevation[0]!, name: 'moor trailhead' },
    { x: r.points.at(-1)![0], y: r.points.at(-1)![1], ele: r.elevation.at(-1)!, name: 'fell-top cairn' },
  ]));
  const bands = (iso.bands ?? []).map((b) => `${formatDuration(b.lower)}–${formatDuration(b.upper)} ${fmt(b.planArea / 1e6, 3)} km²`);
  say(`== Ostrel Moor (DEM GeoTIFF, ${grid!.width} × ${grid!.height} pixels of ${fmt(grid!.resX, 3)} m): walking times from the moor trailhead`);
  say(`  to the fell-top cairn ${formatDuration(r.seconds)} (${fmt(r.meters, 5)} m, ascent ${fmt(r.ascent, 4)} m, descent ${fmt(r.descent, 4)} m)`);
  say(`  10-minute isochrones: ${iso.levels.map((l) => formatDuration(l)).join(', ')}; bands in plan: ${bands.join(', ')}`);
  say(`  → ${files.iso}, ${files.minutes}, ${files.route}, ${files.gpx}`);
}
