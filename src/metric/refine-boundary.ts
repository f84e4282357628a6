/**
 * Boundary edges facing an obtuse corner, bisected round after round until
 * none is left, with the Delaunay flips restored after each round around the
 * faces the round changed only.
 *
 * Why the splits: see refine.ts's splitObtuseBoundary (a boundary edge's cotan
 * weight is the single ½·cot of its one opposite corner, negative when that
 * corner is obtuse; splitting the encroached segment is the segment rule of
 * J. Ruppert, "A Delaunay refinement algorithm for quality 2-dimensional mesh
 * generation", J. Algorithms 18(3), 1995). A round bisects every boundary edge
 * that faces an obtuse corner (in edge id order, by refine.ts's terminal-edge
 * bisection) and flips back to an intrinsic Delaunay triangulation; the flips
 * can bring another obtuse corner in front of a boundary edge, hence rounds.
 *
 * Cost: before, each round copied the whole mesh twice and tested every edge
 * for the flips; on a scan-like 2M-face terrain (12 rounds, 12.5k vertices
 * added) that was 4 of the remesh's 4.5 s. Here one growing copy serves every
 * round, the flips start from the edges of the faces a split changed (the
 * others keep both their faces, so they stay Delaunay: Lawson's flip
 * algorithm needs only the edges that may have lost it; C. L. Lawson,
 * "Software for C¹ surface interpolation", 1977, and Bobenko & Springborn,
 * Discrete Comput. Geom. 38, 2007, for the intrinsic form) and the obtuse
 * test runs over the boundary edges only.
 */
import type { IntrinsicMesh } from './intrinsic.js';
import { Bisection, splitLongest, type RefineResult } from './refine.js';
import { flipToDelaunay, type FlipMesh } from './delaunay.js';
import { cotOpposite } from './triangle.js';
import { next, prev } from '../mesh/topology.js';

/** Result of {@link splitBoundaryToDelaunay}. */
export interface BoundarySplitResult extends RefineResult {
  /** Delaunay flips made after the splits. */
  flips: number;
  /** True when a round's flip cap stopped its flips early. */
  flipsCapped: boolean;
  /** Rounds run; `roundsCapped` when `maxRounds` were run and an obtuse corner was left. */
  rounds: number;
  roundsCapped: boolean;
}

/**
 * Splits the boundary edges of the intrinsic Delaunay triangulation `m` that
 * face an obtuse corner (cot < −`tolerance`) and flips to Delaunay again,
 * round after round, until no such edge is left, no edge could be split,
 * `maxInserted` vertices were added (`capped`) or `maxRounds` rounds ran
 * (`roundsCapped`). Returns `m` itself when nothing was split. The input is
 * not modified.
 */
export function splitBoundaryToDelaunay(m: IntrinsicMesh, maxInserted: number, maxRounds: number, tolerance = 1e-9): BoundarySplitResult {
  const t0 = m.topology;
  const boundary: number[] = [];
  for (let e = 0; e < t0.ne; e++) if (t0.twin[t0.edgeHalfedge[e]!]! < 0) boundary.push(e);
  let w: Bisection | null = null;
  let capped = false, unsplit = 0, flips = 0, flipsCapped = false, rounds = 0, roundsCapped = false;
  for (;;) {
    const L = w ? w.L : m.edgeLength, edgeOf = w ? w.edgeOf : t0.edgeOf, eh = w ? w.eh : t0.edgeHalfedge;
    const obtuse = boundary.filter((e) => {
      const h = eh[e]!;
      return cotOpposite(L[e]!, L[edgeOf[next(h)]!]!, L[edgeOf[prev(h)]!]!) < -tolerance;
    });
    if (obtuse.length === 0) break;
    if (rounds === maxRounds) { roundsCapped = true; break; }
    if (!(maxInserted >= 1) || (w !== null && w.inserted >= maxInserted)) { capped = true; break; }
    rounds++;
    w ??= new Bisection(m);
    const nf0 = w.nf, ne0 = w.ne, inserted0 = w.inserted;
    const touched: number[] = [];
    for (const e of obtuse) {
      if (w.inserted >= maxInserted) { capped = true; break; }
      const f = (w.eh[e]! / 3) | 0; // the split face keeps its id (its other half is new)
      if (splitLongest(w, e)) touched.push(f);
      else unsplit++;
    }
    if (w.inserted === inserted0) break; // nothing could be split
    for (let f = nf0; f < w.nf; f++) touched.push(f);
    for (let e = ne0; e < w.ne; e++) if (w.twin[w.eh[e]!]! < 0) boundary.push(e); // the split edges' new halves
    const seeds: number[] = [];
    for (const f of touched) seeds.push(w.edgeOf[3 * f]!, w.edgeOf[3 * f + 1]!, w.edgeOf[3 * f + 2]!);
    const view: FlipMesh = { tri: w.tri, twin: w.twin, edgeOf: w.edgeOf, edgeHalfedge: w.eh, vertexHalfedge: w.vh, faceOrigin: w.fo, nf: w.nf, ne: w.ne };
    const r = flipToDelaunay(view, w.L, seeds, tolerance, 20 * w.ne + 1000);
    flips += r.flips;
    flipsCapped ||= r.capped;
    if (capped) break;
  }
  const inserted = w?.inserted ?? 0;
  return { mesh: w && inserted > 0 ? w.result() : m, inserted, capped, unsplit, flips, flipsCapped, rounds, roundsCapped };
}
