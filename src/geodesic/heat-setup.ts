/**
 * Options, figures and the triangulation step of the heat method
 * (heat.ts): option checks, then mollify → intrinsic Delaunay flips →
 * refinement of long edges → flips again → boundary edges opposite obtuse
 * corners split → flips again (repeated until none is left).
 */
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import { meanEdgeLength } from '../metric/intrinsic.js';
import { mollify, DEFAULT_MOLLIFY_DELTA } from '../metric/mollify.js';
import { intrinsicDelaunay } from '../metric/delaunay.js';
import { equilateralEdge } from '../metric/refine.js';
import { refineToDelaunay } from '../metric/refine-boundary.js';
import { usageError, inputError } from '../errors.js';
import { cotanLaplacian, lumpedMass, combine, constrainRows, patternMatrix, type EdgePattern } from '../metric/laplacian.js';
import type { CscMatrix } from '../linalg/csc.js';
import { components, type Components } from '../mesh/components.js';
import { boundaryVertexMask } from '../mesh/boundary.js';
import { relayGeometry } from './heat-relay.js';
import { pinnedPoisson } from './heat-poisson.js';
import type { FactorExecutor } from '../linalg/executor.js';
import type { OrderingExecutor } from '../linalg/ordering-executor.js';

/** Source curves solved one by one (see `HeatSolver.distance` in heat.ts); more are solved together. */
export const MAX_SEPARATE_CURVES = 8;

/** Edges longer than this many equilateral edge lengths are split by the refinement (see {@link HeatOptions.refine}). */
export const REFINE_FACTOR = 3;

/**
 * Rounds of boundary splits + Delaunay flips at most (refine-boundary.ts). A vertex at height ε over a
 * boundary edge of length ℓ needs about log₂(ℓ/ε) rounds (each halves the piece it encroaches
 * on), so 64 rounds reach below the double resolution of any edge; the fan strip of
 * test/metric/refine.test.ts needs 4 (44, 24, 10, 4 splits), the 2M-face scan-like terrain of the heat
 * benchmark 12.
 */
export const BOUNDARY_ROUNDS = 64;

/** Accepted range of {@link HeatOptions.timeScale}: outside it the heat underflows within a few rings or the field is smoothed flat. */
export const TIME_SCALE_RANGE: readonly [number, number] = [1e-2, 1e4];

/** Options of `HeatSolver.prepare` (heat.ts). */
export interface HeatOptions {
  /** m in t = m·h² (h = mean edge length of the intrinsic triangulation); default 1, within {@link TIME_SCALE_RANGE}. */
  timeScale?: number;
  /**
   * Boundary condition of the heat step; default 'average' (the paper's
   * recommendation). 'dirichlet' alone bends the field towards the boundary
   * and is poor in regions only a few edges wide.
   */
  boundary?: 'average' | 'neumann' | 'dirichlet';
  /** Flip to an intrinsic Delaunay triangulation first; default true. */
  intrinsicDelaunay?: boolean;
  /**
   * Split edges (boundary edges too) longer than {@link REFINE_FACTOR} times the edge of an
   * equilateral mesh with the same area and face count (metric/refine.ts), then
   * flip to Delaunay again; then split the boundary edges opposite an obtuse corner and flip
   * again, until there are none (their cotan weight is negative: M + tL would not be an
   * M-matrix and the heat would change sign far from the source). Default true (needs
   * intrinsicDelaunay).
   */
  refine?: boolean;
  /** Mollify edge lengths first (Sharp & Crane 2020); default true. */
  mollify?: boolean;
  /** Mollification margin δ as a fraction of h; default 1e-5. */
  mollifyDelta?: number;
  /** Fill-reducing ordering of the Cholesky factorizations; default the linalg default. */
  ordering?: 'amd' | 'nd' | 'natural';
  /**
   * Runs some of the two or three numeric factorizations on other threads
   * (linalg/executor.ts; on Node `NodeFactorExecutor` from the package's
   * Node entry). The factors are bit-identical to the serial ones; without
   * it everything runs on the calling thread. Not cloneable: leave it out of
   * options sent to a worker.
   */
  factorExecutor?: FactorExecutor | null;
  /**
   * Orders parts of the nested dissection on other threads
   * (linalg/ordering-executor.ts; on Node `NodeOrderingExecutor`); the
   * ordering is the serial one. Not cloneable, like factorExecutor.
   */
  orderingExecutor?: OrderingExecutor | null;
}

