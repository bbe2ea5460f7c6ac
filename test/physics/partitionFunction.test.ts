import { describe, expect, it } from 'vitest';
import { stateConstantsFrom } from '../../src/physics/model';
import { partitionFunction } from '../../src/physics/partitionFunction';

// c2 = hc/k, cm K (CODATA 2018, Tiesinga et al. 2021), written out so the check is independent.
const C2 = 1.438_776_877;

describe('partitionFunction', () => {
  it('refuses a non-positive temperature', () => {
    expect(() => partitionFunction(stateConstantsFrom({ B: 1 }), 'linear', 0)).toThrow(/partitionFunction: temperatureK .*got 0/);
    expect(() => partitionFunction(stateConstantsFrom({ B: 1 }), 'linear', -5)).toThrow(/got -5/);
  });

  it('tends to 1 + 3 exp(−2Bc2/T) + … at low temperature', () => {
    // Ref: Herzberg II (1945) ch. V, eq. (V,14) summed by hand over J = 0, 1, 2 (linear, B = 1 cm^-1, 1 K).
    const T = 1;
    const want = 1 + 3 * Math.exp((-C2 * 2) / T) + 5 * Math.exp((-C2 * 6) / T);
    // Tol: the J = 3 term, 7·exp(−12·c2/1) ≈ 2e-7, is included by the module and omitted here (+1 % for J ≥ 4).
    expect(Math.abs(partitionFunction(stateConstantsFrom({ B: 1 }), 'linear', T) - want)).toBeLessThan(7 * Math.exp((-C2 * 12) / T) * 1.01);
  });

  it('matches the high-temperature expansion of a linear molecule', () => {
    // Ref: H. P. Mulholland, Proc. Camb. Phil. Soc. 24, 280 (1928) (from memory; common practice):
    //   Q = 1/x + 1/3 + x/15 + 4x²/315 + …, x = hcB/kT.
    // Tol x³ + 1e-11·Q absolute: the next term of the series is of order x³, and the module stops
    // summing when a J shell adds < 1e-12 of Q (the tail left is a few times that).
    for (const T of [50, 296, 1000]) {
      const B = 0.39;
      const x = (C2 * B) / T;
      const q = partitionFunction(stateConstantsFrom({ B }), 'linear', T);
      expect(Math.abs(q - (1 / x + 1 / 3 + x / 15 + (4 * x * x) / 315))).toBeLessThan(x ** 3 + 1e-11 * q);
      // The two-term form kT/hcB + 1/3 is good to about x/15.
      expect(Math.abs(q - (1 / x + 1 / 3))).toBeLessThan(x / 10);
    }
  });

  for (const [label, shape, B, unique] of [
    ['CH3F-like prolate top', 'prolate', 0.851_794, 5.182],
    ['heavier prolate top', 'prolate', 0.32, 2.6],
    ['oblate top', 'oblate', 0.25, 0.13],
  ] as const) {
    it(`matches the classical symmetric-top value with its first quantum correction (${label})`, () => {
      // Classical limit (σ = 1): Q_cl = sqrt(π/(A B²)) (kT/hc)^{3/2}, Herzberg II (1945) eq. (V,15).
      // First correction factor exp[β(4B − B²/A)/12], β = hc/kT (A → C for an oblate top): J. E. Viney,
      // Proc. Camb. Phil. Soc. 29, 142 (1933); R. S. McDowell, J. Chem. Phys. 88, 356 (1988) (form from
      // memory; it reduces to the spherical-top factor exp(βB/4) for A = B).
      // Tol 0.1·(βB)²: the neglected terms are second order in β; their coefficient is ~0.01 here.
      for (const T of [50, 100, 296, 1000]) {
        const beta = C2 / T;
        const s = stateConstantsFrom(shape === 'prolate' ? { B, A: unique } : { B, C: unique });
        const q = partitionFunction(s, shape, T);
        const classical = Math.sqrt(Math.PI / (unique * B * B)) * beta ** -1.5;
        const corrected = classical * Math.exp((beta * (4 * B - (B * B) / unique)) / 12);
        expect(Math.abs(q / corrected - 1)).toBeLessThan(0.1 * (beta * B) ** 2);
        // Without the correction the classical value is off by about β(4B − B²/A)/12 (< βB/3).
        expect(Math.abs(q / classical - 1)).toBeLessThan((beta * B) / 3);
      }
    });
  }

  it('averages the nuclear-spin weights over K at high temperature', () => {
    // Common practice: at kT ≫ hcA the K ladder is quasi-continuous, so Q(g) ≈ ⟨g⟩·Q(1) with ⟨g⟩ the mean
    // of the weights over K mod 3 (here (4+2+2)/3). Tol 1 %: the K = 0 level (single, weight 4) and the
    // discreteness of K at βA ≈ 0.013 shift the mean by less than that.
    const s = stateConstantsFrom({ B: 0.32, A: 2.6 });
    const plain = partitionFunction(s, 'prolate', 296);
    const weighted = partitionFunction(s, 'prolate', 296, { spinWeights: [4, 2, 2] });
    expect(Math.abs(weighted / plain / (8 / 3) - 1)).toBeLessThan(0.01);
  });

  it('stops at jLimit when asked', () => {
    const s = stateConstantsFrom({ B: 1 });
    // J = 0 and 1 only: 1 + 3 exp(−2c2/T) (Herzberg II eq. (V,14) by hand).
    expect(partitionFunction(s, 'linear', 300, { jLimit: 1 })).toBeCloseTo(1 + 3 * Math.exp((-2 * C2) / 300), 14);
  });
});
