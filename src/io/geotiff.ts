/**
 * Digital elevation models as GeoTIFF (OGC GeoTIFF standard 1.1, 2019) in
 * and out, through the `geotiff` package (loaded on first use, so bundles
 * that never read a raster do not carry it). Browser-safe: bytes in, bytes
 * out.
 *
 * Reading: the first band of the first image is a height per pixel. Each
 * pixel with data becomes a vertex at its map position (float64: the pixel
 * centre for PixelIsArea rasters, the grid point for PixelIsPoint, GeoTIFF
 * §B.2), and each cell between four neighbouring pixels two triangles
 * (alternating diagonals), or one when only three of its pixels have data.
 * Nodata pixels (the GDAL_NODATA tag, or NaN) are left out, so holes in the
 * data become boundary loops. Faces are counter-clockwise seen from above
 * (+z). The coordinate system is kept as metadata: the EPSG code of the
 * projected (or geographic) CRS from the GeoKeys, and the grid, so a field
 * on the mesh can be written back as a raster on the same grid.
 *
 * Rasters in geographic coordinates (degrees) are refused: lengths on the
 * mesh would mix degrees and metres. Rotated or sheared grids
 * (ModelTransformation with rotation terms) are refused too.
 */
import type { MeshData } from './mesh-data.js';
import { inputError, usageError } from '../errors.js';

/** The raster grid of a DEM and its coordinate system. */
export interface DemGrid {
  /** Pixels per row and rows. */
  width: number;
  /** See {@link width}. */
  height: number;
  /** Map position of the tie point (the raster's corner for PixelIsArea, the first pixel's centre for PixelIsPoint). */
  originX: number;
  /** See {@link originX}. */
  originY: number;
  /** Pixel size in map units, signed (resY is normally negative: rows run south). */
  resX: number;
  /** See {@link resX}. */
  resY: number;
  /** True for PixelIsPoint rasters (GTRasterTypeGeoKey = 2). */
  pixelIsPoint: boolean;
  /** EPSG code of the CRS, or null when user-defined or absent. */
  epsg: number | null;
  /** EPSG code of the linear unit (ProjLinearUnitsGeoKey: 9001 metre, 9002 foot, 9003 US survey foot), or null. */
  linearUnit: number | null;
  /** The nodata value, or null. */
  noData: number | null;
  /** Mesh vertex of each pixel (row by row), −1 for pixels left out. */
  pixelVertex: Int32Array;
}

/** A DEM read into a mesh. */
export interface Dem {
  /** The triangulated grid. */
  data: MeshData;
  /** Its grid and coordinate system. */
  grid: DemGrid;
}

/** True when the bytes start like a TIFF or BigTIFF file (II*\0, MM\0*, II+\0, MM\0+). */
export function isTiff(b: Uint8Array): boolean {
  if (b.length < 4) return false;
  const ii = b[0] === 0x49 && b[1] === 0x49 && b[3] === 0 && (b[2] === 42 || b[2] === 43);
  const mm = b[0] === 0x4d && b[1] === 0x4d && b[2] === 0 && (b[3] === 42 || b[3] === 43);
  return ii || mm;
}

type GeoTiffModule = typeof import('geotiff');
let geotiffModule: Promise<GeoTiffModule> | null = null;
const loadGeotiff = () => (geotiffModule ??= import('geotiff'));

/** Map position of pixel (c, r). */
export function pixelPosition(g: DemGrid, c: number, r: number): [number, number] {
  const o = g.pixelIsPoint ? 0 : 0.5;
  return [g.originX + (c + o) * g.resX, g.originY + (r + o) * g.resY];
}

/**
 * Reads a DEM GeoTIFF into a triangulated grid mesh (see the module
 * comment). `INPUT` naming `name` for a file that is not a readable
 * GeoTIFF, has no georeferencing, is in degrees, or has fewer than three
 * pixels with data in one cell.
 */
