/**
 * The queue of the walking-time search (search.ts, travel-time.ts): a d-ary
 * min-heap (D. B. Johnson, "Priority queues with update and finding minimum
 * spanning trees", IPL 4(3), 1975) with four children per entry, the keys
 * stored in the heap beside the ids, and decrease-key through a position
 * index.
 *
 * Why not the edge-graph queue (geodesic/shared/edge-dijkstra.ts: a binary
 * heap of ids whose keys are read from the caller's array): the Steiner
 * graph has ten times as many nodes as the mesh has vertices and a wavefront
 * of up to ~100k queued nodes, so every comparison of a sift read a key at a
 * random place in tens of megabytes. Here a sift reads the heap's own
 * arrays (as large as the wavefront) and the four keys of a family share a
 * cache line; only the position index is written at random. Measured on
 * the 1M-face terrain of test/bench/travel.bench.ts (CPU time of the search,
 * loaded machine): the binary heap with inline keys saved ~10 %, four
 * children another ~15 %; lazy deletion (re-push, skip stale entries)
 * instead of decrease-key was slower (14M pushes for 5M nodes).
 */

/**
 * Min-heap of node ids with the keys stored in the heap beside the ids and
 * a position index for decrease-key: a sift reads only the heap's arrays.
 * Four children per node (a d-ary heap, D. B. Johnson, "Priority queues
 * with update and finding minimum spanning trees", IPL 4(3), 1975): half
 * the depth of a binary heap, the four keys of a family in one cache line.
 */
export class PairHeap {
  private keys: Float64Array;
  private ids: Int32Array;
  private readonly pos: Int32Array;
  private n = 0;

  /** @param capacity - largest id + 1 (the heap's own arrays start small and double: they hold the wavefront) */
  constructor(capacity: number) {
    const start = Math.max(16, Math.min(capacity, 1 << 14));
    this.keys = new Float64Array(start);
    this.ids = new Int32Array(start);
    this.pos = new Int32Array(capacity).fill(-1);
  }

  /** Number of ids in the heap. */
  get size(): number {
    return this.n;
  }

  /** The smallest key (Infinity when empty). */
  get minKey(): number {
    return this.n > 0 ? this.keys[0]! : Infinity;
  }

  /** Removes every id (the position index is reset entry by entry: the heap's size, not the capacity). */
  clear(): void {
    for (let i = 0; i < this.n; i++) this.pos[this.ids[i]!] = -1;
    this.n = 0;
  }

  /** Inserts `id` with `key`, or lowers its key when present (a larger key is ignored). */
  push(id: number, key: number): void {
    const keys = this.keys, ids = this.ids, pos = this.pos;
    let i = pos[id]!;
    if (i < 0) {
      if (this.n === keys.length) {
        this.grow();
        this.push(id, key);
        return;
      }
      i = this.n++;
    } else if (keys[i]! <= key) return;
    while (i > 0) {
      const p = (i - 1) >> 2, kp = keys[p]!;
      if (kp <= key) break;
      const q = ids[p]!;
      keys[i] = kp; ids[i] = q; pos[q] = i;
      i = p;
    }
    keys[i] = key; ids[i] = id; pos[id] = i;
  }

  /** Removes and returns the id of smallest key (−1 when empty). */
  pop(): number {
    if (this.n === 0) return -1;
    const keys = this.keys, ids = this.ids, pos = this.pos;
    const top = ids[0]!;
    pos[top] = -1;
    const n = --this.n;
    if (n === 0) return top;
    const key = keys[n]!, id = ids[n]!;
    let i = 0;
    for (;;) {
      const c0 = 4 * i + 1;
      if (c0 >= n) break;
      let c = c0, kc = keys[c0]!;
      const end = c0 + 4 < n ? c0 + 4 : n;
      for (let j = c0 + 1; j < end; j++) {
        const kj = keys[j]!;
        if (kj < kc) { c = j; kc = kj; }
      }
      if (kc >= key) break;
      const q = ids[c]!;
      keys[i] = kc; ids[i] = q; pos[q] = i;
      i = c;
    }
    keys[i] = key; ids[i] = id; pos[id] = i;
    return top;
  }

  private grow(): void {
    const keys = new Float64Array(2 * this.keys.length), ids = new Int32Array(2 * this.ids.length);
    keys.set(this.keys);
    ids.set(this.ids);
    this.keys = keys;
    this.ids = ids;
  }
}

