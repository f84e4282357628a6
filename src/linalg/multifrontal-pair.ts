/**
 * Two multifrontal factorizations in one sweep, for matrices A and B with one
 * pattern whose values differ in a few columns (the heat method's natural and
 * Dirichlet heat matrices differ only in the boundary rows and columns).
 *
 * Supernode s's block of L and its update matrix are computed from C's
 * columns in the subtree of s in the supernodal elimination tree and from
 * nothing else (the column dependencies of Cholesky follow the elimination
 * tree: Liu, "The role of elimination trees in sparse factorization", SIAM
 * J. Matrix Anal. Appl. 11(1), 1990). So where A and B agree (bit for bit)
 * on every column of that subtree, B's block equals A's: B stores only the
 * blocks of the `affected` supernodes (an ancestor of a differing column, or
 * its owner), at offsets `own[s]` of a compact array, and reads A's blocks
 * for the rest. The sweep keeps two fronts and two update stacks: an
 * affected supernode assembles B's front from B's update matrices of its
 * affected children and from A's of the others, before A's own assembly pops
 * them. A's computation is exactly that of multifrontal.ts (same bits).
 */
import type { SupernodalStructure } from './supernodes.js';
import { factorFront } from './dense-kernels.js';
import { assembleFront, extendAdd, pushUpdate, storeBlock, updateOrder, type MultifrontalWork } from './multifrontal.js';

/**
 * Marks the supernodes whose subtree holds a column where cxA and cxB differ
 * (lower-triangle CSC of C: cp, cxA / cxB), and gives each an offset in B's
 * compact storage (−1: shared with A). Returns the offsets and B's total.
 */
export function affectedBlocks(sn: SupernodalStructure, cp: Int32Array, cxA: Float64Array, cxB: Float64Array): { own: Int32Array; total: number } {
  const { nsuper, superStart, superParent, valPtr } = sn;
  const own = new Int32Array(nsuper).fill(-1);
  const hit = new Uint8Array(nsuper);
  for (let s = 0; s < nsuper; s++) {
    for (let p = cp[superStart[s]!]!, e = cp[superStart[s + 1]!]!; p < e && !hit[s]; p++) if (!Object.is(cxA[p], cxB[p])) hit[s] = 1;
  }
  // parents come after children: one ascending pass carries the mark up to the roots
  let total = 0;
  for (let s = 0; s < nsuper; s++) {
    if (!hit[s]) continue;
    if (superParent[s]! >= 0) hit[superParent[s]!] = 1;
    own[s] = total;
    total += valPtr[s + 1]! - valPtr[s]!;
  }
  return { own, total };
}

/**
 * Factors A into LxA (full storage) and B into LxB (the blocks with
 * own[s] ≥ 0 only). Returns A's failed column or −1 in `status[0]`, B's in
 * `status[1]` (B stops at its first failure; A carries on), with the pivot
 * values in `pivots`. The two works must be distinct. With `lo`, `hi` only
 * supernodes lo … hi−1 (a whole subtree's range) are factored, from empty
 * stacks, and `unscale` stores the blocks scaled (both as multifrontalFactor;
 * both matrices then carry the same shift). Never throws.
 */
export function multifrontalPair(
  sn: SupernodalStructure,
  cp: Int32Array,
  ci: Int32Array,
  cxA: Float64Array,
  cxB: Float64Array,
  LxA: Float64Array,
  LxB: Float64Array,
  own: Int32Array,
  workA: MultifrontalWork,
  workB: MultifrontalWork,
  status: Int32Array,
  pivots: Float64Array,
  lo = 0,
  hi = sn.nsuper,
  unscale = 1,
): void {
  const { superStart, childCount, rowPtr, valPtr } = sn;
  const FA = workA.front, FB = workB.front;
  let nA = 0, topA = 0, nB = 0, topB = 0;
  let bOk = true;
  status[0] = -1;
  status[1] = -1;
  for (let s = lo; s < hi; s++) {
    const f = superStart[s]!, nc = superStart[s + 1]! - f;
    const nr = rowPtr[s + 1]! - rowPtr[s]!;
    const inB = bOk && own[s]! >= 0;
    if (inB) {
      // B's front first: A's update matrices of the shared children are read in place
      assembleFront(sn, s, cp, ci, cxB, workB, FB);
      let kA = nA, uA = topA;
      for (let c = 0; c < childCount[s]!; c++) {
        const ch = workA.stackIds[--kA]!;
        const m = updateOrder(sn, ch);
        uA -= (m * (m + 1)) >> 1;
        if (own[ch]! >= 0) {
          --nB; // B's stack holds the affected children in the same order
          topB -= (m * (m + 1)) >> 1;
          extendAdd(sn, ch, workB.stack, topB, workB, FB, nr);
        } else {
          extendAdd(sn, ch, workA.stack, uA, workB, FB, nr);
        }
      }
    }
    assembleFront(sn, s, cp, ci, cxA, workA, FA);
    for (let c = 0; c < childCount[s]!; c++) {
      const ch = workA.stackIds[--nA]!;
      const m = updateOrder(sn, ch);
      topA -= (m * (m + 1)) >> 1;
      extendAdd(sn, ch, workA.stack, topA, workA, FA, nr);
    }
    const badA = factorFront(FA, nr, nc, workA.simd, null, f);
    if (badA >= 0) {
      status[0] = f + badA;
      pivots[0] = FA[badA * nr + badA]! * unscale * unscale;
      return;
    }
    storeBlock(FA, nr, nc, LxA, valPtr[s]!, unscale);
    if (nr > nc) {
      topA = pushUpdate(FA, nr, nc, workA.stack, topA);
      workA.stackIds[nA++] = s;
    }
    if (!inB) continue;
    const badB = factorFront(FB, nr, nc, workB.simd, null, f);
    if (badB >= 0) {
      status[1] = f + badB;
      pivots[1] = FB[badB * nr + badB]! * unscale * unscale;
      bOk = false;
      continue;
    }
    storeBlock(FB, nr, nc, LxB, own[s]!, unscale);
    if (nr > nc) {
      topB = pushUpdate(FB, nr, nc, workB.stack, topB);
      workB.stackIds[nB++] = s;
    }
  }
}
