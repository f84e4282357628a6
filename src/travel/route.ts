/**
 * The fastest walking route between surface points, through waypoints in
 * order: one target-stopped search on the Steiner graph per leg
 * (travel-time.ts), the legs joined, and what a walker asks of a route:
 * time, distance on the ground, ascent and descent, the steepest stretch,
 * and a profile (distance, elevation, cumulative time) point by point.
 *
 * Each leg is the graph's fastest route, which is a real route on the mesh
 * (straight steps inside faces): its time is an upper bound of the model's
 * continuous optimum and comes within the Steiner spacing of it
 * (Lanthier, Maheshwari & Sack 2001). A leg whose ends share a face also
 * tries the straight step between them.
 */
import { surfacePointPosition, type SurfacePoint } from '../mesh/surface-point.js';
import { commonFaces } from '../metric/face-points.js';
import { usageError } from '../errors.js';
import type { SteinerGraph } from './steiner-graph.js';
import type { PaceModel } from './pace.js';
import { nodeChain, pointFrame, pointSeeds, runTravelSearch, type TravelState } from './travel-time.js';

/** The steepest stretch of a route. */
export interface SteepestStretch {
  /** Slope angle in degrees (positive uphill in the direction of travel). */
  degrees: number;
  /** Metres along the route where the stretch starts. */
  at: number;
  /** Its length on the ground, metres. */
  meters: number;
}

/** Length on the ground over which the steepest sustained slope of a route is measured, metres. */
export const SUSTAINED_METERS = 10;

/** A walking route on the surface. */
export interface TravelRoute {
  /** Total time, seconds. */
  seconds: number;
  /** Length on the ground (3D), metres. */
  meters: number;
  /** Length in plan (horizontal), metres. */
  horizontalMeters: number;
  /** Total ascent and descent, metres (sums of the rises and falls of the steps). */
  ascent: number;
  /** See {@link ascent}. */
  descent: number;
  /** The steepest single straight step (by absolute slope); null for a route of no length. */
  steepest: SteepestStretch | null;
  /**
   * The steepest sustained stretch: the mean slope (rise over plan distance)
   * of the stretch of at least {@link SUSTAINED_METERS} on the ground that is
   * steepest, starting at a point of the route (the whole route when shorter);
   * null for a route of no length.
   */
  steepestSustained: SteepestStretch | null;
  /** Positions in mesh units, in order (consecutive copies removed). */
  points: [number, number, number][];
  /** Where each point lies on the surface. */
  surfacePoints: SurfacePoint[];
  /** Per point: seconds, metres on the ground, and height (metres along the up axis) from the start. */
  cumulativeSeconds: number[];
  /** See {@link cumulativeSeconds}. */
  cumulativeMeters: number[];
  /** See {@link cumulativeSeconds}. */
  elevation: number[];
  /** Per leg (between consecutive stops): seconds and metres. */
  legs: { seconds: number; meters: number }[];
  /** Index in `points` of each stop (the start, the waypoints, the end). */
  stopIndex: number[];
  /** Arcs relaxed and nodes settled, summed over the legs. */
  work: { relaxed: number; settled: number };
}

/** The straight step between two points sharing a face: its seconds (Infinity when none is passable). */
function directStep(g: SteinerGraph, pace: PaceModel, a: SurfacePoint, b: SurfacePoint): number {
  let best = Infinity;
  const pa = pointFrame(g, a), pb = pointFrame(g, b);
  const dx = Math.hypot(pb[0] - pa[0], pb[1] - pa[1]), s = pace.seconds(dx, pb[2] - pa[2]);
  for (const f of commonFaces(g.t, a, b)) {
    const m = g.faceMult ? g.faceMult[f]! : 1;
    if (m > 0 && s * m < best) best = s === 0 ? 0 : s * m;
  }
  return best;
}

/**
 * The fastest route through `stops` (at least two, visited in order) on
 * graph `g` with `pace`. `USAGE` naming the leg when a stop cannot be
 * reached (every way blocked by the slope limit or impassable faces).
 */
