/**
 * Band type (parallel / perpendicular / infrared inactive) from the symmetry species of a
 * vibrational transition in a symmetric-top point group.
 *
 * Why only these groups: a molecule is a symmetric top by symmetry when it has exactly one
 * rotation axis C_n with n >= 3, or an S4 axis (as in allene, D2d). Rotating the inertia
 * tensor by 2π/n (n >= 3), or applying S4, about that axis must leave it unchanged, which
 * forces I_x = I_y with the axis as the figure axis z. Groups with several such axes (T, O, I
 * families) are spherical tops; groups with at most C2 axes (C2v, D2h, ...) are asymmetric
 * tops unless two moments agree by accident, which symmetry cannot tell.
 *
 * Selection rule: a fundamental is infrared active when its species contains a dipole
 * component. Species of z give a parallel band (ΔK = 0), species of (x, y) a perpendicular
 * band (ΔK = ±1), any other species no dipole band.
 * Source: G. Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. II and IV;
 * character tables as in F. A. Cotton, Chemical Applications of Group Theory, 3rd ed. (1990),
 * Appendix IIA.
 */

/** Infrared activity of a vibrational transition of a symmetric top. */
export type BandSymmetryActivity = 'parallel' | 'perpendicular' | 'inactive';

/** What bandTypeFromSymmetry returns: the activity and a one-sentence reason. */
export interface BandSymmetryResult {
  activity: BandSymmetryActivity;
  reason: string;
}

/** One species (irreducible representation, or real pair of complex-conjugate ones) of a group. */
export interface BandSymmetrySpecies {
  /** Mulliken label, primes as ASCII ' (e.g. "A2''", "E1u"). */
  label: string;
  /** Dimension of the real representation: 1, or 2 for E (including a complex-conjugate pair). */
  dimension: 1 | 2;
  /** True when this E is two complex-conjugate 1-D irreps listed together (cyclic groups). */
  isComplexPair: boolean;
  /** Dipole component carried: 'z', the pair 'xy', or null. */
  transformsLike: 'z' | 'xy' | null;
}

/** A point group's species list and order h (number of symmetry operations). */
export interface BandSymmetryTable {
  pointGroup: string;
  order: number;
  species: readonly BandSymmetrySpecies[];
}

// Row shorthand: [label, dimension, transformsLike, isComplexPair]
type Row = readonly [string, 1 | 2, 'z' | 'xy' | null, boolean?];

