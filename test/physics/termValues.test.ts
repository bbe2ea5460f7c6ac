import { describe, expect, it } from 'vitest';
import { MHZ_PER_CM1 } from '../../src/physics/constants';
import { stateConstantsFrom, type BandModel, type StateConstants } from '../../src/physics/model';
import { levelEnergy, transitionWavenumber, upperLevelEnergy } from '../../src/physics/termValues';

/** Independent evaluation of the contract's F(J,K), written as a sum of separate terms. */
function termByHand(s: Partial<StateConstants>, unique: number, J: number, K: number): number {
  const B = s.B ?? 0;
  return (
    B * J * (J + 1) +
    (unique - B) * K ** 2 -
    (s.DJ ?? 0) * J ** 2 * (J + 1) ** 2 -
    (s.DJK ?? 0) * J * (J + 1) * K ** 2 -
    (s.DK ?? 0) * K ** 4 +
    (s.HJ ?? 0) * J ** 3 * (J + 1) ** 3 +
    (s.HJK ?? 0) * J ** 2 * (J + 1) ** 2 * K ** 2 +
    (s.HKJ ?? 0) * J * (J + 1) * K ** 4 +
    (s.HK ?? 0) * K ** 6
  );
}

describe('levelEnergy', () => {
  it('is zero for J = K = 0 and B J(J+1) for a rigid linear molecule', () => {
    const s = stateConstantsFrom({ B: 0.39 });
    expect(levelEnergy(s, 'linear', 0, 0)).toBe(0);
    // Ref: Herzberg, Spectra of Diatomic Molecules (1950), eq. (III,12), F(J) = B J(J+1).
    for (const J of [1, 2, 10, 57]) expect(levelEnergy(s, 'linear', J, 0)).toBeCloseTo(0.39 * J * (J + 1), 10);
  });

  it('gives B[J(J+1) − 1] for a linear Π state (K = |l| = 1)', () => {
    // Ref: J. M. Hollas, High Resolution Spectroscopy, 2nd ed. (1998), sec. 6.2.4: F(J) = B[J(J+1) − l²].
    const s = stateConstantsFrom({ B: 0.39 });
    for (const J of [1, 2, 30]) expect(levelEnergy(s, 'linear', J, 1)).toBeCloseTo(0.39 * (J * (J + 1) - 1), 10);
  });

  it('matches hand-evaluated values for simple constants', () => {
    // B = 1, A = 3, DJ = 1e-3, DJK = 2e-3, DK = 4e-3 cm^-1; J = 2, K = 1:
    //   6 + (3 − 1)·1 − 1e-3·36 − 2e-3·6·1 − 4e-3·1 = 8 − 0.036 − 0.012 − 0.004 = 7.948 cm^-1
    const s = stateConstantsFrom({ B: 1, A: 3, DJ: 1e-3, DJK: 2e-3, DK: 4e-3 });
    expect(levelEnergy(s, 'prolate', 2, 1)).toBeCloseTo(7.948, 12);
    // J = 3, K = 3: 12 + 2·9 − 1e-3·144 − 2e-3·12·9 − 4e-3·81 = 30 − 0.144 − 0.216 − 0.324 = 29.316
    expect(levelEnergy(s, 'prolate', 3, 3)).toBeCloseTo(29.316, 12);
    // Sextic terms alone, HJ = HJK = HKJ = HK = 1e-6, J = 2, K = 2: x = 6:
    //   1e-6·(216 + 36·4 + 6·16 + 64) = 1e-6·520
    const h = stateConstantsFrom({ HJ: 1e-6, HJK: 1e-6, HKJ: 1e-6, HK: 1e-6 });
    expect(levelEnergy(h, 'prolate', 2, 2)).toBeCloseTo(520e-6, 15);
  });

  it('uses C in place of A for an oblate top and ignores A there', () => {
    // Oblate: F = B J(J+1) + (C − B) K² (Herzberg II 1945, eq. (I,33) with C for the unique axis).
    const s = stateConstantsFrom({ B: 0.5, C: 0.25, A: 99 });
    expect(levelEnergy(s, 'oblate', 4, 3)).toBeCloseTo(0.5 * 20 + (0.25 - 0.5) * 9, 12);
    expect(levelEnergy(s, 'oblate', 4, 3)).toBeLessThan(levelEnergy(s, 'oblate', 4, 0));
  });

  it('agrees with an independent evaluation of the full formula over a grid of J, K', () => {
    const s = { B: 0.851, A: 5.18, DJ: 2e-6, DJK: 1.5e-5, DK: 7e-5, HJ: 1e-12, HJK: -3e-11, HKJ: 2e-10, HK: 5e-10 };
    const state = stateConstantsFrom(s);
    // Tol: relative 1e-13, double rounding of sums of terms up to ~1e4 cm^-1.
    for (let J = 0; J <= 60; J += 3) {
      for (let K = 0; K <= J; K += 2) {
        const want = termByHand(s, s.A, J, K);
        expect(Math.abs(levelEnergy(state, 'prolate', J, K) - want)).toBeLessThan(1e-13 * Math.max(1, Math.abs(want)));
      }
    }
  });

  it('reproduces the textbook rotational transition formula of a symmetric top', () => {
    // Ref: W. Gordy and R. L. Cook, Microwave Molecular Spectra, 3rd ed. (1984), ch. 6 (from memory):
    //   ν(J+1 ← J, K) = 2B(J+1) − 4DJ(J+1)³ − 2DJK(J+1)K²
    //                  + HJ(J+1)³[(J+2)³ − J³] + 4HJK(J+1)³K² + 2HKJ(J+1)K⁴
    const s = { B: 0.3, A: 2.7, DJ: 3e-7, DJK: 2e-6, DK: 1e-5, HJ: 1e-13, HJK: 2e-12, HKJ: -4e-11, HK: 1e-10 };
    const st = stateConstantsFrom(s);
    for (const [J, K] of [
      [0, 0],
      [5, 3],
      [20, 10],
      [40, 1],
    ]) {
      const nu =
        2 * s.B * (J + 1) -
        4 * s.DJ * (J + 1) ** 3 -
        2 * s.DJK * (J + 1) * K ** 2 +
        s.HJ * (J + 1) ** 3 * ((J + 2) ** 3 - J ** 3) +
        4 * s.HJK * (J + 1) ** 3 * K ** 2 +
        2 * s.HKJ * (J + 1) * K ** 4;
      // Tol 1e-11 cm^-1: cancellation of two term values up to ~500 cm^-1.
      expect(Math.abs(levelEnergy(st, 'prolate', J + 1, K) - levelEnergy(st, 'prolate', J, K) - nu)).toBeLessThan(1e-11);
    }
  });

  it('predicts the J = 1←0 and 2←1 lines of CH3F from its ground-state constants', () => {
    // Ref: CH3F ground state, B0 = 25 536.15 MHz, DJ = 0.0602 MHz, DJK = 0.4398 MHz, A0 ≈ 155 350 MHz
    // (from memory; values of the kind published by Papoušek et al., J. Mol. Spectrosc. 1994).
    // Measured lines (from memory): J = 1←0 at ≈ 51 072.1 MHz, J = 2←1 K = 0 at ≈ 102 142.6 MHz and
    // K = 1 at ≈ 102 140.9 MHz. Tol 1 MHz because the recalled constants and lines are approximate.
    const mhz = { B: 25_536.15, A: 155_350, DJ: 0.0602, DJK: 0.4398 };
    const st = stateConstantsFrom({
      B: mhz.B / MHZ_PER_CM1,
      A: mhz.A / MHZ_PER_CM1,
      DJ: mhz.DJ / MHZ_PER_CM1,
      DJK: mhz.DJK / MHZ_PER_CM1,
    });
    const lineMhz = (J: number, K: number) => (levelEnergy(st, 'prolate', J + 1, K) - levelEnergy(st, 'prolate', J, K)) * MHZ_PER_CM1;
    expect(Math.abs(lineMhz(0, 0) - 51_072.1)).toBeLessThan(1);
    expect(Math.abs(lineMhz(1, 0) - 102_142.6)).toBeLessThan(1);
    expect(Math.abs(lineMhz(1, 1) - 102_140.9)).toBeLessThan(1);
    // At J = 1 the K = 1 level lies A − B − 2·DJK above K = 0 (DK taken as 0): about 129 800 MHz.
    const dK = (levelEnergy(st, 'prolate', 1, 1) - levelEnergy(st, 'prolate', 1, 0)) * MHZ_PER_CM1;
    expect(Math.abs(dK - (mhz.A - mhz.B - 2 * mhz.DJK))).toBeLessThan(1e-6);
  });
});

