/**
 * Level sets of a distance field known at every surface point (the exact
 * polyhedral distance), found without missing any: where the field is not
 * linear along an edge, an edge can carry 0, 1, 2 or more crossings of a
 * level, with both ends above it (the middle of an edge near a source), and
 * a curve can bend inside a face or lie wholly inside one.
 *
 * Crossings on an edge. The distance d from a source set is 1-Lipschitz
 * along the surface, so along edge e (parameter s ∈ [0, 1], length ℓ in the
 * measured metric) |d(s) − d(s')| ≤ ℓ|s − s'|. On [s0, s1] with end values
 * v0, v1 this bounds d between (v0 + v1 − ℓw)/2 and (v0 + v1 + ℓw)/2,
 * w = s1 − s0 (the Lipschitz global search of S. A. Piyavskii, "An algorithm
 * for finding the absolute extremum of a function", USSR Comput. Math. and
 * Math. Phys. 12(4), 1972, in its interval form): an interval whose bound
 * shows it wholly above (or wholly below) the level holds no crossing and is
 * dropped; the others are halved. An interval whose ends are on different
 * sides holds a crossing, found by regula falsi to {@link ROOT_WIDTH}. So every
 * piece of the level's sublevel set on the edge longer than
 * {@link SEARCH_WIDTH}·ℓ is found: what can be missed is a touch of the
 * level of depth below SEARCH_WIDTH·ℓ/2, where the curve grazes the edge.
 * The search is breadth first with at most {@link MAX_EDGE_EVALS} values
 * per edge: an edge along which the field stays at the level (the level
 * runs along the edge, as on a grid whose lines lie at distance L) spends
 * it, and is then searched to width ℓ/2048 everywhere (f = L counts as
 * above, so such an edge holds no crossing).
 * Vertex ends take the field's vertex values, with f ≥ L "above" (the
 * perturbation rule of crossings.ts), so the crossings toggle the side from
 * one end's to the other's.
 *
 * Pairing in a face. Going round a face's boundary counter-clockwise, the
 * crossings alternate in (into the sublevel set) and out; the sublevel set
 * meets the boundary in arcs A_0 … A_{m−1} (in_i → out_i). Inside the face
 * each piece of level curve runs from some out_i to some in_j with the lower
 * values on its left, and the pieces do not cross. With one arc the piece is
 * out_0 → in_0. With several, the question is which arcs the sublevel set
 * joins inside the face: arcs A_i and A_{i+1} are taken as joined when the
 * straight segment between their lowest points lies below the level
 * (checked at 15 points). That is sufficient for joining (the segment is a
 * path in the sublevel set), and necessary when the sublevel piece in the
 * face is convex, as it is near the sources: the sublevel set of a distance
 * field near its sources is a union of discs (round point sources) and
 * stadiums (round segments of curve sources), each convex within one face.
 * Joined arcs form runs of consecutive arcs; a run A_s … A_t gives the pieces
 * out_i → in_{i+1} (cutting off each above-arc between them) and
 * out_t → in_s; a lone arc gives out_i → in_i. Those pieces never cross.
 *
 * The curve inside a face. Between its two crossings a piece is bent to the
 * level: from the midpoint of a chord, the level is found along the chord's
 * perpendicular in the face (regula falsi, on the side the field says), and the
 * chord is split there until each chord's sagitta is at most
 * {@link SAGITTA_RATIO} of its length and its quarter points are no farther
 * from the level (which catches corners of the curve, where fronts meet) (for a circular arc that bounds the
 * length error by about SAGITTA_RATIO²·8/3 relative, 2.4e-5).
 *
 * Loops inside a face. Round a point source inside a face, a level smaller
 * than the distance to the face's edges crosses no edge. There the exact
 * field is the Euclidean distance in the face's plane, so the loop is the
 * circle of radius L, sampled with a chord error (sagitta) of at most
 * {@link LOOP_SAGITTA}·L. A loop round several sources inside one face, or
 * round a curve source lying wholly inside one face (the boundary of a
 * union of discs and stadiums), or round a point source in a face whose
 * lengths in the measured metric are not those of the embedding (a user
 * metric: the loop is no circle of the face's plane), is not traced: such
 * faces are reported
 * (`untraced`) so that no caller says nothing lies at that level.
 */
