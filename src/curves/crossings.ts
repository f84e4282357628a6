/**
 * Where a level of a per-vertex field crosses each mesh edge: the one home of
 * the crossing rule shared by isolines (isolines.ts), bands (bands.ts) and
 * offsets (offset.ts), so that a curve and the band it bounds meet at the
 * very same points.
 *
 * Symbolic perturbation (Edelsbrunner & Mücke, "Simulation of simplicity",
 * ACM TOG 9(1), 1990, in its simplest form): a vertex whose value equals the
 * level counts as above it (f ≥ L is "above"), so every vertex is strictly
 * on one side and an edge is crossed exactly when its ends are on different
 * sides. A crossing at a vertex that lies exactly on the level sits at that
 * vertex (edge parameter 0 or 1).
 *
 * Where the crossing lies on a crossed edge:
 * - linear (default): the field is taken linear along the edge, so
 *   s = (L − f(a)) / (f(b) − f(a)) — the piecewise-linear level set
 *   ("marching triangles");
 * - with `alongEdge` (the exact polyhedral distance, which is not linear
 *   along an edge): a root of g(s) = alongEdge(e, s) − L bracketed by the
 *   vertex values, found by regula falsi with the Illinois modification
 *   (Dowell & Jarratt, BIT 11, 1971), every third step a bisection so the
 *   bracket always shrinks. When g has several roots on the edge (the exact
 *   distance rises and falls along an edge that crosses a cut locus) one of
 *   them is returned: which edges are crossed, and so the curves' topology,
 *   follows the vertex values.
 *
 * A face with a corner whose value is not finite (unreachable, beyond a
 * distance cap, or missing data) holds no crossing: curves end on its edges
 * as on a boundary.
 */
import type { Topology } from '../mesh/topology.js';
import { next } from '../mesh/topology.js';
import type { SurfacePoint } from '../mesh/surface-point.js';

/** A scalar field on the surface whose level sets are wanted. */
export interface ScalarField {
  /** One value per topology vertex; a non-finite value marks the vertex as missing (its faces are skipped). */
  values: Float64Array;
  /**
   * The field's value at parameter s ∈ [0, 1] along edge e, measured from the tail of
   * `edgeHalfedge[e]` (as in an edge surface point). Absent: linear between the vertex values.
   */
  alongEdge?: (edge: number, s: number) => number;
  /**
   * A distance field at any surface point (1-Lipschitz along the surface). With it and
   * `edgeLength`, isolines find every crossing of a level on an edge, bend curves inside faces
   * and close loops that cross no edge (exact-level.ts); bands keep the rule of this file.
   */
  at?: (p: SurfacePoint) => number;
  /** Edge lengths in the metric the field measures (with `at`). */
  edgeLength?: Float64Array;
  /** Point sources of a distance field (with `at`): loops round them inside one face. */
  pointSources?: readonly SurfacePoint[];
  /** Curve sources of a distance field (with `at`): one wholly inside a face is reported, not traced. */
  curveSources?: readonly (readonly SurfacePoint[])[];
}

/** Relative width (in edge parameter) at which a crossing's root-find stops. */
export const CROSSING_TOLERANCE = 1e-13;

/** Crossing parameters of a field's levels on the edges of a mesh, computed once per (edge, level) and cached. */
export class EdgeCrossings {
  private readonly cache = new Map<number, number>();

  /**
   * @param t - the mesh's topology
   * @param field - the field
   * @param levels - the levels, by index
   */
  constructor(
    readonly t: Topology,
    readonly field: ScalarField,
    readonly levels: readonly number[],
  ) {}

  /** True when vertex v is above level index i (f ≥ level: the perturbation rule). */
  above(v: number, i: number): boolean {
    return this.field.values[v]! >= this.levels[i]!;
  }

  /** True when every corner of face f has a finite value. */
  faceUsable(f: number): boolean {
    const F = this.field.values, T = this.t.tri;
    return Number.isFinite(F[T[3 * f]!]!) && Number.isFinite(F[T[3 * f + 1]!]!) && Number.isFinite(F[T[3 * f + 2]!]!);
  }

  /** A key for the crossing of level index i on edge e, unique among vertices and crossings (vertex keys are 0…nv−1). */
  key(e: number, i: number): number {
    return this.t.nv + e * this.levels.length + i;
  }

  /**
   * Parameter s ∈ [0, 1] from the tail of `edgeHalfedge[e]` where level index
   * i crosses edge e. Only meaningful when the edge's ends are on different
   * sides of the level.
   */
  param(e: number, i: number): number {
    const k = e * this.levels.length + i;
    const hit = this.cache.get(k);
    if (hit !== undefined) return hit;
    const t = this.t, h = t.edgeHalfedge[e]!;
    const L = this.levels[i]!;
    const fa = this.field.values[t.tri[h]!]!, fb = this.field.values[t.tri[next(h)]!]!;
    // orient so that the root-find runs from the end below the level to the end above it
    const s = fa < L ? this.solve(e, L, fa, fb, false) : 1 - this.solve(e, L, fb, fa, true);
    this.cache.set(k, s);
    return s;
  }

  /** Position of the crossing of level index i on edge e, written to out[o..o+2]. */
  position(positions: Float64Array, e: number, i: number, out: number[] | Float64Array, o = 0): void {
    const t = this.t, h = t.edgeHalfedge[e]!, s = this.param(e, i);
    const a = 3 * t.tri[h]!, b = 3 * t.tri[next(h)]!;
    for (let d = 0; d < 3; d++) out[o + d] = (1 - s) * positions[a + d]! + s * positions[b + d]!;
  }

  /** The crossing of level index i on edge e as a surface point (a vertex when it lies at an end). */
  surfacePoint(e: number, i: number): SurfacePoint {
    const t = this.t, h = t.edgeHalfedge[e]!, s = this.param(e, i);
    if (s <= 0) return { kind: 'vertex', vertex: t.tri[h]! };
    if (s >= 1) return { kind: 'vertex', vertex: t.tri[next(h)]! };
    return { kind: 'edge', edge: e, t: s };
  }

  /**
   * Root of the field minus L on the edge, as a parameter u from the end
   * below (value lo < L) to the end above (value hi ≥ L); `reversed` when u
   * runs against the edge's own parameter.
   */
  private solve(e: number, L: number, lo: number, hi: number, reversed: boolean): number {
    if (hi === L) return 1; // the end above lies exactly on the level
    const along = this.field.alongEdge;
    const linear = (L - lo) / (hi - lo);
    if (!along) return linear < 0 ? 0 : linear > 1 ? 1 : linear;
    let a = 0, b = 1, ga = lo - L, gb = hi - L; // ga < 0 ≤ gb
    let side = 0;
    for (let it = 0; it < 200 && b - a > CROSSING_TOLERANCE; it++) {
      let u = it % 3 === 2 ? 0.5 * (a + b) : a - (ga * (b - a)) / (gb - ga);
      if (!(u > a && u < b)) u = 0.5 * (a + b);
      const g = along(e, reversed ? 1 - u : u) - L;
      if (Number.isNaN(g)) break; // no value there: the best estimate from the bracket so far
      if (g === 0) return u;
      if (g > 0) {
        b = u; gb = g;
        if (side === 1) ga *= 0.5;
        side = 1;
      } else {
        a = u; ga = g;
        if (side === -1) gb *= 0.5;
        side = -1;
      }
    }
    const u = gb - ga > 0 ? a - (ga * (b - a)) / (gb - ga) : 0.5 * (a + b);
    return u < a ? a : u > b ? b : u;
  }
}
