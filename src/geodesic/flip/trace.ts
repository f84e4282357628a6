/**
 * Maps intrinsic edges back to the input surface: each one is a straight
 * segment of the polyhedral metric, given by its tail vertex, its direction
 * there (the signpost, see triangulation.ts) and its length, so it is traced
 * by walking a ray across the input faces unfolded one by one into a common
 * plane (Sharp, Soliman & Crane 2019, §3.3, "tracing"), recording where it
 * crosses input edges.
 *
 * In each face the ray entered through edge A→B (A on the ray's left, B on its
 * right, the face A, B, C counter-clockwise), it leaves through B→C when C lies
 * left of the ray and through C→A otherwise: one orientation test, so a ray
 * through a vertex still takes a defined way. The crossing's parameter is
 * clamped to the edge. The next face is unfolded across the crossed edge from
 * its lengths (`layoutAlong`). The walk ends in the face where the ray reaches
 * its length, which must have the edge's far vertex as a corner; otherwise
 * (rounding on a degenerate mesh) the trace reports failure and the caller
 * falls back to another method, rather than return a path that is wrong.
 * An inserted point (insert.ts) starts its ray inside its face, or on its
 * edge in the face on the ray's side, from its reference direction; a ray
 * ending there must end in a face that holds the point.
 */
import type { SurfacePoint } from '../../mesh/surface-point.js';
import { next, prev, nextOutgoing } from '../../mesh/topology.js';
import { angleOpposite } from '../../metric/triangle.js';
import { layoutAlong, layoutFace } from '../../metric/layout.js';
import type { FlipTriangulation } from './triangulation.js';

/**
 * Traces the path `vertices` / `edges` (intrinsic edge ids of `tri`) on the
 * input surface and appends its points (the first vertex, every edge
 * crossing, every later vertex) to `out`. Returns false when some edge could
 * not be traced (see the module comment).
 */
export function tracePath(tri: FlipTriangulation, vertices: number[], edges: number[], out: SurfacePoint[]): boolean {
  out.push(tri.pointOf(vertices[0]!));
  for (let i = 0; i < edges.length; i++) {
    const u = vertices[i]!, w = vertices[i + 1]!;
    const h = tri.leaving(edges[i]!, u);
    if (h >= 0) {
      if (!traceHalfedge(tri, h, w, out)) return false;
      continue;
    }
    // a boundary edge that only enters u: trace it from w and reverse the crossings
    const back: SurfacePoint[] = [];
    const g = tri.leaving(edges[i]!, w);
    if (g < 0 || !traceHalfedge(tri, g, u, back)) return false;
    back.pop();
    out.push(...back.reverse(), tri.pointOf(w));
  }
  return true;
}

const lay = new Float64Array(2), lay6 = new Float64Array(6);

/** Where a ray starts: the face it runs in, as entry half-edge A→B with corners, or a forced first exit. */
interface RayStart {
  dx: number; dy: number;
  entry: number; ax: number; ay: number; bx: number; by: number; cx: number; cy: number;
  /** First exit half-edge when the ray starts at a corner or inside a face (−1: use the entry rule). */
  X: number; px: number; py: number; qx: number; qy: number;
}

