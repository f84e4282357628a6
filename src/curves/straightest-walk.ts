/**
 * The walk of a discrete straightest geodesic across a triangle mesh, after
 * K. Polthier & M. Schmies, "Straightest geodesics on polyhedral surfaces",
 * in H.-C. Hege & K. Polthier (eds.), Mathematical Visualization, Springer
 * 1998, pp. 135–150.
 *
 * A polyhedral curve is *straightest* when at every point the curve angles
 * on its left and on its right are equal: θ_l = θ_r = θ/2, with θ the total
 * angle of the surface at that point (Polthier & Schmies, definition of
 * discrete straightest geodesics). So:
 *
 * - inside a face (θ = 2π) the curve is a straight segment;
 * - across an edge (θ = 2π) the next face is unfolded into the plane of the
 *   current one and the segment goes on straight: the angle the curve makes
 *   with the edge is the same on both sides;
 * - through a vertex of total angle θ the outgoing direction is the one that
 *   leaves θ/2 on each side of the curve (the back direction turned by θ/2).
 *
 * Each face is laid out in the plane along the half-edge `base` through
 * which the walk entered it (`layoutAlong`: tail A at the origin, tip B on
 * +x, the third corner C above the axis), so crossing an edge needs only the
 * angle to that edge:
 *
 * ```
 *           C                          entering g through o = twin(h) at
 *          / \      d = (a, b) in      parameter 1 − u, direction (−a, −b)
 *         /   \     the frame of h     in the frame of o (equal angles:
 *        / f   \    (b < 0: leaving)   the line goes on straight)
 *   A ──────h────▶ B
 *          ◀──o───
 *            g
 * ```
 *
 * A crossing within `VERTEX_SNAP` × (the edge's length) of a corner is a
 * passage through that vertex. The walk stops on a boundary edge or at a
 * boundary vertex. The kernel never throws: it returns a status.
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import { next, prev, faceOf, isBoundaryVertex, nextOutgoing, type Topology } from '../mesh/topology.js';
import { angleOpposite } from '../metric/triangle.js';
import { layoutAlong } from '../metric/layout.js';
import type { SurfacePoint } from '../mesh/surface-point.js';

/** How close (relative to an edge's length) a crossing must come to a corner to pass through the vertex. */
export const VERTEX_SNAP = 1e-9;

/**
 * Where a walk begins in its face: `interior` strictly inside, `edge` on the
 * half-edge `base` (between A and B), `vertex` at the tail A of `base`.
 */
export type Entry = 'interior' | 'edge' | 'vertex';

/** A walk's start in the layout of one face along one of its half-edges. */
export interface WalkStart {
  /** Half-edge of the face the layout runs along (its tail at the origin, its tip on +x). */
  base: number;
  /** Position in that layout. */
  x: number;
  y: number;
  /** Unit direction in that layout. */
  dx: number;
  dy: number;
  /** Where the start lies in that face. */
  entry: Entry;
}

/** How a walk ended. */
export type WalkStatus = 'complete' | 'boundary' | 'steps' | 'stuck';

/** Outcome of {@link walkStraightest}. */
export interface WalkResult {
  /** `complete`: walked the whole length; `boundary`: reached the boundary; `steps`: step limit; `stuck`: a degenerate face gave no way on. */
  status: WalkStatus;
  /** x, y, z of every point of the polyline (start, edge crossings and vertices passed, end). */
  points: Float64Array;
  /** Intrinsic length walked (sum of the in-face segment lengths), mesh units. */
  length: number;
  /** Face-steps taken. */
  steps: number;
  /** Vertices the line passed through (the θ/2 rule applied). */
  vertexPassages: number;
  /** The face where the walk ended or got stuck. */
  face: number;
  /** Where the walk ended: a vertex, an edge point (edge id and parameter along its `edgeHalfedge`), or a face point. */
  end: SurfacePoint;
}

/** Scratch of one walk (kept apart so walks can run side by side). */
class Walk {
  pts: Float64Array;
  n = 0;
  fan = new Int32Array(16);
  ang = new Float64Array(16);
  readonly lay = new Float64Array(6);
  readonly tri3 = new Float64Array(3);
  constructor(capacity: number) {
    this.pts = new Float64Array(3 * Math.max(4, capacity));
  }
  /** Appends a 3D point unless it repeats the last one. */
  push(x: number, y: number, z: number): void {
    const p = this.pts, k = 3 * this.n;
    if (this.n > 0 && p[k - 3] === x && p[k - 2] === y && p[k - 1] === z) return;
    if (k + 3 > p.length) {
      const q = new Float64Array(2 * p.length);
      q.set(p);
      this.pts = q;
    }
    this.pts[k] = x; this.pts[k + 1] = y; this.pts[k + 2] = z;
    this.n++;
  }
  pushLerp(P: Float64Array, a: number, b: number, u: number): void {
    const i = 3 * a, j = 3 * b;
    this.push(P[i]! + u * (P[j]! - P[i]!), P[i + 1]! + u * (P[j + 1]! - P[i + 1]!), P[i + 2]! + u * (P[j + 2]! - P[i + 2]!));
  }
}

