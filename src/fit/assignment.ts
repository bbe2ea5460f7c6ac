import type { BandModel, TransitionQuanta } from '../physics/model';
import { transitionCheck } from '../physics/transitionCheck';

/**
 * One assignment of quantum numbers to an observed position. One observed peak may carry
 * several assignments (a blend), each its own Assignment sharing the same peakId.
 * The l-sign (Coriolis component) of a perpendicular band is implied by ΔK = K' − K''.
 */
export interface Assignment extends TransitionQuanta {
  /** Stable identifier (unique within a project or line table). */
  id: string;
  /** Observed position, cm^-1. */
  observedCm1: number;
  /** 1σ uncertainty of the position, cm^-1; the fit weights the line by 1/σ². */
  uncertaintyCm1: number;
  /** The observed peak holds more than one transition. */
  isBlended: boolean;
  /** Kept in the table but left out of the fit. */
  isExcluded: boolean;
  /** Free text (untrusted). */
  note: string;
  /** Identifier of the observed peak this assignment belongs to, if any. */
  peakId?: string;
}

/** Default 1σ uncertainty of a line position when none is given, cm^-1 (headless contract). */
export const ASSIGNMENT_DEFAULT_UNCERTAINTY_CM1 = 0.001;

/**
 * Why quantum numbers cannot be assigned in this band, or null when they can.
 * Refuses non-integers, negative J, K > J, |ΔJ| > 1, a ΔK the band type forbids and the
 * missing Q/K = 0 lines (delegates to physics/transitionCheck).
 * @param q quantum numbers J', K', J'', K''
 * @param model band type and rotor shape
 * @returns a sentence naming the offending value, or null
 */
export function assignmentCheck(q: TransitionQuanta, model: Pick<BandModel, 'band' | 'shape'>): string | null {
  return transitionCheck(q, model.band, model.shape);
}