export function fastestRoute(g: SteinerGraph, pace: PaceModel, state: TravelState, stops: readonly SurfacePoint[]): TravelRoute {
  if (stops.length < 2) throw usageError('a route needs at least two points');
  const pts: SurfacePoint[] = [];
  const secs: number[] = [];
  const legs: { seconds: number; meters: number }[] = [];
  const work = { relaxed: 0, settled: 0 };
  const legEnds: number[] = [];
  let t0 = 0;
  for (let i = 0; i + 1 < stops.length; i++) {
    const a = stops[i]!, b = stops[i + 1]!;
    const goal = pointFrame(g, b);
    const r = runTravelSearch(g, pace, state, pointSeeds(g, pace, a, true), pointSeeds(g, pace, b, false), Infinity, [goal[0], goal[1]]);
    work.relaxed += state.relaxed;
    work.settled += state.settled;
    const direct = directStep(g, pace, a, b);
    let leg: SurfacePoint[], legSecs: number[];
    if (direct <= r.seconds) {
      if (direct === Infinity) throw usageError(`no passable route from stop ${i} to stop ${i + 1} (the slope limit or impassable faces block every way)`);
      leg = [a, b];
      legSecs = [0, direct];
    } else {
      const chain = nodeChain(state.pred!, r.via);
      leg = [a, ...chain.map((u) => g.surfacePoint(u)), b];
      legSecs = [0, ...chain.map((u) => state.dist[u]!), r.seconds];
    }
    for (let j = i === 0 ? 0 : 1; j < leg.length; j++) {
      pts.push(leg[j]!);
      secs.push(t0 + legSecs[j]!);
    }
    legs.push({ seconds: legSecs[legSecs.length - 1]!, meters: 0 });
    legEnds.push(pts.length - 1);
    t0 += legSecs[legSecs.length - 1]!;
  }
  return describeRoute(g, pts, secs, legs, legEnds, work);
}

/** Distances, heights, ascent, descent and the steepest step of a chain of points with their times; `legEnds[i]` is the index in `pts` where leg i ends. */
function describeRoute(
  g: SteinerGraph, pts: SurfacePoint[], secs: number[], legs: { seconds: number; meters: number }[], legEnds: number[], work: { relaxed: number; settled: number },
): TravelRoute {
  const out: TravelRoute = {
    seconds: secs[secs.length - 1]!, meters: 0, horizontalMeters: 0, ascent: 0, descent: 0, steepest: null, steepestSustained: null,
    points: [], surfacePoints: [], cumulativeSeconds: [], cumulativeMeters: [], elevation: [], legs, stopIndex: [0], work,
  };
  const along: number[] = [], outIndex: number[] = [], plan: number[] = [0];
  let prev: [number, number, number] | null = null;
  for (let i = 0; i < pts.length; i++) {
    const f = pointFrame(g, pts[i]!);
    if (prev) {
      const dx = Math.hypot(f[0] - prev[0], f[1] - prev[1]), dz = f[2] - prev[2];
      const len = Math.hypot(dx, dz);
      if (len > 0) {
        const deg = (Math.atan2(dz, dx) * 180) / Math.PI;
        if (!out.steepest || Math.abs(deg) > Math.abs(out.steepest.degrees)) out.steepest = { degrees: deg, at: out.meters, meters: len };
        out.meters += len;
        out.horizontalMeters += dx;
        if (dz > 0) out.ascent += dz;
        else out.descent -= dz;
      }
    }
    along.push(out.meters);
    if (!prev || along[i] !== along[i - 1] || f[2] !== prev[2]) {
      // consecutive copies (a vertex stop and its own node) are kept once
      out.points.push(surfacePointPosition(pts[i]!, g.t, g.positions, [0, 0, 0]) as [number, number, number]);
      out.surfacePoints.push(pts[i]!);
      out.cumulativeSeconds.push(secs[i]!);
      out.cumulativeMeters.push(out.meters);
      out.elevation.push(f[2]);
      if (out.points.length > 1) plan.push(out.horizontalMeters);
    }
    outIndex.push(out.points.length - 1);
    prev = f;
  }
  for (const e of legEnds) out.stopIndex.push(outIndex[e]!);
  // steepest sustained: from each point, the first point at least SUSTAINED_METERS further along (two pointers)
  const M = out.cumulativeMeters, Z = out.elevation, np = M.length;
  for (let i = 0, j = 0; i < np - 1 && out.meters > 0; i++) {
    if (j <= i) j = i + 1;
    while (j < np - 1 && M[j]! - M[i]! < SUSTAINED_METERS) j++;
    if (M[j]! - M[i]! < SUSTAINED_METERS && i > 0) break; // the rest is shorter than the stretch
    const dx = plan[j]! - plan[i]!, dz = Z[j]! - Z[i]!;
    const deg = (Math.atan2(dz, dx) * 180) / Math.PI;
    const best = out.steepestSustained;
    if (!best || Math.abs(deg) > Math.abs(best.degrees)) out.steepestSustained = { degrees: deg, at: M[i]!, meters: M[j]! - M[i]! };
  }
  let from = 0;
  legs.forEach((l, i) => {
    l.meters = along[legEnds[i]!]! - along[from]!;
    from = legEnds[i]!;
  });
  return out;
}
