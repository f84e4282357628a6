/**
 * Where a straightest line starts: the tangent plane at a surface point and
 * the map from a direction in that plane to the first face of the walk
 * (K. Polthier & M. Schmies, "Straightest geodesics on polyhedral
 * surfaces", 1998: a direction at a vertex is an angle in the vertex's
 * total angle θ, not in 2π).
 *
 * Tangent plane (unit normal n):
 * - in a face: the face's plane;
 * - on an edge: the plane through the edge whose normal is the mean of the
 *   two unit face normals (one face on a boundary edge); each side of the
 *   edge then spans π both in the plane and on the surface, so a direction
 *   at angle ψ from the edge enters the face on that side at angle ψ;
 * - at a vertex: normal = Σ (corner angle × unit face normal) over the fan
 *   (angle-weighted vertex normal, G. Thürmer & C. A. Wüthrich, "Computing
 *   vertex normals from polygonal facets", J. Graphics Tools 3(1), 1998).
 *   Each fan edge is turned into the plane by the rotation that takes the
 *   mean normal of its faces to n (the smallest rotation between the two
 *   normals), which gives it an angle there; a direction between the images
 *   of the two edges of a corner of angle α, at a fraction q of the angle
 *   between them, becomes the direction at q·α from the first edge inside
 *   that face (piecewise linear in the angle, so the image of an edge walks
 *   along the edge). Where faces meet in one plane the rotation keeps their
 *   angles, so on a developable fan (a prism's side) the heading is exact.
 *   When no corner holds the direction (a fan folded over) the angle from
 *   the first edge is scaled by θ/2π instead. At a boundary vertex, a
 *   direction in no corner points off the surface.
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import { next, prev, faceOf, forEachOutgoing } from '../mesh/topology.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { layoutAlong } from '../metric/layout.js';
import { cornerAngleAt, type WalkStart } from './straightest-walk.js';

/** A 3D vector. */
export type Vec3 = [number, number, number];

const TWO_PI = 2 * Math.PI;
const mod2pi = (a: number) => {
  const r = a % TWO_PI;
  return r < 0 ? r + TWO_PI : r;
};
const dot = (a: Vec3, b: Vec3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
/** Cross product a × b. */
export const cross = (a: Vec3, b: Vec3): Vec3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const at = (P: Float64Array, v: number): Vec3 => [P[3 * v]!, P[3 * v + 1]!, P[3 * v + 2]!];
const sub = (a: Vec3, b: Vec3): Vec3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];

/** `a` scaled to unit length, or null when it has no direction. */
export function unit(a: Vec3): Vec3 | null {
  const l = Math.hypot(a[0], a[1], a[2]);
  return l > 0 && Number.isFinite(l) ? [a[0] / l, a[1] / l, a[2] / l] : null;
}

/** `a` minus its component along the unit vector n. */
export function projectOut(a: Vec3, n: Vec3): Vec3 {
  const s = dot(a, n);
  return [a[0] - s * n[0], a[1] - s * n[1], a[2] - s * n[2]];
}

/** Unit normal of face f from positions (counter-clockwise corners), or null for a face without area. */
function faceNormal(t: IntrinsicMesh['topology'], P: Float64Array, f: number): Vec3 | null {
  const a = at(P, t.tri[3 * f]!), b = at(P, t.tri[3 * f + 1]!), c = at(P, t.tri[3 * f + 2]!);
  return unit(cross(sub(b, a), sub(c, a)));
}

/** The outgoing half-edges of v, counter-clockwise from `vertexHalfedge` (a boundary vertex: from its boundary edge). */
function fanOf(t: IntrinsicMesh['topology'], v: number): number[] {
  const out: number[] = [];
  forEachOutgoing(t, v, (h) => out.push(h));
  return out;
}

/**
 * Unit normal of the tangent plane at a (canonical) surface point: the
 * face's normal, the mean of an edge's face normals, or the angle-weighted
 * vertex normal (see the module comment). Null when none is defined (faces
 * without area).
 */
export function tangentNormal(m: IntrinsicMesh, P: Float64Array, p: SurfacePoint): Vec3 | null {
  const t = m.topology;
  if (p.kind === 'face') return faceNormal(t, P, p.face);
  if (p.kind === 'edge') {
    const h = t.edgeHalfedge[p.edge]!, o = t.twin[h]!;
    const nf = faceNormal(t, P, faceOf(h)), ng = o >= 0 ? faceNormal(t, P, faceOf(o)) : null;
    if (nf && ng) return unit([nf[0] + ng[0], nf[1] + ng[1], nf[2] + ng[2]]) ?? nf;
    return nf ?? ng;
  }
  const s: Vec3 = [0, 0, 0];
  for (const h of fanOf(t, p.vertex)) {
    const n = faceNormal(t, P, faceOf(h));
    if (!n) continue;
    const a = cornerAngleAt(m, h);
    s[0] += a * n[0]; s[1] += a * n[1]; s[2] += a * n[2];
  }
  return unit(s);
}

/**
 * The first face of a walk from surface point p in direction d (a unit
 * vector in the tangent plane of normal n at p): its layout, the position
 * and the direction there. Null when d points off the surface (p on the
 * boundary).
 */
