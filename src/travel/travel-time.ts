/**
 * Walking times over the Steiner graph (steiner-graph.ts): Dijkstra's
 * algorithm (E. W. Dijkstra, Numer. Math. 1, 1959) with non-negative,
 * direction-dependent arc times, the typed-array queue of the edge-graph
 * method (geodesic/shared/edge-dijkstra.ts) and arcs made on the fly.
 *
 * A source or target off the nodes (a point inside a face or on an edge)
 * is joined to every node of its face(s) by a straight segment in that
 * face: the graph with the point added as a node, without storing it.
 * A target stops the search once no unsettled node can improve it: when
 * the settled time reaches the best arrival found, it is final.
 */
import { IndexedMinHeap } from '../geodesic/shared/edge-dijkstra.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { facesOfPoint } from '../metric/face-points.js';
import { next } from '../mesh/topology.js';
import type { SteinerGraph } from './steiner-graph.js';
import { toblerStepSeconds, type PaceModel } from './pace.js';

/** A node with a time: seconds from the source to the node, or from the node to the target. */
export interface TravelSeed {
  /** Graph node. */
  node: number;
  /** Seconds. */
  seconds: number;
}

/** The working arrays of searches on one graph (reused across searches). */
export interface TravelState {
  /** Seconds from the sources per node (Infinity: not reached). */
  dist: Float64Array;
  /** The node each node was reached from (−1: a seed, or not reached). */
  pred: Int32Array;
  /** 1 where a node is settled. */
  done: Uint8Array;
  /** Seconds from a node to the target, where the node is next to it (NaN elsewhere). */
  toTarget: Float64Array;
  /** Scratch of one node's arcs. */
  to: Int32Array;
  /** See {@link to}. */
  mult: Float64Array;
  /** Queue keys of A* searches (time + the heuristic), made on first use. */
  key?: Float64Array;
  /** Arcs relaxed by the last search. */
  relaxed: number;
  /** Nodes settled by the last search. */
  settled: number;
}

/** Fresh working arrays for searches on `g`. */
export function travelState(g: SteinerGraph): TravelState {
  const n = g.nodeCount;
  return {
    dist: new Float64Array(n),
    pred: new Int32Array(n),
    done: new Uint8Array(n),
    toTarget: new Float64Array(n).fill(NaN),
    to: new Int32Array(g.maxDegree),
    mult: new Float64Array(g.maxDegree),
    relaxed: 0,
    settled: 0,
  };
}

/** Height and horizontal coordinates (metres) of a surface point, interpolated from the graph's vertex nodes. */
export function pointFrame(g: SteinerGraph, p: SurfacePoint): [number, number, number] {
  const t = g.t;
  let w: [number, number, number][];
  if (p.kind === 'vertex') w = [[p.vertex, 1, 0]];
  else if (p.kind === 'edge') {
    const h = t.edgeHalfedge[p.edge]!;
    w = [[t.tri[h]!, 1 - p.t, 0], [t.tri[next(h)]!, p.t, 0]];
  } else w = [0, 1, 2].map((c) => [t.tri[3 * p.face + c]!, p.bary[c]!, 0]);
  let a = 0, b = 0, z = 0;
  for (const [v, s] of w) {
    a += s * g.frame[3 * v]!; b += s * g.frame[3 * v + 1]!; z += s * g.frame[3 * v + 2]!;
  }
  return [a, b, z];
}

/**
 * Seconds of the straight step between a point at frame `p` and node `u`
 * (from the point when `fromPoint`, else to it), times `m`.
 */
export function stepSeconds(g: SteinerGraph, pace: PaceModel, p: [number, number, number], u: number, m: number, fromPoint: boolean): number {
  const F = g.frame, da = F[3 * u]! - p[0], db = F[3 * u + 1]! - p[1], dz = F[3 * u + 2]! - p[2];
  const dx = Math.sqrt(da * da + db * db);
  const s = pace.seconds(dx, fromPoint ? dz : -dz);
  return s === 0 ? 0 : s * m;
}

/**
 * The nodes a point joins, with the seconds of the straight step from the
 * point to each (`fromPoint`) or from each to the point: a vertex is its
 * own node (0 s); an edge or face point reaches every node of its face(s)
 * of positive multiplier (the best face for a node on a shared edge).
 */
export function pointSeeds(g: SteinerGraph, pace: PaceModel, p: SurfacePoint, fromPoint: boolean): TravelSeed[] {
  if (p.kind === 'vertex') return [{ node: p.vertex, seconds: 0 }];
  const frame = pointFrame(g, p);
  const best = new Map<number, number>();
  for (const f of facesOfPoint(g.t, p)) {
    const m = g.faceMult ? g.faceMult[f]! : 1;
    if (!(m > 0)) continue;
    for (const u of g.faceNodes(f)) {
      const s = stepSeconds(g, pace, frame, u, m, fromPoint);
      if (s < (best.get(u) ?? Infinity)) best.set(u, s);
    }
  }
  return [...best].filter(([, s]) => s < Infinity).map(([node, seconds]) => ({ node, seconds }));
}

