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
 */
import type { SurfacePoint } from '../../query/surface-point.js';
import { next, prev } from '../../mesh/topology.js';
import { angleOpposite } from '../../metric/triangle.js';
import { layoutAlong } from '../exact/layout.js';
import type { FlipTriangulation } from './triangulation.js';

/**
 * Traces the path `vertices` / `edges` (intrinsic edge ids of `tri`) on the
 * input surface and appends its points (the first vertex, every edge
 * crossing, every later vertex) to `out`. Returns false when some edge could
 * not be traced (see the module comment).
 */
export function tracePath(tri: FlipTriangulation, vertices: number[], edges: number[], out: SurfacePoint[]): boolean {
  out.push({ kind: 'vertex', vertex: vertices[0]! });
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
    out.push(...back.reverse(), { kind: 'vertex', vertex: w });
  }
  return true;
}

const lay = new Float64Array(2);

/** Traces intrinsic half-edge h, which must end at vertex w; appends the crossings and w. */
function traceHalfedge(tri: FlipTriangulation, h: number, w: number, out: SurfacePoint[]): boolean {
  const m = tri.input, T = m.topology, L = m.edgeLength;
  const u = tri.tri[h]!, l = tri.len(h);
  tri.prepare(u);
  const phi = tri.dir[h]!;
  // the input face of u's fan that holds the direction phi
  const start = T.vertexHalfedge[u]!;
  let g = start, acc = 0, c = 0;
  for (let n = 0; ; n++) {
    c = angleOpposite(L[T.edgeOf[next(g)]!]!, L[T.edgeOf[g]!]!, L[T.edgeOf[prev(g)]!]!);
    const o = T.twin[prev(g)]!;
    if (phi < acc + c || o < 0 || o === start || n > T.tri.length) break;
    acc += c;
    g = o;
  }
  const psi = Math.min(Math.max(phi - acc, 0), c);
  const dx = Math.cos(psi), dy = Math.sin(psi);
  // current face: corners A (entry tail), B (entry tip), C; for the first face A = u
  let ax = 0, ay = 0, bx = L[T.edgeOf[g]!]!, by = 0;
  layoutAlong(m, g, lay);
  let cx = lay[0]!, cy = lay[1]!;
  let entry = g, first = true;
  const tol = 1e-9 * l;
  const cap = 4 * T.tri.length + 16;
  for (let steps = 0; steps < cap; steps++) {
    // exit edge X from P to Q (X's tail and tip)
    let X: number, px: number, py: number, qx: number, qy: number;
    if (first || dx * cy - dy * cx > 0) { X = next(entry); px = bx; py = by; qx = cx; qy = cy; }
    else { X = prev(entry); px = cx; py = cy; qx = ax; qy = ay; }
    first = false;
    const den = dx * (py - qy) - dy * (px - qx);
    let t = den !== 0 ? (dx * py - dy * px) / den : 0.5;
    t = t < 0 ? 0 : t > 1 ? 1 : t;
    const xx = px + t * (qx - px), xy = py + t * (qy - py);
    const s = xx * dx + xy * dy;
    if (s >= l - tol) {
      const f = (X / 3) | 0;
      if (T.tri[3 * f] !== w && T.tri[3 * f + 1] !== w && T.tri[3 * f + 2] !== w) return false;
      out.push({ kind: 'vertex', vertex: w });
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
