/**
 * Consistent orientation of a triangle soup across its manifold edges.
 */
import type { Groups } from './edge-groups.js';

/**
 * Flips faces so that every manifold edge is traversed in opposite directions
 * by its two faces. Works per connected piece; keeps the orientation held by
 * the majority of its faces. Returns the number of flipped faces (in pieces
 * that can be oriented) and of pieces that cannot be oriented.
 *
 * A piece that cannot be oriented (a Möbius strip, say) still gets the
 * orientation of its breadth-first spanning tree, so the faces disagree only
 * across the edges where the search fronts met: one cut across the piece
 * makes it orientable, instead of a cut at every edge where the input's
 * listing happened to disagree. Flips there are not counted (no orientation
 * of such a piece is the right one).
 */
export function orientFaces(
  tri: Uint32Array,
  nf: number,
  groups: Groups,
): { flipped: number; nonOrientable: number; changed: boolean } {
  const nh = 3 * nf;
  // neighbour across each half-edge, for manifold edges only
  const across = new Int32Array(nh).fill(-1);
  const { start, order } = groups;
  for (let g = 0; g + 1 < start.length; g++) {
    if (start[g + 1]! - start[g]! !== 2) continue;
    const h0 = order[start[g]!]!, h1 = order[start[g]! + 1]!;
    across[h0] = h1;
    across[h1] = h0;
  }
  const flip = new Int8Array(nf).fill(-1); // -1 unvisited, 0 keep, 1 flip
  const queue = new Int32Array(nf);
  let flipped = 0;
  let changed = false;
  let nonOrientable = 0;
  const members: number[] = [];
  for (let seed = 0; seed < nf; seed++) {
    if (flip[seed] >= 0) continue;
    flip[seed] = 0;
    let qh = 0, qt = 0;
    queue[qt++] = seed;
    members.length = 0;
    let ok = true;
    while (qh < qt) {
      const f = queue[qh++]!;
      members.push(f);
      for (let k = 0; k < 3; k++) {
        const h = 3 * f + k;
        const o = across[h]!;
        if (o < 0) continue;
        const g = (o / 3) | 0;
        // same direction along the shared edge means the faces disagree
        const same = tri[h] === tri[o];
        const want = (flip[f]! ^ (same ? 1 : 0)) as 0 | 1;
        if (flip[g]! < 0) {
          flip[g] = want;
          queue[qt++] = g;
        } else if (flip[g] !== want) ok = false;
      }
    }
    if (!ok) nonOrientable++;
    let nflip = 0;
    for (const f of members) nflip += flip[f]!;
    const invert = 2 * nflip > members.length; // keep the majority orientation
    for (const f of members) {
      const doFlip = invert ? flip[f] === 0 : flip[f] === 1;
      if (doFlip) {
        const t = tri[3 * f + 1]!;
        tri[3 * f + 1] = tri[3 * f + 2]!;
        tri[3 * f + 2] = t;
        changed = true;
        if (ok) flipped++;
      }
    }
  }
  return { flipped, nonOrientable, changed };
}
