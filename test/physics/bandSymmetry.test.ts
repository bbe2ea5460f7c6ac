import { describe, expect, it } from 'vitest';
import { bandSymmetryPointGroups, bandSymmetrySpecies, bandSymmetryTable, bandTypeFromSymmetry } from '../../src/physics/bandSymmetry';

// Reference tables, written out here independently of the module.
// Ref: F. A. Cotton, Chemical Applications of Group Theory, 3rd ed. (1990), Appendix IIA
// character tables, and P. W. Atkins, M. Child, C. Phillips, Tables for Group Theory (OUP 2006);
// all entries from memory. Per group: order h, number of classes, species in table order,
// the z species and the (x, y) species. Complex-conjugate pairs are written as the real "E".
interface Expected {
  order: number;
  classes: number;
  species: string[];
  z: string;
  xy: string;
}
const EXPECTED: Record<string, Expected> = {
  C3: { order: 3, classes: 3, species: ['A', 'E'], z: 'A', xy: 'E' },
  C4: { order: 4, classes: 4, species: ['A', 'B', 'E'], z: 'A', xy: 'E' },
  C6: { order: 6, classes: 6, species: ['A', 'B', 'E1', 'E2'], z: 'A', xy: 'E1' },
  S4: { order: 4, classes: 4, species: ['A', 'B', 'E'], z: 'B', xy: 'E' },
  S6: { order: 6, classes: 6, species: ['Ag', 'Eg', 'Au', 'Eu'], z: 'Au', xy: 'Eu' },
  C3v: { order: 6, classes: 3, species: ['A1', 'A2', 'E'], z: 'A1', xy: 'E' },
  C4v: { order: 8, classes: 5, species: ['A1', 'A2', 'B1', 'B2', 'E'], z: 'A1', xy: 'E' },
  C5v: { order: 10, classes: 4, species: ['A1', 'A2', 'E1', 'E2'], z: 'A1', xy: 'E1' },
  C6v: { order: 12, classes: 6, species: ['A1', 'A2', 'B1', 'B2', 'E1', 'E2'], z: 'A1', xy: 'E1' },
  C3h: { order: 6, classes: 6, species: ["A'", "E'", "A''", "E''"], z: "A''", xy: "E'" },
  C4h: { order: 8, classes: 8, species: ['Ag', 'Bg', 'Eg', 'Au', 'Bu', 'Eu'], z: 'Au', xy: 'Eu' },
  C6h: {
    order: 12,
    classes: 12,
    species: ['Ag', 'Bg', 'E1g', 'E2g', 'Au', 'Bu', 'E1u', 'E2u'],
    z: 'Au',
    xy: 'E1u',
  },
  D3: { order: 6, classes: 3, species: ['A1', 'A2', 'E'], z: 'A2', xy: 'E' },
  D4: { order: 8, classes: 5, species: ['A1', 'A2', 'B1', 'B2', 'E'], z: 'A2', xy: 'E' },
  D6: { order: 12, classes: 6, species: ['A1', 'A2', 'B1', 'B2', 'E1', 'E2'], z: 'A2', xy: 'E1' },
  D2d: { order: 8, classes: 5, species: ['A1', 'A2', 'B1', 'B2', 'E'], z: 'B2', xy: 'E' },
  D3d: { order: 12, classes: 6, species: ['A1g', 'A2g', 'Eg', 'A1u', 'A2u', 'Eu'], z: 'A2u', xy: 'Eu' },
  D4d: {
    order: 16,
    classes: 7,
    species: ['A1', 'A2', 'B1', 'B2', 'E1', 'E2', 'E3'],
    z: 'B2',
    xy: 'E1',
  },
  D3h: { order: 12, classes: 6, species: ["A1'", "A2'", "E'", "A1''", "A2''", "E''"], z: "A2''", xy: "E'" },
  D4h: {
    order: 16,
    classes: 10,
    species: ['A1g', 'A2g', 'B1g', 'B2g', 'Eg', 'A1u', 'A2u', 'B1u', 'B2u', 'Eu'],
    z: 'A2u',
    xy: 'Eu',
  },
  D5h: {
    order: 20,
    classes: 8,
    species: ["A1'", "A2'", "E1'", "E2'", "A1''", "A2''", "E1''", "E2''"],
    z: "A2''",
    xy: "E1'",
  },
  D6h: {
    order: 24,
    classes: 12,
    species: ['A1g', 'A2g', 'B1g', 'B2g', 'E1g', 'E2g', 'A1u', 'A2u', 'B1u', 'B2u', 'E1u', 'E2u'],
    z: 'A2u',
    xy: 'E1u',
  },
};

