/**
 * Approximate minimum degree ordering, written from the paper:
 * P. R. Amestoy, T. A. Davis, I. S. Duff, "An approximate minimum degree
 * ordering algorithm", SIAM J. Matrix Anal. Appl. 17(4):886–905, 1996.
 *
 * Elimination is simulated on the quotient graph, as in the paper. Every node
 * is a *variable* (not yet eliminated) or an *element* (an eliminated pivot,
 * standing for the clique its elimination created). A variable v keeps a list
 * of its adjacent elements E_v followed by its adjacent variables A_v; an
 * element e keeps its variables L_e. Eliminating pivot p:
 *
 * 1. L_p = (A_p ∪ ⋃_{e ∈ E_p} L_e) \ {p}; the elements of E_p are absorbed into p.
 * 2. For every element e touching L_p, |L_e \ L_p| is found in one pass over
 *    the variables of L_p (the paper's approximate external degrees).
 * 3. Each v ∈ L_p drops absorbed elements and the variables of L_p from its
 *    lists and gains p. Elements with L_e ⊆ L_p are absorbed too (aggressive
 *    absorption). A variable left adjacent to p only is eliminated with p
 *    (mass elimination). Its new degree is the paper's upper bound
 *       d̄_v = min( n_left − |v|,  d̄_v_old + |L_p \ v|,
 *                  |A_v \ v| + |L_p \ v| + Σ_{e ∈ E_v \ p} |L_e \ L_p| ),
 *    where |·| counts variables with their supervariable weights.
 * 4. Variables of L_p with identical lists are merged into one supervariable
 *    (indistinguishable variables): candidates are grouped by a hash of their lists, then compared.
 *
 * The pivot is always a variable of least d̄. Here the lists live in one
 * growable Int32Array (`pool`); a new element is appended at its end, and the
 * pool is copied compactly into a fresh array when it runs out of room.
 * Variables adjacent to more than max(64, 8·√n) others are set aside and
 * ordered last (dense rows; common practice, not part of the 1996 paper).
 * The returned order lists each pivot followed by the variables merged into
 * it and those mass-eliminated with it; analyzeCholesky postorders the
 * elimination tree afterwards, so no assembly-tree postorder is done here.
 */
import type { AdjacencyGraph } from './graph.js';
import { usageError } from '../errors.js';

/** Node states. */
const VARIABLE = 0;
const ELEMENT = 1;
/** Absorbed element, merged or eliminated variable: ignored wherever it is still listed. */
const GONE = 2;
const DENSE = 3;

/**
 * Returns perm with perm[k] = the vertex eliminated k-th. The graph must list
 * every edge in both directions, without self-loops or repeats (as
 * `adjacencyFromLower` builds it); a one-sided edge that breaks the
 * elimination is reported as a USAGE error.
 */
