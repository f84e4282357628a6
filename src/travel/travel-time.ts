/**
 * Walking times over the Steiner graph (steiner-graph.ts): Dijkstra's
 * algorithm (E. W. Dijkstra, Numer. Math. 1, 1959) with non-negative,
 * direction-dependent arc times, the typed-array queue of the edge-graph
 * method (geodesic/shared/edge-dijkstra.ts) and arcs walked in place
 * (search.ts).
 *
 * A source or target off the nodes (a point inside a face or on an edge)
 * is joined to every node of its face(s) by a straight segment in that
 * face: the graph with the point added as a node, without storing it.
 * A target stops the search once no unsettled node can improve it: when
 * the settled time reaches the best arrival found, it is final.
 */
import { PairHeap } from './queue.js';
import { SteinerSearch } from './search.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { facesOfPoint } from '../metric/face-points.js';
import { next } from '../mesh/topology.js';
import type { SteinerGraph } from './steiner-graph.js';
import type { PaceModel } from './pace.js';

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
  /** The node each node was reached from (−1: a seed, or not reached); made by the first search with a target (fields do not keep it). */
  pred?: Int32Array;
  /** 1 where a node is settled. */
  done: Uint8Array;
  /** Seconds from a node to the target, where the node is next to it (NaN elsewhere); made by the first search with a target. */
  toTarget?: Float64Array;
  /** Queue keys of A* searches (time + the heuristic), made on first use. */
  key?: Float64Array;
  /** The queue, made by the first search and cleared by the next. */
  heap?: PairHeap;
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
    done: new Uint8Array(n),
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
  const F = g.vertexFrame;
  for (const [v, s] of w) {
    a += s * F[3 * v]!; b += s * F[3 * v + 1]!; z += s * F[3 * v + 2]!;
  }
  return [a, b, z];
}

/**
 * Seconds of the straight step between a point at frame `p` and node `u`
 * (from the point when `fromPoint`, else to it), times `m`.
 */
export function stepSeconds(g: SteinerGraph, pace: PaceModel, p: [number, number, number], u: number, m: number, fromPoint: boolean): number {
  const q = g.nodeFrame(u), da = q[0]! - p[0], db = q[1]! - p[1], dz = q[2]! - p[2];
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
 * time ≤ `maxSeconds`. Results are in `state.dist` and, with a target, `state.pred`
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
  const { dist, done } = state;
  const pred = target ? (state.pred ??= new Int32Array(g.nodeCount)) : null;
  const minPace = pace.minSecondsPerMeter;
  dist.fill(Infinity);
  pred?.fill(-1);
  done.fill(0);
  // A*: keys are time + h; without a goal the keys are the times themselves
  const hRate = goal && target ? minPace * g.minMultiplier : 0;
  const key = hRate > 0 && Number.isFinite(hRate) ? (state.key ??= new Float64Array(g.nodeCount)) : dist;
  const ga = goal ? goal[0] : 0, gb = goal ? goal[1] : 0;
  const xy = [0, 0, 0];
  const h = (u: number) => {
    g.nodeFrame(u, xy);
    return hRate * Math.sqrt((xy[0]! - ga) * (xy[0]! - ga) + (xy[1]! - gb) * (xy[1]! - gb));
  };
  const heap = (state.heap ??= new PairHeap(g.nodeCount));
  heap.clear();
  for (const s of seeds) {
    if (s.seconds < dist[s.node]!) {
      dist[s.node] = s.seconds;
      if (key !== dist) key[s.node] = s.seconds + h(s.node);
      heap.push(s.node, key[s.node]!);
    }
  }
  const toTarget = target ? (state.toTarget ??= new Float64Array(g.nodeCount).fill(NaN)) : null;
  if (toTarget && target) for (const s of target) toTarget[s.node] = Math.min(s.seconds, Number.isNaN(toTarget[s.node]!) ? Infinity : toTarget[s.node]!);
  const search = new SteinerSearch(g, pace, dist, pred, heap, key, hRate, ga, gb, maxSeconds);
  let best = Infinity, via = -1, settled = 0;
  while (heap.size > 0) {
    const ku = heap.minKey, u = heap.pop();
    if (ku >= best) break; // nothing left can arrive earlier (key ≤ any arrival through u)
    const du = dist[u]!;
    done[u] = 1;
    settled++;
    if (toTarget) {
      const tt = toTarget[u]!;
      if (tt === tt && du + tt < best) { best = du + tt; via = u; }
    }
    search.settle(u, du);
  }
  const relaxed = search.relaxed;
  if (toTarget && target) for (const s of target) toTarget[s.node] = NaN;
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