import type { Topology } from '../mesh/topology.js';
import { faceOf, next } from '../mesh/topology.js';
import { canonicalSurfacePoint, type SurfacePoint } from '../mesh/surface-point.js';

/** Same-side intervals narrower than this (times the edge) are dropped: see the module comment. */
export const SEARCH_WIDTH = 1e-7;
/** Field evaluations per edge before the search stops halving same-side intervals (a level running along an edge). */
export const MAX_EDGE_EVALS = 4096;
/** Width (in edge parameter) to which a crossing is bisected. */
export const ROOT_WIDTH = 1e-13;
/** Largest sagitta of a chord of a piece of curve inside a face, relative to the chord. */
export const SAGITTA_RATIO = 3e-3;
/** Largest sagitta of the sampled loop round a point source, relative to the level. */
export const LOOP_SAGITTA = 1e-4;

/** What the search needs of the field. */
export interface PointField {
  /** One value per topology vertex. */
  values: Float64Array;
  /** The field at any surface point (Infinity where unreached). */
  at: (p: SurfacePoint) => number;
  /** Length of each edge in the metric the field measures (its Lipschitz constant along the edge). */
  edgeLength: Float64Array;
  /** Point sources, for loops that cross no edge. */
  pointSources?: readonly SurfacePoint[];
  /** Curve sources: one lying wholly inside a face with a level that crosses no edge is reported as untraced. */
  curveSources?: readonly (readonly SurfacePoint[])[];
}

/** A chained piece of level curve: points with their surface points, and whether it closes. */
export interface LevelPolyline {
  closed: boolean;
  points: [number, number, number][];
  surfacePoints: SurfacePoint[];
}

/** Crossing parameters (from the tail of edgeHalfedge[e]) of level L on edge e, in increasing order. */
export function edgeLevelCrossings(t: Topology, f: PointField, e: number, L: number): number[] {
  const h = t.edgeHalfedge[e]!;
  const v0 = f.values[t.tri[h]!]!, v1 = f.values[t.tri[next(h)]!]!;
  const K = f.edgeLength[e]!;
  const out: number[] = [];
  if (!Number.isFinite(v0) && !Number.isFinite(v1)) return out;
  // values inside the edge come with rounding: one within `tol` under L counts as on the level
  // (above), so a level running along the edge does not break into specks; the vertex ends keep
  // their side (f < L below), moved by at most 2·tol to sit on it against the shifted level
  const tol = 1e-12 * (Math.abs(L) + K);
  const g = (s: number) => f.at({ kind: 'edge', edge: e, t: s });
  L -= tol;
  const w0 = v0 < L + tol ? Math.min(v0, L - tol) : Math.max(v0, L), w1 = v1 < L + tol ? Math.min(v1, L - tol) : Math.max(v1, L);
  // breadth first (all intervals of one width per round), so that a spent budget leaves the
  // whole edge searched to the same width: [s0, value, s1, value] per interval
  let live: number[] = [0, w0, 1, w1];
  let evals = 0;
  while (live.length > 0) {
    const nextRound: number[] = [];
    for (let i = 0; i < live.length; i += 4) {
      const s0 = live[i]!, a = live[i + 1]!, s1 = live[i + 2]!, b = live[i + 3]!;
      const w = s1 - s0, below0 = a < L, below1 = b < L;
      const last = w <= SEARCH_WIDTH || evals >= MAX_EDGE_EVALS;
      if (below0 !== below1) {
        if (last) { out.push(levelRoot((x) => g(x) - L, s0, a - L, s1, b - L, ROOT_WIDTH)); continue; }
      } else {
        const lo = Number.isFinite(a) && Number.isFinite(b) ? (a + b - K * w) / 2 : Math.min(a, b) - K * w;
        const hi = (a + b + K * w) / 2;
        if (below0 ? hi < L : !(lo < L)) continue; // wholly on one side
        if (last) continue; // a graze shallower than K·w/2, or a level running along the edge: see the module comment
      }
      const m = 0.5 * (s0 + s1), vm = g(m);
      evals++;
      nextRound.push(s0, a, m, vm, m, vm, s1, b);
    }
    live = nextRound;
  }
  return out.sort((x, y) => x - y);
}

