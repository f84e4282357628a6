/**
 * Dijkstra's algorithm over the edge graph of a mesh (E. W. Dijkstra, "A note
 * on two problems in connexion with graphs", Numer. Math. 1, 1959), weighted
 * by edge length: the loop shared by the graph method (graph.ts) and the flip
 * method's start path (flip/start-path.ts), and its queue.
 *
 * The queue is a binary min-heap over vertex ids in typed arrays with a
 * position index, so decrease-key is a sift-up and nothing is allocated per
 * push (measured in test/bench: lazy deletion with a generic heap is slower).
 */
import type { IntrinsicMesh } from '../../metric/intrinsic.js';
import { next, prev, nextOutgoing } from '../../mesh/topology.js';

/**
 * Binary min-heap of integer ids keyed by a shared Float64Array, with
 * decrease-key. Invariant: key[heap[i]] ≥ key[heap[(i−1)>>1]];
 * pos[id] = index in heap, or −1 when absent.
 */
export class IndexedMinHeap {
  private readonly heap: Int32Array;
  private readonly pos: Int32Array;
  private n = 0;

  /** @param capacity - largest id + 1; @param key - priorities, read at every comparison */
  constructor(capacity: number, private readonly key: Float64Array) {
    this.heap = new Int32Array(capacity);
    this.pos = new Int32Array(capacity).fill(-1);
  }

  /** Number of ids in the heap. */
  get size(): number {
    return this.n;
  }

  /** Inserts `id` or, when present, restores order after its key decreased. */
  push(id: number): void {
    let i = this.pos[id]!;
    if (i < 0) {
      i = this.n++;
      this.heap[i] = id;
      this.pos[id] = i;
    }
    this.up(i);
  }

  /** Removes and returns the id of smallest key (−1 when empty). */
  pop(): number {
    if (this.n === 0) return -1;
    const top = this.heap[0]!;
    this.pos[top] = -1;
    const last = this.heap[--this.n]!;
    if (this.n > 0) {
      this.heap[0] = last;
      this.pos[last] = 0;
      this.down(0);
    }
    return top;
  }

  private up(i: number): void {
    const { heap, pos, key } = this;
    const id = heap[i]!, k = key[id]!;
    while (i > 0) {
      const p = (i - 1) >> 1;
      const pid = heap[p]!;
      if (key[pid]! <= k) break;
      heap[i] = pid; pos[pid] = i;
      i = p;
    }
    heap[i] = id; pos[id] = i;
  }

  private down(i: number): void {
    const { heap, pos, key } = this;
    const n = this.n, id = heap[i]!, k = key[id]!;
    for (;;) {
      let c = 2 * i + 1;
      if (c >= n) break;
      if (c + 1 < n && key[heap[c + 1]!]! < key[heap[c]!]!) c++;
      const cid = heap[c]!;
      if (key[cid]! >= k) break;
      heap[i] = cid; pos[cid] = i;
      i = c;
    }
    heap[i] = id; pos[id] = i;
  }
}

/**
 * Dijkstra's main loop over the edge graph (Dijkstra, Numer. Math. 1, 1959): pops vertices from
 * `heap` (keyed by `dist`), marks them in `done` and relaxes every edge round each — the outgoing
 * half-edges counter-clockwise and, at a boundary vertex, the last incoming boundary edge, so
 * boundary fans are complete. Distances above `maxD` are not pushed. Stops when the heap is empty
 * or when `stopAt` is popped (then final, not marked). When `via` is given, it receives the edge
 * that last improved each vertex (the shortest-path tree). Allocates nothing.
 */
export function runEdgeDijkstra(
  mesh: IntrinsicMesh,
  dist: Float64Array,
  heap: IndexedMinHeap,
  done: Uint8Array,
  maxD = Infinity,
  stopAt = -1,
  via?: Int32Array,
): void {
  const L = mesh.edgeLength;
  const t = mesh.topology;
  const { twin, tri, vertexHalfedge, edgeOf } = t;
  while (heap.size > 0) {
    const v = heap.pop();
    if (v === stopAt) break;
    done[v] = 1;
    const dv = dist[v]!;
    const start = vertexHalfedge[v]!;
    if (start < 0) continue;
    let last = start;
    for (let h = start; h >= 0; h = nextOutgoing(t, start, h)) {
      const w = tri[next(h)]!, e = edgeOf[h]!;
      const nd = dv + L[e]!;
      if (!done[w] && nd < dist[w]! && nd <= maxD) { dist[w] = nd; if (via) via[w] = e; heap.push(w); }
      last = h;
    }
    // a boundary fan ends with an incoming boundary edge: its tail is a neighbour too
    const hp = prev(last);
    if (twin[hp]! < 0) {
      const u = tri[hp]!, eu = edgeOf[hp]!;
      const nu = dv + L[eu]!;
      if (!done[u] && nu < dist[u]! && nu <= maxD) { dist[u] = nu; if (via) via[u] = eu; heap.push(u); }
    }
  }
}
