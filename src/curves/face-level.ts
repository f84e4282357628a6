/**
 * The level curve of a distance field inside one face (exact-level.ts):
 * pieces bent to the level between their crossings, loops round a point
 * source that cross no edge, and the test of whether the sublevel set joins
 * two arcs of a face's boundary.
 *
 * The curve inside a face. Between its two crossings a piece is bent to the
 * level: from the midpoint of a chord, the level is found along the chord's
 * perpendicular in the face (regula falsi, on the side the field says), and the
 * chord is split there until each chord's sagitta is at most
 * {@link SAGITTA_RATIO} of its length and its quarter points are no farther
 * from the level (which catches corners of the curve, where fronts meet).
 * For a circular arc that bounds the length error by about
 * SAGITTA_RATIO²·8/3 relative, 2.4e-5.
 *
 * Loops inside a face. Round a point source inside a face, a level smaller
 * than the distance to the face's edges crosses no edge. There the exact
 * field is the Euclidean distance in the face's plane, so the loop is the
 * circle of radius L, sampled with a chord error (sagitta) of at most
 * {@link LOOP_SAGITTA}·L. A loop round several sources inside one face, or
 * round a curve source lying wholly inside one face (the boundary of a
 * union of discs and stadiums), or round a point source in a face whose
 * lengths in the measured metric are not those of the embedding (a user
 * metric: the loop is no circle of the face's plane), is not traced: the
 * caller reports such faces (`untraced`) so that no one says nothing lies
 * at that level.
 */
import type { Topology } from '../mesh/topology.js';
import { surfacePointPosition, type SurfacePoint } from '../mesh/surface-point.js';
import { levelRoot } from './edge-level.js';

/** Barycentric coordinates in a face. */
export type Bary = [number, number, number];

/** Largest sagitta of a chord of a piece of curve inside a face, relative to the chord. */
export const SAGITTA_RATIO = 3e-3;
/** Largest sagitta of the sampled loop round a point source, relative to the level. */
export const LOOP_SAGITTA = 1e-4;

/** A chained piece of level curve: points with their surface points, and whether it closes. */
export interface LevelPolyline {
  closed: boolean;
  points: [number, number, number][];
  surfacePoints: SurfacePoint[];
}

/** Position in space of barycentric point b of face f. */
export function position(t: Topology, P: Float64Array, f: number, b: Bary): [number, number, number] {
  const o: [number, number, number] = [0, 0, 0];
  surfacePointPosition({ kind: 'face', face: f, bary: b }, t, P, o);
  return o;
}

/** Field units per embedding unit in face g: its metric perimeter over its perimeter in space (1 without a user metric); 1 when either is 0. */
export function metricScale(t: Topology, P: Float64Array, len: Float64Array, g: number): number {
  let m = 0, e = 0;
  for (let k = 0; k < 3; k++) {
    const a = 3 * t.tri[3 * g + k]!, b = 3 * t.tri[3 * g + (k + 1) % 3]!;
    e += Math.hypot(P[b]! - P[a]!, P[b + 1]! - P[a + 1]!, P[b + 2]! - P[a + 2]!);
    m += len[t.edgeOf[3 * g + k]!]!;
  }
  const r = m / e;
  return r > 0 && r < Infinity ? r : 1;
}

/** True when face g's edge lengths in the field's metric are those of the embedding (so a circle in the face's plane is the level set). */
export function embeddedLengths(t: Topology, P: Float64Array, len: Float64Array, g: number): boolean {
  for (let k = 0; k < 3; k++) {
    const a = 3 * t.tri[3 * g + k]!, b = 3 * t.tri[3 * g + (k + 1) % 3]!;
    const l3 = Math.hypot(P[b]! - P[a]!, P[b + 1]! - P[a + 1]!, P[b + 2]! - P[a + 2]!), l = len[t.edgeOf[3 * g + k]!]!;
    if (!(Math.abs(l - l3) <= 1e-9 * Math.max(l, l3))) return false;
  }
  return true;
}

/** True when the field is below L at 15 evenly spaced points strictly between a and b in face g. */
export function segmentBelow(at: (g: number, b: Bary) => number, g: number, a: Bary, b: Bary, L: number): boolean {
  for (let i = 1; i < 16; i++) {
    const u = i / 16;
    if (!(at(g, [a[0] + u * (b[0] - a[0]), a[1] + u * (b[1] - a[1]), a[2] + u * (b[2] - a[2])]) < L)) return false;
  }
  return true;
}

