/**
 * Cotangent Laplacian, lumped mass, and per-face gradient / divergence, all
 * from edge lengths only.
 *
 * Sign convention: L is positive semi-definite,
 *   L_ij = −w_ij (i ≠ j),  L_ii = Σ_j w_ij,  w_ij = ½ (cot α_ij + cot β_ij),
 * which is the P1 finite-element stiffness matrix L_ij = Σ_f A_f ∇φ_i·∇φ_j.
 *
 * Matrices live on a fixed lower-triangle CSC pattern ({@link EdgePattern}):
 * one diagonal slot per vertex and one slot per distinct vertex pair joined
 * by an edge. L, M + tL, L + εM and copies with constrained rows all share it,
 * so one symbolic Cholesky analysis serves them all. After intrinsic flips two
 * edges may join the same pair (their weights add in one slot) and an edge may
 * be a loop (it contributes w(u_i − u_i)² = 0, so it has no slot).
 *
 * Per-face frame: corner 0 of face f (tail of half-edge 3f) at the origin,
 * corner 1 on the +x axis, corner 2 above it:
 * ```
 *            p2 = (x2, y2),  x2 = (l0² + l2² − l1²) / (2 l0),  y2 = 2A / l0
 *            /\
 *       l2  /  \  l1          l_k = length of half-edge 3f+k
 *          /    \
 *   p0 = (0,0)──── p1 = (l0, 0)
 *             l0
 * ```
 * (p2 from triangle.ts's `placeThirdCorner`, the one layout from lengths).
 * Hat-function gradients: ∇φ_k = rot90(p_{k+2} − p_{k+1}) / (2A), with
 * rot90(x, y) = (−y, x). Degenerate faces (A = 0) follow the library's rule
 * (triangle.ts): cotangents 0, zero gradients, no mass, so they contribute
 * nothing to L, which stays the Gram matrix Σ A_f ∇φ∇φᵀ (PSD).
 */
import type { Topology } from '../mesh/topology.js';
import type { IntrinsicMesh } from './intrinsic.js';
import type { CscMatrix } from '../linalg/csc.js';
import { next } from '../mesh/topology.js';
import { triangleArea, faceCotans, boundedCot, placeThirdCorner } from './triangle.js';
import { barycentricVertexAreas } from './vertex-areas.js';

/**
 * Lower-triangle CSC pattern over the vertices of a topology: in column j the
 * diagonal (row j) comes first, then the rows i > j joined to j by an edge,
 * ascending.
 */
export interface EdgePattern {
  /** Number of vertices (rows and columns). */
  readonly n: number;
  /** Column starts, length n + 1. */
  readonly colPtr: Int32Array;
  /** Row of every slot, ascending within a column. */
  readonly rowIdx: Int32Array;
  /** Slot of the diagonal entry of each vertex (equals colPtr[v]). */
  readonly diagSlot: Int32Array;
  /** Slot of the off-diagonal entry of each edge; -1 for a loop edge. */
  readonly edgeSlot: Int32Array;
}

/**
 * Builds the fixed pattern of a topology in O(E): each edge's pair once
 * (sequential arrays), rows of each column sorted by insertion (short
 * columns) together with their edges, so that deduplicating a column also
 * gives every edge its slot.
 */
export function edgePattern(t: Topology): EdgePattern {
  const n = t.nv, ne = t.ne, tri = t.tri, eh = t.edgeHalfedge;
  const count = new Int32Array(n + 1);
  // each edge's endpoints, lower first (one pass of scattered reads); a loop edge gets lo = -1
  const lo = new Int32Array(ne), hi = new Int32Array(ne);
  for (let e = 0; e < ne; e++) {
    const h = eh[e]!;
    const a = tri[h]!, b = tri[h % 3 === 2 ? h - 2 : h + 1]!;
    if (a === b) { lo[e] = -1; continue; }
    const j = a < b ? a : b;
    lo[e] = j;
    hi[e] = a < b ? b : a;
    count[j]!++;
  }
  // raw rows per column (duplicates included) with their edges, sorted then deduplicated
  const start = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) start[j + 1] = start[j]! + count[j]!;
  const raw = new Int32Array(start[n]!), rawEdge = new Int32Array(start[n]!);
  const fill = start.slice(0, n);
  for (let e = 0; e < ne; e++) {
    const j = lo[e]!;
    if (j < 0) continue;
    const q = fill[j]!++;
    raw[q] = hi[e]!;
    rawEdge[q] = e;
  }
  const colPtr = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) {
    const p0 = start[j]!, p1 = start[j + 1]!;
    for (let p = p0 + 1; p < p1; p++) {
      const x = raw[p]!, xe = rawEdge[p]!;
      let q = p - 1;
      while (q >= p0 && raw[q]! > x) { raw[q + 1] = raw[q]!; rawEdge[q + 1] = rawEdge[q]!; q--; }
      raw[q + 1] = x;
      rawEdge[q + 1] = xe;
    }
    let distinct = 0;
    for (let p = p0; p < p1; p++) if (p === p0 || raw[p] !== raw[p - 1]) distinct++;
    colPtr[j + 1] = colPtr[j]! + 1 + distinct;
  }
  const rowIdx = new Int32Array(colPtr[n]!);
  const diagSlot = new Int32Array(n);
  const edgeSlot = new Int32Array(ne).fill(-1);
  for (let j = 0; j < n; j++) {
    let q = colPtr[j]!;
    diagSlot[j] = q;
    rowIdx[q] = j;
    for (let p = start[j]!; p < start[j + 1]!; p++) {
      if (p === start[j] || raw[p] !== raw[p - 1]) rowIdx[++q] = raw[p]!;
      edgeSlot[rawEdge[p]!] = q;
    }
  }
  return { n, colPtr, rowIdx, diagSlot, edgeSlot };
}

