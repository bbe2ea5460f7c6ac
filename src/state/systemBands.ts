/**
 * Pure helpers of a several-band page session: the bands of a system with their single-band view
 * (the BandModel the one-band panels edit), fit keys, the floated set, and writing an edited view
 * back into the system. No store, no React.
 */
import type { SystemParameter } from '../fit/systemFitTypes';
import { systemAllowedParameters, systemSymmetryAllowedParameters } from '../io/systemFile';
import { interactionStateAllowed } from '../io/systemInteractions';
import { interactionParameterNames } from '../physics/interaction/interactionTerms';
import { PARAMETER_NAMES, stateConstantsFrom, type BandModel, type StateConstants } from '../physics/model';
import type { SystemInteraction, SystemModel, SystemSpecies, SystemState } from '../physics/system/systemModel';

/** One band of a system as the page lists it. */
export interface SystemBandEntry {
  /** "species/band", unique in the system. */
  key: string;
  speciesIndex: number;
  species: string;
  band: string;
  upper: string;
  lower: string;
  /** The band as a single-band model (lower state's origin taken as 0), or null when it cannot be one. */
  view: BandModel | null;
  /** Why the band has no single-band view (the one-band panels cannot show it), else null. */
  viewWhyNot: string | null;
}

/** The page key of a band: "species/band". */
export function bandKeyOf(species: string, band: string): string {
  return `${species}/${band}`;
}

/** The band key of an assignment or candidate that names its band (null for a single-band one). */
export function bandKeyOfLine(x: { band?: string; species?: string }): string | null {
  return x.band !== undefined && x.species !== undefined ? bandKeyOf(x.species, x.band) : null;
}

/**
 * Fit key of a constant in a system: "<state>.<constant>" with one species,
 * "<species>/<state>.<constant>" with several (as io/systemFile.ts names them).
 */
export function systemParamKey(system: SystemModel, speciesIndex: number, state: string, name: string): string {
  return system.species.length > 1 ? `${system.species[speciesIndex].name}/${state}.${name}` : `${state}.${name}`;
}

/** Origin of a state above the species' lowest state, cm^-1 (absent = 0). */
function originOf(state: SystemState): number {
  return state.constants.origin ?? 0;
}

/**
 * The single-band view of a band: lower = the lower state's constants with origin 0, upper = the
 * upper state's with origin G′ − G″ (the band origin). A band from a degenerate lower state, or a
 * state's own rotational spectrum, has none (the single-band model has no such bands).
 * @returns the view, or a sentence saying why there is none
 */
export function systemBandView(
  system: SystemModel,
  speciesIndex: number,
  bandName: string,
): { view: BandModel | null; why: string | null } {
  const sp = system.species[speciesIndex];
  const band = sp.bands.find((b) => b.name === bandName);
  if (!band) return { view: null, why: `species '${sp.name}' has no band '${bandName}'` };
  const lo = sp.states.find((s) => s.name === band.lower);
  const up = sp.states.find((s) => s.name === band.upper);
  if (!lo || !up) return { view: null, why: `band '${bandName}' names a state the species does not have` };
  if (lo === up)
    return { view: null, why: 'a pure rotational band (its lines are listed and fitted, but the one-band panels cannot show it)' };
  if (lo.isDegenerate)
    return { view: null, why: 'its lower state is degenerate (its lines are drawn and fitted, but the one-band panels cannot show it)' };
  const side = (st: SystemState): StateConstants => {
    const c: Partial<StateConstants> = {};
    for (const n of PARAMETER_NAMES) if (st.constants[n] !== undefined) c[n] = st.constants[n];
    return stateConstantsFrom(c);
  };
  const lower = side(lo);
  lower.origin = 0;
  const upper = side(up);
  upper.origin = originOf(up) - originOf(lo);
  return {
    view: {
      shape: sp.shape,
      band: up.isDegenerate ? 'perpendicular' : 'parallel',
      lower,
      upper,
      temperatureK: system.temperatureK,
      jMax: system.jMax,
      kMax: system.kMax,
      spinWeights: [...sp.spinWeights],
    },
    why: null,
  };
}

/** Every band of every species, in system order, with its single-band view. */
export function systemBandEntries(system: SystemModel): SystemBandEntry[] {
  const out: SystemBandEntry[] = [];
  system.species.forEach((sp, speciesIndex) => {
    for (const b of sp.bands) {
      const { view, why } = systemBandView(system, speciesIndex, b.name);
      out.push({
        key: bandKeyOf(sp.name, b.name),
        speciesIndex,
        species: sp.name,
        band: b.name,
        upper: b.upper,
        lower: b.lower,
        view,
        viewWhyNot: why,
      });
    }
  });
  return out;
}

