import { describe, expect, it } from 'vitest';
import { nondegenerateStateLevels, nondegenerateStateParameterNames } from '../../../src/physics/hamiltonian/nondegenerateStateLevels';
import { stateConstantsFrom } from '../../../src/physics/model';
import { levelEnergy } from '../../../src/physics/termValues';

describe('nondegenerateStateLevels', () => {
  const c = { origin: 12.5, B: 0.31, A: 5.2, DJ: 3e-7, DJK: 2e-6, DK: 4e-5, HJ: 1e-12, HJK: 2e-11, HKJ: 3e-10, HK: 4e-9 };

  it('gives origin + F(J,K) of the project contract up to sextic order', () => {
    // Ref: DEVELOPERS.md F(J,K) via termValues.levelEnergy (Herzberg II (1945) eq. (I,31)–(I,33)); same
    // arithmetic up to summation order: tolerance 1e-10 cm⁻¹.
    const state = stateConstantsFrom(c);
    for (const J of [0, 3, 20]) {
      for (const lev of nondegenerateStateLevels(c, J, { shape: 'prolate', pointGroup: 'C3v' }).levels) {
        expect(Math.abs(lev.energyCm1 - c.origin - levelEnergy(state, 'prolate', J, lev.K))).toBeLessThan(1e-10);
      }
    }
  });

  it('adds the octic terms with a + sign', () => {
    // Hand-worked: J = 2, K = 1, LJ = 1e-6: + LJ·6⁴ = 1.296e-3; LJJK = 1e-6: + 6³·1 = 2.16e-4 cm⁻¹.
    const base = nondegenerateStateLevels({}, 2, { shape: 'prolate', pointGroup: 'C3v' }).levels.find((l) => l.K === 1)!.energyCm1;
    const withL = nondegenerateStateLevels({ LJ: 1e-6, LJJK: 1e-6 }, 2, { shape: 'prolate', pointGroup: 'C3v' }).levels.find(
      (l) => l.K === 1,
    )!;
    expect(withL.energyCm1 - base).toBeCloseTo(1.296e-3 + 2.16e-4, 15);
    const names = nondegenerateStateParameterNames('prolate');
    expect(withL.derivatives[names.indexOf('LJ')]).toBe(1296);
  });

  it('lists K = 3n > 0 as an A1/A2 pair and other K > 0 as one E level', () => {
    // Ref: C3v(M) rotational species, Bunker and Jensen (1998) ch. 12 (from memory): K = 0 A1 (even J) / A2
    // (odd J), K = 3n > 0 A1 + A2, otherwise E.
    const levels = nondegenerateStateLevels(c, 4, { shape: 'prolate', pointGroup: 'C3v' }).levels;
    expect(levels.map((l) => `${l.K}${l.tag}:${l.species}`)).toEqual(['0:A1', '1:E', '2:E', '3A1:A1', '3A2:A2', '4:E']);
    expect(nondegenerateStateLevels(c, 3, { shape: 'prolate', pointGroup: 'C3v', vibSpecies: 'A2' }).levels[0].species).toBe('A1');
    expect(() => nondegenerateStateLevels(c, 3, { shape: 'prolate', pointGroup: 'C3v', vibSpecies: 'E' })).toThrow(/degenerate/);
    expect(() => nondegenerateStateLevels({ zeta: 0.2 }, 3, { shape: 'prolate', pointGroup: 'C3v' })).toThrow(
      /zeta belongs to a degenerate \(E\) state/,
    );
    expect(() => nondegenerateStateLevels({ C: 2 }, 3, { shape: 'prolate', pointGroup: 'C3v' })).toThrow(/C belongs to an oblate top/);
    expect(() => nondegenerateStateLevels({ B: NaN }, 3, { shape: 'prolate', pointGroup: 'C3v' })).toThrow(/B must be a finite number/);
  });
});