function model(
  partial: Partial<Omit<BandModel, 'lower' | 'upper'>> & { upper: Partial<StateConstants>; lower: Partial<StateConstants> },
): BandModel {
  return {
    shape: partial.shape ?? 'prolate',
    band: partial.band ?? 'perpendicular',
    lower: stateConstantsFrom(partial.lower),
    upper: stateConstantsFrom(partial.upper),
    temperatureK: 296,
    jMax: 20,
    kMax: 10,
    spinWeights: [1],
  };
}

describe('upperLevelEnergy', () => {
  it("adds the origin to F'(J, K) in a parallel band", () => {
    const m = model({ band: 'parallel', lower: { B: 1 }, upper: { origin: 1000, B: 0.9, A: 4, zeta: 0.3 } });
    expect(upperLevelEnergy(m, 3, 2, 0, 1)).toBeCloseTo(1000 + 0.9 * 12 + (4 - 0.9) * 4, 10);
  });

  it("applies the first-order Coriolis term ∓2A'ζK' in a perpendicular band", () => {
    // Ref: Herzberg II (1945) ch. IV, eq. (IV,45): E' = ν0 + F'(J,K) ∓ 2A'ζK for ΔK = ±1.
    const m = model({ lower: { B: 1 }, upper: { origin: 1000, B: 0.9, A: 4, zeta: 0.3 } });
    const rigid = 1000 + 0.9 * 12 + (4 - 0.9) * 4;
    expect(upperLevelEnergy(m, 3, 2, +1, 0)).toBeCloseTo(rigid - 2 * 4 * 0.3 * 2, 10);
    expect(upperLevelEnergy(m, 3, 2, -1, 0)).toBeCloseTo(rigid + 2 * 4 * 0.3 * 2, 10);
  });

  it("uses C' in the Coriolis term of an oblate top", () => {
    const m = model({ shape: 'oblate', lower: { B: 1 }, upper: { origin: 1000, B: 0.9, C: 0.5, zeta: -0.4 } });
    const rigid = 1000 + 0.9 * 6 + (0.5 - 0.9) * 1;
    expect(upperLevelEnergy(m, 2, 1, +1, 1)).toBeCloseTo(rigid - 2 * 0.5 * -0.4 * 1, 10);
  });

  it('splits a linear Π state by ±q/2·J(J+1) between the P/R and the Q levels', () => {
    // Ref: Hollas (1998) sec. 6.2.4: the two l-type components differ by q J(J+1).
    const m = model({ shape: 'linear', lower: { B: 0.39 }, upper: { origin: 667, B: 0.39, q: 5e-4 } });
    const pr = upperLevelEnergy(m, 7, 1, 1, 1);
    const qq = upperLevelEnergy(m, 7, 1, 1, 0);
    expect(pr - qq).toBeCloseTo(5e-4 * 56, 12);
    expect(upperLevelEnergy(m, 7, 1, 1, -1)).toBe(pr);
  });
});

describe('transitionWavenumber', () => {
  it("is E'(upper) − F''(lower) with the Coriolis sign picked by K' − K''", () => {
    const m = model({ lower: { B: 1, A: 4.1 }, upper: { origin: 1000, B: 0.98, A: 4, zeta: 0.3 } });
    // rR2(3): J'' = 3, K'' = 2 → J' = 4, K' = 3.
    const up = 1000 + 0.98 * 20 + (4 - 0.98) * 9 - 2 * 4 * 0.3 * 3;
    const lo = 1 * 12 + (4.1 - 1) * 4;
    expect(transitionWavenumber(m, 4, 3, 3, 2)).toBeCloseTo(up - lo, 10);
    // pP2(3): J' = 2, K' = 1, Coriolis sign +.
    const up2 = 1000 + 0.98 * 6 + (4 - 0.98) * 1 + 2 * 4 * 0.3 * 1;
    expect(transitionWavenumber(m, 2, 1, 3, 2)).toBeCloseTo(up2 - lo, 10);
  });
});
