import { describe, expect, it } from 'vitest';
import { bandLines, BAND_LINES_MAX } from '../../src/physics/bandLines';
import { SECOND_RADIATION_CM_K } from '../../src/physics/constants';
import { stateConstantsFrom, type BandModel, type LineList, type StateConstants } from '../../src/physics/model';

type Partial2 = Partial<Omit<BandModel, 'lower' | 'upper'>> & {
  lower: Partial<StateConstants>;
  upper: Partial<StateConstants>;
};

function model(p: Partial2): BandModel {
  return {
    shape: p.shape ?? 'prolate',
    band: p.band ?? 'perpendicular',
    lower: stateConstantsFrom(p.lower),
    upper: stateConstantsFrom(p.upper),
    temperatureK: p.temperatureK ?? 296,
    jMax: p.jMax ?? 20,
    kMax: p.kMax ?? 8,
    spinWeights: p.spinWeights ?? [1],
  };
}

/** A C3v-like prolate perpendicular band with distortion (invented constants, cm^-1). */
const PERP = model({
  lower: { B: 0.32, A: 2.6, DJ: 3e-7, DJK: 2e-6, DK: 1.5e-5 },
  upper: { origin: 1150, B: 0.318, A: 2.58, DJ: 3.1e-7, DJK: 2.1e-6, DK: 1.4e-5, zeta: 0.25 },
  jMax: 30,
  kMax: 12,
});

/** A parallel band of the same top. */
const PAR = { ...PERP, band: 'parallel' as const };

function rows(lines: LineList) {
  const out = [];
  for (let i = 0; i < lines.count; i++) {
    out.push({
      jUpper: lines.jUpper[i],
      kUpper: lines.kUpper[i],
      jLower: lines.jLower[i],
      kLower: lines.kLower[i],
      deltaK: lines.deltaK[i],
      deltaJ: lines.deltaJ[i],
      nu: lines.wavenumberCm1[i],
      intensity: lines.intensity[i],
      eLower: lines.eLowerCm1[i],
      hl: lines.honlLondon[i],
    });
  }
  return out;
}

/** The rigid-rotor-plus-distortion term value, written out independently (contract formula). */
function F(s: StateConstants, unique: number, J: number, K: number): number {
  const x = J * (J + 1);
  return s.B * x + (unique - s.B) * K * K - s.DJ * x * x - s.DJK * x * K * K - s.DK * K ** 4;
}

/** Every (J'', K'', ΔJ, ΔK) the contract's selection rules allow, enumerated by brute force. */
function allowedByRules(m: BandModel): Set<string> {
  const out = new Set<string>();
  const kTop = m.shape === 'linear' ? 0 : Math.min(m.kMax, m.jMax);
  for (let K = 0; K <= kTop; K++) {
    if (m.spinWeights[K % m.spinWeights.length] === 0) continue;
    for (let J = K; J <= m.jMax; J++) {
      for (const dK of m.band === 'parallel' ? [0] : [1, -1]) {
        if (m.band === 'perpendicular' && K === 0 && dK === -1) continue;
        for (const dJ of [-1, 0, 1]) {
          const kUp = m.shape === 'linear' ? (m.band === 'perpendicular' ? 1 : 0) : K + dK;
          const jUp = J + dJ;
          if (jUp < kUp) continue;
          if (dJ === 0 && J === 0) continue;
          if (m.band === 'parallel' && dJ === 0 && K === 0) continue;
          out.add(`${J},${K},${dJ},${kUp - K}`);
        }
      }
    }
  }
  return out;
}

