/**
 * The permuted patterns of the symbolic analysis (symbolic.ts): C = P·A·Pᵀ
 * from the lower triangle of A, as compressed columns of one triangle or
 * both, with the slot of every input entry, and the supernodal C relabelled
 * from the ordering's own lower triangle after the postorder (Liu, "The role
 * of elimination trees in sparse factorization", SIAM J. Matrix Anal. Appl.
 * 11(1), 1990).
 */
import type { CscMatrix } from './csc.js';

/** Row indices, column pointers and (when asked for) the slot of every input entry of one triangle. */
export interface Triangle {
  readonly ptr: Int32Array;
  readonly idx: Int32Array;
  readonly map: Int32Array;
}

const NO_TRIANGLE: Triangle = { ptr: new Int32Array(1), idx: new Int32Array(0), map: new Int32Array(0) };

/**
 * Pattern of C = P·A·Pᵀ from the lower triangle of A: entry (i, j) moves to
 * (pinv[i], pinv[j]) and is kept in the upper triangle (column = larger
 * index) when `up`, in the lower one (column = smaller index) when `low`,
 * with the slot of every input entry in the lower one (`slots` 'low') or
 * in both ('both'; else the maps are empty). A triangle not asked for is empty.
 */
export function permutedPattern(Alower: CscMatrix, pinv: Int32Array, up: boolean, low: boolean, slots: 'none' | 'low' | 'both'): { up: Triangle; low: Triangle } {
  const maps = slots === 'both';
  const { n, colPtr, rowIdx } = Alower;
  const nz = colPtr[n]!;
  const upPtr = up ? new Int32Array(n + 1) : NO_TRIANGLE.ptr;
  const lowPtr = low ? new Int32Array(n + 1) : NO_TRIANGLE.ptr;
  for (let j = 0; j < n; j++) {
    const pj = pinv[j]!;
    for (let p = colPtr[j]!; p < colPtr[j + 1]!; p++) {
      const pi = pinv[rowIdx[p]!]!;
      if (up) upPtr[(pi > pj ? pi : pj) + 1]!++;
      if (low) lowPtr[(pi < pj ? pi : pj) + 1]!++;
    }
  }
  for (let k = 0; k < n; k++) {
    if (up) upPtr[k + 1]! += upPtr[k]!;
    if (low) lowPtr[k + 1]! += lowPtr[k]!;
  }
  const upIdx = up ? new Int32Array(nz) : NO_TRIANGLE.idx, lowIdx = low ? new Int32Array(nz) : NO_TRIANGLE.idx;
  const lowMaps = maps || slots === 'low';
  const upMap = up && maps ? new Int32Array(nz) : NO_TRIANGLE.map, lowMap = low && lowMaps ? new Int32Array(nz) : NO_TRIANGLE.map;
  const fillU = up ? upPtr.slice(0, n) : NO_TRIANGLE.ptr, fillL = low ? lowPtr.slice(0, n) : NO_TRIANGLE.ptr;
  for (let j = 0; j < n; j++) {
    const pj = pinv[j]!;
    for (let p = colPtr[j]!; p < colPtr[j + 1]!; p++) {
      const pi = pinv[rowIdx[p]!]!;
      const hi = pi > pj ? pi : pj, lo = pi < pj ? pi : pj;
      if (up) {
        const q = fillU[hi]!++;
        upIdx[q] = lo;
        if (maps) upMap[p] = q;
      }
      if (low) {
        const q = fillL[lo]!++;
        lowIdx[q] = hi;
        if (lowMaps) lowMap[p] = q;
      }
    }
  }
  return { up: { ptr: upPtr, idx: upIdx, map: upMap }, low: { ptr: lowPtr, idx: lowIdx, map: lowMap } };
}

/**
 * The lower triangle of C = P·A·Pᵀ for P = the ordering followed by the
 * postorder `post` of its elimination tree, from the lower triangle `t0` of
 * the ordering alone (with its slots): every entry of A joins a vertex to
 * one of its ancestors in the elimination tree (Liu 1990, §3), and a
 * postorder numbers descendants before ancestors, so an entry's column (the
 * smaller index) is the same vertex under both orders. Column newOf[c] of C
 * is column c of t0, entries in the same order (both are filled by one pass
 * over A's entries in order), rows renumbered; permutedPattern's output,
 * entry for entry, without a second pass over A.
 */
export function relabelLower(t0: Triangle, post: Int32Array, newOf: Int32Array): Triangle {
  const n = post.length, nz = t0.idx.length;
  const ptr = new Int32Array(n + 1), idx = new Int32Array(nz), slot = new Int32Array(nz);
  for (let k = 0; k < n; k++) {
    const c = post[k]!, a = t0.ptr[c]!, b = t0.ptr[c + 1]!;
    let q = ptr[k]!;
    for (let q0 = a; q0 < b; q0++, q++) {
      idx[q] = newOf[t0.idx[q0]!]!;
      slot[q0] = q;
    }
    ptr[k + 1] = q;
  }
  const map = new Int32Array(t0.map.length);
  for (let p = 0; p < map.length; p++) map[p] = slot[t0.map[p]!]!;
  return { ptr, idx, map };
}
