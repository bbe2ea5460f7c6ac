import { PARAMETER_NAMES } from '../physics/model';
import { ASSIGNMENT_MAX_J, assignmentCheck } from './assignment';
import { fitParameterKeys } from './bandDesign';
import type { FitError, FitInput } from './fitTypes';

/**
 * True only when assignmentCheck would accept the line (same rules, no allocation): a cheap
 * first pass so the per-line check of a large fit stays fast; anything else goes to
 * assignmentCheck for the full reason. Kept equal to assignmentCheck by a property test.
 */
export function quantaQuickValid(jUpper: number, kUpper: number, jLower: number, kLower: number, band: string, shape: string): boolean {
  if (!(Number.isInteger(jUpper) && Number.isInteger(kUpper) && Number.isInteger(jLower) && Number.isInteger(kLower))) return false;
  if (kUpper < 0 || kLower < 0 || kUpper > jUpper || kLower > jLower) return false;
  if (jUpper > ASSIGNMENT_MAX_J || jLower > ASSIGNMENT_MAX_J) return false;
  const deltaJ = jUpper - jLower;
  if (deltaJ < -1 || deltaJ > 1) return false;
  if (shape === 'linear') {
    if (kLower !== 0) return false;
    return band === 'parallel' ? kUpper === 0 && deltaJ !== 0 : kUpper === 1;
  }
  const deltaK = kUpper - kLower;
  if (band === 'parallel') {
    if (deltaK !== 0 || (deltaJ === 0 && kLower === 0)) return false;
  } else if (deltaK !== 1 && deltaK !== -1) return false;
  return !(deltaJ === 0 && jLower === 0);
}

function badInput(message: string, parameters: string[] = [], suggestion = 'Correct the input and fit again.'): FitError {
  return { kind: 'bad-input', message, parameters, suggestion, fixSuggested: [] };
}

/**
 * Validate a FitInput once at the entry of fitBand: model values finite, floated keys known
 * for the shape and not repeated, every line's quantum numbers allowed in the band, observed
 * positions finite, uncertainties finite and > 0.
 * @returns a FitError of kind 'bad-input' naming the offending field and value, or null
 */
export function fitCheck(input: FitInput): FitError | null {
  const { model, floated, lines } = input;
  if (!model || typeof model !== 'object') return badInput('fitBand: model is missing');
  if (!['prolate', 'oblate', 'linear'].includes(model.shape))
    return badInput(`fitBand: model.shape must be prolate, oblate or linear, got '${String(model.shape)}'`);
  if (!['parallel', 'perpendicular'].includes(model.band))
    return badInput(`fitBand: model.band must be parallel or perpendicular, got '${String(model.band)}'`);
  for (const side of ['lower', 'upper'] as const) {
    for (const name of PARAMETER_NAMES) {
      const v = model[side]?.[name];
      if (typeof v !== 'number' || !Number.isFinite(v)) {
        return badInput(`fitBand: ${side}.${name} must be a finite number, got ${String(v)}`, [`${side}.${name}`]);
      }
    }
  }
  const allowed = new Set(fitParameterKeys(model.shape));
  const seen = new Set<string>();
  for (const key of floated) {
    if (!allowed.has(key)) {
      return badInput(`fitBand: '${key}' is not a constant of a ${model.shape} model; floatable keys are ${[...allowed].join(', ')}`, [
        key,
      ]);
    }
    if (seen.has(key)) return badInput(`fitBand: '${key}' is listed twice in floated`, [key]);
    seen.add(key);
  }
  if (!Array.isArray(lines)) return badInput('fitBand: lines must be an array');
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i];
    const where = `fitBand: lines[${i}]`;
    if (!quantaQuickValid(line.jUpper, line.kUpper, line.jLower, line.kLower, model.band, model.shape)) {
      const why = assignmentCheck(line, model);
      if (why) return badInput(`${where}: ${why}`);
    }
    if (typeof line.observedCm1 !== 'number' || !Number.isFinite(line.observedCm1)) {
      return badInput(`${where}: observedCm1 must be a finite wavenumber in cm^-1, got ${String(line.observedCm1)}`);
    }
    if (typeof line.uncertaintyCm1 !== 'number' || !Number.isFinite(line.uncertaintyCm1) || line.uncertaintyCm1 <= 0) {
      return badInput(`${where}: uncertaintyCm1 must be a finite number > 0 (cm^-1), got ${String(line.uncertaintyCm1)}`);
    }
  }
  return null;
}
