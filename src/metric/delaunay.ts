/**
 * Intrinsic Delaunay triangulation by edge flips (Bobenko & Springborn,
 * Discrete Comput. Geom. 38, 2007; Fisher et al., Computing 81, 2007).
 *
 * The vertex set and the piecewise-flat metric stay the same; only the
 * triangulation of that metric changes. An interior edge is Delaunay when the
 * angles α, β opposite it satisfy cot α + cot β ≥ 0 (equivalently α + β ≤ π),
 * which makes every cotan weight non-negative and the Laplacian an M-matrix.
 * Flipping a non-Delaunay edge replaces the diagonal ab of the quad acbd by cd:
 * ```
 *          c                        c
 *         / \                      /|\
 *     hp /   \ hn             nh  / | \  pt
 *       /  h  \                  /  |  \
 *      a ─────> b     ──▶       a  h↑t↓ b
 *       \ <──── /                \  |  /
 *     tn \  t  / tp           ph  \ | /  nt
 *         \   /                    \|/
 *          d                        d
 * ```
 * Half-edge slots stay in place: h becomes d→c inside face (a, d, c) with
 * next(h) = c→a and prev(h) = a→d; t becomes c→d inside face (b, c, d) with
 * next(t) = d→b and prev(t) = b→c. The new length |cd| comes from unfolding
 * the two triangles into the plane on either side of ab.
 *
 * The flip algorithm terminates (Bobenko & Springborn); a cap on the number
 * of flips guards against rounding loops all the same, and flips that would
 * create a loop edge or a face without area are skipped.
 */
import type { Topology } from '../mesh/topology.js';
import type { IntrinsicMesh } from './intrinsic.js';
import { next, prev } from '../mesh/topology.js';
import { triangleArea, unfoldedDiagonal, cotOpposite, faceCotans } from './triangle.js';
import { FlipQuad, type FlipArrays } from '../mesh/edge-flip.js';

/** Options of {@link intrinsicDelaunay}. */
export interface DelaunayOptions {
  /** An edge counts as Delaunay when cot α + cot β ≥ −tolerance (default 1e-9). */
  tolerance?: number;
  /** Stop after this many flips (default 20·E + 1000). */
  maxFlips?: number;
}

/** Result of {@link intrinsicDelaunay}. */
export interface DelaunayResult {
  /** The flipped mesh: a new topology over the same vertices, with new edge lengths. */
  mesh: IntrinsicMesh;
  /** Number of flips made. */
  flips: number;
  /** Non-Delaunay edges left unflipped because the flip was degenerate. */
  skipped: number;
  /** True when the flip cap stopped the loop early. */
  capped: boolean;
}

/**
 * cot α + cot β of the angles opposite interior half-edge h and its twin
 * (Infinity on the boundary). Cotangents follow the library's one rule
 * (triangle.ts's {@link cotOpposite}: 0 for a face without area, unbounded
 * otherwise, so the test is exact on needles too).
 */
export function edgeCotanSum(t: Topology, L: Float64Array, h: number): number {
  const o = t.twin[h]!;
  if (o < 0) return Infinity;
  return oppositeCot(t, L, h) + oppositeCot(t, L, o);
}

/** cot of the angle opposite half-edge h in its face. */
function oppositeCot(t: FlipArrays, L: Float64Array, h: number): number {
  return cotOpposite(L[t.edgeOf[h]!]!, L[t.edgeOf[next(h)]!]!, L[t.edgeOf[prev(h)]!]!);
}

/**
 * Flips the interior edges of a copy of `m` until every one is Delaunay (up
 * to the tolerance). The input is not modified. Vertex ids are unchanged, so
 * per-vertex results on the output map to the input directly; edge and face
 * ids are kept but their meaning changes where flips happened (flipped faces
 * get `faceOrigin = -1`).
 */
export function intrinsicDelaunay(m: IntrinsicMesh, options: DelaunayOptions = {}): DelaunayResult {
  const src = m.topology;
  const tol = options.tolerance ?? 1e-9;
  const maxFlips = options.maxFlips ?? 20 * src.ne + 1000;
  const t: Topology = {
    nv: src.nv, nf: src.nf, ne: src.ne, tri: src.tri.slice(), twin: src.twin.slice(), edgeOf: src.edgeOf.slice(),
    edgeHalfedge: src.edgeHalfedge.slice(), vertexHalfedge: src.vertexHalfedge.slice(),
    vertexOrigin: src.vertexOrigin.slice(), faceOrigin: src.faceOrigin.slice(),
  };
  const L = m.edgeLength.slice();
  const r = flipToDelaunay(t, L, null, tol, maxFlips);
  return { mesh: { topology: t, edgeLength: L }, ...r };
}