/** What `HeatSolver.prepare` did and how long it took. */
export interface HeatStats {
  /** Wall time of prepare, ms. */
  prepareMs: number;
  /** Of which: mollification + intrinsic flips, ms. */
  remeshMs: number;
  /**
   * Of which: ordering + symbolic analysis, ms, with the assembly of the
   * matrices and face data (it overlaps the ordering when an ordering
   * executor has threads; before it, else).
   */
  analysisMs: number;
  /** Of which: numeric factorizations, ms. */
  factorMs: number;
  /** Intrinsic flips made. */
  flips: number;
  /** True when the flip cap stopped the Delaunay loop early. */
  flipsCapped: boolean;
  /** Vertices inserted by the intrinsic refinement, long edges and obtuse boundary corners (results are returned at the input's vertices only). */
  inserted: number;
  /**
   * True when the refinement stopped at its vertex cap (max(1000, nv) insertions, both kinds
   * of split together) or after {@link BOUNDARY_ROUNDS} rounds of boundary splits.
   */
  refineCapped: boolean;
  /** Uniform length added by mollification (mesh units; 0 when none was needed). */
  mollifyEpsilon: number;
  /** Nonzeros of one Cholesky factor (diagonal included). */
  nnzL: number;
  /** Number of numeric factorizations (2 or 3). */
  factorizations: number;
  /** Values of L stored by the factors together (the Dirichlet heat factor shares the natural one's blocks where the boundary does not reach). */
  factorValues: number;
  /** The ordering used. */
  ordering: string;
  /** Mean edge length h of the input mesh (mesh units). */
  meanEdgeLength: number;
  /** Mean edge length of the intrinsic triangulation, the h of the time step (mesh units). */
  stepEdgeLength: number;
  /** Time step t = m·h² (mesh units squared). */
  timeStep: number;
  /** True when the Poisson step fell back from pinning to L + εM. */
  poissonShifted: boolean;
}

/** Timing and diagnostics of the last `HeatSolver.distance` call. */
export interface HeatSolveStats {
  /** Wall time, ms. */
  solveMs: number;
  /**
   * Faces left with X = 0: ∇u = 0 even after relaying (see heat-relay.ts).
   * In 'dirichlet' mode, faces with three boundary corners always count here.
   */
  flatFaces: number;
  /** Heat solves (stages) needed: 1 unless the heat underflowed far from the sources. */
  relayStages: number;
  /** Time spent factoring the Poisson matrix for this source set (curve sources only; 0 when reused), ms. */
  sourceFactorMs: number;
}

/** The checked options and the triangulation {@link heatTriangulation} built. */
export interface HeatTriangulation {
  /** The time scale m. */
  m: number;
  /** The boundary mode. */
  boundary: 'average' | 'neumann' | 'dirichlet';
  /** The triangulation to solve on: the input's vertices first, then inserted ones. */
  work: IntrinsicMesh;
  /** Mean edge length of the input mesh. */
  h: number;
  /** Uniform length added by mollification. */
  epsilon: number;
  /** Intrinsic flips made (both passes). */
  flips: number;
  /** True when a flip cap stopped a Delaunay pass early. */
  flipsCapped: boolean;
  /** Vertices inserted by the refinement. */
  inserted: number;
  /** True when the refinement stopped at its vertex cap or round cap (see {@link HeatStats.refineCapped}). */
  refineCapped: boolean;
}

/**
 * Checks the options and the mesh (`USAGE` for bad options or an empty mesh,
 * `INPUT` for an invalid edge length) and builds the intrinsic triangulation.
 */
export function heatTriangulation(mesh: IntrinsicMesh, opts: HeatOptions): HeatTriangulation {
    const m = opts.timeScale ?? 1;
    const [mLo, mHi] = TIME_SCALE_RANGE;
    if (!(m >= mLo && m <= mHi)) throw usageError(`timeScale must lie in [${mLo}, ${mHi}], got ${m}`, 'heat');
    const boundary = opts.boundary ?? 'average';
    if (!['average', 'neumann', 'dirichlet'].includes(boundary)) throw usageError(`unknown boundary condition '${boundary}'`, 'heat');
    const delta = opts.mollifyDelta ?? DEFAULT_MOLLIFY_DELTA;
    if (!(delta >= 0 && Number.isFinite(delta))) throw usageError(`mollifyDelta must be a non-negative number, got ${delta}`, 'heat');
    if (opts.ordering !== undefined && !['amd', 'nd', 'natural'].includes(opts.ordering)) {
      throw usageError(`unknown ordering '${opts.ordering}'`, 'heat');
    }
    const t = mesh.topology;
    if (t.nf === 0 || t.nv === 0) throw usageError('mesh has no faces', 'heat');
    for (let e = 0; e < t.ne; e++) {
      const l = mesh.edgeLength[e]!;
      if (!(l >= 0 && l < Infinity)) throw inputError(`edge ${e} has invalid length ${l}`, 'heat');
    }
    const h = meanEdgeLength(mesh);
    if (!(h > 0)) throw usageError('mesh has no positive edge length', 'heat');

    let work = mesh, epsilon = 0, flips = 0, flipsCapped = false;
    if (opts.mollify ?? true) ({ mesh: work, epsilon } = mollify(work, delta));
    let inserted = 0, refineCapped = false;
    if (opts.intrinsicDelaunay ?? true) {
      const r = intrinsicDelaunay(work);
      work = r.mesh; flips = r.flips; flipsCapped = r.capped;
      if (opts.refine ?? true) {
        // long edges, then boundary edges opposite an obtuse corner (negative weights: M + tL no
        // M-matrix) until none is left, flipping back to Delaunay after each step
        const b = refineToDelaunay(work, REFINE_FACTOR * equilateralEdge(work), Math.max(1000, t.nv), BOUNDARY_ROUNDS);
        work = b.mesh; inserted = b.inserted; refineCapped = b.capped || b.roundsCapped;
        flips += b.flips; flipsCapped ||= b.flipsCapped;
      }
    }
    return { m, boundary, work, h, epsilon, flips, flipsCapped, inserted, refineCapped };
}

