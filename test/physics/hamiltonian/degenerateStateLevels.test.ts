import { describe, expect, it } from 'vitest';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import {
  degenerateStateEnergies,
  degenerateStateLevels,
  degenerateStateParameterNames,
} from '../../../src/physics/hamiltonian/degenerateStateLevels';
import type { HamiltonianConstants } from '../../../src/physics/hamiltonian/hamiltonianLevel';
import { stateConstantsFrom } from '../../../src/physics/model';
import { levelEnergy } from '../../../src/physics/termValues';

/** An invented prolate C3v top in an E state (fictitious; magnitudes like a methyl halide). */
const INVENTED_E = {
  origin: 1180.5,
  B: 0.342,
  A: 5.1,
  DJ: 4.0e-7,
  DJK: 2.6e-6,
  DK: 3.0e-5,
  HJK: 1e-11,
  zeta: 0.27,
  etaJ: 2.0e-6,
  etaK: 4.0e-5,
  q22: 3.0e-4,
  q22J: -2.0e-9,
  q12: 2.0e-4,
} satisfies HamiltonianConstants;

/**
 * Independent reference: the full 2(2J+1)-dimensional matrix in the |k, ℓ = ±1⟩ basis written
 * element by element from the formulas of the doc comment (both Δk directions filled explicitly),
 * diagonalised by ml-matrix. Returns every eigenvalue (an E level appears twice).
 */
function fullMatrixEigenvalues(c: HamiltonianConstants, J: number, unique: 'A' | 'C'): number[] {
  const x = J * (J + 1);
  const states: [number, number][] = [];
  for (let k = -J; k <= J; k++) for (const l of [1, -1]) states.push([k, l]);
  const n = states.length;
  const m = new Matrix(n, n);
  const U = c[unique] ?? 0;
  const g = (name: string) => c[name] ?? 0;
  for (let a = 0; a < n; a++) {
    const [k, l] = states[a];
    const k2 = k * k;
    m.set(
      a,
      a,
      g('origin') +
        g('B') * x +
        (U - g('B')) * k2 -
        g('DJ') * x * x -
        g('DJK') * x * k2 -
        g('DK') * k2 * k2 +
        g('HJ') * x ** 3 +
        g('HJK') * x * x * k2 +
        g('HKJ') * x * k2 * k2 +
        g('HK') * k2 ** 3 -
        2 * U * g('zeta') * k * l +
        g('etaJ') * x * k * l +
        g('etaK') * k ** 3 * l,
    );
    for (let b = 0; b < n; b++) {
      const [kb, lb] = states[b];
      // ℓ(2,2): |k, +1⟩ ↔ |k−2, −1⟩.
      if (l === 1 && lb === -1 && kb === k - 2) {
        const v = -0.5 * (g('q22') + g('q22J') * x) * Math.sqrt(x - k * (k - 1)) * Math.sqrt(x - (k - 1) * (k - 2));
        m.set(a, b, v);
        m.set(b, a, v);
      }
      // ℓ(2,−1): |k, −1⟩ ↔ |k−1, +1⟩.
      if (l === -1 && lb === 1 && kb === k - 1) {
        const v = g('q12') * (2 * k - 1) * Math.sqrt(x - k * (k - 1));
        m.set(a, b, v);
        m.set(b, a, v);
      }
    }
  }
  return [...new EigenvalueDecomposition(m, { assumeSymmetric: true }).realEigenvalues].sort((p, q) => p - q);
}

function levelEigenvalues(c: HamiltonianConstants, J: number, shape: 'prolate' | 'oblate', group: 'C3v' | 'D3h'): number[] {
  const out: number[] = [];
  for (const lev of degenerateStateLevels(c, J, { shape, pointGroup: group }).levels) {
    for (let r = 0; r < lev.degeneracy; r++) out.push(lev.energyCm1);
  }
  return out.sort((p, q) => p - q);
}

