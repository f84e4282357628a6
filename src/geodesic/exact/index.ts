/**
 * Exact polyhedral geodesic distances and shortest paths by window
 * propagation.
 *
 * Method. Continuous Dijkstra with windows (Mitchell, Mount, Papadimitriou,
 * SIAM J. Comput. 16(4), 1987) in the practical form of Surazhsky,
 * Surazhsky, Kirsanov, Gortler & Hoppe, "Fast exact and approximate
 * geodesics on meshes", ACM TOG 24(3), 2005: windows on edges processed by
 * their smallest distance, saddle and reflex boundary vertices as
 * pseudo-sources, and windows on one edge trimmed against each other
 * (trim.ts). Windows wait in buckets a quarter edge wide (bucket-queue.ts:
 * their order only affects pruning), vertices in an exact heap, settled
 * only below every queued window key (what pseudo-sources need). Added to that: the vertex-distance filter
 * of Xin & Wang, ACM TOG 28(4), 2009 (proof in propagate.ts), merging of
 * touching windows with the same image (flat regions stay one window), and
 * saddles lighting only the wedge where a geodesic can bend around them
 * (pseudo-wedge.ts), and windows that would go once round a sharp vertex
 * dropped (winding.ts: such a path is beaten by the edge it crosses twice;
 * without it a tall spike made tens of thousands of windows). Window lists
 * are kept sorted along their edges so the trimming scans stop early.
 *
 * Cost. On noisy meshes the windows are real structure, not waste: every
 * saddle (about half the vertices of a jittered terrain) owns a thin shadow
 * wedge, and 97–99% of the windows give the minimum somewhere on their edge
 * in the final field (usage.ts, reported by the benchmark). So the run
 * costs 0.35–0.5 µs per window times 11–35 windows per face, far more than
 * an edge-graph Dijkstra; the time per window stays flat from 10k to 1.3M
 * faces, so it is arithmetic and branching, not memory traffic.
 *
 * Why this over the triangle-oriented scheme of Qin et al. (ACM TOG 35(4),
 * 2016), which is faster on whole-mesh runs:
 * - ordering by distance (to within a bucket) is what makes early stopping
 *   exact: a two-point query or a distance cap only touches faces up to
 *   that distance (measured: 0.1% of the faces of a 1M-face terrain);
 * - a window is only ever changed while it is still queued; once propagated
 *   it is final, so any surface point is evaluated by scanning the windows
 *   of its face, and a shortest path is traced back through them;
 * - every bound a vertex or point receives is the length of a real path
 *   (clamped into a window when rounding puts it a hair outside), so
 *   rounding can only cost accuracy locally, never produce NaN, a negative
 *   value or a value below the true distance by more than rounding.
 *
 * The solver reads edge lengths only (faces laid out in the plane from
 * their three lengths), so any intrinsic metric works.
 *
 * Memory. Windows are the run's memory (54 bytes each, 11–66 per face
 * measured on terrains). The store grows on demand within a memory budget
 * (`memoryBudget`, bytes; budget.ts); a whole-mesh run projects its size
 * from its first part and refuses early when it will not fit. Either way
 * the run ends with a `LIMIT` error naming the budget and the option, never
 * with the process running out of memory. Typed arrays live outside the JS
 * heap, so V8's heap limit does not bound the budget (checked: a run
 * storing 300 MB of windows passes under --max-old-space-size=40).
 *
 * Sources: vertices; points on edges and in faces (their faces' edges get
 * windows, their faces' corners straight distances); curves, as the union
 * of their points and straight segments (planar fronts, see planar.ts and
 * seed.ts).
 */