// --- Independent geometry: build each group from its Schoenflies symbol as 3×3 matrices. ---
// Ref: Cotton (1990) ch. 3 (generators of C_n, C_nv, C_nh, D_n, D_nh, D_nd, S_2n); the group is
// closed by repeated multiplication, so order and class count come from geometry, not tables.
type M3 = number[]; // row-major 3×3
const mul = (a: M3, b: M3): M3 => {
  const c = new Array<number>(9).fill(0);
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) for (let k = 0; k < 3; k++) c[3 * i + j] += a[3 * i + k] * b[3 * k + j];
  return c;
};
const transpose = (a: M3): M3 => [a[0], a[3], a[6], a[1], a[4], a[7], a[2], a[5], a[8]];
// Entries are cosines/sines of multiples of 2π/n; 1e-6 rounding merges float round-off (~1e-15).
const keyOf = (a: M3): string => a.map((x) => (Math.abs(x) < 1e-6 ? 0 : x).toFixed(6)).join(',');
const rotZ = (angle: number): M3 => {
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  return [c, -s, 0, s, c, 0, 0, 0, 1];
};
const SIGMA_H: M3 = [1, 0, 0, 0, 1, 0, 0, 0, -1];
const SIGMA_V_XZ: M3 = [1, 0, 0, 0, -1, 0, 0, 0, 1];
const C2_X: M3 = [1, 0, 0, 0, -1, 0, 0, 0, -1];

function generators(symbol: string): M3[] {
  const m = /^([CDS])(\d+)([vhd]?)$/.exec(symbol);
  if (!m) throw new Error(`test: cannot parse ${symbol}`);
  const n = Number(m[2]);
  if (m[1] === 'S') return [mul(SIGMA_H, rotZ((2 * Math.PI) / n))];
  const cn = rotZ((2 * Math.PI) / n);
  const gens = [cn];
  if (m[1] === 'D') gens.push(C2_X);
  if (m[3] === 'v') gens.push(SIGMA_V_XZ);
  if (m[3] === 'h') gens.push(SIGMA_H);
  if (m[3] === 'd') gens.push(mul(SIGMA_H, rotZ(Math.PI / n))); // S_2n about z
  return gens;
}

function closeGroup(gens: M3[]): M3[] {
  const elems = new Map<string, M3>();
  const identity: M3 = [1, 0, 0, 0, 1, 0, 0, 0, 1];
  elems.set(keyOf(identity), identity);
  let frontier = [identity];
  while (frontier.length > 0) {
    const next: M3[] = [];
    for (const a of frontier)
      for (const g of gens) {
        const p = mul(a, g);
        const k = keyOf(p);
        if (!elems.has(k)) {
          elems.set(k, p);
          next.push(p);
        }
      }
    frontier = next;
  }
  return [...elems.values()];
}

function classCount(group: M3[]): number {
  const seen = new Set<string>();
  let count = 0;
  for (const x of group) {
    if (seen.has(keyOf(x))) continue;
    count++;
    // Orthogonal matrices: g⁻¹ = gᵀ
    for (const g of group) seen.add(keyOf(mul(mul(g, x), transpose(g))));
  }
  return count;
}

const isAbelian = (group: M3[]): boolean => group.every((a) => group.every((b) => keyOf(mul(a, b)) === keyOf(mul(b, a))));

// Σ_R |χ(R)|² / h for the z (χ = R_zz) and (x, y) (χ = R_xx + R_yy) representations.
// Ref: Cotton (1990) §4.3, eq. 4.3-4: the sum is h exactly for an irreducible representation,
// and 2h for the sum of two inequivalent 1-D irreps (a complex-conjugate pair).
function normSquared(group: M3[], chi: (r: M3) => number): number {
  return group.reduce((s, r) => s + chi(r) ** 2, 0) / group.length;
}

const REQUIRED = ['C3v', 'C4v', 'C6v', 'C3', 'C3h', 'D3', 'D3h', 'D3d', 'D2d', 'D4h', 'D6h', 'S4'];

describe('bandSymmetryPointGroups', () => {
  it('lists every group of the reference set and no other', () => {
    expect([...bandSymmetryPointGroups()].sort()).toEqual(Object.keys(EXPECTED).sort());
    for (const g of REQUIRED) expect(bandSymmetryPointGroups()).toContain(g);
  });
});

