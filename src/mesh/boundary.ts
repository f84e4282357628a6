/**
 * Boundary loops: chains of half-edges without a twin. On a built topology
 * every vertex has a single fan, so each boundary vertex has exactly one
 * outgoing boundary half-edge (`vertexHalfedge`) and the loops are disjoint.
 */
import type { Topology } from './topology.js';
import { next } from './topology.js';

/**
 * Returns every boundary loop as the list of its half-edges, in order; the
 * face lies to the left of each half-edge, so outer boundaries run
 * counter-clockwise and holes clockwise when seen from the normal side.
 */
export function boundaryLoops(t: Topology): Int32Array[] {
  const nh = t.twin.length;
  const seen = new Uint8Array(nh);
  const loops: Int32Array[] = [];
  const buf: number[] = [];
  for (let h0 = 0; h0 < nh; h0++) {
    if (t.twin[h0] !== -1 || seen[h0]) continue;
    buf.length = 0;
    let h = h0;
    while (!seen[h]) {
      seen[h] = 1;
      buf.push(h);
      const v = t.tri[next(h)]!; // tip
      h = t.vertexHalfedge[v]!;
      if (h < 0 || t.twin[h] !== -1) break; // cannot happen on a built topology
    }
    loops.push(Int32Array.from(buf));
  }
  return loops;
}

/** Per-vertex flag: 1 on the boundary, 0 inside (isolated vertices count as inside). */
export function boundaryVertexMask(t: Topology): Uint8Array {
  const m = new Uint8Array(t.nv);
  for (let h = 0; h < t.twin.length; h++) {
    if (t.twin[h] === -1) {
      m[t.tri[h]!] = 1;
      m[t.tri[next(h)]!] = 1;
    }
  }
  return m;
}
