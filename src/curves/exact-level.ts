/**
 * Level sets of a distance field known at every surface point (the exact
 * polyhedral distance), found without missing any: where the field is not
 * linear along an edge, an edge can carry 0, 1, 2 or more crossings of a
 * level, with both ends above it (the middle of an edge near a source), and
 * a curve can bend inside a face or lie wholly inside one.
 *
 * Crossings on an edge: every one, by a Lipschitz search (edge-level.ts).
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
 *
 * Inside a face, pieces are bent to the level and loops round a lone point
 * source are closed (face-level.ts); a loop wholly inside a face that is not
 * traced is reported (`untraced`) so that no caller says nothing lies at
 * that level.
 */
import type { Topology } from '../mesh/topology.js';
import { faceOf, next } from '../mesh/topology.js';
import { canonicalSurfacePoint, type SurfacePoint } from '../mesh/surface-point.js';
import { baryInFace } from '../metric/face-points.js';
import { edgeLevelCrossings, type PointField } from './edge-level.js';
import { bend, embeddedLengths, faceLoop, metricScale, position, segmentBelow, type Bary, type LevelPolyline } from './face-level.js';

export type { PointField } from './edge-level.js';
export type { LevelPolyline } from './face-level.js';

/** Barycentric coordinates in face f of the point at parameter s of edge e (one of f's edges). */
function edgeBary(t: Topology, f: number, e: number, s: number): Bary {
  const out: Bary = [0, 0, 0];
  baryInFace(t, f, { kind: 'edge', edge: e, t: s }, out);
  return out;
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
