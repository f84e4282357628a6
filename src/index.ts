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
// walking time on terrain (`orthodrome travel`): terrain from bytes (DEM GeoTIFF or mesh), times from sources, fastest
// routes; pace models and the Steiner graph are in `orthodrome/geodesic`, GeoTIFF, GPX and map files in `orthodrome/io`
export { openTerrain, type Terrain, type TerrainOptions } from './travel/terrain.js';
export { travelField, travelRoute, type TravelOptions, type TravelField, type TravelRouteResult } from './travel/index.js';
// batch scoring (`orthodrome score`): the rest of it (metric catalogue, rules, result rows, manifests, landmarks) is the
// `orthodrome/score` subpath (src/score/index.ts); imported from its own module so that the root does not load the rules
// schema library (zod, about 3 MB of heap) for every command
export { scoreSurface, type ScoreOptions, type SurfaceScore } from './score/score-mesh.js';
