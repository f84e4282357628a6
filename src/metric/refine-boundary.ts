/**
 * The heat method's intrinsic refinement with the Delaunay flips restored
 * incrementally: long edges bisected (refine.ts), then boundary edges facing
 * an obtuse corner, bisected round after round until none is left, with the
 * flips restored after each step around the faces it changed only.
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
 * Cost: before, each step copied the whole mesh twice and tested every edge
 * for the flips; on a scan-like 2M-face terrain (8.5k vertices on long
 * edges, then 12 rounds and 12.5k on the boundary) that was 4 of the
 * remesh's 4.5 s. Here one growing copy serves every step, and a boundary
 * round's flips start from the edges of the faces its splits changed (the
 * others keep both their faces, so they stay Delaunay: Lawson's flip
 * algorithm needs only the edges that may have lost it; C. L. Lawson,
 * "Software for C¹ surface interpolation", 1977, and Bobenko & Springborn,
 * Discrete Comput. Geom. 38, 2007, for the intrinsic form); the obtuse test
 * runs over the boundary edges only. The flips after the long-edge
 * bisection still test every edge in id order: bisections inside a flat
 * region make co-circular quads, where a different flip order can end on the
 * other, equally Delaunay, diagonal (measured: the seeded order changed 13 of
 * 1078 flips on a scan-like terrain), and the heat method's published
 * figures rest on the full order. On the meshes tested the boundary rounds'
 * seeded flips end on the full order's triangulation to the bit.
 */
import type { IntrinsicMesh } from './intrinsic.js';
import { Bisection, bisectLongEdges, hasLongEdge, splitLongest, type RefineResult } from './refine.js';
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
  const st = new Refinement(m, tolerance);
  st.boundaryRounds(maxInserted, maxRounds);
  return st.result();
}

/**
 * The heat method's intrinsic refinement of the intrinsic Delaunay
 * triangulation `m`: refine.ts's longest-edge bisection of the edges longer
 * than `maxLength`, flips back to Delaunay from the faces it changed, then
 * {@link splitBoundaryToDelaunay}'s rounds (skipped when the vertex cap
 * stopped the bisection), all on one growing copy (the flips after the
 * bisection test every edge: see below). The same triangulation as
 * refineLongEdges, intrinsicDelaunay and the rounds one after the other
 * (tested); `m` itself when nothing was split.
 */
export function refineToDelaunay(m: IntrinsicMesh, maxLength: number, maxInserted: number, maxRounds: number, tolerance = 1e-9): BoundarySplitResult {
  const st = new Refinement(m, tolerance);
  if (hasLongEdge(m, maxLength)) {
    if (!(maxInserted >= 1)) {
      st.capped = true;
      return st.result();
    }
    const w = st.work();
    const r = bisectLongEdges(w, maxLength, maxInserted, null);
    st.capped = r.capped;
    st.unsplit += r.unsplit;
    // every edge, in id order, as intrinsicDelaunay would: bisections inside flat regions make
    // co-circular quads, where another flip order can pick the other (equally Delaunay) diagonal
    if (w.inserted > 0) st.flip(null);
  }
  if (!st.capped) st.boundaryRounds(maxInserted, maxRounds);
  return st.result();
}

/** One refinement in progress: the input, its growing copy once something is split, and the counts. */
class Refinement {
  capped = false;
  unsplit = 0;
  flips = 0;
  flipsCapped = false;
  rounds = 0;
  roundsCapped = false;
  #w: Bisection | null = null;

  constructor(private readonly m: IntrinsicMesh, private readonly tolerance: number) {}

  /** The growing copy (made on first use). */
  work(): Bisection {
    return (this.#w ??= new Bisection(this.m));
  }

  /** Flips to Delaunay from the edges of the faces `touched` and of the faces from `nf0` on. */
  flipAround(touched: number[], nf0: number): void {
    const w = this.work();
    for (let f = nf0; f < w.nf; f++) touched.push(f);
    const seeds: number[] = [];
    for (const f of touched) seeds.push(w.edgeOf[3 * f]!, w.edgeOf[3 * f + 1]!, w.edgeOf[3 * f + 2]!);
    this.flip(seeds);
  }

  /** Flips the growing copy to Delaunay from `seeds` (null: every edge). */
  flip(seeds: number[] | null): void {
    const w = this.work();
    const view: FlipMesh = { tri: w.tri, twin: w.twin, edgeOf: w.edgeOf, edgeHalfedge: w.eh, vertexHalfedge: w.vh, faceOrigin: w.fo, nf: w.nf, ne: w.ne };
    const r = flipToDelaunay(view, w.L, seeds, this.tolerance, 20 * w.ne + 1000);
    this.flips += r.flips;
    this.flipsCapped ||= r.capped;
  }

  /** The rounds of {@link splitBoundaryToDelaunay}. */
  boundaryRounds(maxInserted: number, maxRounds: number): void {
    const m = this.m, t0 = m.topology, tol = this.tolerance;
    const boundary: number[] = [];
    const w0 = this.#w;
    const eh0 = w0 ? w0.eh : t0.edgeHalfedge, twin0 = w0 ? w0.twin : t0.twin, ne0 = w0 ? w0.ne : t0.ne;
    for (let e = 0; e < ne0; e++) if (twin0[eh0[e]!]! < 0) boundary.push(e);
    for (;;) {
      const w = this.#w;
      const L = w ? w.L : m.edgeLength, edgeOf = w ? w.edgeOf : t0.edgeOf, eh = w ? w.eh : t0.edgeHalfedge;
      const obtuse = boundary.filter((e) => {
        const h = eh[e]!;
        return cotOpposite(L[e]!, L[edgeOf[next(h)]!]!, L[edgeOf[prev(h)]!]!) < -tol;
      });
      if (obtuse.length === 0) return;
      if (this.rounds === maxRounds) { this.roundsCapped = true; return; }
      if (!(maxInserted >= 1) || (w !== null && w.inserted >= maxInserted)) { this.capped = true; return; }
      this.rounds++;
      const b = this.work();
      const nf0 = b.nf, ne1 = b.ne, inserted0 = b.inserted;
      const touched: number[] = [];
      for (const e of obtuse) {
        if (b.inserted >= maxInserted) { this.capped = true; break; }
        const f = (b.eh[e]! / 3) | 0; // the split face keeps its id (its other half is new)
        if (splitLongest(b, e)) touched.push(f);
        else this.unsplit++;
      }
      if (b.inserted === inserted0) return; // nothing could be split
      for (let e = ne1; e < b.ne; e++) if (b.twin[b.eh[e]!]! < 0) boundary.push(e); // the split edges' new halves
      this.flipAround(touched, nf0);
      if (this.capped) return;
    }
  }

  result(): BoundarySplitResult {
    const w = this.#w, inserted = w?.inserted ?? 0;
    return {
      mesh: w && inserted > 0 ? w.result() : this.m, inserted, capped: this.capped, unsplit: this.unsplit,
      flips: this.flips, flipsCapped: this.flipsCapped, rounds: this.rounds, roundsCapped: this.roundsCapped,
    };
  }
}
