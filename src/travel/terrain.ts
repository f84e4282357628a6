/**
 * Opening terrain from bytes: a DEM GeoTIFF (io/geotiff.ts) becomes a grid
 * mesh with its grid and coordinate system kept; any other bytes are a mesh
 * file (OBJ, PLY, STL) opened as usual, without a grid. Browser-safe.
 */
import { openSurface, type OpenOptions, type Surface } from '../api/surface.js';
import { isTiff, parseDem, type DemGrid } from '../io/geotiff.js';

/** A terrain surface and, for a DEM, its raster grid. */
export interface Terrain {
  /** The surface. */
  surface: Surface;
  /** The DEM's grid and CRS (null for a mesh file). */
  grid: DemGrid | null;
}

/**
 * The terrain in `bytes` (`name` labels errors): a GeoTIFF DEM when the bytes
 * start like a TIFF file, else a mesh file. Bad input is an `INPUT` error
 * naming `name`.
 */
export async function openTerrain(bytes: Uint8Array, name: string, opts: OpenOptions = {}): Promise<Terrain> {
  if (!isTiff(bytes)) return { surface: openSurface(bytes, name, opts), grid: null };
  const dem = await parseDem(bytes, name);
  return { surface: openSurface(dem.data, name, opts), grid: dem.grid };
}
