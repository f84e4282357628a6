/**
 * Builds a {@link Topology} from a triangle list, repairing what can be
 * repaired and reporting every problem with its location.
 *
 * Steps, each linear in the mesh size:
 * 1. drop triangles with a repeated vertex (counted and listed), then
 *    duplicate triangles (same vertex set as an earlier one, in any order:
 *    counted and listed, the first copy kept), so that what follows is about
 *    the surface itself and not about its repeated faces;
 * 2. group the half-edges of each undirected edge (radix sort on the vertex pair);
 * 3. orient: breadth-first over manifold edges, flip faces so neighbours agree,
 *    keeping the majority orientation of each component; a component that
 *    cannot be oriented is reported and the edges where its breadth-first
 *    orientation disagrees are cut (listed as seams, so reports can count the
 *    surface as given: a seam is one edge, and its ends are not non-manifold);
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
import { distinctFaces, type DuplicateFace } from './duplicates.js';

export type { DuplicateFace };

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
  /** Input triangles dropped because an earlier one has the same vertex set (listed up to `maxListed`). */
  duplicateFaces: DuplicateFace[];
  /** Exact number of duplicate triangles dropped. */
  duplicateFaceCount: number;
  /** Edges with more than two incident faces. */
  nonManifoldEdges: NonManifoldEdge[];
  /** Exact number of non-manifold edges (the list above may be capped). */
  nonManifoldEdgeCount: number;
  /**
   * Input vertices whose incident faces form several fans, not counting ends
   * of non-manifold edges. Fans are joined across every edge with two faces,
   * whatever their orientation, so the ends of orientation seams are not listed.
   */
  nonManifoldVertices: number[];
  /** Exact number of non-manifold vertices (the list above may be capped). */
  nonManifoldVertexCount: number;
  /** Number of faces flipped to make orientation consistent. */
  flippedFaces: number;
  /** Number of connected pieces that could not be consistently oriented. */
  nonOrientableComponents: number;
  /** Edges cut because orientation could not be made consistent across them. */
  orientationCuts: number;
  /**
   * The cut edges as pairs of half-edges of the built topology, `[h0, h1, …]`:
   * both sides of one edge of the input surface (each is a boundary half-edge
   * of the topology, and both run the same way).
   */
  orientationSeams: Int32Array;
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

  // 1. drop degenerate triangles, then duplicates
  const { tri, faceOrigin, degenerateFaces, duplicateFaces, duplicateFaceCount } = distinctFaces(triangles, nv, maxListed);
  const nf = faceOrigin.length;

  // 2. group half-edges by undirected edge (linear radix sort on the vertex pair)
  let groups = groupHalfedges(tri, nv);

  // 3. orientation
  let flippedFaces = 0;
  let nonOrientableComponents = 0;
  if (orient) {
    const r = orientFaces(tri, nf, groups);
    flippedFaces = r.flipped;
    nonOrientableComponents = r.nonOrientable;
    if (r.changed) groups = groupHalfedges(tri, nv); // corners moved: regroup
  }

  // 4. twins from groups; cut non-manifold and mis-oriented edges
  const paired = pairTwins(tri, groups, faceOrigin, nv, maxListed);
  const { twin, seams } = paired;

  // 5. split vertices with several fans
  const parent = fanForest(tri, twin);
  const nonManifold = nonManifoldVerticesOf(tri, parent, seams, paired.cutVertex, nv, maxListed);
  const { vertexOrigin, splitVertices } = splitFans(tri, parent, nv);
  const nvOut = vertexOrigin.length;
  const { vertexHalfedge, isolatedVertices } = vertexHalfedges(tri, twin, nvOut, nv);
  const { edgeOf, edgeHalfedge, ne } = edgeIndex(twin);

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
    duplicateFaces,
    duplicateFaceCount,
    nonManifoldEdges: paired.nonManifoldEdges,
    nonManifoldEdgeCount: paired.nonManifoldEdgeCount,
    nonManifoldVertices: nonManifold.list.sort((x, y) => x - y),
    nonManifoldVertexCount: nonManifold.count,
    flippedFaces,
    nonOrientableComponents,
    orientationCuts: seams.length / 2,
    orientationSeams: Int32Array.from(seams),
    isolatedVertices,
    splitVertices,
  };
  return { topology, report };
}

/** Twins of the half-edges, and the edges cut instead of paired (step 4). */
interface PairedEdges {
  /** twin[h], −1 on the boundary and on cut edges. */
  twin: Int32Array;
  nonManifoldEdges: NonManifoldEdge[];
  nonManifoldEdgeCount: number;
  /** Orientation seams as half-edge pairs [h0, h1, …], both running the same way. */
  seams: number[];
  /** 1 at the ends of non-manifold edges. */
  cutVertex: Uint8Array;
}

/**
 * Step 4: pairs the two half-edges of each edge with two faces that run
 * opposite ways; an edge whose two half-edges run the same way becomes an
 * orientation seam, an edge with more than two faces is non-manifold; both
 * are cut (left as boundary).
 */
function pairTwins(
  tri: Uint32Array, groups: ReturnType<typeof groupHalfedges>, faceOrigin: ArrayLike<number>, nv: number, maxListed: number,
): PairedEdges {
  const twin = new Int32Array(tri.length).fill(-1);
  const nonManifoldEdges: NonManifoldEdge[] = [];
  let nonManifoldEdgeCount = 0;
  const seams: number[] = [];
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
        seams.push(h0, h1); // same direction: tri[h0] === tri[h1]
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
  return { twin, nonManifoldEdges, nonManifoldEdgeCount, seams, cutVertex };
}

