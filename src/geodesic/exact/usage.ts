/**
 * How much of the window set the final distance field uses (a benchmark
 * and test diagnostic, not part of a solve).
 *
 * A live window w on half-edge h is *used* when, at one of `samples`
 * evenly spaced points x of its interval, nothing else on the same edge
 * gives a shorter distance: not another live window on h or on twin(h)
 * (mirrored frame), and not an end vertex, d(A) + x or d(B) + (L − x).
 * Ties within a relative 1e-9 count as used. Sampling can miss a used
 * window that wins only between samples, so `used` is a lower bound.
 *
 * Why it matters: an unused window is work a sharper pruning could have
 * saved; a used one is part of the field's structure (each distinct
 * unfolded source image seen by an edge), which any window method has to
 * produce. So `used` bounds from below what a faster exact method of this
 * family can skip.
 */
import { next } from '../../mesh/topology.js';
import type { ExactState } from './state.js';
import { axisValue } from './light.js';
import { WIN_DEAD } from './codes.js';

/** Result of {@link windowUsage}. */
export interface WindowUsage {
  /** Windows created in the run. */
  created: number;
  /** Windows still alive at the end (not trimmed away before propagation). */
  live: number;
  /** Live windows that give the minimum at one of their sample points. */
  used: number;
}

const TIE = 1e-9;

/** Counts the windows of a finished run that the final field uses (see the module comment). */
export function windowUsage(s: ExactState, samples = 5): WindowUsage {
  const W = s.win, t = s.t;
  const n = Math.max(1, Math.floor(samples));
  let live = 0, used = 0;
  for (let w = 0; w < W.count; w++) {
    if (W.state[w] === WIN_DEAD) continue;
    live++;
    const h = W.he[w]!, g = t.twin[h]!, L = s.hl[h]!;
    const dA = s.dist[t.tri[h]!]!, dB = s.dist[t.tri[next(h)]!]!;
    const b0 = W.b0[w]!, b1 = W.b1[w]!;
    for (let i = 0; i < n; i++) {
      const x = b0 + ((i + 0.5) / n) * (b1 - b0);
      const own = axisValue(W.flat[w]!, W.sx[w]!, W.sy[w]!, W.sigma[w]!, x);
      const limit = own / (1 + TIE);
      let beaten = dA + x < limit || dB + (L - x) < limit;
      for (let side = 0; side < 2 && !beaten; side++) {
        const e = side === 0 ? h : g;
        if (e < 0) continue;
        const xe = side === 0 ? x : L - x;
        for (let o = W.heHead[e]!; o >= 0 && !beaten; o = W.nextOnHe[o]!) {
          if (o === w || W.state[o] === WIN_DEAD || xe < W.b0[o]! || xe > W.b1[o]!) continue;
          if (axisValue(W.flat[o]!, W.sx[o]!, W.sy[o]!, W.sigma[o]!, xe) < limit) beaten = true;
        }
      }
      if (!beaten) {
        used++;
        break;
      }
    }
  }
  return { created: W.count, live, used };
}
