/**
 * Half-edges grouped by undirected edge, in O(n): bucket by the smaller
 * endpoint (counting sort), then sort each small bucket by the larger one.
 * A group of one is a boundary edge, two a manifold edge, more a
 * non-manifold edge.
 */
import { next } from './topology.js';

/** Group g holds the half-edges `order[start[g] .. start[g+1])`. */
export interface Groups {
  /** group g holds order[start[g] .. start[g+1]) */
  start: Int32Array;
  /** half-edges sorted by undirected edge */
  order: Int32Array;
}

/** Groups half-edges by their undirected edge, in O(n): bucket by min endpoint, then match max endpoints. */
export function groupHalfedges(tri: Uint32Array, nv: number): Groups {
  const nh = tri.length;
  const count = new Int32Array(nv + 1);
  for (let h = 0; h < nh; h++) {
    const a = tri[h]!, b = tri[next(h)]!;
    count[(a < b ? a : b) + 1]!++;
  }
  for (let v = 0; v < nv; v++) count[v + 1]! += count[v]!;
  const bucket = new Int32Array(nh);
  const fill = count.slice(0, nv);
  for (let h = 0; h < nh; h++) {
    const a = tri[h]!, b = tri[next(h)]!;
    bucket[fill[a < b ? a : b]!++] = h;
  }
  // within each bucket, sort by max endpoint (buckets are small: insertion sort)
  const maxOf = (h: number) => {
    const a = tri[h]!, b = tri[next(h)]!;
    return a > b ? a : b;
  };
  const starts: number[] = [];
  for (let v = 0; v < nv; v++) {
    const s = count[v]!, e = count[v + 1]!;
    for (let i = s + 1; i < e; i++) {
      const h = bucket[i]!;
      const key = maxOf(h);
      let j = i - 1;
      while (j >= s && maxOf(bucket[j]!) > key) {
        bucket[j + 1] = bucket[j]!;
        j--;
      }
      bucket[j + 1] = h;
    }
    for (let i = s; i < e; i++) if (i === s || maxOf(bucket[i]!) !== maxOf(bucket[i - 1]!)) starts.push(i);
  }
  starts.push(nh);
  return { start: Int32Array.from(starts), order: bucket };
}

