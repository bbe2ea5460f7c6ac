/**
 * First-guess model of the built-in fallback demo: an invented prolate symmetric top ("demo
 * molecule", no real species) with a perpendicular band near 1000 cm^-1. Used only when
 * public/demo/model.json cannot be read.
 */
import { stateConstantsFrom, type BandModel } from '../physics/model';

/** Invented constants, cm^-1 (ζ dimensionless); temperature 150 K. */
export function modelDefaultDemo(): BandModel {
  return {
    shape: 'prolate',
    band: 'perpendicular',
    lower: stateConstantsFrom({ B: 0.3512, A: 5.214, DJ: 4.1e-7, DJK: 3.3e-6, DK: 8.6e-5 }),
    upper: stateConstantsFrom({ origin: 1012.37, B: 0.3498, A: 5.187, DJ: 4.0e-7, DJK: 3.2e-6, DK: 8.5e-5, zeta: 0.214 }),
    temperatureK: 150,
    jMax: 45,
    kMax: 9,
    spinWeights: [2, 1, 1],
  };
}

/** Constants floated by default in the fallback demo. */
export const MODEL_DEFAULT_FLOATED = [
  'upper.origin',
  'upper.B',
  'upper.A',
  'upper.zeta',
  'lower.B',
  'upper.DJ',
  'lower.DJ',
  'upper.DJK',
  'lower.DJK',
];
