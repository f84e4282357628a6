/**
 * Polygon faces to triangles by ear clipping in each polygon's best-fit plane.
 *
 * Per polygon P0..Pn-1 (n ≥ 4):
 * 1. Newell normal N = Σ (Pi − c) × (Pi+1 − c), c the vertex mean (subtracting
 *    c keeps map-sized coordinates such as x ≈ 512000 precise). Its direction
 *    is the polygon's orientation, so the polygon is counter-clockwise in the
 *    plane basis (u, v) with u × v = N/|N|.
 * 2. An ear is a corner (a, i, c) of the remaining polygon that turns left
 *    (signed area > tolerance, so no flipped or zero-area triangle) and whose
 *    closed triangle holds no other remaining vertex:
 *
 *          c ─────── ...          clip (a, i, c), drop i,
 *         ╱ ╲                     repeat until 3 corners are left
 *        i   ╲
 *         ╲   ╲
 *          a ─ ...
 *
 *    Among the ears, one next to a straight corner (collinear neighbours) goes
 *    first, since a straight corner can only be clipped after its corner
 *    changes; otherwise the best-shaped one (largest 2·area / Σ side²). This
 *    search runs for polygons up to {@link BEST_EAR_LIMIT} corners; larger
 *    ones take the first ear found, and test emptiness against the corners
 *    that do not turn left only (a simple polygon's ear candidate that holds
 *    any vertex holds a reflex one: Eberly, "Triangulation by Ear Clipping",
 *    2002). A convex n-gon cap, common in CAD exports, then clips in O(n)
 *    instead of O(n²) (20 000 corners: 6.7 s before).
 * 3. When no ear exists (self-intersecting or folded input) the left-turning
 *    corner with the largest area is clipped; when no corner turns left at all
 *    (collinear or degenerate remainder) the rest is fanned.
 *
 * Triangles pass through unchanged; an all-triangle mesh takes a fast path.
 */
import type { MeshData } from '../io/mesh-data.js';

/** Triangles of a polygon mesh and the input face each came from. */
export interface Triangulation {
  /** Three vertex indices per triangle. */
  triangles: Uint32Array;
  /** Input polygon index of each triangle. */
  source: Uint32Array;
}

/** Largest polygon for which the best-shaped ear is searched (O(n³) there). */
export const BEST_EAR_LIMIT = 32;

/** Reused per-polygon workspace, grown to the largest polygon seen. */
interface Work {
  xy: Float64Array;
  nextOf: Int32Array;
  prevOf: Int32Array;
  /** Large polygons: corners that do not turn left (may hold stale entries), and flags. */
  reflex: Int32Array;
  inReflex: Uint8Array;
  alive: Uint8Array;
}

function newWork(n: number): Work {
  return {
    xy: new Float64Array(2 * n), nextOf: new Int32Array(n), prevOf: new Int32Array(n),
    reflex: new Int32Array(n), inReflex: new Uint8Array(n), alive: new Uint8Array(n),
  };
}

function workFor(w: Work, n: number): Work {
  if (w.nextOf.length >= n) return w;
  return newWork(n);
}

/** Twice the signed area of (a, b, c) in the plane. */
function orient(xy: Float64Array, a: number, b: number, c: number): number {
  const ax = xy[2 * a]!, ay = xy[2 * a + 1]!;
  return (xy[2 * b]! - ax) * (xy[2 * c + 1]! - ay) - (xy[2 * b + 1]! - ay) * (xy[2 * c]! - ax);
}

/** Triangulates every polygon of `m` (triangles pass through unchanged). */
export function triangulate(m: MeshData): Triangulation {
  const FO = m.faceOffsets, FI = m.faceIndices;
  const nf = FO.length - 1;
  let allTri = FI.length === 3 * nf;
  for (let f = 0; allTri && f <= nf; f++) allTri = FO[f] === 3 * f;
  if (allTri) {
    const source = new Uint32Array(nf);
    for (let f = 0; f < nf; f++) source[f] = f;
    return { triangles: FI.slice(), source };
  }
  let nt = 0;
  for (let f = 0; f < nf; f++) nt += Math.max(0, FO[f + 1]! - FO[f]! - 2);
  const triangles = new Uint32Array(3 * nt);
  const source = new Uint32Array(nt);
  let w: Work = newWork(0);
  let t = 0;
  for (let f = 0; f < nf; f++) {
    const s = FO[f]!, n = FO[f + 1]! - s;
    if (n < 3) continue;
    if (n === 3) {
      triangles[3 * t] = FI[s]!; triangles[3 * t + 1] = FI[s + 1]!; triangles[3 * t + 2] = FI[s + 2]!;
      source[t++] = f;
      continue;
    }
    w = workFor(w, n);
    const t1 = clipPolygon(m.positions, FI, s, n, w, triangles, t);
    source.fill(f, t, t1);
    t = t1;
  }
  return { triangles, source };
}

