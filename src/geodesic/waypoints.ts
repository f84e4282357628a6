/**
 * Shortest paths through waypoints: each consecutive pair of stops is joined
 * by an exact shortest path, and the legs are concatenated. A leg is found
 * by window propagation (a two-point query that stops as soon as the next
 * stop is settled) or by intrinsic edge flips from the edge-graph shortest
 * route (flip/index.ts); `WaypointOptions.method` picks.
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { checkSurfacePoint, formatSurfacePoint } from '../mesh/surface-point.js';
import { isOrthodromeError, limitError, usageError } from '../errors.js';
import { checkEdgeLengths } from './solver.js';
import type { SurfacePath } from './shared/field.js';
import { exactDistance, type ExactResult } from './exact/index.js';
import { DEFAULT_MAX_PINCH_SOLVES } from './pinch.js';
import { prepareExactGeometry } from './exact/geometry.js';
import { commonFaces, inFaceDistance } from '../metric/face-points.js';
import { flipGeodesicPath } from './flip/index.js';
import { verifyShortest, lengthsFromPositions } from './flip/verify.js';

/** How the legs of a path are found: see {@link WaypointOptions.method}. */
export type PathMethod = 'auto' | 'flip' | 'windows';

/** Faces from which `method: 'auto'` uses edge flips (window propagation below). */
export const AUTO_FLIP_FACES = 50_000;

/**
 * Default of `WaypointOptions.verifyFaces` with `method: 'flip'`: the largest region a flip leg is
 * proven shortest on by window propagation. Past it the leg keeps its certified bound (`excessBound`).
 */
export const FLIP_VERIFY_FACES = 50_000;

/**
 * Default of `WaypointOptions.verifyFaces` with `method: 'auto'`. The proof costs window
 * propagation on the region: measured on noisy terrain, 4.4–5.4 s for the 396k-face region of a
 * 1M-face mesh corner to corner (quiet machine), 6.3 s for the 75.6k-face region of a 200k-face
 * one (loaded machine), so 10–80 µs per region face. Up to 50k faces that is a few seconds at
 * most; larger regions are returned with their certified bound (raise `verifyFaces` to prove).
 */
export const AUTO_PROVE_FACES = 50_000;

/** A path through waypoints with per-point bookkeeping. */
export interface WaypointPath {
  /** The whole path (legs joined; the shared stop appears once); empty when some leg is unreachable. */
  path: SurfacePath;
  /** Total length, mesh units (Infinity when some leg has no path). */
  length: number;
  /**
   * Each leg, its length, the method that found it (absent: windows), whether it is
   * proven shortest (absent: true; false for a flip leg that could not be checked) and a
   * certified bound on how much longer than the shortest it can be, relative (0 when proven;
   * absent when unknown: an unproven leg without positions).
   */
  legs: { path: SurfacePath; length: number; method?: 'flip' | 'windows'; proven?: boolean; excessBound?: number }[];
  /**
   * Certified bound on the relative excess of `length` over the shortest path through the
   * stops in order: the largest leg bound (Σ Lᵢ ≤ (1 + max εᵢ) Σ dᵢ); Infinity when some
   * unproven leg has no bound; 0 (or absent) when every leg is proven.
   */
  excessBound?: number;
  /** Cumulative intrinsic length at each point of `path`. */
  cumulative: Float64Array;
  /** A face containing the segment from each point to the next (the last point: from the previous). */
  faces: Int32Array;
}

/** Options of {@link shortestPathThrough}. */
export interface WaypointOptions {
  /** Memory budget of each exact run, bytes (see ExactOptions). */
  memoryBudget?: number;
  /**
   * Pinch points: the copies of each vertex split where sheets meet (e.g.
   * `PointResolver.splitGroups()`); paths may pass through them (see pinch.ts).
   */
  pinches?: number[][];
  /** Most extra exact runs per leg for pinch points (default 256) before a `LIMIT` error. */
  maxPinchSolves?: number;
  /**
   * `windows`: window propagation for every leg (the shortest path, proven). `flip`: legs
   * by intrinsic edge flips from the edge-graph shortest route (a geodesic, the shortest in
   * that route's homotopy class; much faster on large meshes); points off the vertices are
   * inserted as vertices first; legs between two such points on one face, legs whose stop
   * has several copies (a split vertex), and legs where the flips do not converge use windows.
   * `auto` (default): `windows` below {@link AUTO_FLIP_FACES} faces or without `positions`; else flips, each
   * leg then checked as with `flip`: proven shortest (or replaced) when the ellipsoid region has at
   * most `verifyFaces` faces, otherwise returned unproven with its certified `excessBound`
   * (from the straight 3D chord, flip/verify.ts). Paths through pinch points always use windows.
   */
  method?: PathMethod;
  /**
   * x, y, z per vertex, the positions the edge lengths were measured from (the check and the
   * bound rest on the straight 3D distance being at most the surface distance, which holds
   * only then). With them every flip leg is checked (flip/verify.ts): window
   * propagation on the faces within the ellipsoid |x − a| + |x − b| ≤ its length, which holds
   * every shorter path, proves it shortest or finds the shorter one, when that region has at
   * most `verifyFaces` faces. Without them a flip leg is a geodesic only; beyond that, a geodesic
   * with a certified bound on its excess over the shortest (`excessBound`).
   */
  positions?: Float64Array;
  /** Largest region (faces) a flip leg is proven on (default {@link FLIP_VERIFY_FACES} with `flip`, {@link AUTO_PROVE_FACES} with `auto`; Infinity: always, the memory budget bounding it). */
  verifyFaces?: number;
}

