/**
 * Window storage for the exact solver: struct-of-arrays, growable.
 *
 * A window lies on half-edge `he` and propagates into `faceOf(he)`. In the
 * frame of `he` (tail at the origin, tip at (L, 0), its face above the x
 * axis) the window is the interval [b0, b1] of the x axis lit by the image
 * I = (sx, sy), sy ≤ 0, of a (pseudo-)source at distance σ:
 *
 * ```
 *            face(he)
 *      ───────[b0=====b1]──────▶ he
 *               \     /
 *                \   /     distance at x ∈ [b0, b1] = σ + |x − I|
 *                 \ /
 *                  I (unfolded source image, below the axis)
 * ```
 *
 * A planar window (`flat` 1, lit by a straight wavefront from a curve
 * source) stores instead the unit direction of travel (sx, sy) = (ux, uy),
 * uy > 0, and the offset σ = c: distance at p = c + ux·px + uy·py.
 *
 * `parent` is the window it was propagated from (≥ 0) or −1 − r for a root
 * r (a source or pseudo-source). A window may shrink or die only while it
 * is still queued (`state` 0); once propagated (`state` 1) it never
 * changes, so parent links and intervals stay valid for back-tracing. Each
 * half-edge keeps a singly linked list (`heHead`, `nextOnHe`) of the live
 * windows lying on it (a window is unlinked when it dies), in increasing b0
 * when the run prunes (the order lets a scan stop early; see addWindow).
 *
 * Room. The store holds at most `room` windows before it asks the run's
 * budget for more (budget.ts): `add` requires `count < room`, and the caller
 * calls `makeRoom()` when the store is full. Arrays are reserved ahead and
 * grow by doubling when the budget allows the copy; a refused allocation
 * (RangeError) is reported as such, never thrown mid-run.
 */
import type { Topology } from '../../mesh/topology.js';
import { RunBudget, WINDOW_BYTES } from './budget.js';
import { WIN_QUEUED } from './codes.js';

/** The exact solver's windows, struct-of-arrays, with per-half-edge lists and room granted by the run's budget (see the module comment). */
export class WindowStore {
  /** Number of windows stored. */
  count = 0;
  /** `add` may be called while count < room; past it, call {@link makeRoom}. */
  room: number;
  /** Half-edge each window lies on. */
  he: Int32Array;
  /** Interval start along the half-edge, from its tail. */
  b0: Float64Array;
  /** Interval end along the half-edge, from its tail. */
  b1: Float64Array;
  /** Image x (or direction x for planar windows) in the half-edge frame. */
  sx: Float64Array;
  /** Image y ≤ 0 (or direction y > 0 for planar windows). */
  sy: Float64Array;
  /** Distance σ at the image (or offset c for planar windows). */
  sigma: Float64Array;
  /** Window propagated from (≥ 0) or −1 − root; for diagnostics (back-tracing walks the geometry). */
  parent: Int32Array;
  /** Next window on the same half-edge, −1 at the end. */
  nextOnHe: Int32Array;
  /** WIN_QUEUED, WIN_PROPAGATED or WIN_DEAD (trimmed away before propagation); codes.ts. */
  state: Uint8Array;
  /** POINT_WINDOW or PLANAR_WINDOW (see the module comment; codes.ts). */
  flat: Uint8Array;
  /** First window on each half-edge, −1 when none. */
  readonly heHead: Int32Array;
  /** Windows made on each half-edge, dead ones included (guard.ts caps it). */
  readonly heCount: Int32Array;
  /** 1 for each face that has held a window (up to date after {@link touchedFaces}). */
  readonly faceSeen: Uint8Array;
  private faces = 0;
  private scanned = 0;
  /** The run's memory budget. */
  readonly budget: RunBudget;
  private readonly t: Topology;

  /**
   * @param t - the mesh's topology
   * @param capacity - initial capacity reserved (grows by doubling as the budget allows)
   * @param budget - the run's budget (default: none)
   */
  constructor(t: Topology, capacity: number, budget = new RunBudget(Infinity)) {
    this.t = t;
    this.budget = budget;
    const c = Math.max(64, Math.min(capacity, budget.maxWindows, Math.floor(budget.limit / WINDOW_BYTES)));
    this.he = new Int32Array(c);
    this.b0 = new Float64Array(c);
    this.b1 = new Float64Array(c);
    this.sx = new Float64Array(c);
    this.sy = new Float64Array(c);
    this.sigma = new Float64Array(c);
    this.parent = new Int32Array(c);
    this.nextOnHe = new Int32Array(c);
    this.state = new Uint8Array(c);
    this.flat = new Uint8Array(c);
    this.heHead = new Int32Array(3 * t.nf).fill(-1);
    this.heCount = new Int32Array(3 * t.nf);
    this.faceSeen = new Uint8Array(t.nf);
    this.room = 0; // the first add asks the budget (the state's fixed bytes are known by then)
  }

