/**
 * Index of the first element of the ascending array `x` that is >= value (x.length if none).
 * @param x ascending numbers
 * @param value the value searched for
 */
export function sortedLowerBound(x: ArrayLike<number>, value: number): number {
  let lo = 0;
  let hi = x.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (x[mid] < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
