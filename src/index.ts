/**
 * orthodrome — intrinsic distances, shortest paths and curvature on
 * triangulated surfaces. This module is the public API and nothing else.
 *
 * Data flows one way: bytes → MeshData → Surface (half-edge topology) →
 * IntrinsicMesh (edge lengths: the metric, the interface every solver
 * consumes) → distance fields, paths and reports.
 *
 * Everything comes from `./core.js`, which also runs in a browser, except the
 * Node adapters {@link readMeshFile} and {@link writeFileAtomic}.
 *
 * @packageDocumentation
 */
export * from './core.js';
export { readMeshFile, readMeshFileSync, DEFAULT_MAX_INPUT_BYTES, type ReadMeshOptions } from './io/read-mesh.js';
export { writeFileAtomic, writeFileAtomicSync, type AtomicData, type AtomicOptions } from './io/atomic.js';
