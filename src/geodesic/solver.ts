/**
 * One front for every distance method: prepare once for a mesh, then solve
 * for any number of source sets, and evaluate the result at surface points.
 *
 * | method  | what it computes                                           | at a surface point            |
 * |---------|------------------------------------------------------------|-------------------------------|
 * | `exact` | exact polyhedral distance (window propagation)             | exact, from the face's windows|
 * | `heat`  | heat-method approximation (prefactored; fast per source)   | linear in the face            |
 * | `graph` | shortest path along mesh edges (an upper bound)            | best corner + straight segment|
 *
 * Every source and target is validated and put in its canonical spelling
 * here (`checkSurfacePoint`: a face point on a corner is that vertex, on an
 * edge that edge point), so every spelling of one point gives one answer
 * with every method. A NaN in a result is a `NUMERIC` error naming the
 * method and the step, never a distance or "unreachable".
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { checkSurfacePoint } from '../mesh/surface-point.js';
import { inputError, numericError } from '../errors.js';
import type { DistanceField, DistanceMethod } from './shared/field.js';
import type { SourceSet } from './shared/sources.js';
import { HeatSolver, type HeatOptions } from './heat.js';
import { graphDistance, graphValueAt } from './graph.js';
import { valueAtPoint } from './heat-sources.js';
import { exactDistance } from './exact/index.js';
import { prepareExactGeometry, type ExactGeometry } from './exact/geometry.js';

/** Largest edge length {@link prepareDistance} accepts, mesh units; a non-zero face must be at least its inverse across. */
export const MAX_LENGTH = 1e60;

/** Options for {@link prepareDistance}. */
export interface DistanceOptions {
  /** Heat-method options (method `heat` only). */
  heat?: HeatOptions;
  /** Stop at this distance (methods `exact` and `graph`); farther vertices are Infinity. */
  maxDistance?: number;
  /** Memory budget of each exact solve, bytes (method `exact`; default 2 GiB): a run that would exceed it throws `LIMIT`. */
  memoryBudget?: number;
  /**
   * Method `exact`: the mesh's source-independent data, already made by `prepareExactGeometry`
   * for this very mesh object (e.g. shared between worker threads); made afresh when absent.
   */
  exactGeometry?: ExactGeometry;
  /**
   * Called now and then during long work, on the solving thread (the solvers never print; a
   * front end decides what to show): the stage, and the share done when known (exact: the share
   * of the faces its windows have reached). Keep it cheap.
   */
  progress?: (p: SolveProgress) => void;
}

/** A progress report (see {@link DistanceOptions.progress}). */
export interface SolveProgress {
  /** The method's preparation, or a solve. */
  stage: 'prepare' | 'solve';
  /** Share done in [0, 1], when known. */
  share?: number;
}

/** Options of one solve. */
export interface SolveOptions {
  /**
   * Points whose distances are wanted. With `fieldNeeded: false` the exact
   * method may stop as soon as these are settled.
   */
  targets?: SurfacePoint[];
  /** Whether every vertex's distance is needed (default true). */
  fieldNeeded?: boolean;
}

/** The outcome of one solve. */
export interface DistanceResult {
  /** Per-vertex distances (complete unless the solve stopped early; see `complete`). */
  field: DistanceField;
  /** Distance at a surface point in mesh units (Infinity when unreachable). */
  at(p: SurfacePoint): number;
  /** Wall time of the solve, ms. */
  solveMs: number;
  /** False when the method stopped early (targets settled or maxDistance reached). */
  complete: boolean;
  /** Why an incomplete exact solve stopped (`targets` settled, or `maxDistance`); absent or null otherwise. */
  stoppedBy?: 'targets' | 'maxDistance' | null;
  /** Method-specific figures (windows, faces touched, …). */
  details: Record<string, number | boolean | string>;
}

/** A prepared solver. */
export interface DistanceSolver {
  /** The method. */
  readonly method: DistanceMethod;
  /** Wall time of preparation, ms. */
  readonly prepareMs: number;
  /** Method-specific preparation figures. */
  readonly prepareDetails: Record<string, number | boolean | string>;
  /** Distances from one source set. */
  solve(sources: SourceSet, opts?: SolveOptions): DistanceResult;
}

/**
 * Prepares a solver of the given method for `mesh` (an edge length that is
 * negative, not finite or above {@link MAX_LENGTH}, or a face smaller than
 * its inverse, is an `INPUT` error: see {@link checkEdgeLengths}). Its `solve` validates
 * every source and target (`USAGE` error naming the bad point, see
 * `checkSurfacePoint`), and throws `NUMERIC` if the method produced a NaN.
 */
