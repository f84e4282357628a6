/**
 * Storing a new window on a half-edge, in four phases (Surazhsky, Surazhsky,
 * Kirsanov, Gortler & Hoppe, ACM TOG 24(3), 2005, with the vertex filter of
 * Xin & Wang, ACM TOG 28(4), 2009):
 *
 * 1. filter: clamp to the edge, drop a window that even at its far end is
 *    beaten through an end vertex, and cut a prefix/suffix where it is
 *    ({@link cutBehindA}, {@link cutBehindB}; proof in propagate.ts's module
 *    comment);
 * 2. trim: against the windows already on the edge (either side), and
 *    queued ones against it (trim.ts);
 * 3. merge: a queued window with the same image and σ that touches it grows
 *    instead ({@link mergeInto}; flat regions stay one window);
 * 4. insert: store it, keeping the edge's list sorted by b0, and queue it by
 *    its smallest distance.
 *
 * Phases 1, 2 and 4 run on every window and stay in the body of
 * {@link addWindow}, each under its heading: as separate functions they cost
 * 8–10% of a whole-mesh run (measured, A/B in one process: calls V8 does not
 * inline in this hot path). The rare branches (partial cuts, merging) are
 * functions. Working space comes from the run's scratch (`ExactState.scratch`),
 * so nothing here keeps module state.
 */
import type { ExactState } from './state.js';
import { next } from '../../mesh/topology.js';
import { trimBoth } from './trim.js';
import { axisValue, intervalMin } from './light.js';
import { WIN_QUEUED, WIN_DEAD } from './codes.js';

// hot imports bound once: transpilers that emit CommonJS read every imported name through a
// getter on each call
const trimPair = trimBoth;
const next1 = next;
const value = axisValue;
const keyOf = intervalMin;

/** Relative slack of the filter and of degenerate-width tests. */
export const REL = 1e-12;
/** Relative tolerance under which two windows count as the same image and σ (merged). */
const MERGE = 1e-11;

/**
 * Stores a window after clamping, filtering, trimming and merging; returns
 * its id (or the id of the window it merged into) or −1. `flat` marks a
 * planar window (sx, sy = direction, σ = offset; see windows.ts).
 */
export function addWindow(s: ExactState, h: number, b0: number, b1: number, sx: number, sy: number, sigma: number, parent: number, flat = 0): number {
  // 1. filter: clamp to the edge, then the vertex-distance test against both end vertices
  const L = s.hl[h]!;
  if (b0 < 0) b0 = 0;
  if (b1 > L) b1 = L;
  if (!(b1 - b0 > REL * L)) return -1;
  if (!flat && !(sy <= 0)) sy = 0; // rounding (or NaN) guard: image never above the edge
  const t = s.t;
  const A = t.tri[h]!, B = t.tri[next1(h)]!;
  const v1 = value(flat, sx, sy, sigma, b1);
  const v0 = value(flat, sx, sy, sigma, b0);
  const prune = s.prune;
  const dA = prune ? s.dist[A]! : Infinity, dB = prune ? s.dist[B]! : Infinity;
  if (v1 > (dA + b1) * (1 + REL) || v0 > (dB + (L - b0)) * (1 + REL)) return -1;
  if (!flat && v0 > (dA + b0) * (1 + REL)) b0 = cutBehindA(sx, sy, sigma, dA, b0, b1);
  if (!flat && v1 > (dB + (L - b1)) * (1 + REL)) b1 = cutBehindB(sx, sy, sigma, dB, L, b0, b1);

  // 2. trim N against the windows already on this edge (either side) and, in the first pass, queued
  // ones against N; passes repeat while N shrinks (a cut can expose an overlap with another window).
  // Lists are sorted by b0 (each in its own frame), so a scan stops at the first window starting
  // past N; a trim or merge can leave a window slightly out of order, which only costs pruning.
  const W = s.win, g = t.twin[h]!, out = s.scratch.pair, work = s.scratch.trim;
  const tolI = MERGE * (L + Math.abs(sx) + Math.abs(sy) + Math.abs(sigma));
  // merging needs a queued window on h with N's image and σ; the first pass notes whether one
  // exists (trimming only ever removes windows), so the merge scan below runs only then
  let mergeable = flat !== 0 || !prune;
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
        if (side === 0 && !mergeable && oHi >= b0 - tolI && W.state[o] === WIN_QUEUED &&
          Math.abs(W.sigma[o]! - sigma) <= tolI && Math.abs(W.sx[o]! - sx) <= tolI && Math.abs(W.sy[o]! - sy) <= tolI) mergeable = true;
        if (oHi > b0 && oLo < b1) {
          const oc = side === 0 ? W.sx[o]! : L - W.sx[o]!;
          const r = trimPair(b0, b1, sx, sy, sigma, oLo, oHi, oc, W.sy[o]!, W.sigma[o]!, pass === 0 && W.state[o] === WIN_QUEUED, out, work);
          if (r & 2 || (out[2] !== oLo || out[3] !== oHi)) {
            if (r & 2 || !(out[3]! - out[2]! > REL * L)) {
              // O dies (only a queued window is ever trimmed): unlink it, nothing else refers to it
              W.state[o] = WIN_DEAD;
              if (before < 0) W.heHead[e] = W.nextOnHe[o]!;
              else W.nextOnHe[before] = W.nextOnHe[o]!;
              if (r & 1) return -1;
              if (out[0] !== b0 || out[1] !== b1) changed = true;
              b0 = out[0]!; b1 = out[1]!;
              continue;
            }
            if (side === 0) { W.b0[o] = out[2]!; W.b1[o] = out[3]!; }
            else { W.b0[o] = L - out[3]!; W.b1[o] = L - out[2]!; }
          }
          if (r & 1) return -1;
          if (out[0] !== b0 || out[1] !== b1) changed = true;
          b0 = out[0]!; b1 = out[1]!;
        }
        before = o;
        if (side === 0 && pass === 0 && W.b0[o]! <= b0) pred = o;
      }
    }
  }
  if (!(b1 - b0 > REL * L)) return -1;
  const key = keyOf(flat, sx, sy, sigma, b0, b1);
  if (key > s.maxDistance) {
    s.capped = true;
    return -1;
  }
  if (W.count >= W.room && !W.makeRoom()) {
    s.overflow = true; // the budget, the window cap or the allocator refused (W.budget.tripped says which)
    return -1;
  }

  // 3. merge into a queued window on this half-edge with the same image and σ that touches N
  if (prune && mergeable) {
    const o = mergeInto(s, h, b0, b1, sx, sy, sigma, parent, flat, key, tolI);
    if (o >= 0) return o;
  }

  // 4. insert, keeping h's list sorted: after the last window starting at or before b0
  if (W.heCount[h]! >= s.maxPerEdge) {
    s.diverged = 'edge'; // windows piling up on one edge: the run is not converging (guard.ts)
    s.divergedAt = h;
    return -1;
  }
  let at = -1;
  if (prune) {
    at = pred;
    for (let o = at < 0 ? W.heHead[h]! : W.nextOnHe[at]!; o >= 0 && W.b0[o]! <= b0; o = W.nextOnHe[o]!) at = o;
  }
  const w = W.add(h, b0, b1, sx, sy, sigma, parent, flat, at);
  s.wq.push(key, w);
  return w;
}

