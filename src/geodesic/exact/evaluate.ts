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
import { pointSegmentDistance, planarLength as norm } from '../../metric/layout.js';
import { windowCrossing } from './light.js';
import { EVAL_NONE, EVAL_WINDOW, EVAL_CORNER, EVAL_ROOT, WIN_DEAD, type EvalKind } from './codes.js';

/** Best candidate found by {@link evaluateInFace}. */
export interface Evaluation {
  /** Distance (Infinity when nothing reaches the face). */
  value: number;
  /** What the best candidate is (EVAL_ constants, codes.ts): a window, a corner vertex, a point root, or none. */
  kind: EvalKind;
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

/**
 * Evaluates the distance at barycentric point b of face f; writes the best
 * candidate to `out`. Windows on half-edge `skip` (if given) are ignored.
 */
export function evaluateInFace(s: ExactState, f: number, b: ArrayLike<number>, out: Evaluation, skip = -1): Evaluation {
  out.value = Infinity; out.kind = EVAL_NONE; out.id = -1; out.x = 0;
  const W = s.win, P = s.scratch.point;
  for (let k = 0; k < 3; k++) for (let w = W.heHead[3 * f + k]!; w >= 0; w = W.nextOnHe[w]!) {
    if (W.state[w] === WIN_DEAD || 3 * f + k === skip) continue;
    pointInFrame(s, f, k, b, P);
    const px = P[0]!, py = P[1]!;
    const sx = W.sx[w]!, sy = W.sy[w]!, flat = W.flat[w]!;
    let x = windowCrossing(flat, sx, sy, px, py);
    const b0 = W.b0[w]!, b1 = W.b1[w]!;
    x = x < b0 ? b0 : x > b1 ? b1 : x;
    const d = (flat ? W.sigma[w]! + sx * x : W.sigma[w]! + norm(x - sx, sy)) + norm(px - x, py);
    if (d < out.value) { out.value = d; out.kind = EVAL_WINDOW; out.id = w; out.x = x; }
  }
  pointInFrame(s, f, 0, b, P);
  const L = s.hl[3 * f]!, cx = s.hc[6 * f]!, cy = s.hc[6 * f + 1]!;
  const cornerX = [0, L, cx], cornerY = [0, 0, cy];
  for (let k = 0; k < 3; k++) {
    const v = s.t.tri[3 * f + k]!;
    const d = s.dist[v]! + norm(P[0]! - cornerX[k]!, P[1]! - cornerY[k]!);
    if (d < out.value) { out.value = d; out.kind = EVAL_CORNER; out.id = v; }
  }
  for (let i = 0; i < s.pointRoots.length; i++) {
    const r = s.pointRoots[i]!;
    const j = r.faces.indexOf(f);
    if (j < 0) continue;
    const sb = r.bary, sq = r.bary2;
    const qx = sb[3 * j + 1]! * L + sb[3 * j + 2]! * cx, qy = sb[3 * j + 2]! * cy;
    const d = sq
      ? pointSegmentDistance(P[0]!, P[1]!, qx, qy, sq[3 * j + 1]! * L + sq[3 * j + 2]! * cx, sq[3 * j + 2]! * cy)
      : norm(P[0]! - qx, P[1]! - qy);
    if (d < out.value) { out.value = d; out.kind = EVAL_ROOT; out.id = i; }
  }
  return out;
}
