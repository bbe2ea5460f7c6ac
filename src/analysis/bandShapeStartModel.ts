/**
 * A starting band model from a band-shape diagnosis: the band type the profile implies, its origin,
 * B where the trace showed it, and for a Q-branch series the upper unique constant that reproduces
 * the measured Q-branch spacing with the current ζ and B′; J″ (and K″) reaching as far as the band is
 * populated at the model's temperature.
 */
import { SECOND_RADIATION_CM_K } from '../physics/constants';
import { shapeUniqueName, type BandModel, type ParameterName, type TopShape } from '../physics/model';
import type { BandShapeClassification } from './bandShapeClassify';

/** What bandShapeStartModel returns: the model and each change in words. */
export interface BandShapeStartModel {
  model: BandModel;
  changes: string[];
}

/** Population below this fraction of the band's strongest level is left out of jMax and kMax. */
const POPULATION_CUT = 1e-3;
/** Largest J″ (and K″) a starting model asks for (a heavy molecule at 400 K stays below it). */
const J_MAX_START = 400;
/** Centrifugal distortion constants, which belong to the molecule whose B they were fitted with. */
const DISTORTION: ParameterName[] = ['DJ', 'DJK', 'DK', 'HJ', 'HJK', 'HKJ', 'HK'];
/** B changed by more than this fraction: the previous model's distortion constants are set to 0. */
const DISTORTION_RESET_B_CHANGE = 0.1;

/**
 * Smallest J above the most populated one whose population (2J + 1)·exp(−B·J(J + 1)·c2/T) falls
 * under POPULATION_CUT of the largest (Boltzmann distribution of a rigid rotor, Herzberg II (1945)
 * ch. I), at most J_MAX_START.
 * @param bCm1 rotational constant B, cm^-1
 * @param temperatureK temperature, K
 */
export function populatedJMax(bCm1: number, temperatureK: number): number {
  if (!(bCm1 > 0) || !(temperatureK > 0)) return J_MAX_START;
  const pop = (j: number) => (2 * j + 1) * Math.exp((-bCm1 * j * (j + 1) * SECOND_RADIATION_CM_K) / temperatureK);
  let peak = 0;
  for (let j = 0; j <= J_MAX_START; j++) peak = Math.max(peak, pop(j));
  for (let j = 1; j <= J_MAX_START; j++) if (pop(j) < POPULATION_CUT * peak && pop(j) < pop(j - 1)) return j;
  return J_MAX_START;
}

/**
 * Smallest K whose factor 2·exp(−(A − B)·K²·c2/T) of a prolate top's level energy falls under
 * POPULATION_CUT of K = 0's, at most jMax (Herzberg II (1945) ch. I).
 */
function populatedKMax(uniqueMinusBCm1: number, temperatureK: number, jMax: number): number {
  const a = Math.abs(uniqueMinusBCm1);
  if (!(a > 0) || !(temperatureK > 0)) return jMax;
  const k = Math.ceil(Math.sqrt((Math.log(2 / POPULATION_CUT) * temperatureK) / (a * SECOND_RADIATION_CM_K)));
  return Math.min(jMax, k);
}

/**
 * Build a starting model from a diagnosis, keeping everything the diagnosis does not speak to.
 * Linear types give a linear model; symmetric-top types keep the current top's shape (prolate or
 * oblate cannot be told from the profile) or take prolate from a linear one. A Q-series spacing Δ
 * sets A′ (C′) from Δ = 2[A′(1−ζ) − B′] with the current ζ and B′ (Herzberg II (1945) ch. IV).
 * When B changes by more than 10 %, the previous model's centrifugal distortion constants (those of
 * another molecule) are set to 0; J″max and K″max are raised to where the band is populated.
 * @param diagnosis result of bandShapeClassify
 * @param current the current model (constants in cm^-1)
 * @returns the new model and the changes in words
 */
export function bandShapeStartModel(diagnosis: BandShapeClassification, current: BandModel): BandShapeStartModel {
  const changes: string[] = [];
  const isLinear = diagnosis.type.startsWith('linear');
  const shape: TopShape = isLinear ? 'linear' : current.shape === 'linear' ? 'prolate' : current.shape;
  const band = diagnosis.type.endsWith('perpendicular') ? 'perpendicular' : 'parallel';
  const model: BandModel = structuredClone(current);
  if (shape !== current.shape || band !== current.band) {
    model.shape = shape;
    model.band = band;
    changes.push(`band type ${current.shape} ${current.band} → ${shape} ${band}`);
  }
  const unique = shapeUniqueName(shape);
  if (!unique) {
    model.lower.A = model.upper.A = model.lower.C = model.upper.C = 0;
    model.upper.zeta = 0;
    model.kMax = 0;
  } else if (current.shape === 'linear') {
    // A top from a linear model: a rough unique constant (A = 5B prolate), ζ 0 until measured.
    model.lower.A = model.upper.A = 5 * model.lower.B;
    model.kMax = Math.max(model.kMax, 15);
    changes.push(`A′ = A″ = 5B (rough; a linear model has none)`);
  }
  if (band === 'parallel') model.upper.zeta = 0;
  model.upper.origin = diagnosis.origin;
  changes.push(`origin ${current.upper.origin.toFixed(3)} → ${diagnosis.origin.toFixed(3)} cm⁻¹`);
  if (diagnosis.B !== null) {
    model.lower.B = diagnosis.B;
    model.upper.B = diagnosis.B;
    changes.push(`B′ = B″ = ${diagnosis.B.toPrecision(4)} cm⁻¹`);
    if (!(Math.abs(diagnosis.B / current.lower.B - 1) <= DISTORTION_RESET_B_CHANGE)) {
      const reset = DISTORTION.filter((k) => model.lower[k] !== 0 || model.upper[k] !== 0);
      for (const k of reset) model.lower[k] = model.upper[k] = 0;
      if (reset.length) changes.push(`${reset.join(', ')} → 0 (the previous model's belong to another B)`);
    }
  }
  // Every populated level: a band cut short at J″max misfits its wings. An oblate top's lowest level
  // of each J is K = J, F ≈ CJ(J + 1), so its levels are populated to higher J than B alone says.
  const lowestRotor = unique === 'C' ? Math.min(model.lower.B, model.lower.C) : model.lower.B;
  const jNeeded = populatedJMax(lowestRotor, model.temperatureK);
  if (jNeeded > model.jMax) {
    changes.push(`J″max ${model.jMax} → ${jNeeded} (populated to 0.1 % of the strongest level at ${model.temperatureK} K)`);
    model.jMax = jNeeded;
  }
  if (unique) {
    // K up to J for an oblate top (its K factor grows with K).
    const uMinusB = model.lower[unique] - model.lower.B;
    const kNeeded = uMinusB < 0 ? model.jMax : populatedKMax(uMinusB, model.temperatureK, model.jMax);
    if (kNeeded > model.kMax) {
      changes.push(`K″max ${model.kMax} → ${kNeeded}`);
      model.kMax = kNeeded;
    }
  }
  if (diagnosis.qSpacing !== undefined && unique) {
    const zeta = model.upper.zeta;
    if (zeta < 1) {
      const value = (Math.abs(diagnosis.qSpacing) / 2 + model.upper.B) / (1 - zeta);
      changes.push(
        `${unique}′ ${model.upper[unique].toPrecision(5)} → ${value.toPrecision(5)} cm⁻¹ (Q spacing with ζ = ${zeta} and B′ kept)`,
      );
      model.upper[unique] = value;
    }
  }
  return { model, changes };
}
