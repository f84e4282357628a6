/**
 * An intrinsic triangulation that can flip edges and still says where each
 * of its edges runs on the input surface.
 *
 * Follows the signpost idea of Sharp, Soliman & Crane, "Navigating Intrinsic
 * Triangulations", ACM TOG 38(4), 2019, reduced to what paths need: the
 * vertex set never changes (every intrinsic vertex is an input vertex), and
 * each intrinsic half-edge stores its length (per edge) and its direction at
 * its tail as an angle `dir[h]`, measured counter-clockwise on the input
 * surface from the input's reference half-edge `vertexHalfedge[v]` of the
 * tail. Those two numbers are enough to trace the edge across the input faces
 * (trace.ts); no coordinates are stored here. Angles are true angles (not
 * rescaled to 2π): flips do not change cone angles, and a vertex's total
 * angle Θ(v) is the sum of its input corner angles. Interior vertices take
 * angles modulo Θ(v); boundary vertices never wrap (a wedge never crosses the
 * boundary gap), so their angles stay in [0, Θ(v)].
 *
 * Directions are set lazily: a vertex gets them (from its input fan, rotating
 * `twin[prev(h)]` counter-clockwise) the first time it is touched, and every
 * flip touches its four quad vertices first, so an untouched vertex's fan is
 * still the input fan. Work and memory outside the arrays copied up front
 * stay proportional to the region the path sweeps.
 *
 * Flip layout, the same as the sketch in src/metric/delaunay.ts: the quad
 * (a, b, c) + (b, a, d) with diagonal h = a→b becomes (d, c, a) + (c, d, b)
 * with h = d→c; outer half-edges move to new slots with their edge ids (edge
 * ids are stable, so a path stored as edge ids survives flips elsewhere). The
 * new directions follow Sharp et al. 2019 §3.2: the direction of d→c is that
 * of d→b plus the new corner at d, and c→d that of c→a plus the corner at c.
 */
import type { IntrinsicMesh } from '../../metric/intrinsic.js';
import type { Topology } from '../../mesh/topology.js';
import { next, prev } from '../../mesh/topology.js';
import { FlipQuad } from '../../mesh/edge-flip.js';
import { angleOpposite, triangleArea, unfoldedDiagonal } from '../../metric/triangle.js';
import type { SurfacePoint } from '../../mesh/surface-point.js';

/** An input mesh under flips, with a direction per half-edge (see the module comment). */
export class FlipTriangulation {
  /** Corner vertices per face slot (tail of each half-edge). */
  readonly tri: Uint32Array;
  /** Opposite half-edge, −1 on the boundary. */
  readonly twin: Int32Array;
  /** Stable edge id per half-edge slot. */
  readonly edgeOf: Int32Array;
  /** One half-edge slot per edge. */
  readonly edgeHalfedge: Int32Array;
  /** Length per edge id. */
  readonly length: Float64Array;
  /** Direction of each half-edge at its tail, radians from the tail's input reference (valid once the tail is set up). */
  readonly dir: Float64Array;
  /** Total angle per vertex (valid once the vertex is set up). */
  readonly theta: Float64Array;
  /** 1 on boundary vertices (valid once set up). */
  readonly onBoundary: Uint8Array;
  /** One half-edge leaving each vertex (the boundary one on the boundary); a vertex's reference direction until it is set up. */
  readonly anchor: Int32Array;
  /** Scratch for the unfolded quad of a flip (xc, yc, xd, yd). */
  private readonly unfold = new Float64Array(4);
  /** Scratch for the quad of a flip (its slots and corners). */
  private readonly quad = new FlipQuad();
  /** Number of flips made. */
  flips = 0;
  /** Current numbers of vertices, faces and edges (input ones first; insert.ts adds more). */
  nv: number;
  nf: number;
  ne: number;
  /** The surface point of each inserted vertex (vertex id nv₀ + i, nv₀ the input's count). */
  readonly inserted: SurfacePoint[] = [];
  private readonly ready: Uint8Array;

  /**
   * Copies the connectivity and lengths of `input` (the input is never modified), with room
   * for `extra` inserted points (insert.ts: each adds a vertex, up to 2 faces and 3 edges).
   */
  constructor(readonly input: IntrinsicMesh, extra = 0) {
    const t = input.topology;
    const grow = <T extends Uint32Array | Int32Array | Float64Array | Uint8Array>(a: T, n: number, make: (n: number) => T): T => {
      const b = make(a.length + n);
      b.set(a as never);
      return b;
    };
    this.nv = t.nv; this.nf = t.nf; this.ne = t.ne;
    this.tri = grow(t.tri, 6 * extra, (n) => new Uint32Array(n));
    this.twin = grow(t.twin, 6 * extra, (n) => new Int32Array(n));
    this.edgeOf = grow(t.edgeOf, 6 * extra, (n) => new Int32Array(n));
    this.edgeHalfedge = grow(t.edgeHalfedge, 3 * extra, (n) => new Int32Array(n));
    this.anchor = grow(t.vertexHalfedge, extra, (n) => new Int32Array(n));
    this.length = grow(input.edgeLength, 3 * extra, (n) => new Float64Array(n));
    this.dir = new Float64Array(t.tri.length + 6 * extra);
    this.theta = new Float64Array(t.nv + extra);
    this.onBoundary = new Uint8Array(t.nv + extra);
    this.ready = new Uint8Array(t.nv + extra);
  }

