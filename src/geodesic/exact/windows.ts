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
 */
export class WindowStore {
  /** Number of windows stored. */
  count = 0;
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
  /** 0 queued, 1 propagated, 2 dead (trimmed away before propagation). */
  state: Uint8Array;
  /** 1 for a planar window (see the module comment). */
  flat: Uint8Array;
  /** First window on each half-edge, −1 when none. */
  readonly heHead: Int32Array;

  private readonly maxCapacity: number;

  /**
   * @param nf - number of faces
   * @param capacity - initial capacity (grows by doubling)
   * @param maxCapacity - growth never goes past this (the run's window cap)
   */
  constructor(nf: number, capacity: number, maxCapacity = Infinity) {
    const c = Math.max(64, Math.min(capacity, maxCapacity));
    this.maxCapacity = Math.max(c, maxCapacity);
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
    this.heHead = new Int32Array(3 * nf).fill(-1);
  }

  /** Stores a window and returns its id; it is linked after window `after` on its half-edge (−1: at the head). */
  add(he: number, b0: number, b1: number, sx: number, sy: number, sigma: number, parent: number, flat = 0, after = -1): number {
    if (this.count === this.he.length) this.grow();
    const w = this.count++;
    this.he[w] = he; this.b0[w] = b0; this.b1[w] = b1;
    this.sx[w] = sx; this.sy[w] = sy; this.sigma[w] = sigma; this.parent[w] = parent;
    this.state[w] = 0;
    this.flat[w] = flat;
    if (after < 0) {
      this.nextOnHe[w] = this.heHead[he]!;
      this.heHead[he] = w;
    } else {
      this.nextOnHe[w] = this.nextOnHe[after]!;
      this.nextOnHe[after] = w;
    }
    return w;
  }

  /** Bytes held by the window arrays. */
  get bytes(): number {
    return this.he.length * 54 + this.heHead.byteLength;
  }

  private grow(): void {
    const c = Math.min(2 * this.he.length, this.maxCapacity);
    const gi = (a: Int32Array) => { const b = new Int32Array(c); b.set(a); return b; };
    const gf = (a: Float64Array) => { const b = new Float64Array(c); b.set(a); return b; };
    this.he = gi(this.he); this.parent = gi(this.parent); this.nextOnHe = gi(this.nextOnHe);
    const st = new Uint8Array(c); st.set(this.state); this.state = st;
    const fl = new Uint8Array(c); fl.set(this.flat); this.flat = fl;
    this.b0 = gf(this.b0); this.b1 = gf(this.b1); this.sx = gf(this.sx); this.sy = gf(this.sy); this.sigma = gf(this.sigma);
  }
}
