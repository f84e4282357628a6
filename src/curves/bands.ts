/**
 * Bands: the parts of the surface between consecutive levels of a
 * per-vertex field, {lower ≤ f < upper}, as polygons (outer rings with
 * holes) with their area on the surface and in plan view.
 *
 * Method: each face is clipped to the band — with the field linear in the
 * face the band's part of a face is the triangle cut by two parallel lines,
 * a convex polygon (Sutherland & Hodgman, "Reentrant polygon clipping",
 * CACM 17(1), 1974, here by walking the triangle's boundary) whose corners
 * are the face's corners inside the band and the crossings of the two
 * levels on its edges. Crossings come from crossings.ts (the perturbation
 * rule f ≥ L is "above"; exact roots along edges when the field provides
 * them), so a band's edge meets the isoline at the same level at the very
 * same points, and neighbouring faces share their cut points: the pieces
 * tile each face, and the bands tile the surface.
 *
 * Areas: `area` is the sum of the pieces' areas on the surface (each piece
 * is flat, in its face), so the bands' areas add up to the area of the
 * faces whose corners all have finite values. `planArea` is the sum of the
 * pieces' areas projected on the xy-plane (plan view, as on a map); a part
 * that overhangs another is counted again.
 *
 * Rings: a band's boundary is made of the pieces' edges that no
 * neighbouring piece shares (isoline segments at either level, boundary
 * edges of the mesh, edges of skipped faces), chained into closed rings.
 * A ring that runs counter-clockwise in plan view (seen from +z, or from −z
 * when the mesh faces down overall) is an outer ring, a clockwise one a
 * hole, given to the smallest outer ring that holds it in plan view. This
 * is meant for maps (heightfields); on a surface that folds over in plan
 * the rings are still the band's boundary, but outer and hole follow the
 * projection, and a hole that no outer ring holds becomes an outer ring.
 */
import type { Topology } from '../mesh/topology.js';
import { usageError, limitError } from '../errors.js';
import { EdgeCrossings, type ScalarField } from './crossings.js';
import { DEFAULT_MAX_LEVELS, finiteRange } from './isolines.js';

type P3 = [number, number, number];

/** One polygon of a band: an outer ring and its holes; each ring repeats its first point as its last (as GeoJSON does). */
export interface BandPolygon {
  /** Outer ring, counter-clockwise in plan view. */
  outer: P3[];
  /** Holes, clockwise in plan view. */
  holes: P3[][];
}

/** The part of the surface with lower ≤ f < upper. */
export interface Band {
  /** Lower level (inclusive). */
  lower: number;
  /** Upper level (exclusive). */
  upper: number;
  /** Area on the surface, mesh units². */
  area: number;
  /** Area projected on the xy-plane, mesh units² (overhanging parts count again). */
  planArea: number;
  /** The band as polygons (empty when `rings: false`). */
  polygons: BandPolygon[];
}

/** Options of {@link bands}. */
export interface BandOptions {
  /** Build the polygons (default true); false gives the areas only. */
  rings?: boolean;
}

/**
 * Band edges for a spacing D that cover the whole field: every multiple of
 * D from the one at or below the smallest finite value to the first above
 * the largest, so the bands' areas add up to the whole (finite) surface.
 * Throws `USAGE` for a bad spacing and `LIMIT` past `maxLevels`.
 */
export function bandLevels(values: Float64Array, every: number, maxLevels = DEFAULT_MAX_LEVELS): number[] {
  if (!(every > 0 && every < Infinity)) throw usageError(`the level spacing must be a positive number, got ${every}`);
  const [lo, hi] = finiteRange(values);
  const k0 = Math.floor(lo / every), k1 = Math.floor(hi / every) + 1;
  if (k1 - k0 + 1 > maxLevels) {
    throw limitError(`a spacing of ${every} gives ${k1 - k0 + 1} band edges over the field's range [${lo}, ${hi}], more than the ${maxLevels} allowed; raise maxLevels (--max-levels) or choose a wider spacing`);
  }
  const out: number[] = [];
  for (let k = k0; k <= k1; k++) out.push(k * every);
  return out;
}

/**
 * The bands between consecutive `levels` (sorted increasing, at least two)
 * of `field`; `positions` are x, y, z per topology vertex.
 */
