import { describe, expect, it } from 'vitest';
import { honlLondonFactor } from '../../../src/physics/honlLondon';
import { bandTransitions, levelComponents, levelTagsAllowed, systemBandType } from '../../../src/physics/system/bandRules';
import type { LevelSet } from '../../../src/physics/system/levelTypes';
import { termLevelProvider } from '../../../src/physics/system/termLevels';

interface Found {
  lowerK: number;
  lowerL: number;
  lowerTag: string;
  upperK: number;
  upperL: number;
  upperTag: string;
  strength: number;
}

function copy(s: LevelSet): LevelSet {
  return {
    ...s,
    K: s.K.slice(),
    l: s.l.slice(),
    tag: s.tag.slice(),
    energyCm1: s.energyCm1.slice(),
    componentCount: s.componentCount.slice(),
  };
}

/** Every transition J'' → J' between two closed-form states (constants only set the labels here). */
function transitions(
  shape: 'prolate' | 'linear',
  lowerDeg: boolean,
  upperDeg: boolean,
  jLower: number,
  jUpper: number,
  kMax = 30,
): Found[] {
  const lo = termLevelProvider(shape, lowerDeg);
  const up = termLevelProvider(shape, upperDeg);
  const values = (n: number) => new Float64Array(n).fill(0.1);
  const a = copy(lo.levels(jLower, values(lo.parameterNames.length), kMax));
  const b = copy(up.levels(jUpper, values(up.parameterNames.length), kMax + 1));
  const out: Found[] = [];
  bandTransitions(a, lowerDeg, b, upperDeg, kMax, (i, j, s) =>
    out.push({ lowerK: a.K[i], lowerL: a.l[i], lowerTag: a.tag[i], upperK: b.K[j], upperL: b.l[j], upperTag: b.tag[j], strength: s }),
  );
  return out;
}

/** Σ over every upper level and ΔJ of the strengths out of the lower level (K'', l'', tag''). */
function sumFrom(shape: 'prolate' | 'linear', lowerDeg: boolean, upperDeg: boolean, J: number, K: number, l: number, tag = ''): number {
  let s = 0;
  for (const dJ of [-1, 0, 1]) {
    if (J + dJ < 0) continue;
    for (const t of transitions(shape, lowerDeg, upperDeg, J, J + dJ)) {
      if (t.lowerK === K && t.lowerL === l && t.lowerTag === tag) s += t.strength;
    }
  }
  return s;
}

describe('systemBandType', () => {
  it('follows the degeneracy of the two states', () => {
    // Ref: Herzberg II (1945) ch. IV: A–A and E–E (Δℓ = 0) bands are ΔK = 0, A–E bands ΔK = ±1.
    expect(systemBandType(false, false)).toBe('parallel');
    expect(systemBandType(false, true)).toBe('perpendicular');
    expect(systemBandType(true, false)).toBe('perpendicular');
    expect(systemBandType(true, true)).toBe('parallel');
  });
});

describe('levelComponents', () => {
  it('gives the signed (k, ℓ) pairs of each label, kℓ of the sign of l', () => {
    expect(levelComponents(0, 0, false)).toEqual([0, 0]);
    expect(levelComponents(3, 0, false)).toEqual([3, 0, -3, 0]);
    expect(levelComponents(0, 0, true)).toEqual([0, 1, 0, -1]);
    expect(levelComponents(2, 1, true)).toEqual([2, 1, -2, -1]);
    expect(levelComponents(2, -1, true)).toEqual([2, -1, -2, 1]);
  });
});

