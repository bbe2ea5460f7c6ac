import { describe, expect, it } from 'vitest';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { leastSquaresSolve } from '../../../src/fit/leastSquares';
import type { HamiltonianLevel } from '../../../src/physics/hamiltonian/hamiltonianLevel';
import { inversionStateLevels, inversionStateParameterNames } from '../../../src/physics/hamiltonian/inversionStateLevels';
import { levelSpinWeight, type SpinStatistics } from '../../../src/physics/hamiltonian/spinStatistics';
import { transitionsAllowed } from '../../../src/physics/hamiltonian/transitionsAllowed';
import { nh3LinesRead } from './nh3Fixture';

/**
 * ¹⁴NH3 spin weights in D3h(M), per component function (spinStatistics.ts convention): A2', A2'' 12,
 * E', E'' 3 (Bunker and Jensen (1998) give 12, 12, 6, 6 per level; ch. 8, from memory), A1', A1'' 0.
 */
const NH3_SPIN: SpinStatistics = {
  kind: 'species',
  pointGroup: 'D3h',
  weights: { "A1'": 0, "A1''": 0, "A2'": 12, "A2''": 12, "E'": 3, "E''": 3 },
};

function findLevel(levels: HamiltonianLevel[], K: number, inv: 's' | 'a', species?: string): HamiltonianLevel | undefined {
  return levels.find((l) => l.K === K && l.tag.startsWith(inv) && (species === undefined || l.species === species));
}

describe('inversionStateLevels', () => {
  it('splits every (J, K) into s below a by Δ(J,K) = inv + F_inv(J,K)', () => {
    // Hand-worked: mean origin 950, B 10, C 6, inv 36, invB −0.1: J = 2, K = 1 mean = 950 + 60 − 4 = 1006,
    // Δ = 36 − 0.1·(6 − 1) = 35.5 → s = 988.25, a = 1023.75 cm⁻¹.
    const r = inversionStateLevels({ origin: 950, B: 10, C: 6, inv: 36, invB: -0.1 }, 2, { shape: 'oblate' });
    expect(findLevel(r.levels, 1, 's')!.energyCm1).toBeCloseTo(988.25, 10);
    expect(findLevel(r.levels, 1, 'a')!.energyCm1).toBeCloseTo(1023.75, 10);
    const names = inversionStateParameterNames('oblate');
    const s = findLevel(r.levels, 1, 's')!;
    expect(s.derivatives[names.indexOf('inv')]).toBe(-0.5);
    expect(s.derivatives[names.indexOf('invB')]).toBeCloseTo(-0.5 * (6 - 1), 12);
  });

  it('gives the D3h(M) species of the empirical ¹⁴NH3 levels, and zero weight to the absent ones', () => {
    // Ref: symmetry labels of the MARVEL empirical levels of ¹⁴NH3 (2025 update; fixture README), for
    // every level of the ground and v2 = 1 states that the J'' ≤ 15 ν2 lines reach.
    const lines = nh3LinesRead();
    let checked = 0;
    for (const line of lines) {
      for (const lev of [line.upper, line.lower]) {
        const levels = inversionStateLevels({}, lev.J, { shape: 'oblate' }).levels;
        const same = levels.filter((l) => l.K === lev.K && l.tag.startsWith(lev.inv));
        expect(same.map((l) => l.species)).toContain(lev.sym);
        for (const l of same) {
          expect(levelSpinWeight(NH3_SPIN, l) > 0).toBe(l.species === lev.sym);
        }
        checked++;
      }
    }
    expect(checked).toBe(2 * lines.length);
  });

  it('leaves only a for even J and only s for odd J in K = 0 of the ground state', () => {
    // Ref: Herzberg II (1945) ch. I, NH3 inversion doubling and spin statistics (from memory); the
    // fixture's ground-state K = 0 levels (J 0…16) follow the same rule (checked here).
    for (let J = 0; J <= 6; J++) {
      const k0 = inversionStateLevels({}, J, { shape: 'oblate' }).levels.filter((l) => l.K === 0 && levelSpinWeight(NH3_SPIN, l) > 0);
      expect(k0.map((l) => l.tag)).toEqual([J % 2 === 0 ? 'a' : 's']);
    }
    for (const line of nh3LinesRead()) {
      if (line.lower.K === 0) expect(line.lower.inv).toBe(line.lower.J % 2 === 0 ? 'a' : 's');
    }
  });

  it('gives K = 3n levels twice the weight of the others per inversion level (ortho : para = 2 : 1)', () => {
    // Ref: Herzberg II (1945) ch. I (¹⁴NH3: K = 3n levels have twice the statistical weight of K ≠ 3n),
    // from memory.
    const levels = inversionStateLevels({}, 7, { shape: 'oblate' }).levels;
    const weight = (K: number, inv: 's' | 'a') =>
      levels.filter((l) => l.K === K && l.tag.startsWith(inv)).reduce((s, l) => s + levelSpinWeight(NH3_SPIN, l), 0);
    for (const inv of ['s', 'a'] as const) {
      expect(weight(3, inv) / weight(1, inv)).toBe(2);
      expect(weight(6, inv) / weight(5, inv)).toBe(2);
    }
  });

  it('allows exactly s←a and a←s in ν2, covering every fixture line', () => {
    // Ref: the fixture lines (each an empirical-level difference, README) must all be allowed; s←s and a←a
    // are refused by the D3h(M) rule Γ' ⊗ Γ'' ⊇ A1'' (Bunker and Jensen 1998, ch. 15, from memory).
    const lines = nh3LinesRead();
    const byJ = new Map<number, HamiltonianLevel[]>();
    const levelsOf = (J: number) => byJ.get(J) ?? byJ.set(J, inversionStateLevels({}, J, { shape: 'oblate' }).levels).get(J)!;
    const upper = [...Array(17).keys()].flatMap(levelsOf);
    const lower = [...Array(16).keys()].flatMap(levelsOf);
    const allowed = transitionsAllowed(upper, lower, { pointGroup: 'D3h', band: 'parallel', spin: NH3_SPIN });
    const key = (u: HamiltonianLevel, l: HamiltonianLevel) => `${u.J},${u.K},${u.tag[0]}<-${l.J},${l.K},${l.tag[0]}`;
    const allowedKeys = new Set(allowed.map((t) => key(upper[t.upper], lower[t.lower])));
    for (const t of allowed) expect(upper[t.upper].tag[0]).not.toBe(lower[t.lower].tag[0]);
    for (const line of lines) {
      expect(allowedKeys.has(`${line.upper.J},${line.upper.K},${line.upper.inv}<-${line.lower.J},${line.lower.K},${line.lower.inv}`)).toBe(
        true,
      );
    }
    // No Q line from K = 0 (only one inversion component of each K = 0 level exists).
    expect(allowed.some((t) => upper[t.upper].K === 0 && t.deltaJ === 0)).toBe(false);
  });
});

