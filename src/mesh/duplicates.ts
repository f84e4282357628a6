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

/** 32-bit mix of one vertex index (summed and xor-ed over a face: order-independent). */
function mix(v: number, k: number): number {
  let x = Math.imul(v ^ (v >>> 16), k);
  x = Math.imul(x ^ (x >>> 15), 0x2c1b3c6d);
  return (x ^ (x >>> 16)) >>> 0;
}

/**
 * Duplicate polygons (more than three corners; triangles are left to
 * {@link distinctFaces}): for each face of `faceOffsets`/`faceIndices`, the
 * earliest face with the same size and vertex set, or -1. Two differently
 * listed copies of a quad would be cut along different diagonals, so their
 * triangles would not repeat each other: this catches them first. Expected
 * linear time: faces are bucketed by an order-independent hash of their
 * vertex set (counting sort); within a bucket a face is compared with the
 * distinct faces seen so far, by a second hash and then exactly.
 */
export function findDuplicatePolygons(faceOffsets: Uint32Array, faceIndices: Uint32Array): Int32Array {
  const nf = faceOffsets.length - 1;
  const firstOf = new Int32Array(Math.max(nf, 0)).fill(-1);
  let np = 0;
  for (let f = 0; f < nf; f++) if (faceOffsets[f + 1]! - faceOffsets[f]! > 3) np++;
  if (np < 2) return firstOf;
  let M = 2;
  while (M < 2 * np) M <<= 1;
  const bucketOf = new Int32Array(nf).fill(-1);
  const check = new Uint32Array(nf);
  const count = new Int32Array(M + 1);
  for (let f = 0; f < nf; f++) {
    const s = faceOffsets[f]!, e = faceOffsets[f + 1]!;
    if (e - s <= 3) continue;
    let h1 = Math.imul(e - s, 0x27d4eb2d), h2 = e - s;
    for (let i = s; i < e; i++) {
      const v = faceIndices[i]!;
      h1 = (h1 + mix(v, 0x45d9f3b)) >>> 0;
      h2 ^= mix(v, 0x119de1f3);
    }
    bucketOf[f] = h1 & (M - 1);
    check[f] = h2 >>> 0;
    count[bucketOf[f]! + 1]!++;
  }
  for (let b = 0; b < M; b++) count[b + 1]! += count[b]!;
  const order = new Int32Array(np);
  const fill = count.slice(0, M);
  for (let f = 0; f < nf; f++) if (bucketOf[f]! >= 0) order[fill[bucketOf[f]!]!++] = f; // ascending f in each bucket
  const sorted = (f: number) => Array.from(faceIndices.subarray(faceOffsets[f]!, faceOffsets[f + 1]!)).sort((x, y) => x - y);
  const same = (f: number, g: number) => {
    if (check[f] !== check[g] || faceOffsets[f + 1]! - faceOffsets[f]! !== faceOffsets[g + 1]! - faceOffsets[g]!) return false;
    const a = sorted(f), b = sorted(g);
    return a.every((x, i) => x === b[i]);
  };
  const reps: number[] = [];
  for (let b = 0; b < M; b++) {
    const s = count[b]!, e = count[b + 1]!;
    if (e - s < 2) continue;
    reps.length = 0;
    for (let i = s; i < e; i++) {
      const f = order[i]!;
      let dup = -1;
      for (const g of reps) if (same(f, g)) { dup = g; break; }
      if (dup >= 0) firstOf[f] = dup;
      else reps.push(f);
    }
  }
  return firstOf;
}