/** Result of {@link runTravelSearch}. */
export interface SearchResult {
  /** Seconds to the target (Infinity: unreachable, or no target). */
  seconds: number;
  /** The node the best arrival came through (−1: none). */
  via: number;
}

/**
 * Dijkstra from `seeds` over `g` with arc times from `pace`. With `target`
 * (the nodes next to the target and their seconds to it) it stops once the
 * target's time is final; otherwise it settles every reachable node with a
 * time ≤ `maxSeconds`. Results are in `state.dist` and `state.pred`
 * (with a target, times of nodes left unsettled are not final: `state.done`).
 *
 * With `goal` (the target's horizontal position, metres) the queue is
 * ordered by time + h(u), h(u) = horizontal distance to the goal × the
 * fastest pace × the smallest multiplier: A* (Hart, Nilsson & Raphael, IEEE
 * Trans. SSC 4(2), 1968). No step can be faster than h's rate, so h never
 * overestimates and |h(u) − h(w)| ≤ the time of the step u→w (triangle
 * inequality in plan): h is consistent, every settled time is final and the
 * result is the one Dijkstra gives, with fewer nodes settled.
 */
export function runTravelSearch(
  g: SteinerGraph,
  pace: PaceModel,
  state: TravelState,
  seeds: readonly TravelSeed[],
  target: readonly TravelSeed[] | null = null,
  maxSeconds = Infinity,
  goal: [number, number] | null = null,
): SearchResult {
  const { dist, pred, done, toTarget, to, mult } = state;
  const F = g.frame;
  const minPace = pace.minSecondsPerMeter;
  const tobler = pace.name === 'tobler', maxGrade = pace.maxGrade; // the default model called directly (inlined)
  dist.fill(Infinity);
  pred.fill(-1);
  done.fill(0);
  // A*: keys are time + h; without a goal the keys are the times themselves
  const hRate = goal && target ? minPace * g.minMultiplier : 0;
  const key = hRate > 0 && Number.isFinite(hRate) ? (state.key ??= new Float64Array(g.nodeCount)) : dist;
  const ga = goal ? goal[0] : 0, gb = goal ? goal[1] : 0;
  const h = (u: number) => hRate * Math.sqrt((F[3 * u]! - ga) ** 2 + (F[3 * u + 1]! - gb) ** 2);
  const heap = new IndexedMinHeap(g.nodeCount, key);
  for (const s of seeds) {
    if (s.seconds < dist[s.node]!) {
      dist[s.node] = s.seconds;
      if (key !== dist) key[s.node] = s.seconds + h(s.node);
      heap.push(s.node);
    }
  }
  if (target) for (const s of target) toTarget[s.node] = Math.min(s.seconds, Number.isNaN(toTarget[s.node]!) ? Infinity : toTarget[s.node]!);
  let best = Infinity, via = -1, relaxed = 0, settled = 0;
  while (heap.size > 0) {
    const u = heap.pop();
    const du = dist[u]!;
    if (key[u]! >= best) break; // nothing left can arrive earlier (key ≤ any arrival through u)
    done[u] = 1;
    settled++;
    if (target) {
      const tt = toTarget[u]!;
      if (tt === tt && du + tt < best) { best = du + tt; via = u; }
    }
    const n = g.arcs(u, to, mult);
    const au = F[3 * u]!, bu = F[3 * u + 1]!, zu = F[3 * u + 2]!;
    for (let i = 0; i < n; i++) {
      const w = to[i]!, dw = dist[w]!;
      if (dw <= du) continue; // settled, or already as early (steps take no negative time)
      const o = 3 * w, da = F[o]! - au, db = F[o + 1]! - bu, dx = Math.sqrt(da * da + db * db), m = mult[i]!;
      if (du + dx * minPace * m >= dw) continue; // even the fastest pace would not improve w
      const s = tobler ? toblerStepSeconds(dx, F[o + 2]! - zu, maxGrade) : pace.seconds(dx, F[o + 2]! - zu);
      relaxed++;
      const nd = du + (s === 0 ? 0 : s * m);
      if (nd < dw && nd <= maxSeconds) {
        dist[w] = nd;
        pred[w] = u;
        if (key !== dist) key[w] = nd + h(w);
        heap.push(w);
      }
    }
  }
  if (target) for (const s of target) toTarget[s.node] = NaN;
  state.relaxed = relaxed;
  state.settled = settled;
  return { seconds: best, via };
}

/** The nodes from a seed to `u` along `pred`, in order. */
export function nodeChain(pred: Int32Array, u: number): number[] {
  const out: number[] = [];
  for (let w = u; w >= 0; w = pred[w]!) out.push(w);
  return out.reverse();
}
