/**
 * The combinatorial edge flip on half-edge arrays: which slots and vertices
 * make up the quad about an interior half-edge, and how the two faces are
 * rewired when its diagonal is replaced by the other one. The one home of
 * that bookkeeping for the intrinsic Delaunay flips (metric/delaunay.ts) and
 * the flippable triangulation of exact paths (geodesic/flip/triangulation.ts);
 * lengths, angles and directions stay with the callers.
 *
 * The edge flip itself is the elementary move of intrinsic triangulations
 * (Bobenko & Springborn, Discrete Comput. Geom. 38, 2007; Fisher et al.,
 * Computing 81, 2007). Layout (the sketch in metric/delaunay.ts): the quad
 * (a, b, c) + (b, a, d) with diagonal h = a→b becomes (d, c, a) + (c, d, b)
 * with h = d→c. Half-edge slots stay in place: h becomes d→c with
 * next(h) = c→a and prev(h) = a→d; its twin o becomes c→d with
 * next(o) = d→b and prev(o) = b→c. The four outer sides move to new slots
 * with their edge ids and twins (edge ids are stable).
 */
import { next, prev } from './topology.js';

/** The arrays a flip rewires (a Topology, topology.ts, has them, as does a flippable copy). */
export interface FlipArrays {
  /** Tail vertex of each half-edge slot. */
  readonly tri: Uint32Array;
  /** Opposite half-edge, −1 on the boundary. */
  readonly twin: Int32Array;
  /** Edge id of each half-edge slot. */
  readonly edgeOf: Int32Array;
  /** One half-edge slot per edge. */
  readonly edgeHalfedge: Int32Array;
}

/**
 * The quad about one interior half-edge h (names as in the module comment),
 * read by {@link FlipQuad.read}; one object per flipping loop, reused for
 * every flip (hot loops do not allocate).
 */
export class FlipQuad {
  /** The diagonal a→b. */
  h = -1;
  /** Its twin b→a. */
  o = -1;
  /** next(h) = b→c, prev(h) = c→a, next(o) = a→d, prev(o) = d→b. */
  hn = -1; hp = -1; on = -1; op = -1;
  /** The quad's corners: the diagonal's ends a, b and the opposite corners c (of h's face) and d (of o's face). */
  a = -1; b = -1; c = -1; d = -1;

  /**
   * Reads the quad about half-edge h of `t`. Returns false when the edge
   * cannot be flipped whatever its lengths: a boundary edge, the twin in the
   * same face, c = d (the new edge would be a loop), or an outer side glued
   * back onto the quad itself (possible after earlier flips).
   */
  read(t: FlipArrays, h: number): boolean {
    const { tri, twin } = t;
    const o = twin[h]!;
    if (o < 0) return false;
    const f0 = (h / 3) | 0, f1 = (o / 3) | 0;
    if (f0 === f1) return false;
    const hn = next(h), hp = prev(h), on = next(o), op = prev(o);
    const c = tri[hp]!, d = tri[op]!;
    if (c === d) return false;
    if (inQuad(twin[hn]!, f0, f1) || inQuad(twin[hp]!, f0, f1) || inQuad(twin[on]!, f0, f1) || inQuad(twin[op]!, f0, f1)) return false;
    this.h = h; this.o = o; this.hn = hn; this.hp = hp; this.on = on; this.op = op;
    this.a = tri[h]!; this.b = tri[hn]!; this.c = c; this.d = d;
    return true;
  }

  /**
   * Flips the quad last read: rewrites both faces' corners, moves the outer
   * sides (edge id, twin, the edge's half-edge) to their new slots and lets
   * a vertex anchor that pointed at a moving slot follow its directed edge
   * (`anchor` is a vertex → outgoing half-edge array, e.g. vertexHalfedge).
   * Per-slot data of the caller is the caller's to move (per-edge data such
   * as lengths stays put): afterwards slot hn holds the side that was in hp,
   * hp the one in on, on the one in op and op the one in hn.
   */
  rewire(t: FlipArrays, anchor: Int32Array): void {
    const { tri, twin, edgeOf, edgeHalfedge: eh } = t;
    const { h, o, hn, hp, on, op, a, b, c, d } = this;
    const eHn = edgeOf[hn]!, eHp = edgeOf[hp]!, eOn = edgeOf[on]!, eOp = edgeOf[op]!;
    const tHn = twin[hn]!, tHp = twin[hp]!, tOn = twin[on]!, tOp = twin[op]!;
    // vertex anchors that point at a moving slot follow their directed edge
    const fixA = anchor[a] === h || anchor[a] === on, fixB = anchor[b] === o || anchor[b] === hn;
    const fixC = anchor[c] === hp, fixD = anchor[d] === op;
    // face of h = (d, c, a): h = d→c, hn = c→a (old hp), hp = a→d (old on)
    tri[h] = d; tri[hn] = c; tri[hp] = a;
    // face of o = (c, d, b): o = c→d, on = d→b (old op), op = b→c (old hn)
    tri[o] = c; tri[on] = d; tri[op] = b;
    relink(edgeOf, twin, eh, hn, eHp, tHp);
    relink(edgeOf, twin, eh, hp, eOn, tOn);
    relink(edgeOf, twin, eh, on, eOp, tOp);
    relink(edgeOf, twin, eh, op, eHn, tHn);
    if (fixA) anchor[a] = hp;
    if (fixB) anchor[b] = op;
    if (fixC) anchor[c] = hn;
    if (fixD) anchor[d] = on;
  }
}

/** Puts side e (twin tw) into `slot` (a module function: making a closure on every flip took a third of the flipping time). */
function relink(edgeOf: Int32Array, twin: Int32Array, eh: Int32Array, slot: number, e: number, tw: number): void {
  edgeOf[slot] = e;
  twin[slot] = tw;
  if (tw >= 0) twin[tw] = slot;
  eh[e] = slot;
}

/** True when half-edge tw (≥ 0) belongs to face f0 or f1. */
function inQuad(tw: number, f0: number, f1: number): boolean {
  const g = (tw / 3) | 0;
  return tw >= 0 && (g === f0 || g === f1);
}
