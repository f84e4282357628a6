/**
 * Heat-method geodesic distance (Crane, Weischedel, Wardetzky, "Geodesics in
 * Heat", ACM TOG 32(5), 2013), working from edge lengths only.
 *
 * 0. remesh:   mollify, intrinsic Delaunay flips, split long edges, flip again,
 *              split boundary edges opposite obtuse corners, flip again (repeated)
 * 1. heat:     (M + t L) u = δ          t = m·h², h = mean edge length of that triangulation
 * 2. field:    X_f = −∇u_f / |∇u_f|     per face, relayed where u underflows (heat-relay.ts)
 * 3. distance: L φ = b,  b_i = Σ_f A_f ∇φ_i·X_f   (least squares ∇φ ≈ X)
 * 4. point sources: shift φ so its least value at the sources is zero;
 *    curve sources: φ held at the sources' Dirichlet data instead, so every
 *    curve is the zero level (heat-poisson.ts, SourcePoisson); clamp at 0.
 *
 * L is the PSD cotan Laplacian and M the lumped mass on an intrinsic
 * Delaunay triangulation of the mollified metric (both on by default): all
 * interior cotan weights are then ≥ 0, and a boundary edge keeps its single
 * cotangent, negative only opposite an obtuse boundary corner, which the
 * refinement removes by splitting such edges (metric/refine.ts,
 * splitObtuseBoundary; left only with refine off or at its caps: on a 40 × 1
 * strip in two fans 44 such edges made the heat change sign 8 units from the
 * source and the distances 61% short). So M + tL is an M-matrix (nonnegative
 * inverse: u ≥ 0 everywhere), its Cholesky factor has no positive off-diagonal and
 * the triangular solves add only terms of one sign. Tiny heat values far
 * from the source then keep their relative accuracy down to the double range
 * (~e^-708), which on a mesh means about 600 edge rings from the source at
 * m = 1 (the heat decays like e^(−r/√t)); beyond that the heat underflows,
 * ∇u = 0 and those faces are counted in `flatFaces` of the stats `solve` returns.
 *
 * Boundaries: 'neumann', 'dirichlet' or 'average' (default, the paper's
 * recommendation: the mean of the two); the Dirichlet data are 0 except at
 * boundary vertices carrying source heat δ_v, held at δ_v / (M + tL)_vv (the
 * value a lone heated vertex takes), so a source on the boundary is a
 * boundary value, as in Varadhan's formula with Dirichlet data (heat-step.ts).
 *
 * A NaN or infinite value in the solve is a `NUMERIC` error, never a
 * distance; so is heat that underflows beyond the relay (timeScale too small).
 *
 * The Poisson step pins one vertex per connected component (heat-poisson.ts).
 *
 * All matrices share one lower-triangle pattern and one symbolic analysis
 * (the values are assembled while an ordering executor's threads split and
 * order the pattern: AnalyzeOptions.meanwhile);
 * the Dirichlet heat factor is computed with the natural one and stores only
 * the blocks the boundary rows reach (linalg/multifrontal-pair.ts), and an
 * executor (HeatOptions.factorExecutor) may factor on other threads;
 * per-source work is two or three triangular solve pairs and two sweeps
 * over the faces, in preallocated buffers. The heat right-hand side of a
 * point source has one nonzero per weighted vertex, so each heat step's
 * forward pass reads only that vertex's path up the elimination tree
 * (solve-supernodal.ts); only the backward passes and the Poisson pair read
 * the whole factor.
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import type { DistanceField } from './shared/field.js';
import type { SourceSet } from './shared/sources.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { analyzeCholesky, CholeskyFactor } from '../linalg/index.js';
import { meanEdgeLength } from '../metric/intrinsic.js';
import {
  heatTriangulation, assembleHeat, MAX_SEPARATE_CURVES, type HeatAssembly, type HeatOptions, type HeatStats, type HeatSolveStats,
} from './heat-setup.js';
import { edgePattern, patternMatrix } from '../metric/laplacian.js';
import { tail } from '../mesh/topology.js';
import { addSourceHeat, sourceValue, sourceDirichlet } from './heat-sources.js';
import { factorShiftedPoisson, SourcePoisson } from './heat-poisson.js';
import { assembleDivergence, heatCeiling, type RelayWork } from './heat-relay.js';
import { usageError, numericError, isOrthodromeError } from '../errors.js';
import { HeatStep, maskIndices, type HeatStepParts } from './heat-step.js';

export {
  MAX_SEPARATE_CURVES, REFINE_FACTOR, TIME_SCALE_RANGE, type HeatOptions, type HeatStats, type HeatSolveStats,
} from './heat-setup.js';

/** Factors, geometry and masks a prepared solver keeps (the heat step's among them). */
interface HeatParts extends HeatStepParts {
  /** Face data of the relay sweep (heat-relay.ts, relayGeometry). */
  faces: Float64Array;
  /** Vertices without area (isolated, or only zero-area faces): identity rows. */
  inactive: Uint8Array;
  /** Smallest positive lumped mass. */
  minMass: number;
  /** Ceiling for the scaled heat (heat-relay.ts). */
  heatCeiling: number;
  /** Rows of the Poisson system fixed to 0: pinned or inactive vertices. */
  blocked: Uint8Array;
  poisson: CholeskyFactor;
  sourcePoisson: SourcePoisson;
}

