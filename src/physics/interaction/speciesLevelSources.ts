import type { LevelProvider, LevelSet } from '../system/levelTypes';
import type { SystemSpecies } from '../system/systemModel';
import { systemStateProvider, systemStateValues } from '../system/systemStateLevels';
import { coupledGroupCreate, coupledLevels, type CoupledGroup, type CoupledLabelMemory, type CoupledLevels } from './coupledLevels';

/** Where a state's levels come from, and which file constant each provider constant is. */
export interface StateLevelSource {
  provider: LevelProvider;
  /** The constants in provider.parameterNames order, from the system model. */
  values: Float64Array;
  /** For each provider constant: its owner (a state or an interaction of the species) and name. */
  owners: { owner: string; name: string }[];
  /** Set when the state belongs to a coupled group. */
  coupled: CoupledStateSource | null;
}

/** A state of a coupled group: the group and the state's index in it. */
export interface CoupledStateSource {
  group: CoupledGroup;
  stateIndex: number;
  /** The whole group's levels at J (every state, every K; cached per J and constants). */
  groupLevels(J: number, values: Float64Array): CoupledLevels;
  /** The group's levels carry their symmetry species (coupledLevelSpecies); false where it is not known. */
  hasSpecies: boolean;
}

/**
 * Symmetry species in C3v(M) of a coupled level, from its block: the class-1 block (k − ℓ ≢ 0 mod 3)
 * gives E levels, the σv = +1 and −1 halves of class 0 give A1 and A2 levels; every eigenstate of a
 * block, whatever its largest component, shares it. Valid under coupledLevels' σv phases, which take
 * the nondegenerate states as A1 and the degenerate ones as E (so K = 0, even J of an A1 state is A1).
 * Source: Bunker and Jensen, Molecular Symmetry and Spectroscopy (1998), the C3v(M) species of
 * symmetric-top functions (from memory); the block rule follows from H commuting with σv.
 * @param sigma the level's σv eigenvalue (CoupledLevels.sigma: ±1, or 0 for an E level)
 */
export function coupledLevelSpecies(sigma: number): string {
  return sigma > 0 ? 'A1' : sigma < 0 ? 'A2' : 'E';
}

/**
 * Whether the coupled levels of these states can be named by C3v(M) species: the species declares
 * C3v and each state is of the species coupledLevels' phases assume (A1 nondegenerate, E degenerate).
 * Otherwise (no point group, D3h, an A2 state) their species stay unknown ('').
 */
function coupledHasSpecies(species: SystemSpecies, states: readonly SystemSpecies['states'][number][]): boolean {
  return (
    species.pointGroup === 'C3v' &&
    states.every((st) => st.symmetry !== undefined && st.symmetry.vibSpecies === (st.isDegenerate ? 'E' : 'A1'))
  );
}

/** Options of speciesLevelSources. */
export interface SpeciesLevelSourcesOptions {
  /**
   * Keep each coupled level's label continuous from one call to the next at the same J
   * (coupledLabelFollow), as a fit wants while its constants move. @default false
   */
  isLabelFollowing?: boolean;
}

/**
 * The level source of every state of a species: states joined by interactions (directly or through
 * others) form a coupled group whose levels come from one Hamiltonian (coupledLevels), and so does a
 * state alone that carries h3 (its K = 3 A1/A2 splitting); every other state keeps its own provider
 * (systemStateProvider). The coupled states of one group share one
 * computation per J and set of constants.
 * @param species the species (its `interactions`, if any, define the groups)
 * @throws Error for an interaction naming an unknown state, or on a linear molecule
 */