import type { IntrinsicMesh } from '../../metric/intrinsic.js';
import type { SurfacePoint } from '../../mesh/surface-point.js';
import { checkSurfacePoint } from '../../mesh/surface-point.js';
import type { DistanceField, SurfacePath } from '../shared/field.js';
import type { SourceSet } from '../shared/sources.js';
import { formatBytes, limitError, usageError } from '../../errors.js';
import { baryInFace, chainLength, facesOfPoint } from '../../metric/face-points.js';
import { createState } from './state.js';
import { prepareExactGeometry } from './geometry.js';
import type { ExactGeometry } from './geometry.js';
import type { ExactState } from './state.js';
import { runEvents } from './propagate.js';
import { seedSources, rootPoint } from './seed.js';
import { markPseudoSources } from './pseudo-sources.js';
import { evaluateInFace } from './evaluate.js';
import { EVAL_NONE, EVAL_CORNER, WIN_DEAD } from './codes.js';
import type { Evaluation } from './evaluate.js';
import { tracePath } from './backtrace.js';
import { windowUsage } from './usage.js';
import type { WindowUsage } from './usage.js';
import { DEFAULT_MEMORY_BUDGET } from './budget.js';
import { divergedError } from './guard.js';

export { DEFAULT_MEMORY_BUDGET } from './budget.js';

/** Options of {@link exactDistance}. */
export interface ExactOptions {
  /** Stop at this distance (mesh units): farther vertices and points report Infinity. */
  maxDistance?: number;
  /** Stop as soon as every target's distance is final (a two-point query). */
  targets?: SurfacePoint[];
  /**
   * Memory budget of the run in bytes (default {@link DEFAULT_MEMORY_BUDGET}, 2 GiB; Infinity
   * for none): the solver's arrays, windows (54 bytes each) and queues. A run that reaches it,
   * or is projected to, throws a `LIMIT` error.
   */
  memoryBudget?: number;
  /** Optional cap on the number of windows (default none: the memory budget bounds the run). */
  maxWindows?: number;
  /**
   * The mesh's source-independent data from {@link prepareExactGeometry}, reused across runs on
   * the same mesh (it is most of a two-point query's cost); made afresh when absent.
   */
  geometry?: ExactGeometry;
  /**
   * Called about every 4096 events with the share of the faces the run's windows have reached
   * so far, in [0, 1] (for a progress display: the solver never prints). Keep it cheap.
   */
  progress?: (share: number) => void;
}

/** Result of {@link exactDistance}. */
export interface ExactResult {
  /** Per-vertex distances (method 'exact'); Infinity when unreachable or beyond where the run stopped. */
  field: DistanceField;
  /** Windows created. */
  windows: number;
  /** Faces that received a window or hold a source. */
  facesTouched: number;
  /** False when the run stopped early (maxDistance or targets). */
  complete: boolean;
  /**
   * Why an incomplete run stopped: `targets` (every target was final) or `maxDistance`
   * (something lay farther); null for a complete run.
   */
  stoppedBy: 'targets' | 'maxDistance' | null;
  /** Bytes the run accounted against its memory budget at its largest. */
  peakBytes: number;
  /** Exact distance at any surface point (Infinity when unreachable or beyond where the run stopped). */
  distanceAt(p: SurfacePoint): number;
  /** An exact shortest path from the sources to p; empty with length Infinity when p was not reached. */
  pathTo(p: SurfacePoint): SurfacePath;
  /** Diagnostic: how many windows the final field uses, sampled at `samples` points per window (see usage.ts). */
  windowUsage(samples?: number): WindowUsage;
}

/** Windows reserved up front by a whole-mesh run on nf faces (64 per face covers most meshes; more grows the store). */
function wholeMeshReservation(nf: number): number {
  return Math.max(200_000, 64 * nf);
}

/**
 * Exact geodesic distance from a source set on an intrinsic mesh.
 * Throws USAGE for bad sources or options, LIMIT when the memory budget
 * (or an explicit window cap) does not hold the run, and NUMERIC when the
 * run passes a bound no correct run reaches (guard.ts: windows piling up on
 * one edge of a near-degenerate mesh) rather than running on endlessly.
 */
