/**
 * Windows that wind around a sharp vertex are dropped.
 *
 * Why this is needed. Around an interior vertex V whose total angle Θ is
 * small (the tip of a tall spike: six needle faces with apex angles of
 * 2·10⁻⁵ rad give Θ ≈ 10⁻⁴), a beam of rays that passes close to V winds
 * round it again and again: unfolded, a straight line sweeps up to π around
 * V, that is up to π/Θ turns (≈ 24,000 here), and every face it crosses
 * makes a new window. The trimming of Surazhsky et al. (ACM TOG 24(3),
 * 2005; trim.ts) cannot remove the extra turns, because near V a path that
 * winds once more is longer by only about r·Θ (r: distance from V, here
 * 10⁻⁵), far inside the relative slack that keeps near-ties; the vertex
 * filter of Xin & Wang (ACM TOG 28(4), 2009) cannot either, because going
 * round a convex vertex is shorter than going through it. The run then made
 * one window per event at a standing queue key, each trimmed against all the
 * earlier ones on its edge: quadratic, practically endless.
 *
 * The rule. A path that crosses an edge E = (V, X) at P, then crosses only
 * edges incident to V (so it stays in V's star and goes once round V), and
 * crosses E again at Q, is not a shortest path. Unfold the faces it crosses
 * about V: they form a flat sector, the two copies of E are rays from V at
 * angle Θ apart, and the straight piece from P′ to Q′ has length
 *
 *   |P′Q′|² = |VP|² + |VQ|² − 2·|VP|·|VQ|·cos Θ  >  (|VP| − |VQ|)²
 *
 * for 0 < Θ < 2π, while the segment of E from P to Q has length
 * ||VP| − |VQ||. So every path through such a window is beaten by a real
 * path (along E), no shortest path uses it, and dropping it is exact: the
 * same argument that lets Mitchell, Mount & Papadimitriou (SIAM J. Comput.
 * 16(4), 1987) note that a shortest path crosses an edge at most once, here
 * proved within one vertex star, so it holds for any intrinsic metric, not
 * only for surfaces embedded in space.
 *
 * Where to look. A straight line not through V sweeps less than π around
 * V, so only interior vertices with Θ < π can be wound round; the check
 * runs only at vertices with Θ below {@link WIND_ANGLE} (more than π, so
 * that angles rounded in needle faces cannot hide one). It is topological:
 * it walks a new window's parent links back while they lie on edges
 * incident to V, and reports a window already on the new window's half-edge
 * (a full turn ends on the same half-edge). The walk is at most one turn
 * long. A merged window (propagate.ts) carries pieces of different
 * histories and points at itself as its parent, which ends the walk: the
 * rule then keeps the window (keeping is always safe).
 */
import type { Topology } from '../../mesh/topology.js';
import { next } from '../../mesh/topology.js';
import type { WindowStore } from './windows.js';

/** Vertices with total angle below this (radians) are checked (see the module comment: any value ≥ π is exact). */
export const WIND_ANGLE = 1.5 * Math.PI;

/** Writes out[v] = 1 for interior vertices of total angle below {@link WIND_ANGLE}; returns how many. */
export function sharpFlags(t: Topology, ang: Float64Array, out: Uint8Array): number {
  const sum = new Float64Array(t.nv);
  const boundary = new Uint8Array(t.nv);
  for (let h = 0; h < ang.length; h++) {
    sum[t.tri[h]!]! += ang[h]!;
    if (t.twin[h] === -1) { boundary[t.tri[h]!] = 1; boundary[t.tri[next(h)]!] = 1; }
  }
  let n = 0;
  for (let v = 0; v < t.nv; v++) if (!boundary[v] && sum[v]! < WIND_ANGLE) { out[v] = 1; n++; }
  return n;
}

/**
 * Whether a child of window `w` placed on half-edge `g` (an edge incident
 * to `v`, as is w's) would complete a turn round v: w or one of its
 * ancestors, reached through windows lying on edges incident to v, lies on g.
 */
export function windsAround(W: WindowStore, t: Topology, w: number, g: number, v: number): boolean {
  const tri = t.tri, he = W.he, parent = W.parent;
  for (let a = w, steps = 0; a >= 0 && steps < tri.length; steps++) {
    const ha = he[a]!;
    if (ha === g) return true;
    if (tri[ha] !== v && tri[next(ha)] !== v) return false;
    const p = parent[a]!;
    if (p === a) return false; // merged: mixed history
    a = p;
  }
  return false;
}