export function speciesLevelSources(species: SystemSpecies, options: SpeciesLevelSourcesOptions = {}): Map<string, StateLevelSource> {
  const out = new Map<string, StateLevelSource>();
  const interactions = species.interactions ?? [];
  // Groups: connected components of the interaction graph.
  const groupOf = new Map<string, number>();
  const members: string[][] = [];
  for (const it of interactions) {
    for (const s of it.states)
      if (!species.states.some((st) => st.name === s))
        throw new Error(`speciesLevelSources: interaction '${it.name}' of species '${species.name}' names the unknown state '${s}'`);
    const [a, b] = it.states;
    const ga = groupOf.get(a);
    const gb = groupOf.get(b);
    if (ga === undefined && gb === undefined) {
      members.push([a, b]);
      groupOf.set(a, members.length - 1);
      groupOf.set(b, members.length - 1);
    } else if (ga !== undefined && gb === undefined) {
      members[ga].push(b);
      groupOf.set(b, ga);
    } else if (ga === undefined && gb !== undefined) {
      members[gb].push(a);
      groupOf.set(a, gb);
    } else if (ga !== gb) {
      for (const s of members[gb!]) {
        members[ga!].push(s);
        groupOf.set(s, ga!);
      }
      members[gb!] = [];
    }
  }
  // A state that carries a term only the coupled Hamiltonian knows (h3) is diagonalised on its own.
  for (const st of species.states)
    if (!groupOf.has(st.name) && 'h3' in st.constants) {
      members.push([st.name]);
      groupOf.set(st.name, members.length - 1);
    }
  if (members.length > 0 && species.shape === 'linear')
    throw new Error(`speciesLevelSources: species '${species.name}' is linear; interactions are handled for symmetric tops only`);
  members.forEach((names) => {
    if (names.length === 0) return;
    const states = species.states.filter((s) => names.includes(s.name));
    const its = interactions.filter((it) => names.includes(it.states[0]));
    const group = coupledGroupCreate(
      species.shape as 'prolate' | 'oblate',
      states.map((s) => ({ name: s.name, isDegenerate: s.isDegenerate })),
      its.map((it) => ({
        name: it.name,
        type: it.type,
        stateA: states.findIndex((s) => s.name === it.states[0]),
        stateB: states.findIndex((s) => s.name === it.states[1]),
      })),
    );
    const values = Float64Array.from(group.parameters, ({ owner, name }) => {
      const st = states.find((s) => s.name === owner);
      const c = st ? st.constants : its.find((it) => it.name === owner)!.constants;
      return c[name] ?? 0;
    });
    const cache = new Map<number, { values: Float64Array; levels: CoupledLevels }>();
    const memory: CoupledLabelMemory | undefined = options.isLabelFollowing ? { blocks: new Map() } : undefined;
    const memories = new Map<number, CoupledLabelMemory>();
    const groupLevels = (J: number, v: Float64Array): CoupledLevels => {
      const hit = cache.get(J);
      if (hit && sameValues(hit.values, v)) return hit.levels;
      let follow: CoupledLabelMemory | undefined;
      if (memory) {
        follow = memories.get(J);
        if (!follow) memories.set(J, (follow = { blocks: new Map() }));
      }
      const levels = coupledLevels(group, J, v, { follow });
      cache.set(J, { values: v.slice(), levels });
      return levels;
    };
    const hasSpecies = coupledHasSpecies(species, states);
    states.forEach((st, stateIndex) => {
      out.set(st.name, {
        provider: coupledStateProvider(group, stateIndex, groupLevels, hasSpecies),
        values: values.slice(),
        owners: group.parameters.map((p) => ({ ...p })),
        coupled: { group, stateIndex, groupLevels, hasSpecies },
      });
    });
  });
  for (const st of species.states) {
    if (out.has(st.name)) continue;
    const provider = systemStateProvider(species.shape, st);
    out.set(st.name, {
      provider,
      values: systemStateValues(provider, st),
      owners: provider.parameterNames.map((name) => ({ owner: st.name, name })),
      coupled: null,
    });
  }
  return out;
}

function sameValues(a: Float64Array, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/** A LevelProvider view of one state of a coupled group: that state's levels, gradients over the whole group's constants. */
function coupledStateProvider(
  group: CoupledGroup,
  stateIndex: number,
  groupLevels: (J: number, v: Float64Array) => CoupledLevels,
  hasSpecies: boolean,
): LevelProvider {
  const nP = group.parameters.length;
  const parameterNames = group.parameters.map((p) => `${p.owner}.${p.name}`);
  const levels = (J: number, values: Float64Array, kTop: number, withGradient = true): LevelSet => {
    const all = groupLevels(J, values);
    let count = 0;
    for (let i = 0; i < all.count; i++) if (all.state[i] === stateIndex && all.K[i] <= kTop) count++;
    const set: LevelSet = {
      J,
      count,
      K: new Int32Array(count),
      l: new Int8Array(count),
      tag: new Array<string>(count),
      energyCm1: new Float64Array(count),
      // Only the picked levels' gradients are worked out (coupledLevels computes a row on request).
      gradient: new Float64Array(withGradient ? count * nP : 0),
      componentCount: new Uint8Array(count),
      ...(hasSpecies ? { species: new Array<string>(count) } : {}),
    };
    for (let i = 0, r = 0; i < all.count; i++) {
      if (all.state[i] !== stateIndex || all.K[i] > kTop) continue;
      set.K[r] = all.K[i];
      set.l[r] = all.l[i];
      set.tag[r] = all.tag[i];
      set.energyCm1[r] = all.energyCm1[i];
      set.componentCount[r] = all.componentCount[i];
      if (set.species) set.species[r] = coupledLevelSpecies(all.sigma[i]);
      if (withGradient) set.gradient.set(all.levelGradient(i), r * nP);
      r++;
    }
    return set;
  };
  return { parameterNames, isDegenerate: group.states[stateIndex].isDegenerate, levels };
}