export function exactDistance(mesh: IntrinsicMesh, sources: SourceSet, opts: ExactOptions = {}): ExactResult {
  const t = mesh.topology;
  const maxD = opts.maxDistance ?? Infinity;
  if (!(maxD >= 0)) throw usageError(`maxDistance must be a non-negative number, got ${opts.maxDistance}`);
  const maxW = opts.maxWindows ?? Infinity;
  if (!(maxW >= 1)) throw usageError(`maxWindows must be a positive number, got ${opts.maxWindows}`);
  const budget = opts.memoryBudget ?? DEFAULT_MEMORY_BUDGET;
  if (!(budget > 0)) throw usageError(`memoryBudget must be a positive number of bytes, got ${opts.memoryBudget}`);
  sources.points.forEach((p) => checkSurfacePoint(p, t, 'source'));
  sources.curves.forEach((c, i) => c.forEach((p) => checkSurfacePoint(p, t, `curve ${i}`)));
  const targets = (opts.targets ?? []).map((p) => checkSurfacePoint(p, t, 'target'));
  if (opts.geometry && opts.geometry.mesh !== mesh) throw usageError('geometry was prepared for another mesh');
  const geometry = opts.geometry ?? prepareExactGeometry(mesh);

  // a whole-mesh run reserves 64 windows per face at once (within the budget): large typed arrays
  // are zero pages mapped lazily, so only the windows made cost memory, and doubling (copying,
  // touching every copied page) is avoided on most meshes; rough terrain needs more and grows. A
  // run that stops early (targets, maxDistance) starts small and doubles: it makes few windows,
  // and a huge reservation per query costs more than it saves (measured: a two-point query on
  // 20k faces took 3x longer). Where the reservation is refused (a browser tab's limit), start
  // small too. Only whole-mesh runs project their size (budget.ts): an early stop's extent is
  // unknown.
  const small = Math.min(maxW, 65536);
  const whole = targets.length === 0 && maxD === Infinity;
  let s: ExactState;
  try {
    s = createState(mesh, maxD, maxW, whole ? Math.min(maxW, wholeMeshReservation(t.nf)) : small, geometry, budget, whole);
  } catch (e) {
    if (!(e instanceof RangeError)) throw e;
    try {
      s = createState(mesh, maxD, maxW, small, geometry, budget, whole);
    } catch (e2) {
      if (!(e2 instanceof RangeError)) throw e2;
      throw limitError(`exact geodesics: the system refused memory for the run's arrays (mesh of ${t.nf} faces); free memory or use the heat method (--method heat)`);
    }
  }
  markPseudoSources(s);
  const all = seedSources(s, sources);
  const bary = [0, 0, 0];

  const ev: Evaluation = { value: Infinity, kind: EVAL_NONE, id: -1, x: 0 };
  const best = (p: SurfacePoint): Evaluation => {
    const out: Evaluation = { value: Infinity, kind: EVAL_NONE, id: -1, x: 0 };
    for (const f of facesOfPoint(t, p)) {
      baryInFace(t, f, p, bary);
      evaluateInFace(s, f, bary, ev);
      if (ev.value < out.value) Object.assign(out, ev);
    }
    if (p.kind === 'vertex' && s.dist[p.vertex]! <= out.value) {
      Object.assign(out, { value: s.dist[p.vertex]!, kind: EVAL_CORNER, id: p.vertex, x: 0 });
    }
    return out;
  };
  let stop: ((key: number) => boolean) | undefined;
  if (targets.length) {
    const done = new Uint8Array(targets.length);
    stop = (key) => {
      let all = true;
      for (let i = 0; i < targets.length; i++) {
        if (done[i]) continue;
        if (best(targets[i]!).value <= key) done[i] = 1;
        else all = false;
      }
      return all;
    };
  }
  let stopKey: number;
  try {
    stopKey = runEvents(s, withProgress(s, stop, opts.progress));
  } catch (e) {
    // a queue that cannot grow (the window store reports its own refusals through s.overflow)
    if (!(e instanceof RangeError)) throw e;
    throw limitError(
      `exact geodesics: the system refused memory for the event queues (${e.message}; ${s.win.count} windows stored, mesh of ${t.nf} faces); ` +
        'free memory, set a maximum distance (maxDistance, --max-distance), or use the heat method (--method heat) for whole fields',
    );
  }
  if (s.diverged) throw divergedError(s, s.events);
  if (s.overflow) throw overflowError(s);
  const reach = Math.min(stopKey, maxD);
  const distance = new Float64Array(t.nv);
  for (let v = 0; v < t.nv; v++) distance[v] = s.dist[v]! <= reach ? s.dist[v]! : Infinity;
  const field: DistanceField = { method: 'exact', distance, sources: [...sources.points, ...sources.curves.flat()] };
  const sourcePoint = (root: number, from: SurfacePoint): SurfacePoint => rootPoint(s, all, root, from);
  return {
    field,
    windows: s.win.count,
    facesTouched: countTouched(s),
    complete: stopKey === Infinity && !s.capped,
    // runEvents returns a key ≤ maxDistance only when stop() fired (an overflow threw above)
    stoppedBy: stopKey < Infinity && stopKey <= maxD ? 'targets' : stopKey < Infinity || s.capped ? 'maxDistance' : null,
    peakBytes: Math.max(s.win.budget.peakBytes, s.win.budget.total(s.win.count)),
    distanceAt(p) {
      checkSurfacePoint(p, t, 'point');
      const v = best(p).value;
      return v <= reach ? v : Infinity;
    },
    pathTo(p) {
      checkSurfacePoint(p, t, 'point');
      const b = best(p);
      if (!(b.value <= reach) || !Number.isFinite(b.value)) return { points: [], length: Infinity };
      const points = tracePath(s, p, b, sourcePoint);
      return { points, length: chainLength(mesh, points) };
    },
    windowUsage: (samples) => windowUsage(s, samples),
  };
}

