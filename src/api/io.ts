/**
 * `orthodrome/io`: bytes ⇄ mesh data and result files, browser-safe.
 * Readers (OBJ, PLY, STL with welding, format sniffing), writers (PLY, OBJ, CSV, curves),
 * the colour ramp and the JSON writer of results. Files on disk: `orthodrome/node`.
 *
 * @packageDocumentation
 */
export type { MeshData, PropertyColumn, ScalarType } from '../io/mesh-data.js';
export { meshFromTriangles, vertexCount, faceCount } from '../io/mesh-data.js';
export { parseObj } from '../io/obj.js';
export { parsePly } from '../io/ply.js';
export { parseMesh, sniffMesh, isGzip, type Sniffed, type ParseOptions } from '../io/sniff.js';
export { parseStl, isBinaryStl, looksLikeAsciiStl, type StlOptions } from '../io/stl.js';
export type { StlReport } from '../io/mesh-data.js';
export { weldPoints, WELD_RELATIVE_TOLERANCE, NEAR_FACTOR, type WeldResult, type NearPair } from '../io/weld.js';
export { writePly, type PlyMeshInput, type WritePlyOptions } from '../io/write-ply.js';
export { writeObj, writeObjPolyline, type ObjMeshInput, type WriteObjOptions } from '../io/write-obj.js';
export { writeVertexCsv, toCsv, type CsvColumn, type CsvOptions } from '../io/csv.js';
export { colorize, rampColor, type ColorizeOptions } from '../io/colormap.js';
export { toJson } from '../io/json.js';
export {
  writeCurves, curvesToObj, curvesToGeoJson, curvesToCsv, curvesToJson, curveFormatOf, curvePointCount, CURVE_FORMATS,
  type Curve, type CurvePoints, type CurvePolygon, type CurveProperty, type CurveFormat, type CurveWriteOptions,
} from '../io/write-curves.js';
export { toInputVertices } from './write.js';
// terrain files: DEM GeoTIFF in and fields out, GPX 1.1 routes, map coordinate systems (geotiff and proj4 load on first use)
export { parseDem, writeFieldTiff, isTiff, pixelPosition, type Dem, type DemGrid, type FieldTiffOptions } from '../io/geotiff.js';
export { writeGpx, xmlEscape, type GpxPoint, type GpxRoute, type GpxOptions } from '../io/gpx.js';
export { toWgs84, crsMember, parseEpsg, CRS_MEMBER, type MapCrs } from '../travel/map-crs.js';
export { formatDuration, travelGeoJson, routeProfileCsv, routeGpx, type LonLat, type TravelMapParts, type TravelMapOptions, type Isochrone, type IsochroneBand } from '../travel/outputs.js';
