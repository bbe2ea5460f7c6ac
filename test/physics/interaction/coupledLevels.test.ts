import { describe, expect, it } from 'vitest';
import { coupledGroupCreate, coupledLabelFollow, coupledLevels, type CoupledGroup } from '../../../src/physics/interaction/coupledLevels';
import { degenerateStateLevels } from '../../../src/physics/hamiltonian/degenerateStateLevels';
import { nondegenerateStateLevels } from '../../../src/physics/hamiltonian/nondegenerateStateLevels';

function valuesOf(g: CoupledGroup, constants: Record<string, number>): Float64Array {
  return Float64Array.from(g.parameters, (p) => constants[`${p.owner}.${p.name}`] ?? 0);
}

// Invented constants of the size of PH3's (cm⁻¹), not a published set.
const DYAD = {
  'v2.origin': 992,
  'v2.B': 4.45,
  'v2.C': 3.95,
  'v2.DJ': 1.2e-4,
  'v4.origin': 1118,
  'v4.B': 4.46,
  'v4.C': 3.9,
  'v4.DJ': 1e-4,
  'v4.zeta': -0.45,
  'v4.etaJ': 1e-4,
  'v4.etaK': 1e-3,
  'v4.q22': 0.01,
  'v4.q22J': 1e-6,
  'v4.q12': 0.002,
  'c.C1': 3.4,
  'c.C1J': 1e-4,
  'c.C1K': 1e-3,
  'c.C2': 0.01,
  'c.C2J': 1e-6,
};

describe('coupledLevels', () => {
  const dyad = coupledGroupCreate(
    'oblate',
    [
      { name: 'v2', isDegenerate: false },
      { name: 'v4', isDegenerate: true },
    ],
    [{ name: 'c', type: 'coriolis', stateA: 0, stateB: 1 }],
  );

  it('refuses an interaction its two states cannot have, naming it', () => {
    expect(() =>
      coupledGroupCreate(
        'prolate',
        [
          { name: 'a', isDegenerate: false },
          { name: 'b', isDegenerate: true },
        ],
        [{ name: 'f', type: 'fermi', stateA: 0, stateB: 1 }],
      ),
    ).toThrow(/interaction 'f' \(fermi, a ↔ b\)/);
  });

  it('gives each state its own diagonalised levels when the interaction constants are 0 (limiting case)', () => {
    const constants = { ...DYAD, 'c.C1': 0, 'c.C1J': 0, 'c.C1K': 0, 'c.C2': 0, 'c.C2J': 0 };
    for (const J of [0, 1, 5, 12]) {
      const r = coupledLevels(dyad, J, valuesOf(dyad, constants));
      const d = degenerateStateLevels(
        { origin: 1118, B: 4.46, C: 3.9, DJ: 1e-4, zeta: -0.45, etaJ: 1e-4, etaK: 1e-3, q22: 0.01, q22J: 1e-6, q12: 0.002 },
        J,
        { shape: 'oblate', pointGroup: 'C3v' },
      );
      const n = nondegenerateStateLevels({ origin: 992, B: 4.45, C: 3.95, DJ: 1.2e-4 }, J, { shape: 'oblate', pointGroup: 'C3v' });
      const mine4 = [...r.energyCm1].filter((_, i) => r.state[i] === 1).sort((a, b) => a - b);
      const ref4 = d.levels.map((l) => l.energyCm1).sort((a, b) => a - b);
      expect(mine4.length).toBe(ref4.length);
      // Tolerance 1e-9 cm⁻¹: two eigen-solvers on the same matrix, round-off of entries ~1e3.
      mine4.forEach((e, i) => expect(Math.abs(e - ref4[i])).toBeLessThan(1e-9));
      const mine2 = [...r.energyCm1].filter((_, i) => r.state[i] === 0).sort((a, b) => a - b);
      const ref2 = n.levels.map((l) => l.energyCm1).sort((a, b) => a - b);
      expect(new Set(mine2.map((e) => e.toFixed(9))).size).toBe(new Set(ref2.map((e) => e.toFixed(9))).size);
      for (const e of mine2) expect(Math.min(...ref2.map((f) => Math.abs(f - e)))).toBeLessThan(1e-9);
    }
  });

  it('matches the hand-worked J = 1 block: ν2 K = 0 and the σv = −1 member of ν4 K = 1 (+l) at mean ± √(Δ²/4 + 4C1²)', () => {
    // J = 1, x = 2: ⟨v4; ±1, ±1|H|v2; 0⟩ = ±C1√2. σv|v2; 0⟩ = −|v2; 0⟩, so only
    // (|1,+1⟩ − |−1,−1⟩)/√2 couples, with 2·C1; the σv = +1 member stays at E4 (q22 = 0, no rotation).
    const C1 = 3;
    const E2 = 990;
    const E4 = 1120;
    const r = coupledLevels(dyad, 1, valuesOf(dyad, { 'v2.origin': E2, 'v4.origin': E4, 'c.C1': C1 }));
    const half = Math.sqrt(((E4 - E2) / 2) ** 2 + 4 * C1 * C1);
    const find = (state: number, K: number, l: number, tag: string) => {
      const i = [...Array(r.count).keys()].find((j) => r.state[j] === state && r.K[j] === K && r.l[j] === l && r.tag[j] === tag)!;
      return r.energyCm1[i];
    };
    // Round-off tolerance 1e-10 cm⁻¹.
    expect(find(0, 0, 0, '')).toBeCloseTo((E2 + E4) / 2 - half, 10);
    expect(find(1, 1, 1, 'A2')).toBeCloseTo((E2 + E4) / 2 + half, 10);
    expect(find(1, 1, 1, 'A1')).toBeCloseTo(E4, 10);
    // The E levels (K = 1 (−l), K = 0) are reached by no J = 1 coupling of k = 0 and stay at E4.
    expect(find(1, 1, -1, '')).toBeCloseTo(E4, 10);
  });

  it('gives Hellmann–Feynman derivatives equal to central differences for every constant', () => {
    const v = valuesOf(dyad, DYAD);
    const nP = dyad.parameters.length;
    for (const J of [3, 8]) {
      const r = coupledLevels(dyad, J, v);
      dyad.parameters.forEach((p, c) => {
        // Steps small enough that the eigenvectors barely move; tolerance relative to the level's scale of ∂E/∂p.
        const h = Math.max(1e-7, Math.abs(v[c]) * 1e-6) / Math.max(1, (J * (J + 1)) ** 2);
        const up = v.slice();
        const dn = v.slice();
        up[c] += h;
        dn[c] -= h;
        const a = coupledLevels(dyad, J, up, { withDerivatives: false });
        const b = coupledLevels(dyad, J, dn, { withDerivatives: false });
        for (let i = 0; i < r.count; i++) {
          const fd = (a.energyCm1[i] - b.energyCm1[i]) / (2 * h);
          const an = r.gradient[i * nP + c];
          expect(Math.abs(fd - an), `${p.owner}.${p.name} J=${J} level ${i}`).toBeLessThan(1e-5 * Math.max(1, Math.abs(an)) + 2e-8 / h);
        }
      });
    }
  });

  it('labels through an avoided crossing: by largest component the labels stay with the states, followed they stay with the levels', () => {
    // Two nondegenerate states in Fermi resonance, W = 1 cm⁻¹, J = 0; state b's origin swept through a's.
    const g = coupledGroupCreate(
      'prolate',
      [
        { name: 'a', isDegenerate: false },
        { name: 'b', isDegenerate: false },
      ],
      [{ name: 'f', type: 'fermi', stateA: 0, stateB: 1 }],
    );
    const at = (delta: number) => coupledLevels(g, 0, valuesOf(g, { 'a.origin': 100, 'b.origin': 100 + delta, 'f.W': 1 }));
    const lowerState = (r: ReturnType<typeof at>) => r.state[r.energyCm1[0] < r.energyCm1[1] ? 0 : 1];
    // Hand check: levels 100 + δ/2 ± √(δ²/4 + 1).
    const mid = at(0.4);
    expect(Math.min(...mid.energyCm1)).toBeCloseTo(100.2 - Math.sqrt(0.04 + 1), 12);
    // Largest component: below the crossing (δ < 0) the lower level is mostly b, above it mostly a.
    expect(lowerState(at(-0.4))).toBe(1);
    expect(lowerState(at(0.4))).toBe(0);
    // Exactly at the crossing (50/50) both labels are still given once each.
    expect(new Set(at(0).state)).toEqual(new Set([0, 1]));
    // Followed by overlap from δ = −0.4 to +0.4 (eigenvectors change by a rotation of ~22°), the
    // lower level keeps the label it had: continuity in the constants, as a fit needs.
    const ref = coupledLevels(g, 0, valuesOf(g, { 'a.origin': 100, 'b.origin': 99.6, 'f.W': 1 }));
    const memory = { blocks: new Map() };
    coupledLevels(g, 0, valuesOf(g, { 'a.origin': 100, 'b.origin': 99.6, 'f.W': 1 }), { follow: memory });
    const followed = coupledLevels(g, 0, valuesOf(g, { 'a.origin': 100, 'b.origin': 100.4, 'f.W': 1 }), { follow: memory });
    expect(lowerState(followed)).toBe(lowerState(ref));
  });

  it('coupledLabelFollow keeps labels on identical vectors and reports overlap 1', () => {
    const v = [1, 0, 0, 1];
    const r = coupledLabelFollow(v, [1, 0], v, 2);
    expect([...r.labels]).toEqual([1, 0]);
    expect(r.meanOverlap).toBe(1);
  });
});

