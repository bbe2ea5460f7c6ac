/**
 * How many fundamentals a candidate structure makes infrared active, and of which band type, from
 * its point group and the species counts of its vibrational representation Γ_vib. This is how a
 * practitioner weighs candidate structures against a spectrum: e.g. a linear symmetric triatomic
 * (D∞h) shows two infrared fundamentals, a bent one (C2v) three; a centrosymmetric structure has no
 * fundamental active in both infrared and Raman (mutual exclusion).
 * Source: G. Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. II (selection rules,
 * species of the dipole components) and ch. IV (band types); F. A. Cotton, Chemical Applications of
 * Group Theory, 3rd ed. (1990), Appendix IIA (dipole columns).
 */
import { bandSymmetryPointGroups, bandSymmetrySpecies, bandTypeFromSymmetry } from './bandSymmetry';

/** Band type of an infrared-active fundamental, by the rotor the group implies. */
export type FundamentalBandKind =
  /** symmetric top or linear molecule: dipole along the figure axis (ΔK = 0, Σ–Σ). */
  | 'parallel'
  /** symmetric top or linear molecule: dipole perpendicular to it (ΔK = ±1, Π–Σ). */
  | 'perpendicular'
  /** spherical top (triply degenerate, F2 / T2 species): a PQR band with a Coriolis-modified Q. */
  | 'spherical-top'
  /** asymmetric top: dipole along one of the principal axes, named by the Cartesian axis. */
  | 'asymmetric-x'
  | 'asymmetric-y'
  | 'asymmetric-z';

/** Counts of fundamentals of one structure. */
export interface VibrationalActivity {
  pointGroup: string;
  /** Distinct fundamentals (a degenerate species counts once per occurrence). */
  fundamentals: number;
  /** Vibrational degrees of freedom (Σ count × dimension); 3N − 6, or 3N − 5 for a linear molecule. */
  degreesOfFreedom: number;
  /** Infrared-active fundamentals by band kind. */
  infraredActive: Partial<Record<FundamentalBandKind, number>>;
  infraredActiveTotal: number;
  /** Fundamentals with no dipole component (infrared inactive). */
  inactive: number;
  /** One sentence for the user. */
  summary: string;
}

// Groups that are not symmetric tops: species, dimension and dipole component
// (Cotton 1990, Appendix IIA; C∞v and D∞h as in Herzberg II Table 55, recalled).
const OTHER_GROUPS: Record<string, { species: [string, number, string | null][]; rotor: 'linear' | 'spherical' | 'asymmetric' }> = {
  Cinfv: {
    rotor: 'linear',
    species: [
      ['Sigma+', 1, 'z'],
      ['Sigma-', 1, null],
      ['Pi', 2, 'xy'],
      ['Delta', 2, null],
    ],
  },
  Dinfh: {
    rotor: 'linear',
    species: [
      ['Sigmag+', 1, null],
      ['Sigmag-', 1, null],
      ['Pig', 2, null],
      ['Deltag', 2, null],
      ['Sigmau+', 1, 'z'],
      ['Sigmau-', 1, null],
      ['Piu', 2, 'xy'],
      ['Deltau', 2, null],
    ],
  },
  C2v: {
    rotor: 'asymmetric',
    species: [
      ['A1', 1, 'z'],
      ['A2', 1, null],
      ['B1', 1, 'x'],
      ['B2', 1, 'y'],
    ],
  },
  D2h: {
    rotor: 'asymmetric',
    species: [
      ['Ag', 1, null],
      ['B1g', 1, null],
      ['B2g', 1, null],
      ['B3g', 1, null],
      ['Au', 1, null],
      ['B1u', 1, 'z'],
      ['B2u', 1, 'y'],
      ['B3u', 1, 'x'],
    ],
  },
  Td: {
    rotor: 'spherical',
    species: [
      ['A1', 1, null],
      ['A2', 1, null],
      ['E', 2, null],
      ['F1', 3, null],
      ['F2', 3, 'xyz'],
    ],
  },
  Oh: {
    rotor: 'spherical',
    species: [
      ['A1g', 1, null],
      ['A2g', 1, null],
      ['Eg', 2, null],
      ['F1g', 3, null],
      ['F2g', 3, null],
      ['A1u', 1, null],
      ['A2u', 1, null],
      ['Eu', 2, null],
      ['F1u', 3, 'xyz'],
      ['F2u', 3, null],
    ],
  },
};

