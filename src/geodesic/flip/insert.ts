/**
 * Inserting a point of an edge or a face as a vertex of a flippable
 * triangulation, so that paths may start or end there (Sharp & Crane 2020,
 * §5.1: endpoints off the vertices are inserted first; vertex insertion in an
 * intrinsic triangulation as in Sharp, Soliman & Crane 2019, §3.4).
 *
 * Done before any flip, while the triangulation is still the input mesh, so
 * the point's face or edge is an input one and its distances to the corners
 * come from a planar layout of that face. A face point splits its face in
 * three; an edge point splits its edge in two and each face beside it in two.
 * The new vertex's reference direction (its first half-edge) is towards
 * corner 0 of the face for a face point, and along the edge's half-edge
 * `edgeHalfedge[edge]` (towards its tip) for an edge point; trace.ts starts
 * from there. Directions of the new half-edges at the old corners follow the
 * same rule as a flip: a neighbour's direction plus a corner angle.
 *
 * ```
 *   face point p in (c0, c1, c2)         edge point p on a→b (faces a b c, b a d)
 *        c2                                   c
 *       /|\        F  = (c0, c1, p)          /|\        F  = (a, p, c)   G  = (p, b, c)
 *      / p \       G1 = (c1, c2, p)         a-p-b       F' = (b, p, d)   G' = (p, a, d)
 *     /_/ \_\      G2 = (c2, c0, p)          \|/
 *   c0       c1                               d
 * ```
 */
import type { SurfacePoint } from '../../mesh/surface-point.js';
import { next, prev } from '../../mesh/topology.js';
import { angleOpposite } from '../../metric/triangle.js';
import { layoutAlong } from '../../metric/layout.js';
import type { FlipTriangulation } from './triangulation.js';

const lay = new Float64Array(2);

/**
 * Inserts the (canonical, validated) face or edge point p as a new vertex and returns
 * its id. The triangulation must have room for it (constructor `extra`) and no flips yet.
 */
export function insertPoint(tri: FlipTriangulation, p: SurfacePoint): number {
  if (p.kind === 'vertex') return p.vertex;
  if (tri.flips > 0) throw new Error('insertPoint: insert before flipping');
  const v = tri.nv++;
  tri.inserted.push(p);
  if (p.kind === 'face') insertInFace(tri, v, p.face, p.bary);
  else insertOnEdge(tri, v, p.edge, p.t);
  tri.prepare(v);
  return v;
}

/** Moves half-edge slot `from` to slot `to` (with its edge, twin, direction and the anchors that point at it). */
function move(tri: FlipTriangulation, from: number, to: number): void {
  const e = tri.edgeOf[from]!, tw = tri.twin[from]!;
  tri.tri[to] = tri.tri[from]!;
  tri.edgeOf[to] = e;
  tri.twin[to] = tw;
  if (tw >= 0) tri.twin[tw] = to;
  if (tri.edgeHalfedge[e] === from) tri.edgeHalfedge[e] = to;
  tri.dir[to] = tri.dir[from]!;
  const v = tri.tri[from]!;
  if (tri.anchor[v] === from) tri.anchor[v] = to;
}

/** Sets slot h: tail vertex, edge id and twin (both ways when tw ≥ 0). */
function link(tri: FlipTriangulation, h: number, tail: number, e: number, tw: number): void {
  tri.tri[h] = tail;
  tri.edgeOf[h] = e;
  tri.twin[h] = tw;
  if (tw >= 0) tri.twin[tw] = h;
}

