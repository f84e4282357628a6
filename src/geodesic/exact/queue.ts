/**
 * Event queue of the exact solver: a binary min-heap of (key, id) pairs in
 * two growable typed arrays. No decrease-key: a vertex whose distance drops
 * is pushed again and the stale entry is skipped when popped (lazy deletion).
 * Invariant: keys[i] ≥ keys[(i−1)>>1].
 *
 * A typed heap was chosen over heap-js because the entries are plain number
 * pairs: no object per entry, no comparator call per comparison (for the
 * edge graph, TOOLCHAIN.md records heap-js with lazy deletion at 1.5–2× the
 * time of a typed heap).
 */
export class EventQueue {
  private keys: Float64Array;
  private ids: Int32Array;
  private n = 0;

  /** @param capacity - initial capacity; grows by doubling */
  constructor(capacity = 1024) {
    this.keys = new Float64Array(Math.max(16, capacity));
    this.ids = new Int32Array(Math.max(16, capacity));
  }

  /** Number of entries. */
  get size(): number {
    return this.n;
  }

  /** Smallest key (Infinity when empty). */
  peekKey(): number {
    return this.n ? this.keys[0]! : Infinity;
  }

  /** Adds an entry. */
  push(key: number, id: number): void {
    if (this.n === this.keys.length) {
      const k = new Float64Array(2 * this.n), d = new Int32Array(2 * this.n);
      k.set(this.keys); d.set(this.ids);
      this.keys = k; this.ids = d;
    }
    const { keys, ids } = this;
    let i = this.n++;
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (keys[p]! <= key) break;
      keys[i] = keys[p]!; ids[i] = ids[p]!;
      i = p;
    }
    keys[i] = key; ids[i] = id;
  }

  /** Removes the entry of smallest key and returns its id (call only when size > 0). */
  pop(): number {
    const { keys, ids } = this;
    const top = ids[0]!;
    const n = --this.n;
    if (n > 0) {
      const key = keys[n]!, id = ids[n]!;
      let i = 0;
      for (;;) {
        let c = 2 * i + 1;
        if (c >= n) break;
        // the smaller child by arithmetic on the comparison rather than a branch: which child is
        // smaller is a coin toss, and V8 then emits a conditional set, not a mispredicted jump
        if (c + 1 < n) c += +(keys[c + 1]! < keys[c]!);
        if (keys[c]! >= key) break;
        keys[i] = keys[c]!; ids[i] = ids[c]!;
        i = c;
      }
      keys[i] = key; ids[i] = id;
    }
    return top;
  }

  /** Bytes held by the queue arrays. */
  get bytes(): number {
    return this.keys.byteLength + this.ids.byteLength;
  }
}
