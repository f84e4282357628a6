/**
 * Numeric Cholesky factorization P·A·Pᵀ = L·Lᵀ one row of L at a time
 * (row-oriented Cholesky; J. W. H. Liu, "A compact row storage scheme for
 * Cholesky factors using elimination trees", ACM TOMS 12, 1986). With the rows
 * above k done, row k solves a sparse triangular system:
 *
 * ```
 *   [ L₁₁  0  ] [ L₁₁ᵀ l₁₂ ]   [ C₁₁ c₁₂ ]      L₁₁ l₁₂ = c₁₂        (sparse solve)
 *   [ l₁₂ᵀ λ  ] [  0   λ   ] = [ c₁₂ᵀ γ  ]      λ = sqrt(γ − l₁₂ᵀl₁₂)
 * ```
 *
 * The nonzeros of l₁₂ are the row subtree of k: every node on the
 * elimination-tree path from a row i of c₁₂ up to k (Liu 1986). Since a
 * parent's index exceeds its child's, taking those nodes in increasing order
 * makes each L(k, j) final before it is used. Each column of L is filled top
 * down, so its rows come out sorted with the diagonal first. Never allocates:
 * all workspaces are passed in.
 */
import type { CholeskySymbolic } from './symbolic.js';

/**
 * Row-by-row factorization kernel. Returns −1 on success, or the pivot column
 * k where γ − l₁₂ᵀl₁₂ was not a finite number above its floor (0, or
 * minPivot[k]) (then `Lx[lColPtr[k]]` holds that value and the factor is
 * incomplete). `fill[j]` must start at lColPtr[j]; `rowPattern` and `seen`
 * are n-length scratch. Never throws.
 */
export function upLookingFactor(
  sym: CholeskySymbolic,
  Cx: Float64Array,
  Li: Int32Array,
  Lx: Float64Array,
  dense: Float64Array,
  fill: Int32Array,
  rowPattern: Int32Array,
  seen: Int32Array,
  minPivot: Float64Array | null = null,
): number {
  const { n, parent, cColPtr, cRowIdx, lColPtr } = sym;
  seen.fill(-1);
  for (let k = 0; k < n; k++) {
    // scatter column k of C's upper triangle (rows ≤ k) and collect the row subtree of k
    seen[k] = k;
    dense[k] = 0;
    let count = 0;
    for (let p = cColPtr[k]!; p < cColPtr[k + 1]!; p++) {
      const row = cRowIdx[p]!;
      dense[row] = Cx[p]!;
      for (let j = row; seen[j] !== k; j = parent[j]!) {
        seen[j] = k;
        rowPattern[count++] = j;
      }
    }
    sortRange(rowPattern, count);
    let pivot = dense[k]!;
    dense[k] = 0;
    for (let q = 0; q < count; q++) {
      const j = rowPattern[q]!;
      const diag = lColPtr[j]!;
      const lkj = dense[j]! / Lx[diag]!; // L(k, j)
      dense[j] = 0;
      const end = fill[j]!; // column j holds rows < k in Li[diag .. end)
      for (let p = diag + 1; p < end; p++) dense[Li[p]!]! -= Lx[p]! * lkj;
      pivot -= lkj * lkj;
      Li[end] = k;
      Lx[end] = lkj;
      fill[j] = end + 1;
    }
    const at = lColPtr[k]!;
    Li[at] = k;
    if (!(pivot > (minPivot === null ? 0 : minPivot[k]!) && pivot < Infinity)) {
      Lx[at] = pivot;
      return k;
    }
    Lx[at] = Math.sqrt(pivot);
    fill[k] = at + 1;
  }
  return -1;
}

/** Sorts a[0 .. count) ascending in place: insertion sort for short runs, else heapsort. */
function sortRange(a: Int32Array, count: number): void {
  if (count <= 24) {
    for (let i = 1; i < count; i++) {
      const v = a[i]!;
      let j = i - 1;
      for (; j >= 0 && a[j]! > v; j--) a[j + 1] = a[j]!;
      a[j + 1] = v;
    }
    return;
  }
  for (let r = (count >> 1) - 1; r >= 0; r--) siftDown(a, r, count);
  for (let end = count - 1; end > 0; end--) {
    const t = a[0]!;
    a[0] = a[end]!;
    a[end] = t;
    siftDown(a, 0, end);
  }
}

/** Moves a[root] down the max-heap a[0 .. size). */
function siftDown(a: Int32Array, root: number, size: number): void {
  const v = a[root]!;
  let i = root;
  for (;;) {
    let c = 2 * i + 1;
    if (c >= size) break;
    if (c + 1 < size && a[c + 1]! > a[c]!) c++;
    if (a[c]! <= v) break;
    a[i] = a[c]!;
    i = c;
  }
  a[i] = v;
}