export function bands(t: Topology, positions: Float64Array, field: ScalarField, levels: readonly number[], opts: BandOptions = {}): Band[] {
  if (field.values.length !== t.nv) throw usageError(`the field has ${field.values.length} values for ${t.nv} vertices`);
  for (let i = 1; i < levels.length; i++) if (!(levels[i]! > levels[i - 1]!)) throw usageError('band levels must increase strictly');
  const c = new EdgeCrossings(t, field, levels);
  const nb = Math.max(0, levels.length - 1);
  const rings = opts.rings ?? true;
  const out: Band[] = [];
  const acc = Array.from({ length: nb }, () => ({ area: 0, plan: 0, edges: new Map<number, number[]>(), at: new Map<number, P3>() }));
  const F = field.values, T = t.tri;
  let planSign = 0;
  const keys: number[] = [], pts: P3[] = [];
  for (let f = 0; f < t.nf; f++) {
    if (!c.faceUsable(f)) continue;
    planSign += planCross(positions, T[3 * f]!, T[3 * f + 1]!, T[3 * f + 2]!);
    const v0 = F[T[3 * f]!]!, v1 = F[T[3 * f + 1]!]!, v2 = F[T[3 * f + 2]!]!;
    const m = Math.min(v0, v1, v2), M = Math.max(v0, v1, v2);
    // the bands the face touches: not all corners below the lower level, not all at or above the upper
    for (let b = Math.max(0, firstAbove(levels, m) - 1); b < nb && levels[b]! <= M; b++) {
      keys.length = 0; pts.length = 0;
      facePiece(c, positions, f, b, keys, pts);
      if (pts.length < 3) continue;
      const a = acc[b]!;
      a.area += polygonArea3(pts);
      a.plan += Math.abs(planArea(pts));
      if (!rings) continue;
      for (let k = 0; k < keys.length; k++) {
        const from = keys[k]!, to = keys[(k + 1) % keys.length]!;
        if (from === to) continue;
        const list = a.edges.get(from);
        if (list) list.push(to); else a.edges.set(from, [to]);
        a.at.set(from, pts[k]!);
      }
    }
  }
  const sgn = planSign < 0 ? -1 : 1;
  for (let b = 0; b < nb; b++) {
    const a = acc[b]!;
    out.push({ lower: levels[b]!, upper: levels[b + 1]!, area: a.area, planArea: a.plan, polygons: rings ? assemble(a.edges, a.at, sgn) : [] });
  }
  return out;
}

/** Index of the first level > x (levels sorted). */
function firstAbove(levels: readonly number[], x: number): number {
  let lo = 0, hi = levels.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (levels[mid]! > x) hi = mid; else lo = mid + 1;
  }
  return lo;
}

/**
 * The piece of face f in band b (levels b and b+1), counter-clockwise: for
 * each half-edge, its tail corner when inside the band, then the crossings
 * of the two levels on its edge in order from the tail.
 */
function facePiece(c: EdgeCrossings, positions: Float64Array, f: number, b: number, keys: number[], pts: P3[]): void {
  const t = c.t, F = c.field.values;
  for (let k = 0; k < 3; k++) {
    const h = 3 * f + k, a = t.tri[h]!, z = t.tri[3 * f + ((k + 1) % 3)]!;
    const aLo = c.above(a, b), aHi = c.above(a, b + 1);
    if (aLo && !aHi) {
      keys.push(a);
      pts.push([positions[3 * a]!, positions[3 * a + 1]!, positions[3 * a + 2]!]);
    }
    const zLo = c.above(z, b), zHi = c.above(z, b + 1);
    const e = t.edgeOf[h]!;
    const order = F[a]! < F[z]! ? [b, b + 1] : [b + 1, b];
    for (const i of order) {
      if ((i === b ? aLo !== zLo : aHi !== zHi)) {
        const p: P3 = [0, 0, 0];
        c.position(positions, e, i, p);
        keys.push(c.key(e, i));
        pts.push(p);
      }
    }
  }
}

/** Twice the signed plan-view area of triangle (a, b, c). */
function planCross(P: Float64Array, a: number, b: number, c: number): number {
  return (P[3 * b]! - P[3 * a]!) * (P[3 * c + 1]! - P[3 * a + 1]!) - (P[3 * c]! - P[3 * a]!) * (P[3 * b + 1]! - P[3 * a + 1]!);
}

