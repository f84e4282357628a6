/**
 * Proof that a path found by edge flips is the shortest one, by window
 * propagation on the part of the surface where a shorter path could run.
 *
 * FlipOut returns a geodesic (locally shortest); another geodesic, in
 * another homotopy class (round another side of a hole, a cube corner or a
 * hill top), may be shorter. Every point x of a shortest path from a to b
 * satisfies |x − a| + |x − b| ≤ d(a, x) + d(x, b) = d(a, b) ≤ L, where L is
 * the flip path's length and |·| the straight 3D distance, which never
 * exceeds the distance on the surface (the chord is a lower bound; common
 * practice). So every shortest path lies in the ellipsoid
 * E = {x : |x − a| + |x − b| ≤ L}, and window propagation (exact, global:
 * src/geodesic/exact) on the faces that meet E finds it: a path on those
 * faces is a path on the surface, and the shortest one is among them.
 * A face meets E only if f(c) − 2r ≤ L at its centroid c, with r its largest
 * centroid-to-corner distance (f = |x − a| + |x − b| is 2-Lipschitz), which
 * is the test used. Coordinates serve this bound only; lengths still come
 * from the mesh's metric.
 *
 * The same chord is a certified lower bound on the distance, d(a, b) ≥ |b − a|,
 * so a path of length L is at most L/|b − a| − 1 longer than the shortest,
 * relatively: {@link chordExcess}. A path as long as the chord (to 1e-9
 * relative, the flat case) is proven shortest without any search. Both
 * hold when the edge lengths are those of the positions (every face is then
 * congruent to its 3D triangle, and a path on the surface is a curve in
 * space of the same length), as for every mesh read from a file.
 */
import type { IntrinsicMesh } from '../../metric/intrinsic.js';
import type { SurfacePath } from '../shared/field.js';
import type { SurfacePoint } from '../../mesh/surface-point.js';
import { buildTopology } from '../../mesh/build.js';
import { next } from '../../mesh/topology.js';
import { exactDistance } from '../exact/index.js';
import { pointSources } from '../shared/sources.js';
import { surfacePointPosition } from '../../mesh/surface-point.js';

const sq = (x: number, y: number, z: number): number => x * x + y * y + z * z;

/** Result of {@link verifyShortest}. */
export interface VerifyResult {
  /**
   * `proven`: no path from a to b is shorter than L (beyond 1e-9 relative); `shorter`: window
   * propagation found a shorter path (in `path`); `skipped`: the region has more than the
   * allowed faces (nothing is known).
   */
  status: 'proven' | 'shorter' | 'skipped';
  /**
   * Certified bound on how much longer than the shortest path the checked path of length L
   * is, relative ((L − d)/d ≤ excess; {@link chordExcess}); 0 when proven, and the shorter
   * path's own bound when one was found (also 0: windows are exact).
   */
  excess: number;
  /** The shorter path, on the input mesh (status `shorter` only). */
  path?: SurfacePath;
  /** Faces of the region (counted up to the limit + 1 when skipped). */
  faces: number;
}

/**
 * Checks whether the path of length `L` from surface point A to surface point B
 * (canonical) is the shortest (see the module comment). `positions` holds
 * x, y, z per vertex of `mesh`; `maxFaces` bounds the region's size;
 * `memoryBudget` is passed to the window run.
 */
