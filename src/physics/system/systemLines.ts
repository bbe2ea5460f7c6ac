import { SECOND_RADIATION_CM_K } from '../constants';
import type { LineList } from '../model';
import { bandTransitions, systemBandType } from './bandRules';
import type { LevelSet } from './levelTypes';
import type { SystemModel, SystemSpecies } from './systemModel';
import { systemStateFind } from './systemModel';
import { systemLevelSpinWeight, systemStateProvider, systemStateValues } from './systemStateLevels';
import { coupledBandEnumerate } from '../interaction/coupledLines';
import { speciesLevelSources } from '../interaction/speciesLevelSources';
import { speciesPartitionFunction } from './vibrationalPartition';

/** Columnar lines of every band of a system (a LineList plus band, species and level labels). */
export interface SystemLineList extends LineList {
  /** Index into bandRefs of each line's band. */
  bandIndex: Int32Array;
  /** l = sign(kℓ) of the upper and lower level (0 in a nondegenerate state). */
  lUpper: Int8Array;
  lLower: Int8Array;
  /** Tags of the upper and lower level ('' or 'e'/'f'). */
  tagUpper: string[];
  tagLower: string[];
  /** Symmetry species of the upper and lower level ('' where the species declares no point group). */
  symUpper: string[];
  symLower: string[];
  /** Upper-level energy above the species' lowest level, cm^-1. */
  eUpperCm1: Float64Array;
  /**
   * Intensity before normalisation, comparable across bands and species (abundance × band
   * strength × population × Hönl–London × ν × stimulated-emission factor / Q; arbitrary unit × cm^-1).
   */
  strength: Float64Array;
  /** The bands in bandIndex order: species index and name, band name. */
  bandRefs: { speciesIndex: number; species: string; band: string; type: 'parallel' | 'perpendicular' }[];
}

/** Options of systemLines. */
export interface SystemLinesOptions {
  /** Drop lines whose normalised intensity is below this (strongest line of all bands = 1). @default 0 */
  minIntensity?: number;
}

/** Largest number of lines systemLines produces (guards against absurd jMax/kMax). */
export const SYSTEM_LINES_MAX = 5_000_000;

interface Pending {
  band: number;
  jUpper: number;
  kUpper: number;
  lUpper: number;
  tagUpper: string;
  jLower: number;
  kLower: number;
  lLower: number;
  tagLower: string;
  symUpper: string;
  symLower: string;
  nu: number;
  eLower: number;
  eUpper: number;
  hl: number;
  strength: number;
}

function copySet(s: LevelSet): LevelSet {
  return {
    J: s.J,
    count: s.count,
    K: s.K.slice(0, s.count),
    l: s.l.slice(0, s.count),
    tag: s.tag.slice(0, s.count),
    energyCm1: s.energyCm1.slice(0, s.count),
    gradient: new Float64Array(0),
    componentCount: s.componentCount.slice(0, s.count),
    ...(s.species ? { species: s.species.slice(0, s.count) } : {}),
  };
}

/**
 * Enumerate every allowed line of every band of every species, with positions and intensities
 * on one scale, so a hot band beside its cold band, or an isotopologue beside its parent, has
 * the right relative size without hand factors.
 *
 * Intensity of a line from lower level E'' to upper level E' (cm^-1, above the species' lowest level):
 *   I ∝ a · S_band · g · HL · ν · [exp(−c2E''/T) − exp(−c2E'/T)] / Q
 * a the species abundance, S_band the band strength, g the nuclear-spin weight of the lower level
 * (levelSpinIndex), HL the summed Hönl–London factor (bandRules), Q the species' rovibrational
 * partition function (speciesPartitionFunction). E'' includes the lower state's vibrational term
 * value G'', so the Boltzmann factor exp(−c2G''/T) and the vibrational degeneracy (through the
 * level components) enter by themselves. Normalised so the strongest line of all is 1; lines at
 * ν <= 0 are dropped. For one band of one species this is physics/bandLines' intensity.
 * Selection: J'' <= jMax, K'' <= kMax (any K for a linear molecule).
 * Source: Herzberg II (1945) ch. IV (intensities, eq. (IV,76) form) and ch. V (Boltzmann
 * populations); c2 = hc/k (CODATA 2018).
 * @param model system model (cm^-1, K)
 */
