/**
 * Opening a surface from bytes or parsed mesh data: the first step of every
 * job, and the one that runs anywhere (browser or Node). Files on disk go
 * through {@link loadSurface} in `./load.ts` (Node only).
 */
import { parseMesh } from '../io/sniff.js';
import type { MeshData } from '../io/mesh-data.js';
import type { BuildOptions } from '../mesh/build.js';
import { surfaceFromMeshData, isManifold, type Surface } from '../mesh/surface.js';

export { isManifold };
export type { Surface };

/** Options of {@link openSurface} and `loadSurface`. */
export interface OpenOptions {
  /** Repairs while building the half-edge topology (e.g. splitting non-manifold vertices, how many problems to list). */
  build?: BuildOptions;
  /**
   * STL: facet corners closer than this (mesh units) are welded into one vertex
   * (default 1e-9 × the bounding-box diagonal; 0 welds exact copies only).
   */
  weldTolerance?: number;
}

/**
 * A surface from the bytes of an OBJ, PLY or STL file (format sniffed from the
 * content; gzip is unpacked by `loadSurface` only) or from parsed
 * {@link MeshData}: triangulated, with its half-edge topology, positions and
 * the build report (problems found, repairs made). `name` labels errors.
 * Bad input is an `INPUT` error naming `name` and the location.
 */
export function openSurface(input: Uint8Array | MeshData, name = 'mesh', opts: OpenOptions = {}): Surface {
  const data = input instanceof Uint8Array ? parseMesh(input, name, opts.weldTolerance !== undefined ? { weldTolerance: opts.weldTolerance } : {}) : input;
  return surfaceFromMeshData(data, opts.build ?? {});
}
