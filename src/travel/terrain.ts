/**
 * Opening terrain from bytes: a DEM GeoTIFF (io/geotiff.ts) becomes a grid
 * mesh with its grid and coordinate system kept; any other bytes are a mesh
 * file (OBJ, PLY, STL) opened as `openSurface` does, without a grid.
 * Browser-safe.
 */
import { parseMesh } from '../io/sniff.js';
import { surfaceFromMeshData, type Surface } from '../mesh/surface.js';
import type { BuildOptions } from '../mesh/build.js';
import { isTiff, parseDem, type DemGrid } from '../io/geotiff.js';

/** A terrain surface and, for a DEM, its raster grid. */
export interface Terrain {
  /** The surface. */
  surface: Surface;
  /** The DEM's grid and CRS (null for a mesh file). */
  grid: DemGrid | null;
}

/** Options of {@link openTerrain}: as `openSurface`'s. */
export interface TerrainOptions {
  /** Repairs while building the half-edge topology. */
  build?: BuildOptions;
  /** STL: the weld tolerance of facet corners, mesh units. */
  weldTolerance?: number;
}

/**
 * The terrain in `bytes` (`name` labels errors): a GeoTIFF DEM when the bytes
 * start like a TIFF file, else a mesh file. Bad input is an `INPUT` error
 * naming `name`.
 */
export async function openTerrain(bytes: Uint8Array, name: string, opts: TerrainOptions = {}): Promise<Terrain> {
  const data = isTiff(bytes)
    ? await parseDem(bytes, name)
    : { data: parseMesh(bytes, name, opts.weldTolerance !== undefined ? { weldTolerance: opts.weldTolerance } : {}), grid: null };
  return { surface: surfaceFromMeshData(data.data, opts.build ?? {}), grid: data.grid };
}
