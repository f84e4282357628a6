/**
 * Duplicate triangles: triangles with the same three vertices, in any order
 * and either orientation. Found in linear time by a three-pass LSD radix sort
 * (stable counting sorts) of the triangles on their sorted corner triple, so
 * the copies of one vertex set end up adjacent, earliest triangle first.
 * {@link distinctFaces} also drops triangles with a repeated corner.
 */

/** One duplicate: triangle `face` repeats the vertex set of the earlier triangle `of`. */
export interface DuplicateFace {
  /** Index of the repeated (dropped) triangle. */
  face: number;
  /** Index of the first triangle with the same vertex set (kept). */
  of: number;
}

/**
 * For every triangle `f` of `tri` (three corners each, all `< nv`), returns
 * the index of the earliest triangle with the same vertex set, or -1 when `f`
 * is the first (or only) one with its vertex set.
 */
export function findDuplicateFaces(tri: Uint32Array, nv: number): Int32Array {
  const nf = Math.floor(tri.length / 3);
  // sorted corners of each face: k0 ≤ k1 ≤ k2
  const k = new Uint32Array(3 * nf);
  for (let f = 0; f < nf; f++) {
    let a = tri[3 * f]!, b = tri[3 * f + 1]!, c = tri[3 * f + 2]!;
    if (a > b) { const t = a; a = b; b = t; }
    if (b > c) { const t = b; b = c; c = t; }
    if (a > b) { const t = a; a = b; b = t; }
    k[3 * f] = a; k[3 * f + 1] = b; k[3 * f + 2] = c;
  }
  let src = new Int32Array(nf);
  for (let f = 0; f < nf; f++) src[f] = f;
  let dst = new Int32Array(nf);
  const count = new Int32Array(nv + 1);
  for (let d = 2; d >= 0; d--) {
    count.fill(0);
    for (let i = 0; i < nf; i++) count[k[3 * src[i]! + d]! + 1]!++;
    for (let v = 0; v < nv; v++) count[v + 1]! += count[v]!;
    for (let i = 0; i < nf; i++) {
      const f = src[i]!;
      dst[count[k[3 * f + d]!]!++] = f;
    }
    const t = src; src = dst; dst = t;
  }
  const firstOf = new Int32Array(nf).fill(-1);
  let head = -1;
  for (let i = 0; i < nf; i++) {
    const f = src[i]!;
    if (head >= 0 && k[3 * f] === k[3 * head] && k[3 * f + 1] === k[3 * head + 1] && k[3 * f + 2] === k[3 * head + 2]) {
      firstOf[f] = head;
    } else head = f;
  }
  return firstOf;
}

/** The triangles left by {@link distinctFaces} and what it dropped. */
export interface DistinctFaces {
  /** Corners of the kept triangles, three each. */
  tri: Uint32Array;
  /** Input index of each kept triangle. */
  faceOrigin: Int32Array;
  /** Input triangles with a repeated corner (dropped). */
  degenerateFaces: number[];
  /** Input triangles repeating an earlier vertex set (dropped; up to `maxListed`). */
  duplicateFaces: DuplicateFace[];
  /** Exact number of duplicates dropped. */
  duplicateFaceCount: number;
}

/**
 * Drops the triangles of `triangles` that have a repeated corner, then those
 * whose vertex set an earlier kept triangle already has (the first copy stays).
 */
export function distinctFaces(triangles: ArrayLike<number>, nv: number, maxListed: number): DistinctFaces {
  const ntIn = Math.floor(triangles.length / 3);
  const degenerateFaces: number[] = [];
  let nk = 0;
  for (let f = 0; f < ntIn; f++) {
    const a = triangles[3 * f]!, b = triangles[3 * f + 1]!, c = triangles[3 * f + 2]!;
    if (a === b || b === c || c === a) degenerateFaces.push(f);
    else nk++;
  }
  const kept = new Uint32Array(3 * nk);
  const keptOrigin = new Int32Array(nk);
  for (let f = 0, g = 0; f < ntIn; f++) {
    const a = triangles[3 * f]!, b = triangles[3 * f + 1]!, c = triangles[3 * f + 2]!;
    if (a === b || b === c || c === a) continue;
    kept[3 * g] = a; kept[3 * g + 1] = b; kept[3 * g + 2] = c;
    keptOrigin[g++] = f;
  }
  const firstOf = findDuplicateFaces(kept, nv);
  const duplicateFaces: DuplicateFace[] = [];
  let duplicateFaceCount = 0;
  for (let g = 0; g < nk; g++) {
    if (firstOf[g]! < 0) continue;
    duplicateFaceCount++;
    if (duplicateFaces.length < maxListed) duplicateFaces.push({ face: keptOrigin[g]!, of: keptOrigin[firstOf[g]!]! });
  }
  const nf = nk - duplicateFaceCount;
  let tri = kept;
  let faceOrigin = keptOrigin;
  if (duplicateFaceCount > 0) {
    tri = new Uint32Array(3 * nf);
    faceOrigin = new Int32Array(nf);
    for (let g = 0, j = 0; g < nk; g++) {
      if (firstOf[g]! >= 0) continue;
      tri.set(kept.subarray(3 * g, 3 * g + 3), 3 * j);
      faceOrigin[j++] = keptOrigin[g]!;
    }
  }
  return { tri, faceOrigin, degenerateFaces, duplicateFaces, duplicateFaceCount };
}
