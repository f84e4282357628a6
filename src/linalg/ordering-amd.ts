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
 *
 * One file on purpose (over the usual ~300 lines): the bucket operations and
 * node states are used in the hot loops of every step; moved to a module of
 * their own, the ordering measured 1.8× slower (160k-vertex grid, run
 * through tsx as the benchmarks are).
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
 * The quotient graph and the bookkeeping of one elimination, shared by the
 * phases below. Lists live in `pool`: a node's list is
 * pool[begin .. begin + size); a variable's first nElems entries are elements.
 */
interface AmdState {
  /** Number of nodes. */
  readonly n: number;
  /** VARIABLE, ELEMENT, GONE or DENSE per node. */
  readonly state: Uint8Array;
  /** Supervariable size; element: unused. */
  readonly weight: Int32Array;
  /** Variable: d̄; element: |L_e| (weighted). */
  readonly degree: Int32Array;
  /** Start of each node's list in `pool`. */
  readonly begin: Int32Array;
  /** Length of each node's list. */
  readonly size: Int32Array;
  /** Variable: how many leading entries of its list are elements. */
  readonly nElems: Int32Array;
  /** Degree buckets: doubly linked lists of variables by d̄. */
  readonly bucket: Int32Array;
  /** Next variable in the same bucket, −1 at the end. */
  readonly after: Int32Array;
  /** Previous variable in the same bucket, −1 at the head. */
  readonly before: Int32Array;
  /** Members of a supervariable: a singly linked chain from its principal variable. */
  readonly chainNext: Int32Array;
  /** Last member of the chain of each principal variable. */
  readonly chainLast: Int32Array;
  /** Per element |L_e \ L_p|, valid when outsideStep[e] is the current step; a variable's slot holds its partial degree. */
  readonly outside: Int32Array;
  /** The step that last set `outside` of each element. */
  readonly outsideStep: Int32Array;
  /** Membership stamps. */
  readonly stamp: Int32Array;
  /** Next free stamp. */
  stampNow: number;
  /** hash · n + variable, sorted to group equal hashes. */
  readonly keys: Float64Array;
  /** Every list (replaced by a compacted copy when it runs out of room). */
  pool: Int32Array;
  /** First free entry of `pool`. */
  top: number;
  /** The ordering being written. */
  readonly order: Int32Array;
  /** Entries of `order` written. */
  emitted: number;
  /** Weighted count of variables not yet ordered (dense ones excluded). */
  nLeft: number;
  /** No degree bucket below this one is occupied. */
  least: number;
  // the current pivot step
  /** Stamp of this step (marks L_p). */
  sp: number;
  /** L_p is pool[lpStart .. lpEnd). */
  lpStart: number;
  /** End of L_p in `pool`. */
  lpEnd: number;
  /** |L_p|, weighted. */
  lpWeight: number;
  /** Variables of L_p left after pruning; their keys are keys[0 .. candidates). */
  candidates: number;
}

/**
 * Returns perm with perm[k] = the vertex eliminated k-th. The graph must list
 * every edge in both directions, without self-loops or repeats (as
 * `adjacencyFromLower` builds it); a one-sided edge that breaks the
 * elimination is reported as a USAGE error.
 */
export function approximateMinimumDegree(g: AdjacencyGraph): Int32Array {
  const order = new Int32Array(g.n);
  if (g.n === 0) return order;
  const s = initialState(g, order);
  while (s.nLeft > 0) {
    const p = takePivot(s);
    collectPivotList(s, p); // 1
    externalDegrees(s); // 2
    pruneLists(s, p); // 3
    mergeIndistinguishable(s); // 4
    finalDegrees(s, p); // 5
  }
  for (let v = 0; v < g.n; v++) if (s.state[v] === DENSE) order[s.emitted++] = v;
  return order;
}

/** Sets dense rows aside, copies the other adjacency lists into the pool and fills the degree buckets. */
function initialState(g: AdjacencyGraph, order: Int32Array): AmdState {
  const { n, xadj, adj } = g;
  const chainLast = new Int32Array(n);
  for (let v = 0; v < n; v++) chainLast[v] = v;
  const s: AmdState = {
    n,
    state: new Uint8Array(n),
    weight: new Int32Array(n).fill(1),
    degree: new Int32Array(n),
    begin: new Int32Array(n),
    size: new Int32Array(n),
    nElems: new Int32Array(n),
    bucket: new Int32Array(n).fill(-1),
    after: new Int32Array(n).fill(-1),
    before: new Int32Array(n).fill(-1),
    chainNext: new Int32Array(n).fill(-1),
    chainLast,
    outside: new Int32Array(n),
    outsideStep: new Int32Array(n).fill(-1),
    stamp: new Int32Array(n).fill(-1),
    stampNow: 0,
    keys: new Float64Array(n),
    pool: new Int32Array(Math.max(16, xadj[n]! + (xadj[n]! >> 2) + 2 * n)),
    top: 0,
    order,
    emitted: 0,
    nLeft: 0,
    least: 0,
    sp: 0,
    lpStart: 0,
    lpEnd: 0,
    lpWeight: 0,
    candidates: 0,
  };
  const { state, pool, begin, size, degree } = s;
  const denseAbove = Math.max(64, Math.floor(8 * Math.sqrt(n)));
  let denseCount = 0;
  for (let v = 0; v < n; v++) {
    const d = xadj[v + 1]! - xadj[v]!;
    if (d > denseAbove) {
      state[v] = DENSE;
      denseCount++;
    }
  }
  s.nLeft = n - denseCount;
  let top = 0;
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
  s.top = top;
  for (let v = 0; v < n; v++) if (state[v] === VARIABLE) link(s, v);
  return s;
}