// Species and z / (x, y) columns as in Cotton (1990) Appendix IIA (recalled, see tests).
const TABLE_ROWS: Record<string, { order: number; rows: readonly Row[] }> = {
  C3: {
    order: 3,
    rows: [
      ['A', 1, 'z'],
      ['E', 2, 'xy', true],
    ],
  },
  C4: {
    order: 4,
    rows: [
      ['A', 1, 'z'],
      ['B', 1, null],
      ['E', 2, 'xy', true],
    ],
  },
  C6: {
    order: 6,
    rows: [
      ['A', 1, 'z'],
      ['B', 1, null],
      ['E1', 2, 'xy', true],
      ['E2', 2, null, true],
    ],
  },
  S4: {
    order: 4,
    rows: [
      ['A', 1, null],
      ['B', 1, 'z'],
      ['E', 2, 'xy', true],
    ],
  },
  S6: {
    order: 6,
    rows: [
      ['Ag', 1, null],
      ['Eg', 2, null, true],
      ['Au', 1, 'z'],
      ['Eu', 2, 'xy', true],
    ],
  },
  C3v: {
    order: 6,
    rows: [
      ['A1', 1, 'z'],
      ['A2', 1, null],
      ['E', 2, 'xy'],
    ],
  },
  C4v: {
    order: 8,
    rows: [
      ['A1', 1, 'z'],
      ['A2', 1, null],
      ['B1', 1, null],
      ['B2', 1, null],
      ['E', 2, 'xy'],
    ],
  },
  C5v: {
    order: 10,
    rows: [
      ['A1', 1, 'z'],
      ['A2', 1, null],
      ['E1', 2, 'xy'],
      ['E2', 2, null],
    ],
  },
  C6v: {
    order: 12,
    rows: [
      ['A1', 1, 'z'],
      ['A2', 1, null],
      ['B1', 1, null],
      ['B2', 1, null],
      ['E1', 2, 'xy'],
      ['E2', 2, null],
    ],
  },
  C3h: {
    order: 6,
    rows: [
      ["A'", 1, null],
      ["E'", 2, 'xy', true],
      ["A''", 1, 'z'],
      ["E''", 2, null, true],
    ],
  },
  C4h: {
    order: 8,
    rows: [
      ['Ag', 1, null],
      ['Bg', 1, null],
      ['Eg', 2, null, true],
      ['Au', 1, 'z'],
      ['Bu', 1, null],
      ['Eu', 2, 'xy', true],
    ],
  },
  C6h: {
    order: 12,
    rows: [
      ['Ag', 1, null],
      ['Bg', 1, null],
      ['E1g', 2, null, true],
      ['E2g', 2, null, true],
      ['Au', 1, 'z'],
      ['Bu', 1, null],
      ['E1u', 2, 'xy', true],
      ['E2u', 2, null, true],
    ],
  },
  D3: {
    order: 6,
    rows: [
      ['A1', 1, null],
      ['A2', 1, 'z'],
      ['E', 2, 'xy'],
    ],
  },
  D4: {
    order: 8,
    rows: [
      ['A1', 1, null],
      ['A2', 1, 'z'],
      ['B1', 1, null],
      ['B2', 1, null],
      ['E', 2, 'xy'],
    ],
  },
  D6: {
    order: 12,
    rows: [
      ['A1', 1, null],
      ['A2', 1, 'z'],
      ['B1', 1, null],
      ['B2', 1, null],
      ['E1', 2, 'xy'],
      ['E2', 2, null],
    ],
  },
  D2d: {
    order: 8,
    rows: [
      ['A1', 1, null],
      ['A2', 1, null],
      ['B1', 1, null],
      ['B2', 1, 'z'],
      ['E', 2, 'xy'],
    ],
  },
  D3d: {
    order: 12,
    rows: [
      ['A1g', 1, null],
      ['A2g', 1, null],
      ['Eg', 2, null],
      ['A1u', 1, null],
      ['A2u', 1, 'z'],
      ['Eu', 2, 'xy'],
    ],
  },
  D4d: {
    order: 16,
    rows: [
      ['A1', 1, null],
      ['A2', 1, null],
      ['B1', 1, null],
      ['B2', 1, 'z'],
      ['E1', 2, 'xy'],
      ['E2', 2, null],
      ['E3', 2, null],
    ],
  },
  D3h: {
    order: 12,
    rows: [
      ["A1'", 1, null],
      ["A2'", 1, null],
      ["E'", 2, 'xy'],
      ["A1''", 1, null],
      ["A2''", 1, 'z'],
      ["E''", 2, null],
    ],
  },
  D4h: {
    order: 16,
    rows: [
      ['A1g', 1, null],
      ['A2g', 1, null],
      ['B1g', 1, null],
      ['B2g', 1, null],
      ['Eg', 2, null],
      ['A1u', 1, null],
      ['A2u', 1, 'z'],
      ['B1u', 1, null],
      ['B2u', 1, null],
      ['Eu', 2, 'xy'],
    ],
  },
  D5h: {
    order: 20,
    rows: [
      ["A1'", 1, null],
      ["A2'", 1, null],
      ["E1'", 2, 'xy'],
      ["E2'", 2, null],
      ["A1''", 1, null],
      ["A2''", 1, 'z'],
      ["E1''", 2, null],
      ["E2''", 2, null],
    ],
  },
  D6h: {
    order: 24,
    rows: [
      ['A1g', 1, null],
      ['A2g', 1, null],
      ['B1g', 1, null],
      ['B2g', 1, null],
      ['E1g', 2, null],
      ['E2g', 2, null],
      ['A1u', 1, null],
      ['A2u', 1, 'z'],
      ['B1u', 1, null],
      ['B2u', 1, null],
      ['E1u', 2, 'xy'],
      ['E2u', 2, null],
    ],
  },
};

// Other common names of the same group.
const GROUP_ALIASES: Record<string, string> = { c3i: 'S6' };

// Typographic variants seen in pasted labels, mapped to plain ASCII before comparing.
const CHAR_MAP: Record<string, string> = {
  '′': "'",
  ʹ: "'",
  '’': "'",
  '‘': "'",
  '`': "'",
  '´': "'",
  '″': "''",
  ʺ: "''",
  '"': "''",
  '”': "''",
  '₀': '0',
  '₁': '1',
  '₂': '2',
  '₃': '3',
  '₄': '4',
  '₅': '5',
  '₆': '6',
  '₇': '7',
  '₈': '8',
  '₉': '9',
  '¹': '1',
  '²': '2',
  ᵤ: 'u',
  ₕ: 'h',
  ᵥ: 'v',
};

