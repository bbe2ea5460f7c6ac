import { describe, expect, it } from 'vitest';
import { degenerateStateLevels } from '../../../src/physics/hamiltonian/degenerateStateLevels';
import type { HamiltonianLevel } from '../../../src/physics/hamiltonian/hamiltonianLevel';
import { nondegenerateStateLevels } from '../../../src/physics/hamiltonian/nondegenerateStateLevels';
import { rovibDipoleSpecies, rovibSpeciesProduct } from '../../../src/physics/hamiltonian/rovibSymmetry';
import { transitionsAllowed } from '../../../src/physics/hamiltonian/transitionsAllowed';

const J_MAX = 7;
const upperE = { origin: 1000, B: 0.3, A: 5, zeta: 0.25, q22: 2e-3 };

function levelsTo(jMax: number, f: (J: number) => HamiltonianLevel[]): HamiltonianLevel[] {
  return [...Array(jMax + 1).keys()].flatMap(f);
}

describe('rovibSymmetry products', () => {
  it('reduces E ⊗ E to A1 + A2 + E and E′ ⊗ E″ to A1″ + A2″ + E″', () => {
    // Ref: direct products of C3v and D3h, Cotton (1990) App. IIA / Herzberg II (1945) Table 57, from memory.
    expect(rovibSpeciesProduct('C3v', 'E', 'E')).toEqual(['A1', 'A2', 'E']);
    expect(rovibSpeciesProduct('D3h', "E'", "E''")).toEqual(["A1''", "A2''", "E''"]);
    expect(rovibSpeciesProduct('D3h', "A2''", "A2''")).toEqual(["A1'"]);
  });

  it('puts the space-fixed dipole in A2 of C3v(M) and A1″ of D3h(M)', () => {
    // Ref: Bunker and Jensen (1998) ch. 14: μ_Z has the species Γ* (characters +1 for permutations, −1 for
    // permutation-inversions), from memory. NB: A2″ is the species of the molecule-fixed μ_z in the point
    // group D3h, a different thing.
    expect(rovibDipoleSpecies('C3v')).toBe('A2');
    expect(rovibDipoleSpecies('D3h')).toBe("A1''");
  });
});

describe('transitionsAllowed', () => {
  const lower = levelsTo(J_MAX, (J) => nondegenerateStateLevels({ B: 0.3, A: 5 }, J, { shape: 'prolate', pointGroup: 'C3v' }).levels);
  const upper = levelsTo(J_MAX + 1, (J) => degenerateStateLevels(upperE, J, { shape: 'prolate', pointGroup: 'C3v' }).levels);
  const allowed = transitionsAllowed(upper, lower, { pointGroup: 'C3v', band: 'perpendicular' });

  it('gives the textbook perpendicular-band line set: ΔK = ±1, ΔJ = 0, ±1, ΔK = +1 to (+l), ΔK = −1 to (−l)', () => {
    // Ref: Herzberg II (1945) ch. IV sec. 2 (perpendicular bands of symmetric tops: ΔK = ±1, ΔJ = 0, ±1,
    // Δk = Δℓ), from memory. Brute-force scan of the rules over the same quantum numbers.
    const got = new Set(
      allowed.map((t) => `${upper[t.upper].J},${upper[t.upper].K},${upper[t.upper].l},${lower[t.lower].J},${lower[t.lower].K}`),
    );
    const want = new Set<string>();
    for (let jLo = 0; jLo <= J_MAX; jLo++) {
      for (let kLo = 0; kLo <= jLo; kLo++) {
        for (const dK of [1, -1]) {
          const kUp = kLo + dK;
          if (kUp < 0) continue;
          for (const dJ of [-1, 0, 1]) {
            const jUp = jLo + dJ;
            if (jUp < kUp || jUp < 0 || (jUp === 0 && jLo === 0)) continue;
            // l = sign(kℓ): +1 for ΔK = +1, −1 for ΔK = −1, and 0 at K' = 0 (kℓ = 0).
            want.add(`${jUp},${kUp},${kUp === 0 ? 0 : dK},${jLo},${kLo}`);
          }
        }
      }
    }
    expect([...got].sort()).toEqual([...want].sort());
  });

  it('joins each member of a K = 3n pair to one member of the (+l) pair above it (A1 ↔ A2)', () => {
    for (const t of allowed) {
      const up = upper[t.upper];
      const lo = lower[t.lower];
      if (lo.K % 3 === 0 && lo.K > 0 && up.K === lo.K + 1) expect(new Set([up.species, lo.species])).toEqual(new Set(['A1', 'A2']));
    }
  });

  it('sends P and R lines from K″ = 0 to the upper member of the split K′ = 1 pair and Q lines to the lower', () => {
    // Ref: the linear-molecule analogue (DEVELOPERS.md: Π levels reached by P and R lines at +q/2·J(J+1),
    // by Q lines at −q/2·J(J+1); Hollas (1998) sec. 6.2); q22 > 0 here.
    for (const t of allowed) {
      const up = upper[t.upper];
      if (lower[t.lower].K !== 0) continue;
      const pair = upper.filter((u) => u.J === up.J && u.K === 1 && u.l === 1).map((u) => u.energyCm1);
      const isHigher = up.energyCm1 === Math.max(...pair);
      expect(isHigher).toBe(t.deltaJ !== 0);
    }
  });

  it('keeps s ↔ s and a ↔ a in a perpendicular band of an inverting XY3 (E′ and E″ components)', () => {
    // Ref: Herzberg II (1945) ch. IV (NH3 perpendicular bands: + ↔ − with s ↔ s, a ↔ a), from memory.
    // Components of an E state of NH3: s is E′, a is E″ in D3h(M) (inversionVibSpecies).
    const groundS = levelsTo(4, (J) =>
      nondegenerateStateLevels({ B: 9.9, C: 6.2 }, J, { shape: 'oblate', pointGroup: 'D3h' }).levels.map((l) => ({ ...l, tag: 's' })),
    );
    const groundA = levelsTo(4, (J) =>
      nondegenerateStateLevels({ origin: 0.79, B: 9.9, C: 6.2 }, J, { shape: 'oblate', pointGroup: 'D3h', vibSpecies: "A2''" }).levels.map(
        (l) => ({
          ...l,
          tag: 'a',
        }),
      ),
    );
    const eS = levelsTo(5, (J) =>
      degenerateStateLevels({ origin: 1626, B: 10, C: 6.1, zeta: -0.37 }, J, {
        shape: 'oblate',
        pointGroup: 'D3h',
        vibSpecies: "E'",
      }).levels.map((l) => ({ ...l, tag: 's' })),
    );
    const eA = levelsTo(5, (J) =>
      degenerateStateLevels({ origin: 1627, B: 10, C: 6.1, zeta: -0.37 }, J, {
        shape: 'oblate',
        pointGroup: 'D3h',
        vibSpecies: "E''",
      }).levels.map((l) => ({ ...l, tag: 'a' })),
    );
    const up = [...eS, ...eA];
    const lo = [...groundS, ...groundA];
    const pairs = transitionsAllowed(up, lo, { pointGroup: 'D3h', band: 'perpendicular' });
    expect(pairs.length).toBeGreaterThan(50);
    for (const t of pairs) expect(up[t.upper].tag[0]).toBe(lo[t.lower].tag[0]);
  });
});