/** Takes variable v out of its degree bucket. */
function unlink(s: AmdState, v: number): void {
  const { after, before } = s;
  const a = after[v]!, b = before[v]!;
  if (b === -1) s.bucket[s.degree[v]!] = a;
  else after[b] = a;
  if (a !== -1) before[a] = b;
}

/** Puts variable v at the head of the bucket of its degree. */
function link(s: AmdState, v: number): void {
  const { bucket, after, before } = s;
  const d = s.degree[v]!;
  const h = bucket[d]!;
  after[v] = h;
  before[v] = -1;
  if (h !== -1) before[h] = v;
  bucket[d] = v;
}

/** Appends supervariable v and the variables merged into it to the order. */
function emitChain(s: AmdState, v: number): void {
  const { order, chainNext } = s;
  for (let u = v; u !== -1; u = chainNext[u]!) order[s.emitted++] = u;
}

/** The pivot: a variable of least d̄, taken out of its bucket and ordered. */
function takePivot(s: AmdState): number {
  const { bucket, n } = s;
  let least = s.least;
  while (least < n && bucket[least] === -1) least++;
  s.least = least;
  if (least === n) throw new Error('approximateMinimumDegree: internal error, no variable left to eliminate');
  const p = bucket[least]!;
  unlink(s, p);
  s.nLeft -= s.weight[p]!;
  emitChain(s, p);
  return p;
}

/**
 * Step 1: builds L_p at the end of the pool (compacting the pool first when
 * it lacks room); its variables are stamped and taken out of the buckets, the
 * elements of E_p are absorbed, and p becomes an element.
 */
function collectPivotList(s: AmdState, p: number): void {
  const { state, size, nElems, begin, weight, stamp, n } = s;
  let need = size[p]! - nElems[p]!;
  for (let q = begin[p]!; q < begin[p]! + nElems[p]!; q++) if (state[s.pool[q]!] === ELEMENT) need += size[s.pool[q]!]!;
  if (s.top + need > s.pool.length) {
    s.pool = compactPool(s.pool, begin, size, state, need);
    let top = 0;
    for (let v = 0; v < n; v++) if (state[v] === VARIABLE || state[v] === ELEMENT) top += size[v]!;
    s.top = top;
  }
  const pool = s.pool;
  const sp = s.stampNow++; // stamp of this pivot step
  s.sp = sp;
  stamp[p] = sp; // keeps p out of L_p
  let top = s.top;
  const lpStart = top;
  let lpWeight = 0;
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
        unlink(s, u);
      }
      state[x] = GONE; // absorbed into p
    } else if (state[x] === VARIABLE && stamp[x] !== sp) {
      stamp[x] = sp;
      pool[top++] = x;
      lpWeight += weight[x]!;
      unlink(s, x);
    }
  }
  s.top = top;
  s.lpStart = lpStart;
  s.lpEnd = top;
  s.lpWeight = lpWeight;
  state[p] = ELEMENT;
  begin[p] = lpStart;
  nElems[p] = 0;
}

/** Step 2: |L_e \ L_p| for every other element e adjacent to a variable of L_p. */
function externalDegrees(s: AmdState): void {
  const { pool, begin, nElems, state, outside, outsideStep, degree, weight, sp } = s;
  for (let k = s.lpStart; k < s.lpEnd; k++) {
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
}

/**
 * Step 3: prunes each variable's lists, absorbs covered elements, mass-
 * eliminates variables adjacent to p only, and records the others' partial
 * degrees (in `outside`) and hash keys for step 4.
 */
function pruneLists(s: AmdState, p: number): void {
  const { pool, begin, nElems, size, state, outside, weight, stamp, keys, n, sp } = s;
  let candidates = 0;
  for (let k = s.lpStart; k < s.lpEnd; k++) {
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
      s.lpWeight -= weight[v]!;
      s.nLeft -= weight[v]!;
      emitChain(s, v);
      continue;
    }
    outside[v] = partial; // v is a variable: this slot is free for it this step
    keys[candidates++] = (hash % n) * n + v;
  }
  s.candidates = candidates;
}

/** Step 4: variables of L_p with equal hashes and equal lists are merged into supervariables. */
function mergeIndistinguishable(s: AmdState): void {
  const { keys, candidates, state, size, nElems, begin, pool, stamp, weight, chainNext, chainLast, n } = s;
  if (candidates > 1) keys.subarray(0, candidates).sort();
  for (let a = 0; a < candidates - 1; a++) {
    const va = keys[a]! % n;
    if (state[va] !== VARIABLE) continue;
    const ha = Math.floor(keys[a]! / n);
    let mark = -1;
    for (let c = a + 1; c < candidates && Math.floor(keys[c]! / n) === ha; c++) {
      const vc = keys[c]! % n;
      if (state[vc] !== VARIABLE || size[vc] !== size[va] || nElems[vc] !== nElems[va]) continue;
      if (mark === -1) {
        mark = s.stampNow++;
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
}

/** Step 5: final degree bounds and buckets; L_p keeps its surviving principal variables. */
function finalDegrees(s: AmdState, p: number): void {
  const { pool, state, weight, degree, outside, size, lpStart, lpEnd, lpWeight, nLeft } = s;
  let w = lpStart;
  for (let k = lpStart; k < lpEnd; k++) {
    const v = pool[k]!;
    if (state[v] !== VARIABLE) continue;
    const rest = lpWeight - weight[v]!;
    degree[v] = Math.min(nLeft - weight[v]!, degree[v]! + rest, outside[v]! + rest);
    link(s, v);
    if (degree[v]! < s.least) s.least = degree[v]!;
    pool[w++] = v;
  }
  size[p] = w - lpStart;
  degree[p] = lpWeight;
  s.top = w;
  if (size[p] === 0) state[p] = GONE;
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
