/**
 * Distances on a non-orientable surface (Möbius strip, Klein bottle) through
 * its orientation double cover.
 *
 * A half-edge topology needs an orientation, so building such a surface cuts
 * it along seams (`BuildReport.orientationSeams`: pairs of boundary
 * half-edges, the two sides of one input edge, running the same way).
 * Solving on the cut surface would forbid paths across the seam. Instead
 * the solvers run on the orientable double cover (a standard construction
 * of topology, e.g. Hatcher, Algebraic Topology, 2002, §3.3): two sheets,
 * sheet 0 with the built faces and sheet 1 with every face reversed; edges
 * off the seams join faces of one sheet, and each seam joins sheet 0 to
 * sheet 1. The covering map is a local isometry, so every path on the
 * surface lifts to a path of the same length on the cover starting at
 * either lift of its start, and the distance between two points of the
 * surface is the least distance between their lifts: sources are seeded at
 * both lifts, and every value is the minimum over the lifts.
 */
import { next, type Topology } from '../mesh/topology.js';
import { buildTopology, findRoot, union } from '../mesh/build.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../metric/intrinsic.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { checkSurfacePoint } from '../mesh/surface-point.js';
import type { SourceSet } from './shared/sources.js';
import type { DistanceMethod, SurfacePath } from './shared/field.js';
import { shortestPathThrough, type WaypointPath } from './waypoints.js';
import { prepareDistance, type DistanceOptions, type DistanceSolver } from './solver.js';
import { baryInFace, commonFaces } from '../metric/face-points.js';
import { boundaryLoops } from '../mesh/boundary.js';
import { usageError } from '../errors.js';

/** The orientation double cover of a built (cut) surface, and its covering map. */
export interface OrientationCover {
  /** The base surface's topology (cut along the seams). */
  readonly base: Topology;
  /** The cover as an intrinsic mesh (lengths from the base positions). */
  readonly mesh: IntrinsicMesh;
  /** x, y, z per cover vertex (that of the point below it). */
  readonly positions: Float64Array;
  /** The lifts of a base surface point: points of the cover over it (two, or one where the sheets meet). */
  lifts(p: SurfacePoint): SurfacePoint[];
  /** Per-base-vertex values from per-cover-vertex values: the minimum over each vertex's lifts. */
  fold(values: Float64Array): Float64Array;
  /** The lifts of a base segment a–b lying on base face f: one two-point curve per sheet. */
  liftSegment(a: SurfacePoint, b: SurfacePoint, f: number): SurfacePoint[][];
  /** The boundary of the surface as given (the seams are not boundary), as base curves of vertices. */
  boundaryCurves(): SurfacePoint[][];
  /** The base point under a cover point (the covering map), in canonical spelling. */
  project(p: SurfacePoint): SurfacePoint;
  /** The base face under a cover face (−1 stays −1). */
  baseFace(F: number): number;
}

/**
 * Builds the orientation double cover of `t` glued along `seams`
 * (`BuildReport.orientationSeams`). `positions` are x, y, z per vertex of `t`;
 * `edgeLength`, when given, is the base's length per edge (a user metric),
 * which each cover edge takes from the base edge below it (the covering map
 * is a local isometry); without it the lengths come from the positions.
 */