/**
 * One leg: the shortest path from any of `as` to the nearest of `bs`. With
 * pinch points, a Dijkstra over them as in pinch.ts (each run a whole
 * field), then the path is unwound run by run; it lists both copies where it
 * passes a pinch point.
 */
function legPath(run: (from: SurfacePoint[], targets?: SurfacePoint[]) => ExactResult, as: SurfacePoint[], bs: SurfacePoint[], pinches: number[][], cap: number): SurfacePath {
  const runs: { offset: number; r: ExactResult; from: number; via: SurfacePoint | null }[] = [
    { offset: 0, r: pinches.length ? run(as) : run(as, bs), from: -1, via: null },
  ];
  const done = new Uint8Array(pinches.length);
  for (;;) {
    let g = -1, m = Infinity, k = -1, c = -1;
    pinches.forEach((copies, i) => {
      if (done[i]) return;
      runs.forEach((R, j) => { for (const v of copies) if (R.offset + R.r.field.distance[v]! < m) { m = R.offset + R.r.field.distance[v]!; g = i; k = j; c = v; } });
    });
    if (g < 0) break;
    if (runs.length > cap) throw limitError(`a path leg reaches more than ${cap} pinch points (vertices split where sheets meet); raise maxPinchSolves or repair the mesh`, 'pinch points');
    done[g] = 1;
    runs.push({ offset: m, r: run(pinches[g]!.map((vertex) => ({ kind: 'vertex', vertex }))), from: k, via: { kind: 'vertex', vertex: c } });
  }
  // the nearest spelling of the next stop (copies of a split vertex: the one reached first), by any run
  let best = Infinity, K = -1, end: SurfacePoint = bs[0]!;
  runs.forEach((R, j) => { for (const b of bs) { const x = R.offset + R.r.distanceAt(b); if (x < best) { best = x; K = j; end = b; } } });
  if (K < 0) return { points: [], length: Infinity };
  const segments: SurfacePoint[][] = [];
  for (let j = K, target: SurfacePoint | null = end; j >= 0 && target; target = runs[j]!.via, j = runs[j]!.from) {
    segments.unshift(runs[j]!.r.pathTo(target).points);
  }
  return { points: segments.flat(), length: best };
}

/**
 * Exact shortest path visiting `stops` in order. The metric is checked
 * (`checkEdgeLengths`) and every stop is validated
 * (`USAGE` error naming it, see `checkSurfacePoint`). When some leg has no
 * path (its stops lie on different components) the result is "unreachable":
 * `length` is Infinity, `path` is empty (legs are never joined across a
 * gap), and `legs` tells which leg failed (its length is Infinity).
 * `opts.memoryBudget` bounds each leg's exact run (bytes; see ExactOptions);
 * with `opts.pinches`, legs may pass through pinch points.
 *
 * A stop may be given as several points that are one point of the surface
 * as given (the copies of a vertex split while building, see
 * `PointResolver.copies`): each leg leaves from all of them and arrives at
 * the one it reaches first. Where the path passes from one copy to another
 * it lists both (same position, no face between them: `faces` is −1 there
 * and `cumulative` does not grow).
 */
