/**
 * Supernodal structure of a Cholesky factor whose columns are in postorder.
 *
 * A supernode is a run of consecutive columns f..l that share one row
 * pattern below the diagonal block, so L restricted to it is one dense block:
 *
 * ```
 *        f     l
 *      [ x         ]  f    rows R_s = f..l, then the rows below
 *      [ x  x      ]       (sorted); stored by rows (packed, below)
 *      [ x  x  x   ]  l
 *      [ x  x  x   ]  r₁
 *      [ x  x  x   ]  r₂
 * ```
 *
 * Values are stored by rows, the diagonal block as a packed lower triangle
 * (see `valPtr`).
 *
 * Fundamental supernodes (Liu, Ng, Peyton 1993): column j joins column j−1
 * when parent[j−1] = j, j has no other child, and colCount[j−1] =
 * colCount[j] + 1 (column j−1's pattern is column j's plus the diagonal). Relaxed amalgamation then merges a block
 * into its parent when they are adjacent and the explicit zeros this adds
 * stay small (relaxed supernodes, Ashcraft & Grimes, ACM TOMS 15, 1989; our
 * rule: zero fraction z ≤ 3/nc for a merged block of nc columns, so blocks of
 * up to 3 columns always merge; on 160k-vertex terrain and sphere it matched
 * the refactor time of a stepped threshold table with ~5% fewer stored
 * values and ~3% fewer dense flops). The row pattern of a
 * supernode is its own columns plus the rows below them in C's columns and in
 * its children's patterns (Struct(L_s) = Struct(C_s) ∪ ⋃ Struct(L_c) \ …).
 */
import { limitError } from '../errors.js';
import type { CscMatrix } from './csc.js';

/** Supernode partition, patterns and workspace sizes. */
export interface SupernodalStructure {
  /** Number of supernodes. */
  readonly nsuper: number;
  /** Supernode s owns columns superStart[s] .. superStart[s+1]−1. */
  readonly superStart: Int32Array;
  /** Parent supernode (−1 at roots); parents come after children. */
  readonly superParent: Int32Array;
  /** Number of child supernodes. */
  readonly childCount: Int32Array;
  /** Offsets of each supernode's row pattern in `rows`, length nsuper + 1. */
  readonly rowPtr: Int32Array;
  /** Row patterns: own columns first, then the rows below, increasing. */
  readonly rows: Int32Array;
  /**
   * Offsets of each supernode's block of values, length nsuper + 1: the
   * nc × nc diagonal block's lower triangle by rows (row j holds j + 1
   * values), then the nr − nc rows below, nc values each.
   */
  readonly valPtr: Int32Array;
  /** Largest row count of a supernode (frontal matrix order). */
  readonly maxRows: number;
  /** Peak number of doubles on the update-matrix stack during factorization. */
  readonly stackSize: number;
}

/** Largest typed-array length used for the value storage. */
const MAX_VALUES = 2 ** 31 - 1;

/** Largest dense frontal matrix, in doubles (2 GiB). */
const MAX_FRONT = 2 ** 28;

/**
 * Where the rows below a block start: a block at v0 with nc own columns holds
 * its diagonal block packed (row j at v0 + j(j+1)/2), then row r ≥ nc of L₂₁
 * at `belowBase(v0, nc) + r·nc`. One home for the layout the kernels and
 * solves read.
 */
export function belowBase(v0: number, nc: number): number {
  return v0 + ((nc * (nc + 1)) >> 1) - nc * nc;
}

/**
 * Supernodes of the factor of the matrix C whose lower triangle pattern is
 * (lowColPtr, lowRowIdx), with elimination tree `parent` in postorder (every
 * parent index greater than its child's, subtrees contiguous) and column
 * counts `colCount`. Four phases: the column partition, the supernodal tree,
 * the row patterns, and the value layout with the update-stack peak. Throws
 * `LIMIT` when a frontal matrix or the value storage would be too large.
 */
export function findSupernodes(
  n: number,
  parent: Int32Array,
  colCount: Int32Array,
  lowColPtr: Int32Array,
  lowRowIdx: Int32Array,
  relax = true,
): SupernodalStructure {
  const superStart = partitionColumns(n, parent, colCount, relax);
  const nsuper = superStart.length - 1;
  const tree = supernodalTree(n, parent, superStart);
  const { rowPtr, rows, maxRows } = rowPatterns(superStart, tree, colCount, lowColPtr, lowRowIdx);
  if (maxRows * maxRows > MAX_FRONT) {
    throw limitError(`supernodal Cholesky would need a ${maxRows}×${maxRows} dense frontal matrix (too large; the ordering leaves a separator of that size); no option raises this heat-method limit: use --method exact or graph, or a coarser mesh`);
  }
  const { valPtr, stackSize } = valueLayout(superStart, rowPtr, tree);
  return { nsuper, superStart, superParent: tree.superParent, childCount: tree.childCount, rowPtr, rows, valPtr, maxRows, stackSize };
}

