/**
 * Builds a {@link Topology} from a triangle list, repairing what can be
 * repaired and reporting every problem with its location.
 *
 * Steps, each linear in the mesh size:
 * 1. drop triangles with a repeated vertex (counted and listed);
 * 2. group the half-edges of each undirected edge (bucketed by smaller vertex);
 * 3. orient: breadth-first over manifold edges, flip faces so neighbours agree,
 *    keeping the majority orientation of each component; a component that
 *    cannot be oriented is reported and its conflicting edges are cut;
 * 4. edges shared by more than two faces are reported and cut (each side
 *    becomes boundary);
 * 5. vertices whose faces form several fans (bow-ties, and the ends of cut
 *    edges) are split: the first fan keeps the index, the others get new
 *    vertices appended after the input ones (`vertexOrigin` maps back).
 */
import type { Topology } from './topology.js';
import { next, prev } from './topology.js';
import { groupHalfedges } from './edge-groups.js';
import { orientFaces } from './orient.js';

/** A non-manifold edge: two input vertices and the input triangles that share them. */
export interface NonManifoldEdge {
  /** Smaller input vertex index. */
  a: number;
  /** Larger input vertex index. */
  b: number;
  /** Input triangle indices incident to the edge (three or more). */
  faces: number[];
}

/** What {@link buildTopology} found and repaired. */
export interface BuildReport {
  /** Input triangles dropped because a vertex repeats (indices into the input list). */
  degenerateFaces: number[];
  /** Edges with more than two incident faces. */
  nonManifoldEdges: NonManifoldEdge[];
  /** Exact number of non-manifold edges (the list above may be capped). */
  nonManifoldEdgeCount: number;
  /** Input vertices whose incident faces form several fans, not counting ends of non-manifold edges. */
  nonManifoldVertices: number[];
  /** Exact number of non-manifold vertices (the list above may be capped). */
  nonManifoldVertexCount: number;
  /** Number of faces flipped to make orientation consistent. */
  flippedFaces: number;
  /** Number of connected pieces that could not be consistently oriented. */
  nonOrientableComponents: number;
  /** Edges cut because orientation could not be made consistent across them. */
  orientationCuts: number;
  /** Input vertices referenced by no face. */
  isolatedVertices: number;
  /** Number of vertices added by splitting. */
  splitVertices: number;
}

/** Options for {@link buildTopology}. */
export interface BuildOptions {
  /** Flip faces to make orientation consistent (default true). */
  orient?: boolean;
  /** Cap on how many problem locations are listed (counts stay exact; default 1000). */
  maxListed?: number;
}

/** Result of {@link buildTopology}. */
export interface BuiltMesh {
  /** The half-edge connectivity. */
  topology: Topology;
  /** Problems found and repairs made. */
  report: BuildReport;
}

/**
 * Builds half-edge connectivity for `nv` vertices and the triangles in
 * `triangles` (three vertex indices each, all `< nv`).
 *
 * @param triangles - corner indices, three per triangle
 * @param nv - number of input vertices
 * @param options - see {@link BuildOptions}
 */
