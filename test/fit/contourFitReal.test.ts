/**
 * The band-contour fit on real bands: the seven HC3N fundamentals of Tamassia et al. 2022 (published
 * line positions, realBandTraces.ts) seen through an instrument at L = 0.9 and 2.5 cm, boxcar and
 * Norton–Beer medium, 1 % noise; fitted from a start 0.2/L cm^-1 and 0.3 % in B off, floating the
 * origin, B′, B″ and the scale. True origin, B″ and B′ come from the published lines (realBandTraces.ts);
 * DJ from the published ground-state rotational lines and, for the Π states, q from the published
 * e and f lines are held at those values, as a user would hold literature values.
 */
import { describe, expect, it } from 'vitest';
import { contourFit } from '../../src/fit/contourFit';
import { stateConstantsFrom, type BandModel } from '../../src/physics';
import type { TraceApodization } from './contourTraces';
import { realBands, realBandTrace, type RealBand } from './realBandTraces';

interface Row {
  label: string;
  pi: boolean;
  rmsOverNoise: number;
  zOrigin: number;
  zLowerB: number;
  zDeltaB: number;
}

function fitHc3n(
  model: BandModel,
  t: ReturnType<typeof realBandTrace>,
  opdCm: number,
  apodization: TraceApodization,
  lineAliasScan = true,
): ReturnType<typeof contourFit> {
  return contourFit({
    model,
    wavenumberCm1: t.x,
    absorbance: t.y,
    fromCm1: t.fromCm1,
    toCm1: t.toCm1,
    opdCm,
    apodization,
    massAmu: 51,
    float: ['upper.origin', 'upper.B', 'lower.B', 'scale'],
    route: 'linear',
    lineAliasScan,
  });
}

function hc3nStart(band: RealBand, opdCm: number): BandModel {
  const pi = band.upperQ !== null;
  return {
    shape: 'linear',
    band: pi ? 'perpendicular' : 'parallel',
    lower: stateConstantsFrom({ B: band.B * 1.003, DJ: band.DJ! }),
    upper: stateConstantsFrom({ B: band.B * 1.003, DJ: band.DJ!, origin: band.origin! + 0.2 / opdCm, q: band.upperQ ?? 0 }),
    temperatureK: 296,
    jMax: 130,
    kMax: 0,
    spinWeights: [1],
  };
}

const rows: Row[] = [];
for (const band of realBands().filter((b) => b.name.startsWith('HC3N')))
  for (const opdCm of [0.9, 2.5])
    for (const apodization of ['boxcar', 'norton-beer-medium'] as TraceApodization[]) {
      const t = realBandTrace(band, opdCm, apodization, 0.01, 7);
      const pi = band.upperQ !== null;
      const r = fitHc3n(hc3nStart(band, opdCm), t, opdCm, apodization);
      const o = r.parameters['upper.origin'];
      const bl = r.parameters['lower.B'];
      const db = r.combinations["B'-B''"];
      rows.push({
        label: `${band.name} at L = ${opdCm} cm, ${apodization}`,
        pi,
        rmsOverNoise: r.rms / t.noiseSigma,
        zOrigin: (o.value - band.origin!) / o.sigma,
        zLowerB: (bl.value - band.B) / bl.sigma,
        zDeltaB: (db.value - (band.upperB! - band.B)) / db.sigma,
      });
    }
const within4 = (key: 'zOrigin' | 'zLowerB' | 'zDeltaB') => rows.filter((w) => Math.abs(w[key]) <= 4).length;

describe('contourFit on real HC3N bands through an instrument', () => {
  it('fits every band to within 1.5× the noise', () => {
    // Measured: 1.00–1.14 on all 28. (HC3N ν2 at L = 2.5 cm, boxcar, left 1.31× with B″ 1.8 % low, 21σ,
    // in a line-alias minimum, before the fit looked for those.)
    expect(rows).toHaveLength(28);
    for (const w of rows) expect(w.rmsOverNoise, w.label).toBeLessThan(1.5);
  });

  it("puts every Π–Σ band's origin, B″ and B′ − B″ within 4σ of the published values", () => {
    // Measured: |z| ≤ 2.1 on all 12 (ν5, ν6, ν7). Without q (held at 0) B′ − B″ missed by 8–40σ.
    for (const w of rows.filter((x) => x.pi)) {
      expect(Math.abs(w.zOrigin), w.label).toBeLessThanOrEqual(4);
      expect(Math.abs(w.zLowerB), w.label).toBeLessThanOrEqual(4);
      expect(Math.abs(w.zDeltaB), w.label).toBeLessThanOrEqual(4);
    }
  });

  it("puts the Σ–Σ bands' constants within 4σ on all but the measured few at L = 2.5 cm", () => {
    // Measured over the 28 fits: origin within 4σ on 26 (ν4 at L = 2.5 cm: −4.4σ and −4.9σ), B″ on all
    // 28, B′ − B″ on 26 (ν4 at L = 2.5 cm: 5.6σ and 6.0σ). Before the line-alias restarts ν2 at 2.5 cm
    // also missed (origin 6.2σ, B″ −21σ and −11σ, B′ − B″ 8.0σ). At L = 0.9 cm every Σ–Σ fit is
    // within 3.1σ.
    expect(within4('zOrigin')).toBeGreaterThanOrEqual(26);
    expect(within4('zLowerB')).toBe(28);
    expect(within4('zDeltaB')).toBeGreaterThanOrEqual(26);
    for (const w of rows.filter((x) => x.label.includes('L = 0.9'))) {
      expect(Math.abs(w.zOrigin), w.label).toBeLessThanOrEqual(3.5);
      expect(Math.abs(w.zLowerB), w.label).toBeLessThanOrEqual(3.5);
      expect(Math.abs(w.zDeltaB), w.label).toBeLessThanOrEqual(3.5);
    }
  });

  it('leaves a line-alias minimum of B by itself (HC3N ν2 at L = 2.5 cm, boxcar)', () => {
    // Lines about resolved (2B = 0.30 cm^-1 against an FWHM of 0.24 cm^-1): B′ and B″ 1.8 % low put the
    // lines near the intensity maximum (J ≈ 26) one spacing off, a side minimum the solver stopped in.
    const band = realBands().find((b) => b.name === 'HC3N ν2')!;
    const t = realBandTrace(band, 2.5, 'boxcar', 0.01, 7);
    const stuck = fitHc3n(hc3nStart(band, 2.5), t, 2.5, 'boxcar', false);
    const freed = fitHc3n(hc3nStart(band, 2.5), t, 2.5, 'boxcar');
    const z = (r: ReturnType<typeof contourFit>) => (r.parameters['lower.B'].value - band.B) / r.parameters['lower.B'].sigma;
    expect(Math.abs(z(stuck))).toBeGreaterThan(10);
    expect(stuck.lineAliasRestart).toBe(1);
    expect(Math.abs(z(freed))).toBeLessThan(4);
    expect(freed.lineAliasRestart).not.toBe(1);
    expect(freed.rms).toBeLessThan(stuck.rms);
    expect(freed.warnings.join(' ')).toMatch(/line-alias minimum/);
  });
});