/** A prepared heat-method solver: factor once, then answer many source sets. */
export class HeatSolver {
  /** The input mesh (source indices refer to it). */
  readonly mesh: IntrinsicMesh;
  /** The intrinsic triangulation the solver works on: `mesh`'s vertices first (same ids), then those the refinement inserted. */
  readonly triangulation: IntrinsicMesh;
  /** Preparation figures. */
  readonly stats: HeatStats;

  private readonly parts: HeatParts;
  private readonly relay: RelayWork;
  private readonly rhs: Float64Array;
  private readonly u: Float64Array;
  private readonly gD: Float64Array;
  private readonly fixed: Uint8Array;
  private readonly b: Float64Array;
  private readonly heatStep: HeatStep;
  private readonly compShift: Float64Array;
  private readonly lay = new Float64Array(6);
  private readonly xy = new Float64Array(2);

  private constructor(mesh: IntrinsicMesh, triangulation: IntrinsicMesh, stats: HeatStats, parts: HeatParts) {
    this.mesh = mesh;
    this.triangulation = triangulation;
    this.stats = stats;
    this.parts = parts;
    const nv = triangulation.topology.nv;
    this.rhs = new Float64Array(nv);
    this.u = new Float64Array(nv);
    this.gD = new Float64Array(nv);
    this.fixed = new Uint8Array(nv);
    this.b = new Float64Array(nv);
    this.heatStep = new HeatStep(parts, nv);
    this.compShift = new Float64Array(parts.componentCount);
    const wildcard = parts.inactive.slice();
    if (parts.boundaryMode === 'dirichlet' && parts.heatD) for (let v = 0; v < nv; v++) wildcard[v]! |= parts.onBoundary[v]!;
    this.relay = {
      t: triangulation.topology, faces: parts.faces, comp: parts.vertexComponent, wildcard, minMass: parts.minMass, heatCeiling: parts.heatCeiling,
      stage: new Int32Array(nv), compTau: new Float64Array(parts.componentCount), compHot: new Uint8Array(parts.componentCount),
    };
  }

