/**
 * The inner loop of the walking-time search (travel-time.ts): Dijkstra's
 * algorithm (E. W. Dijkstra, Numer. Math. 1, 1959), or A* (Hart, Nilsson &
 * Raphael, IEEE Trans. SSC 4(2), 1968) with a goal, over the Steiner graph
 * of steiner-graph.ts (Lanthier, Maheshwari & Sack 2001), its arcs walked
 * in place instead of listed.
 *
 * The arcs are exactly those of `SteinerGraph.arcs` (the readable
 * definition; test/travel checks this loop against a plain Dijkstra over
 * it), grouped as the loop meets them: out of a Steiner point on edge e,
 * its two neighbours along e, then per face of e its opposite corner and
 * the k points of each of its two other edges; out of a vertex, per
 * outgoing half-edge the neighbour along it and the k points of the
 * opposite edge, and the incoming boundary edge at a boundary vertex.
 *
 * Why it is written this way (measured on the 1M-face terrain of
 * test/bench/travel.bench.ts): a Steiner point's coordinates are computed
 * from its edge's end vertices when an arc needs them, not read from a
 * stored array of 24 bytes per node, so the loop reads the vertex
 * coordinates (a twelfth of the memory) and the times; the arcs are not
 * copied into scratch arrays first; a head that is already as early as the
 * tail is skipped before its coordinates are computed; the fastest pace
 * bounds the step from below before the model is evaluated.
 */
import type { PairHeap } from './queue.js';
import type { SteinerGraph } from './steiner-graph.js';
import { toblerStepSeconds, type PaceModel } from './pace.js';

/** The next half-edge in the same face (topology.ts's rule, local so the loop calls nothing across modules). */
const nxt = (h: number): number => (h % 3 === 2 ? h - 2 : h + 1);
/** The previous half-edge in the same face. */
const prv = (h: number): number => (h % 3 === 0 ? h + 2 : h - 1);

/** One search's state: the loop reads these fields. */
export class SteinerSearch {
  private readonly F: Float64Array;
  private readonly rec: Int32Array;
  private readonly params: Float64Array;
  private readonly minPace: number;
  private readonly maxGrade: number;
  private readonly tobler: boolean;
  /** Arcs whose model time was evaluated. */
  relaxed = 0;
  /** The node being settled, its time and coordinates. */
  private u = 0;
  private du = 0;
  private au = 0;
  private bu = 0;
  private zu = 0;

  /**
   * @param g - the graph; @param pace - the model; @param dist - times (the queue's keys without a goal)
   * @param pred - predecessors (null: not kept); @param heap - the queue, keyed by `key`
   * @param key - `dist`, or the A* keys (time + hRate × plan distance to (ga, gb))
   */
  constructor(
    private readonly g: SteinerGraph,
    private readonly pace: PaceModel,
    private readonly dist: Float64Array,
    private readonly pred: Int32Array | null,
    private readonly heap: PairHeap,
    private readonly key: Float64Array,
    private readonly hRate: number,
    private readonly ga: number,
    private readonly gb: number,
    private readonly maxSeconds: number,
  ) {
    this.F = g.vertexFrame;
    this.rec = g.edgeRecord;
    this.params = g.params;
    this.minPace = pace.minSecondsPerMeter;
    this.maxGrade = pace.maxGrade;
    this.tobler = pace.name === 'tobler';
  }

  /** Relaxes every arc out of node `u`, settled at time `du`. */
  settle(u: number, du: number): void {
    const g = this.g, t = g.t, k = g.k, nv = g.nv, F = this.F, fm = g.faceMult, em = g.edgeMult;
    const { twin, edgeOf, edgeHalfedge } = t;
    this.u = u;
    this.du = du;
    if (u >= nv) {
      const e = ((u - nv) / k) | 0, j = u - nv - e * k;
      const R = this.rec, r8 = 8 * e, A = 3 * R[r8]!, B = 3 * R[r8 + 1]!;
      const s = this.params[j]!, r = 1 - s;
      this.au = r * F[A]! + s * F[B]!;
      this.bu = r * F[A + 1]! + s * F[B + 1]!;
      this.zu = r * F[A + 2]! + s * F[B + 2]!;
      const me = em ? em[e]! : 1;
      if (me > 0) {
        if (j > 0) this.edgePoint(u - 1, j - 1, A, B, me);
        else this.vertex(A / 3, me);
        if (j < k - 1) this.edgePoint(u + 1, j + 1, A, B, me);
        else this.vertex(B / 3, me);
      }
      for (let side = 0; side < 2; side++) {
        const c = R[r8 + 2 + 3 * side]!;
        if (c < 0) continue; // no face on this side
        let m = 1;
        if (fm) {
          const h0 = edgeHalfedge[e]!, h = side === 0 ? h0 : twin[h0]!;
          m = fm[(h / 3) | 0]!;
          if (!(m > 0)) continue;
        }
        this.vertex(c, m);
        this.edgePoints(R[r8 + 3 + 3 * side]!, m);
        this.edgePoints(R[r8 + 4 + 3 * side]!, m);
      }
      return;
    }
    const start = t.vertexHalfedge[u]!;
    if (start < 0) return;
    this.au = F[3 * u]!;
    this.bu = F[3 * u + 1]!;
    this.zu = F[3 * u + 2]!;
    let last = start;
    for (let h = start; h >= 0; ) {
      last = h;
      this.along(u, edgeOf[h]!);
      const m = fm ? fm[(h / 3) | 0]! : 1;
      if (m > 0) this.edgePoints(edgeOf[nxt(h)]!, m); // across the face: the Steiner points of the opposite edge
      const o = twin[prv(h)]!;
      h = o === start ? -1 : o;
    }
    const hp = prv(last);
    if (twin[hp]! < 0) this.along(u, edgeOf[hp]!); // the incoming boundary edge
  }

