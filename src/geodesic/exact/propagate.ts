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
import { next, prev } from '../../mesh/topology.js';
import type { ExactState } from './state.js';
import { addRoot, relaxVertex, VIA_WINDOW, VIA_VERTEX } from './state.js';
import { trimBoth } from './trim.js';
import { propagatePlanar } from './planar.js';
import { emitPseudoSource } from './pseudo-wedge.js';
import { windsAround } from './winding.js';
import { eventBound } from './guard.js';

/** √(x² + y²) without Math.hypot's overflow guard, which costs several times more in V8 (lengths here are far from 1e±154). Local to each hot module so it inlines. */
function len2(x: number, y: number): number {
  return Math.sqrt(x * x + y * y);
}


const TMP = new Float64Array(4);

// hot imports bound once: transpilers that emit CommonJS read every imported name through a
// getter on each call (neither module imports this one, so the bindings exist at load time)
const trimPair = trimBoth;
const relax = relaxVertex;
const next1 = next;
const prev1 = prev;
const winds = windsAround;

/** Relative slack of the filter and of degenerate-width tests. */
const REL = 1e-12;
/** Relative tolerance under which two windows count as the same image and σ (merged). */
const MERGE = 1e-11;

/** Distance of a window's light at x on its own edge (point image or planar front). */
export function axisValue(flat: number, sx: number, sy: number, sigma: number, x: number): number {
  return flat ? sigma + sx * x : sigma + len2(x - sx, sy);
}

/**
 * Stores a window after clamping, filtering, trimming and merging; returns
 * its id (or the id of the window it merged into) or −1. `flat` marks a
 * planar window (sx, sy = direction, σ = offset; see windows.ts).
 */
