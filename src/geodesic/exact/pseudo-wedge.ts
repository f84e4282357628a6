/**
 * Windows of a settled pseudo-source, restricted to the wedge where a
 * shortest path can leave it.
 *
 * Angles around v: the outgoing half-edges in counter-clockwise order from
 * `vertexHalfedge[v]` (h → twin(prev(h))), θ(h) = sum of the corner angles
 * at v before h, Θ = the total angle at v. Face(h) spans [θ(h), θ(h) + α],
 * v→tip(h) at θ(h) and v→tail(prev(h)) at θ(h) + α.
 *
 * Let P be a shortest path to v that arrives from direction θ0 (the
 * direction from v back along P's last segment). A shortest path to q that
 * passes through v can be taken as P followed by v→q (same length). If
 * v→q leaves at θ with an angle < π between θ0 and θ on either side, that
 * side's wedge near v is a flat sector of angle < π and the corner at v can
 * be cut: a strictly shorter path to q exists, so v's windows are never
 * needed in that direction. What remains (Mitchell, Mount, Papadimitriou
 * 1987: a geodesic bends at a vertex only with ≥ π on both sides):
 *
 * ```
 *   interior (Θ > 2π):  θ ∈ [θ0 + π, θ0 + Θ − π]   (mod Θ), width Θ − 2π
 *   boundary (Θ > π):   θ ∈ [0, θ0 − π] ∪ [θ0 + π, Θ]
 *
 *              θ0 + π ╲   shadow   ╱ θ0 + Θ − π
 *                      ╲  wedge   ╱
 *                       ╲        ╱
 *                            v
 *                            │  P arrives from θ0
 * ```
 *
 * θ0 is known when v's bound came straight from a window or along an edge;
 * otherwise (a source vertex, a point root in a neighbouring face) the whole
 * fan is lit, as without the restriction. The wedge is widened by a slack
 * so rounding in θ0 can only add windows, never remove a needed one. Where
 * rounding could exceed that slack the whole fan is lit too, as before:
 * around needles and slivers (a corner angle below MIN_ANGLE, where angles
 * from lengths lose digits), and at vertices whose excess Θ − 2π (Θ − π on
 * the boundary) is so small that they may be flat vertices marked by
 * rounding; there the extra windows make up for rays lost to rounding in
 * the thin faces (measured: columns of 1e-9-wide slivers in a flat grid).
 */
import { next, prev, nextOutgoing } from '../../mesh/topology.js';
import type { ExactState } from './state.js';
import { VIA_VERTEX, VIA_WINDOW } from './codes.js';
import { addWindow } from './add-window.js';
import { windowCrossing } from './light.js';
import { planarLength } from '../../metric/layout.js';

/** Angular slack (radians) added on both sides of the wedge. */
const SLACK = 1e-7;
/** Below this angle excess (radians) the vertex may be flat up to rounding: it lights its whole fan. */
const MIN_EXCESS = 1e-6;
/** A fan with a corner angle below this (radians) lights whole: its layouts' directions may be off by more than SLACK. */
const MIN_ANGLE = 1e-3;

/**
 * Walks v's fan into the run's scratch (fanH: the half-edges, fanT: the
 * angle before each); returns the count, negative when v is on the boundary
 * (−count).
 */
function walkFan(s: ExactState, v: number): number {
  const t = s.t, ang = s.angle, sc = s.scratch;
  const start = t.vertexHalfedge[v]!;
  let n = 0, th = 0, last = start;
  for (let h = start; h >= 0; h = nextOutgoing(t, start, h)) {
    if (n === sc.fanH.length) {
      const a = new Int32Array(2 * n), b = new Float64Array(2 * n);
      a.set(sc.fanH); b.set(sc.fanT); sc.fanH = a; sc.fanT = b;
    }
    sc.fanH[n] = h; sc.fanT[n] = th; n++;
    th += ang[h]!;
    last = h;
  }
  return t.twin[prev(last)]! < 0 ? -n : n;
}

/** Direction θ0 of the last segment of v's recorded path, seen from v; NaN when unknown. */
function arrival(s: ExactState, v: number, n: number, boundary: boolean): number {
  const t = s.t, type = s.viaType[v], id = s.viaId[v]!, fanH = s.scratch.fanH, fanT = s.scratch.fanT;
  if (type === VIA_VERTEX) {
    for (let i = 0; i < n; i++) if (t.tri[next(fanH[i]!)] === id) return fanT[i]!;
    const last = fanH[n - 1]!;
    if (boundary && t.tri[prev(last)] === id) return fanT[n - 1]! + s.angle[last]!;
    return NaN;
  }
  if (type !== VIA_WINDOW) return NaN;
  // window on A→B lit C = v; its bound came through xc (the crossing of the ray to C, clamped
  // into the window, exactly as in propagateWindow / propagatePlanar)
  const W = s.win, hw = W.he[id]!, hv = prev(hw);
  const cx = s.hc[2 * hw]!, cy = s.hc[2 * hw + 1]!;
  const sx = W.sx[id]!, sy = W.sy[id]!;
  const xC = windowCrossing(W.flat[id]!, sx, sy, cx, cy);
  const b0 = W.b0[id]!, b1 = W.b1[id]!;
  const xc = xC < b0 ? b0 : xC > b1 ? b1 : xC;
  // angle at C from C→A = (−cx, −cy) to C→X = (xc − cx, −cy): cross = cy·xc, dot = cy² − cx·(xc − cx)
  let phi = Math.atan2(cy * xc, cy * cy - cx * (xc - cx));
  const a = s.angle[hv]!;
  phi = phi < 0 ? 0 : phi > a ? a : phi;
  for (let i = 0; i < n; i++) if (fanH[i] === hv) return fanT[i]! + phi;
  return NaN;
}