describe.each(Object.keys(EXPECTED))('point group %s', (group) => {
  const exp = EXPECTED[group];
  const table = bandSymmetryTable(group);
  const geometry = closeGroup(generators(group));

  it('has the species of the reference character table, in order', () => {
    expect(bandSymmetrySpecies(group)).toEqual(exp.species);
  });

  it('has the order of the reference table and of the group built from its generators', () => {
    expect(table.order).toBe(exp.order);
    expect(geometry.length).toBe(exp.order);
  });

  it('has as many irreps as classes (a complex pair counts as two)', () => {
    // Ref: Cotton (1990) §4.3, rule 5: number of irreps = number of classes.
    const irreps = table.species.reduce((n, s) => n + (s.isComplexPair ? 2 : 1), 0);
    expect(irreps).toBe(exp.classes);
    expect(classCount(geometry)).toBe(exp.classes);
  });

  it('has dimensions whose squares sum to the group order', () => {
    // Ref: Cotton (1990) §4.3, rule 1: Σ d_i² = h; a complex pair contributes 1² + 1² = 2.
    const sum = table.species.reduce((n, s) => n + (s.isComplexPair ? 2 : s.dimension ** 2), 0);
    expect(sum).toBe(exp.order);
  });

  it('uses complex pairs exactly when the group is abelian', () => {
    // Ref: Cotton (1990) §4.3: every irrep of an abelian group is 1-D, so a 2-D E there must be a
    // pair of complex 1-D irreps; the non-abelian groups here have real 2-D E species.
    const abelian = isAbelian(geometry);
    for (const s of table.species) {
      if (s.dimension === 2) expect(s.isComplexPair).toBe(abelian);
      else expect(s.isComplexPair).toBe(false);
    }
  });

  it('assigns z and (x, y) to the reference species only', () => {
    expect(table.species.filter((s) => s.transformsLike === 'z').map((s) => s.label)).toEqual([exp.z]);
    expect(table.species.filter((s) => s.transformsLike === 'xy').map((s) => s.label)).toEqual([exp.xy]);
    for (const label of exp.species) {
      const want = label === exp.z ? 'parallel' : label === exp.xy ? 'perpendicular' : 'inactive';
      expect(bandTypeFromSymmetry(group, label).activity).toBe(want);
    }
  });

  it('marks the dipole species consistently with the geometry', () => {
    // z alone is always 1-D irreducible; (x, y) is irreducible 2-D, or a complex pair (norm 2)
    // in an abelian group. Tolerance 1e-9: float round-off of cos(2π/n) sums.
    const zSpecies = table.species.find((s) => s.transformsLike === 'z')!;
    const xySpecies = table.species.find((s) => s.transformsLike === 'xy')!;
    expect(zSpecies.dimension).toBe(1);
    expect(normSquared(geometry, (r) => r[8])).toBeCloseTo(1, 9);
    expect(xySpecies.dimension).toBe(2);
    expect(normSquared(geometry, (r) => r[0] + r[4])).toBeCloseTo(xySpecies.isComplexPair ? 2 : 1, 9);
  });

  it('puts z and (x, y) in u species (with i) and in ″ / ′ species (with σh)', () => {
    // Ref: Cotton (1990) §4.4 (Mulliken labels): z and (x, y) are odd under i; under σh,
    // z is antisymmetric (″) and (x, y) symmetric (′).
    const keys = new Set(geometry.map(keyOf));
    if (keys.has(keyOf([-1, 0, 0, 0, -1, 0, 0, 0, -1]))) {
      expect(exp.z.endsWith('u') && exp.xy.endsWith('u')).toBe(true);
    }
    if (keys.has(keyOf(SIGMA_H)) && !keys.has(keyOf([-1, 0, 0, 0, -1, 0, 0, 0, -1]))) {
      expect(exp.z.endsWith("''")).toBe(true);
      expect(exp.xy.endsWith("'") && !exp.xy.endsWith("''")).toBe(true);
    }
  });
});