describe('bandLines: degenerate inputs and validation', () => {
  it('gives the single R(0) line of a parallel band when jMax = 0', () => {
    const lines = bandLines({ ...PAR, jMax: 0 });
    expect(lines.count).toBe(1);
    expect([lines.jLower[0], lines.jUpper[0], lines.deltaJ[0], lines.deltaK[0]]).toEqual([0, 1, 1, 0]);
    expect(lines.intensity[0]).toBe(1);
  });

  it('gives the single rR0(0) line of a perpendicular band when jMax = 0', () => {
    const lines = bandLines({ ...PERP, jMax: 0 });
    expect(lines.count).toBe(1);
    expect([lines.jLower[0], lines.kLower[0], lines.jUpper[0], lines.kUpper[0]]).toEqual([0, 0, 1, 1]);
  });

  it('refuses bad jMax, kMax, temperature, spin weights, non-finite constants and absurd sizes', () => {
    expect(() => bandLines({ ...PERP, jMax: -1 })).toThrow(/bandLines: jMax .*got -1/);
    expect(() => bandLines({ ...PERP, jMax: 2.5 })).toThrow(/jMax/);
    expect(() => bandLines({ ...PERP, kMax: -3 })).toThrow(/kMax .*got -3/);
    expect(() => bandLines({ ...PERP, temperatureK: 0 })).toThrow(/temperatureK .*got 0/);
    expect(() => bandLines({ ...PERP, temperatureK: Infinity })).toThrow(/temperatureK/);
    expect(() => bandLines({ ...PERP, spinWeights: [] })).toThrow(/spinWeights/);
    expect(() => bandLines({ ...PERP, spinWeights: [1, -2] })).toThrow(/spinWeights .*-2/);
    expect(() => bandLines({ ...PERP, upper: { ...PERP.upper, B: NaN } })).toThrow(/upper\.B must be finite, got NaN/);
    expect(() => bandLines({ ...PERP, jMax: 3000, kMax: 3000 })).toThrow(new RegExp(`more than ${BAND_LINES_MAX}`));
  });
});

describe('bandLines: selection rules', () => {
  for (const [name, m] of [
    ['prolate perpendicular', PERP],
    ['prolate parallel', PAR],
    [
      'oblate perpendicular',
      model({ shape: 'oblate', lower: { B: 0.25, C: 0.13 }, upper: { origin: 900, B: 0.249, C: 0.129, zeta: -0.3 }, jMax: 25, kMax: 25 }),
    ],
    ['linear Σ–Σ', model({ shape: 'linear', band: 'parallel', lower: { B: 0.39 }, upper: { origin: 2349, B: 0.387 }, jMax: 40 })],
    ['linear Π–Σ', model({ shape: 'linear', lower: { B: 0.39 }, upper: { origin: 667, B: 0.39, q: 4e-4 }, jMax: 40 })],
    ['spin weights [1, 0, 0]', { ...PERP, spinWeights: [1, 0, 0] }],
  ] as [string, BandModel][]) {
    it(`gives exactly the lines the selection rules allow (${name})`, () => {
      // Ref: Herzberg II (1945) ch. IV (symmetric-top selection rules), as stated in the headless contract.
      const want = allowedByRules(m);
      const got = new Set(rows(bandLines(m)).map((r) => `${r.jLower},${r.kLower},${r.deltaJ},${r.deltaK}`));
      expect(got.size).toBe(bandLines(m).count); // no duplicates
      expect([...got].sort()).toEqual([...want].sort());
    });
  }

  it('takes only ΔK = +1 from K″ = 0 in a perpendicular band, with the degeneracy 2 of K′ = 1', () => {
    const r = rows(bandLines(PERP)).filter((x) => x.kLower === 0);
    expect(r.length).toBeGreaterThan(0);
    expect(r.every((x) => x.deltaK === 1 && x.kUpper === 1)).toBe(true);
    // n·HL of the K'' = 0 lines of one J'' sums to 2J''+1 (Herzberg II 1945, ch. IV, sum rule).
    for (const J of [1, 5, 17]) {
      const sum = r.filter((x) => x.jLower === J).reduce((a, x) => a + 2 * x.hl, 0);
      expect(sum).toBeCloseTo(2 * J + 1, 12);
    }
  });

  it('removes every line of a K″ with zero spin weight and scales the others by their weight', () => {
    const w = bandLines({ ...PERP, spinWeights: [4, 0, 2] });
    expect(rows(w).some((x) => x.kLower % 3 === 1)).toBe(false);
    const plain = rows(bandLines({ ...PERP, spinWeights: [1] }));
    const weighted = rows(w);
    // Compare ratios to the same reference line so the normalisation cancels (tol: round-off 1e-12).
    const key = (x: { jLower: number; kLower: number; deltaJ: number; deltaK: number }) =>
      `${x.jLower},${x.kLower},${x.deltaJ},${x.deltaK}`;
    const ref = plain.find((x) => x.kLower === 0 && x.jLower === 10 && x.deltaJ === 1)!;
    const refW = weighted.find((x) => key(x) === key(ref))!;
    for (const x of weighted) {
      const p = plain.find((y) => key(y) === key(x))!;
      const g = [4, 0, 2][x.kLower % 3];
      expect(x.intensity / refW.intensity).toBeCloseTo(((g / 4) * p.intensity) / ref.intensity, 12);
    }
  });

  it('respects kMax and never lets K″ exceed jMax', () => {
    const r = rows(bandLines({ ...PERP, jMax: 5, kMax: 50 }));
    expect(Math.max(...r.map((x) => x.kLower))).toBe(5);
    expect(Math.max(...rows(bandLines(PERP)).map((x) => x.kLower))).toBe(12);
  });
});

