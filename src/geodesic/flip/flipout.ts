/**
 * Path shortening by intrinsic edge flips: FlipOut, from Sharp & Crane,
 * "You Can Find Geodesic Paths in Triangle Meshes by Just Flipping Edges",
 * ACM TOG 39(6), 2020, §4.
 *
 * A path is a chain of intrinsic edges. At an inner vertex b with
 * neighbours a and c the path bends by two angles, one on each side, that
 * sum to Θ(b). Where one side measures less than π the path is not locally
 * shortest, and FlipOut fixes it: the edges b–x₁ … b–x_{k−1} inside that
 * wedge are flipped while the outer chain a = x₀, x₁, …, x_k = c has a vertex
 * x_j whose angle β_j (the two corners at x_j of the triangles b x_{j−1} x_j
 * and b x_j x_{j+1}) is below π: the quad b x_{j−1} x_j x_{j+1} is then
 * strictly convex, and the flip removes x_j from the chain. Angles β only
 * grow as neighbours are flipped (paper, §4.2), so one sweep along the
 * chain suffices. The path then follows the chain, which is strictly
 * shorter (the chain is convex towards b and the wedge is below π).
 *
 * Sweeps repeat over the path until every inner vertex bends by at least
 * π − {@link BEND_TOLERANCE} on both sides (a boundary vertex only on its
 * side away from the boundary gap), i.e. the path is a geodesic of the
 * polyhedral metric. A repeated vertex (a loop, which FlipOut can create in
 * principle) is cut out at the end of a sweep, which shortens the path too;
 * a vertex that appears twice is left alone during that sweep, so no wedge
 * edge is ever a path edge.
 */
import type { FlipTriangulation } from './triangulation.js';
import type { EdgePath } from './start-path.js';
import { next, prev } from '../../mesh/topology.js';

/**
 * How far below π a bend may stay (radians). A corner of deficit δ between
 * segments of lengths l₁, l₂ makes the path longer by about
 * l₁l₂/(l₁+l₂)·δ²/2, so 1e-9 is far below the 1e-9 relative length goal.
 */
export const BEND_TOLERANCE = 1e-9;

/** Result of {@link shortenPath}. */
export interface ShortenResult extends EdgePath {
  /** True when every bend is within the tolerance of straight (a geodesic). */
  converged: boolean;
  /** Sweeps made over the path. */
  sweeps: number;
}

/**
 * Shortens `start` (an edge path of `tri`) by FlipOut until it is a
 * geodesic, flipping `tri` in place. Stops unconverged after `maxSweeps`
 * sweeps, after `maxFlips` flips (default 20 per edge + 100k: a guard
 * against rounding loops, far above what a path needs, e.g. 7.5k flips for a
 * 1M-face terrain corner to corner) or when a needed flip is degenerate.
 */
export function shortenPath(tri: FlipTriangulation, start: EdgePath, maxSweeps = 1_000_000, maxFlips = 20 * tri.ne + 100_000): ShortenResult {
  let V = start.vertices.slice(), E = start.edges.slice();
  const count = new Map<number, number>();
  for (const v of V) count.set(v, (count.get(v) ?? 0) + 1);
  let sweeps = 0, converged = false;
  const limit = Math.PI - BEND_TOLERANCE;
  while (sweeps < maxSweeps && tri.flips <= maxFlips) {
    sweeps++;
    let changed = false, stuck = false;
    const outV = [V[0]!], outE: number[] = [];
    let pending = E[0]!;
    for (let i = 1; i + 1 < V.length; i++) {
      const b = V[i]!, ebc = E[i]!;
      tri.prepare(b);
      const dba = tri.direction(pending, b), dbc = tri.direction(ebc, b);
      const left = tri.sweep(b, dbc, dba), right = tri.sweep(b, dba, dbc);
      if ((left >= limit && right >= limit) || count.get(b)! > 1) {
        outV.push(b); outE.push(pending); pending = ebc;
        continue;
      }
      const chain = left < right ? flipOut(tri, b, ebc, pending, true) : flipOut(tri, b, pending, ebc, false);
      if (!chain) {
        stuck = true;
        outV.push(b); outE.push(pending); pending = ebc;
        continue;
      }
      changed = true;
      count.set(b, count.get(b)! - 1);
      for (let j = 0; j < chain.vertices.length; j++) {
        const x = chain.vertices[j]!;
        outE.push(chain.edges[j]!);
        outV.push(x);
        count.set(x, (count.get(x) ?? 0) + 1);
      }
      pending = chain.edges[chain.edges.length - 1]!;
    }
    outE.push(pending);
    outV.push(V[V.length - 1]!);
    const cut = cutLoops(outV, outE);
    V = cut.vertices; E = cut.edges;
    count.clear();
    for (const v of V) count.set(v, (count.get(v) ?? 0) + 1);
    if (!changed && !cut.cut) { converged = !stuck; break; }
  }
  let length = 0;
  for (const e of E) length += tri.length[e]!;
  return { vertices: V, edges: E, length, converged, sweeps };
}