export function orientationCover(t: Topology, positions: Float64Array, seams: Int32Array, edgeLength?: Float64Array): OrientationCover {
  const nv = t.nv, nf = t.nf;
  // cover vertices before gluing: (v, sheet) ↦ v + sheet·nv; a seam pair h0 ∥ h1 joins sheet 0's h0
  // with sheet 1's h1 (reversed there, so the two run opposite ways) and sheet 1's h0 with sheet 0's h1
  const parent = new Int32Array(2 * nv);
  for (let i = 0; i < parent.length; i++) parent[i] = i;
  for (let i = 0; i + 1 < seams.length; i += 2) {
    const h0 = seams[i]!, h1 = seams[i + 1]!;
    for (const [a, b] of [[t.tri[h0]!, t.tri[h1]!], [t.tri[next(h0)]!, t.tri[next(h1)]!]] as const) {
      union(parent, a, b + nv);
      union(parent, a + nv, b);
    }
  }
  const cls = (v: number, sheet: number) => findRoot(parent, v + sheet * nv);
  const tris = new Uint32Array(6 * nf);
  for (let f = 0; f < nf; f++) {
    const a = t.tri[3 * f]!, b = t.tri[3 * f + 1]!, c = t.tri[3 * f + 2]!;
    tris.set([cls(a, 0), cls(b, 0), cls(c, 0)], 3 * f);
    tris.set([cls(a, 1), cls(c, 1), cls(b, 1)], 3 * (nf + f));
  }
  const ct = buildTopology(tris, 2 * nv).topology;
  const positions2 = new Float64Array(3 * ct.nv);
  const below = new Int32Array(2 * nv).fill(-1); // glued class → a base vertex under it
  for (let v = 0; v < nv; v++) { below[cls(v, 0)] = v; below[cls(v, 1)] = v; }
  const overClass = new Map<number, number[]>(); // glued class → cover vertices (several if split again)
  for (let u = 0; u < ct.nv; u++) {
    const o = ct.vertexOrigin[u]!, v = below[o]!;
    for (let d = 0; d < 3; d++) positions2[3 * u + d] = positions[3 * v + d]!;
    const list = overClass.get(o);
    if (list) list.push(u); else overClass.set(o, [u]);
  }
  const coverFace = new Int32Array(2 * nf).fill(-1);
  for (let F = 0; F < ct.nf; F++) coverFace[ct.faceOrigin[F]!] = F;
  const mesh = edgeLength ? { topology: ct, edgeLength: liftLengths(t, ct, nf, edgeLength, cls) } : intrinsicFromPositions(ct, positions2);
  const vertexLifts = (v: number): number[] => [...new Set([cls(v, 0), cls(v, 1)])].flatMap((c) => overClass.get(c) ?? []);

  /** The lifts of barycentric point `bary` of base face f, sheet 0 first. */
  const liftInFace = (f: number, bary: ArrayLike<number>): SurfacePoint[] => {
    const out: SurfacePoint[] = [];
    for (let sheet = 0; sheet < 2; sheet++) {
      const F = coverFace[sheet * nf + f]!;
      if (F < 0) continue;
      const b: [number, number, number] = [0, 0, 0];
      for (let k = 0; k < 3; k++) {
        const o = ct.vertexOrigin[ct.tri[3 * F + k]!]!;
        for (let j = 0; j < 3; j++) if (cls(t.tri[3 * f + j]!, sheet) === o) b[k] = bary[j]!;
      }
      out.push(checkSurfacePoint({ kind: 'face', face: F, bary: b }, ct, 'point'));
    }
    return out;
  };
  const lifts = (p0: SurfacePoint): SurfacePoint[] => {
    const p = checkSurfacePoint(p0, t, 'point');
    if (p.kind === 'vertex') return vertexLifts(p.vertex).map((vertex) => ({ kind: 'vertex', vertex }));
    const f = p.kind === 'face' ? p.face : (t.edgeHalfedge[p.edge]! / 3) | 0;
    const b = [0, 0, 0];
    baryInFace(t, f, p, b);
    return liftInFace(f, b);
  };
  const liftSegment = (a: SurfacePoint, b: SurfacePoint, f: number): SurfacePoint[][] => {
    const ba = [0, 0, 0], bb = [0, 0, 0];
    if (!baryInFace(t, f, checkSurfacePoint(a, t, 'curve'), ba) || !baryInFace(t, f, checkSurfacePoint(b, t, 'curve'), bb)) return [];
    const la = liftInFace(f, ba), lb = liftInFace(f, bb);
    return la.map((p, k) => [p, lb[k]!]);
  };
  const seam = new Uint8Array(3 * nf);
  for (const h of seams) seam[h] = 1;
  const boundaryCurves = (): SurfacePoint[][] => {
    const out: SurfacePoint[][] = [];
    for (const loop of boundaryLoops(t)) {
      // runs of non-seam boundary half-edges, started after a seam half-edge when the loop has one
      const n = loop.length, s0 = loop.findIndex((h) => seam[h] === 1);
      let run: SurfacePoint[] = [];
      for (let i = 0; i < n; i++) {
        const h = loop[((s0 < 0 ? 0 : s0 + 1) + i) % n]!;
        if (seam[h]) { if (run.length > 1) out.push(run); run = []; continue; }
        if (run.length === 0) run.push({ kind: 'vertex', vertex: t.tri[h]! });
        run.push({ kind: 'vertex', vertex: t.tri[next(h)]! });
      }
      if (run.length > 1) out.push(run);
    }
    return out;
  };
  const fold = (values: Float64Array): Float64Array => {
    const out = new Float64Array(nv).fill(Infinity);
    for (let v = 0; v < nv; v++) for (const u of vertexLifts(v)) if (values[u]! < out[v]!) out[v] = values[u]!;
    return out;
  };
  const baseFace = (F: number): number => (F < 0 ? -1 : ct.faceOrigin[F]! % nf);
  const project = (q0: SurfacePoint): SurfacePoint => {
    const q = checkSurfacePoint(q0, ct, 'point');
    if (q.kind === 'vertex') return { kind: 'vertex', vertex: below[ct.vertexOrigin[q.vertex]!]! };
    const F = q.kind === 'face' ? q.face : (ct.edgeHalfedge[q.edge]! / 3) | 0;
    const cb = [0, 0, 0];
    baryInFace(ct, F, q, cb);
    const f = baseFace(F), sheet = ct.faceOrigin[F]! >= nf ? 1 : 0;
    const b: [number, number, number] = [0, 0, 0];
    for (let j = 0; j < 3; j++) {
      const c = cls(t.tri[3 * f + j]!, sheet);
      for (let k = 0; k < 3; k++) if (ct.vertexOrigin[ct.tri[3 * F + k]!] === c) b[j] = cb[k]!;
    }
    return checkSurfacePoint({ kind: 'face', face: f, bary: b }, t, 'point');
  };
  return { base: t, mesh, positions: positions2, lifts, fold, liftSegment, boundaryCurves, project, baseFace };
}