/**
 * Partial cut at A: g_A(y) = σ + |I − y| − d(A) − y is non-increasing, so
 * where it is > 0 (the window is beaten through A) is a prefix; its zero
 * solves √((y − sx)² + sy²) = y + k, k = d(A) − σ:
 * y* = (sx² + sy² − k²) / (2(k + sx)). Returns the new start of [b0, b1]
 * (b0 when y* is not inside).
 */
function cutBehindA(sx: number, sy: number, sigma: number, dA: number, b0: number, b1: number): number {
  const k = dA - sigma, den = 2 * (k + sx);
  const y = den > 0 ? (sx * sx + sy * sy - k * k) / den : NaN;
  return y > b0 && y < b1 ? y : b0;
}

/**
 * Partial cut at B, mirrored: g_B(y) = σ + |I − y| − d(B) − (L − y) is
 * non-decreasing, > 0 on a suffix. Returns the new end of [b0, b1].
 */
function cutBehindB(sx: number, sy: number, sigma: number, dB: number, L: number, b0: number, b1: number): number {
  const k = dB - sigma, mx = L - sx, den = 2 * (k + mx);
  const y = den > 0 ? L - (mx * mx + sy * sy - k * k) / den : NaN;
  return y > b0 && y < b1 ? y : b1;
}

/**
 * Phase 3: a queued window on h with N's image and σ that touches N grows
 * to cover it; returns that window's id, or −1 when there is none.
 */
function mergeInto(
  s: ExactState, h: number, b0: number, b1: number, sx: number, sy: number, sigma: number, parent: number, flat: number, key: number, tolI: number,
): number {
  const W = s.win;
  for (let o = W.heHead[h]!; o >= 0; o = W.nextOnHe[o]!) {
    if (W.b0[o]! > b1 + tolI) break;
    if (W.state[o] !== WIN_QUEUED || W.flat[o] !== flat) continue;
    if (Math.abs(W.sx[o]! - sx) > tolI || Math.abs(W.sy[o]! - sy) > tolI || Math.abs(W.sigma[o]! - sigma) > tolI) continue;
    const o0 = W.b0[o]!, o1 = W.b1[o]!;
    if (o1 < b0 - tolI || o0 > b1 + tolI) continue;
    const n0 = o0 < b0 ? o0 : b0, n1 = o1 > b1 ? o1 : b1;
    W.b0[o] = n0; W.b1[o] = n1;
    if (W.parent[o] !== parent) W.parent[o] = o; // pieces of two histories: o points at itself (winding.ts)
    const oFlat = W.flat[o]!, osx = W.sx[o]!, osy = W.sy[o]!, osg = W.sigma[o]!;
    // the old entry pops later and is skipped
    if (key < keyOf(oFlat, osx, osy, osg, o0, o1)) s.wq.push(keyOf(oFlat, osx, osy, osg, n0, n1), o);
    return o;
  }
  return -1;
}
