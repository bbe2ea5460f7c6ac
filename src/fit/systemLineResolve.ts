import { ASSIGNMENT_MAX_J } from './assignment';
import { bandTransitions } from '../physics/system/bandRules';
import { levelLabelText, type LevelSet } from '../physics/system/levelTypes';
import type { SystemModel } from '../physics/system/systemModel';
import { systemStateFind } from '../physics/system/systemModel';
import { systemLevelSpinWeight, systemStateProvider, systemStateValues } from '../physics/system/systemStateLevels';
import type { SystemFitLine } from './systemFitTypes';
import { coupledLineAllowed, coupledMoments } from '../physics/interaction/coupledLines';
import { speciesLevelSources, type StateLevelSource } from '../physics/interaction/speciesLevelSources';

/** What a line table row says about a line (the labels it leaves out are null). */
export interface SystemLineQuery {
  band: string | null;
  species: string | null;
  jUpper: number;
  kUpper: number;
  jLower: number;
  kLower: number;
  lUpper: -1 | 0 | 1 | null;
  lLower: -1 | 0 | 1 | null;
  tagUpper: string | null;
  tagLower: string | null;
}

/** A resolved line (everything but the observation) or why the row names no single allowed line. */
export type SystemLineResolution =
  { ok: true; line: Omit<SystemFitLine, 'observedCm1' | 'uncertaintyCm1' | 'isExcluded' | 'unit'> } | { ok: false; message: string };

function copy(s: LevelSet): LevelSet {
  return {
    ...s,
    K: s.K.slice(0, s.count),
    l: s.l.slice(0, s.count),
    tag: s.tag.slice(0, s.count),
    ...(s.species ? { species: s.species.slice(0, s.count) } : {}),
  };
}

/**
 * Whether a level's tag answers the tag a row gives: equal, or the row gives the inversion
 * component ('s' / 'a') of a level tagged with it and its species ("s:A2'").
 */
function tagMatches(levelTag: string, wanted: string): boolean {
  return levelTag === wanted || levelTag.startsWith(`${wanted}:`);
}

/**
 * Find the one allowed transition of the system that a line-table row names: its species (the
 * only one when not named), its band (the species' only band when not named), and the upper and
 * lower levels with the given J, K and, where given, l and tag. Refuses, in words, when none
 * matches (naming the rule broken) or when several do (naming the labels that would decide).
 * With a species that declares a point group the symmetry rule applies, levels of zero spin weight
 * are not candidates (e.g. the missing member of each K = 0 inversion pair of ¹⁴NH3), and a row's
 * tag 's' or 'a' names the inversion component whatever its species tag ("a:A2''").
 * Source: selection rules of physics/system/bandRules.ts.
 * @param model the system
 * @param q what the row says
 */
