/**
 * The higher-order terms of a coupled A1 ↔ E group (src/physics/interaction/coupledHigherTerms.ts):
 * hand-worked 2 × 2 blocks for each Δk, the whole J manifold diagonalised densely without the class
 * split and σv folding (which hold only if every term commutes with σv), and Hellmann–Feynman
 * derivatives against central differences.
 */
import { describe, expect, it } from 'vitest';
import { coupledGroupCreate, coupledLevels, type CoupledGroup } from '../../../src/physics/interaction/coupledLevels';
import { symmetricEigen } from '../../../src/physics/hamiltonian/symmetricEigen';

function valuesOf(g: CoupledGroup, constants: Record<string, number>): Float64Array {
  return Float64Array.from(g.parameters, (p) => constants[`${p.owner}.${p.name}`] ?? 0);
}

const dyad = coupledGroupCreate(
  'oblate',
  [
    { name: 'v2', isDegenerate: false },
    { name: 'v4', isDegenerate: true },
  ],
  [{ name: 'c', type: 'coriolis', stateA: 0, stateB: 1 }],
);

/** Energy of the level labelled (state, K, l, tag). */
function levelOf(r: ReturnType<typeof coupledLevels>, state: number, K: number, l: number, tag = ''): number {
  const i = [...Array(r.count).keys()].find((j) => r.state[j] === state && r.K[j] === K && r.l[j] === l && r.tag[j] === tag);
  if (i === undefined) throw new Error(`no level ${state} ${K} ${l} ${tag}`);
  return r.energyCm1[i];
}

/** Π_{i=0}^{n−1} √[x − (m+i)(m+i+1)], the ⟨J, m+n|J₊ⁿ|J, m⟩ ladder factor (written out again here). */
function ladder(J: number, m: number, n: number): number {
  let f = 1;
  for (let i = 0; i < n; i++) f *= Math.sqrt(Math.max(0, J * (J + 1) - (m + i) * (m + i + 1)));
  return f;
}

// Invented constants of the size of PH3's, with every higher-order term far larger than PH3's so each
// one moves the levels (cm⁻¹; not a published set).
const C = {
  'v2.origin': 992,
  'v2.B': 4.45,
  'v2.C': 3.95,
  'v2.eps': 2e-3,
  'v4.origin': 1010,
  'v4.B': 4.46,
  'v4.C': 3.9,
  'v4.zeta': -0.45,
  'v4.q22': 0.05,
  'c.C1': 3.4,
  'c.C2': 0.05,
  'c.C2JJ': 1e-5,
  'c.C2JK': -2e-5,
  'c.C4': 2e-3,
  'c.C5': 1e-4,
};