describe('coupledLabelFollow against the plain greedy rule', () => {
  it('carries the labels one full sort of all overlaps would (random near-identity rotations)', () => {
    // Reference: the rule as its comment states it, with one stable sort of all n² overlaps.
    let seed = 987;
    const random = () => {
      seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
      return seed / 2 ** 32 - 0.5;
    };
    for (const n of [2, 9, 40]) {
      const oldV = Float64Array.from({ length: n * n }, (_, i) => (i % (n + 1) === 0 ? 1 : 0) + 0.6 * random());
      const newV = Float64Array.from(oldV, (v) => v + 0.4 * random());
      const oldLabels = Int32Array.from({ length: n }, (_, i) => (i * 7) % n);
      const overlap = new Float64Array(n * n);
      for (let a = 0; a < n; a++)
        for (let b = 0; b < n; b++) {
          let s = 0;
          for (let i = 0; i < n; i++) s += oldV[a * n + i] * newV[b * n + i];
          overlap[a * n + b] = s * s;
        }
      const ref = new Int32Array(n).fill(-1);
      const oldDone = new Uint8Array(n);
      for (const p of Array.from({ length: n * n }, (_, i) => i).sort((p, q) => overlap[q] - overlap[p])) {
        const a = Math.floor(p / n);
        const b = p % n;
        if (oldDone[a] || ref[b] >= 0) continue;
        oldDone[a] = 1;
        ref[b] = oldLabels[a];
      }
      expect([...coupledLabelFollow(oldV, oldLabels, newV, n).labels], `n=${n}`).toEqual([...ref]);
    }
  });
});