/**
 * Projects polygon `FI[s..s+n)` to its Newell plane into `w.xy`. Returns the
 * signed-area tolerance below which a corner counts as straight, or -1 when
 * the polygon has no area. The tolerance covers relative rounding (1e-12 of
 * the squared size r²) and the absolute rounding of the input coordinates:
 * a coordinate of magnitude M carries an error up to δ = 4·ε·M, which moves
 * twice a corner's area by about δ·r per side.
 */
function project(P: Float64Array, FI: Uint32Array, s: number, n: number, xy: Float64Array): number {
  let cx = 0, cy = 0, cz = 0;
  for (let k = 0; k < n; k++) {
    const o = 3 * FI[s + k]!;
    cx += P[o]!; cy += P[o + 1]!; cz += P[o + 2]!;
  }
  cx /= n; cy /= n; cz /= n;
  let nx = 0, ny = 0, nz = 0, r2 = 0, big = 0;
  for (let k = 0; k < n; k++) {
    const o = 3 * FI[s + k]!, q = 3 * FI[s + ((k + 1) % n)]!;
    const ax = P[o]! - cx, ay = P[o + 1]! - cy, az = P[o + 2]! - cz;
    const bx = P[q]! - cx, by = P[q + 1]! - cy, bz = P[q + 2]! - cz;
    nx += ay * bz - az * by; ny += az * bx - ax * bz; nz += ax * by - ay * bx;
    r2 = Math.max(r2, ax * ax + ay * ay + az * az);
    big = Math.max(big, Math.abs(P[o]!), Math.abs(P[o + 1]!), Math.abs(P[o + 2]!));
  }
  const nl = Math.sqrt(nx * nx + ny * ny + nz * nz);
  if (!(nl > 0) || !Number.isFinite(nl)) return -1;
  nx /= nl; ny /= nl; nz /= nl;
  // u ⟂ N from the coordinate axis least aligned with N; v = N × u.
  const ax = Math.abs(nx), ay = Math.abs(ny), az = Math.abs(nz);
  let ux: number, uy: number, uz: number;
  if (ax <= ay && ax <= az) { ux = 0; uy = -nz; uz = ny; }
  else if (ay <= az) { ux = nz; uy = 0; uz = -nx; }
  else { ux = -ny; uy = nx; uz = 0; }
  const ul = Math.sqrt(ux * ux + uy * uy + uz * uz);
  ux /= ul; uy /= ul; uz /= ul;
  const vx = ny * uz - nz * uy, vy = nz * ux - nx * uz, vz = nx * uy - ny * ux;
  for (let k = 0; k < n; k++) {
    const o = 3 * FI[s + k]!;
    const dx = P[o]! - cx, dy = P[o + 1]! - cy, dz = P[o + 2]! - cz;
    xy[2 * k] = dx * ux + dy * uy + dz * uz;
    xy[2 * k + 1] = dx * vx + dy * vy + dz * vz;
  }
  return 1e-12 * r2 + 16 * Number.EPSILON * big * Math.sqrt(r2);
}