export function systemLineResolve(model: SystemModel, q: SystemLineQuery): SystemLineResolution {
  const bad = (message: string): SystemLineResolution => ({ ok: false, message });
  let speciesIndex = 0;
  if (q.species !== null) {
    speciesIndex = model.species.findIndex((s) => s.name === q.species);
    if (speciesIndex < 0)
      return bad(`species '${q.species}' is not in the system (species: ${model.species.map((s) => s.name).join(', ')})`);
  } else if (model.species.length > 1) {
    return bad(`the system has ${model.species.length} species; name the line's species in a species column`);
  }
  const species = model.species[speciesIndex];
  let band = species.bands[0];
  if (q.band !== null) {
    const found = species.bands.find((b) => b.name === q.band);
    if (!found)
      return bad(
        `band '${q.band}' is not a band of species '${species.name}' (bands: ${species.bands.map((b) => b.name).join(', ') || 'none'})`,
      );
    band = found;
  } else if (species.bands.length !== 1) {
    return bad(
      `species '${species.name}' has ${species.bands.length} bands; name the line's band in a band column (bands: ${species.bands.map((b) => b.name).join(', ')})`,
    );
  }
  for (const [name, v] of [
    ['J_up', q.jUpper],
    ['K_up', q.kUpper],
    ['J_lo', q.jLower],
    ['K_lo', q.kLower],
  ] as const) {
    if (!Number.isInteger(v) || v < 0) return bad(`${name}=${v} must be a whole number >= 0`);
    if (v > ASSIGNMENT_MAX_J) return bad(`${name}=${v} is above the largest J handled (${ASSIGNMENT_MAX_J})`);
  }
  const deltaJ = q.jUpper - q.jLower;
  if (deltaJ < -1 || deltaJ > 1) return bad(`J_up=${q.jUpper} and J_lo=${q.jLower} differ by ${deltaJ}; a line has ΔJ = 0 or ±1`);
  const lower = systemStateFind(species, band.lower);
  const upper = systemStateFind(species, band.upper);
  const lp = systemStateProvider(species.shape, lower);
  const up = systemStateProvider(species.shape, upper);
  const sources = species.interactions?.length || species.states.some((s) => 'h3' in s.constants) ? speciesLevelSources(species) : null;
  const coupledLower = sources?.get(band.lower);
  const loSet = coupledLower?.coupled
    ? copy(coupledLower.provider.levels(q.jLower, coupledLower.values, q.kLower))
    : copy(lp.levels(q.jLower, systemStateValues(lp, lower), q.kLower));
  const coupled = sources?.get(band.upper);
  const upSet = coupled?.coupled
    ? copy(coupled.provider.levels(q.jUpper, coupled.values, q.kUpper))
    : copy(up.levels(q.jUpper, systemStateValues(up, upper), q.kUpper));
  const matches: { i: number; j: number }[] = [];
  let sameKAllowed = 0;
  const bySymmetry = species.pointGroup !== undefined;
  const transitions = coupled?.coupled
    ? coupledTransitions(coupled, species, band.lower, loSet, upSet, q.kLower)
    : (emit: (i: number, j: number) => void) =>
        bandTransitions(loSet, lower.isDegenerate, upSet, upper.isDegenerate, q.kLower, emit, species.pointGroup);
  transitions((i, j) => {
    if (loSet.K[i] !== q.kLower || upSet.K[j] !== q.kUpper) return;
    if (bySymmetry && systemLevelSpinWeight(species, loSet, i, lower.isDegenerate) === 0) return;
    if (bySymmetry && systemLevelSpinWeight(species, upSet, j, upper.isDegenerate) === 0) return;
    sameKAllowed++;
    if (q.lLower !== null && loSet.l[i] !== q.lLower) return;
    if (q.lUpper !== null && upSet.l[j] !== q.lUpper) return;
    if (q.tagLower !== null && !(bySymmetry ? tagMatches(loSet.tag[i], q.tagLower) : loSet.tag[i] === q.tagLower)) return;
    if (q.tagUpper !== null && !(bySymmetry ? tagMatches(upSet.tag[j], q.tagUpper) : upSet.tag[j] === q.tagUpper)) return;
    matches.push({ i, j });
  });
  const where = `band '${band.name}' (${band.upper} ← ${band.lower})`;
  const qn = `J'=${q.jUpper} K'=${q.kUpper} ← J"=${q.jLower} K"=${q.kLower}`;
  if (matches.length === 0) {
    if (sameKAllowed > 0) return bad(`${qn} is allowed in ${where}, but not with the l or tag labels given`);
    if (species.shape === 'linear' && (q.kUpper !== (upper.isDegenerate ? 1 : 0) || q.kLower !== (lower.isDegenerate ? 1 : 0))) {
      return bad(`${qn} is not a line of ${where}: a linear molecule has K = 0 in a Σ state and K = 1 in a Π state`);
    }
    if (coupled?.coupled)
      return bad(
        `${qn} is not a line of ${where}: no mixture of the coupled states reaches that level from that lower level (symmetry or ΔJ)`,
      );
    return bad(
      `${qn} is not an allowed line of ${where} (ΔK must be ${lower.isDegenerate === upper.isDegenerate ? '0' : '±1'}, K <= J, and no Q line where its Hönl–London factor is 0)`,
    );
  }
  if (matches.length > 1) {
    const options = matches.map(
      ({ i, j }) =>
        `${levelLabelText({ J: q.jUpper, K: upSet.K[j], l: upSet.l[j] as -1 | 0 | 1, tag: upSet.tag[j] })} ← ${levelLabelText({ J: q.jLower, K: loSet.K[i], l: loSet.l[i] as -1 | 0 | 1, tag: loSet.tag[i] })}`,
    );
    return bad(`${qn} names ${matches.length} lines of ${where} (${options.join('; ')}); give l_lo/l_up or tag_lo/tag_up to choose`);
  }
  const { i, j } = matches[0];
  return {
    ok: true,
    line: {
      speciesIndex,
      band: band.name,
      jUpper: q.jUpper,
      kUpper: q.kUpper,
      lUpper: upSet.l[j] as -1 | 0 | 1,
      tagUpper: upSet.tag[j],
      jLower: q.jLower,
      kLower: q.kLower,
      lLower: loSet.l[i] as -1 | 0 | 1,
      tagLower: loSet.tag[i],
    },
  };
}

/**
 * The transitions a coupled upper state allows from a lower level set: every pair the dipole can
 * reach through some mixture (coupledLineAllowed), perturbation-allowed lines included.
 */
function coupledTransitions(
  source: StateLevelSource,
  species: SystemModel['species'][number],
  lowerName: string,
  loSet: LevelSet,
  upSet: LevelSet,
  kMaxLower: number,
) {
  return (emit: (i: number, j: number) => void) => {
    const cs = source.coupled!;
    const all = cs.groupLevels(upSet.J, source.values);
    const moments = coupledMoments(species, lowerName, source);
    for (let i = 0; i < loSet.count; i++) {
      if (loSet.K[i] > kMaxLower) continue;
      for (let j = 0; j < upSet.count; j++) {
        let index = -1;
        for (let a = 0; a < all.count && index < 0; a++)
          if (all.state[a] === cs.stateIndex && all.K[a] === upSet.K[j] && all.l[a] === upSet.l[j] && all.tag[a] === upSet.tag[j])
            index = a;
        // σv of the lower level: an A1/A2 member by its tag, a single K'' = 0 level (−1)^J'' (A1 state).
        const tag = loSet.tag[i];
        const sigmaLower = tag === 'A1' ? 1 : tag === 'A2' ? -1 : loSet.K[i] === 0 ? (loSet.J % 2 === 0 ? 1 : -1) : 0;
        if (index >= 0 && coupledLineAllowed(all, index, loSet.J, loSet.K[i], sigmaLower, moments)) emit(i, j);
      }
    }
  };
}