/** Interior angle of the face of `h` at the tail of `h` (opposite side next(h)), radians. */
export function cornerAngleAt(m: IntrinsicMesh, h: number): number {
  const L = m.edgeLength, e = m.topology.edgeOf;
  return angleOpposite(L[e[next(h)]!]!, L[e[h]!]!, L[e[prev(h)]!]!);
}

/**
 * Walks a straightest line of intrinsic length up to `length` from `start`
 * (3D point `origin`), crossing at most `maxSteps` faces. `positions` (x, y,
 * z per vertex) only map the points to 3D; the walk itself uses the edge
 * lengths of `m`.
 */
export function walkStraightest(m: IntrinsicMesh, positions: Float64Array, start: WalkStart, origin: ArrayLike<number>, length: number, maxSteps: number): WalkResult {
  const t = m.topology, L = m.edgeLength, tri = t.tri;
  const w = new Walk(Math.min(maxSteps + 2, 1 << 16));
  const lay = w.lay;
  let base = start.base, x = start.x, y = start.y, dx = start.dx, dy = start.dy, entry = start.entry;
  let walked = 0, steps = 0, passages = 0;

  w.push(origin[0]!, origin[1]!, origin[2]!);

  const finish = (status: WalkStatus, end: SurfacePoint): WalkResult => ({
    status, points: w.pts.slice(0, 3 * w.n), length: walked, steps, vertexPassages: passages, face: faceOf(base), end,
  });

  for (;;) {
    layoutAlong(m, base, lay, 4);
    lay[0] = 0; lay[1] = 0; lay[2] = L[t.edgeOf[base]!]!; lay[3] = 0;
    if (steps >= maxSteps) return finish('steps', faceEnd(base, lay, x, y));
    steps++;
    // candidate edges k (corner k → corner k+1): from the entry edge only the other two, from a vertex only the opposite one
    const k0 = entry === 'interior' ? 0 : 1;
    const k1 = entry === 'vertex' ? 1 : 2;
    let bestK = -1, bestS = Infinity, bestU = 0, bestOut = Infinity;
    for (let k = k0; k <= k1; k++) {
      const k2 = (k + 1) % 3;
      const x0 = lay[2 * k]!, y0 = lay[2 * k + 1]!, ex = lay[2 * k2]! - x0, ey = lay[2 * k2 + 1]! - y0;
      const den = dx * ey - dy * ex; // cross(d, e) > 0: the ray leaves the face through this edge
      if (!(den > 0)) continue;
      const qx = x0 - x, qy = y0 - y;
      const s = (qx * ey - qy * ex) / den, u = (qx * dy - qy * dx) / den;
      const out = u < 0 ? -u : u > 1 ? u - 1 : 0; // how far outside the edge the line meets it
      if (out < bestOut - 1e-12 || (Math.abs(out - bestOut) <= 1e-12 && s < bestS)) {
        bestK = k; bestS = s; bestU = u; bestOut = out;
      }
    }
    if (bestK < 0 || !Number.isFinite(bestS)) return finish('stuck', faceEnd(base, lay, x, y));
    const s = bestS > 0 ? bestS : 0, u = bestU < 0 ? 0 : bestU > 1 ? 1 : bestU;
    const rest = length - walked;
    if (s >= rest) {
      x += rest * dx; y += rest * dy;
      walked = length;
      pushLayoutPoint(w, positions, tri, base, lay, x, y);
      return finish('complete', faceEnd(base, lay, x, y));
    }
    const he = bk(base, bestK), le = L[t.edgeOf[he]!]!;
    // within VERTEX_SNAP × le of a corner (u is the fraction of le from the tail)
    const snapA = u <= VERTEX_SNAP, snapB = 1 - u <= VERTEX_SNAP;
    if (!snapA && !snapB) {
      // an edge crossing: unfold the next face (equal angles on both sides of the edge)
      walked += s;
      w.pushLerp(positions, tri[he]!, tri[next(he)]!, u);
      const o = t.twin[he]!;
      if (o < 0) {
        base = he;
        return finish('boundary', edgeEnd(t, he, u));
      }
      const ex = lay[2 * ((bestK + 1) % 3)]! - lay[2 * bestK]!, ey = lay[2 * ((bestK + 1) % 3) + 1]! - lay[2 * bestK + 1]!;
      const a = (dx * ex + dy * ey) / le, b = (ex * dy - ey * dx) / le; // d in the frame of he; b < 0
      const nn = Math.hypot(a, b);
      dx = -a / nn; dy = -b / nn;
      x = (1 - u) * le; y = 0;
      base = o; entry = 'edge';
      continue;
    }
    // through a vertex: corner kv of the layout
    const kv = snapA ? bestK : (bestK + 1) % 3;
    const vx = lay[2 * kv]!, vy = lay[2 * kv + 1]!;
    const seg = Math.hypot(vx - x, vy - y);
    walked += seg < rest ? seg : rest;
    const hv = bk(base, kv), v = tri[hv]!;
    w.push(positions[3 * v]!, positions[3 * v + 1]!, positions[3 * v + 2]!);
    if (isBoundaryVertex(t, v)) {
      base = hv;
      return finish('boundary', { kind: 'vertex', vertex: v });
    }
    // back direction −d measured from the edge hv, inside this face's corner
    const kt = (kv + 1) % 3;
    const ux = lay[2 * kt]! - vx, uy = lay[2 * kt + 1]! - vy;
    let beta = Math.atan2(-(ux * dy - uy * dx), -(ux * dx + uy * dy));
    const nFan = collectFan(w, m, hv);
    if (nFan === 0) return finish('stuck', { kind: 'vertex', vertex: v });
    beta = beta < 0 ? 0 : beta > w.ang[0]! ? w.ang[0]! : beta;
    let theta = 0;
    for (let i = 0; i < nFan; i++) theta += w.ang[i]!;
    // straightest rule: θ/2 on each side of the curve
    let phi = beta + theta / 2;
    if (phi >= theta) phi -= theta;
    let j = 0, acc = 0;
    while (j < nFan - 1 && acc + w.ang[j]! <= phi) acc += w.ang[j++]!;
    let gamma = phi - acc;
    gamma = gamma < 0 ? 0 : gamma > w.ang[j]! ? w.ang[j]! : gamma;
    base = w.fan[j]!;
    x = 0; y = 0; dx = Math.cos(gamma); dy = Math.sin(gamma);
    entry = 'vertex';
    passages++;
  }
}

