/** The truth of one trace in test/fixtures/independent_traces/cases.json (written by make_traces.py). */
import { SECOND_RADIATION_CM_K } from '../../src/physics/constants';
import type { ApodizationName } from '../../src/physics/instrumentLineShape';

export interface IndependentCase {
  name: string;
  shape: 'prolate' | 'oblate' | 'linear';
  band: 'parallel' | 'perpendicular';
  /** Molecular mass, amu. */
  mass: number;
  /** Temperature, K. */
  temperature: number;
  /** Constants of each state, cm^-1 (upper: origin, and zeta dimensionless). */
  lower: Record<string, number>;
  upper: Record<string, number>;
  spinWeights?: number[];
  /** Maximum optical path difference, cm. */
  opd: number;
  apodization: ApodizationName;
  /** Region, cm^-1. */
  from: number;
  to: number;
  /** Noise σ, absorbance. */
  noiseSigmaAbsorbance: number;
  /** Peak optical depth on the fine grid (at the Doppler width). */
  peakTau: number;
  /** The profile the trace shows ('either' for a faint Q-branch series). */
  expect: { profile: 'PR' | 'PQR' | 'Q-series' | 'either' };
}

/**
 * Highest J″ a model of the case needs: where the lower state's Boltzmann factor falls to e^-11.5
 * (1e-5) on its lowest level of that J, as make_traces.py cuts its levels (plus 3).
 */
export function independentJMax(c: IndependentCase): number {
  const bMin = Math.min(c.lower.B, c.lower.A ?? c.lower.C ?? Infinity);
  return Math.ceil(Math.sqrt((11.5 * c.temperature) / SECOND_RADIATION_CM_K / bMin)) + 3;
}