function insertInFace(tri: FlipTriangulation, v: number, F: number, bary: [number, number, number]): void {
  const h0 = 3 * F, h1 = h0 + 1, h2 = h0 + 2;
  const c0 = tri.tri[h0]!, c1 = tri.tri[h1]!, c2 = tri.tri[h2]!;
  tri.prepare(c0); tri.prepare(c1); tri.prepare(c2);
  // corners in the layout along h0: c0 = (0, 0), c1 = (L0, 0), c2 = lay
  const L0 = layoutAlong(tri.input, h0, lay);
  const px = bary[1] * L0 + bary[2] * lay[0]!, py = bary[2] * lay[1]!;
  const l0 = Math.hypot(px, py), l1 = Math.hypot(px - L0, py), l2 = Math.hypot(px - lay[0]!, py - lay[1]!);
  const len0 = tri.len(h0), len1 = tri.len(h1), len2 = tri.len(h2);
  const d0 = tri.wrap(c0, tri.dir[h0]! + angleOpposite(l1, len0, l0)); // c0→p, turned from c0→c1
  const d1 = tri.wrap(c1, tri.dir[h1]! + angleOpposite(l2, len1, l1)); // c1→p, turned from c1→c2
  const d2 = tri.wrap(c2, tri.dir[h2]! + angleOpposite(l0, len2, l2)); // c2→p, turned from c2→c0
  const G1 = tri.nf++, G2 = tri.nf++;
  const e0 = tri.ne++, e1 = tri.ne++, e2 = tri.ne++;
  tri.length[e0] = l0; tri.length[e1] = l1; tri.length[e2] = l2;
  move(tri, h1, 3 * G1);
  move(tri, h2, 3 * G2);
  link(tri, h1, c1, e1, -1); // F: c1→p
  link(tri, h2, v, e0, -1); // F: p→c0
  link(tri, 3 * G1 + 1, c2, e2, -1); // G1: c2→p
  link(tri, 3 * G1 + 2, v, e1, h1); // G1: p→c1
  link(tri, 3 * G2 + 1, c0, e0, h2); // G2: c0→p
  link(tri, 3 * G2 + 2, v, e2, 3 * G1 + 1); // G2: p→c2
  tri.edgeHalfedge[e0] = h2; tri.edgeHalfedge[e1] = 3 * G1 + 2; tri.edgeHalfedge[e2] = 3 * G2 + 2;
  tri.dir[h1] = d1; tri.dir[3 * G1 + 1] = d2; tri.dir[3 * G2 + 1] = d0;
  tri.anchor[v] = h2; // towards corner 0
}

function insertOnEdge(tri: FlipTriangulation, v: number, E: number, t: number): void {
  const h = tri.edgeHalfedge[E]!, o = tri.twin[h]!;
  const hn = next(h), hp = prev(h);
  const a = tri.tri[h]!, b = tri.tri[hn]!, c = tri.tri[hp]!;
  const L = tri.len(h), la = t * L, lb = (1 - t) * L;
  // every corner is set up before anything changes (their fans are read from the current faces)
  tri.prepare(a); tri.prepare(b); tri.prepare(c);
  if (o >= 0) tri.prepare(tri.tri[prev(o)]!);
  layoutAlong(tri.input, h, lay); // a = (0, 0), b = (L, 0), c = lay
  const lc = Math.hypot(lay[0]! - la, lay[1]!);
  const dc = tri.wrap(c, tri.dir[hp]! + angleOpposite(la, tri.len(hp), lc)); // c→p, turned from c→a
  const G = tri.nf++;
  const E2 = tri.ne++, Ec = tri.ne++;
  tri.length[E] = la; tri.length[E2] = lb; tri.length[Ec] = lc;
  move(tri, hn, 3 * G + 1); // G: b→c
  link(tri, hn, v, Ec, -1); // F: p→c (h stays a→p)
  link(tri, 3 * G, v, E2, -1); // G: p→b
  link(tri, 3 * G + 2, c, Ec, hn); // G: c→p
  tri.edgeHalfedge[E] = h; tri.edgeHalfedge[E2] = 3 * G; tri.edgeHalfedge[Ec] = hn;
  tri.dir[3 * G + 2] = dc;
  if (o >= 0) {
    const on = next(o), op = prev(o), d = tri.tri[op]!;
    layoutAlong(tri.input, o, lay); // b = (0, 0), a = (L, 0), d = lay
    const ld = Math.hypot(lay[0]! - lb, lay[1]!);
    const dd = tri.wrap(d, tri.dir[op]! + angleOpposite(lb, tri.len(op), ld)); // d→p, turned from d→b
    const G2 = tri.nf++, Ed = tri.ne++;
    tri.length[Ed] = ld;
    move(tri, on, 3 * G2 + 1); // G': a→d
    // F' = (b, p, d): o = b→p on edge E2, on = p→d; G' = (p, a, d): p→a on edge E
    tri.edgeOf[o] = E2;
    tri.twin[o] = 3 * G; tri.twin[3 * G] = o;
    link(tri, on, v, Ed, -1);
    link(tri, 3 * G2, v, E, h); // p→a, twin of a→p
    link(tri, 3 * G2 + 2, d, Ed, on); // d→p
    tri.edgeHalfedge[Ed] = on;
    tri.dir[3 * G2 + 2] = dd;
  }
  tri.anchor[v] = 3 * G; // towards b, along the edge's half-edge
}