/**
 * A root of h in [x0, x1], where h(x0) and h(x1) lie on different sides (h < 0 is below): regula
 * falsi with the Illinois modification (Dowell & Jarratt, BIT 11, 1971), every third step a
 * bisection so the bracket always shrinks, until the bracket is narrower than `width`.
 */
function levelRoot(h: (x: number) => number, x0: number, h0: number, x1: number, h1: number, width: number): number {
  const belowAt0 = h0 < 0;
  let side = 0;
  for (let it = 0; it < 200 && x1 - x0 > width; it++) {
    let x = it % 3 === 2 ? 0.5 * (x0 + x1) : x0 - (h0 * (x1 - x0)) / (h1 - h0);
    if (!(x > x0 && x < x1)) x = 0.5 * (x0 + x1);
    if (!(x > x0 && x < x1)) break;
    const hx = h(x);
    if ((hx < 0) === belowAt0) {
      x0 = x; h0 = hx;
      if (side === -1) h1 *= 0.5;
      side = -1;
    } else {
      x1 = x; h1 = hx;
      if (side === 1) h0 *= 0.5;
      side = 1;
    }
  }
  const x = Number.isFinite(h0) && Number.isFinite(h1) && h1 !== h0 ? x0 - (h0 * (x1 - x0)) / (h1 - h0) : 0.5 * (x0 + x1);
  return x > x0 && x < x1 ? x : 0.5 * (x0 + x1);
}

type Bary = [number, number, number];

/** Barycentric coordinates in face f of the point at parameter s of edge e (one of f's edges). */
function edgeBary(t: Topology, f: number, e: number, s: number): Bary {
  const h = t.edgeHalfedge[e]!;
  const a = t.tri[h]!, b = t.tri[next(h)]!;
  const out: Bary = [0, 0, 0];
  for (let k = 0; k < 3; k++) {
    const v = t.tri[3 * f + k]!;
    if (v === a) out[k] += 1 - s;
    if (v === b) out[k] += s;
  }
  return out;
}

function position(t: Topology, P: Float64Array, f: number, b: Bary): [number, number, number] {
  const o: [number, number, number] = [0, 0, 0];
  for (let k = 0; k < 3; k++) {
    const v = 3 * t.tri[3 * f + k]!;
    for (let d = 0; d < 3; d++) o[d] += b[k]! * P[v + d]!;
  }
  return o;
}

/**
 * The level curves of `f` at L on the mesh (see the module comment), chained
 * through faces; faces with a non-finite corner hold none (curves end there).
 */
