/**
 * Boundary loops: chains of half-edges without a twin. On a built topology
 * every vertex has a single fan, so each boundary vertex has exactly one
 * outgoing boundary half-edge (`vertexHalfedge`) and the loops are disjoint.
 */
import type { Topology } from './topology.js';
import { next } from './topology.js';
import { glueSeams } from './seams.js';

/**
 * Returns every boundary loop as the list of its half-edges, in order; the
 * face lies to the left of each half-edge, so outer boundaries run
 * counter-clockwise and holes clockwise when seen from the normal side.
 */
export function boundaryLoops(t: Topology): Int32Array[] {
  const nh = t.twin.length;
  const seen = new Uint8Array(nh);
  const loops: Int32Array[] = [];
  const buf: number[] = [];
  for (let h0 = 0; h0 < nh; h0++) {
    if (t.twin[h0] !== -1 || seen[h0]) continue;
    buf.length = 0;
    let h = h0;
    while (!seen[h]) {
      seen[h] = 1;
      buf.push(h);
      const v = t.tri[next(h)]!; // tip
      h = t.vertexHalfedge[v]!;
      if (h < 0 || t.twin[h] !== -1) break; // cannot happen on a built topology
    }
    loops.push(Int32Array.from(buf));
  }
  return loops;
}

/** Per-vertex flag: 1 on the boundary, 0 inside (isolated vertices count as inside). */
export function boundaryVertexMask(t: Topology): Uint8Array {
  const m = new Uint8Array(t.nv);
  for (let h = 0; h < t.twin.length; h++) {
    if (t.twin[h] === -1) {
      m[t.tri[h]!] = 1;
      m[t.tri[next(h)]!] = 1;
    }
  }
  return m;
}

/**
 * A boundary loop of the surface as given, with the figures `inspect`
 * reports and the id that source specs (`loop:ID`) use.
 */
export interface NamedLoop {
  /** Position in the order of {@link namedBoundaryLoops}: 0 is the longest loop. */
  id: number;
  /**
   * The loop's boundary half-edges in order, the face on the left of each
   * (outer boundaries run counter-clockwise, holes clockwise, seen from the
   * normal side). On a non-orientable surface cut along seams, the seam
   * half-edges are not boundary and are left out: consecutive half-edges
   * then meet at two copies of one vertex.
   */
  halfedges: Int32Array;
  /** The tail vertex (topology index) of each half-edge: the loop's vertices in order. */
  vertices: Int32Array;
  /** Sum of the 3D lengths of its edges, in mesh units. */
  length: number;
  /** Bounding box of its vertices. */
  min: [number, number, number];
  /** Bounding box of its vertices. */
  max: [number, number, number];
  /** Its vertex of smallest file index (topology index; `vertexOrigin` gives the file's). */
  representative: number;
}

/** Loops whose lengths differ by at most this fraction of the longer one count as equally long in the id order. */
export const LOOP_LENGTH_TIE = 1e-9;

/**
 * The boundary loops of the surface as given, with stable ids. `seams`
 * (`BuildReport.orientationSeams`) are glued back: a seam is not boundary,
 * and a loop that crosses one continues on the other side.
 *
 * Id order: by length, longest first; loops whose lengths agree within
 * {@link LOOP_LENGTH_TIE} (relative, measured from the longest loop of such
 * a run) are ordered by their smallest file vertex index. The order depends
 * only on the mesh, so ids are the same on every run.
 */
export function namedBoundaryLoops(t: Topology, positions: Float64Array, seams: Int32Array = new Int32Array(0)): NamedLoop[] {
  const raw = seams.length ? gluedLoops(t, seams) : boundaryLoops(t);
  const origin = t.vertexOrigin;
  const loops: NamedLoop[] = raw.map((halfedges) => {
    const n = halfedges.length;
    const vertices = new Int32Array(n);
    const min: [number, number, number] = [Infinity, Infinity, Infinity];
    const max: [number, number, number] = [-Infinity, -Infinity, -Infinity];
    let length = 0, representative = -1;
    for (let i = 0; i < n; i++) {
      const h = halfedges[i]!, a = t.tri[h]!, b = t.tri[next(h)]!;
      vertices[i] = a;
      if (representative < 0 || origin[a]! < origin[representative]!) representative = a;
      length += Math.hypot(positions[3 * b]! - positions[3 * a]!, positions[3 * b + 1]! - positions[3 * a + 1]!, positions[3 * b + 2]! - positions[3 * a + 2]!);
      for (let d = 0; d < 3; d++) {
        const x = positions[3 * a + d]!;
        if (x < min[d]!) min[d] = x;
        if (x > max[d]!) max[d] = x;
      }
    }
    return { id: -1, halfedges, vertices, length, min, max, representative };
  });
  loops.sort((p, q) => q.length - p.length || origin[p.representative]! - origin[q.representative]!);
  // runs of equal length (within the tie tolerance of the run's longest) are ordered by smallest file vertex
  for (let i = 0; i < loops.length; ) {
    let j = i + 1;
    while (j < loops.length && loops[i]!.length - loops[j]!.length <= LOOP_LENGTH_TIE * loops[i]!.length) j++;
    if (j - i > 1) {
      const run = loops.slice(i, j).sort((p, q) => origin[p.representative]! - origin[q.representative]!);
      for (let k = i; k < j; k++) loops[k] = run[k - i]!;
    }
    i = j;
  }
  loops.forEach((l, i) => (l.id = i));
  return loops;
}

/**
 * Boundary loops of a surface cut along `seams`, glued back: chains of
 * non-seam boundary half-edges, each continued at the glued class of its
 * tip (every glued boundary vertex of a manifold surface has one outgoing
 * boundary half-edge).
 */
function gluedLoops(t: Topology, seams: Int32Array): Int32Array[] {
  const nh = t.twin.length;
  const { rep, seamHalfedge: seam } = glueSeams(t, seams);
  const find = (v: number): number => rep[v]!;
  const out = new Int32Array(t.nv).fill(-1); // glued class → its outgoing boundary half-edge
  for (let h = 0; h < nh; h++) if (t.twin[h] === -1 && !seam[h]) { const c = find(t.tri[h]!); if (out[c]! < 0) out[c] = h; }
  const seen = new Uint8Array(nh);
  const loops: Int32Array[] = [];
  const buf: number[] = [];
  for (let h0 = 0; h0 < nh; h0++) {
    if (t.twin[h0] !== -1 || seam[h0] || seen[h0]) continue;
    buf.length = 0;
    for (let h = h0; h >= 0 && !seen[h]; h = out[find(t.tri[next(h)]!)]!) {
      seen[h] = 1;
      buf.push(h);
    }
    loops.push(Int32Array.from(buf));
  }
  return loops;
}
