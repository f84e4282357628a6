/**
 * Window queue of the exact solver: buckets of fixed width Δ on the key
 * (a window's smallest distance), first in first out inside a bucket.
 *
 * ```
 *   bucket b holds keys in [b·Δ, (b+1)·Δ)      cur: every bucket below is empty
 *   (computed as ⌊key/Δ⌋, one less where rounding puts b·Δ above the key)
 *   ┌──────┬──────┬──────┬──────┬─────
 *   │  ∅   │ w7 w2│ w9   │  ∅   │ w4 …        push O(1), pop O(1) amortised
 *   └──────┴──────┴──────┴──────┴─────
 *            ↑ cur          lowerBound() = cur·Δ ≤ every queued key
 *                           (a push below cur moves cur back)
 * ```
 *
 * Exactness does not need windows in strict key order: a window changes
 * only while queued and every value it gives is the length of a real path,
 * so the order only affects how much the filters prune. What does need
 * order is settling vertices (a pseudo-source emits with σ = its final
 * distance): the event loop settles a vertex only when its key is at most
 * `lowerBound()`, so no queued window can still lower it (propagate.ts).
 * Entries live in a pool of typed arrays with a free list; no per-entry
 * objects.
 */

/** Bucket indices are capped here (larger keys share the last bucket: still ≥ its lower bound). */
const MAX_BUCKETS = 1 << 24;

/** FIFO buckets of window ids by key (see the module comment). */
export class BucketQueue {
  /** Bucket width Δ (mesh units). */
  readonly width: number;
  /** Number of entries. */
  size = 0;
  private head: Int32Array;
  private tail: Int32Array;
  private nb = 0;
  private cur = 0;
  private next: Int32Array;
  private ids: Int32Array;
  private used = 0;
  private free = -1;

  /**
   * @param width - bucket width Δ > 0
   * @param capacity - initial entry capacity (grows by doubling)
   */
  constructor(width: number, capacity = 1024) {
    this.width = width > 0 && Number.isFinite(width) ? width : 1;
    this.head = new Int32Array(64).fill(-1);
    this.tail = new Int32Array(64).fill(-1);
    const c = Math.max(64, capacity);
    this.next = new Int32Array(c);
    this.ids = new Int32Array(c);
  }

  /**
   * Queues window `id` with key `key`. A key below the lowest non-empty
   * bucket moves the front back to its bucket (all buckets below the front
   * are empty), so lowerBound() stays a lower bound: a pseudo-source settled
   * just below the front emits windows there.
   */
  push(key: number, id: number): void {
    let b = Math.floor(key / this.width);
    // key / width can round up onto an integer b with b·width just above key (one ulp, e.g. key
    // 49.99999999999998, width 4.999999999999998 gave 10): that bucket's start would exceed the key
    if (b > 0 && b * this.width > key) b--;
    if (!(b >= 0)) b = b < 0 ? 0 : this.cur; // NaN: anywhere is safe for windows; keep it at the front
    if (b >= MAX_BUCKETS) b = MAX_BUCKETS - 1;
    if (b < this.cur) this.cur = b;
    if (b >= this.head.length) this.growBuckets(b + 1);
    if (b >= this.nb) this.nb = b + 1;
    let e = this.free;
    if (e >= 0) this.free = this.next[e]!;
    else {
      if (this.used === this.ids.length) this.growPool();
      e = this.used++;
    }
    this.ids[e] = id;
    this.next[e] = -1;
    const t = this.tail[b]!;
    if (t < 0) this.head[b] = e;
    else this.next[t] = e;
    this.tail[b] = e;
    this.size++;
  }

  /** A lower bound on every queued key: the start of the lowest non-empty bucket (Infinity when empty). */
  lowerBound(): number {
    while (this.cur < this.nb && this.head[this.cur]! < 0) this.cur++;
    return this.cur < this.nb ? this.cur * this.width : Infinity;
  }

  /** Removes and returns the oldest entry of the lowest non-empty bucket (call after lowerBound() < Infinity). */
  pop(): number {
    const b = this.cur, e = this.head[b]!;
    const n = this.next[e]!;
    this.head[b] = n;
    if (n < 0) this.tail[b] = -1;
    this.next[e] = this.free;
    this.free = e;
    this.size--;
    return this.ids[e]!;
  }

  /** Bytes held by the queue arrays. */
  get bytes(): number {
    return this.head.byteLength + this.tail.byteLength + this.next.byteLength + this.ids.byteLength;
  }

  /**
   * Bytes of the queue arrays written so far: the pool is reserved ahead as
   * zero pages the system maps only when written, and entries are taken in
   * order, so only the first `used` entries cost memory (the memory budget
   * counts these).
   */
  get touchedBytes(): number {
    return this.head.byteLength + this.tail.byteLength + 8 * this.used;
  }

  private growBuckets(min: number): void {
    const c = Math.min(Math.max(min, 2 * this.head.length), MAX_BUCKETS);
    const h = new Int32Array(c).fill(-1), t = new Int32Array(c).fill(-1);
    h.set(this.head); t.set(this.tail);
    this.head = h; this.tail = t;
  }

  private growPool(): void {
    const c = 2 * this.ids.length;
    const n = new Int32Array(c), d = new Int32Array(c);
    n.set(this.next); d.set(this.ids);
    this.next = n; this.ids = d;
  }
}
