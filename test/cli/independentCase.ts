/** The truth of one trace in test/fixtures/independent_traces/cases.json (written by make_traces.py). */
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
