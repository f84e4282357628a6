/**
 * Points on a triangulated surface, and their text form.
 *
 * | kind     | meaning                                             | text form          |
 * |----------|-----------------------------------------------------|--------------------|
 * | vertex   | a mesh vertex                                       | `v:INDEX`          |
 * | edge     | (1−t)·tail + t·tip of `edgeHalfedge[edge]`          | `e:INDEX:T`        |
 * | face     | b0·c0 + b1·c1 + b2·c2 of the face's corners         | `f:INDEX:B0,B1,B2` |
 * | (input)  | nearest surface point to x, y, z (resolved later)   | `p:X,Y,Z`          |
 * | (input)  | surface point straight below/above x, y along +z    | `p:X,Y`            |
 *
 * Indices are those of the topology (equal to the file's for vertices that
 * were not split and for faces when no face was dropped or triangulated).
 */
import { usageError } from '../errors.js';
import type { Topology } from './topology.js';
import { next } from './topology.js';

/** A point on the surface. */
export type SurfacePoint =
  | { kind: 'vertex'; vertex: number }
  | { kind: 'edge'; edge: number; t: number }
  | { kind: 'face'; face: number; bary: [number, number, number] };

/**
 * A point spec as typed by a user, before `p:` specs are resolved to the
 * surface: `position` (p:X,Y,Z) is snapped to the nearest surface point in
 * 3D, `column` (p:X,Y) to the highest surface point on the vertical line
 * through (x, y) (a drop along the z axis, for map coordinates).
 */
export type PointSpec =
  | SurfacePoint
  | { kind: 'position'; xyz: [number, number, number] }
  | { kind: 'column'; xy: [number, number] };

/** A number in a spec's text form (digits, optional point and exponent; NaN and Infinity are not spelled). */
export const SPEC_NUMBER = String.raw`[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?`;
const NUM = SPEC_NUMBER;
const RE_V = /^v:(\d+)$/;
const RE_E = new RegExp(`^e:(\\d+):(${NUM})$`);
const RE_F = new RegExp(`^f:(\\d+):(${NUM}),(${NUM}),(${NUM})$`);
const RE_P = new RegExp(`^p:(${NUM}),(${NUM}),(${NUM})$`);
const RE_P2 = new RegExp(`^p:(${NUM}),(${NUM})$`);

/**
 * The coordinates in groups 1…n of a spec's match (point and loop specs),
 * refused with a `USAGE` error naming the spec unless all are finite (a
 * number such as 1e999 matches {@link SPEC_NUMBER} but overflows).
 */
export function specCoordinates(m: RegExpExecArray, n: 3, text: string, label: string): [number, number, number];
export function specCoordinates(m: RegExpExecArray, n: 2, text: string, label: string): [number, number];
export function specCoordinates(m: RegExpExecArray, n: number, text: string, label: string): number[] {
  const out: number[] = [];
  for (let i = 1; i <= n; i++) out.push(Number(m[i]));
  if (!out.every(Number.isFinite)) throw usageError(`coordinates must be finite in '${text}'`, label);
  return out;
}

/**
 * Parses `v:I`, `e:I:T`, `f:I:B0,B1,B2`, `p:X,Y,Z` or `p:X,Y`. Barycentric
 * coordinates in text must be non-negative and are normalised to sum to one
 * (`f:3:1,1,1` is the centroid); `T` must lie in [0, 1]. Throws a `USAGE`
 * error naming the bad spec.
 */
