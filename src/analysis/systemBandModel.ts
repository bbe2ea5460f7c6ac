/**
 * One band of a system as the single-band model it corresponds to, for the tools written for one
 * band (the assignment assistant): the inverse of physics/system/systemFromBandModel.ts.
 */
import type { SystemParameter } from '../fit/systemFitTypes';
import { PARAMETER_NAMES, stateConstantsFrom, type BandModel, type ParameterName, type StateConstants } from '../physics/model';
import type { SystemModel, SystemState } from '../physics/system/systemModel';

/** A system band as a single-band model, or why it cannot be one. */
export type SystemBandModel =
  | {
      ok: true;
      model: BandModel;
      /** Band-model keys ("upper.B", "lower.DJ", "upper.origin") whose system constant is floated (or tied to a floated one). */
      floatable: string[];
      /** Plain words: what the single-band model leaves out (kept at 0 or at its value in the band's runs). */
      notes: string[];
    }
  | { ok: false; reason: string };

const BAND_MODEL_NAMES = new Set<string>(PARAMETER_NAMES);

/**
 * The single-band model of band `bandName` of species `speciesIndex`: shape, band type (parallel
 * when the upper state is nondegenerate, perpendicular when it is degenerate), lower state's
 * constants as `lower` (origin 0) and upper state's as `upper` with upper.origin = G′ − G″ (the band
 * origin, cm^-1), the system's temperature, J and K limits and the species' spin weights.
 * Refused, in words, when the single-band model cannot express the band: a pure rotational band
 * (upper = lower state), a degenerate lower state (hot band from a degenerate level, whose levels
 * carry ±l), or a constant the single-band model lacks (e.g. qJ) with a value other than 0.
 * @param model the system (constants in cm^-1)
 * @param parameters the system's parameters with their status (floated, fixed, tied)
 * @param speciesIndex index of the species
 * @param bandName the band's name within the species
 */
export function systemBandModel(
  model: SystemModel,
  parameters: readonly SystemParameter[],
  speciesIndex: number,
  bandName: string,
): SystemBandModel {
  const species = model.species[speciesIndex];
  if (!species) return { ok: false, reason: `species index ${speciesIndex} does not exist` };
  const band = species.bands.find((b) => b.name === bandName);
  if (!band) return { ok: false, reason: `species '${species.name}' has no band '${bandName}'` };
  const upper = species.states.find((s) => s.name === band.upper);
  const lower = species.states.find((s) => s.name === band.lower);
  if (!upper || !lower) return { ok: false, reason: `band '${bandName}' names a state species '${species.name}' does not have` };
  if (upper.name === lower.name)
    return {
      ok: false,
      reason: `band '${bandName}' is the pure rotational spectrum of state '${upper.name}' (microwave lines), not a band of an infrared trace`,
    };
  if (lower.isDegenerate)
    return {
      ok: false,
      reason:
        `band '${bandName}' starts from the degenerate state '${lower.name}' (a hot band within a degenerate mode, whose lower ` +
        `levels carry ±l): the single-band model has a nondegenerate lower state, so the assistant cannot run on it; assign its lines by hand`,
    };
  const notes: string[] = [];
  const side = (state: SystemState, which: 'upper' | 'lower'): StateConstants | string => {
    const out: Partial<StateConstants> = {};
    for (const [name, value] of Object.entries(state.constants)) {
      if (BAND_MODEL_NAMES.has(name)) {
        out[name as ParameterName] = value;
        continue;
      }
      if (value !== 0) return `state '${state.name}' has ${name} = ${value}, which the single-band model cannot hold`;
      if (isFloatable(parameters, speciesIndex, state.name, name))
        notes.push(`${state.name}.${name} stays 0 in the band's own runs (the joint fit floats it)`);
    }
    const c = stateConstantsFrom(out);
    if (which === 'lower') {
      // ζ and q act only in a degenerate state; the lower state here is nondegenerate.
      c.origin = 0;
      c.zeta = 0;
      c.q = 0;
    }
    return c;
  };
  const up = side(upper, 'upper');
  if (typeof up === 'string') return { ok: false, reason: `band '${bandName}': ${up}` };
  const lo = side(lower, 'lower');
  if (typeof lo === 'string') return { ok: false, reason: `band '${bandName}': ${lo}` };
  up.origin = (upper.constants.origin ?? 0) - (lower.constants.origin ?? 0);
  const floatable: string[] = [];
  for (const name of PARAMETER_NAMES) {
    if (name === 'origin') {
      if (isFloatable(parameters, speciesIndex, upper.name, 'origin') || isFloatable(parameters, speciesIndex, lower.name, 'origin'))
        floatable.push('upper.origin');
      continue;
    }
    if (isFloatable(parameters, speciesIndex, upper.name, name)) floatable.push(`upper.${name}`);
    if (name !== 'zeta' && name !== 'q' && isFloatable(parameters, speciesIndex, lower.name, name)) floatable.push(`lower.${name}`);
  }
  return {
    ok: true,
    model: {
      shape: species.shape,
      band: upper.isDegenerate ? 'perpendicular' : 'parallel',
      lower: lo,
      upper: up,
      temperatureK: model.temperatureK,
      jMax: model.jMax,
      kMax: species.shape === 'linear' ? 0 : model.kMax,
      spinWeights: [...species.spinWeights],
    },
    floatable,
    notes,
  };
}

/** True when the constant is floated, or tied to a floated one. */
function isFloatable(parameters: readonly SystemParameter[], speciesIndex: number, state: string, name: string): boolean {
  const p = parameters.find((q) => q.speciesIndex === speciesIndex && q.state === state && q.name === name);
  if (!p) return false;
  if (p.status === 'floated') return true;
  if (p.status !== 'tied') return false;
  return parameters.find((q) => q.key === p.same)?.status === 'floated';
}
