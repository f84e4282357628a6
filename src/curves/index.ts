/**
 * `orthodrome/curves`: curves on a surface: isolines and bands of a scalar
 * field (a distance field, a vertex property or a CSV column), on-surface
 * offsets, straightest lines, and 3D polylines as curve sources. The root
 * entry has the four main calls (`surfaceIsolines`, `surfaceOffset`,
 * `straightestLine`, `writeCurves`); this subpath has the rest.
 *
 * @packageDocumentation
 */
export { surfaceIsolines, type IsolineOptions, type IsolineResult } from './extract.js';
export { surfaceOffset, distanceScalarField, type OffsetOptions, type OffsetResult } from './offset.js';
export { isolines, chooseLevels, finiteRange, polylineLength, DEFAULT_MAX_LEVELS, type SurfaceCurve, type ScalarField, type LevelOptions } from './isolines.js';
export { bands, bandLevels, planArea, type Band, type BandPolygon, type BandOptions } from './bands.js';
export { fieldFromCsv, vertexProperty, toTopologyVertices } from './field-input.js';
export { parsePolylines, readPolylines, polylineSources, type PolylineFile } from './polyline-source.js';
export {
  straightestLine, defaultMaxSteps, DEFAULT_REFERENCE, REFERENCE_TOLERANCE, REFERENCE_MIN_ANGLE, MAX_DEFAULT_STEPS,
  type StraightestOptions, type StraightestLine, type StraightSurface,
} from './straightest.js';