export function exactLevelCurves(t: Topology, P: Float64Array, f: PointField, L: number, untraced?: number[]): LevelPolyline[] {
  // 1. crossings on every edge that may hold one (Lipschitz bound on the whole edge first)
  const crossEdge: number[] = [], crossParam: number[] = [];
  const byEdge = new Map<number, number[]>();
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!;
    const a = f.values[t.tri[h]!]!, b = f.values[t.tri[next(h)]!]!, K = f.edgeLength[e]!;
    if ((a < L) === (b < L) && (a < L ? (a + b + K) / 2 < L : !((Number.isFinite(a) && Number.isFinite(b) ? (a + b - K) / 2 : Math.min(a, b) - K) < L))) continue;
    const ss = edgeLevelCrossings(t, f, e, L);
    if (ss.length === 0) continue;
    byEdge.set(e, ss.map((s) => { crossEdge.push(e); crossParam.push(s); return crossEdge.length - 1; }));
  }
  // 2. pieces in each face
  const usable = (g: number) => [0, 1, 2].every((k) => Number.isFinite(f.values[t.tri[3 * g + k]!]!));
  const at = (g: number, b: Bary) => f.at({ kind: 'face', face: g, bary: b });
  const pieceFrom = new Map<number, number>(); // key crossing*2+side → piece, by entry crossing
  const pieces: { face: number; from: number; to: number; inner: Bary[] }[] = [];
  const facesWithPieces = new Set<number>();
  const sideOf = (c: number, g: number) => (faceOf(t.edgeHalfedge[crossEdge[c]!]!) === g ? 0 : 1);
  for (const g of facesTouched(t, byEdge)) {
    if (!usable(g)) continue;
    type Item = { c: number; type: 1 | -1; b: Bary } | { c: -1; type: 0; b: Bary; v: number };
    const items: Item[] = [];
    let below = f.values[t.tri[3 * g]!]! < L;
    for (let k = 0; k < 3; k++) {
      const h = 3 * g + k, e = t.edgeOf[h]!, vk = f.values[t.tri[h]!]!;
      items.push({ c: -1, type: 0, b: k === 0 ? [1, 0, 0] : k === 1 ? [0, 1, 0] : [0, 0, 1], v: vk });
      const list = byEdge.get(e) ?? [];
      const ordered = t.edgeHalfedge[e] === h ? list : [...list].reverse();
      for (const c of ordered) {
        items.push({ c, type: below ? -1 : 1, b: edgeBary(t, g, e, crossParam[c]!) });
        below = !below;
      }
    }
    const firstIn = items.findIndex((x) => x.type === 1);
    if (firstIn < 0) continue;
    const ring = [...items.slice(firstIn), ...items.slice(0, firstIn)];
    // arcs: in, corners below, out
    const arcs: { cin: number; cout: number; rep: Bary }[] = [];
    for (let i = 0; i < ring.length; i++) {
      const x = ring[i]!;
      if (x.type !== 1) continue;
      let j = i + 1, best: Bary | null = null, bestV = Infinity;
      for (; ring[j]!.type !== -1; j++) { const y = ring[j]! as { v: number; b: Bary }; if (y.v < bestV) { bestV = y.v; best = y.b; } }
      const o = ring[j]!;
      arcs.push({ cin: x.c, cout: o.c, rep: best ?? [0, 1, 2].map((k) => 0.5 * (x.b[k]! + o.b[k]!)) as Bary });
    }
    const m = arcs.length;
    const joined = arcs.map((A, i) => m > 1 && segmentBelow(at, g, A.rep, arcs[(i + 1) % m]!.rep, L));
    const add = (from: number, to: number) => {
      const fb = edgeBary(t, g, crossEdge[from]!, crossParam[from]!), tb = edgeBary(t, g, crossEdge[to]!, crossParam[to]!);
      const inner: Bary[] = [];
      bend(t, P, at, g, fb, tb, L, inner, 0, metricScale(t, P, f.edgeLength, g));
      pieceFrom.set(from * 2 + sideOf(from, g), pieces.length);
      pieces.push({ face: g, from, to, inner });
    };
    if (joined.every(Boolean)) for (let i = 0; i < m; i++) add(arcs[i]!.cout, arcs[(i + 1) % m]!.cin);
    else {
      const start = (joined.findIndex((x) => !x) + 1) % m;
      for (let n = 0, s = start; n < m;) {
        let e = s;
        while (joined[e % m] && n + (e - s) + 1 < m) { add(arcs[e % m]!.cout, arcs[(e + 1) % m]!.cin); e++; }
        add(arcs[e % m]!.cout, arcs[s % m]!.cin);
        n += e - s + 1; s = e + 1;
      }
    }
    facesWithPieces.add(g);
  }
  // 3. chain: the piece leaving through crossing c continues in the other face of c's edge
  const following = (p: number): number => {
    const q = pieces[p]!, c = q.to;
    return pieceFrom.get(c * 2 + (1 - sideOf(c, q.face))) ?? -1;
  };
  const hasPrev = new Uint8Array(pieces.length);
  pieces.forEach((_, p) => { const n = following(p); if (n >= 0) hasPrev[n] = 1; });
  const seen = new Uint8Array(pieces.length);
  const out: LevelPolyline[] = [];
  const walk = (p0: number) => {
    const pts: [number, number, number][] = [], sps: SurfacePoint[] = [];
    const push = (g: number, b: Bary, sp: SurfacePoint) => {
      const x = position(t, P, g, b), l = pts[pts.length - 1];
      if (l && l[0] === x[0] && l[1] === x[1] && l[2] === x[2]) return;
      pts.push(x); sps.push(sp);
    };
    const pushCrossing = (g: number, c: number) => push(g, edgeBary(t, g, crossEdge[c]!, crossParam[c]!), canonicalSurfacePoint({ kind: 'edge', edge: crossEdge[c]!, t: crossParam[c]! }, t));
    let p = p0, closed = false;
    pushCrossing(pieces[p]!.face, pieces[p]!.from);
    for (;;) {
      seen[p] = 1;
      const q = pieces[p]!;
      for (const b of q.inner) push(q.face, b, { kind: 'face', face: q.face, bary: b });
      const n = following(p);
      if (n === p0) { closed = true; break; }
      pushCrossing(q.face, q.to);
      if (n < 0 || seen[n]) break;
      p = n;
    }
    if (closed) { pts.push([...pts[0]!]); sps.push(sps[0]!); }
    out.push({ closed, points: pts, surfacePoints: sps });
  };
  for (let p = 0; p < pieces.length; p++) if (!seen[p] && !hasPrev[p]) walk(p);
  for (let p = 0; p < pieces.length; p++) if (!seen[p]) walk(p);
  // 4. loops that cross no edge: round a lone point source inside a face, the circle; any other
  // source set wholly inside one face (several points, a curve) is reported in `untraced`
  const inFace = new Map<number, { bary: Bary; curve: boolean }[]>();
  const note = (p: SurfacePoint, curve: boolean) => {
    const c = canonicalSurfacePoint(p, t);
    if (c.kind !== 'face' || facesWithPieces.has(c.face) || !usable(c.face)) return;
    let l = inFace.get(c.face);
    if (!l) inFace.set(c.face, (l = []));
    l.push({ bary: c.bary, curve });
  };
  for (const p of f.pointSources ?? []) note(p, false);
  for (const cv of f.curveSources ?? []) for (const p of cv) note(p, true);
  for (const [g, l] of inFace) {
    if ([0, 1, 2].some((k) => !(f.values[t.tri[3 * g + k]!]! >= L))) continue; // a corner below: the curve crosses edges (found above)
    const loop = l.length === 1 && !l[0]!.curve && embeddedLengths(t, P, f.edgeLength, g) ? faceLoop(t, P, g, l[0]!.bary, L) : null;
    if (loop) out.push(loop);
    else untraced?.push(g);
  }
  return out;
}

