/**
 * Entry validation shared by the analysis functions: equal lengths, finite values, strictly
 * ascending wavenumbers. Throws an Error naming the calling function, the field, the index and value.
 * @param fn name of the public function, for the message
 * @param wavenumberCm1 abscissa, cm^-1
 * @param absorbance ordinate, absorbance units
 */
export function traceCheck(fn: string, wavenumberCm1: ArrayLike<number>, absorbance: ArrayLike<number>): void {
  if (!wavenumberCm1 || !absorbance) throw new Error(`${fn}: trace must have wavenumberCm1 and absorbance arrays`);
  const n = wavenumberCm1.length;
  if (absorbance.length !== n) {
    throw new Error(`${fn}: absorbance has ${absorbance.length} values but wavenumberCm1 has ${n}`);
  }
  for (let i = 0; i < n; i++) {
    const x = wavenumberCm1[i];
    if (!Number.isFinite(x)) throw new Error(`${fn}: wavenumberCm1[${i}] must be finite, got ${x}`);
    if (!Number.isFinite(absorbance[i])) throw new Error(`${fn}: absorbance[${i}] must be finite, got ${absorbance[i]}`);
    if (i > 0 && !(x > wavenumberCm1[i - 1])) {
      throw new Error(`${fn}: wavenumberCm1 must be strictly ascending, got ${wavenumberCm1[i - 1]} then ${x} at index ${i}`);
    }
  }
}