/** Result of fitNu2. */
interface Nu2Fit {
  status: string;
  rms: number;
  nLines: number;
  nConstants: number;
  upper: Record<string, number>;
  lower: Record<string, number>;
}

/**
 * Fit the J'' ≤ 15 fixture lines with inversion-doubled ground and v2 = 1 states (test-side driver over
 * src/fit/leastSquares.ts; unit weights, so χ² is the sum of squared residuals in cm⁻¹²).
 * Floated: every upper constant (but eps3/eps3J unless asked); ground constants except the K-only terms
 * (C, DK, HK, LK and their inv counterparts), which ΔK = 0 lines cannot separate from the upper ones, and
 * the ground 'inv', of which only the sum with the upper one is determined. Those are fixed: C'' = 6.2,
 * inv'' = 0.79 cm⁻¹ (≈ ¹⁴NH3 values, from memory; they shift the upper constants, not the rms).
 * @param withDeltaK3 also float eps3 of both states (eps3J stays 0). Started at 1e-3 cm⁻¹: at 0 its slope is
 *   zero, and from 1e-4 the fit slides back to the local minimum eps3 → 0 (rms 0.038); floating eps3J as well
 *   lets levels swap labels during the iterations (no convergence). Measured, not assumed.
 */
function fitNu2(withDeltaK3: boolean): Nu2Fit {
  const lines = nh3LinesRead().filter((l) => l.lower.J <= 15);
  const names = inversionStateParameterNames('oblate');
  const kOnly = new Set(['C', 'DK', 'HK', 'LK']);
  const isEps = (n: string) => n === 'eps3J' || (n === 'eps3' && !withDeltaK3);
  const upperFree = names.filter((n) => !isEps(n));
  const lowerFree = names.filter((n) => n !== 'origin' && n !== 'inv' && !kOnly.has(n.replace(/^inv/, '')) && !isEps(n));
  const params: { state: 'upper' | 'lower'; name: string }[] = [
    ...upperFree.map((name) => ({ state: 'upper' as const, name })),
    ...lowerFree.map((name) => ({ state: 'lower' as const, name })),
  ];
  const startOf = (name: string) => (({ origin: 950, B: 9.9, C: 6.2, inv: 36, eps3: 1e-3 }) as Record<string, number>)[name] ?? 0;
  const start = params.map((p) => startOf(p.name));
  const lowerFixed: Record<string, number> = { C: 6.2, inv: 0.79 };
  const constantsOf = (p: ArrayLike<number>) => {
    const upper: Record<string, number> = {};
    const lower: Record<string, number> = { ...lowerFixed };
    params.forEach((q, i) => ((q.state === 'upper' ? upper : lower)[q.name] = p[i]));
    return { upper, lower };
  };
  const evaluate = (p: ArrayLike<number>, jac: Float64Array | null, res: Float64Array | null) => {
    const { upper, lower } = constantsOf(p);
    const cache = new Map<string, HamiltonianLevel[]>();
    const levelsOf = (which: 'upper' | 'lower', J: number) => {
      const key = `${which}${J}`;
      if (!cache.has(key)) cache.set(key, inversionStateLevels(which === 'upper' ? upper : lower, J, { shape: 'oblate' }).levels);
      return cache.get(key)!;
    };
    lines.forEach((line, i) => {
      const up = findLevel(levelsOf('upper', line.upper.J), line.upper.K, line.upper.inv, line.upper.sym);
      const lo = findLevel(levelsOf('lower', line.lower.J), line.lower.K, line.lower.inv, line.lower.sym);
      if (!up || !lo) throw new Error(`no level for line ${i}`);
      if (res) res[i] = line.nuCm1 - (up.energyCm1 - lo.energyCm1);
      if (jac) {
        params.forEach((q, j) => {
          const idx = names.indexOf(q.name);
          jac[j * lines.length + i] = q.state === 'upper' ? up.derivatives[idx] : -lo.derivatives[idx];
        });
      }
    });
  };
  const solution = leastSquaresSolve(
    {
      nObservations: lines.length,
      nParameters: params.length,
      residuals: (p, out) => evaluate(p, null, out),
      jacobian: (p, out) => evaluate(p, out, null),
    },
    start,
    { maxIterations: 40 },
  );
  const fitted = constantsOf(solution.parameters);
  return {
    status: solution.status,
    rms: Math.sqrt(solution.chi2 / lines.length),
    nLines: lines.length,
    nConstants: params.length,
    upper: fitted.upper,
    lower: fitted.lower,
  };
}

