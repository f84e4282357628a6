/**
 * The Steiner graph of a terrain for walking times: the discretisation of
 * weighted shortest paths on polyhedral surfaces by points on the edges,
 * after M. Lanthier, A. Maheshwari & J.-R. Sack, "Approximating shortest
 * paths on weighted polyhedral surfaces", Algorithmica 30(4), 2001 (the
 * fixed scheme: k evenly spaced points per edge) and L. Aleksandrov,
 * A. Maheshwari & J.-R. Sack, "Determining approximate shortest paths on
 * weighted polyhedral surfaces", J. ACM 52(1), 2005 (points spaced
 * geometrically towards the vertices, where paths bend round them).
 *
 * Nodes: the mesh vertices `0 … nv−1`, then k Steiner points per edge,
 * node `nv + e·k + j` at parameter `params[j]` along edge e, measured from
 * the tail of `edgeHalfedge[e]` (as in an edge surface point).
 *
 * Arcs (directed, built on the fly when a node is settled, never stored):
 * - along an edge, between consecutive nodes (the end vertices included),
 *   with the smaller multiplier of the edge's passable faces;
 * - across each face, from a node to every node on the face's other edges
 *   (a vertex: the Steiner points of its opposite edge; a Steiner point:
 *   those of the two other edges and the opposite corner), with the face's
 *   multiplier; a face of multiplier 0 has no arc across it.
 * An arc is a straight segment on the surface, so its time is exact for
 * that segment (one slope, one face): every time the graph finds is the
 * time of a real route on the mesh, an upper bound on the model's optimum.
 *
 * Vertex coordinates are kept as horizontal (a, b) and height, in metres:
 * the up axis and the scale of mesh units are applied once here. A Steiner
 * point's are not stored: they are (1 − s)·tail + s·head of its edge's
 * vertex coordinates, computed where needed ({@link SteinerGraph.nodeFrame},
 * and the search's inner loop with the same expression, so the same bits).
 * Stored, they were 24 bytes per node read at random places by the search.
 */
import type { Topology } from '../mesh/topology.js';
import { next, prev, faceOf, nextOutgoing } from '../mesh/topology.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { usageError } from '../errors.js';

/** How Steiner points are spread along an edge. */
export type SteinerSpacing = 'uniform' | 'geometric';

/** Options of {@link SteinerGraph}. */
export interface SteinerOptions {
  /** Steiner points per edge (default 3). */
  k?: number;
  /** `uniform` (default; Lanthier et al. 2001) or `geometric` (halving towards each end; Aleksandrov et al. 2005). */
  spacing?: SteinerSpacing;
  /** Metres per mesh unit, horizontal and vertical (default 1). */
  metersPerUnit?: number;
  /** The up direction, unit length (default +z). */
  up?: [number, number, number];
  /** Per-face time multipliers (0 = impassable), one per topology face; absent = all 1. */
  faceMultipliers?: Float64Array | null;
}

/** Most Steiner points per edge accepted. */
export const MAX_STEINER_K = 64;

/**
 * Parameters of k Steiner points on [0, 1]: uniform j/(k+1), or geometric:
 * distances from the nearer end doubling towards the middle (d, 2d, 4d, …),
 * with the middle point 1/2 for odd k (1/8, 1/4, 1/2, 3/4, 7/8 for k = 5) and
 * for even k a middle gap equal to the largest distance (1/6, 1/3, 2/3, 5/6
 * for k = 4).
 */
export function steinerParams(k: number, spacing: SteinerSpacing): Float64Array {
  const t = new Float64Array(k);
  if (spacing === 'uniform') {
    for (let j = 0; j < k; j++) t[j] = (j + 1) / (k + 1);
    return t;
  }
  const m = k >> 1, out: number[] = [];
  const far = k % 2 === 1 ? 0.25 : 1 / 3; // the largest distance from an end
  for (let i = 0; i < m; i++) {
    const d = far * 2 ** -(m - 1 - i);
    out.push(d, 1 - d);
  }
  if (k % 2 === 1) out.push(0.5);
  return Float64Array.from(out.sort((a, b) => a - b));
}

/** The Steiner graph of a surface (see the module comment). */
export class SteinerGraph {
  /** Mesh vertices (the first nodes). */
  readonly nv: number;
  /** Steiner points per edge. */
  readonly k: number;
  /** Total nodes: nv + ne·k. */
  readonly nodeCount: number;
  /** Parameters of the Steiner points along an edge (ascending). */
  readonly params: Float64Array;
  /**
   * Per mesh vertex, interleaved: horizontal coordinates a, b and the height,
   * metres: `vertexFrame[3v], vertexFrame[3v+1], vertexFrame[3v+2]`.
   */
  readonly vertexFrame: Float64Array;
  /**
   * Per edge e, 8 entries from `8e` (32 bytes: the search reads one record
   * where the topology takes five arrays): the tail and head of
   * `edgeHalfedge[e]`; for its face, the opposite corner, the edge after
   * and the edge before it; the same for the twin's face (−1 when none).
   */
  readonly edgeRecord: Int32Array;
  /** Multiplier per face (null: all 1). */
  readonly faceMult: Float64Array | null;
  /** Multiplier of arcs along each edge: the smallest positive multiplier of its faces, 0 when none (null: all 1). */
  readonly edgeMult: Float64Array | null;
  /** Largest number of arcs out of one node (the size of the scratch buffers). */
  readonly maxDegree: number;
  /** The smallest positive multiplier (1 without multipliers; Infinity when every face is impassable). */
  readonly minMultiplier: number;

