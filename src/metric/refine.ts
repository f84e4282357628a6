/**
 * Intrinsic refinement by longest-edge bisection: inserts vertices at the
 * midpoints of long edges of an intrinsic triangulation, so that a few huge
 * faces (a terrain's sides given as long fans, a big flat cap, the thin
 * triangles of a CAD export) no longer dominate the lumped mass and the cotan
 * couplings of the heat method.
 *
 * Method: Rivara's longest-edge bisection (M.-C. Rivara, "Algorithms for
 * refining triangular grids suitable for adaptive and multigrid techniques",
 * Int. J. Numer. Meth. Eng. 20, 1984) with its longest-edge propagation path
 * (Rivara, "New longest-edge algorithms for the refinement and/or improvement
 * of unstructured triangulations", Int. J. Numer. Meth. Eng. 40, 1997): a
 * triangle is only ever cut from the midpoint of its LONGEST edge to the
 * opposite corner, and an edge is split only once it is the longest edge of
 * every face beside it (the terminal edge of a propagation path; on the
 * boundary, of its one face). Every triangle made then descends from an input
 * triangle by longest-edge bisections, so no angle falls below half the
 * smallest input angle (Rosenberg & Stenger, Math. Comp. 29, 1975, the bound
 * Rivara's algorithms rest on): bisection makes no nearly flat face that was
 * not nearly flat already.
 *
 * Order: edges are split longest first, from a max-heap of the edges longer
 * than `maxLength`. The longest edge of the whole triangulation is the
 * longest of both its faces, so each split is a terminal-edge bisection
 * without walking the paths; the edge-by-edge check in {@link splitLongest}
 * states that invariant. (The earlier version split the edges of a sorted
 * list in rounds, so new medians outgrew edges still waiting, and it never
 * split a boundary edge: nearly flat faces piled up against both, and heat
 * distances on a refined flat grid grew 1% → 73% wrong.)
 *
 * Splitting edge ab of faces (a, b, c) and (b, a, d) at its midpoint m:
 * ```
 *          c                      c
 *         / \                    /|\
 *        /   \                  / | \
 *       a ───── b     ──▶      a──m──b      |am| = |mb| = ½|ab|
 *        \   /                  \ | /       |mc|, |md| from the layouts of the two faces
 *         \ /                    \|/
 *          d                      d
 * ```
 * The midpoint lies on both faces, so no point location is needed: face
 * (a, b, c) is laid out along ab (triangle.ts's placeThirdCorner, the one
 * layout from lengths), c = (cx, cy), m = (½|ab|, 0), and |mc| is their
 * distance; the surface and its metric are unchanged (vertex insertion in
 * an intrinsic triangulation: Sharp, Soliman & Crane, "Navigating intrinsic
 * triangulations", ACM TOG 38(4), 2019). A boundary edge has no face d: m is
 * a new boundary vertex, the boundary loop keeps its shape and length.
 *
 * {@link splitObtuseBoundary} uses the same bisection on the boundary edges
 * opposite an obtuse corner (Ruppert's encroached segments; see there).
 *
 * New vertices get ids after the input's (vertexOrigin −1), so per-vertex
 * results of the input are the first `nv` entries; the two halves of a face
 * keep its faceOrigin (each lies inside it). The caller runs the Delaunay
 * flips afterwards.
 */
import type { Topology } from '../mesh/topology.js';
import type { IntrinsicMesh } from './intrinsic.js';
import { next, prev } from '../mesh/topology.js';
import { placeThirdCorner, triangleArea, cotOpposite } from './triangle.js';
import { planarLength } from './layout.js';

/** Edge length of an equilateral mesh with the same total area and face count: √(4A / (√3·F)). */
export function equilateralEdge(m: IntrinsicMesh): number {
  const { topology: t, edgeLength: L } = m;
  let A = 0;
  for (let f = 0; f < t.nf; f++) A += triangleArea(L[t.edgeOf[3 * f]!]!, L[t.edgeOf[3 * f + 1]!]!, L[t.edgeOf[3 * f + 2]!]!);
  return Math.sqrt((4 * A) / (Math.sqrt(3) * Math.max(1, t.nf)));
}

/** Result of {@link refineLongEdges}. */
export interface RefineResult {
  /** The refined mesh (the input object itself when nothing was split). */
  mesh: IntrinsicMesh;
  /** Vertices inserted. */
  inserted: number;
  /** True when the vertex cap stopped the refinement before every edge was short enough. */
  capped: boolean;
  /**
   * Edges longer than `maxLength` left whole because bisecting them would not
   * halve a longest edge of faces with area: a face beside the edge has no
   * area (or holds both its sides), or a longer edge of that face was itself
   * left whole. 0 on a mollified mesh (every face has area).
   */
  unsplit: number;
}