export function addWindow(s: ExactState, h: number, b0: number, b1: number, sx: number, sy: number, sigma: number, parent: number, flat = 0): number {
  const L = s.hl[h]!;
  if (b0 < 0) b0 = 0;
  if (b1 > L) b1 = L;
  if (!(b1 - b0 > REL * L)) return -1;
  if (!flat && !(sy <= 0)) sy = 0; // rounding (or NaN) guard: image never above the edge
  const t = s.t;
  const A = t.tri[h]!, B = t.tri[next1(h)]!;
  const v1 = axisValue(flat, sx, sy, sigma, b1);
  const v0 = axisValue(flat, sx, sy, sigma, b0);
  const prune = s.prune;
  const dA = prune ? s.dist[A]! : Infinity, dB = prune ? s.dist[B]! : Infinity;
  if (v1 > (dA + b1) * (1 + REL) || v0 > (dB + (L - b0)) * (1 + REL)) return -1;
  // partial cut: g_A(y) = σ + |I − y| − d(A) − y is non-increasing, so where it is > 0 is a prefix;
  // its zero solves √((y−sx)² + sy²) = y + k, k = d(A) − σ: y* = (sx² + sy² − k²) / (2(k + sx))
  if (!flat && v0 > (dA + b0) * (1 + REL)) {
    const k = dA - sigma, den = 2 * (k + sx);
    const y = den > 0 ? (sx * sx + sy * sy - k * k) / den : NaN;
    if (y > b0 && y < b1) b0 = y;
  }
  // mirrored for B: g_B(y) = σ + |I − y| − d(B) − (L − y) is non-decreasing, > 0 on a suffix
  if (!flat && v1 > (dB + (L - b1)) * (1 + REL)) {
    const k = dB - sigma, mx = L - sx, den = 2 * (k + mx);
    const y = den > 0 ? L - (mx * mx + sy * sy - k * k) / den : NaN;
    if (y > b0 && y < b1) b1 = y;
  }
  // trim N against the windows already on this edge (either side) and, in the first pass, queued
  // ones against N; passes repeat while N shrinks (a cut can expose an overlap with another window).
  // Lists are sorted by b0 (each in its own frame), so a scan stops at the first window starting
  // past N; a trim or merge can leave a window slightly out of order, which only costs pruning.
  const W = s.win, g = t.twin[h]!;
  const tolI = MERGE * (L + Math.abs(sx) + Math.abs(sy) + Math.abs(sigma));
  // merging needs a queued window on h with N's image and σ; the first pass notes whether one
  // exists (trimming only ever removes windows), so the merge scan below runs only then
  let mergeable = flat || !prune;
  // last live window on h with b0 ≤ N's b0, found in the first pass (N's b0 only grows after it)
  let pred = -1;
  for (let pass = 0, changed = !flat && prune; changed && pass < 8; pass++) {
    changed = false;
    for (let side = 0; side < 2; side++) {
      const e = side === 0 ? h : g;
      if (e < 0) continue;
      // lists hold live windows only: a window is unlinked where it dies, below
      for (let o = W.heHead[e]!, before = -1; o >= 0; o = W.nextOnHe[o]!) {
        const ob0 = W.b0[o]!;
        if (side === 0 ? ob0 > b1 + tolI : L - ob0 <= b0) break;
        if (W.flat[o]) {
          before = o;
          if (side === 0 && pass === 0 && ob0 <= b0) pred = o;
          continue;
        }
        const oLo = side === 0 ? ob0 : L - W.b1[o]!, oHi = side === 0 ? W.b1[o]! : L - ob0;
        if (side === 0 && !mergeable && oHi >= b0 - tolI && W.state[o] === 0 &&
          Math.abs(W.sigma[o]! - sigma) <= tolI && Math.abs(W.sx[o]! - sx) <= tolI && Math.abs(W.sy[o]! - sy) <= tolI) mergeable = true;
        if (oHi > b0 && oLo < b1) {
          const oc = side === 0 ? W.sx[o]! : L - W.sx[o]!;
          const r = trimPair(b0, b1, sx, sy, sigma, oLo, oHi, oc, W.sy[o]!, W.sigma[o]!, pass === 0 && W.state[o] === 0, TMP);
          if (r & 2 || (TMP[2] !== oLo || TMP[3] !== oHi)) {
            if (r & 2 || !(TMP[3]! - TMP[2]! > REL * L)) {
              // O dies (only a queued window is ever trimmed): unlink it, nothing else refers to it
              W.state[o] = 2;
              if (before < 0) W.heHead[e] = W.nextOnHe[o]!;
              else W.nextOnHe[before] = W.nextOnHe[o]!;
              if (r & 1) return -1;
              if (TMP[0] !== b0 || TMP[1] !== b1) changed = true;
              b0 = TMP[0]!; b1 = TMP[1]!;
              continue;
            }
            if (side === 0) { W.b0[o] = TMP[2]!; W.b1[o] = TMP[3]!; }
            else { W.b0[o] = L - TMP[3]!; W.b1[o] = L - TMP[2]!; }
          }
          if (r & 1) return -1;
          if (TMP[0] !== b0 || TMP[1] !== b1) changed = true;
          b0 = TMP[0]!; b1 = TMP[1]!;
        }
        before = o;
        if (side === 0 && pass === 0 && W.b0[o]! <= b0) pred = o;
      }
    }
  }
  if (!(b1 - b0 > REL * L)) return -1;
  const key = flat ? sigma + sx * (sx > 0 ? b0 : b1) : sigma + len2((sx < b0 ? b0 : sx > b1 ? b1 : sx) - sx, sy);
  if (key > s.maxDistance) {
    s.capped = true;
    return -1;
  }
  if (W.count >= W.room && !W.makeRoom()) {
    s.overflow = true; // the budget, the window cap or the allocator refused (W.budget.tripped says which)
    return -1;
  }
  // a queued window on this half-edge with the same image and σ that touches N: grow it instead
  for (let o = prune && mergeable ? W.heHead[h]! : -1; o >= 0; o = W.nextOnHe[o]!) {
    if (W.b0[o]! > b1 + tolI) break;
    if (W.state[o] !== 0 || W.flat[o] !== flat) continue;
    if (Math.abs(W.sx[o]! - sx) > tolI || Math.abs(W.sy[o]! - sy) > tolI || Math.abs(W.sigma[o]! - sigma) > tolI) continue;
    const o0 = W.b0[o]!, o1 = W.b1[o]!;
    if (o1 < b0 - tolI || o0 > b1 + tolI) continue;
    const n0 = o0 < b0 ? o0 : b0, n1 = o1 > b1 ? o1 : b1;
    W.b0[o] = n0; W.b1[o] = n1;
    if (W.parent[o] !== parent) W.parent[o] = o; // pieces of two histories: o points at itself (winding.ts)
    if (key < windowKey(W, o, o0, o1)) s.wq.push(windowKey(W, o, n0, n1), o); // the old entry pops later and is skipped
    return o;
  }
  if (W.heCount[h]! >= s.maxPerEdge) {
    s.diverged = 'edge'; // windows piling up on one edge: the run is not converging (guard.ts)
    s.divergedAt = h;
    return -1;
  }
  // keep h's list sorted: insert after the last window starting at or before b0
  let at = -1;
  if (prune) {
    at = pred;
    for (let o = at < 0 ? W.heHead[h]! : W.nextOnHe[at]!; o >= 0 && W.b0[o]! <= b0; o = W.nextOnHe[o]!) at = o;
  }
  const w = W.add(h, b0, b1, sx, sy, sigma, parent, flat, at);
  s.wq.push(key, w);
  return w;
}

/** Smallest distance of window o's light over [b0, b1]. */
function windowKey(W: ExactState['win'], o: number, b0: number, b1: number): number {
  const sx = W.sx[o]!, sy = W.sy[o]!, sg = W.sigma[o]!;
  if (W.flat[o]) return sg + sx * (sx > 0 ? b0 : b1);
  return sg + len2((sx < b0 ? b0 : sx > b1 ? b1 : sx) - sx, sy);
}