/** The LIMIT error for a run whose window store ran out of room, by what refused it. */
function overflowError(s: ExactState): Error {
  const b = s.win.budget, nf = s.t.nf;
  const where = `${s.win.count} windows stored on ${s.win.touchedFaces()} of ${nf} faces`;
  const advice = 'set a maximum distance (maxDistance, --max-distance) if only nearby distances are needed, or use the heat method (--method heat) for whole fields';
  switch (b.tripped) {
    case 'windows':
      return limitError(`exact geodesics: the window cap of ${b.maxWindows} (maxWindows) was reached (${where}); raise maxWindows, or ${advice}`);
    case 'estimate':
      return limitError(
        `exact geodesics: this run would need about ${formatBytes(b.neededBytes)} (about ${(b.projectedWindows / 1e6).toPrecision(3)} million windows, estimated after ` +
          `${Math.round(100 * b.touchedShare)}% of the faces), more than the memory budget of ${formatBytes(b.limit)}; ` +
          `raise the budget (memoryBudget, --memory-budget), or ${advice}`,
      );
    case 'allocation':
      return limitError(
        `exact geodesics: the system refused ${formatBytes(b.neededBytes)} for the window store (${where}) within the memory budget of ` +
          `${formatBytes(b.limit)}; free memory or lower the budget (memoryBudget, --memory-budget) so the run stops cleanly, or ${advice}`,
      );
    default:
      if (b.total(0) > b.limit) {
        return limitError(
          `exact geodesics: the memory budget of ${formatBytes(b.limit)} is less than the mesh alone needs (${formatBytes(b.total(0))} ` +
            `for ${nf} faces, before any window); raise the budget (memoryBudget, --memory-budget), or use the heat method (--method heat) for whole fields`,
        );
      }
      return limitError(
        `exact geodesics: the memory budget of ${formatBytes(b.limit)} was reached (${where}); raise the budget (memoryBudget, --memory-budget), or ${advice}`,
      );
  }
}

function countTouched(s: ExactState): number {
  const seen = new Uint8Array(s.t.nf);
  const W = s.win;
  for (let h = 0; h < W.heHead.length; h++) {
    for (let w = W.heHead[h]!; w >= 0; w = W.nextOnHe[w]!) if (W.state[w] !== WIN_DEAD) { seen[(h / 3) | 0] = 1; break; }
  }
  for (const r of s.pointRoots) for (const f of r.faces) seen[f] = 1;
  let n = 0;
  for (let f = 0; f < s.t.nf; f++) n += seen[f]!;
  return n;
}

/**
 * `stop` (or no stop) that also reports the share of faces reached to `progress` on every 128th
 * call (runEvents asks `stop` every 32 events); without `progress`, `stop` itself.
 */
function withProgress(s: ExactState, stop: ((key: number) => boolean) | undefined, progress: ((share: number) => void) | undefined): ((key: number) => boolean) | undefined {
  if (!progress) return stop;
  const nf = s.t.nf || 1;
  let calls = 0;
  return (key) => {
    if ((++calls & 127) === 0) progress(Math.min(1, s.win.touchedFaces() / nf));
    return stop ? stop(key) : false;
  };
}