describe('a fit of ¹⁴NH3 ν2 with inversion (J″ ≤ 15)', () => {
  const subBandOrigin = (f: Nu2Fit, upInv: -1 | 1) => f.upper.origin + (upInv * f.upper.inv) / 2 + (upInv * f.lower.inv) / 2;

  for (const withDeltaK3 of [false, true]) {
    it(`reproduces the empirical-level lines with octic mean and splitting expansions${withDeltaK3 ? ' and the ΔK = ±3 s ↔ a interaction' : ''}`, () => {
      const f = fitNu2(withDeltaK3);
      console.info(
        `NH3 nu2 with inversion${withDeltaK3 ? ' + dK=3' : ''}, J'' <= 15: ${f.nLines} lines, ${f.nConstants} constants, ` +
          `status ${f.status}, rms ${f.rms.toExponential(3)} cm-1; s<-a origin ${subBandOrigin(f, -1).toFixed(4)}, ` +
          `a<-s origin ${subBandOrigin(f, 1).toFixed(4)}, B'' ${f.lower.B.toFixed(5)}` +
          (withDeltaK3 ? `, eps3' ${f.upper.eps3.toExponential(4)}, eps3'' ${f.lower.eps3.toExponential(4)}` : ''),
      );
      expect(['chi2-change', 'step-size', 'no-further-decrease']).toContain(f.status);
      // Target from the issue: beat the separate sub-band fits (≈ 0.05 cm⁻¹ at J'' ≤ 15). Measured here:
      // 0.0327 cm⁻¹ without and 0.0025 cm⁻¹ with the ΔK = ±3 term, whose bound (0.005) guards that gain.
      expect(f.rms).toBeLessThan(withDeltaK3 ? 0.005 : 0.05);
      // Ref: sub-band origins ≈ 931.64 (s←a) and 968.12 (a←s) cm⁻¹ (fixture source notes; textbook values of
      // the ¹⁴NH3 v2 = 1 inversion levels, from memory); tolerance 0.05 cm⁻¹, the size of the target rms.
      expect(Math.abs(subBandOrigin(f, -1) - 931.64)).toBeLessThan(0.05);
      expect(Math.abs(subBandOrigin(f, 1) - 968.12)).toBeLessThan(0.05);
      // Ref: ground-state B0 of ¹⁴NH3 ≈ 9.944 cm⁻¹ (from memory); tolerance 0.01 cm⁻¹ (the mean B of an
      // effective fit absorbs higher-order terms).
      expect(Math.abs(f.lower.B - 9.944)).toBeLessThan(0.01);
    });
  }
});

