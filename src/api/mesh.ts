/**
 * `orthodrome/mesh`: the half-edge mesh: topology arrays and their helpers,
 * building with repairs, triangulation, seams, boundary loops, components,
 * and the `Surface` (mesh data → topology and positions).
 *
 * @packageDocumentation
 */
export type { Topology } from '../mesh/topology.js';
export { next, prev, faceOf, tail, tip, isBoundaryVertex, isBoundaryEdge, forEachOutgoing } from '../mesh/topology.js';
export { buildTopology, type BuildReport, type BuildOptions, type BuiltMesh, type NonManifoldEdge, type DuplicateFace } from '../mesh/build.js';
export { glueSeams, type GluedVertices } from '../mesh/seams.js';
export { triangulate, type Triangulation } from '../mesh/triangulate.js';
export { boundaryLoops, boundaryVertexMask, namedBoundaryLoops, LOOP_LENGTH_TIE, type NamedLoop } from '../mesh/boundary.js';
export { components, type Components, type ComponentInfo } from '../mesh/components.js';
export { surfaceFromMeshData, isManifold, MAX_COORDINATE, type Surface } from '../mesh/surface.js';