function normalizeLabel(text: string): string {
  let out = '';
  for (const ch of text) {
    const mapped = CHAR_MAP[ch] ?? ch;
    // Subscript/superscript markup (A_1, A_{1g}, E^'), spaces
    if (/^[\s_{}^]$/.test(mapped)) continue;
    out += mapped;
  }
  // Primes may be typeset before the subscript (A′₁ for A₁′): move them all to the end.
  const primes = out.replace(/[^']/g, '');
  return out.replace(/'/g, '').toLowerCase() + primes;
}

function tableKey(fn: string, pointGroup: unknown): string {
  if (typeof pointGroup !== 'string') {
    throw new Error(`${fn}: pointGroup must be a string, got ${String(pointGroup)}`);
  }
  const norm = normalizeLabel(pointGroup);
  const alias = GROUP_ALIASES[norm];
  if (alias) return alias;
  for (const key of Object.keys(TABLE_ROWS)) if (key.toLowerCase() === norm) return key;
  throw new Error(`${fn}: unknown point group "${pointGroup}"; valid: ${Object.keys(TABLE_ROWS).join(', ')} (alias C3i = S6)`);
}

function rowToSpecies(row: Row): BandSymmetrySpecies {
  return { label: row[0], dimension: row[1], transformsLike: row[2], isComplexPair: row[3] === true };
}

/**
 * Point groups known to bandTypeFromSymmetry, all of them symmetric-top groups (one C_n axis
 * with n >= 3, or an S4 axis).
 * @returns Schoenflies symbols, e.g. "C3v", "D6h"
 */
export function bandSymmetryPointGroups(): string[] {
  return Object.keys(TABLE_ROWS);
}

/**
 * Species and order of one point group, with each species' dimension and dipole component.
 * A complex-conjugate pair of 1-D irreps (cyclic groups C3, S4, C3h, ...) appears once, as the
 * real 2-D label "E" with isComplexPair = true.
 * Source: Cotton (1990) Appendix IIA.
 * @param pointGroup Schoenflies symbol, case-insensitive ("c3v", "C_{3v}", "C₃ᵥ")
 * @returns group order h (number of operations) and its species in table order
 */
export function bandSymmetryTable(pointGroup: string): BandSymmetryTable {
  const key = tableKey('bandSymmetryTable', pointGroup);
  const { order, rows } = TABLE_ROWS[key];
  return { pointGroup: key, order, species: rows.map(rowToSpecies) };
}

/**
 * Every species label of a point group, in table order (a complex-conjugate pair as one "E").
 * @param pointGroup Schoenflies symbol, case-insensitive
 * @returns Mulliken labels with ASCII primes, e.g. ["A1'", "A2'", "E'", "A1''", "A2''", "E''"]
 */
export function bandSymmetrySpecies(pointGroup: string): string[] {
  const key = tableKey('bandSymmetrySpecies', pointGroup);
  return TABLE_ROWS[key].rows.map((r) => r[0]);
}

/**
 * Band type of a vibrational transition of the given species: z-like → parallel (ΔK = 0),
 * (x, y)-like → perpendicular (ΔK = ±1), otherwise infrared inactive.
 * Labels are case-insensitive; primes may be ' or ′ (″ for a double prime) and subscripts may
 * be written A1, A_1, A_{1g} or A₁. A complex pair may also be named by one component (¹E, 2E').
 * WARNING: pass the species of the transition (upper ⊗ lower vibrational species). For a
 * fundamental from the ground state that is the species of the upper level; for a hot band or
 * combination band reduce the product first.
 * Source: Herzberg II (1945) ch. IV; Cotton (1990) Appendix IIA for the z and (x, y) columns.
 * @param pointGroup Schoenflies symbol, e.g. "C3v", "D3h"
 * @param species Mulliken label, e.g. "A2''"
 * @returns activity and a plain-language reason
 */
export function bandTypeFromSymmetry(pointGroup: string, species: string): BandSymmetryResult {
  const fn = 'bandTypeFromSymmetry';
  const key = tableKey(fn, pointGroup);
  if (typeof species !== 'string') {
    throw new Error(`${fn}: species must be a string, got ${String(species)}`);
  }
  const list = TABLE_ROWS[key].rows.map(rowToSpecies);
  const norm = normalizeLabel(species);
  let found = list.find((s) => normalizeLabel(s.label) === norm);
  if (!found && /^[12]/.test(norm)) {
    // ¹E / ²E: one component of a complex-conjugate pair; both belong to the same real E.
    found = list.find((s) => s.isComplexPair && normalizeLabel(s.label) === norm.slice(1));
  }
  if (!found) {
    throw new Error(`${fn}: species "${species}" is not a species of ${key}; valid: ${list.map((s) => s.label).join(', ')}`);
  }
  const name = found.isComplexPair ? `${found.label} (real pair of complex-conjugate 1-D species)` : found.label;
  if (found.transformsLike === 'z') {
    return { activity: 'parallel', reason: `${name} of ${key} transforms like z: parallel band (ΔK = 0)` };
  }
  if (found.transformsLike === 'xy') {
    return {
      activity: 'perpendicular',
      reason: `${name} of ${key} transforms like (x, y): perpendicular band (ΔK = ±1)`,
    };
  }
  return {
    activity: 'inactive',
    reason: `${name} of ${key} transforms like neither z nor (x, y): no dipole transition, infrared inactive`,
  };
}