export async function parseDem(bytes: Uint8Array, name: string): Promise<Dem> {
  const { fromArrayBuffer } = await loadGeotiff();
  const ab = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
  let image, raster: ArrayLike<number>, keys: Record<string, unknown>, origin: number[], res: number[], noData: number | null;
  try {
    const tiff = await fromArrayBuffer(ab);
    image = await tiff.getImage();
    keys = (image.getGeoKeys() ?? {}) as Record<string, unknown>;
    const fd = image.fileDirectory as unknown as { getValue?: (n: string) => unknown; ModelTransformation?: number[] };
    const mt = (fd.getValue ? fd.getValue('ModelTransformation') : fd.ModelTransformation) as number[] | undefined;
    if (mt && (mt[1] !== 0 || mt[4] !== 0)) throw inputError('rotated or sheared rasters (ModelTransformation with rotation terms) are not supported; resample to a north-up grid', name);
    origin = image.getOrigin();
    res = image.getResolution();
    noData = image.getGDALNoData();
    raster = (await image.readRasters({ samples: [0] }))[0] as ArrayLike<number>;
  } catch (e) {
    if (e instanceof Error && e.name === 'OrthodromeError') throw e;
    throw inputError(`not a readable GeoTIFF DEM (${e instanceof Error ? e.message : String(e)})`, name);
  }
  if (keys.GTModelTypeGeoKey === 2 || (keys.GeographicTypeGeoKey !== undefined && keys.ProjectedCSTypeGeoKey === undefined && keys.GTModelTypeGeoKey !== 1)) {
    throw inputError('the DEM is in geographic coordinates (degrees); reproject it to a projected coordinate system in metres first', name);
  }
  const width = image.getWidth(), height = image.getHeight();
  const [ox, oy] = origin as [number, number];
  const [rx, ry] = res as [number, number];
  if (![ox, oy, rx, ry].every(Number.isFinite) || rx === 0 || ry === 0) throw inputError('the GeoTIFF has no usable georeferencing (tie point and pixel scale)', name);
  const epsgKey = (keys.ProjectedCSTypeGeoKey ?? keys.GeographicTypeGeoKey) as number | undefined;
  const grid: DemGrid = {
    width, height, originX: ox, originY: oy, resX: rx, resY: ry,
    pixelIsPoint: keys.GTRasterTypeGeoKey === 2,
    epsg: typeof epsgKey === 'number' && epsgKey > 0 && epsgKey < 32767 ? epsgKey : null,
    linearUnit: typeof keys.ProjLinearUnitsGeoKey === 'number' ? keys.ProjLinearUnitsGeoKey : null,
    noData: noData ?? null,
    pixelVertex: new Int32Array(width * height).fill(-1),
  };
  const valid = (i: number) => {
    const z = raster[i]!;
    return Number.isFinite(z) && !(noData !== null && z === noData);
  };
  // triangles of each cell, then the vertices they use
  const tris: number[] = [];
  for (let r = 0; r + 1 < height; r++) {
    for (let c = 0; c + 1 < width; c++) {
      const a = r * width + c, b = a + 1, d = a + width, e = d + 1; // a b / d e (row r above row r+1)
      const va = valid(a), vb = valid(b), vd = valid(d), ve = valid(e);
      const n = +va + +vb + +vd + +ve;
      if (n === 4) {
        if ((r + c) % 2 === 0) tris.push(d, e, b, d, b, a);
        else tris.push(d, e, a, e, b, a);
      } else if (n === 3) {
        tris.push(...[d, e, b, a].filter((_p, i) => [vd, ve, vb, va][i]));
      }
    }
  }
  if (tris.length === 0) throw inputError('the DEM has no cell with at least three pixels of data', name);
  const pv = grid.pixelVertex;
  let nv = 0;
  for (const p of tris) if (pv[p]! < 0) pv[p] = nv++;
  // vertices in pixel order, so indices follow the raster
  nv = 0;
  for (let p = 0; p < pv.length; p++) if (pv[p]! >= 0) pv[p] = nv++;
  const positions = new Float64Array(3 * nv);
  for (let p = 0; p < pv.length; p++) {
    const v = pv[p]!;
    if (v < 0) continue;
    const [x, y] = pixelPosition(grid, p % width, (p / width) | 0);
    positions[3 * v] = x; positions[3 * v + 1] = y; positions[3 * v + 2] = raster[p]!;
  }
  const faceIndices = new Uint32Array(tris.length);
  for (let i = 0; i < tris.length; i += 3) {
    let a = pv[tris[i]!]!, b = pv[tris[i + 1]!]!, c = pv[tris[i + 2]!]!;
    // counter-clockwise seen from +z, whatever the signs of the pixel sizes
    const cross = (positions[3 * b]! - positions[3 * a]!) * (positions[3 * c + 1]! - positions[3 * a + 1]!)
      - (positions[3 * b + 1]! - positions[3 * a + 1]!) * (positions[3 * c]! - positions[3 * a]!);
    if (cross < 0) [b, c] = [c, b];
    faceIndices[i] = a; faceIndices[i + 1] = b; faceIndices[i + 2] = c;
  }
  const nf = tris.length / 3, faceOffsets = new Uint32Array(nf + 1);
  for (let f = 0; f <= nf; f++) faceOffsets[f] = 3 * f;
  return { data: { positions, faceOffsets, faceIndices, vertexProps: [], faceProps: [], name }, grid };
}

