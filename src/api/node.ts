/**
 * `orthodrome/node`: the Node adapters: reading mesh files (gzip unpacked,
 * size bounded) and writing files atomically (temporary file and rename,
 * gzip for `.gz`, temporary files removed on signals). Not for browsers.
 *
 * @packageDocumentation
 */
export { readMeshFile, readMeshFileSync, gunzipIfNeeded, DEFAULT_MAX_INPUT_BYTES, type ReadMeshOptions } from '../io/read-mesh.js';
export { writeFileAtomic, writeFileAtomicSync, pendingTempFiles, type AtomicData, type AtomicOptions } from '../io/atomic.js';
export { loadSurface, type LoadOptions } from './load.js';
export { NodeFactorExecutor, DEFAULT_MIN_SIZE as FACTOR_THREADS_MIN_SIZE, type NodeFactorExecutorOptions, type ExecutorCounts } from '../linalg/parallel-node.js';
export { NodeOrderingExecutor, DEFAULT_ORDERING_MIN_SIZE as ORDERING_THREADS_MIN_SIZE, type NodeOrderingExecutorOptions } from '../linalg/ordering-parallel-node.js';
