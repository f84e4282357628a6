/**
 * Loading a mesh file for a command: read, parse, triangulate, build the
 * topology, and refuse non-manifold input for solvers unless splitting is
 * allowed.
 */
import { readMeshFile } from '../src/io/read-mesh.js';
import { surfaceFromMeshData, isManifold, type Surface } from '../src/mesh/surface.js';
import { inputError } from '../src/errors.js';
import { since } from './run.js';

/** A loaded surface and how long it took. */
export interface Loaded {
  surface: Surface;
  loadMs: number;
}

/**
 * Loads `path`. With `requireManifold`, a mesh that needed cutting or
 * splitting is refused (exit 2) with the first location, unless
 * `allowSplit` is set.
 */
export async function loadSurface(path: string, opts: { requireManifold?: boolean; allowSplit?: boolean } = {}): Promise<Loaded> {
  const t0 = performance.now();
  const data = await readMeshFile(path);
  const surface = surfaceFromMeshData(data);
  if (opts.requireManifold && !opts.allowSplit && !isManifold(surface)) {
    const r = surface.report;
    let where = '';
    if (r.nonManifoldEdgeCount > 0) {
      const e = r.nonManifoldEdges[0]!;
      where = `${r.nonManifoldEdgeCount} non-manifold edge(s), first between vertices ${e.a} and ${e.b} (faces ${e.faces.join(', ')})`;
    } else if (r.nonManifoldVertexCount > 0) {
      where = `${r.nonManifoldVertexCount} non-manifold vertex(es), first vertex ${r.nonManifoldVertices[0]}`;
    } else {
      where = `${r.orientationCuts} edge(s) where the surface cannot be oriented consistently`;
    }
    throw inputError(`${where}; see 'orthodrome inspect', or pass --split-nonmanifold to cut the mesh there`, path);
  }
  return { surface, loadMs: since(t0) };
}