  /** Stores a window (requires count < room) and returns its id; it is linked after window `after` on its half-edge (−1: at the head). */
  add(he: number, b0: number, b1: number, sx: number, sy: number, sigma: number, parent: number, flat = 0, after = -1): number {
    const w = this.count++;
    this.he[w] = he; this.b0[w] = b0; this.b1[w] = b1;
    this.sx[w] = sx; this.sy[w] = sy; this.sigma[w] = sigma; this.parent[w] = parent;
    this.state[w] = WIN_QUEUED;
    this.flat[w] = flat;
    this.heCount[he]++;
    if (after < 0) {
      this.nextOnHe[w] = this.heHead[he]!;
      this.heHead[he] = w;
    } else {
      this.nextOnHe[w] = this.nextOnHe[after]!;
      this.nextOnHe[after] = w;
    }
    return w;
  }

  /** Number of faces that have held a window (brings {@link faceSeen} up to date). */
  touchedFaces(): number {
    const { faceSeen, he } = this;
    let n = this.faces;
    for (let w = this.scanned; w < this.count; w++) {
      const f = (he[w]! / 3) | 0;
      if (!faceSeen[f]) { faceSeen[f] = 1; n++; }
    }
    this.scanned = this.count;
    return (this.faces = n);
  }

  /**
   * Asks the budget for room for more windows, growing the arrays when
   * needed; false when the budget, the window cap or the allocator refuses
   * (why: `budget.tripped`).
   */
  makeRoom(): boolean {
    const b = this.budget, n = this.count;
    const allowed = b.nextRoom(this.t, n, this.touchedFaces(), this.faceSeen);
    if (allowed <= n) return false;
    if (n < this.he.length) {
      this.room = Math.min(allowed, this.he.length); // reserved room left: fill it before growing
      return true;
    }
    if (!b.allowsGrowth(n)) return false;
    // double; but when a store of twice the size could never be copied again within the budget, take
    // everything the budget holds now (else the run would stop at the doubled size, up to half the
    // budget short). allowed ≤ full and n < maxWindows (nextRoom), so c > n.
    const full = Math.floor((b.limit - b.total(0)) / WINDOW_BYTES);
    let c = 2 * this.he.length;
    if (b.total(c, c * WINDOW_BYTES) > b.limit) c = full;
    c = Math.min(c, b.maxWindows, full);
    try {
      this.grow(c);
    } catch (e) {
      if (!(e instanceof RangeError)) throw e;
      b.refused(c * WINDOW_BYTES);
      return false;
    }
    this.room = Math.min(allowed, c);
    return true;
  }

  /** Bytes held by the window arrays (reserved, not all written). */
  get bytes(): number {
    return this.he.length * WINDOW_BYTES + this.fixedBytes;
  }

  /** Bytes of the per-face arrays (fixed for the run). */
  get fixedBytes(): number {
    return this.heHead.byteLength + this.heCount.byteLength + this.faceSeen.byteLength;
  }

  private grow(c: number): void {
    // allocate every new array before replacing any, so a refusal leaves the store intact
    const n = this.count;
    const gi = (a: Int32Array) => { const b = new Int32Array(c); b.set(a.subarray(0, n)); return b; };
    const gf = (a: Float64Array) => { const b = new Float64Array(c); b.set(a.subarray(0, n)); return b; };
    const gu = (a: Uint8Array) => { const b = new Uint8Array(c); b.set(a.subarray(0, n)); return b; };
    const he = gi(this.he), parent = gi(this.parent), nextOnHe = gi(this.nextOnHe), state = gu(this.state), flat = gu(this.flat);
    const b0 = gf(this.b0), b1 = gf(this.b1), sx = gf(this.sx), sy = gf(this.sy), sigma = gf(this.sigma);
    this.he = he; this.parent = parent; this.nextOnHe = nextOnHe; this.state = state; this.flat = flat;
    this.b0 = b0; this.b1 = b1; this.sx = sx; this.sy = sy; this.sigma = sigma;
  }
}