describe('bandTypeFromSymmetry spot checks on real molecules', () => {
  // Ref: G. Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. II tables of
  // fundamentals and ch. IV band types; from memory.
  it('CH3F-like C3v: A1 parallel, E perpendicular, A2 inactive', () => {
    expect(bandTypeFromSymmetry('C3v', 'A1').activity).toBe('parallel');
    expect(bandTypeFromSymmetry('C3v', 'E').activity).toBe('perpendicular');
    expect(bandTypeFromSymmetry('C3v', 'A2').activity).toBe('inactive');
  });

  it('NH3 (C3v) umbrella mode ν2 of species A1 is a parallel band', () => {
    expect(bandTypeFromSymmetry('c3v', 'a_1').activity).toBe('parallel');
  });

  it("BF3-like D3h: ν2 A2'' parallel, ν3 E' perpendicular, ν1 A1' inactive", () => {
    const r = bandTypeFromSymmetry('D3h', 'A2′′');
    expect(r.activity).toBe('parallel');
    expect(r.reason).toBe("A2'' of D3h transforms like z: parallel band (ΔK = 0)");
    expect(bandTypeFromSymmetry('D3h', 'E′').activity).toBe('perpendicular');
    expect(bandTypeFromSymmetry('D3h', "A1'").activity).toBe('inactive');
  });

  it('benzene-like D6h: A2u parallel, E1u perpendicular, all ten others inactive', () => {
    for (const label of bandSymmetrySpecies('D6h')) {
      const want = label === 'A2u' ? 'parallel' : label === 'E1u' ? 'perpendicular' : 'inactive';
      expect(bandTypeFromSymmetry('D6h', label).activity).toBe(want);
    }
    expect(bandSymmetrySpecies('D6h').filter((l) => l !== 'A2u' && l !== 'E1u')).toHaveLength(10);
  });

  it('allene-like D2d: B2 parallel, E perpendicular, B1 inactive', () => {
    expect(bandTypeFromSymmetry('D2d', 'B2').activity).toBe('parallel');
    expect(bandTypeFromSymmetry('D2d', 'E').activity).toBe('perpendicular');
    expect(bandTypeFromSymmetry('D2d', 'B1').activity).toBe('inactive');
  });

  it('ethane-like D3d: A2u parallel, Eu perpendicular, Eg inactive', () => {
    expect(bandTypeFromSymmetry('D3d', 'A_{2u}').activity).toBe('parallel');
    expect(bandTypeFromSymmetry('D3d', 'E_u').activity).toBe('perpendicular');
    expect(bandTypeFromSymmetry('D3d', 'Eg').activity).toBe('inactive');
  });
});

describe('bandTypeFromSymmetry label handling', () => {
  it('accepts case, subscript and prime variants of the same label', () => {
    for (const label of ["A2''", 'A2″', 'A_2′′', 'a₂"', "A''2", 'A′′₂']) {
      expect(bandTypeFromSymmetry('d3h', label).activity).toBe('parallel');
    }
    expect(bandTypeFromSymmetry('D_{6h}', 'e_{1u}').activity).toBe('perpendicular');
    expect(bandTypeFromSymmetry('C₃ᵥ', 'A₁').activity).toBe('parallel');
  });

  it('accepts E or one complex component for a complex-conjugate pair', () => {
    expect(bandTypeFromSymmetry('C3', 'E').activity).toBe('perpendicular');
    expect(bandTypeFromSymmetry('C3h', "¹E'").activity).toBe('perpendicular');
    expect(bandTypeFromSymmetry('C3h', "2E''").activity).toBe('inactive');
    expect(bandTypeFromSymmetry('S4', 'B').activity).toBe('parallel');
    expect(bandTypeFromSymmetry('C3', 'E').reason).toMatch(/complex-conjugate/);
  });

  it('accepts C3i as another name for S6', () => {
    expect(bandTypeFromSymmetry('C3i', 'Au').activity).toBe('parallel');
  });

  it('does not confuse single and double primes', () => {
    expect(bandTypeFromSymmetry('D3h', "E''").activity).toBe('inactive');
    expect(bandTypeFromSymmetry('D3h', "E'").activity).toBe('perpendicular');
  });

  it('rejects an unknown group, naming the function, the value and the valid groups', () => {
    expect(() => bandTypeFromSymmetry('C2v', 'A1')).toThrow(/bandTypeFromSymmetry: unknown point group "C2v".*C3v/);
    expect(() => bandSymmetrySpecies('Td')).toThrow(/bandSymmetrySpecies: unknown point group "Td"/);
  });

  it('rejects a species not in the group, listing the valid species', () => {
    expect(() => bandTypeFromSymmetry('C3v', 'B1')).toThrow(/bandTypeFromSymmetry: species "B1" is not a species of C3v; valid: A1, A2, E/);
    // a component prefix is only meaningful for a complex pair
    expect(() => bandTypeFromSymmetry('C3v', '1E')).toThrow(/species "1E"/);
    expect(() => bandTypeFromSymmetry('D3h', 'A2')).toThrow(/valid: A1', A2'/);
  });

  it('rejects non-string input with a clear error', () => {
    expect(() => bandTypeFromSymmetry(undefined as unknown as string, 'A1')).toThrow(
      /bandTypeFromSymmetry: pointGroup must be a string, got undefined/,
    );
    expect(() => bandTypeFromSymmetry('C3v', 3 as unknown as string)).toThrow(/species must be a string, got 3/);
  });
});
