import { PARAMETER_NAMES, type BandModel } from '../model';
import type { SystemModel } from './systemModel';

/** Name given to the one species and the one band of a single-band model read as a system. */
export const SINGLE_BAND_SPECIES = 'molecule';
export const SINGLE_BAND_BAND = 'band';

/**
 * A single-band model as a system: one species with states `lower` (origin 0, nondegenerate) and
 * `upper` (degenerate when the band is perpendicular), one band `band` of strength 1, so its fit keys
 * stay `upper.B`, `lower.B`, `upper.origin`. Every constant of the old model is carried over, ζ of
 * a parallel band included (it then has no effect, as before).
 * @param model single-band model (cm^-1, K)
 * @param speciesName species name @default 'molecule'
 */
export function systemFromBandModel(model: BandModel, speciesName = SINGLE_BAND_SPECIES): SystemModel {
  const constants = (side: 'lower' | 'upper'): Record<string, number> => {
    const out: Record<string, number> = {};
    for (const name of PARAMETER_NAMES) if (model[side][name] !== 0) out[name] = model[side][name];
    if (side === 'lower') delete out.origin;
    return out;
  };
  return {
    temperatureK: model.temperatureK,
    jMax: model.jMax,
    kMax: model.kMax,
    species: [
      {
        name: speciesName,
        shape: model.shape,
        abundance: 1,
        spinWeights: [...model.spinWeights],
        states: [
          { name: 'lower', isDegenerate: false, constants: constants('lower') },
          { name: 'upper', isDegenerate: model.band === 'perpendicular', constants: constants('upper') },
        ],
        bands: [{ name: SINGLE_BAND_BAND, upper: 'upper', lower: 'lower', strength: 1 }],
      },
    ],
  };
}
