/**
 * orthodrome — intrinsic distances, shortest paths and curvature on
 * triangulated surfaces. This module is the public entry (`orthodrome`):
 * the facade of `./core.js` (which also runs in a browser) and its two Node
 * adapters, {@link loadSurface} (a mesh file → a surface) and
 * {@link writeFileAtomic} (store a result file).
 *
 * Data flows one way: bytes → MeshData → Surface (half-edge topology) →
 * IntrinsicMesh (edge lengths: the metric, the interface every solver
 * consumes) → distance fields, paths and reports. The parts of that flow
 * are in the subpaths `orthodrome/io`, `/mesh`, `/metric`, `/linalg`,
 * `/geodesic`, `/points`, `/report`, `/errors` and `/node` (src/api/*.ts).
 *
 * @packageDocumentation
 */
export * from './core.js';
export { loadSurface, type LoadOptions } from './api/load.js';
export { writeFileAtomic } from './io/atomic.js';
// walking time on terrain (`orthodrome travel`): pace models, Steiner-graph fields and routes, DEM GeoTIFF, GPX, map CRS
// (geotiff and proj4 are loaded on first use)
export * from './travel/api.js';
// batch scoring (`orthodrome score`): the rest of it (metric catalogue, rules, result rows, manifests, landmarks) is the
// `orthodrome/score` subpath (src/score/index.ts); imported from its own module so that the root does not load the rules
// schema library (zod, about 3 MB of heap) for every command
export { scoreSurface, type ScoreOptions, type SurfaceScore } from './score/score-mesh.js';