/** The arrays {@link flipToDelaunay} rewrites in place: a Topology's, or a refinement's growing ones (refine.ts). */
export interface FlipMesh extends FlipArrays {
  readonly vertexHalfedge: Int32Array;
  readonly faceOrigin: Int32Array;
  readonly nf: number;
  readonly ne: number;
}

/**
 * The flip loop of {@link intrinsicDelaunay}, in place on `t` and `L`: a FIFO
 * queue of edges, each in it at most once; a non-Delaunay interior edge is
 * flipped and the four sides of its quad are queued again. `seeds` null
 * queues every edge (and keeps the cotangents per face, one area for three);
 * a list queues only those edges, for a triangulation that was Delaunay
 * except around them (after a few vertex insertions, the edges of the faces
 * they touched): the untouched edges keep both their faces, so they stay
 * Delaunay, and the flips restore the rest (Lawson's flip algorithm; the
 * intrinsic form: Bobenko & Springborn 2007).
 */
export function flipToDelaunay(t: FlipMesh, L: Float64Array, seeds: ArrayLike<number> | null, tol: number, maxFlips: number): { flips: number; skipped: number; capped: boolean } {
  const { twin, edgeOf, edgeHalfedge } = t;
  // cot[h]: cotangent of the angle opposite half-edge h, kept per face (the same values as
  // edgeCotanSum's, bit for bit), so the test of an edge is one addition; seeded runs test directly
  const cot = seeds === null ? new Float64Array(3 * t.nf) : null;
  if (cot !== null) for (let f = 0; f < t.nf; f++) cacheFace(t, L, cot, f);
  const ne = t.ne;
  const cap = Math.max(1, ne);
  const ring = new Int32Array(cap);
  const queued = new Uint8Array(ne);
  let head = 0, size = 0;
  const push = (e: number): void => {
    if (queued[e] || twin[edgeHalfedge[e]!]! < 0) return;
    queued[e] = 1;
    const at = head + size;
    ring[at < cap ? at : at - cap] = e;
    size++;
  };
  if (seeds === null) for (let e = 0; e < ne; e++) push(e);
  else for (let k = 0; k < seeds.length; k++) push(seeds[k]!);

  let flips = 0, skipped = 0, capped = false;
  const quad = new FlipQuad();
  while (size > 0) {
    const e = ring[head]!;
    head = head + 1 < cap ? head + 1 : 0;
    size--;
    queued[e] = 0;
    const h = edgeHalfedge[e]!, o = twin[h]!;
    if (o < 0 || (cot !== null ? cot[h]! + cot[o]! : oppositeCot(t, L, h) + oppositeCot(t, L, o)) >= -tol) continue;
    if (flips >= maxFlips) { capped = true; break; }
    if (!flip(t, L, h, quad)) { skipped++; continue; }
    if (cot !== null) {
      cacheFace(t, L, cot, (h / 3) | 0);
      cacheFace(t, L, cot, (o / 3) | 0);
    }
    flips++;
    push(edgeOf[next(h)]!); push(edgeOf[prev(h)]!);
    push(edgeOf[next(o)]!); push(edgeOf[prev(o)]!);
  }
  return { flips, skipped, capped };
}

/**
 * Writes the cotangents opposite face f's three half-edges to cot[3f …]
 * (triangle.ts's faceCotans: the values of cotOpposite, one area for three).
 */
function cacheFace(t: FlipArrays, L: Float64Array, cot: Float64Array, f: number): void {
  const h = 3 * f, eo = t.edgeOf;
  // slots h, h + 1, h + 2 are h, next(h), prev(h)
  faceCotans(L[eo[h]!]!, L[eo[h + 1]!]!, L[eo[h + 2]!]!, cot, h);
}

/**
 * Flips interior half-edge h in place (see the module sketch; the
 * combinatorics are mesh/edge-flip.ts's). Returns false, changing nothing,
 * when the flip is degenerate: the twin lies in the same face, the new edge
 * would be a loop, an outer side is glued onto the quad, or a new face would
 * have no area.
 */
function flip(t: FlipMesh, L: Float64Array, h: number, q: FlipQuad): boolean {
  if (!q.read(t, h)) return false;
  const { edgeOf } = t;
  const lab = L[edgeOf[h]!]!, lbc = L[edgeOf[q.hn]!]!, lca = L[edgeOf[q.hp]!]!;
  const lad = L[edgeOf[q.on]!]!, ldb = L[edgeOf[q.op]!]!;
  const lcd = unfoldedDiagonal(lab, lbc, lca, lad, ldb);
  if (!(lcd > 0)) return false;
  if (!(triangleArea(lcd, lca, lad) > 0 && triangleArea(lcd, ldb, lbc) > 0)) return false;
  q.rewire(t, t.vertexHalfedge);
  L[edgeOf[h]!] = lcd;
  t.faceOrigin[(h / 3) | 0] = -1;
  t.faceOrigin[(q.o / 3) | 0] = -1;
  return true;
}
