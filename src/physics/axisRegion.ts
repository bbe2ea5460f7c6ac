/**
 * The points of an ascending wavenumber axis inside a region [fromCm1, toCm1], ends included, as the
 * index range i0 (first at or above fromCm1) to i1 (one past the last at or below toCm1); i1 = i0 when
 * none is inside. The tools that work on a region of a trace read these points and no other, so a
 * caller may pass that slice alone.
 * @param axisCm1 ascending axis, cm^-1
 * @param fromCm1 region start, cm^-1
 * @param toCm1 region end, cm^-1
 */
export function axisRegionIndices(axisCm1: ArrayLike<number>, fromCm1: number, toCm1: number): [number, number] {
  let i0 = 0;
  while (i0 < axisCm1.length && axisCm1[i0] < fromCm1) i0++;
  let i1 = i0;
  while (i1 < axisCm1.length && axisCm1[i1] <= toCm1) i1++;
  return [i0, i1];
}
