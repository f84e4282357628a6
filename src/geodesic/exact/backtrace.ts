/**
 * Back-tracing a shortest path through the windows.
 *
 * From the end point P, the best candidate of its face (see evaluate.ts)
 * names a window w and the point x where the segment from P towards w's
 * image crosses w's edge. From x the light came through the face on the
 * other side of that edge: evaluating x there (ignoring the windows lying on
 * x's own edge, which would give a step of length zero) names the next
 * window and crossing, and so on, until the best candidate is a source
 * point or a corner vertex; from a vertex the walk follows how that vertex's
 * distance was reached (a window, an edge from a settled vertex, or a
 * source).
 *
 * ```
 *   P ── x_k ── x_{k−1} ── … ── x_1 ── S      unfolded: straight between
 *        w_k    w_{k−1}          w_1          pseudo-sources
 * ```
 *
 * Each step moves along a real segment inside one face and lands on a point
 * whose evaluated distance is at most the remaining length, so the path is
 * a real surface path no longer than the distance reported at P (and so
 * equal to it, as nothing is shorter than the exact distance). The walk
 * uses the stored geometry only, not parent links, so windows merged or
 * trimmed after they were stored do not break it.
 */
import type { SurfacePoint } from '../../mesh/surface-point.js';
import { next, faceOf } from '../../mesh/topology.js';
import type { ExactState } from './state.js';
import { VIA_WINDOW, VIA_VERTEX, VIA_ROOT, EVAL_NONE, EVAL_WINDOW, EVAL_CORNER, EVAL_ROOT, type EvalKind } from './codes.js';
import type { Evaluation } from './evaluate.js';
import { evaluateInFace } from './evaluate.js';
import { windowCrossing } from './light.js';

const REL = 1e-12;

/** The surface point at distance x from the tail of half-edge h (a vertex at either end). */
function edgePoint(s: ExactState, h: number, x: number): SurfacePoint {
  const L = s.hl[h]!;
  const t = s.t;
  if (!(x > REL * L)) return { kind: 'vertex', vertex: t.tri[h]! };
  if (!(x < L * (1 - REL))) return { kind: 'vertex', vertex: t.tri[next(h)]! };
  const e = t.edgeOf[h]!;
  const u = x / L;
  return { kind: 'edge', edge: e, t: t.edgeHalfedge[e] === h ? u : 1 - u };
}

/** Crossing with window w's axis of the segment from (px, py) (in w's frame) to w's image. */
function crossing(s: ExactState, w: number, px: number, py: number, clamp: boolean): number {
  const W = s.win;
  const x = windowCrossing(W.flat[w]!, W.sx[w]!, W.sy[w]!, px, py);
  if (!clamp) return x;
  const b0 = W.b0[w]!, b1 = W.b1[w]!;
  return x < b0 ? b0 : x > b1 ? b1 : x;
}

/**
 * Points of the shortest path from the sources to `end`, given the best
 * evaluation of `end`, in order from source to end. `sourcePoint(r, from)`
 * returns the point of root r nearest to `from` (the point itself, or the
 * foot on a curve segment).
 */
export function tracePath(
  s: ExactState,
  end: SurfacePoint,
  best: Evaluation,
  sourcePoint: (root: number, from: SurfacePoint) => SurfacePoint,
): SurfacePoint[] {
  const out: SurfacePoint[] = [end];
  const t = s.t, W = s.win;
  let guard = 8 * (t.nf + t.nv) + 16;
  const ev: Evaluation = { value: 0, kind: EVAL_NONE, id: 0, x: 0 };
  const b = [0, 0, 0];
  let kind: EvalKind = best.kind, id = best.id, x = best.x;
  const P = [0, 0];
  const seen = new Set<number>();
  while (--guard > 0) {
    if (kind === EVAL_ROOT) { out.push(sourcePoint(s.pointRoots[id]!.root, out[out.length - 1]!)); break; }
    if (kind === EVAL_WINDOW) {
      const h = W.he[id]!;
      out.push(edgePoint(s, h, x));
      // continue from x in the face across h, skipping windows on x's own edge
      const g = t.twin[h]!;
      if (g < 0) break;
      const f = faceOf(g), k = g - 3 * f, L = s.hl[h]!;
      // g runs tip(h) → tail(h): x from tail(h) is L − x from g's tail
      b[0] = b[1] = b[2] = 0;
      b[k] = x / L;
      b[(k + 1) % 3] = 1 - x / L;
      evaluateInFace(s, f, b, ev, g);
      if (ev.kind === EVAL_NONE || !(ev.value < Infinity)) break;
      kind = ev.kind; id = ev.id; x = ev.x;
      continue;
    }
    if (kind !== EVAL_CORNER) break;
    // at vertex id
    const v = id;
    const last = out[out.length - 1]!;
    if (!(last.kind === 'vertex' && last.vertex === v)) out.push({ kind: 'vertex', vertex: v });
    const type = s.viaType[v]!, via = s.viaId[v]!;
    if (seen.has(v)) break; // a zero-length cycle: cannot happen with exact bounds, guarded anyway
    seen.add(v);
    if (type === VIA_VERTEX) { id = via; continue; }
    if (type === VIA_WINDOW) {
      const h = W.he[via]!;
      if (t.tri[h] === v) { P[0] = 0; P[1] = 0; }
      else if (t.tri[next(h)] === v) { P[0] = s.hl[h]!; P[1] = 0; }
      else { P[0] = s.hc[2 * h]!; P[1] = s.hc[2 * h + 1]!; }
      // v is the third corner of the window's face, reached when the (then final) window was propagated
      x = crossing(s, via, P[0]!, P[1]!, true);
      kind = EVAL_WINDOW; id = via;
      continue;
    }
    if (type === VIA_ROOT) out.push(sourcePoint(via, { kind: 'vertex', vertex: v }));
    break; // a source vertex (or nothing reached it)
  }
  out.reverse();
  return dedupe(out);
}

function same(a: SurfacePoint, b: SurfacePoint): boolean {
  if (a.kind === 'vertex') return b.kind === 'vertex' && a.vertex === b.vertex;
  if (a.kind === 'edge') return b.kind === 'edge' && a.edge === b.edge && Math.abs(a.t - b.t) <= REL;
  return b.kind === 'face' && a.face === b.face && a.bary.every((x, i) => Math.abs(x - b.bary[i]!) <= REL);
}

function dedupe(pts: SurfacePoint[]): SurfacePoint[] {
  const out: SurfacePoint[] = [];
  for (const p of pts) if (!out.length || !same(out[out.length - 1]!, p)) out.push(p);
  return out;
}
