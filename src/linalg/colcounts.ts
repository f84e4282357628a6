/**
 * Column counts of the Cholesky factor without forming it (J. R. Gilbert,
 * E. G. Ng, B. W. Peyton, "An efficient algorithm to compute row and column
 * counts for sparse Cholesky factorization", SIAM J. Matrix Anal. Appl. 15,
 * 1994).
 *
 * Row u of L is the row subtree T_u: the union of the elimination-tree paths
 * from every p < u with C(u, p) ≠ 0 up to u, so colcount(p) = number of row
 * subtrees that contain p. The paper assigns each node a weight such that
 * colcount(p) = Σ of the weights in p's subtree: +1 for an etree leaf, −1
 * for each child (the child's rows continue in p), +1 wherever p is a leaf of
 * some T_u, and −1 at the least common ancestor of two consecutive leaves of
 * one T_u (counted twice otherwise). Nodes are visited in postorder; p is a
 * leaf of T_u exactly when its first descendant comes after the previous
 * neighbour of u that was visited. The least common ancestors come from a
 * disjoint-set forest that merges each visited node with its parent (union by
 * size, path halving, each set remembering its topmost node).
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
  const weight = new Int32Array(n);
  // firstDesc[p] = smallest postorder number in p's subtree; a child sets its
  // parent's before the parent is reached, and the first child's is smallest
  const firstDesc = new Int32Array(n).fill(-1);
  for (let k = 0; k < n; k++) {
    const p = post[k]!;
    const isLeaf = firstDesc[p] === -1;
    if (isLeaf) firstDesc[p] = k;
    weight[p] = isLeaf ? 1 : 0;
    const q = parent[p]!;
    if (q !== -1 && firstDesc[q] === -1) firstDesc[q] = firstDesc[p]!;
  }
  const prevNbr = new Int32Array(n).fill(-1); // postorder number of u's last visited neighbour
  const prevLeaf = new Int32Array(n).fill(-1); // u's last leaf found
  const link = new Int32Array(n);
  const negSize = new Int32Array(n).fill(-1);
  const topmost = new Int32Array(n);
  for (let x = 0; x < n; x++) {
    link[x] = x;
    topmost[x] = x;
  }
  const find = (x: number): number => {
    while (link[x] !== x) {
      link[x] = link[link[x]!]!;
      x = link[x]!;
    }
    return x;
  };
  for (let k = 0; k < n; k++) {
    const p = post[k]!;
    const q = parent[p]!;
    if (q !== -1) weight[q]!--;
    for (let e = lowerColPtr[p]!; e < lowerColPtr[p + 1]!; e++) {
      const u = lowerRowIdx[e]!;
      if (u <= p) continue;
      if (firstDesc[p]! > prevNbr[u]!) {
        weight[p]!++; // p is a leaf of T_u
        const last = prevLeaf[u]!;
        if (last !== -1) weight[topmost[find(last)]!]!--; // their least common ancestor
        prevLeaf[u] = p;
      }
      prevNbr[u] = k;
    }
    if (q !== -1) {
      // merge p's set into its parent's; the merged set's topmost node is q
      const a = find(p), b = find(q);
      const big = negSize[a]! < negSize[b]! ? a : b;
      const small = big === a ? b : a;
      link[small] = big;
      negSize[big]! += negSize[small]!;
      topmost[big] = q;
    }
  }
  // subtree sums, children before parents (postorder)
  for (let k = 0; k < n; k++) {
    const p = post[k]!;
    if (parent[p] !== -1) weight[parent[p]!]! += weight[p]!;
  }
  return weight;
}