/**
 * Constants a state uses, as the system file allows them (io/systemFile.ts): a state joined by an
 * interaction or a nondegenerate one giving h3 takes the diagonalising providers' set, a state of a
 * species with a point group the effective Hamiltonian's, else the closed form's; less the
 * species' zero origin.
 */
export function systemStateConstantNames(sp: SystemSpecies, st: SystemState): string[] {
  const lowest = sp.states.reduce((a, b) => (originOf(b) < originOf(a) ? b : a), sp.states[0]);
  const isCoupled = (sp.interactions ?? []).some((it) => it.states.includes(st.name)) || (!st.isDegenerate && 'h3' in st.constants);
  const allowed =
    isCoupled && sp.shape !== 'linear'
      ? interactionStateAllowed(sp.shape, st.isDegenerate)
      : st.symmetry && sp.shape !== 'linear'
        ? systemSymmetryAllowedParameters(sp.shape, st.isDegenerate, st.symmetry)
        : systemAllowedParameters(sp.shape, st.isDegenerate);
  return allowed.filter((n) => n !== 'origin' || st !== lowest);
}

/** Constants an interaction of a species carries (physics/interaction/interactionTerms.ts), [] when its states are not found. */
export function systemInteractionConstantNames(sp: SystemSpecies, it: SystemInteraction): string[] {
  const [a, b] = it.states.map((n) => sp.states.find((st) => st.name === n));
  if (!a || !b) return [];
  const names = interactionParameterNames(it.type, a.isDegenerate, b.isDegenerate);
  return typeof names === 'string' ? [] : names;
}

/**
 * Every constant of the system with its fit status: floated when its key is in `floated`, tied when
 * `ties` names a target for it, else fixed (values from the system's states).
 * @param ties fit key → the key it follows
 */
export function systemParameters(
  system: SystemModel,
  floated: readonly string[],
  ties: Readonly<Record<string, string>> = {},
): SystemParameter[] {
  const isFloated = new Set(floated);
  const out: SystemParameter[] = [];
  system.species.forEach((sp, speciesIndex) => {
    const owners: { name: string; constants: Record<string, number>; names: string[] }[] = [
      ...sp.states.map((st) => ({ name: st.name, constants: st.constants, names: systemStateConstantNames(sp, st) })),
      // Interaction constants have keys "<interaction>.<constant>", like a state's.
      ...(sp.interactions ?? []).map((it) => ({ name: it.name, constants: it.constants, names: systemInteractionConstantNames(sp, it) })),
    ];
    for (const st of owners) {
      for (const name of st.names) {
        const key = systemParamKey(system, speciesIndex, st.name, name);
        const same = ties[key];
        const p: SystemParameter = {
          key,
          speciesIndex,
          state: st.name,
          name,
          value: st.constants[name] ?? 0,
          status: same ? 'tied' : isFloated.has(key) ? 'floated' : 'fixed',
        };
        if (same) p.same = same;
        out.push(p);
      }
    }
  });
  return out;
}

/**
 * The floated keys of a band's single-band view ("upper.B", "lower.DJ") from the system's floated set.
 * @param entry a band with a view
 */
export function systemFloatedToView(system: SystemModel, floated: readonly string[], entry: SystemBandEntry): string[] {
  const isFloated = new Set(floated);
  const out: string[] = [];
  for (const side of ['upper', 'lower'] as const) {
    const state = side === 'upper' ? entry.upper : entry.lower;
    for (const name of PARAMETER_NAMES) {
      if (side === 'lower' && name === 'origin') continue;
      if (isFloated.has(systemParamKey(system, entry.speciesIndex, state, name))) out.push(`${side}.${name}`);
    }
  }
  return out;
}

/** Copy tied constants' values from the constants they follow (after an edit of the target). */
export function systemTiesApply(system: SystemModel, ties: Readonly<Record<string, string>>): SystemModel {
  if (Object.keys(ties).length === 0) return system;
  const valueOf = new Map<string, number>();
  system.species.forEach((sp, i) => {
    for (const st of sp.states) for (const [n, v] of Object.entries(st.constants)) valueOf.set(systemParamKey(system, i, st.name, n), v);
  });
  return {
    ...system,
    species: system.species.map((sp, i) => ({
      ...sp,
      states: sp.states.map((st) => {
        let constants = st.constants;
        for (const n of Object.keys(constants)) {
          const target = ties[systemParamKey(system, i, st.name, n)];
          if (target !== undefined && valueOf.has(target) && valueOf.get(target) !== constants[n]) {
            constants = constants === st.constants ? { ...constants } : constants;
            constants[n] = valueOf.get(target)!;
          }
        }
        return constants === st.constants ? st : { ...st, constants };
      }),
    })),
  };
}