export function verifyShortest(mesh: IntrinsicMesh, positions: Float64Array, A: SurfacePoint, B: SurfacePoint, L: number, maxFaces: number, memoryBudget?: number): VerifyResult {
  const t = mesh.topology, P = positions;
  const pa = surfacePointPosition(A, t, P), pb = surfacePointPosition(B, t, P);
  const ax = pa[0]!, ay = pa[1]!, az = pa[2]!, bx = pb[0]!, by = pb[1]!, bz = pb[2]!;
  const excess = chordExcess(L, Math.hypot(bx - ax, by - ay, bz - az));
  if (excess <= 1e-9) return { status: 'proven', faces: 0, excess: 0 }; // as long as the chord: nothing is shorter
  const bound = L * (1 + 1e-9);
  const faces: number[] = [];
  for (let f = 0; f < t.nf; f++) {
    const i = 3 * t.tri[3 * f]!, j = 3 * t.tri[3 * f + 1]!, k = 3 * t.tri[3 * f + 2]!;
    const cx = (P[i]! + P[j]! + P[k]!) / 3, cy = (P[i + 1]! + P[j + 1]! + P[k + 1]!) / 3, cz = (P[i + 2]! + P[j + 2]! + P[k + 2]!) / 3;
    // (square roots of sums of squares: Math.hypot is several times slower, and the 1e-9 slack
    // in `bound` is far above their rounding)
    const r = Math.sqrt(Math.max(sq(P[i]! - cx, P[i + 1]! - cy, P[i + 2]! - cz), sq(P[j]! - cx, P[j + 1]! - cy, P[j + 2]! - cz), sq(P[k]! - cx, P[k + 1]! - cy, P[k + 2]! - cz)));
    const fc = Math.sqrt(sq(cx - ax, cy - ay, cz - az)) + Math.sqrt(sq(cx - bx, cy - by, cz - bz));
    if (!(fc - 2 * r > bound)) {
      faces.push(f);
      if (faces.length > maxFaces) return { status: 'skipped', faces: faces.length, excess };
    }
  }
  // the region as a mesh of its own; sub vertex i is input vertex verts[i]
  const subId = new Map<number, number>(), verts: number[] = [];
  const tris = new Uint32Array(3 * faces.length);
  faces.forEach((f, n) => {
    for (let k = 0; k < 3; k++) {
      const v = t.tri[3 * f + k]!;
      let s = subId.get(v);
      if (s === undefined) { s = verts.length; subId.set(v, s); verts.push(v); }
      tris[3 * n + k] = s;
    }
  });
  const st = buildTopology(tris, verts.length, { orient: false }).topology;
  const orig = (sv: number): number => verts[st.vertexOrigin[sv]!]!;
  // input half-edge of each sub half-edge (same face, same two ends)
  const inputHalfedge = (h: number): number => {
    const F = faces[st.faceOrigin[(h / 3) | 0]!]!, u = orig(st.tri[h]!), w = orig(st.tri[next(h)]!);
    for (let k = 0; k < 3; k++) {
      const H = 3 * F + k;
      if (t.tri[H] === u && t.tri[next(H)] === w) return H;
    }
    return -1;
  };
  const len = new Float64Array(st.ne);
  for (let e = 0; e < st.ne; e++) {
    const H = inputHalfedge(st.edgeHalfedge[e]!);
    if (H < 0) return { status: 'skipped', faces: faces.length, excess }; // the build reoriented a face: no proof
    len[e] = mesh.edgeLength[t.edgeOf[H]!]!;
  }
  const sub: IntrinsicMesh = { topology: st, edgeLength: len };
  // A and B on the region (their faces are in it: f ≤ L there, so f(c) − 2r ≤ L)
  const subFace = new Map<number, number>();
  for (let n = 0; n < st.nf; n++) subFace.set(faces[st.faceOrigin[n]!]!, n);
  const toSub = (p: SurfacePoint): SurfacePoint | null => {
    if (p.kind === 'vertex') {
      for (let s = 0; s < st.nv; s++) if (orig(s) === p.vertex) return { kind: 'vertex', vertex: s };
      return null;
    }
    if (p.kind === 'face') {
      const n = subFace.get(p.face);
      if (n === undefined) return null;
      const bary: [number, number, number] = [0, 0, 0];
      for (let k = 0; k < 3; k++) bary[k] = p.bary[[0, 1, 2].find((j) => t.tri[3 * p.face + j] === orig(st.tri[3 * n + k]!))!]!;
      return { kind: 'face', face: n, bary };
    }
    const H = t.edgeHalfedge[p.edge]!, n = subFace.get((H / 3) | 0);
    if (n === undefined) return null;
    const k = [0, 1, 2].find((j) => inputHalfedge(3 * n + j) === H);
    if (k === undefined) return null;
    const e = st.edgeOf[3 * n + k]!;
    return { kind: 'edge', edge: e, t: st.edgeHalfedge[e] === 3 * n + k ? p.t : 1 - p.t };
  };
  const sa = toSub(A), target = toSub(B);
  if (!sa || !target) return { status: 'skipped', faces: faces.length, excess };
  const run = exactDistance(sub, pointSources([sa]), { targets: [target], ...(memoryBudget !== undefined ? { memoryBudget } : {}) });
  const d = run.distanceAt(target);
  if (!(d < L * (1 - 1e-9))) return { status: 'proven', faces: faces.length, excess: 0 };
  const p = run.pathTo(target);
  const points = p.points.map((q): SurfacePoint => {
    if (q.kind === 'vertex') return { kind: 'vertex', vertex: orig(q.vertex) };
    if (q.kind === 'edge') {
      const h = st.edgeHalfedge[q.edge]!, H = inputHalfedge(h), E = t.edgeOf[H]!;
      return { kind: 'edge', edge: E, t: t.edgeHalfedge[E] === H ? q.t : 1 - q.t };
    }
    const F = faces[st.faceOrigin[q.face]!]!, bary: [number, number, number] = [0, 0, 0];
    for (let k = 0; k < 3; k++) bary[[0, 1, 2].find((j) => t.tri[3 * F + j] === orig(st.tri[3 * q.face + k]!))!] = q.bary[k]!;
    return { kind: 'face', face: F, bary };
  });
  return { status: 'shorter', path: { points, length: p.length }, faces: faces.length, excess: 0 };
}

/**
 * Certified relative excess of a path of length `L` over the shortest one between two points
 * whose straight 3D distance is `chord` (a lower bound on their distance on the surface, see the
 * module comment): (L − c)/c with c = chord·(1 − 1e-12), which covers the rounding of the
 * lengths and of the chord (a few ulps each). Infinity when the chord is 0 (the two ends meet in
 * space only) and L is not.
 */
export function chordExcess(L: number, chord: number): number {
  if (!(L > 0)) return 0;
  const c = chord * (1 - 1e-12);
  return c > 0 ? Math.max(0, (L - c) / c) : Infinity;
}

/**
 * True when every edge length of `mesh` is the straight distance between its ends in
 * `positions` (to 1e-12 relative: the rounding of computing it again). Only then is every face
 * congruent to its 3D triangle, so that the chord bounds the surface distance from below and the
 * check above and {@link chordExcess} hold; a metric of the user's own (lengths not from these
 * positions) fails it, and its flip legs are neither proven nor bounded this way.
 */
export function lengthsFromPositions(mesh: IntrinsicMesh, positions: Float64Array): boolean {
  const t = mesh.topology, L = mesh.edgeLength, P = positions;
  if (P.length < 3 * t.nv) return false;
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!, u = 3 * t.tri[h]!, v = 3 * t.tri[next(h)]!;
    const dx = P[u]! - P[v]!, dy = P[u + 1]! - P[v + 1]!, dz = P[u + 2]! - P[v + 2]!;
    const d = Math.sqrt(dx * dx + dy * dy + dz * dz); // a few ulps from any other formula; Math.hypot is slower
    if (!(Math.abs(L[e]! - d) <= 1e-12 * d)) return false;
  }
  return true;
}