export function approximateMinimumDegree(g: AdjacencyGraph): Int32Array {
  const { n, xadj, adj } = g;
  const order = new Int32Array(n);
  if (n === 0) return order;
  const state = new Uint8Array(n);
  const weight = new Int32Array(n).fill(1); // supervariable size; element: unused
  const degree = new Int32Array(n); // variable: d̄; element: |L_e| (weighted)
  const begin = new Int32Array(n); // a node's list is pool[begin .. begin + size)
  const size = new Int32Array(n);
  const nElems = new Int32Array(n); // variable: the first nElems entries are elements
  // degree buckets: doubly linked lists of variables
  const bucket = new Int32Array(n).fill(-1);
  const after = new Int32Array(n).fill(-1);
  const before = new Int32Array(n).fill(-1);
  // members of a supervariable: a singly linked chain from its principal variable
  const chainNext = new Int32Array(n).fill(-1);
  const chainLast = new Int32Array(n);
  for (let v = 0; v < n; v++) chainLast[v] = v;
  // scratch: per-element |L_e \ L_p| with the step that set it; membership stamps
  const outside = new Int32Array(n);
  const outsideStep = new Int32Array(n).fill(-1);
  const stamp = new Int32Array(n).fill(-1);
  let stampNow = 0;
  const keys = new Float64Array(n); // hash · n + variable, sorted to group equal hashes

  let pool: Int32Array = new Int32Array(Math.max(16, xadj[n]! + (xadj[n]! >> 2) + 2 * n));
  let top = 0;
  const denseAbove = Math.max(64, Math.floor(8 * Math.sqrt(n)));
  let emitted = 0;
  let denseCount = 0;
  for (let v = 0; v < n; v++) {
    const d = xadj[v + 1]! - xadj[v]!;
    if (d > denseAbove) {
      state[v] = DENSE;
      denseCount++;
    }
  }
  let nLeft = n - denseCount; // weighted count of variables not yet ordered (dense ones excluded)
  for (let v = 0; v < n; v++) {
    if (state[v] === DENSE) continue;
    begin[v] = top;
    for (let q = xadj[v]!; q < xadj[v + 1]!; q++) {
      const u = adj[q]!;
      if (u !== v && state[u] !== DENSE) pool[top++] = u;
    }
    size[v] = top - begin[v]!;
    degree[v] = size[v]!;
  }

  const unlink = (v: number): void => {
    const a = after[v]!, b = before[v]!;
    if (b === -1) bucket[degree[v]!] = a;
    else after[b] = a;
    if (a !== -1) before[a] = b;
  };
  const link = (v: number): void => {
    const d = degree[v]!;
    const h = bucket[d]!;
    after[v] = h;
    before[v] = -1;
    if (h !== -1) before[h] = v;
    bucket[d] = v;
  };
  const emitChain = (v: number): void => {
    for (let u = v; u !== -1; u = chainNext[u]!) order[emitted++] = u;
  };
  for (let v = 0; v < n; v++) if (state[v] === VARIABLE) link(v);
  let least = 0;

  while (nLeft > 0) {
    while (least < n && bucket[least] === -1) least++;
    if (least === n) throw new Error('approximateMinimumDegree: internal error, no variable left to eliminate');
    const p = bucket[least]!;
    unlink(p);
    const pw = weight[p]!;
    nLeft -= pw;
    emitChain(p);

    // 1. build L_p at the end of the pool; its variables are stamped and taken out of the buckets
    let need = size[p]! - nElems[p]!;
    for (let q = begin[p]!; q < begin[p]! + nElems[p]!; q++) if (state[pool[q]!] === ELEMENT) need += size[pool[q]!]!;
    if (top + need > pool.length) {
      pool = compactPool(pool, begin, size, state, need);
      top = 0;
      for (let v = 0; v < n; v++) if (state[v] === VARIABLE || state[v] === ELEMENT) top += size[v]!;
    }
    const sp = stampNow++; // stamp of this pivot step
    stamp[p] = sp; // keeps p out of L_p
    const lpStart = top;
    let lpWeight = 0; // |L_p|, weighted
    // (a variable joins L_p once: live, not p, not yet stamped; it leaves its degree bucket)
    for (let q = begin[p]!; q < begin[p]! + size[p]!; q++) {
      const x = pool[q]!;
      if (q < begin[p]! + nElems[p]!) {
        if (state[x] !== ELEMENT) continue;
        for (let r = begin[x]!; r < begin[x]! + size[x]!; r++) {
          const u = pool[r]!;
          if (state[u] !== VARIABLE || stamp[u] === sp) continue;
          stamp[u] = sp;
          pool[top++] = u;
          lpWeight += weight[u]!;
          unlink(u);
        }
        state[x] = GONE; // absorbed into p
      } else if (state[x] === VARIABLE && stamp[x] !== sp) {
        stamp[x] = sp;
        pool[top++] = x;
        lpWeight += weight[x]!;
        unlink(x);
      }
    }
    const lpEnd = top;
    state[p] = ELEMENT;
    begin[p] = lpStart;
    nElems[p] = 0;

    // 2. |L_e \ L_p| for every other element e adjacent to a variable of L_p
    for (let k = lpStart; k < lpEnd; k++) {
      const v = pool[k]!;
      for (let q = begin[v]!; q < begin[v]! + nElems[v]!; q++) {
        const e = pool[q]!;
        if (state[e] !== ELEMENT) continue;
        if (outsideStep[e] !== sp) {
          outsideStep[e] = sp;
          outside[e] = degree[e]!;
        }
        outside[e] -= weight[v]!;
      }
    }

    // 3. prune each variable's lists, absorb covered elements, bound its degree
    let candidates = 0;
    for (let k = lpStart; k < lpEnd; k++) {
      const v = pool[k]!;
      const b = begin[v]!, ne = nElems[v]!, end = b + size[v]!;
      let partial = 0, hash = p;
      let we = b; // elements are kept in pool[b .. we)
      for (let q = b; q < b + ne; q++) {
        const e = pool[q]!;
        if (state[e] !== ELEMENT) continue;
        if (outside[e] === 0) {
          state[e] = GONE; // aggressive absorption: L_e ⊆ L_p
          continue;
        }
        partial += outside[e]!;
        hash += e;
        pool[we++] = e;
      }
      let wv = we; // then variables in pool[we .. wv)
      for (let q = b + ne; q < end; q++) {
        const u = pool[q]!;
        if (state[u] !== VARIABLE || stamp[u] === sp) continue; // gone, or now reached through p
        partial += weight[u]!;
        hash += u;
        pool[wv++] = u;
      }
      // v lost p from A_v or an element absorbed into p, so one slot is free for p
      if (wv === end) throw usageError(`approximateMinimumDegree: the adjacency graph lists edge ${p}–${v} in one direction only`);
      pool[wv] = pool[we]!;
      pool[we] = p;
      nElems[v] = we - b + 1;
      size[v] = wv + 1 - b;
      if (partial === 0) {
        // mass elimination: every neighbour of v is in L_p
        state[v] = GONE;
        lpWeight -= weight[v]!;
        nLeft -= weight[v]!;
        emitChain(v);
        continue;
      }
      outside[v] = partial; // v is a variable: this slot is free for it this step
      keys[candidates++] = (hash % n) * n + v;
    }

    // 4. supervariables: variables with equal hashes and equal lists are merged
    const group = keys;
    if (candidates > 1) keys.subarray(0, candidates).sort();
    for (let a = 0; a < candidates - 1; a++) {
      const va = group[a]! % n;
      if (state[va] !== VARIABLE) continue;
      const ha = Math.floor(group[a]! / n);
      let mark = -1;
      for (let c = a + 1; c < candidates && Math.floor(group[c]! / n) === ha; c++) {
        const vc = group[c]! % n;
        if (state[vc] !== VARIABLE || size[vc] !== size[va] || nElems[vc] !== nElems[va]) continue;
        if (mark === -1) {
          mark = stampNow++;
          for (let q = begin[va]!; q < begin[va]! + size[va]!; q++) stamp[pool[q]!] = mark;
        }
        let same = true;
        for (let q = begin[vc]!; same && q < begin[vc]! + size[vc]!; q++) same = stamp[pool[q]!] === mark;
        if (!same) continue;
        weight[va]! += weight[vc]!;
        state[vc] = GONE;
        chainNext[chainLast[va]!] = vc;
        chainLast[va] = chainLast[vc]!;
      }
    }

    // 5. final degrees; L_p keeps its surviving principal variables
    let w = lpStart;
    for (let k = lpStart; k < lpEnd; k++) {
      const v = pool[k]!;
      if (state[v] !== VARIABLE) continue;
      const rest = lpWeight - weight[v]!;
      degree[v] = Math.min(nLeft - weight[v]!, degree[v]! + rest, outside[v]! + rest);
      link(v);
      if (degree[v]! < least) least = degree[v]!;
      pool[w++] = v;
    }
    size[p] = w - lpStart;
    degree[p] = lpWeight;
    top = w;
    if (size[p] === 0) state[p] = GONE;
  }
  for (let v = 0; v < n; v++) if (state[v] === DENSE) order[emitted++] = v;
  return order;
}

/**
 * Copies the lists of live variables and elements, in node order, into a
 * fresh pool with room for at least `need` more entries, updating `begin`.
 */
function compactPool(pool: Int32Array, begin: Int32Array, size: Int32Array, state: Uint8Array, need: number): Int32Array {
  const n = begin.length;
  let live = 0;
  for (let v = 0; v < n; v++) if (state[v] === VARIABLE || state[v] === ELEMENT) live += size[v]!;
  const fresh = new Int32Array(Math.max(pool.length, live + (live >> 1) + need + 1024));
  let t = 0;
  for (let v = 0; v < n; v++) {
    if (state[v] !== VARIABLE && state[v] !== ELEMENT) continue;
    fresh.set(pool.subarray(begin[v]!, begin[v]! + size[v]!), t);
    begin[v] = t;
    t += size[v]!;
  }
  return fresh;
}