/**
 * Write an edited single-band view back into the system: the lower state's constants (its origin
 * kept), the upper state's (origin = band origin + G″), the species' shape and spin weights, the
 * system's temperature and J/K limits, and the floated flags of both states' constants. A state
 * shared with other bands changes for them too (one state, one set of constants).
 * @param entry the band the view belongs to
 * @param model the edited view
 * @param viewFloated the view's floated keys ("upper.B")
 */
export function systemApplyView(
  system: SystemModel,
  floated: readonly string[],
  ties: Readonly<Record<string, string>>,
  entry: SystemBandEntry,
  model: BandModel,
  viewFloated: readonly string[],
): { system: SystemModel; floated: string[] } {
  const sp = system.species[entry.speciesIndex];
  const lo = sp.states.find((s) => s.name === entry.lower)!;
  const isViewFloated = new Set(viewFloated);
  const floatedSet = new Set(floated);
  const write = (st: SystemState, side: 'upper' | 'lower'): SystemState => {
    const constants: Record<string, number> = { ...st.constants };
    for (const name of systemStateConstantNames(sp, st)) {
      if (!(PARAMETER_NAMES as readonly string[]).includes(name)) continue;
      if (side === 'lower' && name === 'origin') continue;
      const key = systemParamKey(system, entry.speciesIndex, st.name, name);
      if (ties[key]) continue;
      let v = model[side][name as keyof StateConstants];
      if (side === 'upper' && name === 'origin') v += originOf(lo);
      if (v !== 0 || constants[name] !== undefined) constants[name] = v;
      if (isViewFloated.has(`${side}.${name}`)) floatedSet.add(key);
      else floatedSet.delete(key);
    }
    return { ...st, constants };
  };
  const states = sp.states.map((st) => (st.name === entry.lower ? write(st, 'lower') : st));
  const upIndex = states.findIndex((s) => s.name === entry.upper);
  // The view's band type is the upper state's degeneracy (the lower state of a view is nondegenerate).
  states[upIndex] = { ...write(states[upIndex], 'upper'), isDegenerate: model.band === 'perpendicular' };
  const species = system.species.map((s, i) =>
    i === entry.speciesIndex ? { ...s, shape: model.shape, spinWeights: [...model.spinWeights], states } : s,
  );
  const next = systemTiesApply({ ...system, temperatureK: model.temperatureK, jMax: model.jMax, kMax: model.kMax, species }, ties);
  return { system: next, floated: [...floatedSet] };
}

/**
 * A first floated set for a system without one: every nonzero constant of every state but the
 * unique-axis constant (A or C) of each species' lowest state, which IR bands alone determine poorly.
 */
export function systemFloatedDefault(system: SystemModel): string[] {
  const out: string[] = [];
  system.species.forEach((sp, i) => {
    const lowest = sp.states.reduce((a, b) => (originOf(b) < originOf(a) ? b : a), sp.states[0]);
    const owners: { name: string; constants: Record<string, number>; names: string[] }[] = [
      ...sp.states.map((st) => ({ name: st.name, constants: st.constants, names: systemStateConstantNames(sp, st) })),
      // Interaction constants have keys "<interaction>.<constant>", like a state's.
      ...(sp.interactions ?? []).map((it) => ({ name: it.name, constants: it.constants, names: systemInteractionConstantNames(sp, it) })),
    ];
    for (const st of owners) {
      for (const name of st.names) {
        if ((st.constants[name] ?? 0) === 0) continue;
        if (st.name === lowest.name && (name === 'A' || name === 'C')) continue;
        if (name.startsWith('H') || name === 'DK') continue;
        out.push(systemParamKey(system, i, st.name, name));
      }
    }
  });
  return out;
}

/**
 * The current value of a constant named by its fit key ("state.B" or "species/state.B"), NaN when
 * the system has no such state or interaction (cm^-1; ζ dimensionless; an absent constant is 0).
 */
export function systemValueOf(system: SystemModel, key: string): number {
  const slash = key.indexOf('/');
  const sp = slash >= 0 ? system.species.find((x) => x.name === key.slice(0, slash)) : system.species[0];
  const rest = key.slice(slash + 1);
  const dot = rest.lastIndexOf('.');
  const owner = rest.slice(0, dot);
  const st = sp?.states.find((x) => x.name === owner) ?? sp?.interactions?.find((x) => x.name === owner);
  return st ? (st.constants[rest.slice(dot + 1)] ?? 0) : NaN;
}