describe('inversionStateLevels with the ΔK = ±3 s ↔ a interaction', () => {
  const base = { origin: 950, B: 10.0, C: 6.2, DJ: 8e-4, DJK: -1.4e-3, DK: 8e-4, inv: 35.7, invB: -0.3, invC: 0.2, invDJ: 1e-4 };

  /** Independent reference: the full 2(2J+1) matrix over (k, v) from the doc-comment formulas, by ml-matrix. */
  function fullEigenvalues(c: Record<string, number>, J: number): number[] {
    const x = J * (J + 1);
    const states: [number, 's' | 'a'][] = [];
    for (let k = -J; k <= J; k++) for (const v of ['s', 'a'] as const) states.push([k, v]);
    const n = states.length;
    const m = new Matrix(n, n);
    const closed = (K: number, v: 's' | 'a') =>
      findLevel(inversionStateLevels({ ...c, eps3: 0, eps3J: 0 }, J, { shape: 'oblate' }).levels, K, v)!.energyCm1;
    const f = (q: number) => x - q * (q + 1);
    for (let a = 0; a < n; a++) {
      const [k, v] = states[a];
      m.set(a, a, closed(Math.abs(k), v));
      for (let b = 0; b < n; b++) {
        const [kb, vb] = states[b];
        if (kb === k + 3 && vb !== v) {
          const el = ((c.eps3 ?? 0) + (c.eps3J ?? 0) * x) * (2 * k + 3) * Math.sqrt(f(k) * f(k + 1) * f(k + 2));
          m.set(a, b, el);
          m.set(b, a, el);
        }
      }
    }
    return [...new EigenvalueDecomposition(m, { assumeSymmetric: true }).realEigenvalues].sort((p, q) => p - q);
  }

  it('matches the full (k, s/a) matrix diagonalised by ml-matrix', () => {
    // Reference: fullEigenvalues (independent construction, ml-matrix 6.15); energies ~1e3–1e4 cm⁻¹:
    // agreement to 1e-8 cm⁻¹ (round-off).
    const c = { ...base, eps3: 2e-3, eps3J: -1e-6 };
    for (const J of [0, 1, 2, 3, 4, 7, 15]) {
      const ours = inversionStateLevels(c, J, { shape: 'oblate' })
        .levels.flatMap((l) => Array(l.degeneracy).fill(l.energyCm1) as number[])
        .sort((p, q) => p - q);
      const ref = fullEigenvalues(c, J);
      expect(ours.length).toBe(ref.length);
      for (let i = 0; i < ref.length; i++) expect(Math.abs(ours[i] - ref[i])).toBeLessThan(1e-8);
    }
  });

  it('reduces to the closed form with the same labels and species as eps3 → 0', () => {
    // eps3 = 1e-12 cm⁻¹ shifts levels by O(eps3² · J⁶ / ΔE) < 1e-12: tolerance 1e-9 cm⁻¹ (round-off).
    for (const J of [0, 1, 5, 9]) {
      const closed = inversionStateLevels(base, J, { shape: 'oblate' }).levels;
      const coupled = inversionStateLevels({ ...base, eps3: 1e-12 }, J, { shape: 'oblate' }).levels;
      expect(coupled.map((l) => `${l.K}${l.tag}${l.species}`).sort()).toEqual(closed.map((l) => `${l.K}${l.tag}${l.species}`).sort());
      for (const l of coupled) {
        const m = closed.find((q) => q.K === l.K && q.tag === l.tag)!;
        expect(Math.abs(l.energyCm1 - m.energyCm1)).toBeLessThan(1e-9);
      }
    }
  });

  it('gives ∂E/∂p matching central finite differences, eps3 and eps3J included', () => {
    // Hellmann–Feynman vs FD with h·max|∂E/∂p| = 1e-4 cm⁻¹: agreement 1e-5 relative + 1e-10/h.
    const names = inversionStateParameterNames('oblate');
    const c: Record<string, number> = { ...base, eps3: 3e-3, eps3J: 2e-6 };
    const J = 11;
    const ref = inversionStateLevels(c, J, { shape: 'oblate' }).levels;
    for (const name of ['origin', 'B', 'C', 'inv', 'invB', 'invC', 'DJK', 'eps3', 'eps3J']) {
      const pi = names.indexOf(name);
      const scale = Math.max(...ref.map((l) => Math.abs(l.derivatives[pi])), 1e-30);
      const h = 1e-4 / scale;
      const up = inversionStateLevels({ ...c, [name]: (c[name] ?? 0) + h }, J, { shape: 'oblate' }).levels;
      const dn = inversionStateLevels({ ...c, [name]: (c[name] ?? 0) - h }, J, { shape: 'oblate' }).levels;
      ref.forEach((l, i) => {
        expect(up[i].K === l.K && up[i].tag === l.tag).toBe(true);
        const fd = (up[i].energyCm1 - dn[i].energyCm1) / (2 * h);
        expect(Math.abs(fd - l.derivatives[pi]), `${name} K=${l.K} ${l.tag}`).toBeLessThan(1e-5 * Math.abs(l.derivatives[pi]) + 1e-10 / h);
      });
    }
  });
});