/** Options of {@link writeFieldTiff}. */
export interface FieldTiffOptions {
  /** Value written where the field has none (default the DEM's nodata, else −9999). */
  noData?: number;
  /** Sample type (default float64: values kept exactly). */
  sampleType?: 'float32' | 'float64';
}

/**
 * A GeoTIFF raster on the DEM's grid holding one value per mesh vertex
 * (`values`, indexed like the DEM mesh's vertices): each pixel gets its
 * vertex's value, nodata where the pixel has no vertex or the value is not
 * finite. The georeferencing (tie point, pixel scale, raster type) and the
 * EPSG code are written back as read.
 */
export async function writeFieldTiff(grid: DemGrid, values: Float64Array, opts: FieldTiffOptions = {}): Promise<Uint8Array> {
  const noData = opts.noData ?? grid.noData ?? -9999;
  if (!Number.isFinite(noData)) throw usageError(`the nodata value must be finite, got ${noData}`);
  const n = grid.width * grid.height;
  const out = opts.sampleType === 'float32' ? new Float32Array(n) : new Float64Array(n);
  for (let p = 0; p < n; p++) {
    const v = grid.pixelVertex[p]!;
    const x = v >= 0 ? values[v]! : NaN;
    out[p] = Number.isFinite(x) ? x : noData;
  }
  const { writeArrayBuffer } = await loadGeotiff();
  const meta: Record<string, unknown> = {
    width: grid.width, height: grid.height,
    GTModelTypeGeoKey: 1,
    GTRasterTypeGeoKey: grid.pixelIsPoint ? 2 : 1,
    // 32767: user-defined; without a CRS key the writer would assume WGS 84
    ProjectedCSTypeGeoKey: grid.epsg ?? 32767,
    GDAL_NODATA: String(noData),
  };
  if (grid.resY < 0 && grid.resX > 0) {
    meta.ModelPixelScale = [grid.resX, -grid.resY, 0];
    meta.ModelTiepoint = [0, 0, 0, grid.originX, grid.originY, 0];
  } else {
    meta.ModelTransformation = [grid.resX, 0, 0, grid.originX, 0, grid.resY, 0, grid.originY, 0, 0, 0, 0, 0, 0, 0, 1];
  }
  return new Uint8Array(writeArrayBuffer(out, meta as Parameters<GeoTiffModule['writeArrayBuffer']>[1]));
}
