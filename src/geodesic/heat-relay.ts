/**
 * The heat method's middle step, X = −∇u/|∇u| and b_i = Σ_f A_f ∇φ_i·X_f,
 * made safe against the heat underflowing far from the sources.
 *
 * Backward-Euler heat decays like e^(−r/√t): with t = h² a unit source
 * leaves the double range about 700 edge rings out, where ∇u becomes 0 (or
 * subnormal noise) and the direction field is lost. Only directions matter,
 * so two things are done. The initial heat is scaled up to a ceiling C: with
 * (M + tL)u = δ, Σ_i M_i u_i = Σ δ (1ᵀL = 0) and u ≥ 0, so u_i ≤ Σδ / min M,
 * and Σδ → C·min M keeps u ≤ C. C = 1e300 / (3·max|∇φ| · max(1, √max A_ii))
 * also keeps the gradients (≤ 3·u·max|∇φ|) and the forward-substitution
 * values (≤ u·L_ii) finite; for meshes in ordinary units C ≈ 1e297 and the
 * range C … 1e-290 spans ~1350 rings. Past that the heat is relayed:
 * vertices whose heat is above τ = max(u_max·1e-580, 1e-290) (per component)
 * settle in stage 0; the settled vertices next to unsettled ones form a
 * front, and heat released from the front (weighted by u/τ, then scaled up
 * the same way) settles the next band in stage 1, and so on:
 * ```
 *   source ●~~~~~ stage 0 ~~~~~|front|~~~~~ stage 1 ~~~~~|front|~~~ stage 2 …
 * ```
 * Beyond a front the relayed heat is the heat of a curve source along a level
 * set of u, whose normalised gradient is the same direction field (Huygens'
 * principle for distance: d(x) = d(front) + dist(front, x)). Each face takes
 * X from the stage that settled its last corner. On most meshes everything
 * settles in stage 0 and this is one sweep over the faces.
 */
import type { Topology } from '../mesh/topology.js';
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import { faceHatGradients } from '../metric/laplacian.js';
import { planarLength } from '../metric/layout.js';
import { next } from '../mesh/topology.js';

/** Workspaces and per-mesh data for {@link assembleDivergence}. */
export interface RelayWork {
  /** Working topology (the intrinsic triangulation). */
  readonly t: Topology;
  /** Face areas and hat gradients of `t`, packed by {@link relayGeometry}. */
  readonly faces: Float64Array;
  /** Component of each vertex (-1 isolated). */
  readonly comp: Int32Array;
  /** Vertices that never block settling (Dirichlet-fixed boundary, inactive rows). */
  readonly wildcard: Uint8Array;
  /** Stage per vertex, size nv. */
  readonly stage: Int32Array;
  /** Per-component maximum / threshold, size = component count. */
  readonly compTau: Float64Array;
  /** Per-component flag: has heat, size = component count. */
  readonly compHot: Uint8Array;
  /** Smallest positive lumped mass (bounds the heat: u_i ≤ Σδ / min M). */
  readonly minMass: number;
  /** Ceiling C for the scaled heat (see the module comment). */
  readonly heatCeiling: number;
}

/** Largest number of relay stages before the rest is left with X = 0. */
export const MAX_RELAY_STAGES = 256;
/** Settling threshold relative to a component's largest heat value, as two factors (1e-580 underflows). */
const RELATIVE_TAU = 1e-290;
/** Lowest absolute settling threshold (keeps away from subnormal numbers). */
const MIN_TAU = 1e-290;

/** Doubles per face in the relay's packed face data ({@link relayGeometry}). */
const FACE_STRIDE = 5;

/**
 * What the sweep over faces reads, packed five doubles per face in one
 * stream, and the largest hat-gradient component (for {@link heatCeiling}).
 * In the face frame of laplacian.ts (faceHatGradients) the hat gradients are
 * ∇φ₀ = (−c, y₀), ∇φ₁ = (c, y₁), ∇φ₂ = (0, y₂) with c = 1/l₀, so face f
 * stores [c, y₀, y₁, y₂, A_f] at 5f. Made face by face: the full face geometry
 * (8 doubles per face) is never held, which spared 112 MB of fresh memory
 * at 2M faces (same values to the bit).
 */
export function relayGeometry(mesh: IntrinsicMesh): { faces: Float64Array; maxGrad: number } {
  const { topology: t, edgeLength: L } = mesh;
  const out = new Float64Array(FACE_STRIDE * t.nf);
  const g = new Float64Array(6), p2 = [0, 0];
  let maxGrad = 0;
  for (let f = 0; f < t.nf; f++) {
    const A = faceHatGradients(L[t.edgeOf[3 * f]!]!, L[t.edgeOf[3 * f + 1]!]!, L[t.edgeOf[3 * f + 2]!]!, g, 0, p2);
    const q = FACE_STRIDE * f;
    out[q] = g[2]!;
    out[q + 1] = g[1]!;
    out[q + 2] = g[3]!;
    out[q + 3] = g[5]!;
    out[q + 4] = A;
    for (let k = 0; k < 6; k++) maxGrad = Math.max(maxGrad, Math.abs(g[k]!));
  }
  return { faces: out, maxGrad };
}

/**
 * The ceiling C of the module comment from the largest hat-gradient
 * component and the largest diagonal entry of the heat matrix.
 */
export function heatCeiling(maxGrad: number, maxDiag: number): number {
  return 1e300 / (Math.max(1, 3 * maxGrad) * Math.max(1, Math.sqrt(maxDiag)));
}