/**
 * A {@link DistanceSolver} for a surface with orientation seams: it takes and
 * returns points and per-vertex fields of the base surface, and solves on
 * its double cover (see the module comment).
 */
export function prepareCoverDistance(cover: OrientationCover, method: DistanceMethod, opts: DistanceOptions = {}): DistanceSolver {
  const inner = prepareDistance(cover.mesh, method, opts);
  const liftSet = (s: SourceSet): SourceSet => ({
    points: s.points.flatMap((p) => cover.lifts(p)),
    // a curve lifts segment by segment: each segment lies on a base face, whose two lifts hold it
    curves: s.curves.flatMap((c, ci) =>
      c.slice(1).flatMap((b, i) => {
        const a = c[i]!, f = commonFaces(cover.base, checkSurfacePoint(a, cover.base, `curve ${ci}`), checkSurfacePoint(b, cover.base, `curve ${ci}`))[0];
        if (f === undefined) throw usageError(`points ${i} and ${i + 1} share no face`, `curve ${ci}`);
        return cover.liftSegment(a, b, f);
      }),
    ),
  });
  return {
    method,
    prepareMs: inner.prepareMs,
    prepareDetails: { ...inner.prepareDetails, doubleCover: true },
    solve(sources, so = {}) {
      const targets = so.targets?.flatMap((p) => cover.lifts(p));
      const r = inner.solve(liftSet(sources), { ...so, ...(targets ? { targets } : {}) });
      const field = { ...r.field, distance: cover.fold(r.field.distance), sources: [...sources.points, ...sources.curves.flat()] };
      return { ...r, field, at: (p) => Math.min(...cover.lifts(p).map((q) => r.at(q))) };
    },
  };
}

/**
 * The exact shortest path through `stops` (base points, or lists of
 * equivalent base points) on a surface with orientation seams: traced on the
 * double cover from every lift of each stop, then mapped down. Points are
 * base spellings; across a seam two consecutive points share no base face
 * (they meet through the seam). `cumulative`, `faces` (mapped to base faces)
 * and the lengths are those of the cover path (the covering map keeps
 * lengths).
 */
export function coverPathThrough(cover: OrientationCover, stops: (SurfacePoint | SurfacePoint[])[], opts: { memoryBudget?: number } = {}): WaypointPath {
  const lifted = stops.map((s) => (Array.isArray(s) ? s : [s]).flatMap((p) => cover.lifts(p)));
  const r = shortestPathThrough(cover.mesh, lifted, opts);
  const down = (p: SurfacePath): SurfacePath => ({ points: p.points.map(cover.project), length: p.length });
  return {
    path: down(r.path),
    length: r.length,
    legs: r.legs.map((l) => ({ path: down(l.path), length: l.length })),
    cumulative: r.cumulative,
    faces: r.faces.map(cover.baseFace),
  };
}

/**
 * Cover edge lengths from base edge lengths: a cover edge of cover face F lies
 * over the edge of base face f = `faceOrigin[F] mod nf` (sheet 1 when
 * `faceOrigin[F] ≥ nf`) whose ends lift, on that sheet (`cls`), to the glued
 * vertices at its own ends.
 */
function liftLengths(t: Topology, ct: Topology, nf: number, base: Float64Array, cls: (v: number, sheet: number) => number): Float64Array {
  const out = new Float64Array(ct.ne);
  for (let H = 0; H < ct.tri.length; H++) {
    const o = ct.faceOrigin[(H / 3) | 0]!, f = o % nf, sheet = o >= nf ? 1 : 0;
    const a = ct.vertexOrigin[ct.tri[H]!]!, b = ct.vertexOrigin[ct.tri[H % 3 === 2 ? H - 2 : H + 1]!]!;
    for (let k = 0; k < 3; k++) {
      const h = 3 * f + k, p = cls(t.tri[h]!, sheet), q = cls(t.tri[k === 2 ? h - 2 : h + 1]!, sheet);
      if ((p === a && q === b) || (p === b && q === a)) out[ct.edgeOf[H]!] = base[t.edgeOf[h]!]!;
    }
  }
  return out;
}