/** Field units per embedding unit in face g: its metric perimeter over its perimeter in space (1 without a user metric); 1 when either is 0. */
function metricScale(t: Topology, P: Float64Array, len: Float64Array, g: number): number {
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
function embeddedLengths(t: Topology, P: Float64Array, len: Float64Array, g: number): boolean {
  for (let k = 0; k < 3; k++) {
    const a = 3 * t.tri[3 * g + k]!, b = 3 * t.tri[3 * g + (k + 1) % 3]!;
    const l3 = Math.hypot(P[b]! - P[a]!, P[b + 1]! - P[a + 1]!, P[b + 2]! - P[a + 2]!), l = len[t.edgeOf[3 * g + k]!]!;
    if (!(Math.abs(l - l3) <= 1e-9 * Math.max(l, l3))) return false;
  }
  return true;
}

/** Faces of the edges that carry crossings. */
function facesTouched(t: Topology, byEdge: Map<number, number[]>): number[] {
  const s = new Set<number>();
  for (const e of byEdge.keys()) {
    const h = t.edgeHalfedge[e]!;
    s.add(faceOf(h));
    if (t.twin[h]! >= 0) s.add(faceOf(t.twin[h]!));
  }
  return [...s].sort((a, b) => a - b);
}

/** True when the field is below L at 15 evenly spaced points strictly between a and b in face g. */
function segmentBelow(at: (g: number, b: Bary) => number, g: number, a: Bary, b: Bary, L: number): boolean {
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
function bend(t: Topology, P: Float64Array, at: (g: number, b: Bary) => number, g: number, a: Bary, b: Bary, L: number, out: Bary[], depth: number, rho: number): void {
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
  if (sag <= lim && quarter(0.25) <= lim && quarter(0.75) <= lim) return;
  bend(t, P, at, g, a, xb, L, out, depth + 1, rho);
  out.push(xb);
  bend(t, P, at, g, xb, b, L, out, depth + 1, rho);
}

/** The circle of radius L round barycentric point c of face g, when it fits inside the face (else null). */
function faceLoop(t: Topology, P: Float64Array, g: number, c: Bary, L: number): LevelPolyline | null {
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