export function buildTopology(
  triangles: ArrayLike<number>,
  nv: number,
  options: BuildOptions = {},
): BuiltMesh {
  const orient = options.orient ?? true;
  const maxListed = options.maxListed ?? 1000;
  const ntIn = Math.floor(triangles.length / 3);

  // 1. drop degenerate triangles
  const degenerateFaces: number[] = [];
  let nf = 0;
  for (let f = 0; f < ntIn; f++) {
    const a = triangles[3 * f]!, b = triangles[3 * f + 1]!, c = triangles[3 * f + 2]!;
    if (a === b || b === c || c === a) degenerateFaces.push(f);
    else nf++;
  }
  const tri = new Uint32Array(3 * nf);
  const faceOrigin = new Int32Array(nf);
  for (let f = 0, g = 0; f < ntIn; f++) {
    const a = triangles[3 * f]!, b = triangles[3 * f + 1]!, c = triangles[3 * f + 2]!;
    if (a === b || b === c || c === a) continue;
    tri[3 * g] = a; tri[3 * g + 1] = b; tri[3 * g + 2] = c;
    faceOrigin[g++] = f;
  }
  const nh = 3 * nf;

  // 2. group half-edges by undirected edge: bucket by min vertex, then by max vertex.
  let groups = groupHalfedges(tri, nv);

  // 3. orientation
  let flippedFaces = 0;
  let nonOrientableComponents = 0;
  if (orient) {
    const r = orientFaces(tri, nf, groups);
    flippedFaces = r.flipped;
    nonOrientableComponents = r.nonOrientable;
    if (flippedFaces > 0) groups = groupHalfedges(tri, nv); // corners moved: regroup
  }

  // 4. twins from groups; cut non-manifold and mis-oriented edges
  const twin = new Int32Array(nh).fill(-1);
  const nonManifoldEdges: NonManifoldEdge[] = [];
  let nonManifoldEdgeCount = 0;
  let orientationCuts = 0;
  const cutVertex = new Uint8Array(nv); // ends of non-manifold edges
  const { start, order } = groups;
  for (let gi = 0; gi + 1 < start.length; gi++) {
    const s = start[gi]!, e = start[gi + 1]!;
    const size = e - s;
    if (size === 2) {
      const h0 = order[s]!, h1 = order[s + 1]!;
      if (tri[h0] === tri[next(h1)] && tri[h1] === tri[next(h0)]) {
        twin[h0] = h1;
        twin[h1] = h0;
      } else {
        orientationCuts++;
      }
    } else if (size > 2) {
      nonManifoldEdgeCount++;
      const h0 = order[s]!;
      const a = tri[h0]!, b = tri[next(h0)]!;
      cutVertex[a] = 1;
      cutVertex[b] = 1;
      if (nonManifoldEdges.length < maxListed) {
        const faces: number[] = [];
        for (let k = s; k < e; k++) faces.push(faceOrigin[(order[k]! / 3) | 0]!);
        nonManifoldEdges.push({ a: Math.min(a, b), b: Math.max(a, b), faces });
      }
    }
  }

  // 5. split vertices with several fans. Corner h (at tri[h]) is joined with the
  // corner twin[prev(h)] (same vertex, next face counter-clockwise).
  const parent = new Int32Array(nh);
  for (let h = 0; h < nh; h++) parent[h] = h;
  const find = (x: number): number => {
    while (parent[x] !== x) {
      parent[x] = parent[parent[x]!]!;
      x = parent[x]!;
    }
    return x;
  };
  for (let h = 0; h < nh; h++) {
    const o = twin[prev(h)]!;
    if (o >= 0) {
      const ra = find(h), rb = find(o);
      if (ra !== rb) parent[ra] = rb;
    }
  }
  // the first fan seen at each vertex keeps the vertex; the others get new ids
  const fanOwner = new Int32Array(nv).fill(-1);
  const rootVertex = new Int32Array(nh).fill(-1);
  const extraOrigin: number[] = [];
  const nonManifoldVertexSet = new Set<number>();
  let nonManifoldVertexCount = 0;
  for (let h = 0; h < nh; h++) {
    const v = tri[h]!;
    const r = find(h);
    if (rootVertex[r]! >= 0) {
      tri[h] = rootVertex[r]!;
      continue;
    }
    if (fanOwner[v]! < 0) {
      fanOwner[v] = r;
      rootVertex[r] = v;
    } else {
      const nvNew = nv + extraOrigin.length;
      extraOrigin.push(v);
      rootVertex[r] = nvNew;
      tri[h] = nvNew;
      if (!cutVertex[v] && !nonManifoldVertexSet.has(v)) {
        nonManifoldVertexCount++;
        if (nonManifoldVertexSet.size < maxListed) nonManifoldVertexSet.add(v);
      }
    }
  }
  const nvOut = nv + extraOrigin.length;
  const vertexOrigin = new Int32Array(nvOut);
  for (let v = 0; v < nv; v++) vertexOrigin[v] = v;
  for (let i = 0; i < extraOrigin.length; i++) vertexOrigin[nv + i] = extraOrigin[i]!;

  // vertexHalfedge: the boundary outgoing half-edge if there is one
  const vertexHalfedge = new Int32Array(nvOut).fill(-1);
  for (let h = 0; h < nh; h++) {
    const v = tri[h]!;
    if (vertexHalfedge[v]! < 0 || twin[h] === -1) vertexHalfedge[v] = h;
  }
  let isolatedVertices = 0;
  for (let v = 0; v < nv; v++) if (vertexHalfedge[v]! < 0) isolatedVertices++;

  // edges
  const edgeOf = new Int32Array(nh);
  let ne = 0;
  for (let h = 0; h < nh; h++) {
    const t = twin[h]!;
    if (t < 0 || h < t) edgeOf[h] = ne++;
    else edgeOf[h] = edgeOf[t]!;
  }
  const edgeHalfedge = new Int32Array(ne);
  for (let h = nh - 1; h >= 0; h--) edgeHalfedge[edgeOf[h]!] = h;

  const topology: Topology = {
    nv: nvOut,
    nf,
    ne,
    tri,
    twin,
    edgeOf,
    edgeHalfedge,
    vertexHalfedge,
    vertexOrigin,
    faceOrigin,
  };
  const report: BuildReport = {
    degenerateFaces,
    nonManifoldEdges,
    nonManifoldEdgeCount,
    nonManifoldVertices: [...nonManifoldVertexSet].sort((x, y) => x - y),
    nonManifoldVertexCount,
    flippedFaces,
    nonOrientableComponents,
    orientationCuts,
    isolatedVertices,
    splitVertices: extraOrigin.length,
  };
  return { topology, report };
}