/** Half-edge of the face of `base` that runs from layout corner k (0 = tail of base). */
function bk(base: number, k: number): number {
  return k === 0 ? base : k === 1 ? next(base) : prev(base);
}

/**
 * The outgoing half-edges of an interior vertex, counter-clockwise from `h0`
 * (into `w.fan`), and the corner angle of each one's face at the vertex (into
 * `w.ang`). Returns their number.
 */
function collectFan(w: Walk, m: IntrinsicMesh, h0: number): number {
  const t = m.topology;
  let n = 0;
  for (let h = h0; h >= 0; h = nextOutgoing(t, h0, h)) {
    if (n === t.tri.length) return 0; // not a fan (a broken topology): no way on
    if (n === w.fan.length) {
      const f = new Int32Array(2 * n), a = new Float64Array(2 * n);
      f.set(w.fan); a.set(w.ang);
      w.fan = f; w.ang = a;
    }
    w.fan[n] = h;
    w.ang[n] = cornerAngleAt(m, h);
    n++;
  }
  return n;
}

/** Barycentric coordinates of layout point (x, y) on corners A, B, C of the layout (clamped to the face). */
function layoutBary(lay: Float64Array, x: number, y: number, out: Float64Array): void {
  const l = lay[2]!, cx = lay[4]!, cy = lay[5]!;
  let b2 = cy > 0 ? y / cy : 0;
  let b1 = l > 0 ? (x - b2 * cx) / l : 0;
  b2 = b2 < 0 ? 0 : b2;
  b1 = b1 < 0 ? 0 : b1;
  let b0 = 1 - b1 - b2;
  if (b0 < 0) {
    const s = b1 + b2;
    b1 /= s; b2 /= s; b0 = 0;
  }
  out[0] = b0; out[1] = b1; out[2] = b2;
}

/** Appends the 3D point of layout point (x, y) of the face of `base`. */
function pushLayoutPoint(w: Walk, P: Float64Array, tri: Uint32Array, base: number, lay: Float64Array, x: number, y: number): void {
  const b = w.tri3;
  layoutBary(lay, x, y, b);
  const a = 3 * tri[base]!, c = 3 * tri[next(base)]!, d = 3 * tri[prev(base)]!;
  // A + b1·(B − A) + b2·(C − A): differences first, so map coordinates keep their last digits
  w.push(
    P[a]! + b[1]! * (P[c]! - P[a]!) + b[2]! * (P[d]! - P[a]!),
    P[a + 1]! + b[1]! * (P[c + 1]! - P[a + 1]!) + b[2]! * (P[d + 1]! - P[a + 1]!),
    P[a + 2]! + b[1]! * (P[c + 2]! - P[a + 2]!) + b[2]! * (P[d + 2]! - P[a + 2]!),
  );
}

/** The face point of layout point (x, y): barycentric coordinates in the face's own corner order. */
function faceEnd(base: number, lay: Float64Array, x: number, y: number): SurfacePoint {
  const b = new Float64Array(3);
  layoutBary(lay, x, y, b);
  const f = faceOf(base), k = base - 3 * f;
  const bary: [number, number, number] = [0, 0, 0];
  bary[k] = b[0]!; bary[(k + 1) % 3] = b[1]!; bary[(k + 2) % 3] = b[2]!;
  return { kind: 'face', face: f, bary };
}

/** The edge point at parameter u along half-edge h, as (edge id, parameter along its edgeHalfedge). */
function edgeEnd(t: Topology, h: number, u: number): SurfacePoint {
  const e = t.edgeOf[h]!;
  return { kind: 'edge', edge: e, t: t.edgeHalfedge[e] === h ? u : 1 - u };
}
