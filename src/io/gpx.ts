/**
 * GPX 1.1 (the GPS exchange format, schema http://www.topografix.com/GPX/1/1)
 * writer for routes: the stops as waypoints (`wpt`) and the route as a
 * track (`trk` / `trkseg` / `trkpt`) or a route (`rte` / `rtept`), each point
 * with `lat`, `lon` (WGS 84 degrees) and `ele` (metres). Elements follow the
 * schema's order (metadata, wpt, rte, trk). Text is XML-escaped; numbers are
 * written as plain decimals (xsd:decimal has no exponent form).
 */
import { usageError } from '../errors.js';

/** A point in WGS 84 with its elevation. */
export interface GpxPoint {
  /** Latitude, degrees in [−90, 90]. */
  lat: number;
  /** Longitude, degrees in [−180, 180]. */
  lon: number;
  /** Elevation, metres. */
  ele?: number;
  /** A name (waypoints). */
  name?: string;
}

/** What to write. */
export interface GpxRoute {
  /** Name of the route (and of the file's metadata). */
  name: string;
  /** A description (e.g. time, distance, ascent). */
  desc?: string;
  /** The route's points, in order. */
  points: GpxPoint[];
  /** Named stops written as waypoints. */
  waypoints?: GpxPoint[];
}

/** Options of {@link writeGpx}. */
export interface GpxOptions {
  /** `trk` (default: a track of any length) or `rte` (a route of route points). */
  as?: 'trk' | 'rte';
  /** The `creator` attribute (default `orthodrome`). */
  creator?: string;
}

/** XML text with &, <, >, " and ' escaped (XML 1.0 §2.4, predefined entities). */
export function xmlEscape(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' })[c]!);
}

/** A decimal without exponent, at most `digits` decimals, trailing zeros removed. */
function decimal(x: number, digits: number): string {
  const s = x.toFixed(digits);
  return s.includes('.') ? s.replace(/\.?0+$/, '') : s;
}

function point(tag: string, p: GpxPoint, i: number, indent: string): string {
  if (!(Math.abs(p.lat) <= 90) || !(Math.abs(p.lon) <= 180)) {
    throw usageError(`cannot write GPX: point ${i} is not a WGS 84 longitude/latitude (${p.lon}, ${p.lat})`);
  }
  const inner: string[] = [];
  if (p.ele !== undefined) {
    if (!Number.isFinite(p.ele)) throw usageError(`cannot write GPX: point ${i} has elevation ${p.ele}`);
    inner.push(`<ele>${decimal(p.ele, 3)}</ele>`);
  }
  if (p.name !== undefined) inner.push(`<name>${xmlEscape(p.name)}</name>`);
  return `${indent}<${tag} lat="${decimal(p.lat, 9)}" lon="${decimal(p.lon, 9)}">${inner.join('')}</${tag}>`;
}

/** GPX 1.1 text of a route (see the module comment). `USAGE` for a point off the WGS 84 ranges. */
export function writeGpx(route: GpxRoute, opts: GpxOptions = {}): string {
  const as = opts.as ?? 'trk';
  const name = xmlEscape(route.name);
  const desc = route.desc !== undefined ? `<desc>${xmlEscape(route.desc)}</desc>` : '';
  const L = [
    '<?xml version="1.0" encoding="UTF-8"?>',
    `<gpx version="1.1" creator="${xmlEscape(opts.creator ?? 'orthodrome')}" xmlns="http://www.topografix.com/GPX/1/1" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" xsi:schemaLocation="http://www.topografix.com/GPX/1/1 http://www.topografix.com/GPX/1/1/gpx.xsd">`,
    `  <metadata><name>${name}</name>${desc}</metadata>`,
  ];
  (route.waypoints ?? []).forEach((p, i) => L.push(point('wpt', p, i, '  ')));
  if (as === 'rte') {
    L.push(`  <rte><name>${name}</name>${desc}`);
    route.points.forEach((p, i) => L.push(point('rtept', p, i, '    ')));
    L.push('  </rte>');
  } else {
    L.push(`  <trk><name>${name}</name>${desc}`, '    <trkseg>');
    route.points.forEach((p, i) => L.push(point('trkpt', p, i, '      ')));
    L.push('    </trkseg>', '  </trk>');
  }
  L.push('</gpx>');
  return L.join('\n') + '\n';
}