/** Area of a planar polygon in 3D (fan from the first corner; the pieces are convex). */
function polygonArea3(p: P3[]): number {
  let x = 0, y = 0, z = 0;
  const o = p[0]!;
  for (let k = 1; k + 1 < p.length; k++) {
    const a = p[k]!, b = p[k + 1]!;
    const ux = a[0] - o[0], uy = a[1] - o[1], uz = a[2] - o[2];
    const vx = b[0] - o[0], vy = b[1] - o[1], vz = b[2] - o[2];
    x += uy * vz - uz * vy; y += uz * vx - ux * vz; z += ux * vy - uy * vx;
  }
  return 0.5 * Math.hypot(x, y, z);
}

/** Signed plan-view (xy) area of a polygon, counter-clockwise positive (shoelace formula). */
export function planArea(p: readonly (readonly number[])[]): number {
  let s = 0;
  for (let k = 0; k < p.length; k++) {
    const a = p[k]!, b = p[(k + 1) % p.length]!;
    s += a[0]! * b[1]! - b[0]! * a[1]!;
  }
  return 0.5 * s;
}

/** Chains the unshared piece edges into rings, then sorts them into outer rings and holes. */
function assemble(edges: Map<number, number[]>, at: Map<number, P3>, sgn: number): BandPolygon[] {
  const bnext = new Map<number, number[]>();
  for (const [from, tos] of edges) {
    for (const to of tos) {
      if (edges.get(to)?.includes(from)) continue; // shared with the neighbouring piece: inside the band
      const list = bnext.get(from);
      if (list) list.push(to); else bnext.set(from, [to]);
    }
  }
  const rings: P3[][] = [];
  for (const start of bnext.keys()) {
    while ((bnext.get(start)?.length ?? 0) > 0) {
      const ring: P3[] = [];
      let k = start;
      for (let guard = 0; guard <= edges.size; guard++) {
        const list = bnext.get(k);
        if (!list || list.length === 0) break;
        const p = at.get(k)!;
        const last = ring[ring.length - 1];
        if (!last || last[0] !== p[0] || last[1] !== p[1] || last[2] !== p[2]) ring.push(p);
        k = list.pop()!;
        if (k === start) break;
      }
      const first = ring[0];
      const last = ring[ring.length - 1];
      if (ring.length > 1 && first && last && first[0] === last[0] && first[1] === last[1] && first[2] === last[2]) ring.pop();
      if (ring.length >= 3) rings.push(ring);
    }
  }
  const outers: { ring: P3[]; area: number; holes: P3[][] }[] = [];
  const holes: P3[][] = [];
  for (const r of rings) {
    const a = sgn * planArea(r);
    if (a > 0) outers.push({ ring: r, area: a, holes: [] }); else holes.push(r);
  }
  for (const h of holes) {
    let best: (typeof outers)[number] | undefined;
    for (const o of outers) if ((!best || o.area < best.area) && insidePlan(o.ring, h)) best = o;
    if (best) best.holes.push(h);
    else outers.push({ ring: h.slice().reverse(), area: -sgn * planArea(h), holes: [] });
  }
  // counter-clockwise outer rings and clockwise holes in plan view, whichever way the faces point
  const close = (r: P3[]): P3[] => (sgn > 0 ? [...r, r[0]!] : [r[0]!, ...r.slice().reverse()]);
  return outers.map((o) => ({ outer: close(o.ring), holes: o.holes.map(close) }));
}

/** True when ring `h` lies inside ring `o` in plan view (tested at h's first point off o's boundary; crossing-number rule). */
function insidePlan(o: P3[], h: P3[]): boolean {
  for (const q of h) {
    let inside = false, onEdge = false;
    for (let i = 0, j = o.length - 1; i < o.length; j = i++) {
      const a = o[i]!, b = o[j]!;
      if ((a[0] === q[0] && a[1] === q[1])) { onEdge = true; break; }
      if ((a[1] > q[1]) !== (b[1] > q[1]) && q[0] < ((b[0] - a[0]) * (q[1] - a[1])) / (b[1] - a[1]) + a[0]) inside = !inside;
    }
    if (!onEdge) return inside;
  }
  return false;
}
