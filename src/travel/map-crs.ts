/**
 * Map coordinate systems of terrain outputs: the CRS a DEM declared (its
 * EPSG code) or the user named, written into GeoJSON as a foreign member
 * (RFC 7946 §6.1: the `crs` member of the 2008 GeoJSON draft is not part of
 * RFC 7946, whose positions are WGS 84 longitude and latitude, §4), and the
 * transformation of map coordinates to WGS 84 longitude/latitude through
 * `proj4` (loaded on first use) when the CRS is known to it or given as a
 * PROJ string.
 */
import { usageError } from '../errors.js';

/** A map coordinate system: an EPSG code and/or a PROJ definition string. */
export interface MapCrs {
  /** EPSG code, or null. */
  epsg: number | null;
  /** A PROJ definition (`+proj=utm +zone=33 …`), or null: then looked up by EPSG code. */
  proj: string | null;
}

/** The foreign member GeoJSON outputs carry when their coordinates are map coordinates. */
export const CRS_MEMBER = 'mapCoordinateSystem';

/** `EPSG:32633` or `32633` → 32633; `USAGE` naming `label` otherwise. */
export function parseEpsg(text: string, label = '--crs'): number {
  const m = /^\s*(?:epsg:)?(\d{4,5})\s*$/i.exec(text);
  if (!m) throw usageError(`${label} must be an EPSG code such as EPSG:32633, got '${text}'`);
  return Number(m[1]);
}

/** The CRS as GeoJSON states it (a foreign member), with the axes it uses. */
export function crsMember(crs: MapCrs): Record<string, unknown> {
  return {
    ...(crs.epsg !== null ? { epsg: crs.epsg, name: `EPSG:${crs.epsg}` } : {}),
    ...(crs.proj !== null ? { proj: crs.proj } : {}),
    axes: 'map x (easting), map y (northing), elevation; lengths in metres',
  };
}

type Transform = (x: number, y: number) => [number, number];

/**
 * A function from map (x, y) to WGS 84 [longitude, latitude] for `crs`.
 * `USAGE` when proj4 does not know the EPSG code and no PROJ string is given.
 */
export async function toWgs84(crs: MapCrs): Promise<Transform> {
  const proj4 = (await import('proj4')).default;
  let def: string | undefined;
  if (crs.proj !== null) def = crs.proj;
  else if (crs.epsg !== null) {
    if (crs.epsg === 4326) return (x, y) => [x, y];
    if (proj4.defs(`EPSG:${crs.epsg}`)) def = `EPSG:${crs.epsg}`;
  }
  if (def === undefined) {
    throw usageError(
      crs.epsg === null
        ? 'the coordinate system is not known: name it with --crs EPSG:CODE (or --crs-def PROJSTRING) to write WGS 84 longitude/latitude'
        : `EPSG:${crs.epsg} is not built into proj4: give its PROJ definition with --crs-def '+proj=…'`,
    );
  }
  let conv: { forward: (p: number[]) => number[] };
  try {
    conv = proj4(def, 'EPSG:4326') as unknown as { forward: (p: number[]) => number[] };
  } catch (e) {
    throw usageError(`cannot use the coordinate system '${def}' (${e instanceof Error ? e.message : String(e)})`);
  }
  return (x, y) => {
    const p = conv.forward([x, y]);
    if (!Number.isFinite(p[0]) || !Number.isFinite(p[1])) throw usageError(`map point (${x}, ${y}) has no WGS 84 position in ${def}`);
    return [p[0]!, p[1]!];
  };
}