export function shortestPathThrough(mesh: IntrinsicMesh, stops0: (SurfacePoint | SurfacePoint[])[], opts: WaypointOptions = {}): WaypointPath {
  checkEdgeLengths(mesh, 'path');
  const stops = stops0.map((p, i) => (Array.isArray(p) ? p : [p]).map((q) => checkSurfacePoint(q, mesh.topology, `stop ${i}`)));
  if (stops.some((s) => s.length === 0)) throw usageError('a stop needs at least one point', 'path');
  const legs: { path: SurfacePath; length: number; method: 'flip' | 'windows'; proven: boolean; excessBound?: number }[] = [];
  const points: SurfacePoint[] = [];
  let length = 0;
  const method = opts.method ?? 'auto';
  if (method !== 'auto' && method !== 'flip' && method !== 'windows') throw usageError(`unknown path method '${String(method)}' (auto, flip or windows)`, 'path');
  // positions serve the check only when the lengths are theirs (not a metric of the user's own)
  const big = mesh.topology.nf >= AUTO_FLIP_FACES;
  const positions = opts.positions && (method === 'flip' || (method === 'auto' && big)) && lengthsFromPositions(mesh, opts.positions) ? opts.positions : undefined;
  // auto flips only where it can check each leg (positions that gave the lengths); otherwise windows, as before
  const flips = !opts.pinches?.length && (method === 'flip' || (method === 'auto' && big && positions !== undefined));
  let geometry: ReturnType<typeof prepareExactGeometry> | undefined; // made on the first window leg
  for (let i = 0; i + 1 < stops.length; i++) {
    const run = (from: SurfacePoint[], targets?: SurfacePoint[]) => exactDistance(mesh, { points: from, curves: [] }, {
      geometry: (geometry ??= prepareExactGeometry(mesh)), ...(targets ? { targets } : {}), ...(opts.memoryBudget !== undefined ? { memoryBudget: opts.memoryBudget } : {}),
    });
    const a = stops[i]!, b = stops[i + 1]!;
    const f = flips && a.length === 1 && b.length === 1 ? flipGeodesicPath(mesh, a[0]!, b[0]!) : null;
    let p: SurfacePath, how: 'flip' | 'windows' = 'windows', proven = true, excess: number | undefined = 0;
    if (f && f.status === 'ok') {
      p = f.path; how = 'flip'; proven = p.length === 0; // a point to itself: nothing is shorter
      if (!proven) excess = undefined;
      if (positions && p.length > 0) {
        const limit = opts.verifyFaces ?? (method === 'auto' ? AUTO_PROVE_FACES : FLIP_VERIFY_FACES);
        let v: ReturnType<typeof verifyShortest>;
        try {
          v = verifyShortest(mesh, positions, a[0]!, b[0]!, p.length, limit, opts.memoryBudget);
        } catch (err) {
          if (!isOrthodromeError(err) || err.code !== 'LIMIT') throw err;
          throw limitError(`${err.detail}; this was the proof that a path found by edge flips is the shortest: a smaller face limit on the proof (--prove-limit) returns the geodesic unproven, with its certified bound, instead`, err.location);
        }
        if (v.status !== 'skipped') proven = true;
        excess = v.excess;
        if (v.status === 'shorter') { p = v.path!; how = 'windows'; }
      }
    } else if (f && f.status === 'unreachable') {
      p = f.path;
    } else {
      p = legPath(run, a, b, opts.pinches ?? [], opts.maxPinchSolves ?? DEFAULT_MAX_PINCH_SOLVES);
    }
    legs.push({ path: p, length: p.length, method: how, proven, ...(excess !== undefined ? { excessBound: excess } : {}) });
    length += p.length;
    if (!Number.isFinite(p.length)) continue;
    // legs share their stop; a leg may leave from another copy of it (same position), kept then
    const last = points[points.length - 1];
    points.push(...(last && p.points[0] && formatSurfacePoint(last) === formatSurfacePoint(p.points[0]) ? p.points.slice(1) : p.points));
  }
  const excessBound = legs.reduce((m, l) => Math.max(m, l.excessBound ?? Infinity), 0);
  if (!Number.isFinite(length)) {
    return { path: { points: [], length: Infinity }, length: Infinity, legs, excessBound, cumulative: new Float64Array(0), faces: new Int32Array(0) };
  }
  const t = mesh.topology;
  const n = points.length;
  const cumulative = new Float64Array(n);
  const faces = new Int32Array(n).fill(-1);
  for (let i = 1; i < n; i++) {
    const { distance, face } = inFaceDistance(mesh, points[i - 1]!, points[i]!);
    cumulative[i] = cumulative[i - 1]! + (Number.isFinite(distance) ? distance : 0);
    faces[i - 1] = face;
  }
  if (n > 1) faces[n - 1] = faces[n - 2]!;
  else if (n === 1) faces[0] = commonFaces(t, points[0]!, points[0]!)[0] ?? -1;
  return { path: { points, length }, length, legs, excessBound, cumulative, faces };
}