describe('bandLines: positions', () => {
  it("puts every line at E′ − E″ of the contract's term values", () => {
    const { lower: lo, upper: up } = PERP;
    for (const x of rows(bandLines(PERP))) {
      const coriolis = 2 * up.A * up.zeta * x.kUpper * (x.deltaK > 0 ? -1 : 1);
      const want = up.origin + F(up, up.A, x.jUpper, x.kUpper) + coriolis - F(lo, lo.A, x.jLower, x.kLower);
      // Tol 1e-9 cm^-1: round-off of ~1e3 cm^-1 sums.
      expect(Math.abs(x.nu - want)).toBeLessThan(1e-9);
      expect(Math.abs(x.eLower - F(lo, lo.A, x.jLower, x.kLower))).toBeLessThan(1e-10);
    }
  });

  it('reproduces the closed-form sub-band origins of a perpendicular band (rigid rotor)', () => {
    // Ref: Herzberg II (1945) ch. IV, sub-band origins of a perpendicular band (eq. (IV,64) there):
    // with E' = ν0 + B'J(J+1) + (A'−B')K'² ∓ 2A'ζK' and K' = K'' ± 1, the Q lines are
    //   ν_Q = ν_sub + (B' − B'')J(J+1),
    //   ν_sub(K'', ±) = ν0 + [A'(1∓2ζ) − B'] ± 2[A'(1−ζ) − B']K'' + [(A'−B') − (A''−B'')]K''².
    // (Derived here by expanding (K''±1)² and collecting powers of K''.)
    const lo = { B: 0.32, A: 2.6 };
    const up = { origin: 1150, B: 0.318, A: 2.58, zeta: 0.25 };
    const m = model({ lower: lo, upper: up, jMax: 30, kMax: 12 });
    const q = rows(bandLines(m)).filter((x) => x.deltaJ === 0);
    expect(q.length).toBeGreaterThan(100);
    for (const x of q) {
      const s = x.deltaK;
      const sub =
        up.origin +
        (up.A * (1 - 2 * up.zeta) - up.B) +
        s * 2 * (up.A * (1 - up.zeta) - up.B) * x.kLower +
        (up.A - up.B - (lo.A - lo.B)) * x.kLower ** 2;
      // The Q-branch limit: subtract the J-dependent part. Tol 1e-9 cm^-1 (round-off).
      expect(Math.abs(x.nu - (up.B - lo.B) * x.jLower * (x.jLower + 1) - sub)).toBeLessThan(1e-9);
    }
  });

  it('spaces adjacent rQ sub-branch heads by about 2[A′(1−ζ) − B′]', () => {
    // Common practice (Herzberg II 1945 ch. IV): Q sub-branches of a perpendicular band are spaced by
    // ≈ 2[A'(1−ζ) − B']; the exact spacing adds [(A'−B') − (A''−B'')](2K''+1), small when A' ≈ A''.
    // With these constants that correction is ≤ 0.02·25 = 0.5 % of the spacing; tol 1 %.
    const lo = { B: 0.32, A: 2.6 };
    const up = { origin: 1150, B: 0.32, A: 2.6 - 1e-4, zeta: 0.25 };
    const lines = rows(bandLines(model({ lower: lo, upper: up, jMax: 30, kMax: 12 })));
    const head = (K: number, s: number) =>
      lines.find((x) => x.deltaJ === 0 && x.kLower === K && x.deltaK === s && x.jLower === K + (s > 0 ? 1 : 0))!.nu;
    const spacing = 2 * (up.A * (1 - up.zeta) - up.B);
    for (let K = 1; K < 12; K++) {
      expect(Math.abs((head(K + 1, 1) - head(K, 1)) / spacing - 1)).toBeLessThan(0.01);
      expect(Math.abs((head(K, -1) - head(K + 1, -1)) / spacing - 1)).toBeLessThan(0.01);
    }
  });

  it('leaves a gap of 2B′ + 2B″ ≈ 4B between R(0) and P(1) of a parallel band', () => {
    // Common practice: R(0) − P(1) = 2B' + 2B'' (rigid rotor, K = 0), i.e. about 4B.
    const m = model({ band: 'parallel', lower: { B: 0.32, A: 2.6 }, upper: { origin: 1150, B: 0.318, A: 2.58 } });
    const r = rows(bandLines(m));
    const R0 = r.find((x) => x.kLower === 0 && x.jLower === 0 && x.deltaJ === 1)!.nu;
    const P1 = r.find((x) => x.kLower === 0 && x.jLower === 1 && x.deltaJ === -1)!.nu;
    expect(R0 - P1).toBeCloseTo(2 * 0.318 + 2 * 0.32, 10);
    expect(Math.abs((R0 - P1) / (4 * 0.32) - 1)).toBeLessThan(0.01); // B' within 1 % of B''
    // With distortion R(0) = ν0 + 2B' − 4DJ' and P(1) = ν0 − 2B'' + 4DJ'' (Herzberg II ch. IV).
    const d = model({ band: 'parallel', lower: { B: 0.32, A: 2.6, DJ: 1e-4 }, upper: { origin: 1150, B: 0.318, A: 2.58, DJ: 2e-4 } });
    const rd = rows(bandLines(d));
    const R0d = rd.find((x) => x.kLower === 0 && x.jLower === 0 && x.deltaJ === 1)!.nu;
    const P1d = rd.find((x) => x.kLower === 0 && x.jLower === 1 && x.deltaJ === -1)!.nu;
    expect(R0d - 1150).toBeCloseTo(2 * 0.318 - 4 * 2e-4, 10);
    expect(P1d - 1150).toBeCloseTo(-2 * 0.32 + 4 * 1e-4, 10);
  });

  it('uses C for an oblate top', () => {
    const lo = { B: 0.25, C: 0.13 };
    const up = { origin: 900, B: 0.249, C: 0.129, zeta: -0.3 };
    const m = model({ shape: 'oblate', lower: lo, upper: up, jMax: 15, kMax: 15 });
    for (const x of rows(bandLines(m))) {
      const want =
        up.origin +
        up.B * x.jUpper * (x.jUpper + 1) +
        (up.C - up.B) * x.kUpper ** 2 -
        x.deltaK * 2 * up.C * up.zeta * x.kUpper -
        (lo.B * x.jLower * (x.jLower + 1) + (lo.C - lo.B) * x.kLower ** 2);
      expect(Math.abs(x.nu - want)).toBeLessThan(1e-9);
    }
  });

  it('drops lines at non-positive wavenumber', () => {
    // An unphysical origin near 0: the P lines would fall below zero.
    const m = model({ band: 'parallel', lower: { B: 1, A: 3 }, upper: { origin: 5, B: 1, A: 3 }, jMax: 20, kMax: 0 });
    const r = rows(bandLines(m));
    expect(r.every((x) => x.nu > 0)).toBe(true);
    expect(r.some((x) => x.deltaJ === -1 && x.jLower === 2)).toBe(true); // 5 − 4 = 1 > 0 kept
    expect(r.some((x) => x.deltaJ === -1 && x.jLower === 3)).toBe(false); // 5 − 6 < 0 dropped
  });
});

