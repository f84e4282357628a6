/**
 * Approximate minimum degree ordering (Amestoy, Davis, Duff, SIAM J. Matrix
 * Anal. Appl. 17, 1996; structure as in Davis 2006, §7.1).
 *
 * Elimination is simulated on a quotient graph: eliminating pivot k turns it
 * into an *element* whose variable list Lk is the union of k's variables and
 * the lists of the elements adjacent to k (those elements are absorbed). Each
 * variable i keeps, in one slice of the shared array Ci,
 *
 * ```
 *   Ci[Cp[i] .. Cp[i]+elen[i]-1]     elements adjacent to i   (Ei)
 *   Ci[Cp[i]+elen[i] .. Cp[i]+len[i]-1]  variables adjacent to i (Ai)
 * ```
 *
 * The exact degree |∪ Le ∪ Ai| is replaced by the bound
 *   d(i) ≈ |Ai \ i| + |Lk \ i| + Σ_{e ∈ Ei, e ≠ k} |Le \ Lk|,
 * with |Le \ Lk| for every element found in one scan (`w[e] − mark`).
 * Elements with Le ⊆ Lk are absorbed (aggressive absorption); variables with
 * identical adjacency are merged into supervariables (found by hashing);
 * variables of degree above max(16, 10·√n) are treated as dense and ordered
 * last. The ordering is the postorder of the resulting assembly tree.
 * Sign-flipped indices (−2 − j) mark absorbed objects and their parents.
 */
import type { AdjacencyGraph } from './graph.js';

const flip = (i: number): number => -i - 2;