export function systemLines(model: SystemModel, options: SystemLinesOptions = {}): SystemLineList {
  const { jMax, kMax, temperatureK } = model;
  if (!Number.isInteger(jMax) || jMax < 0) throw new Error(`systemLines: jMax must be an integer >= 0, got ${jMax}`);
  if (!Number.isInteger(kMax) || kMax < 0) throw new Error(`systemLines: kMax must be an integer >= 0, got ${kMax}`);
  if (!(temperatureK > 0) || !Number.isFinite(temperatureK))
    throw new Error(`systemLines: temperatureK must be a finite number > 0, got ${temperatureK}`);
  const c2OverT = SECOND_RADIATION_CM_K / temperatureK;
  const pending: Pending[] = [];
  const bandRefs: SystemLineList['bandRefs'] = [];
  model.species.forEach((species, speciesIndex) => {
    const q = speciesPartitionFunction(species, temperatureK);
    for (const band of species.bands) {
      const b = bandRefs.length;
      const lowerState = systemStateFind(species, band.lower);
      const upperState = systemStateFind(species, band.upper);
      bandRefs.push({
        speciesIndex,
        species: species.name,
        band: band.name,
        type: systemBandType(lowerState.isDegenerate, upperState.isDegenerate),
      });
      bandEnumerate(species, band.lower, band.upper, jMax, kMax, (lo, i, up, j, hl) => {
        const eLower = lo.energyCm1[i];
        const eUpper = up.energyCm1[j];
        const nu = eUpper - eLower;
        if (!(nu > 0)) return;
        const g = systemLevelSpinWeight(species, lo, i, lowerState.isDegenerate);
        if (g === 0) return;
        const x = c2OverT * nu;
        const popLower = Math.exp(-c2OverT * eLower);
        const boltzmann = x < 1e-2 ? popLower * -Math.expm1(-x) : popLower - Math.exp(-c2OverT * eUpper);
        const strength = (species.abundance * band.strength * g * hl * nu * boltzmann) / q;
        pending.push({
          band: b,
          jUpper: up.J,
          kUpper: up.K[j],
          lUpper: up.l[j],
          tagUpper: up.tag[j],
          jLower: lo.J,
          kLower: lo.K[i],
          lLower: lo.l[i],
          tagLower: lo.tag[i],
          symUpper: up.species ? up.species[j] : '',
          symLower: lo.species ? lo.species[i] : '',
          nu,
          eLower,
          eUpper,
          hl,
          strength,
        });
        if (pending.length > SYSTEM_LINES_MAX) {
          throw new Error(`systemLines: more than ${SYSTEM_LINES_MAX} lines; lower jMax or kMax`);
        }
      });
    }
  });
  let maxI = 0;
  for (const p of pending) if (p.strength > maxI) maxI = p.strength;
  const scale = maxI > 0 ? maxI : Infinity;
  const cut = options.minIntensity ?? 0;
  const kept = pending.filter((p) => p.strength / scale >= cut);
  const n = kept.length;
  const out: SystemLineList = {
    count: n,
    jUpper: new Int32Array(n),
    kUpper: new Int32Array(n),
    jLower: new Int32Array(n),
    kLower: new Int32Array(n),
    deltaK: new Int8Array(n),
    deltaJ: new Int8Array(n),
    wavenumberCm1: new Float64Array(n),
    intensity: new Float64Array(n),
    eLowerCm1: new Float64Array(n),
    honlLondon: new Float64Array(n),
    bandIndex: new Int32Array(n),
    lUpper: new Int8Array(n),
    lLower: new Int8Array(n),
    tagUpper: new Array<string>(n),
    tagLower: new Array<string>(n),
    symUpper: new Array<string>(n),
    symLower: new Array<string>(n),
    eUpperCm1: new Float64Array(n),
    strength: new Float64Array(n),
    bandRefs,
  };
  kept.forEach((p, i) => {
    out.jUpper[i] = p.jUpper;
    out.kUpper[i] = p.kUpper;
    out.jLower[i] = p.jLower;
    out.kLower[i] = p.kLower;
    out.deltaK[i] = p.kUpper - p.kLower;
    out.deltaJ[i] = p.jUpper - p.jLower;
    out.wavenumberCm1[i] = p.nu;
    // Divide rather than multiply by 1/max so the strongest line comes out exactly 1.
    out.intensity[i] = p.strength / scale;
    out.eLowerCm1[i] = p.eLower;
    out.honlLondon[i] = p.hl;
    out.bandIndex[i] = p.band;
    out.lUpper[i] = p.lUpper;
    out.lLower[i] = p.lLower;
    out.tagUpper[i] = p.tagUpper;
    out.tagLower[i] = p.tagLower;
    out.symUpper[i] = p.symUpper;
    out.symLower[i] = p.symLower;
    out.eUpperCm1[i] = p.eUpper;
    out.strength[i] = p.strength;
  });
  return out;
}

