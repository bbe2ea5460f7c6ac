import type { BandModel } from '../physics/model';
import { ASSISTANT_DEFAULTS, type AssistantOptions, type AssistantOptionsResolved } from './assistantTypes';

/** Allowed range of each numeric option: [min, max, whole-number?]. */
const RANGES: Record<keyof AssistantOptions, [number, number, boolean]> = {
  toleranceSigma: [0.5, 20, false],
  widthFloorFraction: [0, 2, false],
  positionFloorFraction: [0, 1, false],
  blendWidthRatio: [1.0001, 10, false],
  widthNeighbours: [1, 1000, true],
  blendUncertaintyFraction: [0, 5, false],
  dominanceRatio: [1, 1000, false],
  blendPartnerFraction: [0, 1, false],
  minPredictedSnr: [0, 1e6, false],
  intensityRatioMax: [1, 1e6, false],
  maxWindowFwhm: [0.05, 1000, false],
  reachJStep: [1, 1000, true],
  maxIterations: [1, 10000, true],
  outlierSigma: [0.5, 100, false],
  excludeSigma: [0.5, 100, false],
  fallbackSigmaCm1: [1e-9, 1e3, false],
};

/**
 * Fill in the defaults of AssistantOptions and check every given value.
 * fallbackSigmaCm1 defaults to 0.1 × 2B'' (a tenth of the rotational line spacing), or 0.05 cm^-1
 * when B'' is 0.
 * @param model the band model (for the default fallback σ)
 * @param options the caller's options
 * @throws Error naming the option and its value when it is not a number in range
 */
export function assistantOptionsResolve(model: Pick<BandModel, 'lower'>, options: AssistantOptions = {}): AssistantOptionsResolved {
  for (const [name, value] of Object.entries(options)) {
    if (value === undefined) continue;
    const range = RANGES[name as keyof AssistantOptions];
    if (!range) throw new Error(`assistant: unknown option '${name}' (known: ${Object.keys(RANGES).join(', ')})`);
    const [min, max, whole] = range;
    if (typeof value !== 'number' || !Number.isFinite(value) || value < min || value > max || (whole && !Number.isInteger(value))) {
      throw new Error(`assistant: option ${name} must be a${whole ? ' whole' : ''} number in [${min}, ${max}], got ${String(value)}`);
    }
  }
  const b = Math.abs(model.lower.B);
  return {
    ...ASSISTANT_DEFAULTS,
    fallbackSigmaCm1: b > 0 ? 0.2 * b : 0.05,
    ...Object.fromEntries(Object.entries(options).filter(([, v]) => v !== undefined)),
  } as AssistantOptionsResolved;
}
