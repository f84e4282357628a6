/**
 * Storing a new window on a half-edge, in four phases (Surazhsky, Surazhsky,
 * Kirsanov, Gortler & Hoppe, ACM TOG 24(3), 2005, with the vertex filter of
 * Xin & Wang, ACM TOG 28(4), 2009):
 *
 * 1. {@link filterByVertices}: clamp to the edge, drop a window that even at
 *    its far end is beaten through an end vertex, and cut a prefix/suffix
 *    where it is (proof in propagate.ts's module comment);
 * 2. {@link trimOnEdge}: trim it against the windows already on the edge
 *    (either side) and queued ones against it (trim.ts);
 * 3. {@link mergeInto}: a queued window with the same image and σ that
 *    touches it grows instead (flat regions stay one window);
 * 4. {@link insertWindow}: store it, keeping the edge's list sorted by b0,
 *    and queue it by its smallest distance.
 *
 * The phases hand the window's interval over through the run's scratch
 * (`ExactState.scratch`), so nothing here keeps module state.
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
  const L = s.hl[h]!;
  if (b0 < 0) b0 = 0;
  if (b1 > L) b1 = L;
  if (!(b1 - b0 > REL * L)) return -1;
  if (!flat && !(sy <= 0)) sy = 0; // rounding (or NaN) guard: image never above the edge
  const sc = s.scratch;
  if (!filterByVertices(s, h, b0, b1, sx, sy, sigma, flat)) return -1;
  const tolI = MERGE * (L + Math.abs(sx) + Math.abs(sy) + Math.abs(sigma));
  if (!trimOnEdge(s, h, sc.b0, sc.b1, sx, sy, sigma, flat, tolI)) return -1;
  b0 = sc.b0; b1 = sc.b1;
  if (!(b1 - b0 > REL * L)) return -1;
  const key = keyOf(flat, sx, sy, sigma, b0, b1);
  if (key > s.maxDistance) {
    s.capped = true;
    return -1;
  }
  const W = s.win;
  if (W.count >= W.room && !W.makeRoom()) {
    s.overflow = true; // the budget, the window cap or the allocator refused (W.budget.tripped says which)
    return -1;
  }
  if (s.prune && sc.mergeable) {
    const o = mergeInto(s, h, b0, b1, sx, sy, sigma, parent, flat, key, tolI);
    if (o >= 0) return o;
  }
  return insertWindow(s, h, b0, b1, sx, sy, sigma, parent, flat, key, sc.pred);
}

/**
 * Phase 1: the vertex-distance filter. False when the window is useless;
 * otherwise its interval, cut where an end vertex beats it, is in
 * `s.scratch.b0`, `b1`.
 */
function filterByVertices(s: ExactState, h: number, b0: number, b1: number, sx: number, sy: number, sigma: number, flat: number): boolean {
  const L = s.hl[h]!, t = s.t;
  const A = t.tri[h]!, B = t.tri[next1(h)]!;
  const v1 = value(flat, sx, sy, sigma, b1);
  const v0 = value(flat, sx, sy, sigma, b0);
  const prune = s.prune;
  const dA = prune ? s.dist[A]! : Infinity, dB = prune ? s.dist[B]! : Infinity;
  if (v1 > (dA + b1) * (1 + REL) || v0 > (dB + (L - b0)) * (1 + REL)) return false;
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
  s.scratch.b0 = b0;
  s.scratch.b1 = b1;
  return true;
}

/**
 * Phase 2: trims the new window N = [b0, b1] against the windows already on
 * h and on its twin (mirrored frame) and, in the first pass, queued ones
 * against N; passes repeat while N shrinks (a cut can expose an overlap with
 * another window). False when N dies; otherwise `s.scratch` holds N's
 * interval, whether a queued window on h could absorb N (`mergeable`, noted
 * in the first pass: trimming only ever removes windows) and the last live
 * window on h starting at or before N's b0 (`pred`, the insertion point).
 *
 * Lists are sorted by b0 (each in its own frame), so a scan stops at the
 * first window starting past N; a trim or merge can leave a window slightly
 * out of order, which only costs pruning.
 */
function trimOnEdge(s: ExactState, h: number, b0: number, b1: number, sx: number, sy: number, sigma: number, flat: number, tolI: number): boolean {
  const L = s.hl[h]!, W = s.win, g = s.t.twin[h]!, prune = s.prune, sc = s.scratch, out = sc.pair, work = sc.trim;
  let mergeable = flat !== 0 || !prune;
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
              if (r & 1) return false;
              if (out[0] !== b0 || out[1] !== b1) changed = true;
              b0 = out[0]!; b1 = out[1]!;
              continue;
            }
            if (side === 0) { W.b0[o] = out[2]!; W.b1[o] = out[3]!; }
            else { W.b0[o] = L - out[3]!; W.b1[o] = L - out[2]!; }
          }
          if (r & 1) return false;
          if (out[0] !== b0 || out[1] !== b1) changed = true;
          b0 = out[0]!; b1 = out[1]!;
        }
        before = o;
        if (side === 0 && pass === 0 && W.b0[o]! <= b0) pred = o;
      }
    }
  }
  sc.b0 = b0; sc.b1 = b1; sc.mergeable = mergeable; sc.pred = pred;
  return true;
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

/**
 * Phase 4: stores N on h after window `pred` (the last starting at or before
 * b0, found by the trim; the list is scanned on from there) and queues it.
 * Returns its id, or −1 when h already holds more windows than a converging
 * run makes (the run is then stopped: guard.ts).
 */
function insertWindow(
  s: ExactState, h: number, b0: number, b1: number, sx: number, sy: number, sigma: number, parent: number, flat: number, key: number, pred: number,
): number {
  const W = s.win;
  if (W.heCount[h]! >= s.maxPerEdge) {
    s.diverged = 'edge'; // windows piling up on one edge: the run is not converging (guard.ts)
    s.divergedAt = h;
    return -1;
  }
  // keep h's list sorted: insert after the last window starting at or before b0
  let at = -1;
  if (s.prune) {
    at = pred;
    for (let o = at < 0 ? W.heHead[h]! : W.nextOnHe[at]!; o >= 0 && W.b0[o]! <= b0; o = W.nextOnHe[o]!) at = o;
  }
  const w = W.add(h, b0, b1, sx, sy, sigma, parent, flat, at);
  s.wq.push(key, w);
  return w;
}
