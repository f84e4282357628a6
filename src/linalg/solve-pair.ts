/**
 * The backward solve of two factors that share blocks (multifrontal-pair.ts)
 * in one pass: where a block is shared, it is read once and applied to both
 * right-hand sides; elsewhere each factor's block is applied to its own.
 * Every vector sees exactly the operations of its own backward solve
 * (solve-supernodal.ts, backwardBlock), in the same order, so the results
 * are the same to the bit; only the reads of the shared blocks are halved.
 */
import { belowBase, type SupernodalStructure } from './supernodes.js';
import { backwardBlock, diagonalBackward } from './solve-supernodal.js';

/**
 * Lᵀ x = y for A's factor (LxA, full storage) on xA and B's (block s at
 * own[s] in LxB, or A's block where own[s] < 0) on xB, in place.
 */
export function pairTransposeSolve(
  sn: SupernodalStructure, LxA: Float64Array, xA: Float64Array, LxB: Float64Array, own: Int32Array, xB: Float64Array,
): void {
  for (let s = sn.nsuper - 1; s >= 0; s--) {
    const v0 = sn.valPtr[s]!;
    if (own[s]! >= 0) {
      backwardBlock(sn, s, LxA, v0, xA);
      backwardBlock(sn, s, LxB, own[s]!, xB);
    } else {
      sharedBackwardBlock(sn, s, LxA, v0, xA, xB);
    }
  }
}

/** backwardBlock on two vectors with one block. */
function sharedBackwardBlock(sn: SupernodalStructure, s: number, Lx: Float64Array, v0: number, x: Float64Array, z: Float64Array): void {
  const { superStart, rowPtr, rows } = sn;
  const f = superStart[s]!, nc = superStart[s + 1]! - f;
  const r0 = rowPtr[s]!, nr = rowPtr[s + 1]! - r0;
  const w0 = belowBase(v0, nc);
  let r = nr - 1;
  for (; r - 7 >= nc; r -= 8) {
    const i0 = rows[r0 + r]!, i1 = rows[r0 + r - 1]!, i2 = rows[r0 + r - 2]!, i3 = rows[r0 + r - 3]!;
    const i4 = rows[r0 + r - 4]!, i5 = rows[r0 + r - 5]!, i6 = rows[r0 + r - 6]!, i7 = rows[r0 + r - 7]!;
    const x0 = x[i0]!, x1 = x[i1]!, x2 = x[i2]!, x3 = x[i3]!, x4 = x[i4]!, x5 = x[i5]!, x6 = x[i6]!, x7 = x[i7]!;
    const z0 = z[i0]!, z1 = z[i1]!, z2 = z[i2]!, z3 = z[i3]!, z4 = z[i4]!, z5 = z[i5]!, z6 = z[i6]!, z7 = z[i7]!;
    const q0 = w0 + r * nc, q1 = q0 - nc, q2 = q1 - nc, q3 = q2 - nc, q4 = q3 - nc, q5 = q4 - nc, q6 = q5 - nc, q7 = q6 - nc;
    for (let k = nc - 1; k >= 0; k--) {
      const l0 = Lx[q0 + k]!, l1 = Lx[q1 + k]!, l2 = Lx[q2 + k]!, l3 = Lx[q3 + k]!;
      const l4 = Lx[q4 + k]!, l5 = Lx[q5 + k]!, l6 = Lx[q6 + k]!, l7 = Lx[q7 + k]!;
      x[f + k]! -= (l0 * x0 + l1 * x1 + l2 * x2 + l3 * x3) + (l4 * x4 + l5 * x5 + l6 * x6 + l7 * x7);
      z[f + k]! -= (l0 * z0 + l1 * z1 + l2 * z2 + l3 * z3) + (l4 * z4 + l5 * z5 + l6 * z6 + l7 * z7);
    }
  }
  for (; r - 3 >= nc; r -= 4) {
    const i0 = rows[r0 + r]!, i1 = rows[r0 + r - 1]!, i2 = rows[r0 + r - 2]!, i3 = rows[r0 + r - 3]!;
    const x0 = x[i0]!, x1 = x[i1]!, x2 = x[i2]!, x3 = x[i3]!;
    const z0 = z[i0]!, z1 = z[i1]!, z2 = z[i2]!, z3 = z[i3]!;
    const q0 = w0 + r * nc, q1 = q0 - nc, q2 = q1 - nc, q3 = q2 - nc;
    for (let k = nc - 1; k >= 0; k--) {
      const l0 = Lx[q0 + k]!, l1 = Lx[q1 + k]!, l2 = Lx[q2 + k]!, l3 = Lx[q3 + k]!;
      x[f + k]! -= l0 * x0 + l1 * x1 + l2 * x2 + l3 * x3;
      z[f + k]! -= l0 * z0 + l1 * z1 + l2 * z2 + l3 * z3;
    }
  }
  for (; r >= nc; r--) {
    const i0 = rows[r0 + r]!;
    const xr = x[i0]!, zr = z[i0]!;
    const q0 = w0 + r * nc;
    for (let k = nc - 1; k >= 0; k--) {
      const l0 = Lx[q0 + k]!;
      x[f + k]! -= l0 * xr;
      z[f + k]! -= l0 * zr;
    }
  }
  // the diagonal block is small (in cache): one vector after the other, each with its own operations
  diagonalBackward(Lx, v0, f, nc, x);
  diagonalBackward(Lx, v0, f, nc, z);
}