  /**
   * Builds the intrinsic triangulation, the matrices, one symbolic analysis
   * and the numeric factorizations. Throws `USAGE` for bad options or an
   * empty mesh, `NUMERIC` when a matrix cannot be factored.
   */
  static prepare(mesh: IntrinsicMesh, opts: HeatOptions = {}): HeatSolver {
    const t0 = performance.now();
    if (mesh.topology.nv >= (opts.factorExecutor?.minSize ?? Infinity)) opts.factorExecutor?.warm?.(); // threads load during the remesh
    if (mesh.topology.nv >= (opts.orderingExecutor?.minSize ?? Infinity)) opts.orderingExecutor?.warm?.();
    const { m, boundary, work, h, epsilon, flips, flipsCapped, inserted, refineCapped } = heatTriangulation(mesh, opts);
    const t1 = performance.now();
    // h of the time step: mean edge of the triangulation solved on (after flips and refinement)
    const hStep = meanEdgeLength(work);
    const step = m * hStep * hStep;

    const p = edgePattern(work.topology);
    const Lv = new Float64Array(p.colPtr[p.n]!);
    // the matrices and face data, assembled while other threads order the pattern (the analysis reads the pattern only)
    const box: { asm?: HeatAssembly } = {};
    const sym = analyzeCholesky(patternMatrix(p, Lv), {
      ...(opts.ordering ? { ordering: opts.ordering } : {}), orderingExecutor: opts.orderingExecutor ?? null,
      meanwhile: () => { box.asm = assembleHeat(work, p, Lv, step, boundary); },
    });
    const t2 = performance.now();
    const { Mv, faces, maxGrad, comp, onBoundary, inactive, minMass, heatDiag, maxDiag, fixedD, mats, blocked: pinnedBlocked } = box.asm!; // set by analyzeCholesky's one call of meanwhile
    // heatD shares heatN's blocks wherever the boundary rows do not reach (multifrontal-pair.ts)
    const fs = CholeskyFactor.factorMany(mats, sym, { executor: opts.factorExecutor ?? null, pairFirst: mats.length === 3 });
    const heatN = CholeskyFactor.orThrow(fs[0]!), heatD = mats.length === 3 ? CholeskyFactor.orThrow(fs[1]!) : null;
    // a singular pinned Poisson matrix (a component held together by faces without area): L + εM instead
    const pf = fs[mats.length - 1]!, shifted = !(pf instanceof CholeskyFactor);
    const { factor: poisson, blocked } = pf instanceof CholeskyFactor ? { factor: pf, blocked: pinnedBlocked } : factorShiftedPoisson(p, sym, Lv, Mv, inactive, h);
    const t3 = performance.now();

    const stats: HeatStats = {
      prepareMs: t3 - t0, remeshMs: t1 - t0, analysisMs: t2 - t1, factorMs: t3 - t2,
      flips, flipsCapped, inserted, refineCapped, mollifyEpsilon: epsilon, nnzL: sym.nnzL, factorizations: heatD ? 3 : 2,
      factorValues: heatN.storedValues + (heatD?.storedValues ?? 0) + poisson.storedValues,
      ordering: sym.ordering, meanEdgeLength: h, stepEdgeLength: hStep, timeStep: step, poissonShifted: shifted,
    };
    return new HeatSolver(mesh, work, stats, {
      boundaryMode: boundary, faces, inactive, minMass, heatCeiling: heatCeiling(maxGrad, maxDiag), vertexComponent: comp.vertexComponent, componentCount: comp.count,
      onBoundary, blocked, heatN, heatD, poisson, p, Lv, step, heatDiag, fixedD, fixedList: maskIndices(fixedD),
      sourcePoisson: new SourcePoisson(p, sym, Lv, inactive, comp.vertexComponent, comp.count),
    });
  }

  /**
   * Distance from a source set (points and curves on the input mesh) to every
   * vertex, in mesh units. Vertices of components without a source get
   * Infinity. Throws `USAGE` for invalid or empty source sets, `NUMERIC` when
   * the solve produces a NaN or infinite value or the heat underflows.
   *
   * Up to {@link MAX_SEPARATE_CURVES} curves are solved one by one (the point
   * sources together) and the fields combined by their minimum,
   * d(x, A ∪ B) = min(d(x, A), d(x, B)): one smoothed field for sources of
   * different shape moves the seam between them by about √t·ln(ratio of
   * their heat) (a concave rim out-heats a convex one), 3% on an annulus.
   * Each curve is held at zero by Dirichlet data, which costs one numeric
   * factorization per curve (the last one is kept for a repeated call).
   * More curves are solved at once, all held at zero (one factorization).
   */
  distance(sources: SourceSet): DistanceField {
    return this.solve(sources).field;
  }