/** Unit normal and the map from a 3D direction in face g's plane to a barycentric direction. */
function faceFrame(t: Topology, P: Float64Array, g: number) {
  const A = 3 * t.tri[3 * g]!, B = 3 * t.tri[3 * g + 1]!, C = 3 * t.tri[3 * g + 2]!;
  const e1 = [P[B]! - P[A]!, P[B + 1]! - P[A + 1]!, P[B + 2]! - P[A + 2]!];
  const e2 = [P[C]! - P[A]!, P[C + 1]! - P[A + 1]!, P[C + 2]! - P[A + 2]!];
  const n = [e1[1]! * e2[2]! - e1[2]! * e2[1]!, e1[2]! * e2[0]! - e1[0]! * e2[2]!, e1[0]! * e2[1]! - e1[1]! * e2[0]!];
  const nl = Math.hypot(n[0]!, n[1]!, n[2]!);
  const dot = (x: number[], y: number[]) => x[0]! * y[0]! + x[1]! * y[1]! + x[2]! * y[2]!;
  const a11 = dot(e1, e1), a12 = dot(e1, e2), a22 = dot(e2, e2), det = a11 * a22 - a12 * a12;
  const toBary = (d: number[]): Bary => {
    const r1 = dot(e1, d), r2 = dot(e2, d);
    const u = (a22 * r1 - a12 * r2) / det, v = (a11 * r2 - a12 * r1) / det;
    return [-u - v, u, v];
  };
  return { n: nl > 0 ? n.map((x) => x / nl) : null, toBary, ok: nl > 0 && det > 0 };
}

/** Adds, between a and b (excluded), points of the level curve in face g (see the module comment). */
export function bend(t: Topology, P: Float64Array, at: (g: number, b: Bary) => number, g: number, a: Bary, b: Bary, L: number, out: Bary[], depth: number, rho: number): void {
  if (depth > 12) return;
  const fr = faceFrame(t, P, g);
  if (!fr.ok || !fr.n) return;
  const pa = position(t, P, g, a), pb = position(t, P, g, b);
  const chord = [pb[0] - pa[0], pb[1] - pa[1], pb[2] - pa[2]], cl = Math.hypot(chord[0]!, chord[1]!, chord[2]!);
  if (!(cl > 0)) return;
  const n = fr.n;
  const left = [n[1]! * chord[2]! - n[2]! * chord[1]!, n[2]! * chord[0]! - n[0]! * chord[2]!, n[0]! * chord[1]! - n[1]! * chord[0]!];
  const m: Bary = [(a[0] + b[0]) / 2, (a[1] + b[1]) / 2, (a[2] + b[2]) / 2];
  const gm = at(g, m) - L;
  if (gm === 0 || !Number.isFinite(gm)) return;
  // lower values on the left: a midpoint below the level has the curve on its right
  const db = fr.toBary(gm < 0 ? left.map((x) => -x) : left);
  let smax = Infinity;
  for (let k = 0; k < 3; k++) if (db[k]! < 0) smax = Math.min(smax, -m[k]! / db[k]!);
  if (!(smax > 0 && smax < Infinity)) return;
  const pt = (s: number): Bary => [Math.max(0, m[0] + s * db[0]!), Math.max(0, m[1] + s * db[1]!), Math.max(0, m[2] + s * db[2]!)];
  const h = (u: number) => at(g, pt(u)) - L;
  // a short bracket first: a distance changes by at most the distance moved, so the level lies at
  // least |gm| away, and about there when the curve runs along the chord (s = 1 moves |chord|);
  // under a user metric the guess may miss, and the whole width to the face's edge is taken
  const sb = Math.min(smax, (2 * Math.abs(gm)) / (rho * cl));
  const hb = sb < smax ? h(sb) : NaN;
  let root: number;
  if (sb < smax && (hb < 0) !== (gm < 0)) root = levelRoot(h, 0, gm, sb, hb, 1e-13 * smax);
  else {
    const ge = h(smax);
    if ((ge < 0) === (gm < 0)) return; // no bracket inside the face: keep the chord
    root = sb < smax ? levelRoot(h, sb, hb, smax, ge, 1e-13 * smax) : levelRoot(h, 0, gm, smax, ge, 1e-13 * smax);
  }
  const x = pt(root), sum = x[0] + x[1] + x[2];
  const xb: Bary = [x[0] / sum, x[1] / sum, x[2] / sum];
  const px = position(t, P, g, xb);
  const pm = position(t, P, g, m);
  const sag = Math.hypot(px[0] - pm[0], px[1] - pm[1], px[2] - pm[2]);
  // the chord is kept when the curve's midpoint is within the bound and the chord's quarter points
  // are not farther from the level than that (a distance changes by at most the distance moved, so
  // |d(q) − L| is at most q's distance from the curve; rho turns the field's units into the
  // embedding's, so a uniformly scaled metric makes the same choices): the midpoint alone is fooled where the
  // curve has a corner (two fronts meeting), the quarter points catch it
  const lim = SAGITTA_RATIO * cl;
  const quarter = (u: number): number => (1 / rho) * Math.abs(at(g, [a[0] + u * (b[0] - a[0]), a[1] + u * (b[1] - a[1]), a[2] + u * (b[2] - a[2])]) - L);
  const q1 = quarter(0.25), q3 = quarter(0.75);
  if (!Number.isFinite(q1) || !Number.isFinite(q3)) { out.push(xb); return; } // unreached points (cannot happen inside a crossed face): no further bending
  if (sag <= lim && q1 <= lim && q3 <= lim) return;
  bend(t, P, at, g, a, xb, L, out, depth + 1, rho);
  out.push(xb);
  bend(t, P, at, g, xb, b, L, out, depth + 1, rho);
}