describe('bandTransitions: Hönl–London factors of every case', () => {
  it('nondegenerate ↔ nondegenerate: the parallel factors, twice for K > 0, and the sum rule 2J″+1 per component', () => {
    // Ref: Herzberg II (1945) eqs. (IV,60)–(IV,62); sum rule Σ_branches HL = 2J″+1 per ±k component
    // (Herzberg II ch. IV; Bunker & Jensen (1998) ch. 14).
    for (const t of transitions('prolate', false, false, 6, 7)) {
      expect(t.upperK).toBe(t.lowerK);
      expect(t.strength).toBeCloseTo((t.lowerK === 0 ? 1 : 2) * honlLondonFactor(6, t.lowerK, 1, 0), 12);
    }
    for (const K of [0, 1, 4, 6]) expect(sumFrom('prolate', false, false, 6, K, 0)).toBeCloseTo((K === 0 ? 1 : 2) * 13, 10);
  });

  it('nondegenerate → degenerate: ΔK = +1 ends on (+l) levels, ΔK = −1 on (−l) levels and K′ = 0; sum 2J″+1 per component', () => {
    // Ref: Herzberg II (1945) ch. IV sec. 2 (ΔK = ±1 with Δℓ = ±1 of the same sign); factors (IV,72);
    // the ±1 sub-bands of one component together sum to 2J″+1.
    for (const t of transitions('prolate', false, true, 5, 5)) {
      const dK = t.upperK - t.lowerK;
      if (t.upperK === 0) expect(t.upperL).toBe(0);
      else expect(t.upperL).toBe(dK > 0 ? 1 : -1);
      expect(t.strength).toBeCloseTo(2 * honlLondonFactor(5, t.lowerK, 0, dK), 12);
    }
    for (const K of [0, 1, 3, 5]) expect(sumFrom('prolate', false, true, 5, K, 0)).toBeCloseTo((K === 0 ? 1 : 2) * 11, 10);
  });

  it('degenerate → degenerate (hot band within a degenerate mode): ΔK = 0, l kept, parallel factors per component', () => {
    // Ref: Herzberg II (1945) ch. IV (ΔK = 0, Δℓ = 0 between two degenerate levels); the factors
    // are those of a parallel band for each of the two components of a level.
    const found = transitions('prolate', true, true, 4, 4);
    for (const t of found) {
      expect(t.upperK).toBe(t.lowerK);
      expect(t.upperL).toBe(t.lowerL);
      expect(t.strength).toBeCloseTo(2 * honlLondonFactor(4, t.lowerK, 0, 0), 12);
    }
    // No Q line from K = 0 (factor (2J+1)K²/(J(J+1)) = 0), and one from each of (+l) and (−l) at K = 2.
    expect(found.filter((t) => t.lowerK === 0)).toHaveLength(0);
    expect(found.filter((t) => t.lowerK === 2).map((t) => t.lowerL)).toEqual([1, -1]);
    for (const [K, l] of [
      [0, 0],
      [1, 1],
      [1, -1],
      [4, 1],
    ])
      expect(sumFrom('prolate', true, true, 4, K, l)).toBeCloseTo(2 * 9, 10);
  });

  it('degenerate → nondegenerate: each line has the strength of its reverse (line strengths are symmetric)', () => {
    // Ref: Bunker & Jensen (1998) ch. 14: the line strength S(f←i) = S(i←f) (sum of |⟨f|μ|i⟩|² over
    // both levels' sublevels); so the E → A band's factors must equal the A → E band's read backwards.
    for (const [jLo, jUp] of [
      [5, 6],
      [5, 5],
      [5, 4],
    ]) {
      const forward = transitions('prolate', true, false, jLo, jUp);
      const backward = transitions('prolate', false, true, jUp, jLo);
      expect(forward.length).toBe(backward.length);
      for (const t of forward) {
        const r = backward.find((b) => b.lowerK === t.upperK && b.upperK === t.lowerK && b.upperL === t.lowerL);
        expect(r, JSON.stringify(t)).toBeDefined();
        expect(t.strength).toBeCloseTo(r!.strength, 12);
      }
    }
    // From a degenerate level only one Δk is open per component: the sum is (2J″+1)/2 per component.
    // Ref: Herzberg II (1945) ch. IV (a component k″ with ℓ″ = +1 reaches ℓ′ = 0 only with Δk = −1).
    expect(sumFrom('prolate', true, false, 5, 3, 1)).toBeCloseTo(2 * 5.5, 10);
  });

  it('linear Π ← Σ+: R (J″+2)/2, Q (2J″+1)/2, P (J″−1)/2; P and R end on e levels, Q on f levels', () => {
    // Ref: Herzberg II (1945) ch. IV (Π–Σ bands of linear molecules; from memory the factors
    // (J+2)/2, (2J+1)/2, (J−1)/2 for R, Q, P); e/f rule: J. M. Brown et al., J. Mol. Spectrosc. 55, 500 (1975).
    const J = 7;
    const byBranch = (dJ: number) => transitions('linear', false, true, J, J + dJ);
    expect(byBranch(1)).toEqual([expect.objectContaining({ upperTag: 'e', strength: (J + 2) / 2 })]);
    expect(byBranch(0)).toEqual([expect.objectContaining({ upperTag: 'f', strength: (2 * J + 1) / 2 })]);
    expect(byBranch(-1)).toEqual([expect.objectContaining({ upperTag: 'e', strength: (J - 1) / 2 })]);
  });

  it('linear Π ← Π: e ↔ e and f ↔ f in P and R, e ↔ f in Q, each with the parallel factor of K = 1', () => {
    // Ref: Herzberg II (1945) ch. IV (Π–Π bands: weak Q branch with factor (2J+1)ℓ²/(J(J+1))), parity rule
    // as in Brown et al. (1975).
    const J = 6;
    const r = transitions('linear', true, true, J, J + 1);
    expect(r.map((t) => `${t.lowerTag}${t.upperTag}`).sort()).toEqual(['ee', 'ff']);
    for (const t of r) expect(t.strength).toBeCloseTo((J * (J + 2)) / (J + 1), 12);
    const q = transitions('linear', true, true, J, J);
    expect(q.map((t) => `${t.lowerTag}${t.upperTag}`).sort()).toEqual(['ef', 'fe']);
    for (const t of q) expect(t.strength).toBeCloseTo((2 * J + 1) / (J * (J + 1)), 12);
  });

  it('linear Σ+ ← Π: P and R from e levels, Q from f levels, symmetric with Π ← Σ+', () => {
    const J = 5;
    const q = transitions('linear', true, false, J, J);
    expect(q).toEqual([expect.objectContaining({ lowerTag: 'f', upperTag: 'e' })]);
    const back = transitions('linear', false, true, J, J);
    expect(q[0].strength).toBeCloseTo(back[0].strength, 12);
    const r = transitions('linear', true, false, J, J + 1);
    expect(r).toEqual([expect.objectContaining({ lowerTag: 'e', upperTag: 'e' })]);
  });
});

describe('levelTagsAllowed', () => {
  it('applies the e/f parity rule and lets untagged levels pass', () => {
    expect(levelTagsAllowed('e', 'e', 1)).toBe(true);
    expect(levelTagsAllowed('e', 'f', 1)).toBe(false);
    expect(levelTagsAllowed('e', 'f', 0)).toBe(true);
    expect(levelTagsAllowed('', 'f', 0)).toBe(true);
  });
});
