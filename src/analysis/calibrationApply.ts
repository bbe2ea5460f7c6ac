import type { AxisCalibration } from './calibrationFit';

function calibrationCheck(fn: string, axis: ArrayLike<number>, cal: AxisCalibration): void {
  if (!axis || typeof axis.length !== 'number') throw new Error(`${fn}: axis must be an array of wavenumbers`);
  if (!cal || !Number.isFinite(cal.delta) || !(1 + cal.delta > 0)) {
    throw new Error(`${fn}: delta must be a finite number > −1, got ${cal?.delta}`);
  }
  if (!Number.isFinite(cal.offsetCm1)) throw new Error(`${fn}: offsetCm1 must be finite, got ${cal.offsetCm1}`);
}

/**
 * Calibrated axis ν_true = (1 + δ) ν_obs + offset, point by point (a new array).
 * Source: the model fitted by calibrationFit.
 * @param axis observed wavenumbers, cm^-1
 * @param cal δ (dimensionless, > −1) and offset (cm^-1)
 * @param out optional output array (may be `axis` itself)
 * @returns calibrated wavenumbers, cm^-1
 */
export function calibrationApply(axis: ArrayLike<number>, cal: AxisCalibration, out?: Float64Array): Float64Array {
  calibrationCheck('calibrationApply', axis, cal);
  const res = out ?? new Float64Array(axis.length);
  const scale = 1 + cal.delta;
  for (let i = 0; i < axis.length; i++) res[i] = scale * axis[i] + cal.offsetCm1;
  return res;
}

/**
 * Inverse of {@link calibrationApply}: ν_obs = (ν_true − offset) / (1 + δ), so
 * calibrationRevert(calibrationApply(ν, c), c) returns ν to round-off (a few ulp).
 * @param axis calibrated wavenumbers, cm^-1
 * @param cal δ (dimensionless, > −1) and offset (cm^-1)
 * @param out optional output array (may be `axis` itself)
 * @returns observed-axis wavenumbers, cm^-1
 */
export function calibrationRevert(axis: ArrayLike<number>, cal: AxisCalibration, out?: Float64Array): Float64Array {
  calibrationCheck('calibrationRevert', axis, cal);
  const res = out ?? new Float64Array(axis.length);
  const scale = 1 + cal.delta;
  for (let i = 0; i < axis.length; i++) res[i] = (axis[i] - cal.offsetCm1) / scale;
  return res;
}