describe('degenerateStateLevels', () => {
  it('gives one E level at J = 0 and 2(2J+1) functions for every J', () => {
    const r = degenerateStateLevels(INVENTED_E, 0, { shape: 'prolate', pointGroup: 'C3v' });
    expect(r.levels).toHaveLength(1);
    expect(r.levels[0]).toMatchObject({ J: 0, K: 0, l: 0, species: 'E', degeneracy: 2 });
    for (const J of [1, 2, 3, 7, 20]) {
      const n = degenerateStateLevels(INVENTED_E, J, { shape: 'prolate', pointGroup: 'C3v' }).levels.reduce((s, l) => s + l.degeneracy, 0);
      expect(n).toBe(2 * (2 * J + 1));
    }
  });

  it('reduces to the first-order formula of DEVELOPERS.md when q22 = q12 = 0', () => {
    // Ref: Herzberg II (1945) eq. (IV,45) via termValues.levelEnergy: origin + F(J,K) ∓ 2AζK; the
    // (+l) level (kℓ > 0) takes −2AζK. Same arithmetic up to summation order: tolerance 1e-9 cm⁻¹.
    const c = { ...INVENTED_E, etaJ: 0, etaK: 0, q22: 0, q22J: 0, q12: 0 };
    const state = stateConstantsFrom({ B: c.B, A: c.A, DJ: c.DJ, DJK: c.DJK, DK: c.DK, HJK: c.HJK });
    for (const J of [0, 1, 5, 30]) {
      for (const lev of degenerateStateLevels(c, J, { shape: 'prolate', pointGroup: 'C3v' }).levels) {
        const expected = c.origin + levelEnergy(state, 'prolate', J, lev.K) - 2 * c.A * c.zeta * lev.K * lev.l;
        expect(Math.abs(lev.energyCm1 - expected)).toBeLessThan(1e-9);
        expect(lev.labelWeight).toBe(1);
      }
    }
  });

  it('adds ηJ J(J+1) kℓ + ηK k³ℓ to the Coriolis term (closed form when the ℓ-type terms are 0)', () => {
    const c = { ...INVENTED_E, q22: 0, q22J: 0, q12: 0 };
    const J = 12;
    const x = J * (J + 1);
    for (const lev of degenerateStateLevels(c, J, { shape: 'prolate', pointGroup: 'C3v' }).levels) {
      const kl = lev.K * lev.l;
      const base = degenerateStateLevels({ ...c, etaJ: 0, etaK: 0 }, J, { shape: 'prolate', pointGroup: 'C3v' }).levels.find(
        (b) => b.K === lev.K && b.l === lev.l && b.tag === lev.tag,
      )!;
      expect(Math.abs(lev.energyCm1 - base.energyCm1 - (c.etaJ * x * kl + c.etaK * lev.K ** 2 * kl))).toBeLessThan(1e-9);
    }
  });

  it('gives the hand-worked J = 1 levels with q12 and q22', () => {
    // Hand-worked 2×2 (x = J(J+1) = 2): the chain |1,−1⟩ (K = 1, −l) – |0,+1⟩ (K = 0) is linked by ℓ(2,−1),
    // element q12·(2·1 − 1)·√(x − 1·0) = √2·q12, with diagonals B·x + (A − B) + 2Aζ and B·x, so
    // E = mean ± √(Δ²/4 + 2 q12²). The |1,+1⟩/|−1,−1⟩ pair (K = 1, +l) has ℓ(2,2) element −½ q22·√2·√2 =
    // −q22 and splits into B·x + (A − B) − 2Aζ ± q22. Tolerance 1e-12 cm⁻¹ (round-off).
    const c = { origin: 0, B: 0.3, A: 5, zeta: 0.25, q22: 0.01, q12: 0.2 };
    const ls = degenerateStateLevels(c, 1, { shape: 'prolate', pointGroup: 'C3v' }).levels;
    const d1 = 0.3 * 2 + (5 - 0.3) + 2 * 5 * 0.25;
    const d0 = 0.3 * 2;
    const mean = (d1 + d0) / 2;
    const root = Math.sqrt(((d1 - d0) / 2) ** 2 + 2 * 0.2 ** 2);
    const eMinus = ls.filter((l) => l.species === 'E').map((l) => l.energyCm1);
    eMinus.sort((a, b) => a - b);
    expect(eMinus).toHaveLength(2);
    expect(Math.abs(eMinus[0] - (mean - root))).toBeLessThan(1e-12);
    expect(Math.abs(eMinus[1] - (mean + root))).toBeLessThan(1e-12);
    const plus = ls
      .filter((l) => l.K === 1 && l.l === 1)
      .map((l) => l.energyCm1)
      .sort((a, b) => a - b);
    const dPlus = 0.3 * 2 + (5 - 0.3) - 2 * 5 * 0.25;
    expect(Math.abs(plus[0] - (dPlus - 0.01))).toBeLessThan(1e-12);
    expect(Math.abs(plus[1] - (dPlus + 0.01))).toBeLessThan(1e-12);
  });

  it('splits the K = 1 (+l) pair by q22 J(J+1) into A1 and A2 (first order, P/R levels from K″ = 0 above)', () => {
    // Hand-worked 2×2: with ζ-only diagonal the pair |1,+1⟩, |−1,−1⟩ is degenerate and the ℓ(2,2)
    // element −½q22 J(J+1) splits it into ±½ q22 J(J+1); the rest of the chain shifts both by
    // O(q22²/ΔE) ≪ 1e-6 here. Only q22 on: tolerance 1e-6 cm⁻¹.
    const c = { origin: 0, B: 0.3, A: 5, zeta: 0.25, q22: 1e-3 };
    for (const J of [1, 2, 3, 10]) {
      const ls = degenerateStateLevels(c, J, { shape: 'prolate', pointGroup: 'C3v' }).levels.filter((l) => l.K === 1 && l.l === 1);
      expect(ls.map((l) => l.tag).sort()).toEqual(['A1', 'A2']);
      const [lo, hi] = ls.map((l) => l.energyCm1).sort((a, b) => a - b);
      expect(Math.abs(hi - lo - c.q22 * J * (J + 1))).toBeLessThan(1e-6);
      // The upper member is A2 for odd J and A1 for even J: the member reached from K″ = 0 by P and R
      // lines (ΔJ = ±1 changes the parity of J; see rovibSymmetry and transitionsAllowed tests).
      const upper = ls.find((l) => l.energyCm1 === hi)!;
      expect(upper.species).toBe(J % 2 === 1 ? 'A2' : 'A1');
    }
  });

  for (const [shape, group, label] of [
    ['prolate', 'C3v', 'a prolate C3v top with every term'],
    ['oblate', 'D3h', 'an oblate D3h top (no q12)'],
  ] as const) {
    it(`matches the full-basis matrix diagonalised by ml-matrix for ${label}`, () => {
      const c: Record<string, number> = { ...INVENTED_E };
      if (shape === 'oblate') {
        c.C = 2.2;
        delete c.A;
      }
      if (group === 'D3h') delete c.q12;
      // Reference: fullMatrixEigenvalues (independent construction, ml-matrix 6.15). Energies up to
      // ~1e4 cm⁻¹: agreement to 1e-8 cm⁻¹ (round-off of the two solvers).
      for (const J of [0, 1, 2, 3, 4, 9, 25, 40]) {
        const ours = levelEigenvalues(c, J, shape, group);
        const ref = fullMatrixEigenvalues(c, J, shape === 'prolate' ? 'A' : 'C');
        expect(ours.length).toBe(ref.length);
        for (let i = 0; i < ref.length; i++) expect(Math.abs(ours[i] - ref[i])).toBeLessThan(1e-8);
      }
    });
  }

  it('labels every level uniquely by (K, l, tag) within one J', () => {
    // A strong q12 mixes (+l) and (−l) stacks; labels must still be distinct.
    const c = { ...INVENTED_E, q12: 0.05, q22: 0.02 };
    for (const J of [5, 30]) {
      const keys = degenerateStateLevels(c, J, { shape: 'prolate', pointGroup: 'C3v' }).levels.map((l) => `${l.K},${l.l},${l.tag}`);
      expect(new Set(keys).size).toBe(keys.length);
    }
  });

  it('gives ∂E/∂p that match central finite differences for every constant', () => {
    // Hellmann–Feynman vs (E(p+h) − E(p−h))/2h, with h chosen so that h·max|∂E/∂p| ≈ 1e-4 cm⁻¹ (small
    // enough for the O(h²) truncation, large enough for round-off 1e-12 cm⁻¹ of E ≈ 1e4 cm⁻¹): agreement to
    // 1e-5 relative plus 1e-10/h absolute.
    const names = degenerateStateParameterNames('prolate');
    const c = { ...INVENTED_E, HJ: 1e-12, HKJ: 2e-10, HK: 3e-10, LJK: 1e-16, q12: 5e-3 };
    // J = 30: the E chain has 41 functions, so its vectors come from inverse iteration (tridiagonalEigenFast).
    const J = 30;
    const base = degenerateStateLevels(c, J, { shape: 'prolate', pointGroup: 'C3v' });
    for (let pi = 0; pi < names.length; pi++) {
      const name = names[pi];
      const value = (c as Record<string, number>)[name] ?? 0;
      const scale = Math.max(...base.levels.map((l) => Math.abs(l.derivatives[pi])), 1e-30);
      const h = 1e-4 / scale;
      const up = degenerateStateLevels({ ...c, [name]: value + h }, J, { shape: 'prolate', pointGroup: 'C3v' }).levels;
      const dn = degenerateStateLevels({ ...c, [name]: value - h }, J, { shape: 'prolate', pointGroup: 'C3v' }).levels;
      base.levels.forEach((lev, i) => {
        expect(up[i].K === lev.K && up[i].l === lev.l && up[i].tag === lev.tag).toBe(true);
        const fd = (up[i].energyCm1 - dn[i].energyCm1) / (2 * h);
        const hf = lev.derivatives[pi];
        expect(Math.abs(fd - hf), `${name} at K=${lev.K} l=${lev.l} ${lev.tag}`).toBeLessThan(1e-5 * Math.abs(hf) + 1e-10 / h);
      });
    }
  });

  it('refuses q12 in D3h in words, and an unknown constant', () => {
    expect(() => degenerateStateLevels({ q12: 1e-4 }, 3, { shape: 'oblate', pointGroup: 'D3h' })).toThrow(/q12 .* not allowed in D3h/);
    expect(() => degenerateStateLevels({ qq: 1 }, 3, { shape: 'oblate', pointGroup: 'D3h' })).toThrow(/unknown constant "qq"/);
    expect(() => degenerateStateLevels({}, 3, { shape: 'oblate', pointGroup: 'C4v' as 'C3v' })).toThrow(/not supported/);
    expect(() => degenerateStateLevels({}, -1, { shape: 'oblate', pointGroup: 'D3h' })).toThrow(/J must be/);
  });

  it("gives E' / E'' and A'/A'' species by K parity in D3h", () => {
    // Ref: D3h(M) species of an E' state: σh multiplies |k⟩ by (−1)^k (Bunker and Jensen 1998,
    // ch. 12, from memory): even-K levels are primed, odd-K double-primed; an E'' state swaps them.
    const c = { origin: 0, B: 0.3, C: 0.15, zeta: -0.3, q22: 1e-3 };
    for (const vibSpecies of ["E'", "E''"]) {
      for (const lev of degenerateStateLevels(c, 6, { shape: 'oblate', pointGroup: 'D3h', vibSpecies }).levels) {
        const primed = (lev.K % 2 === 0) === (vibSpecies === "E'");
        expect(lev.species.endsWith("''")).toBe(!primed);
        // A species exactly when k − ℓ ≡ 0 (mod 3): (+l) K ≡ 1, (−l) K ≡ 2.
        const isA = lev.l === 1 ? lev.K % 3 === 1 : lev.K % 3 === 2;
        expect(lev.species.startsWith('A')).toBe(isA);
      }
    }
  });
});