const GROUP_NAMES: Record<string, string> = {
  cinfv: 'Cinfv',
  'c∞v': 'Cinfv',
  dinfh: 'Dinfh',
  'd∞h': 'Dinfh',
  c2v: 'C2v',
  d2h: 'D2h',
  td: 'Td',
  oh: 'Oh',
};

/** Species labels of the non-symmetric-top groups, compared without case, "_", "^" or spaces; T = F. */
function normSpecies(label: string): string {
  return label
    .replace(/[Σσ]/g, 'sigma')
    .replace(/[Ππ]/g, 'pi')
    .replace(/[Δδ]/g, 'delta')
    .replace(/[\s_^{}]/g, '')
    .toLowerCase()
    .replace(/^t(\d)/, 'f$1');
}

/**
 * Infrared activity of the fundamentals of one structure.
 * @param pointGroup Schoenflies symbol: a symmetric-top group of bandSymmetry.ts, or C∞v (Cinfv),
 *   D∞h (Dinfh), C2v, D2h, Td, Oh
 * @param gammaVib species → how many times it occurs in Γ_vib, e.g. {"A1": 2, "E": 2} for C3v NH3
 * @returns counts by band kind and a summary sentence
 * @throws Error naming an unknown group or species, or a count that is not a whole number ≥ 0
 */
export function vibrationalActivity(pointGroup: string, gammaVib: Record<string, number>): VibrationalActivity {
  const fn = 'vibrationalActivity';
  const key = GROUP_NAMES[pointGroup.replace(/[\s_{}]/g, '').toLowerCase()];
  const infraredActive: Partial<Record<FundamentalBandKind, number>> = {};
  let fundamentals = 0;
  let dof = 0;
  let inactive = 0;
  const add = (kind: FundamentalBandKind, n: number) => (infraredActive[kind] = (infraredActive[kind] ?? 0) + n);
  for (const [species, count] of Object.entries(gammaVib)) {
    if (!Number.isInteger(count) || count < 0) throw new Error(`${fn}: the count of ${species} must be a whole number >= 0, got ${count}`);
    if (key) {
      const g = OTHER_GROUPS[key];
      const row = g.species.find((s) => normSpecies(s[0]) === normSpecies(species));
      if (!row) throw new Error(`${fn}: "${species}" is not a species of ${pointGroup}; valid: ${g.species.map((s) => s[0]).join(', ')}`);
      fundamentals += count;
      dof += count * row[1];
      const d = row[2];
      if (d === null) inactive += count;
      else if (g.rotor === 'linear') add(d === 'z' ? 'parallel' : 'perpendicular', count);
      else if (g.rotor === 'spherical') add('spherical-top', count);
      else add(`asymmetric-${d}` as FundamentalBandKind, count);
    } else {
      const r = bandTypeFromSymmetry(pointGroup, species); // throws for an unknown group or species
      const dim = /^E/i.test(species.replace(/^[12]/, '')) ? 2 : 1;
      fundamentals += count;
      dof += count * dim;
      if (r.activity === 'inactive') inactive += count;
      else add(r.activity, count);
    }
  }
  const total = Object.values(infraredActive).reduce((a, b) => a + (b ?? 0), 0);
  const parts = Object.entries(infraredActive).map(([k, v]) => `${v} ${k}`);
  const summary =
    `${pointGroup}: ${fundamentals} fundamental${fundamentals === 1 ? '' : 's'} (${dof} vibrational degrees of freedom), ` +
    `${total} infrared active${parts.length ? ` (${parts.join(', ')})` : ''}, ${inactive} inactive.`;
  return { pointGroup, fundamentals, degreesOfFreedom: dof, infraredActive, infraredActiveTotal: total, inactive, summary };
}

/** Point groups vibrationalActivity accepts. */
export function vibrationalActivityGroups(): string[] {
  return [...bandSymmetryPointGroups(), ...Object.keys(OTHER_GROUPS)];
}

/** Species of a group, for pickers and messages. */
export function vibrationalActivitySpecies(pointGroup: string): string[] {
  const key = GROUP_NAMES[pointGroup.replace(/[\s_{}]/g, '').toLowerCase()];
  return key ? OTHER_GROUPS[key].species.map((s) => s[0]) : bandSymmetrySpecies(pointGroup);
}
