/**
 * Distance at any surface point from the stored windows.
 *
 * For a point P of face f the candidates are, each the length of a real
 * path (so the minimum is an upper bound, exact once the run is complete):
 * - every window on a half-edge of f: σ + |I − x| + |x − P| with x the
 *   crossing of the segment I→P with the window, clamped into [b0, b1]
 *   (equal to σ + |I − P| when P is lit by the window);
 * - every corner c: d(c) + |c − P| (covers pseudo-sources at corners);
 * - every point source on f: |S − P|, and every segment of a curve source
 *   on f: the distance from P to the segment.
 */
import type { ExactState } from './state.js';
import { pointSegmentDistance } from '../../metric/layout.js';

/** √(x² + y²) without Math.hypot's overflow guard, which costs several times more in V8 (lengths here are far from 1e±154). Local to each hot module so it inlines. */
function len2(x: number, y: number): number {
  return Math.sqrt(x * x + y * y);
}


/** Best candidate found by {@link evaluateInFace}. */
export interface Evaluation {
  /** Distance (Infinity when nothing reaches the face). */
  value: number;
  /** 1 window, 2 corner vertex, 3 point root, 0 none. */
  kind: number;
  /** Window id, vertex id or index into `pointRoots`. */
  id: number;
  /** For a window: the crossing on its half-edge, as a distance from the half-edge's tail. */
  x: number;
}

/** Position (x, y) of the barycentric point b of face f in the frame of half-edge 3f+k. */
export function pointInFrame(s: ExactState, f: number, k: number, b: ArrayLike<number>, out: number[]): void {
  const g = 3 * f + k;
  const bk1 = b[(k + 1) % 3]!, bk2 = b[(k + 2) % 3]!;
  out[0] = bk1 * s.hl[g]! + bk2 * s.hc[2 * g]!;
  out[1] = bk2 * s.hc[2 * g + 1]!;
}

const P = [0, 0];

/**
 * Where the light of a window reaching (px, py) (in the window's frame)
 * crossed the axis: towards the image for a point window, back along the
 * direction for a planar one.
 */
export function windowCrossing(flat: number, sx: number, sy: number, px: number, py: number): number {
  if (flat) return sy > 0 ? px - (sx * py) / sy : px;
  const den = py - sy;
  return den > 0 ? sx + ((px - sx) * -sy) / den : px;
}

/**
 * Evaluates the distance at barycentric point b of face f; writes the best
 * candidate to `out`. Windows on half-edge `skip` (if given) are ignored.
 */
export function evaluateInFace(s: ExactState, f: number, b: ArrayLike<number>, out: Evaluation, skip = -1): Evaluation {
  out.value = Infinity; out.kind = 0; out.id = -1; out.x = 0;
  const W = s.win;
  for (let k = 0; k < 3; k++) for (let w = W.heHead[3 * f + k]!; w >= 0; w = W.nextOnHe[w]!) {
    if (W.state[w] === 2 || 3 * f + k === skip) continue;
    pointInFrame(s, f, k, b, P);
    const px = P[0]!, py = P[1]!;
    const sx = W.sx[w]!, sy = W.sy[w]!, flat = W.flat[w]!;
    let x = windowCrossing(flat, sx, sy, px, py);
    const b0 = W.b0[w]!, b1 = W.b1[w]!;
    x = x < b0 ? b0 : x > b1 ? b1 : x;
    const d = (flat ? W.sigma[w]! + sx * x : W.sigma[w]! + len2(x - sx, sy)) + len2(px - x, py);
    if (d < out.value) { out.value = d; out.kind = 1; out.id = w; out.x = x; }
  }
  pointInFrame(s, f, 0, b, P);
  const L = s.hl[3 * f]!, cx = s.hc[6 * f]!, cy = s.hc[6 * f + 1]!;
  const cornerX = [0, L, cx], cornerY = [0, 0, cy];
  for (let k = 0; k < 3; k++) {
    const v = s.t.tri[3 * f + k]!;
    const d = s.dist[v]! + len2(P[0]! - cornerX[k]!, P[1]! - cornerY[k]!);
    if (d < out.value) { out.value = d; out.kind = 2; out.id = v; }
  }
  for (let i = 0; i < s.pointRoots.length; i++) {
    const r = s.pointRoots[i]!;
    const j = r.faces.indexOf(f);
    if (j < 0) continue;
    const sb = r.bary, sq = r.bary2;
    const qx = sb[3 * j + 1]! * L + sb[3 * j + 2]! * cx, qy = sb[3 * j + 2]! * cy;
    const d = sq
      ? pointSegmentDistance(P[0]!, P[1]!, qx, qy, sq[3 * j + 1]! * L + sq[3 * j + 2]! * cx, sq[3 * j + 2]! * cy)
      : len2(P[0]! - qx, P[1]! - qy);
    if (d < out.value) { out.value = d; out.kind = 3; out.id = i; }
  }
  return out;
}
