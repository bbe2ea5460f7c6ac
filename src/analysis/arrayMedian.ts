/**
 * Median of the first `n` values of a scratch array, found in place by quickselect (expected O(n)).
 * The array is reordered. For even n the mean of the two middle values is returned; NaN for n = 0.
 * Source: Hoare, Commun. ACM 4, 321 (1961), "Algorithm 65: Find"; median-of-three pivot.
 * @param scratch values (any unit); WARNING: reordered in place, pass a copy you do not need
 * @param n number of leading entries to use (default scratch.length)
 * @returns the median, same unit as the values
 */
export function arrayMedianInPlace(scratch: Float64Array, n = scratch.length): number {
  if (n <= 0) return NaN;
  const upper = arraySelectInPlace(scratch, n, n >> 1);
  if (n & 1) return upper;
  // The lower middle is the largest value left of the selected one after partitioning.
  let lower = -Infinity;
  const half = n >> 1;
  for (let i = 0; i < half; i++) if (scratch[i] > lower) lower = scratch[i];
  return 0.5 * (lower + upper);
}

/**
 * The k-th smallest (0-based) of the first `n` values, by quickselect; afterwards entries
 * [0, k) are ≤ it and (k, n) are ≥ it.
 * Source: Hoare, Commun. ACM 4, 321 (1961).
 * @param scratch values (any unit), reordered in place
 * @param n number of leading entries to use
 * @param k rank wanted, 0 ≤ k < n
 * @returns the k-th smallest value
 */
export function arraySelectInPlace(scratch: Float64Array, n: number, k: number): number {
  let lo = 0;
  let hi = n - 1;
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    // Median of three as pivot keeps sorted or reversed input from degrading to O(n^2).
    const a = scratch[lo];
    const b = scratch[mid];
    const c = scratch[hi];
    const pivot = a < b ? (b < c ? b : a < c ? c : a) : a < c ? a : b < c ? c : b;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (scratch[i] < pivot) i++;
      while (scratch[j] > pivot) j--;
      if (i <= j) {
        const t = scratch[i];
        scratch[i] = scratch[j];
        scratch[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return scratch[k];
  }
  return scratch[k];
}
