/**
 * The surface as given, seen through a built topology: a non-orientable
 * piece (Möbius strip, Klein bottle) is cut along seams so that it has
 * half-edges (`BuildReport.orientationSeams`: pairs of half-edges, the two
 * sides of one input edge, running the same way). Counting and curvature
 * glue the seams back: the copies of a vertex made by the cut are one vertex,
 * and a seam is neither two edges nor boundary.
 */
import type { Topology } from './topology.js';
import { next } from './topology.js';
import { findRoot, union } from './build.js';

/** Vertex classes of the glued surface. */
export interface GluedVertices {
  /** Representative of each topology vertex's class (itself when it has no seam copy). */
  rep: Int32Array;
  /** 1 for half-edges on a seam. */
  seamHalfedge: Uint8Array;
  /** 1 for vertices on the boundary of the glued surface (a boundary edge that is not a seam). */
  boundary: Uint8Array;
}

/** Merges the seam copies of each vertex (union–find) and marks the true boundary. */
export function glueSeams(t: Topology, seams: Int32Array): GluedVertices {
  const parent = new Int32Array(t.nv);
  for (let v = 0; v < t.nv; v++) parent[v] = v;
  const seamHalfedge = new Uint8Array(t.twin.length);
  for (let i = 0; i + 1 < seams.length; i += 2) {
    const h0 = seams[i]!, h1 = seams[i + 1]!;
    seamHalfedge[h0] = 1;
    seamHalfedge[h1] = 1;
    union(parent, t.tri[h0]!, t.tri[h1]!); // both sides run the same way
    union(parent, t.tri[next(h0)]!, t.tri[next(h1)]!);
  }
  const rep = new Int32Array(t.nv);
  for (let v = 0; v < t.nv; v++) rep[v] = findRoot(parent, v);
  const boundary = new Uint8Array(t.nv);
  for (let h = 0; h < t.twin.length; h++) {
    if (t.twin[h] !== -1 || seamHalfedge[h]) continue;
    boundary[rep[t.tri[h]!]!] = 1;
    boundary[rep[t.tri[next(h)]!]!] = 1;
  }
  for (let v = 0; v < t.nv; v++) boundary[v] = boundary[rep[v]!]!;
  return { rep, seamHalfedge, boundary };
}