export function parsePointSpec(text: string, label = 'point'): PointSpec {
  const s = text.trim();
  let m: RegExpExecArray | null;
  if ((m = RE_V.exec(s))) return { kind: 'vertex', vertex: Number(m[1]) };
  if ((m = RE_E.exec(s))) {
    const t = Number(m[2]);
    if (!(t >= 0 && t <= 1)) throw usageError(`edge parameter must lie in [0, 1] in '${text}'`, label);
    return { kind: 'edge', edge: Number(m[1]), t };
  }
  if ((m = RE_F.exec(s))) {
    const b = [Number(m[2]), Number(m[3]), Number(m[4])];
    const sum = b[0]! + b[1]! + b[2]!;
    if (b.some((x) => !(x >= 0)) || !(sum > 0) || !Number.isFinite(sum)) {
      throw usageError(`barycentric coordinates must be non-negative and not all zero in '${text}'`, label);
    }
    return { kind: 'face', face: Number(m[1]), bary: [b[0]! / sum, b[1]! / sum, b[2]! / sum] };
  }
  if ((m = RE_P.exec(s))) return { kind: 'position', xyz: specCoordinates(m, 3, text, label) };
  if ((m = RE_P2.exec(s))) return { kind: 'column', xy: specCoordinates(m, 2, text, label) };
  throw usageError(`cannot read point '${text}' (expected v:INDEX, e:INDEX:T, f:INDEX:B0,B1,B2, p:X,Y,Z or p:X,Y)`, label);
}

/**
 * Relative tolerance of {@link canonicalSurfacePoint}: a barycentric
 * coordinate or edge parameter below it (or within it of 1) counts as zero
 * (one). The point then moves by at most about 2·10⁻⁹ × the longest edge of
 * its face, far below any measurable distance, while the solvers see one
 * spelling for every point that lies on a vertex or an edge.
 */
export const SNAP_TOLERANCE = 1e-9;

/** How far barycentric coordinates given to the library may sum away from one (they are then rescaled). */
export const BARY_SUM_TOLERANCE = 1e-6;

const isIndex = (i: number, n: number) => Number.isInteger(i) && i >= 0 && i < n;
const show = (p: SurfacePoint) =>
  p.kind === 'vertex' ? `v:${p.vertex}` : p.kind === 'edge' ? `e:${p.edge}:${p.t}` : `f:${p.face}:${p.bary?.join(',')}`;

/**
 * Validates a surface point against a topology and returns its canonical
 * form ({@link canonicalSurfacePoint}). Every solver entry calls it on every
 * source and target.
 *
 * Refused with a `USAGE` error naming the point (and `label`, e.g. the
 * option): an index that is not an integer in range, a vertex on no face,
 * an edge parameter outside [0, 1] or not finite, barycentric coordinates
 * that are negative, not finite, or do not sum to one within
 * {@link BARY_SUM_TOLERANCE} (`[2, 2, 2]` is refused, not normalised; the
 * text form `f:F:B0,B1,B2` is normalised by {@link parsePointSpec}).
 */
export function checkSurfacePoint(p: SurfacePoint, t: Topology, label = 'point'): SurfacePoint {
  const bad = (why: string) => usageError(`${why} in point ${show(p)}`, label);
  if (p === null || typeof p !== 'object') throw usageError(`not a surface point: ${String(p)}`, label);
  if (p.kind === 'vertex') {
    if (!isIndex(p.vertex, t.nv)) throw bad(`vertex ${p.vertex} does not exist (mesh has ${t.nv})`);
    if (t.vertexHalfedge[p.vertex]! < 0) throw bad(`vertex ${p.vertex} belongs to no face`);
  } else if (p.kind === 'edge') {
    if (!isIndex(p.edge, t.ne)) throw bad(`edge ${p.edge} does not exist (mesh has ${t.ne})`);
    if (!(p.t >= 0 && p.t <= 1)) throw bad(`edge parameter ${p.t} must be a number in [0, 1]`);
  } else if (p.kind === 'face') {
    if (!isIndex(p.face, t.nf)) throw bad(`face ${p.face} does not exist (mesh has ${t.nf})`);
    const b = p.bary;
    if (!b || (b as ArrayLike<number>).length !== 3) throw bad('a face point needs three barycentric coordinates');
    if (!(b[0]! >= 0 && b[1]! >= 0 && b[2]! >= 0 && Number.isFinite(b[0]! + b[1]! + b[2]!))) {
      throw bad('barycentric coordinates must be finite and non-negative');
    }
    const sum = b[0]! + b[1]! + b[2]!;
    if (!(Math.abs(sum - 1) <= BARY_SUM_TOLERANCE)) throw bad(`barycentric coordinates must sum to 1 (they sum to ${sum})`);
  } else {
    throw usageError(`unknown surface point kind '${(p as { kind: unknown }).kind}'`, label);
  }
  return canonicalSurfacePoint(p, t);
}