/**
 * Union–find forest of corners: corner h (at tri[h]) is joined with the
 * corner twin[prev(h)] (same vertex, next face counter-clockwise), so each
 * set is one fan of faces about a vertex.
 */
function fanForest(tri: Uint32Array, twin: Int32Array): Int32Array {
  const nh = tri.length;
  const parent = new Int32Array(nh);
  for (let h = 0; h < nh; h++) parent[h] = h;
  for (let h = 0; h < nh; h++) {
    const o = twin[prev(h)]!;
    if (o >= 0) union(parent, h, o);
  }
  return parent;
}

/**
 * Input vertices with several fans, judged on the surface as given: corners
 * are also joined across orientation seams (both sides run the same way, so
 * h0 ~ h1 at the tail and next(h0) ~ next(h1) at the tip), and the ends of
 * non-manifold edges are not counted. Lists up to `maxListed`.
 */
function nonManifoldVerticesOf(
  tri: Uint32Array, parent: Int32Array, seams: number[], cutVertex: Uint8Array, nv: number, maxListed: number,
): { list: number[]; count: number } {
  const given = parent.slice();
  for (let i = 0; i < seams.length; i += 2) {
    union(given, seams[i]!, seams[i + 1]!);
    union(given, next(seams[i]!), next(seams[i + 1]!));
  }
  const list: number[] = [];
  let count = 0;
  const owner = new Int32Array(nv).fill(-1);
  const flagged = new Uint8Array(nv);
  for (let h = 0; h < tri.length; h++) {
    const v = tri[h]!, r = findRoot(given, h);
    if (owner[v]! < 0) owner[v] = r;
    else if (owner[v] !== r && !cutVertex[v] && !flagged[v]) {
      flagged[v] = 1;
      count++;
      if (list.length < maxListed) list.push(v);
    }
  }
  return { list, count };
}

/**
 * Renumbers corners in place so that each fan is its own vertex: the first
 * fan seen at each vertex keeps the index, the others get new vertices
 * appended after the input ones. Returns vertexOrigin (new → input vertex).
 */
function splitFans(tri: Uint32Array, parent: Int32Array, nv: number): { vertexOrigin: Int32Array; splitVertices: number } {
  const nh = tri.length;
  const fanOwner = new Int32Array(nv).fill(-1);
  const rootVertex = new Int32Array(nh).fill(-1);
  const extraOrigin: number[] = [];
  for (let h = 0; h < nh; h++) {
    const v = tri[h]!;
    const r = findRoot(parent, h);
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
    }
  }
  const vertexOrigin = new Int32Array(nv + extraOrigin.length);
  for (let v = 0; v < nv; v++) vertexOrigin[v] = v;
  for (let i = 0; i < extraOrigin.length; i++) vertexOrigin[nv + i] = extraOrigin[i]!;
  return { vertexOrigin, splitVertices: extraOrigin.length };
}

/** vertexHalfedge (the boundary outgoing half-edge if there is one), and the input vertices with no face. */
function vertexHalfedges(tri: Uint32Array, twin: Int32Array, nvOut: number, nv: number): { vertexHalfedge: Int32Array; isolatedVertices: number } {
  const vertexHalfedge = new Int32Array(nvOut).fill(-1);
  for (let h = 0; h < tri.length; h++) {
    const v = tri[h]!;
    if (vertexHalfedge[v]! < 0 || twin[h] === -1) vertexHalfedge[v] = h;
  }
  let isolatedVertices = 0;
  for (let v = 0; v < nv; v++) if (vertexHalfedge[v]! < 0) isolatedVertices++;
  return { vertexHalfedge, isolatedVertices };
}

/** Edge numbering: an edge per twin pair or boundary half-edge, in half-edge order; edgeHalfedge is its first half-edge. */
function edgeIndex(twin: Int32Array): { edgeOf: Int32Array; edgeHalfedge: Int32Array; ne: number } {
  const nh = twin.length;
  const edgeOf = new Int32Array(nh);
  let ne = 0;
  for (let h = 0; h < nh; h++) {
    const t = twin[h]!;
    if (t < 0 || h < t) edgeOf[h] = ne++;
    else edgeOf[h] = edgeOf[t]!;
  }
  const edgeHalfedge = new Int32Array(ne);
  for (let h = nh - 1; h >= 0; h--) edgeHalfedge[edgeOf[h]!] = h;
  return { edgeOf, edgeHalfedge, ne };
}

/**
 * Representative of `x`'s set in the union–find forest `parent`
 * (`parent[x] === x` at a representative; path halving, Tarjan & van
 * Leeuwen, J. ACM 31(2), 1984). The one home of this forest: the fans here,
 * seam copies (seams.ts), boundary loops (components.ts) and the cover's
 * sheets (geodesic/cover.ts). Kept in this file, where the hot loop
 * (fanForest, every half-edge) calls it: moved to a module of its own it
 * made buildTopology 14% slower under tsx at 500k faces (CPU time, medians
 * of 21), and a bare union loop 2× slower; as plain ESM under node, no difference.
 */
export function findRoot(parent: Int32Array, x: number): number {
  while (parent[x] !== x) {
    parent[x] = parent[parent[x]!]!;
    x = parent[x]!;
  }
  return x;
}

/** Joins the sets of `a` and `b` in the forest `parent`: `a`'s representative then points at `b`'s. */
export function union(parent: Int32Array, a: number, b: number): void {
  const ra = findRoot(parent, a), rb = findRoot(parent, b);
  if (ra !== rb) parent[ra] = rb;
}