/**
 * Splits every edge longer than `maxLength` (boundary edges too) by Rivara's
 * longest-edge bisection, longest first, until none is left or `maxInserted`
 * vertices were added (then `capped`: a documented stop, not an error; the
 * mesh is a valid refinement of the input either way). The input is not
 * modified.
 */
export function refineLongEdges(m: IntrinsicMesh, maxLength: number, maxInserted: number): RefineResult {
  if (!hasLongEdge(m, maxLength)) return { mesh: m, inserted: 0, capped: false, unsplit: 0 };
  if (!(maxInserted >= 1)) return { mesh: m, inserted: 0, capped: true, unsplit: 0 };
  const w = new Bisection(m);
  const { capped, unsplit } = bisectLongEdges(w, maxLength, maxInserted, null);
  if (w.inserted === 0) return { mesh: m, inserted: 0, capped, unsplit };
  return { mesh: w.result(), inserted: w.inserted, capped, unsplit };
}

/** True when some edge of `m` is longer than `maxLength`. */
export function hasLongEdge(m: IntrinsicMesh, maxLength: number): boolean {
  const L = m.edgeLength;
  for (let e = 0; e < L.length; e++) if (L[e]! > maxLength) return true;
  return false;
}

/**
 * {@link refineLongEdges}'s loop on a refinement in progress: bisects w's
 * edges longer than `maxLength`, longest first, until none is left or
 * w.inserted reaches `maxInserted`. With `touched`, the ids of the existing
 * faces each split changed are appended to it (the faces it adds are those
 * from the old w.nf on).
 */
export function bisectLongEdges(w: Bisection, maxLength: number, maxInserted: number, touched: number[] | null): { capped: boolean; unsplit: number } {
  const heap = new EdgeHeap();
  for (let e = 0; e < w.ne; e++) if (w.L[e]! > maxLength) heap.push(e, w.L[e]!);
  let capped = false, unsplit = 0;
  while (heap.size > 0) {
    const l = heap.topLength(), e = heap.pop();
    if (w.L[e] !== l) continue; // stale: the edge was split since it was queued
    if (w.inserted >= maxInserted) { capped = true; break; }
    const h = w.eh[e]!, o = w.twin[h]!;
    if (!splitLongest(w, e)) { unsplit++; continue; }
    if (touched !== null) {
      touched.push((h / 3) | 0);
      if (o >= 0) touched.push((o / 3) | 0);
    }
    // the split edge's two halves and the new edges towards c and d
    for (let k = w.ne - (w.twin[w.eh[e]!]! >= 0 ? 3 : 2); k < w.ne; k++) if (w.L[k]! > maxLength) heap.push(k, w.L[k]!);
    if (w.L[e]! > maxLength) heap.push(e, w.L[e]!);
  }
  return { capped, unsplit };
}

/**
 * Bisects every boundary edge whose one opposite corner is obtuse
 * (cot < −`tolerance`), up to `maxInserted` vertices. Such an edge is the
 * longest side of its face, so the split is the same terminal-edge bisection
 * as {@link refineLongEdges}'s. Why: a boundary edge's cotan weight is the
 * single ½·cot of that corner, negative when it is obtuse, and a negative
 * weight makes the heat matrix M + tL a non-M-matrix whose solution changes
 * sign far from the source. Splitting the edges a vertex encroaches on
 * (inside their diametral circle, i.e. opposite an obtuse angle) is the
 * segment rule of Delaunay refinement (J. Ruppert, "A Delaunay refinement
 * algorithm for quality 2-dimensional mesh generation", J. Algorithms 18(3),
 * 1995): the caller flips to Delaunay again and repeats until no boundary
 * edge is split.
 */
export function splitObtuseBoundary(m: IntrinsicMesh, maxInserted: number, tolerance = 1e-9): RefineResult {
  const { topology: t, edgeLength: L } = m;
  const obtuse: number[] = [];
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!;
    if (t.twin[h]! < 0 && cotOpposite(L[e]!, L[t.edgeOf[next(h)]!]!, L[t.edgeOf[prev(h)]!]!) < -tolerance) obtuse.push(e);
  }
  if (obtuse.length === 0) return { mesh: m, inserted: 0, capped: false, unsplit: 0 };
  const w = new Bisection(m);
  let capped = false, unsplit = 0;
  for (const e of obtuse) {
    if (w.inserted >= maxInserted) { capped = true; break; }
    if (!splitLongest(w, e)) unsplit++;
  }
  return { mesh: w.inserted > 0 ? w.result() : m, inserted: w.inserted, capped, unsplit };
}

