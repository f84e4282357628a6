/**
 * Node adapter of the facade: a surface from a mesh file on disk (OBJ, PLY or STL,
 * gzip unpacked by magic bytes, size bounded). Reached only from the Node
 * entry (`src/index.ts`); the browser entry (`src/core.ts`) has
 * `openSurface` for bytes instead.
 */
import { readMeshFile } from '../io/read-mesh.js';
import { openSurface, type OpenOptions, type Surface } from './surface.js';

/** Options of {@link loadSurface}. */
export interface LoadOptions extends OpenOptions {
  /**
   * Largest input accepted, bytes, on disk and after gzip unpacking (default
   * 1 GiB, `DEFAULT_MAX_INPUT_BYTES` of `orthodrome/node`); over it is a `LIMIT` error.
   */
  maxInputBytes?: number;
}

/**
 * Reads, parses and builds the surface of the mesh file at `path`. A file
 * that cannot be read or parsed is an `INPUT` error naming the file and the
 * location; input over `maxInputBytes` is a `LIMIT` error.
 */
export async function loadSurface(path: string, opts: LoadOptions = {}): Promise<Surface> {
  const data = await readMeshFile(path, {
    ...(opts.maxInputBytes !== undefined ? { maxInputBytes: opts.maxInputBytes } : {}),
    ...(opts.weldTolerance !== undefined ? { weldTolerance: opts.weldTolerance } : {}),
  });
  return openSurface(data, path, opts);
}
