/**
 * Planar windows: the straight wavefronts of curve (segment) sources.
 *
 * Inside its face, the distance to a segment PQ is the distance to its
 * nearer end (point sources, handled elsewhere) or, in the strip over PQ,
 * the distance to its line: a front moving at unit speed along a normal
 * ±n. Unfolded across edges the front stays straight, so a planar window on
 * half-edge h carries the direction u = (ux, uy), uy > 0, and an offset c
 * with distance c + u·p at any point p it lights (windows.ts).
 *
 * ```
 *        face(h)     ↑ u   ↑ u          rays: x + t·u, x ∈ [b0, b1]
 *      ─────────[b0══════════b1]───▶ h
 * ```
 *
 * Propagation mirrors the point case with parallel rays: the ray through C
 * meets the axis at xC = cx − ux·cy/uy; [b0, min(b1, xC)] leaves through CA
 * and [max(b0, xC), b1] through BC; in a child frame with origin O and axis
 * e, normal n: u' = (u·e, u·n), c' = c + u·O.
 */
import { next, prev } from '../../mesh/topology.js';
import type { ExactState } from './state.js';
import { relaxVertex } from './state.js';
import { VIA_WINDOW, PLANAR_WINDOW } from './codes.js';
import { addWindow, REL } from './add-window.js';
import { windowCrossing, unitRatio as unit } from './light.js';
import { planarLength as norm } from '../../metric/layout.js';
import { windsAround } from './winding.js';

/** Propagates planar window w through its face (already marked propagated). */
export function propagatePlanar(s: ExactState, w: number): void {
  const W = s.win, t = s.t;
  const h = W.he[w]!, b0 = W.b0[w]!, b1 = W.b1[w]!, ux = W.sx[w]!, uy = W.sy[w]!, c = W.sigma[w]!;
  const L = s.hl[h]!;
  if (!(uy > REL)) return; // a front gliding along the edge lights nothing inside
  const A = t.tri[h]!, B = t.tri[next(h)]!;
  if (s.prune && c + ux * b1 > (s.dist[A]! + b1) * (1 + REL)) return;
  if (s.prune && c + ux * b0 > (s.dist[B]! + (L - b0)) * (1 + REL)) return;
  const cx = s.hc[2 * h]!, cy = s.hc[2 * h + 1]!;
  const xC = windowCrossing(PLANAR_WINDOW, ux, uy, cx, cy); // uy > 0 here: cx − ux·cy/uy
  const hp = prev(h), hn = next(h);
  const xc = xC < b0 ? b0 : xC > b1 ? b1 : xC; // as for point windows: exact when lit, a bound otherwise
  relaxVertex(s, t.tri[hp]!, c + ux * xc + norm(cx - xc, cy), VIA_WINDOW, w);
  const gp = t.twin[hp]!, sharp = s.geometry.sharp;
  // a front that would go once round a sharp vertex carries no shortest path (winding.ts)
  if (gp >= 0 && b0 < xC && !(sharp[A] && windsAround(W, t, w, gp, A))) {
    // A→C hit at s(x) = x·uy / (cx·uy − cy·ux)
    const den = cx * uy - cy * ux, x1 = b1 < xC ? b1 : xC;
    const lca = norm(cx, cy), Lc = s.hl[gp]!;
    if (lca > 0) {
      const ex = cx / lca, ey = cy / lca;
      addWindow(s, gp, unit(b0 * uy, den) * Lc, unit(x1 * uy, den) * Lc, ux * ex + uy * ey, -ux * ey + uy * ex, c, w, PLANAR_WINDOW);
    }
  }
  const gn = t.twin[hn]!;
  if (gn >= 0 && b1 > xC && !(sharp[B] && windsAround(W, t, w, gn, B))) {
    // B→C hit at s(x) = (x − L)·uy / ((cx − L)·uy − cy·ux); the twin runs C→B
    const den = (cx - L) * uy - cy * ux, x0 = b0 > xC ? b0 : xC;
    const dx = L - cx, dy = -cy, lbc = norm(dx, dy), Lc = s.hl[gn]!;
    if (lbc > 0) {
      const ex = dx / lbc, ey = dy / lbc;
      const s0 = unit((x0 - L) * uy, den), s1 = unit((b1 - L) * uy, den);
      addWindow(s, gn, (1 - s0) * Lc, (1 - s1) * Lc, ux * ex + uy * ey, -ux * ey + uy * ex, c + ux * cx + uy * cy, w, PLANAR_WINDOW);
    }
  }
}

/**
 * Emits the planar windows of segment PQ of face f (barycentric bp, bq) onto
 * the twins of the face's edges, one front per side of the segment, over the
 * part of each edge whose foot on PQ's line falls inside PQ. In the frame of
 * edge g = 3f+k (face above the axis) a front leaving through g has uy < 0;
 * lit x satisfy (x − P)·d ∈ [0, |d|²] and (x − P)·u ≥ 0, d = Q − P; its
 * distance is u·(x − P). The twin frame flips both axes about (L, 0).
 */
export function emitFromSegment(s: ExactState, f: number, bp: ArrayLike<number>, bq: ArrayLike<number>, root: number): void {
  for (let k = 0; k < 3; k++) {
    const g = 3 * f + k;
    const gt = s.t.twin[g]!;
    if (gt < 0) continue;
    const L = s.hl[g]!, cx = s.hc[2 * g]!, cy = s.hc[2 * g + 1]!;
    const k1 = (k + 1) % 3, k2 = (k + 2) % 3;
    const px = bp[k1]! * L + bp[k2]! * cx, py = bp[k2]! * cy;
    const qx = bq[k1]! * L + bq[k2]! * cx, qy = bq[k2]! * cy;
    const dx = qx - px, dy = qy - py, len = norm(dx, dy);
    if (!(len > REL * L)) continue;
    for (const sign of [1, -1]) {
      const ux = (-sign * dy) / len, uy = (sign * dx) / len;
      if (!(uy < -REL)) continue; // this side of the segment does not face edge g
      let lo = 0, hi = L;
      // foot inside PQ: (x − px)·dx − py·dy ∈ [0, len²]
      if (Math.abs(dx) > REL * len) {
        const a = px + (py * dy) / dx, b = px + (py * dy + len * len) / dx;
        lo = Math.max(lo, Math.min(a, b));
        hi = Math.min(hi, Math.max(a, b));
      } else if (!(-py * dy >= 0 && -py * dy <= len * len)) continue;
      // in front: (x − px)·ux − py·uy ≥ 0
      if (ux > 0) lo = Math.max(lo, px + (py * uy) / ux);
      else if (ux < 0) hi = Math.min(hi, px + (py * uy) / ux);
      if (!(hi - lo > REL * L)) continue;
      const c = -(ux * px + uy * py);
      addWindow(s, gt, L - hi, L - lo, -ux, -uy, c + ux * L, -1 - root, PLANAR_WINDOW);
    }
  }
}