export function prepareDistance(mesh: IntrinsicMesh, method: DistanceMethod, opts: DistanceOptions = {}): DistanceSolver {
  const t = mesh.topology;
  checkEdgeLengths(mesh, method);
  const inner = prepareMethod(mesh, method, opts);
  const clean = (sources: SourceSet): SourceSet => ({
    points: sources.points.map((p) => checkSurfacePoint(p, t, 'source')),
    curves: sources.curves.map((c, i) => c.map((p) => checkSurfacePoint(p, t, `curve ${i}`))),
  });
  return {
    method,
    prepareMs: inner.prepareMs,
    prepareDetails: inner.prepareDetails,
    solve(sources, so = {}) {
      const targets = so.targets?.map((p) => checkSurfacePoint(p, t, 'target'));
      const r = inner.solve(clean(sources), { ...so, ...(targets ? { targets } : {}) });
      const d = r.field.distance;
      for (let v = 0; v < d.length; v++) {
        if (Number.isNaN(d[v])) throw numericError(`the ${method} solve produced NaN at vertex ${v}`, `${method} distance`);
      }
      return {
        ...r,
        at(p) {
          const x = r.at(checkSurfacePoint(p, t, 'point'));
          if (Number.isNaN(x)) throw numericError('evaluating the distance at a point produced NaN', `${method} distance`);
          return x;
        },
      };
    },
  };
}

/**
 * Refuses a metric the solvers cannot measure in (`INPUT` error naming the
 * edge or face and `label`): a length that is negative or not finite (a NaN
 * would silently drop its edge from the exact and graph searches, every
 * comparison being false), above {@link MAX_LENGTH}, or a face whose longest
 * edge is non-zero but below its inverse (products of four lengths, triangle
 * areas, must stay inside double range; measured: the exact method silently
 * degrades to edge-graph values on meshes scaled by 1e77 or 1e-80).
 */
export function checkEdgeLengths(mesh: IntrinsicMesh, label: string): void {
  const t = mesh.topology;
  for (let e = 0; e < t.ne; e++) {
    const l = mesh.edgeLength[e]!;
    if (!(l >= 0 && l < Infinity)) throw inputError(`edge ${e} has invalid length ${l}`, label);
    if (l > MAX_LENGTH) {
      throw inputError(`edge ${e} has length ${l}, beyond the ${MAX_LENGTH} mesh units the solvers handle; rescale the mesh (change its units)`, label);
    }
  }
  const L = mesh.edgeLength, eo = t.edgeOf;
  for (let f = 0; f < t.nf; f++) {
    const m = Math.max(L[eo[3 * f]!]!, L[eo[3 * f + 1]!]!, L[eo[3 * f + 2]!]!);
    if (m > 0 && m < 1 / MAX_LENGTH) {
      throw inputError(`face ${f} is only ${m} mesh units across, below the ${1 / MAX_LENGTH} the solvers handle; rescale the mesh (change its units)`, label);
    }
  }
}

function prepareMethod(mesh: IntrinsicMesh, method: DistanceMethod, opts: DistanceOptions): DistanceSolver {
  const t = mesh.topology;
  if (method === 'heat') {
    opts.progress?.({ stage: 'prepare' });
    const heat = HeatSolver.prepare(mesh, opts.heat ?? {});
    const s = heat.stats;
    return {
      method,
      prepareMs: s.prepareMs,
      prepareDetails: {
        flips: s.flips,
        mollifyEpsilon: s.mollifyEpsilon,
        nnzL: s.nnzL,
        ordering: s.ordering,
        timeStep: s.timeStep,
        factorMs: s.factorMs,
        analysisMs: s.analysisMs,
      },
      solve(sources) {
        opts.progress?.({ stage: 'solve' });
        const { field, stats } = heat.solve(sources);
        const d = field.distance;
        return {
          field,
          at: (p) => valueAtPoint(t, p, d),
          solveMs: stats.solveMs,
          complete: true,
          details: { flatFaces: stats.flatFaces },
        };
      },
    };
  }
  if (method === 'graph') {
    return {
      method,
      prepareMs: 0,
      prepareDetails: {},
      solve(sources) {
        opts.progress?.({ stage: 'solve' });
        const t0 = performance.now();
        const field = graphDistance(mesh, sources, opts.maxDistance !== undefined ? { maxDistance: opts.maxDistance } : {});
        const d = field.distance;
        return { field, at: (p) => { const x = graphValueAt(mesh, sources, d, p); return x <= (opts.maxDistance ?? Infinity) ? x : Infinity; }, solveMs: performance.now() - t0, complete: true, details: {} };
      },
    };
  }
  const p0 = performance.now();
  const geometry = opts.exactGeometry?.mesh === mesh ? opts.exactGeometry : prepareExactGeometry(mesh);
  return {
    method,
    prepareMs: performance.now() - p0,
    prepareDetails: { saddles: geometry.saddles },
    solve(sources, so = {}) {
      opts.progress?.({ stage: 'solve' });
      const t0 = performance.now();
      const early = so.fieldNeeded === false && so.targets && so.targets.length > 0;
      const r = exactDistance(mesh, sources, {
        geometry,
        ...(opts.maxDistance !== undefined ? { maxDistance: opts.maxDistance } : {}),
        ...(opts.memoryBudget !== undefined ? { memoryBudget: opts.memoryBudget } : {}),
        ...(early ? { targets: so.targets } : {}),
        ...(opts.progress ? { progress: (share: number) => opts.progress!({ stage: 'solve', share }) } : {}),
      });
      return {
        field: r.field,
        at: (p) => r.distanceAt(p),
        solveMs: performance.now() - t0,
        complete: r.complete,
        stoppedBy: r.stoppedBy,
        details: { windows: r.windows, facesTouched: r.facesTouched, faceFraction: t.nf ? r.facesTouched / t.nf : 0, memoryBytes: r.peakBytes },
      };
    },
  };
}
