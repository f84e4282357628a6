/**
 * Intrinsic refinement by edge bisection: inserts vertices at the midpoints
 * of long interior edges of an intrinsic triangulation, so that a few huge
 * faces (a terrain's sides given as long fans, a big flat cap) no longer
 * dominate the lumped mass and the cotan couplings of the heat method.
 *
 * This follows the idea of intrinsic Delaunay refinement (Sharp, Soliman &
 * Crane, "Navigating intrinsic triangulations", ACM TOG 38(4), 2019: add
 * vertices to the intrinsic triangulation, the surface and its metric being
 * unchanged), with the simplest insertion point: the midpoint of an edge,
 * which lies on both of its faces, so no point location across faces is
 * needed. Splitting edge ab of faces (a, b, c) and (b, a, d) at m:
 * ```
 *          c                      c
 *         / \                    /|\
 *        /   \                  / | \
 *       a ───── b     ──▶      a──m──b       |mc| = ½ √(2|ca|² + 2|cb|² − |ab|²)
 *        \   /                  \ | /        (the median, from the face's own lengths)
 *         \ /                    \|/
 *          d                      d
 * ```
 * Longest edges are split first (longest-edge bisection, Rivara, Int. J.
 * Numer. Meth. Eng. 20, 1984, keeps the angles bounded away from 0). Boundary
 * edges are not split, so boundary loops (curve sources) keep their vertices.
 * New vertices get ids after the input's, so per-vertex results of the input
 * are the first `nv` entries. The caller runs the Delaunay flips afterwards.
 */
import type { Topology } from '../mesh/topology.js';
import type { IntrinsicMesh } from './intrinsic.js';
import { next, prev } from '../mesh/topology.js';
import { triangleArea } from './triangle.js';

/** Edge length of an equilateral mesh with the same total area and face count: √(4A / (√3·F)). */
export function equilateralEdge(m: IntrinsicMesh): number {
  const { topology: t, edgeLength: L } = m;
  let A = 0;
  for (let f = 0; f < t.nf; f++) A += triangleArea(L[t.edgeOf[3 * f]!]!, L[t.edgeOf[3 * f + 1]!]!, L[t.edgeOf[3 * f + 2]!]!);
  return Math.sqrt((4 * A) / (Math.sqrt(3) * Math.max(1, t.nf)));
}

/** Result of {@link refineLongEdges}. */
export interface RefineResult {
  /** The refined mesh (the input object itself when nothing was split). */
  mesh: IntrinsicMesh;
  /** Vertices inserted. */
  inserted: number;
  /** True when the vertex cap stopped the refinement before every edge was short enough. */
  capped: boolean;
}

/**
 * Splits interior edges longer than `maxLength` at their midpoints, longest
 * first, until none is left or `maxInserted` vertices were added. The input
 * is not modified.
 */
export function refineLongEdges(m: IntrinsicMesh, maxLength: number, maxInserted: number): RefineResult {
  const src = m.topology;
  let any = false;
  for (let e = 0; e < src.ne && !any; e++) any = m.edgeLength[e]! > maxLength && src.twin[src.edgeHalfedge[e]!]! >= 0;
  if (!any || maxInserted < 1) return { mesh: m, inserted: 0, capped: any };
  const tri = Array.from(src.tri), twin = Array.from(src.twin), edgeOf = Array.from(src.edgeOf);
  const eh = Array.from(src.edgeHalfedge), vh = Array.from(src.vertexHalfedge);
  const vo = Array.from(src.vertexOrigin), fo = Array.from(src.faceOrigin);
  const L = Array.from(m.edgeLength);
  let nv = src.nv, nf = src.nf;
  // max-heap of (length, edge) by a sorted work list, re-sorted per round (rounds halve the lengths)
  let inserted = 0, capped = false;
  for (let round = 0; round < 64; round++) {
    const long: number[] = [];
    for (let e = 0; e < L.length; e++) if (L[e]! > maxLength && twin[eh[e]!]! >= 0) long.push(e);
    if (long.length === 0) break;
    long.sort((x, y) => L[y]! - L[x]!);
    for (const e of long) {
      if (!(L[e]! > maxLength)) continue;
      if (inserted >= maxInserted) { capped = true; break; }
      const h = eh[e]!, o = twin[h]!;
      if (o < 0 || ((h / 3) | 0) === ((o / 3) | 0)) continue;
      const hn = next(h), hp = prev(h), on = next(o), op = prev(o);
      const a = tri[h]!, b = tri[hn]!, c = tri[hp]!, d = tri[op]!;
      const l = L[e]!, lbc = L[edgeOf[hn]!]!, lca = L[edgeOf[hp]!]!, lad = L[edgeOf[on]!]!, ldb = L[edgeOf[op]!]!;
      const mc = 0.5 * Math.sqrt(Math.max(0, 2 * lca * lca + 2 * lbc * lbc - l * l));
      const md = 0.5 * Math.sqrt(Math.max(0, 2 * lad * lad + 2 * ldb * ldb - l * l));
      if (!(mc > 0 && md > 0)) continue;
      const mv = nv++;
      const f2 = nf++, f3 = nf++;
      const eMB = L.length, eMC = eMB + 1, eMD = eMB + 2;
      L[e] = 0.5 * l; L.push(0.5 * l, mc, md);
      const s2 = 3 * f2, s3 = 3 * f3;
      // f2 = (m, b, c): m→b, b→c (old hn), c→m
      tri.push(mv, b, c, mv, a, d);
      twin.push(o, twin[hn]!, hn, h, twin[on]!, on);
      edgeOf.push(eMB, edgeOf[hn]!, eMC, e, edgeOf[on]!, eMD);
      fo.push(-1, -1);
      // moved sides keep their edges and outside twins
      const moveSide = (from: number, to: number): void => {
        const tw = twin[from]!, ed = edgeOf[from]!;
        if (tw >= 0) twin[tw] = to;
        if (eh[ed] === from) eh[ed] = to;
        const v = tri[from]!;
        if (vh[v] === from) vh[v] = to;
      };
      moveSide(hn, s2 + 1);
      moveSide(on, s3 + 1);
      // f0 = (a, m, c): h = a→m, hn = m→c, hp = c→a
      tri[hn] = mv; twin[hn] = s2 + 2; edgeOf[hn] = eMC; twin[h] = s3;
      // f1 = (b, m, d): o = b→m, on = m→d, op = d→b
      tri[on] = mv; twin[on] = s3 + 2; edgeOf[on] = eMD; twin[o] = s2; edgeOf[o] = eMB;
      eh[e] = h; eh.push(s2, hn, on);
      vh.push(s2); vo.push(-1);
      fo[(h / 3) | 0] = -1;
      fo[(o / 3) | 0] = -1;
      inserted++;
    }
    if (capped) break;
  }
  if (inserted === 0) return { mesh: m, inserted: 0, capped };
  const t: Topology = {
    nv, nf, ne: L.length,
    tri: Uint32Array.from(tri), twin: Int32Array.from(twin), edgeOf: Int32Array.from(edgeOf),
    edgeHalfedge: Int32Array.from(eh), vertexHalfedge: Int32Array.from(vh),
    vertexOrigin: Int32Array.from(vo), faceOrigin: Int32Array.from(fo),
  };
  return { mesh: { topology: t, edgeLength: Float64Array.from(L) }, inserted, capped };
}