  /** {@link HeatSolver.distance}, with the figures of this very call (`stats`). */
  solve(sources: SourceSet): { field: DistanceField; stats: HeatSolveStats } {
    const t0 = performance.now();
    const nv = this.triangulation.topology.nv;
    this.rhs.fill(0);
    const total = addSourceHeat(this.mesh, sources, this.stats.meanEdgeLength, this.rhs);
    if (!(total > 0)) throw usageError('the source set is empty', 'heat');
    const parts: SourceSet[] = [];
    if (sources.curves.length > MAX_SEPARATE_CURVES) parts.push(sources);
    else {
      if (sources.points.length > 0) parts.push({ points: sources.points, curves: [] });
      for (const c of sources.curves) parts.push({ points: [], curves: [c] });
    }
    const stats: HeatSolveStats = { solveMs: 0, flatFaces: 0, relayStages: 0, sourceFactorMs: 0 };
    // one part writes every entry of phi (solvePart); several are combined by their minimum
    const phi = new Float64Array(nv);
    if (parts.length > 1) phi.fill(Infinity);
    const part = parts.length > 1 ? new Float64Array(nv) : phi;
    for (const src of parts) {
      this.solvePart(src, part, stats);
      if (part !== phi) for (let v = 0; v < nv; v++) if (part[v]! < phi[v]!) phi[v] = part[v]!;
    }
    stats.solveMs = performance.now() - t0;
    const nIn = this.mesh.topology.nv;
    return { field: { method: 'heat', distance: phi.length === nIn ? phi : phi.slice(0, nIn), sources: [...sources.points, ...sources.curves.flat()] }, stats };
  }

  /** One field: point sources shifted to zero, or curves held at zero. */
  private solvePart(sources: SourceSet, phi: Float64Array, stats: HeatSolveStats): void {
    const { rhs, b } = this;
    const { blocked, vertexComponent: comp, componentCount: nc } = this.parts;
    const nv = phi.length;
    rhs.fill(0);
    addSourceHeat(this.mesh, sources, this.stats.meanEdgeLength, rhs);
    const { flatFaces, stages, unsettled } = assembleDivergence(this.relay, this.heatStep.run, rhs, this.u, b);
    if (unsettled > 0) {
      throw numericError(`the heat underflowed before reaching ${unsettled} vertices (t = ${this.stats.timeStep}); raise timeScale`, 'heat');
    }
    stats.flatFaces += flatFaces;
    stats.relayStages = Math.max(stats.relayStages, stages);
    const shift = this.compShift.fill(Infinity);
    const seen = (p: SurfacePoint, val: number): void => {
      const c = comp[p.kind === 'vertex' ? p.vertex : p.kind === 'edge' ? tail(this.mesh.topology, this.mesh.topology.edgeHalfedge[p.edge]!) : this.mesh.topology.tri[3 * p.face]!]!;
      if (c >= 0 && val < shift[c]!) shift[c] = val;
    };
    let held = false;
    if (sources.curves.length > 0) {
      // curves: every source is the zero level (Dirichlet data, heat-poisson.ts)
      sourceDirichlet(this.mesh, sources, this.fixed, this.gD);
      const sp = this.parts.sourcePoisson;
      try {
        stats.sourceFactorMs += sp.solve(this.fixed, this.gD, b, phi);
        held = true;
      } catch (e) {
        // L_FF singular (free vertices joined to the sources only through faces without area): shift instead
        if (!isOrthodromeError(e) || e.code !== 'NUMERIC') throw e;
      }
    }
    if (held) {
      for (const p of sources.points) seen(p, 0);
      for (const curve of sources.curves) for (const p of curve) seen(p, 0);
    } else {
      // point sources: shift each component so its least source value is zero (see sourceValue)
      for (let v = 0; v < nv; v++) if (blocked[v]) b[v] = 0;
      this.parts.poisson.solve(b, phi);
      for (const p of sources.points) seen(p, sourceValue(this.mesh, p, phi, this.lay, this.xy));
      for (const curve of sources.curves) for (const p of curve) seen(p, sourceValue(this.mesh, p, phi, this.lay, this.xy));
    }
    for (let v = 0; v < nv; v++) {
      const c = comp[v]!;
      const s = c >= 0 && c < nc ? shift[c]! : Infinity;
      if (s === Infinity) { phi[v] = Infinity; continue; }
      const d = phi[v]! - s;
      if (!Number.isFinite(d)) throw numericError(`the heat method produced ${d} at vertex ${v}`, 'heat');
      phi[v] = d > 0 ? d : 0; // clamps tiny negatives
    }
  }
}