/**
 * Phase 1: superStart (length nsuper + 1). Fundamental supernodes merged
 * greedily with their parent: scanning in order, the current block [a, b]
 * can only merge with the next fundamental block, and only when that block
 * is its parent (parent[b] = b + 1).
 */
function partitionColumns(n: number, parent: Int32Array, colCount: Int32Array, relax: boolean): Int32Array {
  const nchild = new Int32Array(n);
  for (let j = 0; j < n; j++) if (parent[j] !== -1) nchild[parent[j]!]!++;
  const start: number[] = [];
  let a = 0; // current block's first column
  let j = 0;
  while (j < n) {
    // fundamental block t = [j, e)
    let e = j + 1;
    while (e < n && parent[e - 1] === e && colCount[e - 1] === colCount[e]! + 1 && nchild[e] === 1) e++;
    if (j > 0 && !(relax && parent[j - 1] === j && amalgamate(colCount, a, j, e))) {
      start.push(a);
      a = j;
    }
    j = e;
  }
  if (n > 0) start.push(a);
  const superStart = new Int32Array(start.length + 1);
  superStart.set(start);
  superStart[start.length] = n;
  return superStart;
}

/**
 * The relaxed-amalgamation rule (module comment): merging block [a, j) with
 * its parent block [j, e) stores nc·nr − nc(nc−1)/2 values for nc = e − a
 * columns; merge when the zero fraction z of that block satisfies z·nc ≤ 3.
 */
function amalgamate(colCount: Int32Array, a: number, j: number, e: number): boolean {
  const nc = e - a;
  const nr = j - a + colCount[j]!;
  const entries = nc * nr - (nc * (nc - 1)) / 2;
  let actual = 0;
  for (let c = a; c < e; c++) actual += colCount[c]!;
  return ((entries - actual) / entries) * nc <= 3;
}

/** The supernodal elimination tree with child lists in increasing order. */
interface SuperTree {
  readonly superParent: Int32Array;
  readonly childCount: Int32Array;
  /** First child of each supernode (−1: none); `childNext` links the siblings. */
  readonly childHead: Int32Array;
  readonly childNext: Int32Array;
}

/** Phase 2: parent, child count and child lists of every supernode. */
function supernodalTree(n: number, parent: Int32Array, superStart: Int32Array): SuperTree {
  const nsuper = superStart.length - 1;
  const superOf = new Int32Array(n);
  for (let s = 0; s < nsuper; s++) for (let c = superStart[s]!; c < superStart[s + 1]!; c++) superOf[c] = s;
  const superParent = new Int32Array(nsuper);
  const childCount = new Int32Array(nsuper);
  for (let s = 0; s < nsuper; s++) {
    const p = parent[superStart[s + 1]! - 1]!;
    superParent[s] = p === -1 ? -1 : superOf[p]!;
    if (p !== -1) childCount[superParent[s]!]!++;
  }
  const childHead = new Int32Array(nsuper).fill(-1);
  const childNext = new Int32Array(nsuper);
  for (let s = nsuper - 1; s >= 0; s--) {
    const p = superParent[s]!;
    if (p === -1) continue;
    childNext[s] = childHead[p]!;
    childHead[p] = s;
  }
  return { superParent, childCount, childHead, childNext };
}

/**
 * Phase 3: row patterns, own columns first, then the rows below in C's
 * columns and in the children's patterns, sorted.
 */