/**
 * Visit every allowed transition of one band of a species: J'' = 0 … jMax, K'' <= kMax (any K'' for a
 * linear molecule), J' = J'' + ΔJ. The callback gets the lower set and index, the upper set and
 * index, and the summed Hönl–London factor. The sets passed are copies (gradients omitted).
 * @param species the species
 * @param lowerName name of the lower state
 * @param upperName name of the upper state
 */
export function bandEnumerate(
  species: SystemSpecies,
  lowerName: string,
  upperName: string,
  jMax: number,
  kMax: number,
  visit: (lower: LevelSet, lowerIndex: number, upper: LevelSet, upperIndex: number, honlLondon: number) => void,
): void {
  const lowerState = systemStateFind(species, lowerName);
  const upperState = systemStateFind(species, upperName);
  let lowerProvider = systemStateProvider(species.shape, lowerState);
  let lowerValues = systemStateValues(lowerProvider, lowerState);
  if (species.interactions?.length || species.states.some((s) => 'h3' in s.constants)) {
    // Coupled upper states: lines and intensities from the mixed levels (physics/interaction).
    const sources = speciesLevelSources(species);
    if (sources.get(upperName)!.coupled) {
      const band = species.bands.find((b) => b.lower === lowerName && b.upper === upperName);
      coupledBandEnumerate(species, lowerName, upperName, band?.strength ?? 1, jMax, kMax, sources, visit);
      return;
    }
    // A coupled lower state (a hot band from it, or a ground state with h3) below a state of its
    // own: its levels are the mixed ones, as in the fit (fit/systemFit) and the line resolution.
    const lower = sources.get(lowerName)!;
    if (lower.coupled) {
      lowerProvider = lower.provider;
      lowerValues = lower.values;
    }
  }
  const upperProvider = systemStateProvider(species.shape, upperState);
  const upperValues = systemStateValues(upperProvider, upperState);
  const isLinear = species.shape === 'linear';
  const kLower = isLinear ? 1 : kMax;
  const upperSets: LevelSet[] = [];
  for (let J = 0; J <= jMax + 1; J++) upperSets.push(copySet(upperProvider.levels(J, upperValues, kLower + 1, false)));
  for (let J = 0; J <= jMax; J++) {
    const lower = copySet(lowerProvider.levels(J, lowerValues, kLower, false));
    for (let deltaJ = -1; deltaJ <= 1; deltaJ++) {
      const jUp = J + deltaJ;
      if (jUp < 0) continue;
      const upper = upperSets[jUp];
      bandTransitions(
        lower,
        lowerState.isDegenerate,
        upper,
        upperState.isDegenerate,
        kLower,
        (i, j, s) => visit(lower, i, upper, j, s),
        species.pointGroup,
      );
    }
  }
}
