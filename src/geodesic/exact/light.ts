/**
 * Where a window's light goes, in the frame of its half-edge (windows.ts):
 * its distance at a point of its own edge, where the ray that reaches a point
 * crossed the edge, and its smallest distance over an interval. The one home
 * of these formulas for propagation, pseudo-sources, evaluation, back-tracing
 * and the usage diagnostic.
 *
 * ```
 *            P = (px, py)          point window: the ray from the image I
 *           /                      to P crosses the axis at
 *    ──────x──────▶ h                x = sx + (px − sx)·(−sy)/(py − sy);
 *         /                        planar window: the ray back from P along
 *        I = (sx, sy), sy ≤ 0      the direction u crosses at x = px − ux·py/uy
 * ```
 */
import { planarLength } from '../../metric/layout.js';

const norm = planarLength;

/** Distance of a window's light at x on its own edge (point image, or planar front when `flat`). */
export function axisValue(flat: number, sx: number, sy: number, sigma: number, x: number): number {
  return flat ? sigma + sx * x : sigma + norm(x - sx, sy);
}

/**
 * Where the light of a window reaching (px, py) (in the window's frame)
 * crossed the axis: towards the image for a point window, back along the
 * direction for a planar one. A point on the axis level with the image (or
 * a front gliding along the axis) crosses at px.
 */
export function windowCrossing(flat: number, sx: number, sy: number, px: number, py: number): number {
  if (flat) return sy > 0 ? px - (sx * py) / sy : px;
  const den = py - sy;
  return den > 0 ? sx + ((px - sx) * -sy) / den : px;
}

/** Smallest distance of a window's light over [b0, b1] on its edge (the key it is queued by). */
export function intervalMin(flat: number, sx: number, sy: number, sigma: number, b0: number, b1: number): number {
  if (flat) return sigma + sx * (sx > 0 ? b0 : b1);
  return sigma + norm((sx < b0 ? b0 : sx > b1 ? b1 : sx) - sx, sy);
}

/** u = num / den clamped into [0, 1], NaN and ±Infinity mapped into range (a parameter along an edge). */
export function unitRatio(num: number, den: number): number {
  const u = num / den;
  return u > 0 ? (u < 1 ? u : 1) : 0;
}
