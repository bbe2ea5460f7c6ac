/** The small invented band shared by the ladder tests (not a real molecule). */
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';

// Invented constants (cm^-1), small enough to count lines by hand.
export const ladderTestModel: BandModel = {
  shape: 'prolate',
  band: 'perpendicular',
  lower: stateConstantsFrom({ B: 0.3, A: 5 }),
  upper: stateConstantsFrom({ origin: 1000, B: 0.299, A: 4.98, zeta: 0.2 }),
  temperatureK: 300,
  jMax: 6,
  kMax: 2,
  spinWeights: [1],
};