describe('coupledHigherTerms', () => {
  it('ε (eps), Δk = ±3 in ν2: J = 2, K = 1 and K = 2 at mean ± √(Δ²/4 + (12ε)²), ⟨1|H|−2⟩ = ε(2k + 3)L₃ = −12ε', () => {
    // Hand-worked: x = 6, F(K) = B x + (C − B)K² = 23 (K = 1), 20 (K = 2) with B = 4, C = 3;
    // L₃(−2) = √(6 − 2)·√(6 − 0)·√(6 − 0) = 12, 2k + 3 = −1.
    const eps = 0.1;
    const r = coupledLevels(dyad, 2, valuesOf(dyad, { 'v2.B': 4, 'v2.C': 3, 'v4.origin': 500, 'v2.eps': eps }));
    const half = Math.sqrt(1.5 ** 2 + (12 * eps) ** 2);
    // Round-off tolerance 1e-10 cm⁻¹.
    expect(levelOf(r, 0, 1, 0)).toBeCloseTo(21.5 + half, 10);
    expect(levelOf(r, 0, 2, 0)).toBeCloseTo(21.5 - half, 10);
  });

  it('C4, Δk = ±4, Δℓ = ±1: J = 2, ν2 K = 2 and ν4 K = 2 (+l) at mean ± √(Δ²/4 + (24·C4)²); the other levels stay', () => {
    // ⟨v4; 2, +1|H|v2; −2⟩ = C4·L₄(−2), L₄(−2) = √(6 − 2)·√(6 − 0)·√(6 − 0)·√(6 − 2) = 24.
    const C4 = 0.1;
    const r = coupledLevels(dyad, 2, valuesOf(dyad, { 'v2.origin': 990, 'v4.origin': 1000, 'c.C4': C4 }));
    const half = Math.sqrt(5 ** 2 + (24 * C4) ** 2);
    expect(levelOf(r, 0, 2, 0)).toBeCloseTo(995 - half, 10);
    expect(levelOf(r, 1, 2, 1)).toBeCloseTo(995 + half, 10);
    expect(levelOf(r, 0, 1, 0)).toBeCloseTo(990, 10);
    expect(levelOf(r, 1, 1, -1)).toBeCloseTo(1000, 10);
    // K = 2 (−l) is an A1/A2 pair (k − ℓ ≡ 0 mod 3), which no J = 2 C4 element reaches.
    expect(levelOf(r, 1, 2, -1, 'A1')).toBeCloseTo(1000, 10);
    expect(levelOf(r, 1, 2, -1, 'A2')).toBeCloseTo(1000, 10);
  });

  it('C5, Δk = ∓5, Δℓ = ±1: J = 3, ν2 K = 2 and ν4 K = 3 (−l) at mean ± √(Δ²/4 + (L₅·C5)²), L₅ = √86400', () => {
    // ⟨v4; 3, −1|H|v2; −2⟩ = −C5·L₅(−2), L₅(−2) = √(10·12·12·10·6) at x = 12.
    const C5 = 0.01;
    const r = coupledLevels(dyad, 3, valuesOf(dyad, { 'v2.origin': 990, 'v4.origin': 1000, 'c.C5': C5 }));
    const half = Math.sqrt(25 + 86400 * C5 * C5);
    expect(levelOf(r, 0, 2, 0)).toBeCloseTo(995 - half, 10);
    expect(levelOf(r, 1, 3, -1)).toBeCloseTo(995 + half, 10);
  });

  it('C2JJ and C2JK scale the Δk = ∓2 element by x² and x(k ∓ 1)²: the same levels as C2 of that size', () => {
    // J = 4 (x = 20): C2JJ·x² ≡ C2 = C2JJ·400; the ΔK = ±2 pairs of ν2 K and ν4 K ± 2 have the
    // mean k (k ∓ 1) of their own, so C2JK is compared pair by pair in the dense test below.
    const base = { 'v2.origin': 990, 'v2.B': 4.45, 'v2.C': 3.95, 'v4.origin': 1000, 'v4.B': 4.46, 'v4.C': 3.9 };
    const a = coupledLevels(dyad, 4, valuesOf(dyad, { ...base, 'c.C2JJ': 1e-4 }));
    const b = coupledLevels(dyad, 4, valuesOf(dyad, { ...base, 'c.C2': 1e-4 * 400 }));
    for (let i = 0; i < a.count; i++) expect(a.energyCm1[i]).toBeCloseTo(b.energyCm1[i], 9);
  });

  it('gives the eigenvalues of the whole J manifold diagonalised densely (no class split, no σv folding) with every term on', () => {
    // Independent check of the σv phase rule: the class split and the σv folding of coupledLevels
    // give the dense spectrum only if every element commutes with σv (a wrong relative sign of an
    // odd-Δk term, e.g. C5 without the ℓ sign, breaks it).
    const x = (J: number) => J * (J + 1);
    for (const J of [3, 6, 9]) {
      type Fn = { s: 'v2' | 'v4'; k: number; ell: number };
      const basis: Fn[] = [];
      for (let k = -J; k <= J; k++) basis.push({ s: 'v2', k, ell: 0 });
      for (let k = -J; k <= J; k++) for (const ell of [1, -1]) basis.push({ s: 'v4', k, ell });
      const n = basis.length;
      const h = new Float64Array(n * n);
      const at = (s: string, k: number, ell: number) => basis.findIndex((f) => f.s === s && f.k === k && f.ell === ell);
      const add = (i: number, j: number, v: number) => {
        if (i < 0 || j < 0) return;
        h[i * n + j] += v;
        if (i !== j) h[j * n + i] += v;
      };
      basis.forEach((f, i) => {
        const st = f.s;
        const k2 = f.k * f.k;
        add(i, i, C[`${st}.origin`] + C[`${st}.B`] * x(J) + (C[`${st}.C`] - C[`${st}.B`]) * k2);
        if (st === 'v4') {
          add(i, i, -2 * C['v4.C'] * C['v4.zeta'] * f.k * f.ell);
          // ℓ(2,2): ⟨k−2, −1|H|k, +1⟩ = −½ q22 L₂(k − 2).
          if (f.ell === 1) add(i, at('v4', f.k - 2, -1), -0.5 * C['v4.q22'] * ladder(J, f.k - 2, 2));
          return;
        }
        // ν2: ε, Δk = +3.
        add(i, at('v2', f.k + 3, 0), C['v2.eps'] * (2 * f.k + 3) * ladder(J, f.k, 3));
        for (const sgn of [1, -1]) {
          const k = f.k;
          // C1: ⟨v4; k±1, ±1|H|v2; k⟩ = ±C1 L₁.
          add(i, at('v4', k + sgn, sgn), sgn * C['c.C1'] * ladder(J, sgn > 0 ? k : k - 1, 1));
          // C2 (+ C2JJ x² + C2JK x (k ∓ 1)²): ⟨v4; k∓2, ±1|H|v2; k⟩ = (…)·L₂.
          const c2 = C['c.C2'] + C['c.C2JJ'] * x(J) ** 2 + C['c.C2JK'] * x(J) * (k - sgn) ** 2;
          add(i, at('v4', k - 2 * sgn, sgn), c2 * ladder(J, sgn > 0 ? k - 2 : k, 2));
          // C4: ⟨v4; k±4, ±1|H|v2; k⟩ = C4 L₄;  C5: ⟨v4; k∓5, ±1|H|v2; k⟩ = ±C5 L₅.
          add(i, at('v4', k + 4 * sgn, sgn), C['c.C4'] * ladder(J, sgn > 0 ? k : k - 4, 4));
          add(i, at('v4', k - 5 * sgn, sgn), sgn * C['c.C5'] * ladder(J, sgn > 0 ? k - 5 : k, 5));
        }
      });
      const dense = [...symmetricEigen(h, n).values].sort((a, b) => a - b);
      const r = coupledLevels(dyad, J, valuesOf(dyad, C), { withDerivatives: false });
      const mine: number[] = [];
      for (let i = 0; i < r.count; i++) for (let c = 0; c < r.componentCount[i]; c++) mine.push(r.energyCm1[i]);
      mine.sort((a, b) => a - b);
      expect(mine.length).toBe(dense.length);
      // Tolerance 1e-8 cm⁻¹: two eigen-solvers on matrices with entries up to ~1e3 cm⁻¹.
      mine.forEach((e, i) => expect(Math.abs(e - dense[i]), `J=${J} level ${i}`).toBeLessThan(1e-8));
    }
  });

  it('gives Hellmann–Feynman derivatives of the added constants equal to central differences', () => {
    const v = valuesOf(dyad, C);
    const nP = dyad.parameters.length;
    const added = ['v2.eps', 'c.C2JJ', 'c.C2JK', 'c.C4', 'c.C5'];
    for (const J of [5, 11]) {
      const r = coupledLevels(dyad, J, v);
      for (const key of added) {
        const c = dyad.parameters.findIndex((p) => `${p.owner}.${p.name}` === key);
        expect(c, key).toBeGreaterThanOrEqual(0);
        const h = Math.abs(v[c]) * 1e-4;
        const up = v.slice();
        const dn = v.slice();
        up[c] += h;
        dn[c] -= h;
        const a = coupledLevels(dyad, J, up, { withDerivatives: false });
        const b = coupledLevels(dyad, J, dn, { withDerivatives: false });
        let largest = 0;
        for (let i = 0; i < r.count; i++) {
          const fd = (a.energyCm1[i] - b.energyCm1[i]) / (2 * h);
          const an = r.gradient[i * nP + c];
          largest = Math.max(largest, Math.abs(an));
          // Central differences: error O(h²·E‴); 1e-5 relative plus round-off 1e-9/h.
          expect(Math.abs(fd - an), `${key} J=${J} level ${i}`).toBeLessThan(1e-5 * Math.max(1, Math.abs(an)) + 1e-9 / h);
        }
        // The constant moves some level of this J (not a test that cannot fail).
        expect(largest, key).toBeGreaterThan(1);
      }
    }
  });
});