/** Layout scratch: the third corner of a face laid out along the edge being split. */
const xy = new Float64Array(2);

/**
 * |m x| for the midpoint m of side h (length l) of its face and the face's
 * third corner x, from the face laid out along h (placeThirdCorner); −1 when
 * the face has no area, or when h is not a longest side of its face.
 */
function medianAcross(w: Bisection, h: number, l: number): number {
  const ln = w.L[w.edgeOf[next(h)]!]!, lp = w.L[w.edgeOf[prev(h)]!]!;
  if (ln > l || lp > l) return -1;
  const area = triangleArea(l, ln, lp);
  if (!(area > 0)) return -1;
  placeThirdCorner(l, ln, lp, area, xy, 0);
  return planarLength(xy[0]! - 0.5 * l, xy[1]!);
}

/**
 * Bisects edge e at its midpoint if it is a longest edge of each face beside
 * it and those faces have area (Rivara's terminal-edge condition); returns
 * false, changing nothing, otherwise. New edges: m–b, m–c and, inside, m–d
 * (ids ne, ne+1, ne+2); e keeps the half a–m.
 */
export function splitLongest(w: Bisection, e: number): boolean {
  const h = w.eh[e]!, o = w.twin[h]!, l = w.L[e]!;
  if (o >= 0 && ((h / 3) | 0) === ((o / 3) | 0)) return false;
  const mc = medianAcross(w, h, l);
  if (!(mc > 0)) return false;
  let md = 0;
  if (o >= 0) {
    md = medianAcross(w, o, l);
    if (!(md > 0)) return false;
  }
  w.reserve();
  const v = w.nv++;
  w.vo[v] = -1;
  const eMB = w.ne, eMC = w.ne + 1;
  w.ne += 2;
  w.L[e] = 0.5 * l; w.L[eMB] = 0.5 * l; w.L[eMC] = mc;
  // face (a, b, c) → (a, m, c) in place + G = (m, b, c); h stays a→m
  const hn = next(h), G = w.nf++, g = 3 * G;
  w.fo[G] = w.fo[(h / 3) | 0]!;
  w.move(hn, g + 1); // G: b→c, with its edge and twin (if b–c is glued to a–d, move(on) below re-pairs them)
  w.link(hn, v, eMC, g + 2); // (a, m, c): m→c ↔ G: c→m
  w.link(g + 2, w.tri[prev(h)]!, eMC, hn);
  w.link(g, v, eMB, -1); // G: m→b
  w.eh[eMC] = hn; w.eh[eMB] = g;
  w.vh[v] = g; // on the boundary, m→b is the boundary half-edge leaving m
  if (o >= 0) {
    // face (b, a, d) → (b, m, d) in place + G' = (m, a, d); o becomes b→m on edge m–b
    const on = next(o), eMD = w.ne++, G2 = w.nf++, g2 = 3 * G2;
    w.L[eMD] = md;
    w.fo[G2] = w.fo[(o / 3) | 0]!;
    w.move(on, g2 + 1); // G': a→d
    w.link(on, v, eMD, g2 + 2); // (b, m, d): m→d ↔ G': d→m
    w.link(g2 + 2, w.tri[prev(o)]!, eMD, on);
    w.link(g2, v, e, h); // G': m→a ↔ a→m
    w.link(o, w.tri[o]!, eMB, g); // b→m ↔ m→b
    w.eh[eMD] = on;
  }
  w.eh[e] = h;
  w.inserted++;
  return true;
}

/** The growing half-edge arrays of the refinement (typed, doubled when full). */
export class Bisection {
  nv: number; nf: number; ne: number;
  inserted = 0;
  tri: Uint32Array; twin: Int32Array; edgeOf: Int32Array; eh: Int32Array; vh: Int32Array;
  vo: Int32Array; fo: Int32Array; L: Float64Array;

  constructor(m: IntrinsicMesh) {
    const t = m.topology;
    this.nv = t.nv; this.nf = t.nf; this.ne = t.ne;
    // copies with room for about nv/8 splits (each adds a vertex, two faces, three edges): a
    // refinement that inserts a few percent of the vertices (boundary edges, a scan's long edges)
    // then never grows; doubling 1M-vertex arrays for 2% more allocated ~250 MB of fresh memory
    const room = Math.max(64, Math.ceil(t.nv / 8));
    const fCap = t.nf + 2 * room, eCap = t.ne + 3 * room, vCap = t.nv + room;
    this.tri = copyInto(t.tri, 3 * fCap); this.twin = copyInto(t.twin, 3 * fCap); this.edgeOf = copyInto(t.edgeOf, 3 * fCap);
    this.eh = copyInto(t.edgeHalfedge, eCap); this.vh = copyInto(t.vertexHalfedge, vCap);
    this.vo = copyInto(t.vertexOrigin, vCap); this.fo = copyInto(t.faceOrigin, fCap);
    this.L = copyInto(m.edgeLength, eCap);
  }

