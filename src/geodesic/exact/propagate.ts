/**
 * Window creation, filtering and propagation through one face, and the
 * event loop.
 *
 * Propagating window w on half-edge h (frame of h: A = (0,0), B = (L,0),
 * C = (cx, cy) above, image I = (sx, sy) below):
 *
 * ```
 *                    C
 *                   /·\          xC = where the ray I→C crosses AB
 *     child on     / · \    child on
 *     twin(CA)    /  ·  \   twin(BC)
 *                /   ·   \
 *             A ──[b0·xC··b1]── B
 *                   \ · /
 *                     I
 * ```
 *
 * Rays through [b0, min(b1, xC)] leave through CA, rays through
 * [max(b0, xC), b1] leave through BC; when xC ∈ [b0, b1], C itself is lit
 * and gets the bound σ + |I − C| (otherwise the bound through the nearest
 * window end). A child is stored on the twin half-edge,
 * in whose frame the image is again below the axis. Vertices get bounds only
 * as a lit third corner C (or along an edge from a settled vertex): the last
 * straight piece of a shortest path to v crosses the face opposite v, or
 * runs along an edge from a vertex it passed through.
 *
 * Filter (Xin & Wang 2009, vertex-distance test): a window on A→B is
 * useless when even its far end is reached sooner from an end vertex:
 *   σ + |I − b1| > d(A) + b1        or   σ + |I − b0| > d(B) + (L − b0).
 * Proof for the B test: g(x) = σ + |I − x| − d(B) − (L − x) is
 * non-decreasing in x (d|I − x|/dx ≥ −1), so g(b0) > 0 gives g > 0 on the
 * whole window; for any point q reached through x, σ + |I − q| =
 * σ + |I − x| + |x − q| > d(B) + |B − x| + |x − q| ≥ d(B) + |B − q|, so no
 * shortest path uses the window. Bounds d(·) are lengths of real paths, so
 * the test only ever removes non-shortest paths.
 */
import { next, prev, nextOutgoing } from '../../mesh/topology.js';
import type { ExactState } from './state.js';
import { addRoot, relaxVertex } from './state.js';
import { VIA_WINDOW, VIA_VERTEX, WIN_QUEUED, WIN_PROPAGATED } from './codes.js';
import { addWindow, REL } from './add-window.js';
import { windowCrossing, unitRatio } from './light.js';
import { planarLength } from '../../metric/layout.js';
import { propagatePlanar } from './planar.js';
import { emitPseudoSource } from './pseudo-wedge.js';
import { windsAround } from './winding.js';
import { eventBound } from './guard.js';

// hot imports bound once: transpilers that emit CommonJS read every imported name through a
// getter on each call (none of these modules imports this one, so the bindings exist at load time)
const relax = relaxVertex;
const next1 = next;
const prev1 = prev;
const winds = windsAround;
const norm = planarLength;
const crossing = windowCrossing;
const unit = unitRatio;
const add = addWindow;

/** Propagates window w through its face (see the module sketch). */
export function propagateWindow(s: ExactState, w: number): void {
  const W = s.win, t = s.t;
  if (W.state[w] !== WIN_QUEUED) return;
  W.state[w] = WIN_PROPAGATED;
  if (W.flat[w]) return propagatePlanar(s, w);
  const h = W.he[w]!, b0 = W.b0[w]!, b1 = W.b1[w]!, sx = W.sx[w]!, sy = W.sy[w]!, sigma = W.sigma[w]!;
  const L = s.hl[h]!;
  // re-test against bounds that may have dropped since the window was queued
  const A = t.tri[h]!, B = t.tri[next1(h)]!;
  if (s.prune && sigma + norm(b1 - sx, sy) > (s.dist[A]! + b1) * (1 + REL)) return;
  if (s.prune && sigma + norm(b0 - sx, sy) > (s.dist[B]! + (L - b0)) * (1 + REL)) return;
  const cx = s.hc[2 * h]!, cy = s.hc[2 * h + 1]!;
  // ray I→C meets the axis at xC = sx + (cx − sx)·(−sy)/(cy − sy) (light.ts)
  const xC = crossing(0, sx, sy, cx, cy);
  const hp = prev1(h), hn = next1(h);
  // C gets the real path through the window point nearest the ray I→C: exact when C is lit, and a
  // bound when a ray through a flat vertex grazes it from outside by a rounding error
  const xc = xC < b0 ? b0 : xC > b1 ? b1 : xC;
  relax(s, t.tri[hp]!, sigma + norm(xc - sx, sy) + norm(cx - xc, cy), VIA_WINDOW, w);
  const gp = t.twin[hp]!, sharp = s.geometry.sharp;
  if (gp >= 0 && b0 < xC && !(sharp[A] && winds(W, t, w, gp, A))) {
    // line A + u·(C − A): u(x) = x·sy / ((x − sx)·cy + sy·cx)
    const x1 = b1 < xC ? b1 : xC;
    const u0 = unit(b0 * sy, (b0 - sx) * cy + sy * cx);
    // at x = xC the ray meets C itself (u = 1); recomputing u there cancels badly when I nears the axis
    const u1 = x1 === xC ? 1 : unit(x1 * sy, (x1 - sx) * cy + sy * cx);
    const lca = norm(cx, cy), Lc = s.hl[gp]!;
    if (lca > 0) {
      const ex = cx / lca, ey = cy / lca; // frame of twin(CA) = A→C
      add(s, gp, u0 * Lc, u1 * Lc, sx * ex + sy * ey, -sx * ey + sy * ex, sigma, w);
    }
  }
  const gn = t.twin[hn]!;
  if (gn >= 0 && b1 > xC && !(sharp[B] && winds(W, t, w, gn, B))) {
    // line B + u·(C − B): u(x) = sy·(x − L) / ((x − sx)·cy + sy·(cx − L))
    const x0 = b0 > xC ? b0 : xC;
    const u0 = x0 === xC ? 1 : unit(sy * (x0 - L), (x0 - sx) * cy + sy * (cx - L));
    const u1 = unit(sy * (b1 - L), (b1 - sx) * cy + sy * (cx - L));
    const dx = L - cx, dy = -cy, lbc = norm(dx, dy), Lc = s.hl[gn]!;
    if (lbc > 0) {
      const ex = dx / lbc, ey = dy / lbc; // frame of twin(BC) = C→B
      const px = sx - cx, py = sy - cy;
      add(s, gn, (1 - u0) * Lc, (1 - u1) * Lc, px * ex + py * ey, -px * ey + py * ex, sigma, w);
    }
  }
}

