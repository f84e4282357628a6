/**
 * The neutral in-memory form of a mesh file: what a parser returns and a writer
 * takes. It is faithful to the file: vertex indices are exactly those of the
 * file (0-based), polygons are kept as polygons, and extra per-vertex and
 * per-face properties are kept as named float64 columns with their declared
 * storage type, so a round trip loses nothing.
 */

/** Scalar storage types, named as in the PLY header (`char`…`double`). */
export type ScalarType =
  | 'int8'
  | 'uint8'
  | 'int16'
  | 'uint16'
  | 'int32'
  | 'uint32'
  | 'float32'
  | 'float64';

/** A named per-element property column (one value per vertex or per face). */
export interface PropertyColumn {
  /** Property name as in the file (for example `quality`, `red`, `cost`). */
  name: string;
  /** Storage type declared in the file; writers use it for binary output. */
  type: ScalarType;
  /** One value per element, widened to float64 without loss. */
  values: Float64Array;
}

/** A polygon mesh as read from a file. */
export interface MeshData {
  /** x, y, z of every vertex, float64, in file order. */
  positions: Float64Array;
  /**
   * Polygon faces in compressed form: face `f` has the vertex indices
   * `faceIndices[faceOffsets[f] .. faceOffsets[f+1])`. Indices are 0-based and
   * validated against the vertex count by the parser.
   */
  faceOffsets: Uint32Array;
  /** Concatenated vertex indices of all faces (see `faceOffsets`). */
  faceIndices: Uint32Array;
  /** Extra per-vertex properties (everything but x, y, z). */
  vertexProps: PropertyColumn[];
  /** Extra per-face properties (everything but the index list). */
  faceProps: PropertyColumn[];
  /** A label for messages, normally the file name. */
  name: string;
  /** Set by the STL reader: the encoding, the weld of the facet corners and the check of the stored normals. */
  stl?: StlReport;
}

/**
 * What reading an STL file found (`parseStl`). STL stores each facet's three
 * corners on their own; they are welded into shared vertices (io/weld.ts).
 */
export interface StlReport {
  /** `binary` or `ascii`, as sniffed from the content. */
  encoding: 'binary' | 'ascii';
  /** Facets in the file. */
  facets: number;
  /** Weld tolerance used, in mesh units. */
  weldTolerance: number;
  /** Facet corners merged into an earlier vertex: 3 × facets − vertices. */
  mergedVertices: number;
  /** Vertices closer than this (mesh units) but beyond the tolerance are counted as near pairs. */
  nearPairRadius: number;
  /** Pairs of vertices left apart although closer than `nearPairRadius`; null when not checked (too dense a region). */
  nearPairs: number | null;
  /** The first near pair: vertex indices (from 0) and distance, or null. */
  firstNearPair: { a: number; b: number; distance: number } | null;
  /** Facets whose stored normal points against the normal of their winding (right-hand rule). */
  normalsDisagreeing: number;
  /** Facets whose normal was not checked: stored as zero or not finite, or a facet without area. */
  normalsUnchecked: number;
  /** The first facet (from 0) whose stored normal disagrees, or null. */
  firstNormalDisagreeing: number | null;
}

/** Number of vertices of a {@link MeshData}. */
export function vertexCount(m: MeshData): number {
  return m.positions.length / 3;
}

/** Number of (polygon) faces of a {@link MeshData}. */
export function faceCount(m: MeshData): number {
  return m.faceOffsets.length - 1;
}

/**
 * Builds a {@link MeshData} from a plain triangle list (3 indices per face).
 * Handy for generated meshes and tests.
 */
export function meshFromTriangles(
  positions: Float64Array,
  triangles: ArrayLike<number>,
  name = 'mesh',
): MeshData {
  const nf = Math.floor(triangles.length / 3);
  const faceOffsets = new Uint32Array(nf + 1);
  for (let f = 0; f <= nf; f++) faceOffsets[f] = 3 * f;
  return {
    positions,
    faceOffsets,
    faceIndices: Uint32Array.from(triangles),
    vertexProps: [],
    faceProps: [],
    name,
  };
}