describe('degenerateStateEnergies', () => {
  it('gives the same energies and species as degenerateStateLevels, without labels (C3v with q12, D3h without)', () => {
    // Reference: degenerateStateLevels (eigenvectors, labels) on the same constants; the multiset of
    // (energy, species, degeneracy) must agree to round-off (1e-9 cm⁻¹ on energies ~1e3 cm⁻¹).
    const d3h = { ...INVENTED_E, q12: 0 };
    for (const [group, c] of [
      ['C3v', INVENTED_E],
      ['D3h', d3h],
    ] as const) {
      for (const J of [0, 1, 2, 5, 17, 40]) {
        const opts = { shape: 'prolate' as const, pointGroup: group };
        const ref = degenerateStateLevels(c, J, opts)
          .levels.map((l) => ({ e: l.energyCm1, s: l.species, d: l.degeneracy }))
          .sort((a, b) => a.e - b.e);
        const e = degenerateStateEnergies(c, J, opts);
        const got = e.energyCm1.map((v, i) => ({ e: v, s: e.species[i], d: e.degeneracy[i] })).sort((a, b) => a.e - b.e);
        expect(got.length).toBe(ref.length);
        got.forEach((g, i) => {
          expect(Math.abs(g.e - ref[i].e)).toBeLessThan(1e-9);
          // Members of a near-degenerate A1/A2 pair may sort either way: compare species within 1e-9 cm⁻¹ only.
          const same = ref.filter((r) => Math.abs(r.e - g.e) < 1e-9).map((r) => r.s);
          expect(same).toContain(g.s);
          expect(g.d).toBe(ref[i].d);
        });
      }
    }
  });
});
