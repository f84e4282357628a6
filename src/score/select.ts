/**
 * Order statistics without a full sort: the k-th smallest of an array, in
 * place, by Hoare's FIND (C. A. R. Hoare, "Algorithm 65: Find", Comm. ACM
 * 4(7), 1961): partition round a pivot, keep the side that holds position
 * k, repeat. Expected linear time; the pivot is the median of the first,
 * middle and last values, and after 2·⌈log₂ n⌉ + 8 rounds the range left is
 * sorted instead, so no input makes it quadratic.
 *
 * The value found is the k-th smallest whatever the method, so quantiles
 * taken this way are exactly those read from the sorted array.
 */

/**
 * Moves the k-th smallest value (0-based) of `a[lo..hi]` to `a[k]`, values
 * not greater before it and not smaller after it, and returns it. `a` must
 * hold no NaN; `lo ≤ k ≤ hi`.
 */
export function selectInPlace(a: Float64Array, k: number, lo = 0, hi = a.length - 1): number {
  let rounds = 2 * Math.ceil(Math.log2(hi - lo + 2)) + 8;
  while (hi > lo) {
    if (rounds-- === 0) {
      a.subarray(lo, hi + 1).sort();
      break;
    }
    // median of three: a[lo] ≤ a[mid] ≤ a[hi], so both scans below stop inside [lo, hi]
    const mid = lo + ((hi - lo) >> 1);
    if (a[mid]! < a[lo]!) swap(a, lo, mid);
    if (a[hi]! < a[lo]!) swap(a, lo, hi);
    if (a[hi]! < a[mid]!) swap(a, mid, hi);
    const pivot = a[mid]!;
    let i = lo, j = hi;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        swap(a, i, j);
        i++;
        j--;
      }
    }
    // now a[lo..j] ≤ pivot ≤ a[i..hi], and everything strictly between j and i equals the pivot
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return a[k]!;
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i]!;
  a[i] = a[j]!;
  a[j] = t;
}