/** Clips polygon `FI[s..s+n)` into `out` from triangle `t`; returns the next free triangle. */
function clipPolygon(P: Float64Array, FI: Uint32Array, s: number, n: number, w: Work, out: Uint32Array, t: number): number {
  const { xy, nextOf, prevOf } = w;
  const tol = project(P, FI, s, n, xy);
  if (!(tol > 0)) {
    for (let k = 1; k + 1 < n; k++) put(out, t++, FI, s, 0, k, k + 1);
    return t;
  }
  for (let k = 0; k < n; k++) { nextOf[k] = (k + 1) % n; prevOf[k] = (k + n - 1) % n; }
  let left = n, start = 0;
  const best = n <= BEST_EAR_LIMIT;
  // large polygons: emptiness is tested against the corners that do not turn left only
  const { reflex, inReflex, alive } = w;
  let nReflex = 0;
  const markIfReflex = (k: number) => {
    if (inReflex[k] || orient(xy, prevOf[k]!, k, nextOf[k]!) > tol) return;
    inReflex[k] = 1;
    reflex[nReflex++] = k;
  };
  if (!best) {
    for (let k = 0; k < n; k++) { alive[k] = 1; inReflex[k] = 0; }
    for (let k = 0; k < n; k++) markIfReflex(k);
  }
  const emptyOfReflex = (a: number, i: number, c: number): boolean => {
    for (let j = 0; j < nReflex; ) {
      const p = reflex[j]!;
      if (!alive[p] || orient(xy, prevOf[p]!, p, nextOf[p]!) > tol) {
        inReflex[p] = 0; // clipped, or turns left now: drop it from the list
        reflex[j] = reflex[--nReflex]!;
        continue;
      }
      j++;
      if (p === a || p === i || p === c) continue;
      const vp = FI[s + p]!;
      if (vp === FI[s + a] || vp === FI[s + i] || vp === FI[s + c]) continue;
      if (dist2(xy, p, a) === 0 || dist2(xy, p, i) === 0 || dist2(xy, p, c) === 0) continue;
      if (orient(xy, a, i, p) >= 0 && orient(xy, i, c, p) >= 0 && orient(xy, c, a, p) >= 0) return false;
    }
    return true;
  };
  while (left > 3) {
    let ear = -1, earQ = -Infinity, bulge = -1, bulgeA = tol;
    let i = start;
    for (let step = 0; step < left; step++, i = nextOf[i]!) {
      const a = prevOf[i]!, c = nextOf[i]!;
      const area = orient(xy, a, i, c);
      if (!(area > tol)) continue;
      if (area > bulgeA) { bulgeA = area; bulge = i; }
      if (!(best ? isEmpty(xy, FI, s, a, i, c, nextOf) : emptyOfReflex(a, i, c))) continue;
      // Straight corners can only go once a neighbour is clipped (their corner
      // then bends), so ears next to one come first; else the best shape.
      const nearStraight = Math.abs(orient(xy, prevOf[a]!, a, i)) <= tol || Math.abs(orient(xy, i, c, nextOf[c]!)) <= tol;
      const q = area / (dist2(xy, a, i) + dist2(xy, i, c) + dist2(xy, c, a)) + (nearStraight ? 1 : 0);
      if (q > earQ) { earQ = q; ear = i; }
      if (!best) break;
    }
    if (ear < 0) ear = bulge;
    if (ear < 0) break;
    const a = prevOf[ear]!, c = nextOf[ear]!;
    put(out, t++, FI, s, a, ear, c);
    nextOf[a] = c; prevOf[c] = a;
    start = c;
    left--;
    if (!best) {
      alive[ear] = 0;
      markIfReflex(a); // a clipped neighbour may turn right on self-intersecting input
      markIfReflex(c);
    }
  }
  // Three corners left, or a remainder without any left turn: fan it.
  const a = start;
  for (let b = nextOf[a]!; nextOf[b]! !== a; b = nextOf[b]!) put(out, t++, FI, s, a, b, nextOf[b]!);
  return t;
}

/** Writes triangle t as corners a, b, c of the polygon starting at `FI[s]`. */
function put(out: Uint32Array, t: number, FI: Uint32Array, s: number, a: number, b: number, c: number): void {
  out[3 * t] = FI[s + a]!;
  out[3 * t + 1] = FI[s + b]!;
  out[3 * t + 2] = FI[s + c]!;
}

function dist2(xy: Float64Array, a: number, b: number): number {
  const dx = xy[2 * a]! - xy[2 * b]!, dy = xy[2 * a + 1]! - xy[2 * b + 1]!;
  return dx * dx + dy * dy;
}

/**
 * True when no remaining corner other than a, i, c (or a copy of one of them,
 * same vertex index or same position) lies in the closed triangle (a, i, c).
 */
function isEmpty(xy: Float64Array, FI: Uint32Array, s: number, a: number, i: number, c: number, nextOf: Int32Array): boolean {
  for (let p = nextOf[c]!; p !== a; p = nextOf[p]!) {
    const vp = FI[s + p]!;
    if (vp === FI[s + a] || vp === FI[s + i] || vp === FI[s + c]) continue;
    if (dist2(xy, p, a) === 0 || dist2(xy, p, i) === 0 || dist2(xy, p, c) === 0) continue;
    if (orient(xy, a, i, p) >= 0 && orient(xy, i, c, p) >= 0 && orient(xy, c, a, p) >= 0) return false;
  }
  return true;
}