/**
 * Emits windows from a point of face f (barycentric b0, b1, b2 on its
 * corners) at distance σ onto the twins of the face's edges that do not hold
 * the point. In the frame of g = 3f+k the point is
 * P = (b[k+1]·L + b[k+2]·cx, b[k+2]·cy) and in the frame of twin(g) it is
 * (L − Px, −Py), lighting the whole edge.
 */
export function emitFromPoint(s: ExactState, f: number, b: ArrayLike<number>, sigma: number, root: number): void {
  for (let k = 0; k < 3; k++) {
    const g = 3 * f + k;
    const gt = s.t.twin[g]!;
    if (gt < 0) continue;
    const bk1 = b[(k + 1) % 3]!, bk2 = b[(k + 2) % 3]!;
    const L = s.hl[g]!;
    const px = bk1 * L + bk2 * s.hc[2 * g]!, py = bk2 * s.hc[2 * g + 1]!;
    if (!(py > 0)) continue;
    add(s, gt, 0, L, L - px, -py, sigma, -1 - root);
  }
}

/** Settles vertex v: relaxes its edge neighbours and, for a pseudo-source, emits windows into its shadow wedge. */
export function settleVertex(s: ExactState, v: number): void {
  const t = s.t;
  s.settled[v] = 1;
  const dv = s.dist[v]!;
  const start = t.vertexHalfedge[v]!;
  if (start < 0) return;
  let last = start;
  for (let h = start; h >= 0; h = nextOutgoing(t, start, h)) {
    relax(s, t.tri[next1(h)]!, dv + s.hl[h]!, VIA_VERTEX, v);
    last = h;
  }
  // a boundary fan ends with an incoming boundary edge: its tail is a neighbour too
  const hp = prev1(last);
  if (t.twin[hp]! < 0) relax(s, t.tri[hp]!, dv + s.hl[hp]!, VIA_VERTEX, v);
  // neighbours first: their lowered bounds make the vertex filter sharper for v's windows
  if (s.pseudo[v]) emitPseudoSource(s, v, addRoot(s, v, dv));
}

/**
 * Runs the event loop until both queues are empty, the next key passes
 * `maxDistance`, `stop(key)` returns true (checked every 32 events), the
 * window store has no more room (`s.overflow`: the memory budget, the window
 * cap or the allocator refused) or the run passes a bound no correct run
 * reaches (`s.diverged`, guard.ts). Returns the key at which it stopped (Infinity when the
 * queues ran dry): every vertex bound ≤ that key is exact.
 *
 * A vertex is settled only when its key is at most the window queue's
 * lower bound, so no queued window can still lower it; windows go in
 * bucket order (see bucket-queue.ts).
 */
export function runEvents(s: ExactState, stop?: (key: number) => boolean): number {
  const vq = s.queue, wq = s.wq;
  let n = 0;
  for (;;) {
    const vk = vq.size > 0 ? vq.peekKey() : Infinity;
    const wk = wq.lowerBound();
    const key = vk < wk ? vk : wk;
    if (key === Infinity) return Infinity;
    if (key > s.maxDistance) return key;
    if (stop && (n++ & 31) === 0 && stop(key)) return key;
    if ((++s.events & 1023) === 0 && s.events > eventBound(s)) s.diverged = 'events';
    if (vk <= wk) {
      const v = -1 - vq.pop();
      if (!s.settled[v]) settleVertex(s, v);
    } else propagateWindow(s, wq.pop());
    if (s.overflow || s.diverged) return key;
  }
}
