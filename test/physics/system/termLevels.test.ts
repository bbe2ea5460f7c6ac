import { describe, expect, it } from 'vitest';
import { stateConstantsFrom } from '../../../src/physics/model';
import { termLevelProvider } from '../../../src/physics/system/termLevels';
import { levelEnergy } from '../../../src/physics/termValues';

const prolate = {
  origin: 1014.6,
  B: 0.4417,
  A: 5.083,
  DJ: 6.2e-7,
  DJK: 4.0e-6,
  DK: 8.1e-5,
  HJ: 1e-12,
  HJK: 2e-11,
  HKJ: -3e-10,
  HK: 4e-9,
  zeta: 0.281,
};

describe('termLevelProvider', () => {
  it('gives a nondegenerate state one level per K (l = 0) with termValues.levelEnergy plus the origin', () => {
    const p = termLevelProvider('prolate', false);
    const values = Float64Array.from(p.parameterNames, (n) => prolate[n as keyof typeof prolate]);
    const s = p.levels(6, values, 4);
    expect(Array.from(s.K.subarray(0, s.count))).toEqual([0, 1, 2, 3, 4]);
    for (let i = 0; i < s.count; i++) {
      expect(s.energyCm1[i]).toBe(prolate.origin + levelEnergy(stateConstantsFrom({ ...prolate, origin: 0 }), 'prolate', 6, s.K[i]));
      expect(s.componentCount[i]).toBe(s.K[i] === 0 ? 1 : 2);
    }
  });

  it('splits K > 0 of a degenerate state into (+l) and (−l) levels 4AζK apart', () => {
    // Ref: Herzberg II (1945) eq. (IV,45): E = … − 2Aζkℓ, so the (+l) and (−l) levels of one K differ by 4AζK.
    const p = termLevelProvider('prolate', true);
    const values = Float64Array.from(p.parameterNames, (n) => prolate[n as keyof typeof prolate]);
    const s = p.levels(5, values, 3);
    const at = (K: number, l: number) => s.energyCm1[Array.from(s.K).findIndex((k, i) => k === K && s.l[i] === l && i < s.count)];
    expect(at(3, -1) - at(3, 1)).toBeCloseTo(4 * prolate.A * prolate.zeta * 3, 10);
    expect(s.count).toBe(7);
  });

  it('gives analytic derivatives that match central finite differences for every constant', () => {
    // E is linear in each constant separately (A·ζ is bilinear), so a central difference is exact up to
    // round-off: ~1e-16·|E|/h ≈ 1e-10 with h = 1e-3 against derivatives >= 1e-3 of the largest; tolerance 1e-6.
    for (const [shape, deg, constants] of [
      ['prolate', true, prolate],
      ['oblate', false, { ...prolate, C: 0.21, A: 0 }],
      ['linear', true, { origin: 222.4, B: 0.1516, DJ: 1.9e-8, HJ: 1e-14, q: 2.2e-4, qJ: -3e-10 }],
    ] as const) {
      const p = termLevelProvider(shape, deg);
      const values = Float64Array.from(p.parameterNames, (n) => (constants as Record<string, number>)[n] ?? 0);
      const n = p.parameterNames.length;
      const base = p.levels(7, values, 5);
      const count = base.count;
      const grad = base.gradient.slice(0, count * n);
      for (let j = 0; j < n; j++) {
        const h = 1e-3;
        const plus = Float64Array.from(values);
        const minus = Float64Array.from(values);
        plus[j] += h;
        minus[j] -= h;
        const ePlus = p.levels(7, plus, 5).energyCm1.slice(0, count);
        const eMinus = p.levels(7, minus, 5).energyCm1.slice(0, count);
        for (let i = 0; i < count; i++) {
          const fd = (ePlus[i] - eMinus[i]) / (2 * h);
          const scale = Math.max(
            Math.abs(grad[i * n + j]),
            1e-3 *
              Math.max(
                ...Array.from(
                  grad.filter((_, k) => k % n === j),
                  Math.abs,
                ),
              ),
            1e-300,
          );
          expect(Math.abs(fd - grad[i * n + j]) / scale, `${shape} ${p.parameterNames[j]} level ${i}`).toBeLessThan(1e-6);
        }
      }
    }
  });

  it('gives a linear Π state e and f levels at ±q_eff/2·J(J+1), q_eff = q + qJ·J(J+1)', () => {
    // Ref: Hollas, High Resolution Spectroscopy (1998) sec. 6.2 (ℓ-type doubling Δν = q J(J+1)).
    const p = termLevelProvider('linear', true);
    const q = 2.2e-4;
    const qJ = -3e-10;
    const s = p.levels(10, Float64Array.from([0, 0.15, 0, 0, q, qJ]), 1);
    expect(s.tag.slice(0, 2)).toEqual(['e', 'f']);
    // Round-off of the level energies (~1e-16 × 17 cm^-1): 13 decimals.
    expect(s.energyCm1[0] - s.energyCm1[1]).toBeCloseTo((q + qJ * 110) * 110, 13);
    expect(p.levels(0, Float64Array.from([0, 0.15, 0, 0, q, qJ]), 1).count).toBe(0);
  });
});
