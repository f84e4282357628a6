/**
 * Every crossing of a level on one edge, for a distance field known at every
 * surface point (exact-level.ts uses it; the exact polyhedral distance is not
 * linear along an edge, so an edge can hold 0, 1, 2 or more crossings).
 *
 * Crossings on an edge. The distance d from a source set is 1-Lipschitz
 * along the surface, so along edge e (parameter s ∈ [0, 1], length ℓ in the
 * measured metric) |d(s) − d(s')| ≤ ℓ|s − s'|. On [s0, s1] with end values
 * v0, v1 this bounds d between (v0 + v1 − ℓw)/2 and (v0 + v1 + ℓw)/2,
 * w = s1 − s0 (the Lipschitz global search of S. A. Piyavskii, "An algorithm
 * for finding the absolute extremum of a function", USSR Comput. Math. and
 * Math. Phys. 12(4), 1972, in its interval form): an interval whose bound
 * shows it wholly above (or wholly below) the level holds no crossing and is
 * dropped; the others are halved. An interval whose ends are on different
 * sides holds a crossing, found by regula falsi to {@link ROOT_WIDTH}. So every
 * piece of the level's sublevel set on the edge longer than
 * {@link SEARCH_WIDTH}·ℓ is found: what can be missed is a touch of the
 * level of depth below SEARCH_WIDTH·ℓ/2, where the curve grazes the edge.
 * The search is breadth first with at most {@link MAX_EDGE_EVALS} values
 * per edge: an edge along which the field stays at the level (the level
 * runs along the edge, as on a grid whose lines lie at distance L) spends
 * it, and is then searched to width ℓ/2048 everywhere (f = L counts as
 * above, so such an edge holds no crossing).
 * Vertex ends take the field's vertex values, with f ≥ L "above" (the
 * perturbation rule of crossings.ts), so the crossings toggle the side from
 * one end's to the other's.
 */
import type { Topology } from '../mesh/topology.js';
import { next } from '../mesh/topology.js';
import type { SurfacePoint } from '../mesh/surface-point.js';

/** Same-side intervals narrower than this (times the edge) are dropped: see the module comment. */
export const SEARCH_WIDTH = 1e-7;
/** Field evaluations per edge before the search stops halving same-side intervals (a level running along an edge). */
export const MAX_EDGE_EVALS = 4096;
/** Width (in edge parameter) to which a crossing is narrowed. */
export const ROOT_WIDTH = 1e-13;

/** What the search needs of the field. */
export interface PointField {
  /** One value per topology vertex. */
  values: Float64Array;
  /** The field at any surface point (Infinity where unreached). */
  at: (p: SurfacePoint) => number;
  /** Length of each edge in the metric the field measures (its Lipschitz constant along the edge). */
  edgeLength: Float64Array;
  /** Point sources, for loops that cross no edge. */
  pointSources?: readonly SurfacePoint[];
  /** Curve sources: one lying wholly inside a face with a level that crosses no edge is reported as untraced. */
  curveSources?: readonly (readonly SurfacePoint[])[];
}

/** Crossing parameters (from the tail of edgeHalfedge[e]) of level L on edge e, in increasing order. */
export function edgeLevelCrossings(t: Topology, f: PointField, e: number, L: number): number[] {
  const h = t.edgeHalfedge[e]!;
  const v0 = f.values[t.tri[h]!]!, v1 = f.values[t.tri[next(h)]!]!;
  const K = f.edgeLength[e]!;
  const out: number[] = [];
  if (!Number.isFinite(v0) && !Number.isFinite(v1)) return out;
  // values inside the edge come with rounding: one within `tol` under L counts as on the level
  // (above), so a level running along the edge does not break into specks; the vertex ends keep
  // their side (f < L below), moved by at most 2·tol to sit on it against the shifted level
  const tol = 1e-12 * (Math.abs(L) + K);
  const g = (s: number) => f.at({ kind: 'edge', edge: e, t: s });
  L -= tol;
  const w0 = v0 < L + tol ? Math.min(v0, L - tol) : Math.max(v0, L), w1 = v1 < L + tol ? Math.min(v1, L - tol) : Math.max(v1, L);
  // breadth first (all intervals of one width per round), so that a spent budget leaves the
  // whole edge searched to the same width: [s0, value, s1, value] per interval
  let live: number[] = [0, w0, 1, w1];
  let evals = 0;
  while (live.length > 0) {
    const nextRound: number[] = [];
    for (let i = 0; i < live.length; i += 4) {
      const s0 = live[i]!, a = live[i + 1]!, s1 = live[i + 2]!, b = live[i + 3]!;
      const w = s1 - s0, below0 = a < L, below1 = b < L;
      const last = w <= SEARCH_WIDTH || evals >= MAX_EDGE_EVALS;
      if (below0 !== below1) {
        if (last) { out.push(levelRoot((x) => g(x) - L, s0, a - L, s1, b - L, ROOT_WIDTH)); continue; }
      } else {
        const lo = Number.isFinite(a) && Number.isFinite(b) ? (a + b - K * w) / 2 : Math.min(a, b) - K * w;
        const hi = (a + b + K * w) / 2;
        if (below0 ? hi < L : !(lo < L)) continue; // wholly on one side
        if (last) continue; // a graze shallower than K·w/2, or a level running along the edge: see the module comment
      }
      const m = 0.5 * (s0 + s1), vm = g(m);
      evals++;
      nextRound.push(s0, a, m, vm, m, vm, s1, b);
    }
    live = nextRound;
  }
  return out.sort((x, y) => x - y);
}

/**
 * A root of h in [x0, x1], where h(x0) and h(x1) lie on different sides (h < 0 is below): regula
 * falsi with the Illinois modification (Dowell & Jarratt, BIT 11, 1971), every third step a
 * bisection so the bracket always shrinks, until the bracket is narrower than `width`.
 */
export function levelRoot(h: (x: number) => number, x0: number, h0: number, x1: number, h1: number, width: number): number {
  const belowAt0 = h0 < 0;
  let side = 0;
  for (let it = 0; it < 200 && x1 - x0 > width; it++) {
    let x = it % 3 === 2 ? 0.5 * (x0 + x1) : x0 - (h0 * (x1 - x0)) / (h1 - h0);
    if (!(x > x0 && x < x1)) x = 0.5 * (x0 + x1);
    if (!(x > x0 && x < x1)) break;
    const hx = h(x);
    if ((hx < 0) === belowAt0) {
      x0 = x; h0 = hx;
      if (side === -1) h1 *= 0.5;
      side = -1;
    } else {
      x1 = x; h1 = hx;
      if (side === 1) h0 *= 0.5;
      side = 1;
    }
  }
  const x = Number.isFinite(h0) && Number.isFinite(h1) && h1 !== h0 ? x0 - (h0 * (x1 - x0)) / (h1 - h0) : 0.5 * (x0 + x1);
  return x > x0 && x < x1 ? x : 0.5 * (x0 + x1);
}