/**
 * Emits pseudo-source v's windows (σ = its distance, root `root`) onto the
 * edges opposite v, each clipped to the shadow wedge (see the module
 * comment); the whole fan when the arrival direction is unknown or pruning
 * is off.
 */
export function emitPseudoSource(s: ExactState, v: number, root: number): void {
  if (s.t.vertexHalfedge[v]! < 0) return;
  const full = !s.prune || !s.wedge || s.angle.length === 0;
  let n = walkFan(s, v);
  const boundary = n < 0;
  if (boundary) n = -n;
  const fanH = s.scratch.fanH, fanT = s.scratch.fanT;
  const last = fanH[n - 1]!;
  const total = fanT[n - 1]! + s.angle[last]!;
  let wedge = !full && total - (boundary ? Math.PI : 2 * Math.PI) > MIN_EXCESS;
  for (let i = 0; wedge && i < n; i++) {
    const f3 = fanH[i]! - (fanH[i]! % 3), A = s.angle;
    if (A[f3]! < MIN_ANGLE || A[f3 + 1]! < MIN_ANGLE || A[f3 + 2]! < MIN_ANGLE) wedge = false;
  }
  const th0 = wedge ? arrival(s, v, n, boundary) : NaN;
  // allowed set as up to two absolute intervals [l0, h0] ∪ [l1, h1]
  let l0 = -Infinity, h0 = Infinity, l1 = 1, h1 = 0;
  if (th0 === th0) {
    if (boundary) {
      l0 = -Infinity; h0 = th0 - Math.PI + SLACK;
      l1 = th0 + Math.PI - SLACK; h1 = Infinity;
    } else {
      let lo = (th0 + Math.PI - SLACK) % total;
      if (lo < 0) lo += total;
      const w = total - 2 * Math.PI + 2 * SLACK;
      if (w < total) {
        l0 = lo; h0 = lo + w;
        l1 = lo - total; h1 = lo + w - total;
      }
    }
  }
  const dv = s.dist[v]!;
  for (let i = 0; i < n; i++) {
    const h = fanH[i]!, a = fanT[i]!, alpha = s.angle.length ? s.angle[h]! : Math.PI;
    // hull of (face range ∩ allowed), relative to the face's first side
    let p0 = Infinity, p1 = -Infinity;
    const lo0 = a > l0 ? a : l0, hi0 = a + alpha < h0 ? a + alpha : h0;
    if (lo0 <= hi0) { p0 = lo0 - a; p1 = hi0 - a; }
    const lo1 = a > l1 ? a : l1, hi1 = a + alpha < h1 ? a + alpha : h1;
    if (lo1 <= hi1) { if (lo1 - a < p0) p0 = lo1 - a; if (hi1 - a > p1) p1 = hi1 - a; }
    if (p0 > p1) continue;
    emitCorner(s, h, dv, root, p0 <= 0 ? -1 : p0, p1 >= alpha ? -1 : p1);
  }
}

/**
 * Window from corner v = tail(h) onto the twin of the opposite edge
 * g = next(h), over the rays at angles [φ0, φ1] from v→tip(h) (−1: the
 * edge's end). In g's frame v = (cx, cy), and the ray at φ, direction
 * d = rot_φ(unit(B − v)), meets the axis at x = cx − cy·dx/dy; the twin's
 * frame maps x to L − x.
 */
function emitCorner(s: ExactState, h: number, dv: number, root: number, phi0: number, phi1: number): void {
  const g = next(h), gt = s.t.twin[g]!;
  if (gt < 0) return;
  const L = s.hl[g]!, cx = s.hc[2 * g]!, cy = s.hc[2 * g + 1]!;
  if (!(cy > 0)) return;
  let x0 = 0, x1 = L;
  if (phi0 >= 0 || phi1 >= 0) {
    const r = planarLength(cx, cy);
    if (!(r > 0)) return;
    if (phi0 >= 0) x0 = rayHit(-cx / r, -cy / r, cx, cy, L, phi0);
    if (phi1 >= 0) x1 = rayHit(-cx / r, -cy / r, cx, cy, L, phi1);
  }
  addWindow(s, gt, L - x1, L - x0, L - cx, -cy, dv, -1 - root);
}

/** Where the ray from (cx, cy) in direction rot_φ(ux, uy) meets the axis, clamped into [0, L]. */
function rayHit(ux: number, uy: number, cx: number, cy: number, L: number, phi: number): number {
  const c = Math.cos(phi), sn = Math.sin(phi);
  const dx = c * ux - sn * uy, dy = sn * ux + c * uy;
  const x = dy < 0 ? cx - (cy * dx) / dy : L;
  return x < 0 ? 0 : x > L ? L : x;
}