  /** The arc from vertex `v` to its neighbour node along edge `e`. */
  private along(v: number, e: number): void {
    const g = this.g, me = g.edgeMult ? g.edgeMult[e]! : 1;
    if (!(me > 0)) return;
    const k = g.k, tail = this.rec[8 * e]!, head = this.rec[8 * e + 1]!;
    if (k === 0) this.vertex(tail === v ? head : tail, me);
    else if (tail === v) this.edgePoint(g.nv + e * k, 0, 3 * tail, 3 * head, me);
    else this.edgePoint(g.nv + e * k + k - 1, k - 1, 3 * tail, 3 * head, me);
  }

  /** Arcs to the k Steiner points of edge `e`. */
  private edgePoints(e: number, m: number): void {
    const g = this.g, k = g.k;
    if (k === 0) return;
    const A = 3 * this.rec[8 * e]!, B = 3 * this.rec[8 * e + 1]!;
    const base = g.nv + e * k;
    for (let j = 0; j < k; j++) this.edgePoint(base + j, j, A, B, m);
  }

  /** The arc to Steiner point `w`, the `j`-th of the edge from vertex coordinates at `A` to `B` (offsets in the frame). */
  private edgePoint(w: number, j: number, A: number, B: number, m: number): void {
    const dw = this.dist[w]!;
    if (dw <= this.du) return; // settled, or already as early (steps take no negative time)
    const F = this.F, s = this.params[j]!, r = 1 - s;
    this.relax(w, dw, r * F[A]! + s * F[B]!, r * F[A + 1]! + s * F[B + 1]!, r * F[A + 2]! + s * F[B + 2]!, m);
  }

  /** The arc to vertex `v`. */
  private vertex(v: number, m: number): void {
    const dw = this.dist[v]!;
    if (dw <= this.du) return;
    const F = this.F;
    this.relax(v, dw, F[3 * v]!, F[3 * v + 1]!, F[3 * v + 2]!, m);
  }

  /** The arc to node `w` (time `dw`, coordinates `wa, wb, wz`) with multiplier `m`. */
  private relax(w: number, dw: number, wa: number, wb: number, wz: number, m: number): void {
    const du = this.du, da = wa - this.au, db = wb - this.bu, dx = Math.sqrt(da * da + db * db);
    const dz = wz - this.zu;
    // a lower bound of the step: Tobler's dx·0.6·e^{3.5|dz/dx + 0.05|} with e^x ≥ 1 + x (shaved by 1e-9 against
    // rounding), else the fastest pace; a step it cannot make earlier than w's time is not evaluated
    const lb = this.tobler ? 0.6 * (1 - 1e-9) * (dx + 3.5 * Math.abs(dz + 0.05 * dx)) : dx * this.minPace;
    if (du + lb * m >= dw) return;
    const s = this.tobler ? toblerStepSeconds(dx, dz, this.maxGrade) : this.pace.seconds(dx, dz);
    this.relaxed++;
    const nd = du + (s === 0 ? 0 : s * m);
    if (nd < dw && nd <= this.maxSeconds) {
      this.dist[w] = nd;
      if (this.pred) this.pred[w] = this.u;
      if (this.key !== this.dist) {
        const ea = wa - this.ga, eb = wb - this.gb;
        this.key[w] = nd + this.hRate * Math.sqrt(ea * ea + eb * eb);
        this.heap.push(w, this.key[w]!);
      } else this.heap.push(w, nd);
    }
  }
}