/**
 * The one spelling the solvers use for a (valid) surface point: a face
 * point whose barycentric coordinates put it on a corner becomes that
 * vertex, on an edge that edge point; an edge point at an end becomes the
 * vertex; "on" means within {@link SNAP_TOLERANCE} (relative to the face's
 * size). Other face points get coordinates rescaled to sum exactly to one.
 */
export function canonicalSurfacePoint(p: SurfacePoint, t: Topology): SurfacePoint {
  if (p.kind === 'vertex') return p;
  if (p.kind === 'edge') {
    const h = t.edgeHalfedge[p.edge]!;
    if (p.t <= SNAP_TOLERANCE) return { kind: 'vertex', vertex: t.tri[h]! };
    if (p.t >= 1 - SNAP_TOLERANCE) return { kind: 'vertex', vertex: t.tri[next(h)]! };
    return p;
  }
  const sum = p.bary[0] + p.bary[1] + p.bary[2];
  const b = p.bary.map((x) => (x / sum <= SNAP_TOLERANCE ? 0 : x)) as [number, number, number];
  const s2 = b[0] + b[1] + b[2];
  const zeros = b.filter((x) => x === 0).length;
  if (zeros === 2) return { kind: 'vertex', vertex: t.tri[3 * p.face + b.findIndex((x) => x > 0)]! };
  if (zeros === 1) {
    // on the edge of half-edge 3f+k, from corner k to corner k+1 (the zero is corner k+2)
    const k = (b.indexOf(0) + 1) % 3, h = 3 * p.face + k;
    const e = t.edgeOf[h]!;
    const u = b[(k + 1) % 3]! / s2; // weight of corner k+1 = parameter from corner k
    const tt = t.edgeHalfedge[e] === h ? u : 1 - u;
    return canonicalSurfacePoint({ kind: 'edge', edge: e, t: tt }, t);
  }
  return { kind: 'face', face: p.face, bary: [b[0] / s2, b[1] / s2, b[2] / s2] };
}

/** Formats a surface point in its text form (round-trips through {@link parsePointSpec}). */
export function formatSurfacePoint(p: SurfacePoint): string {
  if (p.kind === 'vertex') return `v:${p.vertex}`;
  if (p.kind === 'edge') return `e:${p.edge}:${p.t}`;
  return `f:${p.face}:${p.bary[0]},${p.bary[1]},${p.bary[2]}`;
}

/** 3D position of a surface point given positions per topology vertex. */
export function surfacePointPosition(
  p: SurfacePoint,
  t: Topology,
  positions: Float64Array,
  out: Float64Array | number[] = new Float64Array(3),
): Float64Array | number[] {
  if (p.kind === 'vertex') {
    for (let i = 0; i < 3; i++) out[i] = positions[3 * p.vertex + i]!;
  } else if (p.kind === 'edge') {
    const h = t.edgeHalfedge[p.edge]!;
    const a = 3 * t.tri[h]!, b = 3 * t.tri[next(h)]!;
    for (let i = 0; i < 3; i++) out[i] = (1 - p.t) * positions[a + i]! + p.t * positions[b + i]!;
  } else {
    const c0 = 3 * t.tri[3 * p.face]!, c1 = 3 * t.tri[3 * p.face + 1]!, c2 = 3 * t.tri[3 * p.face + 2]!;
    const [b0, b1, b2] = p.bary;
    for (let i = 0; i < 3; i++) out[i] = b0 * positions[c0 + i]! + b1 * positions[c1 + i]! + b2 * positions[c2 + i]!;
  }
  return out;
}
