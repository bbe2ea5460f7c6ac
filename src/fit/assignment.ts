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
  /** Band name within its species, in a several-band session (absent: the session's one band). */
  band?: string;
  /** Species (molecule or isotopologue) name, with `band`. */
  species?: string;
  /**
   * Level tags of a several-band line where the band leaves a choice (io/systemLineTable tag_up,
   * tag_lo): A1/A2 members of a split K = 3n pair, s/a inversion components ("a:A2''"), e/f.
   * Absent or "" when J and K alone name the level.
   */
  tagUpper?: string;
  tagLower?: string;
  /** l = sign(kℓ) of a degenerate level (+1, −1; 0 nondegenerate), where the band leaves a choice (l_up, l_lo). */
  lUpper?: -1 | 0 | 1;
  lLower?: -1 | 0 | 1;
}

/** Default 1σ uncertainty of a line position when none is given, cm^-1 (headless contract). */
export const ASSIGNMENT_DEFAULT_UNCERTAINTY_CM1 = 0.001;

/**
 * Largest J (and so K) an assignment may carry: the largest jMax a model file accepts, so every
 * assigned line can also be simulated. A J of 1e12 is a typo, not a level (J(J+1)·B would be ~1e23 cm^-1).
 * io/inputLimits re-exports it as INPUT_LIMITS.maxQuantumJ.
 */
export const ASSIGNMENT_MAX_J = 2000;

/**
 * Why quantum numbers cannot be assigned in this band, or null when they can.
 * Refuses non-integers, negative J, J above ASSIGNMENT_MAX_J, K > J, |ΔJ| > 1, a ΔK the band type
 * forbids and the missing Q/K = 0 lines (delegates to physics/transitionCheck for all but the J limit).
 * @param q quantum numbers J', K', J'', K''
 * @param model band type and rotor shape
 * @returns a sentence naming the offending value, or null
 */
export function assignmentCheck(q: TransitionQuanta, model: Pick<BandModel, 'band' | 'shape'>): string | null {
  const why = transitionCheck(q, model.band, model.shape);
  if (why) return why;
  // transitionCheck has passed, so K <= J: checking J bounds K too.
  if (q.jUpper > ASSIGNMENT_MAX_J) return `J_up=${q.jUpper} is above the largest J handled (${ASSIGNMENT_MAX_J})`;
  if (q.jLower > ASSIGNMENT_MAX_J) return `J_lo=${q.jLower} is above the largest J handled (${ASSIGNMENT_MAX_J})`;
  return null;
}
