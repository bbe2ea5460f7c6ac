/**
 * A starting band model from a band-shape diagnosis: the band type the profile implies, its origin,
 * B where the trace showed it, and for a Q-branch series the upper unique constant that reproduces
 * the measured Q-branch spacing with the current ζ and B′.
 */
import { shapeUniqueName, type BandModel, type TopShape } from '../physics/model';
import type { BandShapeClassification } from './bandShapeClassify';

/** What bandShapeStartModel returns: the model and each change in words. */
export interface BandShapeStartModel {
  model: BandModel;
  changes: string[];
}

/**
 * Build a starting model from a diagnosis, keeping everything the diagnosis does not speak to.
 * Linear types give a linear model; symmetric-top types keep the current top's shape (prolate or
 * oblate cannot be told from the profile) or take prolate from a linear one. A Q-series spacing Δ
 * sets A′ (C′) from Δ = 2[A′(1−ζ) − B′] with the current ζ and B′ (Herzberg II (1945) ch. IV).
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