/** Wraps values on a pattern as a CSC matrix (no copy). */
export function patternMatrix(p: EdgePattern, values: Float64Array): CscMatrix {
  return { n: p.n, colPtr: p.colPtr, rowIdx: p.rowIdx, values };
}

/** Per-face area and hat-function gradients in each face's own frame. */
export interface FaceGeometry {
  /** Area of each face. */
  readonly area: Float64Array;
  /** ∇φ of corner k of face f at [6f + 2k], [6f + 2k + 1] (face frame, see module comment). */
  readonly grad: Float64Array;
}

/** Lays every face out in its own frame from its side lengths. */
export function faceGeometry(m: IntrinsicMesh): FaceGeometry {
  const { topology: t, edgeLength: L } = m;
  const area = new Float64Array(t.nf);
  const grad = new Float64Array(6 * t.nf);
  const p2 = [0, 0];
  for (let f = 0; f < t.nf; f++) {
    area[f] = faceHatGradients(L[t.edgeOf[3 * f]!]!, L[t.edgeOf[3 * f + 1]!]!, L[t.edgeOf[3 * f + 2]!]!, grad, 6 * f, p2);
  }
  return { area, grad };
}

/**
 * One face of {@link faceGeometry}: the face with sides l0, l1, l2 laid out
 * in its own frame (side l0 on the x axis, placeThirdCorner), its three hat
 * gradients written to g[o …] (corner k at o + 2k; zeros for a face without
 * area or with l0 = 0); returns its area. `p2` is scratch (two numbers).
 */
export function faceHatGradients(l0: number, l1: number, l2: number, g: Float64Array, o: number, p2: number[]): number {
  const A = triangleArea(l0, l1, l2);
  if (!(A > 0) || !(l0 > 0)) {
    g.fill(0, o, o + 6);
    return A;
  }
  placeThirdCorner(l0, l1, l2, A, p2, 0);
  const x2 = p2[0]!, y2 = p2[1]!;
  const s = 1 / (2 * A);
  // corner 0: rot90(p2 − p1) = (−y2, x2 − l0)
  g[o] = -y2 * s; g[o + 1] = (x2 - l0) * s;
  // corner 1: rot90(p0 − p2) = (y2, −x2)
  g[o + 2] = y2 * s; g[o + 3] = -x2 * s;
  // corner 2: rot90(p1 − p0) = (0, l0)
  g[o + 4] = 0; g[o + 5] = l0 * s;
  return A;
}

/**
 * Cotangent Laplacian values on `p` (PSD convention). A face contributes
 * ½ cot θ to the weight of the edge opposite each corner θ; cotangents come
 * from triangle.ts ({@link faceCotans}: 0 for a face without area) bounded
 * to ±COT_LIMIT.
 */
export function cotanLaplacian(m: IntrinsicMesh, p: EdgePattern, out = new Float64Array(p.colPtr[p.n]!)): Float64Array {
  const { topology: t, edgeLength: L } = m;
  const cot = [0, 0, 0];
  out.fill(0);
  for (let f = 0; f < t.nf; f++) {
    const h0 = 3 * f;
    faceCotans(L[t.edgeOf[h0]!]!, L[t.edgeOf[h0 + 1]!]!, L[t.edgeOf[h0 + 2]!]!, cot, 0);
    for (let k = 0; k < 3; k++) {
      const h = h0 + k;
      const w = 0.5 * boundedCot(cot[k]!);
      const s = p.edgeSlot[t.edgeOf[h]!]!;
      if (s < 0) continue;
      out[s]! -= w;
      out[p.diagSlot[t.tri[h]!]!]! += w;
      out[p.diagSlot[t.tri[next(h)]!]!]! += w;
    }
  }
  return out;
}

/**
 * Lumped (barycentric) mass: one third of each incident face's area per
 * vertex. The same function as vertex-areas.ts's `barycentricVertexAreas` (one
 * home), under the name the heat method uses.
 */