export function walkStartOf(m: IntrinsicMesh, P: Float64Array, p: SurfacePoint, n: Vec3, d: Vec3): WalkStart | null {
  const t = m.topology, L = m.edgeLength, lay = new Float64Array(6);
  if (p.kind === 'face') {
    const base = 3 * p.face;
    const l = layoutAlong(m, base, lay, 0);
    const e1 = unit(sub(at(P, t.tri[base + 1]!), at(P, t.tri[base]!)));
    if (!e1) return null;
    const e2 = cross(n, e1);
    const dd = [dot(d, e1), dot(d, e2)], dl = Math.hypot(dd[0]!, dd[1]!);
    if (!(dl > 0)) return null;
    const [, b1, b2] = p.bary;
    return { base, x: b1 * l + b2 * lay[0]!, y: b2 * lay[1]!, dx: dd[0]! / dl, dy: dd[1]! / dl, entry: 'interior' };
  }
  if (p.kind === 'edge') {
    const h = t.edgeHalfedge[p.edge]!, o = t.twin[h]!, l = L[p.edge]!;
    const e = unit(sub(at(P, t.tri[next(h)]!), at(P, t.tri[h]!)));
    if (!e) return null;
    const psi = Math.atan2(dot(cross(e, d), n), dot(e, d)); // angle from the edge, counter-clockwise about n
    if (psi >= 0) return { base: h, x: p.t * l, y: 0, dx: Math.cos(psi), dy: Math.sin(psi), entry: 'edge' };
    if (o < 0) return null;
    const g = psi + Math.PI; // the same direction measured from the twin, which runs the other way
    return { base: o, x: (1 - p.t) * l, y: 0, dx: Math.cos(g), dy: Math.sin(g), entry: 'edge' };
  }
  return vertexStart(m, P, p.vertex, n, d);
}

/**
 * `a` turned by the rotation that takes the unit vector `from` to the unit
 * vector `to` about their common perpendicular (Rodrigues' formula, with
 * w = from × to, c = from · to: a·c + w × a + w (w · a) / (1 + c)); `a`
 * projected onto the plane normal to `to` when the two are opposite.
 */
export function rotateInto(a: Vec3, from: Vec3, to: Vec3): Vec3 {
  const c = dot(from, to);
  if (!(c > -1 + 1e-9)) return projectOut(a, to);
  const w = cross(from, to), wa = cross(w, a), k = dot(w, a) / (1 + c);
  return [a[0] * c + wa[0] + w[0] * k, a[1] * c + wa[1] + w[1] * k, a[2] * c + wa[2] + w[2] * k];
}

/** {@link walkStartOf} at a vertex (see the module comment for the map from the plane to the fan). */
function vertexStart(m: IntrinsicMesh, P: Float64Array, v: number, n: Vec3, d: Vec3): WalkStart | null {
  const t = m.topology, fan = fanOf(t, v), k = fan.length;
  const boundary = t.twin[fan[0]!]! < 0;
  const pv = at(P, v);
  const normals = fan.map((h) => faceNormal(t, P, faceOf(h)));
  // the fan's edges from v (a boundary vertex has one more: the far side of its last face), each turned into the tangent plane
  const ends = fan.map((h) => t.tri[next(h)]!);
  if (boundary) ends.push(t.tri[prev(fan[k - 1]!)]!);
  const dirs = ends.map((w, i) => {
    const nl = i > 0 ? normals[i - 1] : boundary ? null : normals[k - 1];
    const nr = i < k ? normals[i] : null;
    const mean = nl && nr ? unit([nl[0] + nr[0], nl[1] + nr[1], nl[2] + nr[2]]) : nl ?? nr ?? null;
    const e = sub(at(P, w), pv);
    return projectOut(mean ? rotateInto(e, mean, n) : e, n);
  });
  const r1 = unit(dirs[0]!) ?? unit(projectOut(d, n));
  if (!r1) return null;
  const r2 = cross(n, r1);
  const angleOf = (q: Vec3) => Math.atan2(dot(q, r2), dot(q, r1));
  const delta = angleOf(d);
  const alpha = fan.map((h) => cornerAngleAt(m, h));
  const start = (h: number, gamma: number): WalkStart => ({ base: h, x: 0, y: 0, dx: Math.cos(gamma), dy: Math.sin(gamma), entry: 'vertex' });
  for (let i = 0; i < k; i++) {
    const a = angleOf(dirs[i]!), c = angleOf(dirs[(i + 1) % dirs.length]!);
    const width = mod2pi(c - a);
    let off = mod2pi(delta - a);
    if (off > TWO_PI - 1e-12) off = 0;
    if (width < Math.PI && off <= width + 1e-12) return start(fan[i]!, Math.min(1, width > 0 ? off / width : 0) * alpha[i]!);
  }
  if (boundary) return null;
  // a fan folded over in the plane: scale the angle from the first edge by θ / 2π
  const theta = alpha.reduce((s, x) => s + x, 0);
  let phi = (mod2pi(delta) / TWO_PI) * theta, j = 0;
  while (j < k - 1 && phi >= alpha[j]!) phi -= alpha[j++]!;
  return start(fan[j]!, Math.min(Math.max(phi, 0), alpha[j]!));
}
