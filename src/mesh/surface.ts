/**
 * A surface ready for the solvers: the file's data, its triangulation, the
 * half-edge topology and positions per topology vertex.
 */
import type { MeshData } from '../io/mesh-data.js';
import { buildTopology, type BuildReport, type BuildOptions } from './build.js';
import type { Topology } from './topology.js';
import { triangulate, type Triangulation } from './triangulate.js';
import { findDuplicatePolygons, type DuplicateFace } from './duplicates.js';
import { inputError } from '../errors.js';

/** Largest coordinate magnitude a surface may have (edges then stay below the solvers' 1e60 mesh units). */
export const MAX_COORDINATE = 1e59;

/** Everything known about a loaded surface. */
export interface Surface {
  /** The data as read from the file. */
  data: MeshData;
  /** Half-edge connectivity (after triangulation and repairs). */
  topology: Topology;
  /** x, y, z per topology vertex (split vertices copy their origin). */
  positions: Float64Array;
  /** Input polygon of each topology face. */
  facePolygon: Uint32Array;
  /**
   * Problems found and repairs made while building. Its face indices
   * (`degenerateFaces`, `duplicateFaces`, `nonManifoldEdges[].faces`) are the
   * file's faces (polygons), counted from 0.
   */
  report: BuildReport;
}

/**
 * Triangulates `data`, builds its topology and lays out positions. Throws an
 * `INPUT` error naming the file when the mesh has no usable face.
 */
export function surfaceFromMeshData(data: MeshData, options: BuildOptions = {}): Surface {
  const nv = data.positions.length / 3;
  let tr = triangulate(data);
  // polygons repeated with another starting corner triangulate differently: drop them first
  const dupPoly = findDuplicatePolygons(data.faceOffsets, data.faceIndices);
  const polyDups: DuplicateFace[] = [];
  for (let f = 0; f < dupPoly.length; f++) if (dupPoly[f]! >= 0) polyDups.push({ face: f, of: dupPoly[f]! });
  if (polyDups.length > 0) tr = withoutPolygons(tr, dupPoly);
  const { topology, report } = buildTopology(tr.triangles, nv, options);
  if (topology.nf === 0) {
    throw inputError(
      tr.triangles.length === 0 ? 'mesh has no faces' : 'mesh has no faces left after dropping degenerate ones',
      data.name,
    );
  }
  const positions = new Float64Array(3 * topology.nv);
  for (let v = 0; v < topology.nv; v++) {
    const o = 3 * topology.vertexOrigin[v]!;
    positions[3 * v] = data.positions[o]!;
    positions[3 * v + 1] = data.positions[o + 1]!;
    positions[3 * v + 2] = data.positions[o + 2]!;
    // products of four lengths (triangle areas) must stay in double range: see checkEdgeLengths (solver.ts)
    for (let d = 0; d < 3; d++) {
      if (Math.abs(positions[3 * v + d]!) > MAX_COORDINATE) {
        throw inputError(`coordinate ${positions[3 * v + d]} is beyond ±${MAX_COORDINATE}; rescale the mesh (change its units)`, `${data.name}: vertex ${topology.vertexOrigin[v]}`);
      }
    }
  }
  // face indices in the report: triangles → the file's polygons
  const src = tr.source;
  for (let i = 0; i < report.degenerateFaces.length; i++) report.degenerateFaces[i] = src[report.degenerateFaces[i]!]!;
  for (const d of report.duplicateFaces) {
    d.face = src[d.face]!;
    d.of = src[d.of]!;
  }
  for (const e of report.nonManifoldEdges) e.faces = e.faces.map((f) => src[f]!);
  if (polyDups.length > 0) {
    const maxListed = options.maxListed ?? 1000;
    report.duplicateFaces = [...polyDups, ...report.duplicateFaces].sort((a, b) => a.face - b.face).slice(0, maxListed);
    report.duplicateFaceCount += polyDups.length;
  }
  const facePolygon = new Uint32Array(topology.nf);
  for (let f = 0; f < topology.nf; f++) facePolygon[f] = tr.source[topology.faceOrigin[f]!]!;
  return { data, topology, positions, facePolygon, report };
}

/**
 * True when the surface had no non-manifold edges or vertices, i.e. nothing
 * was split. Solvers ask for this unless the user allows splitting.
 */
export function isManifold(s: Surface): boolean {
  return s.report.nonManifoldEdgeCount === 0 && s.report.nonManifoldVertexCount === 0 && s.report.orientationCuts === 0;
}

/** The triangulation without the triangles of the polygons marked (≥ 0) in `drop`. */
function withoutPolygons(tr: Triangulation, drop: Int32Array): Triangulation {
  let n = 0;
  for (let t = 0; t < tr.source.length; t++) if (drop[tr.source[t]!]! < 0) n++;
  const triangles = new Uint32Array(3 * n);
  const source = new Uint32Array(n);
  for (let t = 0, k = 0; t < tr.source.length; t++) {
    if (drop[tr.source[t]!]! >= 0) continue;
    triangles.set(tr.triangles.subarray(3 * t, 3 * t + 3), 3 * k);
    source[k++] = tr.source[t]!;
  }
  return { ...tr, triangles, source };
}