export const lumpedMass: typeof barycentricVertexAreas = barycentricVertexAreas;

/** out = α·L + β·diag(mass) on the shared pattern (L given by its values). */
export function combine(
  p: EdgePattern,
  alpha: number,
  L: Float64Array,
  beta: number,
  mass: Float64Array,
  out = new Float64Array(L.length),
): Float64Array {
  for (let s = 0; s < L.length; s++) out[s] = alpha * L[s]!;
  for (let v = 0; v < p.n; v++) out[p.diagSlot[v]!]! += beta * mass[v]!;
  return out;
}

/**
 * Replaces the row and column of every vertex with `fixed[v] ≠ 0` by those of
 * the identity (Dirichlet condition u_v = given value), in place. The pattern
 * keeps its structural zeros so the symbolic analysis still applies; the
 * result stays symmetric positive definite when the input was on the free
 * vertices.
 */
export function constrainRows(p: EdgePattern, values: Float64Array, fixed: Uint8Array): void {
  for (let j = 0; j < p.n; j++) {
    const fj = fixed[j]!;
    for (let s = p.colPtr[j]!; s < p.colPtr[j + 1]!; s++) {
      const i = p.rowIdx[s]!;
      if (fj || fixed[i]) values[s] = i === j ? 1 : 0;
    }
  }
}

/**
 * Moves known values to the right-hand side of a system whose `fixed` rows
 * and columns were replaced by the identity ({@link constrainRows}): for
 * every stored pair (i free, j fixed), rhs_i −= scale · values_ij · g_j, so
 * that the free rows solve A_FF x_F = rhs_F − A_FD g_D. Sets rhs_j = g_j on
 * the fixed rows. `values` are the unconstrained matrix entries.
 */
export function liftDirichlet(
  p: EdgePattern, values: Float64Array, scale: number, fixed: Uint8Array, g: Float64Array, rhs: Float64Array,
): void {
  // all-zero data move nothing (the common case of a heat step without a boundary source): skip the O(nnz) pass
  let any = false;
  for (let v = 0; v < p.n && !any; v++) any = fixed[v] !== 0 && g[v] !== 0;
  if (any) liftPairs(p, values, scale, fixed, g, rhs);
  for (let v = 0; v < p.n; v++) if (fixed[v]) rhs[v] = g[v]!;
}

/** The pass over stored pairs of {@link liftDirichlet}. */
function liftPairs(p: EdgePattern, values: Float64Array, scale: number, fixed: Uint8Array, g: Float64Array, rhs: Float64Array): void {
  for (let j = 0; j < p.n; j++) {
    const fj = fixed[j]!;
    for (let s = p.colPtr[j]! + 1; s < p.colPtr[j + 1]!; s++) {
      const i = p.rowIdx[s]!, fi = fixed[i]!;
      if (fj && !fi) rhs[i]! -= scale * values[s]! * g[j]!;
      else if (fi && !fj) rhs[j]! -= scale * values[s]! * g[i]!;
    }
  }
}

/** Per-face gradient of a per-vertex function: out[2f], out[2f+1] in face f's frame. */
export function faceGradient(t: Topology, g: FaceGeometry, u: Float64Array, out = new Float64Array(2 * t.nf)): Float64Array {
  const G = g.grad;
  for (let f = 0; f < t.nf; f++) {
    const u0 = u[t.tri[3 * f]!]!, u1 = u[t.tri[3 * f + 1]!]!, u2 = u[t.tri[3 * f + 2]!]!, o = 6 * f;
    out[2 * f] = u0 * G[o]! + u1 * G[o + 2]! + u2 * G[o + 4]!;
    out[2 * f + 1] = u0 * G[o + 1]! + u1 * G[o + 3]! + u2 * G[o + 5]!;
  }
  return out;
}

/**
 * Weak (integrated) divergence of a per-face vector field, with the sign that
 * matches the PSD Laplacian: out_i = Σ_f A_f ∇φ_i · X_f = −∫_{cell i} div X.
 * Then weakDivergence(faceGradient(u)) = L u, and L φ = weakDivergence(X) is
 * the least-squares fit ∇φ ≈ X.
 */
export function weakDivergence(t: Topology, g: FaceGeometry, X: Float64Array, out = new Float64Array(t.nv)): Float64Array {
  const G = g.grad, A = g.area;
  out.fill(0);
  for (let f = 0; f < t.nf; f++) {
    const ax = A[f]! * X[2 * f]!, ay = A[f]! * X[2 * f + 1]!, o = 6 * f;
    out[t.tri[3 * f]!]! += ax * G[o]! + ay * G[o + 1]!;
    out[t.tri[3 * f + 1]!]! += ax * G[o + 2]! + ay * G[o + 3]!;
    out[t.tri[3 * f + 2]!]! += ax * G[o + 4]! + ay * G[o + 5]!;
  }
  return out;
}