  /** The current triangulation as an intrinsic mesh (a view: it changes with the flips). */
  view(): IntrinsicMesh {
    const t = this.input.topology;
    const topology: Topology = {
      nv: this.nv, nf: this.nf, ne: this.ne, tri: this.tri, twin: this.twin, edgeOf: this.edgeOf,
      edgeHalfedge: this.edgeHalfedge, vertexHalfedge: this.anchor, vertexOrigin: t.vertexOrigin, faceOrigin: t.faceOrigin,
    };
    return { topology, edgeLength: this.length };
  }

  /** The surface point of vertex v on the input surface. */
  pointOf(v: number): SurfacePoint {
    return v < this.input.topology.nv ? { kind: 'vertex', vertex: v } : this.inserted[v - this.input.topology.nv]!;
  }

  /** Wraps an angle at v into [0, Θ(v)) (interior vertices; boundary ones never wrap). */
  wrap(v: number, x: number): number {
    if (this.onBoundary[v]) return x;
    const T = this.theta[v]!;
    return x >= T ? x - T : x;
  }

  /** The input topology (directions are measured in its fans). */
  get topology(): Topology {
    return this.input.topology;
  }

  /** Length of the edge of half-edge h. */
  len(h: number): number {
    return this.length[this.edgeOf[h]!]!;
  }

  /** Interior angle at the tail of half-edge h in its current face. */
  corner(h: number): number {
    return angleOpposite(this.len(next(h)), this.len(h), this.len(prev(h)));
  }

  /** The half-edge of edge e that leaves vertex v (−1 if v is not an end of e). */
  leaving(e: number, v: number): number {
    const h = this.edgeHalfedge[e]!;
    if (this.tri[h] === v) return h;
    const o = this.twin[h]!;
    return o >= 0 && this.tri[o] === v ? o : -1;
  }

  /** Sets up the directions around v from its (untouched) input fan; idempotent. */
  prepare(v: number): void {
    if (this.ready[v]) return;
    this.ready[v] = 1;
    const start = this.anchor[v]!;
    if (start < 0) return;
    const { twin, dir } = this;
    let h = start, a = 0, n = 0;
    for (;;) {
      dir[h] = a;
      a += this.corner(h);
      const o = twin[prev(h)]!;
      if (o < 0) { this.onBoundary[v] = 1; break; }
      if (o === start || ++n > this.tri.length) break;
      h = o;
    }
    this.theta[v] = a;
  }

  /**
   * Direction of edge e at its end v (v set up): that of its half-edge
   * leaving v, or Θ(v) for a boundary edge that only enters v (the last
   * direction of a boundary vertex's fan).
   */
  direction(e: number, v: number): number {
    const h = this.leaving(e, v);
    return h >= 0 ? this.dir[h]! : this.theta[v]!;
  }

  /**
   * Counter-clockwise angle at v from direction `from` to direction `to`
   * (v set up); Infinity when that sweep crosses the boundary gap of a
   * boundary vertex.
   */
  sweep(v: number, from: number, to: number): number {
    const d = to - from;
    if (this.onBoundary[v]) return d >= 0 ? d : Infinity;
    return d >= 0 ? d : d + this.theta[v]!;
  }

  /**
   * Flips the edge of interior half-edge h in place. Returns false, changing
   * nothing, when the flip is not possible: a boundary edge, the twin in the
   * same face, a loop edge would result, an outer side is glued onto the
   * quad, or the quad is not strictly convex (the new edge would leave it,
   * or a new face would have no area).
   */
  flip(h: number): boolean {
    const { edgeOf, dir, length: L, quad: q } = this;
    if (!q.read(this, h)) return false;
    const { o, hn, hp, on, op, a, b, c, d } = q;
    const lab = L[edgeOf[h]!]!, lbc = L[edgeOf[hn]!]!, lca = L[edgeOf[hp]!]!;
    const lad = L[edgeOf[on]!]!, ldb = L[edgeOf[op]!]!;
    const u = this.unfold;
    const lcd = unfoldedDiagonal(lab, lbc, lca, lad, ldb, u);
    if (!(lcd > 0)) return false;
    const xc = u[0]!, yc = u[1]!, xd = u[2]!, yd = u[3]!;
    // the quad must be strictly convex: c–d crosses a–b strictly between a and b (a margin of
    // 1e-12 relative refuses a or b on c–d up to rounding, e.g. a boundary vertex of angle π)
    const xCross = xc + ((xd - xc) * yc) / (yc + yd);
    if (!(xCross > 1e-12 * lab && xCross < (1 - 1e-12) * lab)) return false;
    const A2 = triangleArea(lcd, lca, lad), A3 = triangleArea(lcd, ldb, lbc);
    if (!(A2 > 1e-12 * lcd * lcd && A3 > 1e-12 * lcd * lcd)) return false;
    this.prepare(a); this.prepare(b); this.prepare(c); this.prepare(d);
    const dHn = dir[hn]!, dHp = dir[hp]!, dOn = dir[on]!, dOp = dir[op]!;
    q.rewire(this, this.anchor);
    // the outer sides' directions move with them (FlipQuad.rewire's slot moves)
    dir[hn] = dHp; // c→a
    dir[hp] = dOn; // a→d
    dir[on] = dOp; // d→b
    dir[op] = dHn; // b→c
    L[edgeOf[h]!] = lcd;
    // d→c: from d→b, turn by the corner at d of (c, d, b), opposite side bc
    dir[h] = this.wrap(d, dOp + angleOpposite(lbc, lcd, ldb));
    // c→d: from c→a, turn by the corner at c of (d, c, a), opposite side ad
    dir[o] = this.wrap(c, dHp + angleOpposite(lad, lcd, lca));
    this.flips++;
    return true;
  }

}