/** The circle of radius L round barycentric point c of face g, when it fits inside the face (else null). */
export function faceLoop(t: Topology, P: Float64Array, g: number, c: Bary, L: number): LevelPolyline | null {
  const fr = faceFrame(t, P, g);
  if (!fr.ok || !fr.n) return null;
  const C = position(t, P, g, c);
  // the circle fits when L is below the distance from C to each edge line (height × barycentric coordinate)
  for (let k = 0; k < 3; k++) {
    const a = 3 * t.tri[3 * g + (k + 1) % 3]!, b = 3 * t.tri[3 * g + (k + 2) % 3]!;
    const ab = [P[b]! - P[a]!, P[b + 1]! - P[a + 1]!, P[b + 2]! - P[a + 2]!];
    const ac = [C[0] - P[a]!, C[1] - P[a + 1]!, C[2] - P[a + 2]!];
    const cr = Math.hypot(ab[1]! * ac[2]! - ab[2]! * ac[1]!, ab[2]! * ac[0]! - ab[0]! * ac[2]!, ab[0]! * ac[1]! - ab[1]! * ac[0]!);
    if (!(cr / Math.hypot(ab[0]!, ab[1]!, ab[2]!) > L)) return null;
  }
  const A = 3 * t.tri[3 * g]!, B = 3 * t.tri[3 * g + 1]!;
  const e1 = [P[B]! - P[A]!, P[B + 1]! - P[A + 1]!, P[B + 2]! - P[A + 2]!];
  const l1 = Math.hypot(e1[0]!, e1[1]!, e1[2]!);
  const u = e1.map((x) => x / l1), n = fr.n;
  const v = [n[1]! * u[2]! - n[2]! * u[1]!, n[2]! * u[0]! - n[0]! * u[2]!, n[0]! * u[1]! - n[1]! * u[0]!]; // n × u: counter-clockwise
  // sagitta L(1 − cos(θ/2)) ≤ LOOP_SAGITTA·L
  const N = Math.max(8, Math.ceil((2 * Math.PI) / (2 * Math.acos(1 - LOOP_SAGITTA))));
  const points: [number, number, number][] = [], surfacePoints: SurfacePoint[] = [];
  for (let i = 0; i <= N; i++) {
    const phi = (2 * Math.PI * (i % N)) / N, cs = Math.cos(phi) * L, sn = Math.sin(phi) * L;
    const d = [cs * u[0]! + sn * v[0]!, cs * u[1]! + sn * v[1]!, cs * u[2]! + sn * v[2]!];
    const db = fr.toBary(d);
    const b: Bary = [c[0] + db[0], c[1] + db[1], c[2] + db[2]];
    points.push(position(t, P, g, b));
    surfacePoints.push({ kind: 'face', face: g, bary: b });
  }
  return { closed: true, points, surfacePoints };
}