/**
 * FlipOut in the wedge at b swept counter-clockwise from edge `e0` to edge
 * `e1` (both ends of b, angle below π; `e0` leaves b, `e1` may be a boundary
 * edge that only enters b). Returns the chain that
 * replaces b, ordered from the path's previous vertex to its next one
 * (`reverse`: the wedge runs from next to previous), as its inner vertices
 * and its edges (one more edge than vertices); null when a flip the chain
 * needs is degenerate.
 */
function flipOut(tri: FlipTriangulation, b: number, e0: number, e1: number, reverse: boolean): { vertices: number[]; edges: number[] } | null {
  const { twin, edgeOf } = tri;
  // the wedge's edges from b, as stable edge ids
  const W = [e0];
  for (let h = tri.leaving(e0, b), n = 0; edgeOf[h] !== e1;) {
    if (h < 0 || ++n > tri.tri.length) return null;
    const o = twin[prev(h)]!;
    if (o < 0) {
      if (edgeOf[prev(h)] !== e1) return null;
      break;
    }
    h = o;
    W.push(edgeOf[h]!);
  }
  if (W[W.length - 1] !== e1) W.push(e1);
  const limit = Math.PI - BEND_TOLERANCE;
  for (let j = 1; j + 1 < W.length;) {
    const hPrev = tri.leaving(W[j - 1]!, b), hCur = tri.leaving(W[j]!, b);
    const beta = tri.corner(prev(hPrev)) + tri.corner(next(hCur));
    if (beta < limit) {
      if (!tri.flip(hCur)) return null;
      W.splice(j, 1);
      if (j > 1) j--;
    } else {
      j++;
    }
  }
  const vertices: number[] = [], edges: number[] = [];
  for (let j = 0; j + 1 < W.length; j++) {
    const h = tri.leaving(W[j]!, b);
    edges.push(edgeOf[next(h)]!);
    if (j > 0) vertices.push(tri.tri[next(h)]!);
  }
  if (reverse) { vertices.reverse(); edges.reverse(); }
  return { vertices, edges };
}

/** Removes every loop (a vertex visited twice) from a vertex/edge path. */
function cutLoops(V: number[], E: number[]): { vertices: number[]; edges: number[]; cut: boolean } {
  const at = new Map<number, number>();
  const rv: number[] = [], re: number[] = [];
  let cut = false;
  for (let k = 0; k < V.length; k++) {
    const v = V[k]!;
    const j = at.get(v);
    if (j !== undefined) {
      for (let r = j + 1; r < rv.length; r++) at.delete(rv[r]!);
      rv.length = j + 1;
      re.length = j;
      cut = true;
      continue;
    }
    if (k > 0) re.push(E[k - 1]!);
    at.set(v, rv.length);
    rv.push(v);
  }
  return { vertices: rv, edges: re, cut };
}
