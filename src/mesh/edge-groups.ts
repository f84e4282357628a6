/**
 * Half-edges grouped by undirected edge, in O(n + nv): a two-pass LSD radix
 * sort (two stable counting sorts) on the key (smaller endpoint, larger
 * endpoint): first by the larger endpoint, then by the smaller one. No pass
 * depends on how many half-edges share a vertex, so high-valence vertices
 * (cone tips, fan-triangulated caps) cost no more than any other.
 * A group of one is a boundary edge, two a manifold edge, more a
 * non-manifold edge. Within a group, half-edges keep increasing index order.
 */
import { next } from './topology.js';

/** Group g holds the half-edges `order[start[g] .. start[g+1])`. */
export interface Groups {
  /** group g holds order[start[g] .. start[g+1]) */
  start: Int32Array;
  /** half-edges sorted by undirected edge */
  order: Int32Array;
}

/** Stable counting sort of `src` by `key(h)` (values in [0, nv)) into `dst`. */
function countingSort(src: Int32Array, dst: Int32Array, nv: number, key: Uint32Array): void {
  const count = new Int32Array(nv + 1);
  for (let i = 0; i < src.length; i++) count[key[src[i]!]! + 1]!++;
  for (let v = 0; v < nv; v++) count[v + 1]! += count[v]!;
  for (let i = 0; i < src.length; i++) {
    const h = src[i]!;
    dst[count[key[h]!]!++] = h;
  }
}

/** Groups half-edges by their undirected edge in linear time (see the module comment). */
export function groupHalfedges(tri: Uint32Array, nv: number): Groups {
  const nh = tri.length;
  const lo = new Uint32Array(nh), hi = new Uint32Array(nh);
  const ident = new Int32Array(nh);
  for (let h = 0; h < nh; h++) {
    const a = tri[h]!, b = tri[next(h)]!;
    lo[h] = a < b ? a : b;
    hi[h] = a < b ? b : a;
    ident[h] = h;
  }
  const byHi = new Int32Array(nh);
  countingSort(ident, byHi, nv, hi);
  const order = ident; // reuse: sorted by (lo, hi), stable in h
  countingSort(byHi, order, nv, lo);
  const starts = new Int32Array(nh + 1);
  let ng = 0;
  for (let i = 0; i < nh; i++) {
    const h = order[i]!;
    if (i === 0) starts[ng++] = 0;
    else {
      const g = order[i - 1]!;
      if (lo[h] !== lo[g] || hi[h] !== hi[g]) starts[ng++] = i;
    }
  }
  starts[ng++] = nh;
  return { start: starts.slice(0, ng), order };
}
