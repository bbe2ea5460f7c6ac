/**
 * Pure helpers of the wavenumber-calibration panel: reading reference pairs typed or pasted by the
 * user, and applying or reverting a calibration on a trace. No store, no React.
 */
import { calibrationApply, calibrationRevert } from '../analysis/calibrationApply';
import type { AxisCalibration, CalibrationPair } from '../analysis/calibrationFit';
import type { Trace } from '../io/trace';

/** Pairs read from text, with the lines that could not be read. */
export interface CalibrationPairsText {
  pairs: CalibrationPair[];
  /** One message per unreadable line, naming its 1-based number. */
  errors: string[];
}

/**
 * Read reference pairs from text: one pair per line, "observed, reference[, sigma]" in cm^-1,
 * separated by commas, semicolons, tabs or spaces. Blank lines, '#' comments and a header line
 * whose first field is not a number are skipped.
 */
export function calibrationPairsParse(text: string): CalibrationPairsText {
  const pairs: CalibrationPair[] = [];
  const errors: string[] = [];
  const lines = text.split(/\r\n|\r|\n/);
  lines.forEach((raw, i) => {
    const line = raw.trim();
    if (!line || line.startsWith('#')) return;
    const fields = line.split(/[,;\t ]+/).filter(Boolean);
    const nums = fields.map(Number);
    if (i === 0 && !Number.isFinite(nums[0])) return; // header
    if (fields.length < 2 || fields.length > 3 || !nums.every((v) => Number.isFinite(v))) {
      errors.push(`line ${i + 1}: expected "observed, reference[, sigma]" in cm⁻¹, got "${line.slice(0, 60)}"`);
      return;
    }
    if (!(nums[0] > 0) || !(nums[1] > 0) || (fields.length === 3 && !(nums[2] > 0))) {
      errors.push(`line ${i + 1}: wavenumbers and sigma must be > 0`);
      return;
    }
    pairs.push(
      fields.length === 3
        ? { observedCm1: nums[0], referenceCm1: nums[1], referenceSigmaCm1: nums[2] }
        : { observedCm1: nums[0], referenceCm1: nums[1] },
    );
  });
  return { pairs, errors };
}

/** Write pairs back as text, one "observed, reference[, sigma]" per line (inverse of calibrationPairsParse). */
export function calibrationPairsFormat(pairs: readonly CalibrationPair[]): string {
  return pairs
    .map((p) => [p.observedCm1, p.referenceCm1, ...(p.referenceSigmaCm1 !== undefined ? [p.referenceSigmaCm1] : [])].join(', '))
    .join('\n');
}

/**
 * Compose two calibrations: applying `first`, then `second`, equals applying the result.
 * ν'' = (1+δ2)((1+δ1)ν + o1) + o2 = (1+δ)ν + o with 1+δ = (1+δ1)(1+δ2), o = (1+δ2)o1 + o2.
 */
export function calibrationCompose(first: AxisCalibration, second: AxisCalibration): AxisCalibration {
  return {
    delta: (1 + first.delta) * (1 + second.delta) - 1,
    offsetCm1: (1 + second.delta) * first.offsetCm1 + second.offsetCm1,
  };
}

/** The trace with its axis calibrated (absorbance shared, axis new). */
export function calibrationTraceApply(trace: Trace, cal: AxisCalibration): Trace {
  return { wavenumberCm1: calibrationApply(trace.wavenumberCm1, cal), absorbance: trace.absorbance };
}

/** The trace with a calibration taken back off (exact inverse of calibrationTraceApply up to round-off). */
export function calibrationTraceRevert(trace: Trace, cal: AxisCalibration): Trace {
  return { wavenumberCm1: calibrationRevert(trace.wavenumberCm1, cal), absorbance: trace.absorbance };
}
