import { describe, expect, it } from 'vitest';
import { honlLondonFactor, lineDegeneracy } from '../../src/physics/honlLondon';

/** n! as a double (exact up to 22!, ample for the J <= 40 used here). */
function factorial(n: number): number {
  let f = 1;
  for (let i = 2; i <= n; i++) f *= i;
  return f;
}

/**
 * Wigner 3j symbol by the Racah formula.
 * Ref: A. R. Edmonds, Angular Momentum in Quantum Mechanics (1957), eq. (3.7.3); also R. N. Zare,
 * Angular Momentum (1988), eq. (2.34). Written here independently of the module under test.
 */
function wigner3j(j1: number, j2: number, j3: number, m1: number, m2: number, m3: number): number {
  if (m1 + m2 + m3 !== 0) return 0;
  if (j3 < Math.abs(j1 - j2) || j3 > j1 + j2) return 0;
  if (Math.abs(m1) > j1 || Math.abs(m2) > j2 || Math.abs(m3) > j3) return 0;
  const triangle = (factorial(j1 + j2 - j3) * factorial(j1 - j2 + j3) * factorial(-j1 + j2 + j3)) / factorial(j1 + j2 + j3 + 1);
  const pre = Math.sqrt(
    triangle * factorial(j1 + m1) * factorial(j1 - m1) * factorial(j2 + m2) * factorial(j2 - m2) * factorial(j3 + m3) * factorial(j3 - m3),
  );
  let sum = 0;
  const tMin = Math.max(0, j2 - j3 - m1, j1 - j3 + m2);
  const tMax = Math.min(j1 + j2 - j3, j1 - m1, j2 + m2);
  for (let t = tMin; t <= tMax; t++) {
    sum +=
      (t % 2 === 0 ? 1 : -1) /
      (factorial(t) *
        factorial(j3 - j2 + t + m1) *
        factorial(j3 - j1 + t - m2) *
        factorial(j1 + j2 - j3 - t) *
        factorial(j1 - t - m1) *
        factorial(j2 - t + m2));
  }
  return ((j1 - j2 - m3) % 2 === 0 ? 1 : -1) * pre * sum;
}

/**
 * Hönl–London factor from the 3j symbol for a signed lower component k'' → k' = k'' + ΔK:
 *   S = f · (2J'+1)(2J''+1) (J' 1 J''; k' −ΔK −k'')², f = 1 (ΔK = 0), 1/2 (ΔK = ±1, Herzberg's scale).
 * Ref: P. R. Bunker and P. Jensen, Molecular Symmetry and Spectroscopy, 2nd ed. (1998), ch. 14 (line
 * strength of a symmetric top); Herzberg's perpendicular factors (IV,72) sum to (2J''+1)/2 per ΔK,
 * hence f = 1/2.
 */
function honlLondonFrom3j(J: number, kSigned: number, deltaJ: number, deltaK: number): number {
  const jUp = J + deltaJ;
  const kUp = kSigned + deltaK;
  if (jUp < 0 || Math.abs(kUp) > jUp) return 0;
  const f = deltaK === 0 ? 1 : 0.5;
  return f * (2 * jUp + 1) * (2 * J + 1) * wigner3j(jUp, 1, J, kUp, -deltaK, -kSigned) ** 2;
}

/** Factor of a signed component: the module takes unsigned K with s = sign(ΔK); −K with ΔK equals K with −ΔK. */
function signedFactor(J: number, kSigned: number, deltaJ: number, deltaK: number): number {
  if (kSigned >= 0) return honlLondonFactor(J, kSigned, deltaJ, deltaK);
  return honlLondonFactor(J, -kSigned, deltaJ, -deltaK);
}

