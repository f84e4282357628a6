/**
 * Files of walking-time results, as text (browser-safe; the CLI stores
 * them): the route and the isochrones (lines and bands) as GeoJSON in map
 * coordinates with the CRS named in a foreign member, or in WGS 84
 * longitude/latitude (RFC 7946 §4) through a transform; the route as GPX
 * 1.1; the route's profile as CSV; and durations as h:mm:ss.
 */
import { curvesToGeoJson, type Curve, type CurvePolygon } from '../io/write-curves.js';
import { toCsv } from '../io/csv.js';
import { writeGpx, type GpxPoint } from '../io/gpx.js';
import { CRS_MEMBER, crsMember, type MapCrs } from './map-crs.js';
import type { TravelRoute } from './route.js';

/** A map (x, y) → WGS 84 [longitude, latitude] transform. */
export type LonLat = (x: number, y: number) => [number, number];

/** Seconds as `h:mm:ss` (rounded to the second; `∞` for Infinity, `-` for NaN). */
export function formatDuration(seconds: number): string {
  if (Number.isNaN(seconds)) return '-';
  if (!Number.isFinite(seconds)) return '∞';
  const s = Math.round(seconds);
  const h = Math.floor(s / 3600), m = Math.floor((s % 3600) / 60), r = s % 60;
  return `${h}:${String(m).padStart(2, '0')}:${String(r).padStart(2, '0')}`;
}

/** An isochrone: an isoline of the travel-time field (as `surfaceIsolines` gives it). */
export interface Isochrone {
  /** Seconds. */
  level: number;
  /** True when closed (the last point repeats the first). */
  closed: boolean;
  /** Length, mesh units. */
  length: number;
  /** Positions [x, y, z]. */
  points: readonly (readonly number[])[];
}

/** A band between two isochrones (as `surfaceIsolines` gives it with bands). */
export interface IsochroneBand {
  /** Seconds at its lower and upper edge. */
  lower: number;
  /** See {@link lower}. */
  upper: number;
  /** Area on the surface and in plan view, mesh units². */
  area: number;
  /** See {@link area}. */
  planArea: number;
  /** Its polygons: outer ring and holes, each closed. */
  polygons: { outer: readonly (readonly number[])[]; holes: readonly (readonly number[])[][] }[];
}

/** What goes into a travel GeoJSON file. */
export interface TravelMapParts {
  /** The route, if any. */
  route?: TravelRoute | null;
  /** Isochrones (levels in seconds). */
  isochrones?: Isochrone[];
  /** Bands between isochrones (levels in seconds). */
  bands?: IsochroneBand[];
}

/** Options of {@link travelGeoJson}. */
export interface TravelMapOptions {
  /** The map CRS of the coordinates, stated in the file unless `lonLat` is given. */
  crs?: MapCrs | null;
  /** Transform to WGS 84 longitude/latitude (RFC 7946 positions). */
  lonLat?: LonLat | null;
}

const mapPoint = (p: readonly number[], f: LonLat | null | undefined): [number, number, number] => {
  if (!f) return [p[0]!, p[1]!, p[2]!];
  const [lon, lat] = f(p[0]!, p[1]!);
  return [lon, lat, p[2]!];
};

/**
 * GeoJSON FeatureCollection (RFC 7946): the route as a LineString (kind
 * `route`, with seconds, duration, metres, ascent, descent), the isochrones
 * as LineStrings (kind `isochrone`, level in seconds and minutes) and the
 * bands as Polygons (kind `band`, from/to in minutes). Map coordinates are
 * written as they are with the CRS in the foreign member `mapCoordinateSystem`;
 * with `lonLat` they are WGS 84 longitude, latitude and the member says so.
 */
export function travelGeoJson(parts: TravelMapParts, opts: TravelMapOptions = {}): string {
  const f = opts.lonLat;
  const curves: Curve[] = [];
  const r = parts.route;
  if (r) {
    curves.push({
      closed: false, length: r.meters, points: r.points.map((p) => mapPoint(p, f)),
      properties: { kind: 'route', seconds: r.seconds, duration: formatDuration(r.seconds), meters: r.meters, ascent: r.ascent, descent: r.descent },
    });
  }
  for (const c of parts.isochrones ?? []) {
    curves.push({
      level: c.level, closed: c.closed, length: c.length, points: c.points.map((p) => mapPoint(p, f)),
      properties: { kind: 'isochrone', minutes: c.level / 60, duration: formatDuration(c.level) },
    });
  }
  const polygons: CurvePolygon[] = [];
  for (const b of parts.bands ?? []) {
    for (const p of b.polygons) {
      polygons.push({
        rings: [p.outer, ...p.holes].map((ring) => ring.map((q) => mapPoint(q, f))),
        properties: { kind: 'band', fromMinutes: b.lower / 60, toMinutes: b.upper / 60, area: b.area, planArea: b.planArea },
      });
    }
  }
  const units = f ? 'WGS 84 longitude/latitude degrees; elevation, lengths and areas in metres' : 'map units (metres)';
  const doc = JSON.parse(curvesToGeoJson(curves, polygons, { units })) as Record<string, unknown>;
  if (f) doc[CRS_MEMBER] = { name: 'EPSG:4326', epsg: 4326, axes: 'longitude, latitude (degrees), elevation (metres)' };
  else if (opts.crs) doc[CRS_MEMBER] = crsMember(opts.crs);
  else doc[CRS_MEMBER] = { name: 'unknown', axes: 'mesh coordinates' };
  return JSON.stringify(doc) + '\n';
}

/** The route's profile as CSV: point, distance_m, elevation_m, seconds, duration, x, y, z (mesh units). */
export function routeProfileCsv(r: TravelRoute): string {
  const rows = r.points.map((p, i) => [i, r.cumulativeMeters[i]!, r.elevation[i]!, r.cumulativeSeconds[i]!, formatDuration(r.cumulativeSeconds[i]!), p[0], p[1], p[2]]);
  return toCsv(['point', 'distance_m', 'elevation_m', 'seconds', 'duration', 'x', 'y', 'z'], rows);
}

/**
 * The route as GPX 1.1 (a track; `stops` as named waypoints, map x, y and elevation in metres),
 * positions through `lonLat`, elevation the route's heights (metres).
 */
export function routeGpx(r: TravelRoute, lonLat: LonLat, name: string, stops: { x: number; y: number; ele: number; name: string }[] = []): string {
  const points: GpxPoint[] = r.points.map((p, i) => {
    const [lon, lat] = lonLat(p[0]!, p[1]!);
    return { lat, lon, ele: r.elevation[i]! };
  });
  const waypoints: GpxPoint[] = stops.map((s) => {
    const [lon, lat] = lonLat(s.x, s.y);
    return { lat, lon, ele: s.ele, name: s.name };
  });
  const desc = `${formatDuration(r.seconds)} (h:mm:ss), ${r.meters.toFixed(0)} m, ascent ${r.ascent.toFixed(0)} m, descent ${r.descent.toFixed(0)} m; a planning estimate, not a safety assessment`;
  return writeGpx({ name, desc, points, waypoints });
}