  /** Room for one more split: a vertex, two faces, three edges. */
  reserve(): void {
    if (this.vh.length < this.nv + 1) { this.vh = grow(this.vh, this.nv + 1); this.vo = grow(this.vo, this.nv + 1); }
    if (this.fo.length < this.nf + 2) {
      this.fo = grow(this.fo, this.nf + 2);
      this.tri = grow(this.tri, 3 * this.fo.length); this.twin = grow(this.twin, 3 * this.fo.length);
      this.edgeOf = grow(this.edgeOf, 3 * this.fo.length);
    }
    if (this.L.length < this.ne + 3) { this.L = grow(this.L, this.ne + 3); this.eh = grow(this.eh, this.L.length); }
  }

  /** Moves half-edge slot `from` to `to`, with its tail, edge and twin and the anchors that point at it. */
  move(from: number, to: number): void {
    const tw = this.twin[from]!, ed = this.edgeOf[from]!, v = this.tri[from]!;
    this.link(to, v, ed, tw);
    if (this.eh[ed] === from) this.eh[ed] = to;
    if (this.vh[v] === from) this.vh[v] = to;
  }

  /** Sets slot h: tail vertex, edge and twin (both ways when tw ≥ 0). */
  link(h: number, tail: number, e: number, tw: number): void {
    this.tri[h] = tail; this.edgeOf[h] = e; this.twin[h] = tw;
    if (tw >= 0) this.twin[tw] = h;
  }

  /** The refined intrinsic mesh, arrays cut to size. */
  result(): IntrinsicMesh {
    const { nv, nf, ne } = this;
    const topology: Topology = {
      nv, nf, ne,
      tri: this.tri.slice(0, 3 * nf), twin: this.twin.slice(0, 3 * nf), edgeOf: this.edgeOf.slice(0, 3 * nf),
      edgeHalfedge: this.eh.slice(0, ne), vertexHalfedge: this.vh.slice(0, nv),
      vertexOrigin: this.vo.slice(0, nv), faceOrigin: this.fo.slice(0, nf),
    };
    return { topology, edgeLength: this.L.slice(0, ne) };
  }
}

/** A copy of `a` with room for at least `n` entries (×1.5 each time, so n splits cost O(n) copying). */
function grow<T extends Uint32Array | Int32Array | Float64Array>(a: T, n: number): T {
  return copyInto(a, Math.max(n, Math.ceil(1.5 * a.length), 16));
}

/** A copy of `a` in a new array of `capacity` ≥ a.length entries (the rest zero). */
function copyInto<T extends Uint32Array | Int32Array | Float64Array>(a: T, capacity: number): T {
  const b = new (a.constructor as new (n: number) => T)(Math.max(capacity, a.length));
  b.set(a);
  return b;
}

/**
 * Max-heap of edges by length (ties: the smaller edge id first, so runs are
 * deterministic). Entries are not updated in place: a split edge is pushed
 * again with its new length and the old entry is skipped when popped.
 */
class EdgeHeap {
  private e: number[] = [];
  private l: number[] = [];

  get size(): number { return this.e.length; }

  /** Length of the top entry (as pushed). */
  topLength(): number { return this.l[0]!; }

  push(e: number, l: number): void {
    const E = this.e, Lh = this.l;
    let i = E.length;
    E.push(e); Lh.push(l);
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (!this.above(e, l, E[p]!, Lh[p]!)) break;
      E[i] = E[p]!; Lh[i] = Lh[p]!;
      i = p;
    }
    E[i] = e; Lh[i] = l;
  }

  /** Removes the top entry and returns its edge. */
  pop(): number {
    const E = this.e, Lh = this.l;
    const top = E[0]!;
    const e = E.pop()!, l = Lh.pop()!;
    const n = E.length;
    if (n === 0) return top;
    let i = 0;
    for (;;) {
      let c = 2 * i + 1;
      if (c >= n) break;
      if (c + 1 < n && this.above(E[c + 1]!, Lh[c + 1]!, E[c]!, Lh[c]!)) c++;
      if (!this.above(E[c]!, Lh[c]!, e, l)) break;
      E[i] = E[c]!; Lh[i] = Lh[c]!;
      i = c;
    }
    E[i] = e; Lh[i] = l;
    return top;
  }

  private above(e1: number, l1: number, e2: number, l2: number): boolean {
    return l1 > l2 || (l1 === l2 && e1 < e2);
  }
}
