/**
 * Elimination tree and its postorder.
 *
 * For a symmetric matrix C with Cholesky factor L, parent[j] is the row of the
 * first off-diagonal nonzero in column j of L (−1 for a root). It is found
 * from the pattern of C alone (Liu 1986; Davis 2006, §4.1): for each k, each
 * entry C(i, k) with i < k starts at i and climbs the partial tree to its root
 * r, and k becomes parent of r. Path compression through `ancestor` keeps the
 * climb near-linear.
 */

/**
 * Elimination tree of a symmetric matrix given by its upper triangle in CSC
 * (column k lists rows i ≤ k). Writes parent[] (−1 = root); allocates one
 * n-length workspace unless `work` is passed.
 */
export function eliminationTree(
  n: number,
  upperColPtr: Int32Array,
  upperRowIdx: Int32Array,
  parent = new Int32Array(n),
  work = new Int32Array(n),
): Int32Array {
  const ancestor = work;
  for (let k = 0; k < n; k++) {
    parent[k] = -1;
    ancestor[k] = -1;
    for (let p = upperColPtr[k]!; p < upperColPtr[k + 1]!; p++) {
      let i = upperRowIdx[p]!;
      // climb from i towards the root, pointing every visited node at k
      while (i !== -1 && i < k) {
        const inext = ancestor[i]!;
        ancestor[i] = k;
        if (inext === -1) parent[i] = k;
        i = inext;
      }
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
  const head = new Int32Array(n).fill(-1);
  const next = new Int32Array(n);
  const stack = new Int32Array(n);
  const post = new Int32Array(n);
  // child lists, built by pushing at the head: nodes are pushed in decreasing
  // index (or decreasing weight) so each list runs in increasing order
  const order = new Int32Array(n);
  for (let j = 0; j < n; j++) order[j] = n - 1 - j;
  if (weight) {
    // stable counting sort by decreasing weight
    let maxW = 0;
    for (let j = 0; j < n; j++) maxW = Math.max(maxW, weight[j]!);
    const cnt = new Int32Array(maxW + 2);
    for (let j = 0; j < n; j++) cnt[maxW - weight[j]! + 1]!++;
    for (let w = 0; w <= maxW; w++) cnt[w + 1]! += cnt[w]!;
    for (let j = n - 1; j >= 0; j--) order[cnt[maxW - weight[j]!]!++] = j;
  }
  for (let q = 0; q < n; q++) {
    const j = order[q]!;
    const p = parent[j]!;
    if (p === -1) continue;
    next[j] = head[p]!;
    head[p] = j;
  }
  let k = 0;
  for (let j = 0; j < n; j++) {
    if (parent[j] !== -1) continue;
    let top = 0;
    stack[0] = j;
    while (top >= 0) {
      const p = stack[top]!;
      const c = head[p]!;
      if (c === -1) {
        top--;
        post[k++] = p;
      } else {
        head[p] = next[c]!; // unlink the child so it is pushed once
        stack[++top] = c;
      }
    }
  }
  return post;
}
