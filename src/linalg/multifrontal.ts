/**
 * Supernodal multifrontal numeric Cholesky (Duff & Reid 1983; Liu, SIAM
 * Review 34, 1992). Supernodes are visited in postorder; for supernode s with
 * pattern R_s (nr rows, nc own columns) the frontal matrix
 *
 *   F_s = C(R_s, cols s) assembled  ⊕  Σ_{children c} U_c   (extend-add)
 *
 * is factored on its first nc columns (dense kernels), which gives L's block
 * for s, and leaves the update matrix U_s = F₂₂ − L₂₁L₂₁ᵀ (order nr − nc) for
 * the parent. Postorder makes the children's update matrices the topmost
 * entries of a stack, so one preallocated Float64Array holds them all
 * (each packed: lower triangle by rows, m(m+1)/2 doubles).
 * Extend-add maps a child's rows to the parent's positions through `pos`
 * (global row → local row, valid while s is being assembled).
 */
import { belowBase, type SupernodalStructure } from './supernodes.js';
import { factorFront } from './dense-kernels.js';
import { createSimdFront } from './wasm-update.js';
import type { SimdFront } from './wasm-update.js';

/** Workspaces of {@link multifrontalFactor}: scratch, so the factors of one analysis share them. */
export interface MultifrontalWork {
  /** Frontal matrix, maxRows² doubles (in WebAssembly memory when `simd` is set). */
  readonly front: Float64Array;
  /** The SIMD tile kernel over `front`, or null for the plain kernels. */
  readonly simd: SimdFront | null;
  /** Update-matrix stack. */
  readonly stack: Float64Array;
  /** Row position map, n entries. */
  readonly pos: Int32Array;
  /** Supernode ids on the stack. */
  readonly stackIds: Int32Array;
  /** A child's rows mapped to positions in the parent's front, maxRows entries. */
  readonly rel: Int32Array;
}

/** Allocates the workspaces for a supernodal structure. */
export function multifrontalWork(n: number, sn: SupernodalStructure, useSimd = true): MultifrontalWork {
  const simd = useSimd ? createSimdFront(sn.maxRows * sn.maxRows) : null;
  return {
    front: simd ? simd.front : new Float64Array(sn.maxRows * sn.maxRows),
    simd,
    stack: new Float64Array(Math.max(1, sn.stackSize)),
    pos: new Int32Array(n),
    stackIds: new Int32Array(Math.max(1, sn.nsuper)),
    rel: new Int32Array(Math.max(1, sn.maxRows)),
  };
}

/**
 * Factors C (lower triangle in CSC: cp, ci, cx; rows ≥ column) into the
 * row-major supernode blocks Lx. Returns −1 on success or the (permuted)
 * column whose pivot is not finite and above its floor (0, or minPivot[k]);
 * `pivotOut[0]` receives that pivot value. `progress[0]`, when given, is set
 * to s + 1 as supernode s starts (a heartbeat another thread can watch).
 * With `lo`, `hi` only supernodes lo … hi−1 are factored, from an empty
 * stack: a whole subtree's postorder range (multifrontal-tasks.ts), whose
 * root's update matrix is then left at stack[0 …]. With `unscale` = 2^−k
 * (cx holds 4^k·C: exponent-shift.ts) the blocks are stored times 2^−k, so
 * Lx is C's factor, and the pivot reported is unscaled too.
 * Never throws, never allocates.
 */
export function multifrontalFactor(
  sn: SupernodalStructure,
  cp: Int32Array,
  ci: Int32Array,
  cx: Float64Array,
  Lx: Float64Array,
  work: MultifrontalWork,
  pivotOut: Float64Array,
  minPivot: Float64Array | null = null,
  progress: Int32Array | null = null,
  lo = 0,
  hi = sn.nsuper,
  unscale = 1,
): number {
  const { superStart, childCount, rowPtr, valPtr } = sn;
  const { front: F, stack, stackIds, simd } = work;
  let nStack = 0; // entries on the stack
  let stackTop = 0; // doubles used
  for (let s = lo; s < hi; s++) {
    const f = superStart[s]!, nc = superStart[s + 1]! - f;
    const nr = rowPtr[s + 1]! - rowPtr[s]!;
    if (progress !== null) progress[0] = s + 1;
    assembleFront(sn, s, cp, ci, cx, work, F);
    // extend-add the children's update matrices (topmost on the stack)
    for (let c = 0; c < childCount[s]!; c++) {
      const ch = stackIds[--nStack]!;
      const m = updateOrder(sn, ch);
      stackTop -= (m * (m + 1)) >> 1;
      extendAdd(sn, ch, stack, stackTop, work, F, nr);
    }
    const bad = factorFront(F, nr, nc, simd, minPivot, f);
    if (bad >= 0) {
      pivotOut[0] = F[bad * nr + bad]! * unscale * unscale;
      return f + bad;
    }
    storeBlock(F, nr, nc, Lx, valPtr[s]!, unscale);
    if (nr > nc) {
      stackTop = pushUpdate(F, nr, nc, stack, stackTop);
      stackIds[nStack++] = s;
    }
  }
  return -1;
}