/** The ray of direction `phi` at vertex u (an input vertex or an inserted point), origin at (0, 0). */
function rayStart(tri: FlipTriangulation, u: number, phi: number): RayStart | null {
  const m = tri.input, T = m.topology, L = m.edgeLength;
  const p = tri.pointOf(u);
  if (p.kind === 'vertex') {
    // the input face of u's fan that holds the direction phi
    const start = T.vertexHalfedge[u]!;
    let g = start, acc = 0, c = 0;
    for (let n = 0; ; n++) {
      c = angleOpposite(L[T.edgeOf[next(g)]!]!, L[T.edgeOf[g]!]!, L[T.edgeOf[prev(g)]!]!);
      const o = nextOutgoing(T, start, g);
      if (phi < acc + c || o < 0 || n > T.tri.length) break;
      acc += c;
      g = o;
    }
    const psi = Math.min(Math.max(phi - acc, 0), c);
    const lg = layoutAlong(m, g, lay);
    return { dx: Math.cos(psi), dy: Math.sin(psi), entry: g, ax: 0, ay: 0, bx: lg, by: 0, cx: lay[0]!, cy: lay[1]!, X: next(g), px: lg, py: 0, qx: lay[0]!, qy: lay[1]! };
  }
  if (p.kind === 'face') {
    // reference direction: towards corner 0 (insert.ts); exit through the edge from a corner on the ray's right to one on its left
    const F = p.face;
    layoutFace(m, F, lay6);
    const ox = p.bary[0] * lay6[0]! + p.bary[1] * lay6[2]! + p.bary[2] * lay6[4]!;
    const oy = p.bary[0] * lay6[1]! + p.bary[1] * lay6[3]! + p.bary[2] * lay6[5]!;
    for (let k = 0; k < 6; k += 2) { lay6[k]! -= ox; lay6[k + 1]! -= oy; }
    const psi = Math.atan2(lay6[1]!, lay6[0]!) + phi;
    const dx = Math.cos(psi), dy = Math.sin(psi);
    const side = (k: number) => dx * lay6[2 * k + 1]! - dy * lay6[2 * k]!;
    for (let k = 0; k < 3; k++) {
      const j = (k + 1) % 3;
      if (side(k) <= 0 && side(j) >= 0) {
        return { dx, dy, entry: -1, ax: 0, ay: 0, bx: 0, by: 0, cx: 0, cy: 0, X: 3 * F + k, px: lay6[2 * k]!, py: lay6[2 * k + 1]!, qx: lay6[2 * j]!, qy: lay6[2 * j + 1]! };
      }
    }
    return null;
  }
  // edge point: reference direction along edgeHalfedge[edge] towards its tip; angles up to π on its face's side
  const H = T.edgeHalfedge[p.edge]!, o = T.twin[H]!;
  const le = L[p.edge]!;
  if (phi <= Math.PI || o < 0) {
    layoutAlong(m, H, lay);
    const sx = p.t * le;
    return { dx: Math.cos(phi), dy: Math.sin(phi), entry: H, ax: -sx, ay: 0, bx: le - sx, by: 0, cx: lay[0]! - sx, cy: lay[1]!, X: -1, px: 0, py: 0, qx: 0, qy: 0 };
  }
  layoutAlong(m, o, lay);
  const sx = (1 - p.t) * le;
  return { dx: Math.cos(phi - Math.PI), dy: Math.sin(phi - Math.PI), entry: o, ax: -sx, ay: 0, bx: le - sx, by: 0, cx: lay[0]! - sx, cy: lay[1]!, X: -1, px: 0, py: 0, qx: 0, qy: 0 };
}

/** True when input face f holds vertex or inserted point w of `tri`. */
function faceHolds(tri: FlipTriangulation, f: number, w: number): boolean {
  const T = tri.input.topology, p = tri.pointOf(w);
  if (p.kind === 'vertex') return T.tri[3 * f] === w || T.tri[3 * f + 1] === w || T.tri[3 * f + 2] === w;
  if (p.kind === 'face') return p.face === f;
  const H = T.edgeHalfedge[p.edge]!, o = T.twin[H]!;
  return ((H / 3) | 0) === f || (o >= 0 && ((o / 3) | 0) === f);
}

/** Traces intrinsic half-edge h, which must end at vertex w; appends the crossings and w's point. */
function traceHalfedge(tri: FlipTriangulation, h: number, w: number, out: SurfacePoint[]): boolean {
  const m = tri.input, T = m.topology;
  const u = tri.tri[h]!, l = tri.len(h);
  tri.prepare(u);
  const r = rayStart(tri, u, tri.dir[h]!);
  if (!r) return false;
  const { dx, dy } = r;
  // current face: corners A (entry tail), B (entry tip), C
  let { ax, ay, bx, by, cx, cy, entry } = r;
  let forced = r.X;
  const tol = 1e-9 * l;
  const cap = 4 * T.tri.length + 16;
  for (let steps = 0; steps < cap; steps++) {
    // exit edge X from P to Q (X's tail and tip)
    let X: number, px: number, py: number, qx: number, qy: number;
    if (forced >= 0) { X = forced; px = r.px; py = r.py; qx = r.qx; qy = r.qy; forced = -1; }
    else if (dx * cy - dy * cx > 0) { X = next(entry); px = bx; py = by; qx = cx; qy = cy; }
    else { X = prev(entry); px = cx; py = cy; qx = ax; qy = ay; }
    const den = dx * (py - qy) - dy * (px - qx);
    let t = den !== 0 ? (dx * py - dy * px) / den : 0.5;
    t = t < 0 ? 0 : t > 1 ? 1 : t;
    const xx = px + t * (qx - px), xy = py + t * (qy - py);
    const s = xx * dx + xy * dy;
    if (s >= l - tol) {
      if (!faceHolds(tri, (X / 3) | 0, w)) return false;
      out.push(tri.pointOf(w));
      return true;
    }
    const e = T.edgeOf[X]!;
    out.push({ kind: 'edge', edge: e, t: T.edgeHalfedge[e] === X ? t : 1 - t });
    const tw = T.twin[X]!;
    if (tw < 0) return false;
    // unfold the next face across X: it runs Q → P there, its third corner R to the right of P→Q
    const ex = px - qx, ey = py - qy, el = Math.hypot(ex, ey);
    if (!(el > 0)) return false;
    const ux = ex / el, uy = ey / el;
    layoutAlong(m, tw, lay);
    const rx = qx + lay[0]! * ux - lay[1]! * uy, ry = qy + lay[0]! * uy + lay[1]! * ux;
    ax = qx; ay = qy; bx = px; by = py; cx = rx; cy = ry;
    entry = tw;
  }
  return false;
}