function rowPatterns(
  superStart: Int32Array, tree: SuperTree, colCount: Int32Array, lowColPtr: Int32Array, lowRowIdx: Int32Array,
): { rowPtr: Int32Array; rows: Int32Array; maxRows: number } {
  const nsuper = superStart.length - 1, n = superStart[nsuper]!;
  const { childHead, childNext } = tree;
  // capacity (exact counts come out of the union below): the first column's
  // pattern contains every row of the block (relaxed: a superset of each column's)
  const rowPtr = new Int32Array(nsuper + 1);
  let rowsCap = 0;
  for (let s = 0; s < nsuper; s++) {
    const f = superStart[s]!, l = superStart[s + 1]! - 1;
    rowsCap += Math.max(colCount[f]!, l - f + colCount[l]!);
  }
  let rows: Int32Array = new Int32Array(rowsCap);
  const mark = new Int32Array(n).fill(-1);
  let top = 0, maxRows = 0;
  for (let s = 0; s < nsuper; s++) {
    const f = superStart[s]!, l = superStart[s + 1]! - 1;
    rowPtr[s] = top;
    for (let c = f; c <= l; c++) {
      rows[top++] = c;
      mark[c] = s;
    }
    const below = top;
    for (let c = f; c <= l; c++) {
      for (let p = lowColPtr[c]!; p < lowColPtr[c + 1]!; p++) {
        const i = lowRowIdx[p]!;
        if (i > l && mark[i] !== s) {
          mark[i] = s;
          if (top === rows.length) rows = growInt(rows);
          rows[top++] = i;
        }
      }
    }
    for (let ch = childHead[s]!; ch !== -1; ch = childNext[ch]!) {
      for (let p = rowPtr[ch]!; p < rowPtr[ch + 1]!; p++) {
        const i = rows[p]!;
        if (i > l && mark[i] !== s) {
          mark[i] = s;
          if (top === rows.length) rows = growInt(rows);
          rows[top++] = i;
        }
      }
    }
    rows.subarray(below, top).sort();
    rowPtr[s + 1] = top;
    maxRows = Math.max(maxRows, top - rowPtr[s]!);
  }
  return { rowPtr, rows: rows.slice(0, top), maxRows };
}

/**
 * Phase 4: value offsets and the peak of the update-matrix stack (postorder:
 * children on top).
 */
function valueLayout(superStart: Int32Array, rowPtr: Int32Array, tree: SuperTree): { valPtr: Int32Array; stackSize: number } {
  const nsuper = superStart.length - 1;
  const { childHead, childNext } = tree;
  const valPtr = new Int32Array(nsuper + 1);
  let v = 0, stack = 0, peak = 0;
  for (let s = 0; s < nsuper; s++) {
    const nc = superStart[s + 1]! - superStart[s]!;
    const nr = rowPtr[s + 1]! - rowPtr[s]!;
    valPtr[s] = v;
    v += ((nc * (nc + 1)) >> 1) + (nr - nc) * nc;
    if (v > MAX_VALUES) throw limitError(`supernodal Cholesky factor would need more than ${MAX_VALUES} values (32-bit offsets); no option raises this heat-method limit: use --method exact or graph, or a coarser mesh`);
    for (let ch = childHead[s]!; ch !== -1; ch = childNext[ch]!) {
      const m = rowPtr[ch + 1]! - rowPtr[ch]! - (superStart[ch + 1]! - superStart[ch]!);
      stack -= (m * (m + 1)) / 2;
    }
    const m = nr - nc;
    stack += (m * (m + 1)) / 2;
    peak = Math.max(peak, stack);
  }
  valPtr[nsuper] = v;
  return { valPtr, stackSize: peak };
}

/**
 * L as CSC (rows sorted, diagonal first, explicit zeros of the block storage
 * dropped) from supernode blocks: block s at valPtr[s] in Lx, or, for a
 * factor that shares blocks (multifrontal-pair.ts), at own[s] in Lx and at
 * valPtr[s] in base where own[s] < 0. Allocates; for inspection and tests.
 */
export function blocksToCsc(sn: SupernodalStructure, Lx: Float64Array, own: Int32Array | null = null, base: Float64Array | null = null): CscMatrix {
  const { nsuper, superStart, rowPtr, rows, valPtr } = sn;
  const n = superStart[nsuper]!;
  const colPtr = new Int32Array(n + 1);
  const ri: number[] = [];
  const vx: number[] = [];
  for (let s = 0; s < nsuper; s++) {
    const f = superStart[s]!, nc = superStart[s + 1]! - f;
    const r0 = rowPtr[s]!, nr = rowPtr[s + 1]! - r0;
    const shared = own !== null && own[s]! < 0;
    const o = own === null || shared ? valPtr[s]! : own[s]!;
    const Lb = shared ? base! : Lx;
    for (let k = 0; k < nc; k++) {
      for (let r = k; r < nr; r++) {
        const v = Lb[r < nc ? o + ((r * (r + 1)) >> 1) + k : o + ((nc * (nc + 1)) >> 1) + (r - nc) * nc + k]!;
        if (v === 0 && r !== k) continue;
        ri.push(rows[r0 + r]!);
        vx.push(v);
      }
      colPtr[f + k + 1] = ri.length;
    }
  }
  return { n, colPtr, rowIdx: Int32Array.from(ri), values: Float64Array.from(vx) };
}

function growInt(a: Int32Array): Int32Array {
  const b = new Int32Array(Math.max(16, 2 * a.length));
  b.set(a);
  return b;
}