/** Order of supernode s's update matrix: its rows below its own columns. */
export function updateOrder(sn: SupernodalStructure, s: number): number {
  return sn.rowPtr[s + 1]! - sn.rowPtr[s]! - (sn.superStart[s + 1]! - sn.superStart[s]!);
}

/**
 * Sets `work.pos` for supernode s's rows, zeroes the lower triangle of its
 * front F and assembles the columns of C that s owns: F(pos i, j − f) = C(i, j).
 */
export function assembleFront(
  sn: SupernodalStructure, s: number, cp: Int32Array, ci: Int32Array, cx: Float64Array, work: MultifrontalWork, F: Float64Array,
): void {
  const { superStart, rowPtr, rows } = sn;
  const pos = work.pos;
  const f = superStart[s]!, l = superStart[s + 1]!;
  const r0 = rowPtr[s]!, nr = rowPtr[s + 1]! - r0;
  for (let r = 0; r < nr; r++) pos[rows[r0 + r]!] = r;
  // zero the lower triangle: up to 96 rows the whole square in one fill() (the upper triangle
  // is scratch; measured 5–10× faster per entry than row by row below 64 rows, even at 128),
  // above that row by row (half the entries, and the square no longer stays in cache)
  if (nr <= 96) {
    F.fill(0, 0, nr * nr);
  } else {
    for (let r = 0; r < nr; r++) F.fill(0, r * nr, r * nr + r + 1);
  }
  for (let j = f; j < l; j++) {
    const jc = j - f;
    for (let p = cp[j]!; p < cp[j + 1]!; p++) F[pos[ci[p]!]! * nr + jc]! += cx[p]!;
  }
}

/**
 * Adds child ch's update matrix (packed by rows at stack[u0 …]) into the
 * parent's front F of order nr, mapping the child's rows through `work.pos`
 * (valid for the parent being assembled).
 */
export function extendAdd(
  sn: SupernodalStructure, ch: number, stack: Float64Array, u0: number, work: MultifrontalWork, F: Float64Array, nr: number,
): void {
  const rows = sn.rows, pos = work.pos, rel = work.rel;
  const cr0 = sn.rowPtr[ch]! + (sn.superStart[ch + 1]! - sn.superStart[ch]!);
  const m = sn.rowPtr[ch + 1]! - cr0;
  for (let a = 0; a < m; a++) rel[a] = pos[rows[cr0 + a]!]!;
  // packed row a of U_c starts at a(a+1)/2; its columns map through rel
  let u = u0;
  if (rel[m - 1]! - rel[0]! === m - 1) {
    // the child's rows are consecutive in the parent: plain row additions
    const c0 = rel[0]!;
    for (let a = 0; a < m; a++) {
      const ra = (c0 + a) * nr + c0;
      for (let b = 0; b <= a; b++) F[ra + b]! += stack[u++]!;
    }
  } else {
    for (let a = 0; a < m; a++) {
      const ra = rel[a]! * nr;
      for (let b = 0; b <= a; b++) F[ra + rel[b]!]! += stack[u++]!;
    }
  }
}

/**
 * Copies L's block out of the factored front: the diagonal block's lower
 * triangle packed by rows, then the first nc entries of every row below
 * (F's upper triangle holds scratch values), each times `unscale` (a power
 * of two; 1 copies them as they are).
 */
export function storeBlock(F: Float64Array, nr: number, nc: number, Lx: Float64Array, v0: number, unscale = 1): void {
  for (let r = 0, dst = v0; r < nc; r++) {
    const src = r * nr;
    for (let k = 0; k <= r; k++) Lx[dst++] = F[src + k]! * unscale;
  }
  const w0 = belowBase(v0, nc);
  for (let r = nc; r < nr; r++) {
    const src = r * nr;
    const dst = w0 + r * nc;
    for (let k = 0; k < nc; k++) Lx[dst + k] = F[src + k]! * unscale;
  }
}

/** Pushes U = the lower triangle of F's trailing block, packed by rows; returns the new stack top. */
export function pushUpdate(F: Float64Array, nr: number, nc: number, stack: Float64Array, top: number): number {
  const m = nr - nc;
  let u = top;
  for (let a = 0; a < m; a++) {
    const src = (nc + a) * nr + nc;
    for (let b = 0; b <= a; b++) stack[u++] = F[src + b]!;
  }
  return u;
}