describe('bandLines: intensities', () => {
  it('follows ν·n·g·HL·exp(−c2E″/T)·(1 − exp(−c2ν/T)), strongest line = 1', () => {
    // Ref: Herzberg II (1945) ch. IV intensity expression; c2 from CODATA 2018 (1.438776877 cm K).
    const m = { ...PERP, spinWeights: [4, 2, 2], temperatureK: 150 };
    const r = rows(bandLines(m));
    const c2 = 1.438776877;
    expect(SECOND_RADIATION_CM_K).toBeCloseTo(c2, 12);
    const raw = r.map((x) => {
      const g = m.spinWeights[x.kLower % 3];
      const n = x.kLower === 0 && m.band === 'parallel' ? 1 : 2;
      return x.nu * n * g * x.hl * Math.exp((-c2 * x.eLower) / m.temperatureK) * (1 - Math.exp((-c2 * x.nu) / m.temperatureK));
    });
    const max = Math.max(...raw);
    expect(Math.max(...r.map((x) => x.intensity))).toBe(1);
    // Tol 1e-10 relative: the module forms exp(−c2E''/T) − exp(−c2E'/T) instead of the product.
    r.forEach((x, i) => expect(Math.abs(x.intensity - raw[i] / max)).toBeLessThan(1e-10));
  });

  it('keeps the stimulated-emission factor accurate for a far-infrared band (c2ν/T ≪ 1)', () => {
    // ν ≈ 20 cm^-1 at 1000 K: x = c2ν/T ≈ 0.03, where 1 − e^{−x} must not lose digits.
    const m = model({
      band: 'parallel',
      lower: { B: 0.32, A: 2.6 },
      upper: { origin: 20, B: 0.319, A: 2.6 },
      temperatureK: 1000,
      jMax: 10,
      kMax: 3,
    });
    const r = rows(bandLines(m));
    const c2 = 1.438776877;
    const raw = r.map((x) => x.nu * (x.kLower === 0 ? 1 : 2) * x.hl * Math.exp((-c2 * x.eLower) / 1000) * -Math.expm1((-c2 * x.nu) / 1000));
    const max = Math.max(...raw);
    r.forEach((x, i) => expect(Math.abs(x.intensity - raw[i] / max)).toBeLessThan(1e-9));
  });

  it('applies minIntensity after normalisation', () => {
    const all = bandLines(PERP);
    const some = bandLines(PERP, { minIntensity: 0.1 });
    let expected = 0;
    for (let i = 0; i < all.count; i++) if (all.intensity[i] >= 0.1) expected++;
    expect(some.count).toBe(expected);
    expect(Math.min(...some.intensity)).toBeGreaterThanOrEqual(0.1);
    expect(Math.max(...some.intensity)).toBe(1);
  });
});

