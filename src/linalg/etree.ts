/**
 * Elimination tree and its postorder.
 *
 * For a symmetric matrix C with Cholesky factor L, parent[j] is the row of the
 * first off-diagonal nonzero in column j of L (−1 for a root). It is found
 * from the pattern of C alone (J. W. H. Liu, "The role of elimination trees
 * in sparse factorization", SIAM J. Matrix Anal. Appl. 11, 1990): columns
 * are added in increasing order and the trees built so far are kept as
 * disjoint sets, each remembering its current root. Column k becomes the
 * parent of the root of every set that holds a row i < k of column k, and
 * those sets merge with k's. Union by size and path halving keep it
 * near-linear (Tarjan, J. ACM 22, 1975).
 */

/**
 * Elimination tree of a symmetric matrix given by its upper triangle in CSC
 * (column k lists rows i ≤ k). Writes parent[] (−1 = root). `work` (n
 * entries) is used as workspace; two more n-length arrays are allocated.
 */
export function eliminationTree(
  n: number,
  upperColPtr: Int32Array,
  upperRowIdx: Int32Array,
  parent = new Int32Array(n),
  work = new Int32Array(n),
): Int32Array {
  const link = work; // disjoint-set forest: link[x] === x at a set's representative
  const negSize = new Int32Array(n); // at a representative: −(set size)
  const treeRoot = new Int32Array(n); // at a representative: the root of that set's tree
  const find = (x: number): number => {
    while (link[x] !== x) {
      link[x] = link[link[x]!]!; // path halving
      x = link[x]!;
    }
    return x;
  };
  for (let k = 0; k < n; k++) {
    parent[k] = -1;
    link[k] = k;
    negSize[k] = -1;
    treeRoot[k] = k;
    let repK = k;
    for (let p = upperColPtr[k]!; p < upperColPtr[k + 1]!; p++) {
      const i = upperRowIdx[p]!;
      if (i >= k) continue;
      const r = find(i);
      if (r === repK) continue; // i's tree already hangs under k
      parent[treeRoot[r]!] = k;
      const big = negSize[r]! < negSize[repK]! ? r : repK;
      const small = big === r ? repK : r;
      link[small] = big;
      negSize[big]! += negSize[small]!;
      treeRoot[big] = k;
      repK = big;
    }
  }
  return parent;
}

/**
 * Postorder of a forest given by parent[]: children before parents, each
 * subtree contiguous; children are visited in increasing index, or by
 * increasing `weight` when given (ties by index), so the heaviest child ends
 * next to its parent. Returns post[k] = the k-th node. Iterative.
 */
export function postorder(parent: Int32Array, n: number, weight?: Int32Array): Int32Array {
  // nodes in decreasing (weight, index) order: prepending each to its
  // parent's child list in that order leaves every list increasing
  const byKey = new Int32Array(n);
  if (weight) {
    let maxW = 0;
    for (let j = 0; j < n; j++) if (weight[j]! > maxW) maxW = weight[j]!;
    const slot = new Int32Array(maxW + 2); // counting sort, heaviest first, stable by decreasing index
    for (let j = 0; j < n; j++) slot[maxW - weight[j]! + 1]!++;
    for (let w = 0; w <= maxW; w++) slot[w + 1]! += slot[w]!;
    for (let j = n - 1; j >= 0; j--) byKey[slot[maxW - weight[j]!]!++] = j;
  } else {
    for (let q = 0; q < n; q++) byKey[q] = n - 1 - q;
  }
  const firstChild = new Int32Array(n).fill(-1);
  const sibling = new Int32Array(n).fill(-1);
  for (let q = 0; q < n; q++) {
    const c = byKey[q]!;
    const p = parent[c]!;
    if (p === -1) continue;
    sibling[c] = firstChild[p]!;
    firstChild[p] = c;
  }
  // depth-first walk; cursor[v] = the next child of v to descend into
  const cursor = firstChild;
  const path = new Int32Array(n);
  const post = new Int32Array(n);
  let out = 0;
  for (let r = 0; r < n; r++) {
    if (parent[r] !== -1) continue;
    let depth = 0;
    path[0] = r;
    while (depth >= 0) {
      const v = path[depth]!;
      const c = cursor[v]!;
      if (c === -1) {
        post[out++] = v;
        depth--;
      } else {
        cursor[v] = sibling[c]!;
        path[++depth] = c;
      }
    }
  }
  return post;
}
