/**
 * Pure edits of a system from the model panel's tree: a constant of a state, a species' abundance
 * or mass, a new isotopologue scaled from its parent, a new hot band built on an excited state.
 * Each returns a new system (and the fit keys to float), or throws an Error whose sentence says
 * what is wrong.
 */
import type { SystemModel, SystemSpecies, SystemState } from '../physics/system/systemModel';
import { systemParamKey } from './systemBands';

const NAME_RE = /^[^./\s,"]{1,80}$/;

function checkName(name: string, what: string): void {
  if (!NAME_RE.test(name)) throw new Error(`${what} '${name}' cannot be used: 1 to 80 characters without ".", "/", ",", quotes or spaces`);
}

/** Set one constant of one state (cm^-1; ζ dimensionless). */
export function systemSetConstant(system: SystemModel, speciesIndex: number, state: string, name: string, value: number): SystemModel {
  if (!Number.isFinite(value)) throw new Error(`${name} of ${state} must be a finite number, got ${value}`);
  return {
    ...system,
    species: system.species.map((sp, i) =>
      i !== speciesIndex
        ? sp
        : { ...sp, states: sp.states.map((st) => (st.name === state ? { ...st, constants: { ...st.constants, [name]: value } } : st)) },
    ),
  };
}

/** Set a constant (cm^-1) of an interaction of a species (the system is not changed in place). */
export function systemSetInteractionConstant(
  system: SystemModel,
  speciesIndex: number,
  interaction: string,
  name: string,
  value: number,
): SystemModel {
  if (!Number.isFinite(value)) throw new Error(`${name} of ${interaction} must be a finite number, got ${value}`);
  return {
    ...system,
    species: system.species.map((sp, i) =>
      i !== speciesIndex || !sp.interactions
        ? sp
        : {
            ...sp,
            interactions: sp.interactions.map((it) =>
              it.name === interaction ? { ...it, constants: { ...it.constants, [name]: value } } : it,
            ),
          },
    ),
  };
}

/** Set a species' relative abundance (>= 0) or mass (amu, > 0). */
export function systemSetSpecies(system: SystemModel, speciesIndex: number, field: 'abundance' | 'massAmu', value: number): SystemModel {
  if (field === 'abundance' && !(Number.isFinite(value) && value >= 0))
    throw new Error(`the abundance must be a number >= 0, got ${value}`);
  if (field === 'massAmu' && !(Number.isFinite(value) && value > 0)) throw new Error(`the mass must be a number > 0 amu, got ${value}`);
  return { ...system, species: system.species.map((sp, i) => (i === speciesIndex ? { ...sp, [field]: value } : sp)) };
}

/**
 * A fit key in the several-species form "species/state.name" (a one-species system's keys have no
 * species part; they gain that species' name).
 */
export function systemKeyWithSpecies(key: string, system: SystemModel): string {
  return key.includes('/') ? key : `${system.species[0].name}/${key}`;
}

/** What a new isotopologue needs. */
export interface IsotopologueInput {
  /** Index of the parent species. */
  parentIndex: number;
  name: string;
  /** Mass of the isotopologue, amu (the parent's mass must be known for the default factor). */
  massAmu: number;
  /** Relative abundance (the parent's keeps its own). */
  abundance: number;
  /** Factor on B (and on A or C when isUniqueScaled): default parent mass / new mass. */
  rotationalFactor: number;
  /** Scale A (C) too: true when the substituted atom lies off the symmetry axis. */
  isUniqueScaled: boolean;
}

/**
 * The default factor on B of an isotopologue: m/m′, as if every moment of inertia grew in
 * proportion to the whole molecule's mass. A rough estimate: the true ratio is that of the moments
 * of inertia, which depends on where the substituted atom sits (an atom near the centre of mass
 * changes B hardly at all); it says the size of the shift, the fit must refine it.
 * Source: I = Σ m r² about the centre of mass (Gordy & Cook, Microwave Molecular Spectra (1984) ch. 13, from memory).
 */
export function isotopologueFactorDefault(parentMassAmu: number, massAmu: number): number {
  return parentMassAmu > 0 && massAmu > 0 ? parentMassAmu / massAmu : 1;
}

/** The note shown with an added isotopologue (how its constants were made). */
export function isotopologueNote(input: IsotopologueInput, parent: SystemSpecies): string {
  const f = input.rotationalFactor.toPrecision(6);
  return (
    `${input.name}: constants estimated from ${parent.name}: B ×${f}` +
    (input.isUniqueScaled
      ? `, ${parent.shape === 'oblate' ? 'C' : 'A'} ×${f}`
      : `, ${parent.shape === 'oblate' ? 'C' : 'A'} unchanged (substitution on the axis)`) +
    `, band origins ×${Math.sqrt(input.rotationalFactor).toPrecision(6)} (√ of the factor, as for a harmonic frequency with the mass change), ` +
    `distortion constants ×${(input.rotationalFactor ** 2).toPrecision(6)}, ζ copied. These are estimates to refine by fitting, not measured values.`
  );
}

/**
 * A copy of a species as an isotopologue: every state and band, constants scaled (B by the factor,
 * A or C too when asked, distortion constants by its square (D ∝ B²), origins by its square root),
 * ζ and strengths copied.
 * @returns the new system and the new species' fit keys to float (those floated in the parent)
 */
export function systemAddIsotopologue(
  system: SystemModel,
  floated: readonly string[],
  input: IsotopologueInput,
): { system: SystemModel; floated: string[]; note: string } {
  const parent = system.species[input.parentIndex];
  if (!parent) throw new Error(`there is no species number ${input.parentIndex + 1}`);
  checkName(input.name, 'the species name');
  if (system.species.some((s) => s.name === input.name)) throw new Error(`a species named '${input.name}' exists already`);
  if (!(Number.isFinite(input.massAmu) && input.massAmu > 0)) throw new Error(`the mass must be a number > 0 amu, got ${input.massAmu}`);
  if (!(Number.isFinite(input.abundance) && input.abundance >= 0))
    throw new Error(`the abundance must be a number >= 0, got ${input.abundance}`);
  const f = input.rotationalFactor;
  if (!(Number.isFinite(f) && f > 0.2 && f < 5)) throw new Error(`the factor on B must be a number between 0.2 and 5, got ${f}`);
  const unique = parent.shape === 'oblate' ? 'C' : 'A';
  const scale = (name: string, v: number): number => {
    if (name === 'B' || (name === unique && input.isUniqueScaled)) return v * f;
    if (name === 'origin') return v * Math.sqrt(f);
    if (/^(D|H)/.test(name)) return v * f * f;
    return v;
  };
  const states: SystemState[] = parent.states.map((st) => ({
    ...st,
    constants: Object.fromEntries(Object.entries(st.constants).map(([n, v]) => [n, scale(n, v)])),
  }));
  const species: SystemSpecies = {
    ...parent,
    name: input.name,
    massAmu: input.massAmu,
    abundance: input.abundance,
    spinWeights: [...parent.spinWeights],
    states,
    bands: parent.bands.map((b) => ({ ...b })),
  };
  const next: SystemModel = { ...system, species: [...system.species, species] };
  // Keys change form from "state.B" to "species/state.B" when a second species arrives.
  const out = floated.map((k) => systemKeyWithSpecies(k, system));
  const isFloatedInParent = new Set(out);
  for (const st of states)
    for (const name of Object.keys(st.constants))
      if (isFloatedInParent.has(`${parent.name}/${st.name}.${name}`))
        out.push(systemParamKey(next, next.species.length - 1, st.name, name));
  return { system: next, floated: out, note: isotopologueNote(input, parent) };
}

/** What a new hot band needs. */
export interface HotBandInput {
  speciesIndex: number;
  /** The excited state the hot band starts from (v). */
  lower: string;
  /** A fundamental band of the species (ground → v′) whose quantum the hot band adds. */
  fundamental: string;
  /** Name of the new band. */
  name: string;
}

/**
 * A hot band v + v′ ← v: a new state v+v′ with origin G(v) + G(v′) (the harmonic sum: anharmonic
 * shifts, usually a few cm^-1, are left to the fit), each rotational constant X(v) + X(v′) − X(0)
 * (vibration–rotation α additive), distortion constants and ζ from v′, degeneracy from v′; the
 * band's strength is the fundamental's (harmonic: the v+1 ← v transition moment of another mode
 * equals the fundamental's). Refused when both v and v′ are degenerate (the combination's ℓ = 0, ±2
 * levels are beyond the level model) or v is the lowest state.
 * Source: harmonic-oscillator sum rules and additive α (Herzberg II (1945) ch. II and IV, from memory).
 * @returns the new system, fit keys to float (origin, B, A/C, ζ of the new state) and a note
 */
export function systemAddHotBand(
  system: SystemModel,
  floated: readonly string[],
  input: HotBandInput,
): { system: SystemModel; floated: string[]; note: string } {
  const sp = system.species[input.speciesIndex];
  if (!sp) throw new Error(`there is no species number ${input.speciesIndex + 1}`);
  checkName(input.name, 'the band name');
  if (sp.bands.some((b) => b.name === input.name)) throw new Error(`${sp.name} has a band named '${input.name}' already`);
  const fund = sp.bands.find((b) => b.name === input.fundamental);
  if (!fund) throw new Error(`${sp.name} has no band '${input.fundamental}'`);
  const ground = sp.states.find((s) => s.name === fund.lower)!;
  const added = sp.states.find((s) => s.name === fund.upper)!;
  const lower = sp.states.find((s) => s.name === input.lower);
  if (!lower) throw new Error(`${sp.name} has no state '${input.lower}'`);
  if ((lower.constants.origin ?? 0) <= 0) throw new Error(`'${lower.name}' is the lowest state; a hot band starts from an excited state`);
  if ((ground.constants.origin ?? 0) !== 0)
    throw new Error(`'${fund.name}' does not start from the lowest state, so it is no fundamental to add`);
  if (lower.isDegenerate && added.isDegenerate)
    throw new Error(
      `both '${lower.name}' and '${added.name}' are degenerate: their combination has ℓ = 0, ±2 levels, which the level model does not hold`,
    );
  const stateName = `${lower.name}+${added.name}`;
  checkName(stateName, 'the new state name');
  if (sp.states.some((s) => s.name === stateName)) throw new Error(`${sp.name} has a state '${stateName}' already`);
  const c: Record<string, number> = {};
  for (const n of Object.keys({ ...added.constants, ...lower.constants })) {
    const g = ground.constants[n] ?? 0;
    const a = added.constants[n] ?? 0;
    const l = lower.constants[n] ?? 0;
    if (n === 'origin') c[n] = l + a;
    else if (n === 'B' || n === 'A' || n === 'C') c[n] = l + a - g;
    else if (n === 'zeta' || n === 'q' || n === 'qJ') c[n] = lower.isDegenerate ? l : a;
    else c[n] = a;
  }
  const state: SystemState = { name: stateName, isDegenerate: lower.isDegenerate || added.isDegenerate, constants: c };
  const next: SystemModel = {
    ...system,
    species: system.species.map((s, i) =>
      i === input.speciesIndex
        ? {
            ...s,
            states: [...s.states, state],
            bands: [...s.bands, { name: input.name, upper: stateName, lower: lower.name, strength: fund.strength }],
          }
        : s,
    ),
  };
  const unique = sp.shape === 'oblate' ? 'C' : sp.shape === 'prolate' ? 'A' : null;
  const keys = ['origin', 'B', ...(unique ? [unique] : []), ...(state.isDegenerate && unique ? ['zeta'] : [])].filter((n) => n in c);
  const note =
    `Hot band ${input.name} (${stateName} ← ${lower.name}) of ${sp.name}: origin ${c.origin.toFixed(3)} cm⁻¹ = G(${lower.name}) + G(${added.name}) ` +
    `(anharmonicity neglected: expect it a few cm⁻¹ lower), B, ${unique ?? 'B'} as X(${lower.name}) + X(${added.name}) − X(${ground.name}), ` +
    `distortion constants${state.isDegenerate ? ' and ζ' : ''} copied. Estimates to refine by fitting.`;
  return { system: next, floated: [...floated, ...keys.map((n) => systemParamKey(next, input.speciesIndex, stateName, n))], note };
}