describe('bandLines: linear molecules', () => {
  it('gives a Σ–Σ band only P and R lines with HL(R(J)) = J+1 and HL(P(J)) = J', () => {
    // Ref: Herzberg, Spectra of Diatomic Molecules (1950), ch. IV: Σ–Σ Hönl–London factors J''+1 (R), J'' (P).
    const m = model({ shape: 'linear', band: 'parallel', lower: { B: 0.39 }, upper: { origin: 2349, B: 0.387 }, jMax: 40 });
    const r = rows(bandLines(m));
    expect(new Set(r.map((x) => x.deltaJ))).toEqual(new Set([-1, 1]));
    for (const x of r) {
      expect(x.kLower).toBe(0);
      expect(x.kUpper).toBe(0);
      expect(x.hl).toBeCloseTo(x.deltaJ === 1 ? x.jLower + 1 : x.jLower, 12);
      const want = 2349 + 0.387 * x.jUpper * (x.jUpper + 1) - 0.39 * x.jLower * (x.jLower + 1);
      expect(Math.abs(x.nu - want)).toBeLessThan(1e-9);
    }
  });

  it('gives a Π–Σ band P, Q and R lines with n·HL = (J+2)/2, (2J+1)/2, (J−1)/2', () => {
    // Ref: Herzberg, Spectra of Diatomic Molecules (1950), ch. V, ¹Π–¹Σ Hönl–London factors (Λ'' = 0,
    // Λ' = 1); the scale here sums to 2J''+1 over the three branches. n = 2 (the two l components).
    const m = model({ shape: 'linear', lower: { B: 0.39 }, upper: { origin: 667, B: 0.39, q: 4e-4 }, jMax: 40 });
    const r = rows(bandLines(m));
    for (const x of r) {
      const want = x.deltaJ === 1 ? (x.jLower + 2) / 2 : x.deltaJ === 0 ? (2 * x.jLower + 1) / 2 : (x.jLower - 1) / 2;
      expect(2 * x.hl).toBeCloseTo(want, 12);
      expect(x.kUpper).toBe(1);
    }
    expect(r.some((x) => x.deltaJ === -1 && x.jLower === 1)).toBe(false); // P(1) would end on J' = 0 < |l|
    expect(r.some((x) => x.deltaJ === 0 && x.jLower === 0)).toBe(false);
  });

  it('splits the Q branch from P/R by the l-type doubling q J′(J′+1)', () => {
    // Ref: Hollas, High Resolution Spectroscopy (1998) sec. 6.2.4: P and R lines end on one l-type
    // component, Q lines on the other; the components differ by q J(J+1). Upper level J' reached by
    // R(J'−1) and by Q(J'): [ν_R + F''(J'−1)] − [ν_Q + F''(J')] = q J'(J'+1).
    const q = 4e-4;
    const m = model({ shape: 'linear', lower: { B: 0.39 }, upper: { origin: 667, B: 0.3905, q }, jMax: 40 });
    const r = rows(bandLines(m));
    for (const J of [1, 5, 20, 39]) {
      const R = r.find((x) => x.deltaJ === 1 && x.jLower === J - 1)!;
      const Q = r.find((x) => x.deltaJ === 0 && x.jLower === J)!;
      const P = r.find((x) => x.deltaJ === -1 && x.jLower === J + 1)!;
      expect(R.nu + R.eLower - (Q.nu + Q.eLower)).toBeCloseTo(q * J * (J + 1), 9);
      expect(P.nu + P.eLower).toBeCloseTo(R.nu + R.eLower, 9); // P and R share the upper level
    }
  });
});
