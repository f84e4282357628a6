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
   * then meet at two copies of one vertex, and since crossing a seam
   * reverses the orientation, the loop runs along some half-edges from tip
   * to tail (and its direction is that of the first boundary half-edge
   * found: such a surface has no "left").
   */
  halfedges: Int32Array;
  /**
   * The loop's vertices in order (topology indices): where it enters each
   * half-edge (its tail, unless the loop runs along it backwards). The loop
   * closes from the last back to the first.
   */
  vertices: Int32Array;
  /** Sum of the 3D lengths of its edges, in mesh units. */
  length: number;
  /** Bounding box of its vertices. */
  min: [number, number, number];
  /** Bounding box of its vertices. */
  max: [number, number, number];
  /** Its vertex of smallest file index (topology index; `vertexOrigin` gives the file's); the loop starts there. */
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
  const starts: Int32Array[] = [];
  const raw = seams.length ? gluedLoops(t, seams, starts) : boundaryLoops(t);
  const origin = t.vertexOrigin;
  const loops: NamedLoop[] = raw.map((halfedges, k) => {
    const n = halfedges.length;
    const vertices = starts[k] ?? new Int32Array(n);
    const min: [number, number, number] = [Infinity, Infinity, Infinity];
    const max: [number, number, number] = [-Infinity, -Infinity, -Infinity];
    let length = 0, representative = -1;
    for (let i = 0; i < n; i++) {
      const h = halfedges[i]!;
      if (!starts[k]) vertices[i] = t.tri[h]!;
      const a = vertices[i]!, b = t.tri[h] === a ? t.tri[next(h)]! : t.tri[h]!;
      if (representative < 0 || origin[a]! < origin[representative]!) representative = a;
      length += Math.hypot(positions[3 * b]! - positions[3 * a]!, positions[3 * b + 1]! - positions[3 * a + 1]!, positions[3 * b + 2]! - positions[3 * a + 2]!);
      for (let d = 0; d < 3; d++) {
        const x = positions[3 * a + d]!;
        if (x < min[d]!) min[d] = x;
        if (x > max[d]!) max[d] = x;
      }
    }
    // start the loop at its representative vertex, so the order does not depend on the face order in the file
    const r0 = vertices.indexOf(representative);
    const rot = (a: Int32Array) => {
      if (r0 <= 0) return a;
      const out = new Int32Array(n);
      out.set(a.subarray(r0));
      out.set(a.subarray(0, r0), n - r0);
      return out;
    };
    return { id: -1, halfedges: rot(halfedges), vertices: rot(vertices), length, min, max, representative };
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
 * non-seam boundary half-edges through the glued vertex classes (a glued
 * boundary vertex of a manifold surface has two of them). Crossing a seam
 * reverses the orientation, so a chain may run along a half-edge from tip
 * to tail: `starts` receives the vertex where the walk enters each one.
 */
function gluedLoops(t: Topology, seams: Int32Array, starts: Int32Array[]): Int32Array[] {
  const nh = t.twin.length;
  const { rep, seamHalfedge: seam } = glueSeams(t, seams);
  const first = new Int32Array(t.nv).fill(-1), second = new Int32Array(t.nv).fill(-1); // glued class → its boundary half-edges
  const attach = (c: number, h: number) => { if (first[c]! < 0) first[c] = h; else if (second[c]! < 0) second[c] = h; };
  for (let h = 0; h < nh; h++) {
    if (t.twin[h] !== -1 || seam[h]) continue;
    const a = rep[t.tri[h]!]!, b = rep[t.tri[next(h)]!]!;
    attach(a, h);
    if (b !== a) attach(b, h);
  }
  const seen = new Uint8Array(nh);
  const loops: Int32Array[] = [];
  const buf: number[] = [], vbuf: number[] = [];
  for (let h0 = 0; h0 < nh; h0++) {
    if (t.twin[h0] !== -1 || seam[h0] || seen[h0]) continue;
    buf.length = 0;
    vbuf.length = 0;
    let h = h0, a = t.tri[h0]!;
    for (;;) {
      seen[h] = 1;
      buf.push(h);
      vbuf.push(a);
      const b = t.tri[h] === a ? t.tri[next(h)]! : t.tri[h]!; // the other end
      const c = rep[b]!, f = first[c]!, g = second[c]!;
      const h2 = f >= 0 && !seen[f] ? f : g >= 0 && !seen[g] ? g : -1;
      if (h2 < 0) break;
      a = rep[t.tri[h2]!] === c ? t.tri[h2]! : t.tri[next(h2)]!;
      h = h2;
    }
    loops.push(Int32Array.from(buf));
    starts.push(Int32Array.from(vbuf));
  }
  return loops;
}