/** The matrices and per-mesh data {@link assembleHeat} builds on the shared pattern. */
export interface HeatAssembly {
  /** Lumped mass per vertex. */
  Mv: Float64Array;
  /** Face data of the relay sweep and the largest hat-gradient component (heat-relay.ts). */
  faces: Float64Array;
  maxGrad: number;
  comp: Components;
  onBoundary: Uint8Array;
  /** Vertices without area (isolated, or only zero-area faces): identity rows. */
  inactive: Uint8Array;
  /** Smallest positive lumped mass. */
  minMass: number;
  /** Diagonal of M + tL before the rows are constrained, and the largest diagonal after. */
  heatDiag: Float64Array;
  maxDiag: number;
  /** Rows of the Dirichlet heat matrix fixed to the identity (inactive or on the boundary). */
  fixedD: Uint8Array;
  /** M + tL, then (boundary mode other than 'neumann', with a boundary) its Dirichlet copy, then the pinned Poisson matrix. */
  mats: CscMatrix[];
  /** Rows of the pinned Poisson matrix fixed to 0. */
  blocked: Uint8Array;
}

/**
 * Assembles everything the factorizations and the relay need on pattern `p`
 * (`Lv` receives the cotan Laplacian): run by `HeatSolver.prepare` while
 * other threads order the pattern (AnalyzeOptions.meanwhile), since the
 * analysis reads the pattern only.
 */
export function assembleHeat(work: IntrinsicMesh, p: EdgePattern, Lv: Float64Array<ArrayBuffer>, step: number, boundary: HeatTriangulation['boundary']): HeatAssembly {
  const nv = work.topology.nv;
  cotanLaplacian(work, p, Lv);
  const Mv = lumpedMass(work);
  const { faces, maxGrad } = relayGeometry(work); // packed face data only: the full face geometry is not kept (peak memory)
  const comp = components(work.topology);
  const onBoundary = boundaryVertexMask(work.topology);
  // rows without area (isolated vertices, or only zero-area faces) are fixed to u = 0
  const inactive = new Uint8Array(nv);
  let minMass = Infinity;
  for (let v = 0; v < nv; v++) {
    if (!(Mv[v]! > 0)) inactive[v] = 1;
    else if (Mv[v]! < minMass) minMass = Mv[v]!;
  }
  const A = combine(p, step, Lv, 1, Mv);
  const heatDiag = new Float64Array(nv);
  for (let v = 0; v < nv; v++) heatDiag[v] = A[p.diagSlot[v]!]!;
  constrainRows(p, A, inactive);
  let maxDiag = 0;
  for (let v = 0; v < nv; v++) maxDiag = Math.max(maxDiag, A[p.diagSlot[v]!]!);
  // the two or three matrices (independent factorizations)
  const mats = [patternMatrix(p, A)];
  const fixedD = new Uint8Array(nv);
  let hasBoundary = false;
  for (let v = 0; v < nv && !hasBoundary; v++) hasBoundary = onBoundary[v] === 1 && !inactive[v];
  if (boundary !== 'neumann' && hasBoundary) {
    for (let v = 0; v < nv; v++) fixedD[v] = inactive[v]! | onBoundary[v]!;
    const AD = A.slice();
    constrainRows(p, AD, fixedD);
    mats.push(patternMatrix(p, AD));
  }
  const pinned = pinnedPoisson(p, Lv, Mv, inactive, comp.vertexComponent, comp.count);
  mats.push(patternMatrix(p, pinned.values));
  return { Mv, faces, maxGrad, comp, onBoundary, inactive, minMass, heatDiag, maxDiag, fixedD, mats, blocked: pinned.blocked };
}