/**
 * Runs the heat solve(s) through `heat(rhs, u)` (which may overwrite rhs)
 * and accumulates b (zeroed here). `rhs` holds the initial heat on entry and
 * is used as the relay workspace. Returns the number of faces left with
 * X = 0 in components that carry heat, the number of stages used, and the
 * vertices of heated components the stage cap left unreached (`unsettled`;
 * their distances would be wrong). Vertices left because no heat reaches
 * them at all (negative heat of a non-M-matrix) count as flat faces instead.
 */
export function assembleDivergence(
  w: RelayWork,
  heat: (rhs: Float64Array, u: Float64Array) => void,
  rhs: Float64Array,
  u: Float64Array,
  b: Float64Array,
): { flatFaces: number; stages: number; unsettled: number } {
  const { t, comp, wildcard, stage, compTau: tau, compHot: hot } = w;
  const nv = t.nv;
  hot.fill(0);
  stage.fill(-1);
  b.fill(0);
  let sum = 0;
  for (let v = 0; v < nv; v++) {
    const r = rhs[v]!;
    sum += r;
    if (r > 0 && comp[v]! >= 0) hot[comp[v]!] = 1;
  }
  let flat = 0, k = 0, unsettled = 0;
  for (;; k++) {
    if (k > 0) {
      sum = 0;
      for (let v = 0; v < nv; v++) sum += rhs[v]!;
    }
    if (sum > 0 && w.minMass > 0) {
      const scale = (w.heatCeiling * w.minMass) / sum;
      if (scale < Infinity) for (let v = 0; v < nv; v++) rhs[v]! *= scale;
    }
    heat(rhs, u);
    tau.fill(0);
    for (let v = 0; v < nv; v++) {
      const c = comp[v]!;
      if (c >= 0 && u[v]! > tau[c]!) tau[c] = u[v]!;
    }
    for (let c = 0; c < tau.length; c++) tau[c] = Math.max(tau[c]! * RELATIVE_TAU * RELATIVE_TAU, MIN_TAU);
    let settled = 0, pending = 0;
    for (let v = 0; v < nv; v++) {
      const c = comp[v]!;
      if (c < 0 || !hot[c] || stage[v] !== -1) continue;
      if (wildcard[v] || u[v]! >= tau[c]!) { stage[v] = k; settled++; } else pending++;
    }
    const last = pending === 0 || settled === 0 || k + 1 >= MAX_RELAY_STAGES;
    unsettled = k + 1 >= MAX_RELAY_STAGES ? pending : 0;
    flat += scatterStage(w, k, u, b, last);
    if (last) break;
    // front: settled-in-this-stage vertices with an unsettled neighbour release u/τ
    rhs.fill(0);
    const tri = t.tri;
    for (let h = 0; h < tri.length; h++) {
      const a = tri[h]!, c = tri[next(h)]!;
      if (stage[a] === k && stage[c] === -1 && !wildcard[a]) rhs[a] = u[a]! / tau[comp[a]!]!;
      if (stage[c] === k && stage[a] === -1 && !wildcard[c]) rhs[c] = u[c]! / tau[comp[c]!]!;
    }
  }
  return { flatFaces: flat, stages: k + 1, unsettled };
}

/**
 * Adds A_f ∇φ_i·X_f for the faces whose latest-settled corner settled in
 * stage k (with X from this stage's u). With `last`, faces that still have
 * an unsettled corner in a hot component are counted as flat.
 */
function scatterStage(w: RelayWork, k: number, u: Float64Array, b: Float64Array, last: boolean): number {
  const { t, faces: F, comp, stage, compHot: hot } = w;
  const tri = t.tri;
  let flat = 0;
  for (let f = 0; f < t.nf; f++) {
    const i0 = tri[3 * f]!, i1 = tri[3 * f + 1]!, i2 = tri[3 * f + 2]!;
    const s0 = stage[i0]!, s1 = stage[i1]!, s2 = stage[i2]!;
    if (s0 < 0 || s1 < 0 || s2 < 0) {
      if (last && hot[comp[i0]!]) flat++;
      continue;
    }
    if (Math.max(s0, s1, s2) !== k) continue;
    const o = FACE_STRIDE * f, u0 = u[i0]!, u1 = u[i1]!, u2 = u[i2]!;
    const c = F[o]!, y0 = F[o + 1]!, y1 = F[o + 2]!, y2 = F[o + 3]!, area = F[o + 4]!;
    const gx = (u1 - u0) * c;
    const gy = u0 * y0 + u1 * y1 + u2 * y2;
    // −A/|∇u| directly while |∇u|² is a normal number; else normalise via the larger
    // component first (|∇u|² would underflow for subnormal gradients, overflow near the ceiling)
    const n2 = gx * gx + gy * gy;
    let ax: number, ay: number;
    if (n2 > 1e-280 && n2 < 1e280) {
      const s = -area / Math.sqrt(n2);
      ax = s * gx; ay = s * gy;
    } else {
      const big = Math.max(Math.abs(gx), Math.abs(gy));
      if (!(big > 0 && big < Infinity)) { flat++; continue; }
      const sx = gx / big, sy = gy / big;
      const s = -area / planarLength(sx, sy);
      ax = s * sx; ay = s * sy;
    }
    b[i0]! += ay * y0 - ax * c;
    b[i1]! += ax * c + ay * y1;
    b[i2]! += ay * y2;
  }
  return flat;
}
