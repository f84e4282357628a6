/**
 * Points on a triangulated surface, and their text form.
 *
 * | kind     | meaning                                             | text form          |
 * |----------|-----------------------------------------------------|--------------------|
 * | vertex   | a mesh vertex                                       | `v:INDEX`          |
 * | edge     | (1−t)·tail + t·tip of `edgeHalfedge[edge]`          | `e:INDEX:T`        |
 * | face     | b0·c0 + b1·c1 + b2·c2 of the face's corners         | `f:INDEX:B0,B1,B2` |
 * | (input)  | nearest surface point to x, y, z (resolved later)   | `p:X,Y,Z`          |
 *
 * Indices are those of the topology (equal to the file's for vertices that
 * were not split and for faces when no face was dropped or triangulated).
 */
import { usageError } from '../errors.js';
import type { Topology } from '../mesh/topology.js';
import { next } from '../mesh/topology.js';

/** A point on the surface. */
export type SurfacePoint =
  | { kind: 'vertex'; vertex: number }
  | { kind: 'edge'; edge: number; t: number }
  | { kind: 'face'; face: number; bary: [number, number, number] };

/** A point spec as typed by a user, before `p:` specs are resolved to the surface. */
export type PointSpec = SurfacePoint | { kind: 'position'; xyz: [number, number, number] };

const NUM = String.raw`[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?`;
const RE_V = /^v:(\d+)$/;
const RE_E = new RegExp(`^e:(\\d+):(${NUM})$`);
const RE_F = new RegExp(`^f:(\\d+):(${NUM}),(${NUM}),(${NUM})$`);
const RE_P = new RegExp(`^p:(${NUM}),(${NUM}),(${NUM})$`);

/**
 * Parses `v:I`, `e:I:T`, `f:I:B0,B1,B2` or `p:X,Y,Z`. Barycentric coordinates
 * must be non-negative and are normalised to sum to one; `T` must lie in [0, 1].
 * Throws a `USAGE` error naming the bad spec.
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
  if ((m = RE_P.exec(s))) {
    const xyz: [number, number, number] = [Number(m[1]), Number(m[2]), Number(m[3])];
    if (!xyz.every(Number.isFinite)) throw usageError(`coordinates must be finite in '${text}'`, label);
    return { kind: 'position', xyz };
  }
  throw usageError(`cannot read point '${text}' (expected v:INDEX, e:INDEX:T, f:INDEX:B0,B1,B2 or p:X,Y,Z)`, label);
}

/** Checks a surface point's indices against a topology; throws `USAGE` when out of range. */
export function checkSurfacePoint(p: SurfacePoint, t: Topology, label = 'point'): SurfacePoint {
  if (p.kind === 'vertex') {
    if (!(p.vertex < t.nv)) throw usageError(`vertex ${p.vertex} does not exist (mesh has ${t.nv})`, label);
    if (t.vertexHalfedge[p.vertex]! < 0) throw usageError(`vertex ${p.vertex} belongs to no face`, label);
  } else if (p.kind === 'edge') {
    if (!(p.edge < t.ne)) throw usageError(`edge ${p.edge} does not exist (mesh has ${t.ne})`, label);
  } else if (!(p.face < t.nf)) {
    throw usageError(`face ${p.face} does not exist (mesh has ${t.nf})`, label);
  }
  return p;
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