/** Returns perm with perm[k] = the vertex eliminated k-th. */
export function approximateMinimumDegree(g: AdjacencyGraph): Int32Array {
  const n = g.n;
  if (n === 0) return new Int32Array(0);
  let dense = Math.max(16, Math.floor(10 * Math.sqrt(n)));
  dense = Math.min(n - 2, dense);
  let cnz = g.xadj[n]!;
  const nzmax = cnz + Math.floor(cnz / 5) + 2 * n;
  const Ci = new Int32Array(nzmax);
  Ci.set(g.adj.subarray(0, cnz));
  const Cp = new Int32Array(n + 1);
  Cp.set(g.xadj);
  const len = new Int32Array(n + 1);
  const nv = new Int32Array(n + 1);
  const next = new Int32Array(n + 1);
  const head = new Int32Array(n + 1);
  const elen = new Int32Array(n + 1);
  const degree = new Int32Array(n + 1);
  const w = new Int32Array(n + 1);
  const hhead = new Int32Array(n + 1);
  const last = new Int32Array(n + 1);
  for (let k = 0; k < n; k++) len[k] = Cp[k + 1]! - Cp[k]!;
  len[n] = 0;
  for (let i = 0; i <= n; i++) {
    head[i] = -1;
    last[i] = -1;
    next[i] = -1;
    hhead[i] = -1;
    nv[i] = 1;
    w[i] = 1;
    elen[i] = 0;
    degree[i] = len[i]!;
  }
  // invariant after wclear: w[e] < mark for every e; w[e] = 0 marks a dead element
  const wclear = (mark: number, lemax: number): number => {
    if (mark < 2 || mark + lemax >= 0x3fffffff) {
      for (let k = 0; k < n; k++) if (w[k] !== 0) w[k] = 1;
      mark = 2;
    }
    return mark;
  };
  let mark = wclear(0, 0);
  let nel = 0, mindeg = 0, lemax = 0;
  elen[n] = -2; // n is the dead element collecting dense rows
  Cp[n] = -1;
  w[n] = 0;
  for (let i = 0; i < n; i++) {
    const d = degree[i]!;
    if (d === 0) {
      elen[i] = -2;
      nel++;
      Cp[i] = -1;
      w[i] = 0;
    } else if (d > dense) {
      nv[i] = 0; // absorbed into element n, ordered last
      elen[i] = -1;
      nel++;
      Cp[i] = flip(n);
      nv[n]!++;
    } else {
      if (head[d] !== -1) last[head[d]!] = i;
      next[i] = head[d]!;
      head[d] = i;
    }
  }

  while (nel < n) {
    // --- select a variable of minimum approximate degree
    let k = -1;
    for (; mindeg < n && (k = head[mindeg]!) === -1; mindeg++);
    if (next[k] !== -1) last[next[k]!] = -1;
    head[mindeg] = next[k]!;
    const elenk = elen[k]!;
    let nvk = nv[k]!;
    nel += nvk;

    // --- garbage collection when Lk may not fit in the free tail of Ci
    if (elenk > 0 && cnz + mindeg >= nzmax) {
      for (let j = 0; j < n; j++) {
        const p = Cp[j]!;
        if (p >= 0) {
          Cp[j] = Ci[p]!; // save first entry, mark object start with flip(j)
          Ci[p] = flip(j);
        }
      }
      let q = 0;
      for (let p = 0; p < cnz; ) {
        const j = flip(Ci[p++]!);
        if (j >= 0) {
          Ci[q] = Cp[j]!;
          Cp[j] = q++;
          for (let k3 = 0; k3 < len[j]! - 1; k3++) Ci[q++] = Ci[p++]!;
        }
      }
      cnz = q;
    }

    // --- construct the new element Lk = (Ak ∪ ⋃_{e∈Ek} Le) \ k
    let dk = 0;
    nv[k] = -nvk; // negative nv: "in Lk"
    let p = Cp[k]!;
    const pk1 = elenk === 0 ? p : cnz; // in place when k has no elements
    let pk2 = pk1;
    for (let k1 = 1; k1 <= elenk + 1; k1++) {
      let e: number, pj: number, ln: number;
      if (k1 > elenk) {
        e = k;
        pj = p;
        ln = len[k]! - elenk;
      } else {
        e = Ci[p++]!;
        pj = Cp[e]!;
        ln = len[e]!;
      }
      for (let k2 = 1; k2 <= ln; k2++) {
        const i = Ci[pj++]!;
        const nvi = nv[i]!;
        if (nvi <= 0) continue;
        dk += nvi;
        nv[i] = -nvi;
        Ci[pk2++] = i;
        if (next[i] !== -1) last[next[i]!] = last[i]!;
        if (last[i] !== -1) next[last[i]!] = next[i]!;
        else head[degree[i]!] = next[i]!;
      }
      if (e !== k) {
        Cp[e] = flip(k); // absorb e into k
        w[e] = 0;
      }
    }
    if (elenk !== 0) cnz = pk2;
    degree[k] = dk;
    Cp[k] = pk1;
    len[k] = pk2 - pk1;
    elen[k] = -2;

    // --- scan 1: w[e] − mark = |Le \ Lk| for every element e adjacent to Lk
    mark = wclear(mark, lemax);
    for (let pk = pk1; pk < pk2; pk++) {
      const i = Ci[pk]!;
      const eln = elen[i]!;
      if (eln <= 0) continue;
      const nvi = -nv[i]!;
      const wnvi = mark - nvi;
      for (let q = Cp[i]!; q <= Cp[i]! + eln - 1; q++) {
        const e = Ci[q]!;
        if (w[e]! >= mark) w[e]! -= nvi;
        else if (w[e] !== 0) w[e] = degree[e]! + wnvi;
      }
    }

    // --- scan 2: approximate degree update, pruning, absorption, hashing
    for (let pk = pk1; pk < pk2; pk++) {
      const i = Ci[pk]!;
      const p1 = Cp[i]!;
      const p2 = p1 + elen[i]! - 1;
      let pn = p1;
      let h = 0, d = 0;
      for (let q = p1; q <= p2; q++) {
        const e = Ci[q]!;
        if (w[e] === 0) continue;
        const dext = w[e]! - mark;
        if (dext > 0) {
          d += dext;
          Ci[pn++] = e;
          h += e;
        } else {
          Cp[e] = flip(k); // aggressive absorption: Le ⊆ Lk
          w[e] = 0;
        }
      }
      elen[i] = pn - p1 + 1;
      const p3 = pn;
      const p4 = p1 + len[i]!;
      for (let q = p2 + 1; q < p4; q++) {
        const j = Ci[q]!;
        const nvj = nv[j]!;
        if (nvj <= 0) continue;
        d += nvj;
        Ci[pn++] = j;
        h += j;
      }
      if (d === 0) {
        // mass elimination: i is adjacent to k only
        Cp[i] = flip(k);
        const nvi = -nv[i]!;
        dk -= nvi;
        nvk += nvi;
        nel += nvi;
        nv[i] = 0;
        elen[i] = -1;
      } else {
        degree[i] = Math.min(degree[i]!, d);
        Ci[pn] = Ci[p3]!;
        Ci[p3] = Ci[p1]!;
        Ci[p1] = k; // k becomes the first element of Ei
        len[i] = pn - p1 + 1;
        h %= n;
        next[i] = hhead[h]!;
        hhead[h] = i;
        last[i] = h;
      }
    }
    degree[k] = dk;
    lemax = Math.max(lemax, dk);
    mark = wclear(mark + lemax, lemax);

    // --- supervariable detection: compare variables sharing a hash bucket
    for (let pk = pk1; pk < pk2; pk++) {
      let i = Ci[pk]!;
      if (nv[i]! >= 0) continue;
      const h = last[i]!;
      i = hhead[h]!;
      hhead[h] = -1;
      for (; i !== -1 && next[i] !== -1; i = next[i]!, mark++) {
        const ln = len[i]!;
        const eln = elen[i]!;
        for (let q = Cp[i]! + 1; q <= Cp[i]! + ln - 1; q++) w[Ci[q]!] = mark;
        let jlast = i;
        for (let j = next[i]!; j !== -1; ) {
          let ok = len[j] === ln && elen[j] === eln;
          for (let q = Cp[j]! + 1; ok && q <= Cp[j]! + ln - 1; q++) if (w[Ci[q]!] !== mark) ok = false;
          if (ok) {
            Cp[j] = flip(i); // absorb j into i
            nv[i]! += nv[j]!;
            nv[j] = 0;
            elen[j] = -1;
            j = next[j]!;
            next[jlast] = j;
          } else {
            jlast = j;
            j = next[j]!;
          }
        }
      }
    }

    // --- finalize Lk: external degrees, back into the degree lists
    p = pk1;
    for (let pk = pk1; pk < pk2; pk++) {
      const i = Ci[pk]!;
      const nvi = -nv[i]!;
      if (nvi <= 0) continue;
      nv[i] = nvi;
      let d = degree[i]! + dk - nvi;
      d = Math.min(d, n - nel - nvi);
      if (head[d] !== -1) last[head[d]!] = i;
      next[i] = head[d]!;
      last[i] = -1;
      head[d] = i;
      mindeg = Math.min(mindeg, d);
      degree[i] = d;
      Ci[p++] = i;
    }
    nv[k] = nvk;
    len[k] = p - pk1;
    if (len[k] === 0) {
      Cp[k] = -1; // k is a root of the assembly tree
      w[k] = 0;
    }
    if (elenk !== 0) cnz = p;
  }

  // --- postorder the assembly tree (parents in flip(Cp[·]))
  for (let i = 0; i < n; i++) Cp[i] = flip(Cp[i]!);
  for (let j = 0; j <= n; j++) head[j] = -1;
  for (let j = n; j >= 0; j--) {
    if (nv[j]! > 0) continue; // variables absorbed into a parent
    next[j] = head[Cp[j]!]!;
    head[Cp[j]!] = j;
  }
  for (let e = n; e >= 0; e--) {
    if (nv[e]! <= 0) continue; // elements
    if (Cp[e] !== -1) {
      next[e] = head[Cp[e]!]!;
      head[Cp[e]!] = e;
    }
  }
  const P = new Int32Array(n + 1);
  const stack = w;
  let k = 0;
  for (let i = 0; i <= n; i++) {
    if (Cp[i] !== -1) continue;
    let top = 0;
    stack[0] = i;
    while (top >= 0) {
      const q = stack[top]!;
      const c = head[q]!;
      if (c === -1) {
        top--;
        P[k++] = q;
      } else {
        head[q] = next[c]!;
        stack[++top] = c;
      }
    }
  }
  // node n (the dense element) is the last root visited, so P[n] = n
  return P.subarray(0, n);
}
