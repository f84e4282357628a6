/**
 * Column counts of the Cholesky factor without forming it (Gilbert, Ng, Peyton,
 * SIAM J. Matrix Anal. Appl. 15, 1994; Davis 2006, §4.5).
 *
 * Row i of L is the "row subtree": the union of the etree paths from each j
 * with C(i, j) ≠ 0, j < i, up to i. So colcount[j] = number of row subtrees
 * containing j. Summing per-node differences `delta` up the tree gives it:
 * every leaf j of a row subtree of i adds +1 at j; where two consecutive
 * leaves' paths meet (their least common ancestor q) −1 removes the double
 * count; each node's own parent link contributes −1 for the child (the
 * column of j merges into parent[j]). Leaves are detected with `first[j]`
 * (first postorder index in the subtree of j) and `maxfirst[i]`; the LCA uses
 * a disjoint-set forest over the postorder (`ancestor`, with path compression).
 */

/**
 * colcount[j] = nnz of column j of L (diagonal included) for the symmetric
 * matrix whose LOWER triangle is given in CSC (column j lists rows i ≥ j),
 * with its elimination tree and postorder.
 */
export function columnCounts(
  n: number,
  lowerColPtr: Int32Array,
  lowerRowIdx: Int32Array,
  parent: Int32Array,
  post: Int32Array,
): Int32Array {
  const delta = new Int32Array(n);
  const ancestor = new Int32Array(n);
  const maxfirst = new Int32Array(n).fill(-1);
  const prevleaf = new Int32Array(n).fill(-1);
  const first = new Int32Array(n).fill(-1);
  for (let k = 0; k < n; k++) {
    let j = post[k]!;
    delta[j] = first[j] === -1 ? 1 : 0; // leaves of the etree start at 1
    for (; j !== -1 && first[j] === -1; j = parent[j]!) first[j] = k;
  }
  for (let i = 0; i < n; i++) ancestor[i] = i;
  for (let k = 0; k < n; k++) {
    const j = post[k]!;
    if (parent[j] !== -1) delta[parent[j]!]!--;
    // entries C(i, j), i > j: is j a leaf of the row subtree of i?
    for (let p = lowerColPtr[j]!; p < lowerColPtr[j + 1]!; p++) {
      const i = lowerRowIdx[p]!;
      if (i <= j || first[j]! <= maxfirst[i]!) continue; // not a leaf
      maxfirst[i] = first[j]!;
      const jprev = prevleaf[i]!;
      prevleaf[i] = j;
      delta[j]!++;
      if (jprev === -1) continue; // first leaf of row i
      // q = LCA(jprev, j) = root of jprev's set; compress the path
      let q = jprev;
      while (q !== ancestor[q]) q = ancestor[q]!;
      let s = jprev;
      while (s !== q) {
        const sp = ancestor[s]!;
        ancestor[s] = q;
        s = sp;
      }
      delta[q]!--;
    }
    if (parent[j] !== -1) ancestor[j] = parent[j]!;
  }
  // sum deltas up the tree (children precede parents in index order: parent[j] > j)
  for (let j = 0; j < n; j++) if (parent[j] !== -1) delta[parent[j]!]! += delta[j]!;
  return delta;
}
