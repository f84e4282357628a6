/**
 * The public face of walking time on terrain (re-exported by the root entry,
 * src/index.ts): models, fields and routes (./index.ts), terrain input
 * (DEM GeoTIFF), and the result files (GeoJSON with the CRS, GPX, profile
 * CSV, field rasters). Browser-safe; `geotiff` and `proj4` load on first use.
 *
 * @packageDocumentation
 */
export * from './index.js';
export { openTerrain, type Terrain } from './terrain.js';
export { formatDuration, travelGeoJson, routeProfileCsv, routeGpx, type LonLat, type TravelMapParts, type TravelMapOptions } from './outputs.js';
export { toWgs84, crsMember, parseEpsg, CRS_MEMBER, type MapCrs } from './map-crs.js';
export { parseDem, writeFieldTiff, isTiff, pixelPosition, type Dem, type DemGrid, type FieldTiffOptions } from '../io/geotiff.js';
export { writeGpx, xmlEscape, type GpxPoint, type GpxRoute, type GpxOptions } from '../io/gpx.js';