describe('honlLondonFactor', () => {
  it('is zero for forbidden ΔJ, ΔK and for Q lines with J = 0', () => {
    expect(honlLondonFactor(3, 1, 2, 0)).toBe(0);
    expect(honlLondonFactor(3, 1, 0, 2)).toBe(0);
    expect(honlLondonFactor(0, 0, 0, 0)).toBe(0);
    expect(honlLondonFactor(0, 0, 0, 1)).toBe(0);
    // Parallel Q line with K = 0 vanishes (Herzberg II 1945, eq. (IV,61)).
    expect(honlLondonFactor(5, 0, 0, 0)).toBe(0);
  });

  it("matches Herzberg's parallel-band factors at hand-checkable points", () => {
    // Ref: Herzberg II (1945) eqs. (IV,60)–(IV,62): R (J+1)²−K²/(J+1), Q (2J+1)K²/(J(J+1)), P (J²−K²)/J.
    // J = 3, K = 2: R = (16 − 4)/4 = 3, Q = 7·4/12 = 7/3, P = (9 − 4)/3 = 5/3 (sum 7 = 2J+1).
    expect(honlLondonFactor(3, 2, 1, 0)).toBeCloseTo(3, 14);
    expect(honlLondonFactor(3, 2, 0, 0)).toBeCloseTo(7 / 3, 14);
    expect(honlLondonFactor(3, 2, -1, 0)).toBeCloseTo(5 / 3, 14);
  });

  it("matches Herzberg's perpendicular-band factors at hand-checkable points", () => {
    // Ref: Herzberg II (1945) eq. (IV,72), K → K+1 with J = 3, K = 1:
    //   R (J+2+K)(J+1+K)/(4(J+1)) = 6·5/16 = 15/8; Q (2J+1)(J+1+K)(J−K)/(4J(J+1)) = 7·5·2/48 = 35/24;
    //   P (J−1−K)(J−K)/(4J) = 1·2/12 = 1/6.
    expect(honlLondonFactor(3, 1, 1, 1)).toBeCloseTo(15 / 8, 14);
    expect(honlLondonFactor(3, 1, 0, 1)).toBeCloseTo(35 / 24, 14);
    expect(honlLondonFactor(3, 1, -1, 1)).toBeCloseTo(1 / 6, 14);
    // K → K−1, J = 3, K = 1: R (J+2−K)(J+1−K)/(4(J+1)) = 4·3/16 = 3/4; P (J−1+K)(J+K)/(4J) = 3·4/12 = 1.
    expect(honlLondonFactor(3, 1, 1, -1)).toBeCloseTo(3 / 4, 14);
    expect(honlLondonFactor(3, 1, -1, -1)).toBeCloseTo(1, 14);
  });

  it('agrees with the Wigner 3j expression for every signed component up to J = 25', () => {
    // Tol 1e-11 absolute: factorial-based 3j evaluation in doubles up to 51!/... loses ~1e-12.
    for (let J = 0; J <= 25; J++) {
      for (let k = -J; k <= J; k++) {
        for (const deltaK of [-1, 0, 1]) {
          for (const deltaJ of [-1, 0, 1]) {
            const want = honlLondonFrom3j(J, k, deltaJ, deltaK);
            const got = signedFactor(J, k, deltaJ, deltaK);
            expect(Math.abs(got - want), `J=${J} k=${k} ΔJ=${deltaJ} ΔK=${deltaK}`).toBeLessThan(1e-11 * (2 * J + 1));
          }
        }
      }
    }
  });

  it('sums to 2J″+1 over all branches for each signed lower component (sum rule)', () => {
    // Ref: Herzberg II (1945) ch. IV, the sum rule stated with eqs. (IV,60)–(IV,62) and (IV,72);
    // Bunker & Jensen (1998) ch. 14. Tol 1e-12 relative (round-off).
    for (let J = 0; J <= 60; J++) {
      for (let k = -J; k <= J; k++) {
        let parallel = 0;
        let perpendicular = 0;
        for (const deltaJ of [-1, 0, 1]) {
          parallel += signedFactor(J, k, deltaJ, 0);
          perpendicular += signedFactor(J, k, deltaJ, 1) + signedFactor(J, k, deltaJ, -1);
        }
        // A J = 0 level has no Q line and the parallel R(0) factor is 1 = 2J+1; no term to drop.
        expect(Math.abs(parallel - (2 * J + 1))).toBeLessThan(1e-12 * (2 * J + 1));
        expect(Math.abs(perpendicular - (2 * J + 1))).toBeLessThan(1e-12 * (2 * J + 1));
      }
    }
  });

  it('gives n·HL summed over a line group equal to (2J″+1)·(level degeneracy), K″ = 0 included', () => {
    // Level degeneracy in k components: 1 for K'' = 0, 2 for K'' > 0. Lines of unsigned K'' carry
    // n = lineDegeneracy components. Perpendicular from K'' = 0: only ΔK = +1 lines exist, each with n = 2.
    for (let J = 0; J <= 40; J++) {
      for (let K = 0; K <= J; K++) {
        const levelDeg = K === 0 ? 1 : 2;
        let par = 0;
        let perp = 0;
        for (const deltaJ of [-1, 0, 1]) {
          par += lineDegeneracy('parallel', K) * honlLondonFactor(J, K, deltaJ, 0);
          perp += lineDegeneracy('perpendicular', K) * honlLondonFactor(J, K, deltaJ, 1);
          if (K > 0) perp += lineDegeneracy('perpendicular', K) * honlLondonFactor(J, K, deltaJ, -1);
        }
        expect(Math.abs(par / levelDeg - (2 * J + 1))).toBeLessThan(1e-12 * (2 * J + 1));
        expect(Math.abs(perp / levelDeg - (2 * J + 1))).toBeLessThan(1e-12 * (2 * J + 1));
      }
    }
  });

  it('never returns a negative factor and gives 0 when K″ > J″ (no such level)', () => {
    expect(honlLondonFactor(2, 3, 1, 1)).toBe(0);
    expect(honlLondonFactor(2, 3, -1, 0)).toBe(0);
    for (let J = 0; J <= 30; J++)
      for (let K = 0; K <= J + 1; K++)
        for (const dK of [-1, 0, 1]) for (const dJ of [-1, 0, 1]) expect(honlLondonFactor(J, K, dJ, dK)).toBeGreaterThanOrEqual(0);
  });
});

describe('lineDegeneracy', () => {
  it('is 1 for K″ = 0 of a parallel band and 2 otherwise', () => {
    // Ref: Herzberg II (1945) ch. IV, K = 0 sub-band intensities (K = 0 levels are single).
    expect(lineDegeneracy('parallel', 0)).toBe(1);
    expect(lineDegeneracy('parallel', 3)).toBe(2);
    expect(lineDegeneracy('perpendicular', 0)).toBe(2);
    expect(lineDegeneracy('perpendicular', 5)).toBe(2);
  });
});