  /** @param t - the topology; @param positions - x, y, z per topology vertex (mesh units) */
  constructor(readonly t: Topology, readonly positions: Float64Array, opts: SteinerOptions = {}) {
    const k = opts.k ?? 3;
    if (!(Number.isInteger(k) && k >= 0 && k <= MAX_STEINER_K)) throw usageError(`Steiner points per edge must be an integer in [0, ${MAX_STEINER_K}], got ${k}`);
    const scale = opts.metersPerUnit ?? 1;
    if (!(scale > 0 && Number.isFinite(scale))) throw usageError(`metres per mesh unit must be a positive number, got ${scale}`);
    this.nv = t.nv;
    this.k = k;
    this.params = steinerParams(k, opts.spacing ?? 'uniform');
    this.nodeCount = t.nv + t.ne * k;
    const up = opts.up ?? [0, 0, 1];
    // an orthonormal frame (a, b, up): a ⟂ up from the axis least aligned with up
    const ax = Math.abs(up[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
    const d = ax[0]! * up[0] + ax[1]! * up[1] + ax[2]! * up[2];
    const a = [ax[0]! - d * up[0], ax[1]! - d * up[1], ax[2]! - d * up[2]];
    const na = Math.hypot(a[0]!, a[1]!, a[2]!);
    a[0]! /= na; a[1]! /= na; a[2]! /= na;
    const b = [up[1] * a[2]! - up[2] * a[1]!, up[2] * a[0]! - up[0] * a[2]!, up[0] * a[1]! - up[1] * a[0]!];
    const F = (this.vertexFrame = new Float64Array(3 * t.nv));
    const P = positions;
    for (let v = 0; v < t.nv; v++) {
      const x = P[3 * v]!, y = P[3 * v + 1]!, z = P[3 * v + 2]!;
      F[3 * v] = scale * (x * a[0]! + y * a[1]! + z * a[2]!);
      F[3 * v + 1] = scale * (x * b[0]! + y * b[1]! + z * b[2]!);
      F[3 * v + 2] = scale * (x * up[0] + y * up[1] + z * up[2]);
    }
    const rec = (this.edgeRecord = new Int32Array(8 * t.ne));
    for (let e = 0; e < t.ne; e++) {
      const h = t.edgeHalfedge[e]!, o = t.twin[h]!;
      rec[8 * e] = t.tri[h]!;
      rec[8 * e + 1] = t.tri[next(h)]!;
      rec[8 * e + 2] = t.tri[prev(h)]!;
      rec[8 * e + 3] = t.edgeOf[next(h)]!;
      rec[8 * e + 4] = t.edgeOf[prev(h)]!;
      rec[8 * e + 5] = o >= 0 ? t.tri[prev(o)]! : -1;
      rec[8 * e + 6] = o >= 0 ? t.edgeOf[next(o)]! : -1;
      rec[8 * e + 7] = o >= 0 ? t.edgeOf[prev(o)]! : -1;
    }
    const fm = opts.faceMultipliers ?? null;
    this.faceMult = fm;
    let minMult = fm ? Infinity : 1;
    if (fm) for (let f = 0; f < fm.length; f++) if (fm[f]! > 0 && fm[f]! < minMult) minMult = fm[f]!;
    this.minMultiplier = minMult;
    if (fm) {
      const em = new Float64Array(t.ne);
      for (let e = 0; e < t.ne; e++) {
        const h = t.edgeHalfedge[e]!, o = t.twin[h]!;
        const m1 = fm[faceOf(h)]!, m2 = o >= 0 ? fm[faceOf(o)]! : 0;
        em[e] = m1 > 0 && m2 > 0 ? Math.min(m1, m2) : Math.max(m1, m2, 0);
      }
      this.edgeMult = em;
    } else this.edgeMult = null;
    let maxValence = 0;
    for (let v = 0; v < t.nv; v++) {
      const start = t.vertexHalfedge[v]!;
      let c = 0;
      for (let h = start; h >= 0 && c <= t.tri.length; h = nextOutgoing(t, start, h)) c++;
      if (c > maxValence) maxValence = c;
    }
    this.maxDegree = Math.max((maxValence + 1) * (k + 1), 2 + 2 * (2 * k + 1));
  }

  /**
   * The arcs out of node `u`: heads into `to`, multipliers into `mult`
   * (buffers of at least {@link maxDegree}); returns their number. Arcs of
   * multiplier 0 are left out. Allocates nothing.
   */
  arcs(u: number, to: Int32Array, mult: Float64Array): number {
    const t = this.t, k = this.k, nv = this.nv, fm = this.faceMult, em = this.edgeMult;
    const { tri, twin, edgeOf, edgeHalfedge } = t;
    let n = 0;
    if (u >= nv) {
      const e = ((u - nv) / k) | 0, j = u - nv - e * k;
      const h0 = edgeHalfedge[e]!;
      const me = em ? em[e]! : 1;
      if (me > 0) {
        to[n] = j > 0 ? u - 1 : tri[h0]!; mult[n++] = me;
        to[n] = j < k - 1 ? u + 1 : tri[next(h0)]!; mult[n++] = me;
      }
      for (let side = 0; side < 2; side++) {
        const h = side === 0 ? h0 : twin[h0]!;
        if (h < 0) continue;
        const m = fm ? fm[faceOf(h)]! : 1;
        if (!(m > 0)) continue;
        to[n] = tri[prev(h)]!; mult[n++] = m;
        const b1 = nv + edgeOf[next(h)]! * k, b2 = nv + edgeOf[prev(h)]! * k;
        for (let i = 0; i < k; i++) { to[n] = b1 + i; mult[n++] = m; }
        for (let i = 0; i < k; i++) { to[n] = b2 + i; mult[n++] = m; }
      }
      return n;
    }
    const start = t.vertexHalfedge[u]!;
    if (start < 0) return 0;
    let last = start;
    for (let h = start; h >= 0; h = nextOutgoing(t, start, h)) {
      last = h;
      n = this.alongFrom(u, edgeOf[h]!, to, mult, n);
      const m = fm ? fm[faceOf(h)]! : 1;
      if (!(m > 0)) continue;
      // across the face: the Steiner points of the opposite edge (its corners are reached along the edges)
      const b = nv + edgeOf[next(h)]! * k;
      for (let i = 0; i < k; i++) { to[n] = b + i; mult[n++] = m; }
    }
    const hp = prev(last);
    if (twin[hp]! < 0) n = this.alongFrom(u, edgeOf[hp]!, to, mult, n); // the incoming boundary edge
    return n;
  }

  /** Appends the arc from vertex `v` to its neighbour node along edge `e`. */
  private alongFrom(v: number, e: number, to: Int32Array, mult: Float64Array, n: number): number {
    const me = this.edgeMult ? this.edgeMult[e]! : 1;
    if (!(me > 0)) return n;
    const h = this.t.edgeHalfedge[e]!, k = this.k;
    const atTail = this.t.tri[h]! === v;
    to[n] = k === 0 ? this.t.tri[atTail ? next(h) : h]! : this.nv + e * k + (atTail ? 0 : k - 1);
    mult[n] = me;
    return n + 1;
  }

  /**
   * Horizontal coordinates and height of node `u` (metres) into `out` at
   * `o`: a vertex's stored ones, a Steiner point's (1 − s)·tail + s·head.
   */
  nodeFrame(u: number, out: Float64Array | number[] = [0, 0, 0], o = 0): Float64Array | number[] {
    const F = this.vertexFrame;
    if (u < this.nv) {
      out[o] = F[3 * u]!; out[o + 1] = F[3 * u + 1]!; out[o + 2] = F[3 * u + 2]!;
      return out;
    }
    const e = ((u - this.nv) / this.k) | 0, s = this.params[u - this.nv - e * this.k]!, r = 1 - s;
    const h = this.t.edgeHalfedge[e]!, a = 3 * this.t.tri[h]!, b = 3 * this.t.tri[next(h)]!;
    for (let i = 0; i < 3; i++) out[o + i] = r * F[a + i]! + s * F[b + i]!;
    return out;
  }

  /** Node `u` as a surface point (a vertex, or an edge point). */
  surfacePoint(u: number): SurfacePoint {
    if (u < this.nv) return { kind: 'vertex', vertex: u };
    const e = ((u - this.nv) / this.k) | 0;
    return { kind: 'edge', edge: e, t: this.params[u - this.nv - e * this.k]! };
  }

  /** Mesh-unit position of node `u` into `out` at `o`. */
  position(u: number, out: Float64Array | number[], o = 0): void {
    const P = this.positions;
    if (u < this.nv) {
      out[o] = P[3 * u]!; out[o + 1] = P[3 * u + 1]!; out[o + 2] = P[3 * u + 2]!;
      return;
    }
    const e = ((u - this.nv) / this.k) | 0, s = this.params[u - this.nv - e * this.k]!;
    const h = this.t.edgeHalfedge[e]!, a = 3 * this.t.tri[h]!, b = 3 * this.t.tri[next(h)]!;
    for (let i = 0; i < 3; i++) out[o + i] = (1 - s) * P[a + i]! + s * P[b + i]!;
  }

  /** The nodes on the closed face `f`: its corners, then the Steiner points of its edges. */
  faceNodes(f: number): number[] {
    const t = this.t, k = this.k, out = [t.tri[3 * f]!, t.tri[3 * f + 1]!, t.tri[3 * f + 2]!];
    for (let c = 0; c < 3; c++) {
      const b = this.nv + t.edgeOf[3 * f + c]! * k;
      for (let i = 0; i < k; i++) out.push(b + i);
    }
    return out;
  }
}
