import { describe, expect, it } from 'vitest';
import { clebschOneSign } from '../../../src/physics/interaction/coupledLines';
import { systemLines } from '../../../src/physics/system/systemLines';
import type { SystemModel } from '../../../src/physics/system/systemModel';

/** ⟨j1 m1 j2 m2|J M⟩ by Racah's formula (independent of the j2 = 1 table in coupledLines). */
function clebschRacah(j1: number, m1: number, j2: number, m2: number, J: number, M: number): number {
  if (m1 + m2 !== M) return 0;
  const f = (n: number): number => (n <= 1 ? 1 : n * f(n - 1));
  const pre = Math.sqrt(((2 * J + 1) * f(J + j1 - j2) * f(J - j1 + j2) * f(j1 + j2 - J)) / f(j1 + j2 + J + 1));
  const norm = Math.sqrt(f(J + M) * f(J - M) * f(j1 - m1) * f(j1 + m1) * f(j2 - m2) * f(j2 + m2));
  let sum = 0;
  for (let k = 0; k <= 60; k++) {
    const d = [k, j1 + j2 - J - k, j1 - m1 - k, j2 + m2 - k, J - j2 + m1 + k, J - j1 - m2 + k];
    if (d.some((x) => x < 0)) continue;
    sum += (k % 2 === 0 ? 1 : -1) / d.reduce((p, x) => p * f(x), 1);
  }
  return pre * norm * sum;
}

describe('clebschOneSign', () => {
  it('has the sign of ⟨J″ k″ 1 q | J′ k″+q⟩ from the Racah formula for every J″ <= 6, k″, q and ΔJ', () => {
    let checked = 0;
    for (let j = 0; j <= 6; j++)
      for (let k = -j; k <= j; k++)
        for (const q of [-1, 0, 1])
          for (const jUp of [j - 1, j, j + 1]) {
            if (jUp < 0 || Math.abs(k + q) > jUp) continue;
            const c = clebschRacah(j, k, 1, q, jUp, k + q);
            if (Math.abs(c) < 1e-12) continue;
            expect(clebschOneSign(j, k, q, jUp), `J″=${j} k″=${k} q=${q} J′=${jUp}`).toBe(Math.sign(c));
            checked++;
          }
    expect(checked).toBeGreaterThan(200);
  });
});

/** A small invented A1/E dyad (constants of PH3's size, not a published set). */
function dyad(c1: number, c2: number): SystemModel {
  return {
    temperatureK: 296,
    jMax: 8,
    kMax: 8,
    species: [
      {
        name: 'X',
        shape: 'oblate',
        abundance: 1,
        spinWeights: [1],
        states: [
          { name: 'ground', isDegenerate: false, constants: { origin: 0, B: 4.45, C: 3.92 } },
          { name: 'v2', isDegenerate: false, constants: { origin: 992, B: 4.44, C: 3.91 } },
          { name: 'v4', isDegenerate: true, constants: { origin: 1118, B: 4.46, C: 3.9, zeta: -0.45 } },
        ],
        bands: [
          { name: 'nu2', upper: 'v2', lower: 'ground', strength: 1 },
          { name: 'nu4', upper: 'v4', lower: 'ground', strength: 2 },
        ],
        interactions: [{ name: 'c', type: 'coriolis', states: ['v2', 'v4'], constants: { C1: c1, C2: c2 } }],
      },
    ],
  };
}

describe('coupled bands in systemLines', () => {
  it('gives the uncoupled lines, positions and intensities, when every interaction constant is 0 (limiting case)', () => {
    const coupled = systemLines(dyad(0, 0));
    const plain = dyad(0, 0);
    delete plain.species[0].interactions;
    const ref = systemLines(plain);
    const key = (l: typeof ref, i: number) =>
      `${l.bandIndex[i]} ${l.jUpper[i]} ${l.kUpper[i]} ${l.lUpper[i]} ${l.jLower[i]} ${l.kLower[i]}`;
    const sum = (l: typeof ref) => {
      const m = new Map<string, { nu: number; s: number }>();
      for (let i = 0; i < l.count; i++) {
        const k = key(l, i);
        const p = m.get(k);
        m.set(k, { nu: l.wavenumberCm1[i], s: (p?.s ?? 0) + l.strength[i] });
      }
      return m;
    };
    const a = sum(coupled);
    const b = sum(ref);
    expect(a.size).toBe(b.size);
    for (const [k, v] of b) {
      // 1e-9 cm⁻¹ and 1e-9 relative: the same levels by two routes (diagonalised vs closed form).
      expect(Math.abs(a.get(k)!.nu - v.nu), k).toBeLessThan(1e-9);
      expect(Math.abs(a.get(k)!.s / v.s - 1), k).toBeLessThan(1e-9);
    }
  });

  it('lends intensity to ΔK = ±3 lines of ν2 and ΔK = ±2 lines of ν4 only when the ΔK = ±2 coupling C2 is on', () => {
    const count = (m: SystemModel, band: number, dk: number[]) => {
      const l = systemLines(m);
      let n = 0;
      for (let i = 0; i < l.count; i++) if (l.bandIndex[i] === band && dk.includes(l.kUpper[i] - l.kLower[i]) && l.intensity[i] > 1e-6) n++;
      return n;
    };
    expect(count(dyad(3.4, 0), 0, [3, -3])).toBe(0);
    expect(count(dyad(3.4, 0.05), 0, [3, -3])).toBeGreaterThan(10);
    expect(count(dyad(3.4, 0), 1, [2, -2])).toBe(0);
    expect(count(dyad(3.4, 0.05), 1, [2, -2])).toBeGreaterThan(10);
  });
});