/** u ∈ [0, 1] from a ratio, NaN and ±Infinity mapped into range. */
function unit(num: number, den: number): number {
  const u = num / den;
  return u > 0 ? (u < 1 ? u : 1) : 0;
}

/** Propagates window w through its face (see the module sketch). */
export function propagateWindow(s: ExactState, w: number): void {
  const W = s.win, t = s.t;
  if (W.state[w] !== 0) return;
  W.state[w] = 1;
  if (W.flat[w]) return propagatePlanar(s, w);
  const h = W.he[w]!, b0 = W.b0[w]!, b1 = W.b1[w]!, sx = W.sx[w]!, sy = W.sy[w]!, sigma = W.sigma[w]!;
  const L = s.hl[h]!;
  // re-test against bounds that may have dropped since the window was queued
  const A = t.tri[h]!, B = t.tri[next1(h)]!;
  if (s.prune && sigma + len2(b1 - sx, sy) > (s.dist[A]! + b1) * (1 + REL)) return;
  if (s.prune && sigma + len2(b0 - sx, sy) > (s.dist[B]! + (L - b0)) * (1 + REL)) return;
  const cx = s.hc[2 * h]!, cy = s.hc[2 * h + 1]!;
  const den = cy - sy;
  // ray I→C meets the axis at xC = sx + (cx − sx)·(−sy)/(cy − sy)
  const xC = den > 0 ? sx + ((cx - sx) * -sy) / den : cx;
  const hp = prev1(h), hn = next1(h);
  // C gets the real path through the window point nearest the ray I→C: exact when C is lit, and a
  // bound when a ray through a flat vertex grazes it from outside by a rounding error
  const xc = xC < b0 ? b0 : xC > b1 ? b1 : xC;
  relax(s, t.tri[hp]!, sigma + len2(xc - sx, sy) + len2(cx - xc, cy), VIA_WINDOW, w);
  const gp = t.twin[hp]!, sharp = s.geometry.sharp;
  if (gp >= 0 && b0 < xC && !(sharp[A] && winds(W, t, w, gp, A))) {
    // line A + u·(C − A): u(x) = x·sy / ((x − sx)·cy + sy·cx)
    const x1 = b1 < xC ? b1 : xC;
    const u0 = unit(b0 * sy, (b0 - sx) * cy + sy * cx);
    // at x = xC the ray meets C itself (u = 1); recomputing u there cancels badly when I nears the axis
    const u1 = x1 === xC ? 1 : unit(x1 * sy, (x1 - sx) * cy + sy * cx);
    const lca = len2(cx, cy), Lc = s.hl[gp]!;
    if (lca > 0) {
      const ex = cx / lca, ey = cy / lca; // frame of twin(CA) = A→C
      addWindow(s, gp, u0 * Lc, u1 * Lc, sx * ex + sy * ey, -sx * ey + sy * ex, sigma, w);
    }
  }
  const gn = t.twin[hn]!;
  if (gn >= 0 && b1 > xC && !(sharp[B] && winds(W, t, w, gn, B))) {
    // line B + u·(C − B): u(x) = sy·(x − L) / ((x − sx)·cy + sy·(cx − L))
    const x0 = b0 > xC ? b0 : xC;
    const u0 = x0 === xC ? 1 : unit(sy * (x0 - L), (x0 - sx) * cy + sy * (cx - L));
    const u1 = unit(sy * (b1 - L), (b1 - sx) * cy + sy * (cx - L));
    const dx = L - cx, dy = -cy, lbc = len2(dx, dy), Lc = s.hl[gn]!;
    if (lbc > 0) {
      const ex = dx / lbc, ey = dy / lbc; // frame of twin(BC) = C→B
      const px = sx - cx, py = sy - cy;
      addWindow(s, gn, (1 - u0) * Lc, (1 - u1) * Lc, px * ex + py * ey, -px * ey + py * ex, sigma, w);
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
    addWindow(s, gt, 0, L, L - px, -py, sigma, -1 - root);
  }
}

/** Settles vertex v: relaxes its edge neighbours and, for a pseudo-source, emits windows into its shadow wedge. */
export function settleVertex(s: ExactState, v: number): void {
  const t = s.t;
  s.settled[v] = 1;
  const dv = s.dist[v]!;
  const start = t.vertexHalfedge[v]!;
  if (start < 0) return;
  let h = start, steps = 0;
  for (;;) {
    relax(s, t.tri[next1(h)]!, dv + s.hl[h]!, VIA_VERTEX, v);
    const hp = prev1(h);
    const o = t.twin[hp]!;
    if (o < 0) {
      relax(s, t.tri[hp]!, dv + s.hl[hp]!, VIA_VERTEX, v);
      break;
    }
    h = o;
    if (h === start || ++steps > t.tri.length) break;
  }
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
