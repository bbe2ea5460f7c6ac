/**
 * The band-shape reading on real bands: published line lists (HITRAN 2012 CH3CN ν4, PH3 ν2 and ν4;
 * the HC3N fundamentals of Tamassia et al. 2022) seen through an instrument at L = 0.9–4 cm, boxcar and
 * Norton–Beer medium, with 1 % noise (test/fit/realBandTraces.ts says how the traces are made and
 * where each true B″ and origin comes from). Each check value comes from the published data, none
 * from our physics.
 */
import { describe, expect, it } from 'vitest';
import { bandShapeClassify, type BandShapeClassification } from '../../src/analysis/bandShapeClassify';
import type { TraceApodization } from '../fit/contourTraces';
import { realBands, realBandTrace, realBandTraceThick, type RealBand } from '../fit/realBandTraces';

const OPDS_CM = [0.9, 1.5, 2.5, 4];
const APODIZATIONS: TraceApodization[] = ['boxcar', 'norton-beer-medium'];

interface Reading {
  band: RealBand;
  opdCm: number;
  apodization: TraceApodization;
  r: BandShapeClassification;
}

const readings: Reading[] = [];
for (const band of realBands())
  for (const opdCm of OPDS_CM)
    for (const apodization of APODIZATIONS) {
      const t = realBandTrace(band, opdCm, apodization, 0.01, 7);
      readings.push({ band, opdCm, apodization, r: bandShapeClassify(t.x, t.y, t.fromCm1, t.toCm1, { temperatureK: 296 }) });
    }
const label = (w: Reading) => `${w.band.name} at L = ${w.opdCm} cm, ${w.apodization}`;

describe('bandShapeClassify on real bands (published line lists through an instrument line shape)', () => {
  it('makes its traces from the published data as described', () => {
    const bands = realBands();
    expect(bands.map((b) => b.name)).toEqual([
      'HC3N ν1',
      'HC3N ν2',
      'HC3N ν3',
      'HC3N ν4',
      'HC3N ν5',
      'HC3N ν6',
      'HC3N ν7',
      'CH3CN ν4',
      'PH3 ν2',
      'PH3 ν4',
    ]);
    // HC3N B″ = 4549.06 MHz (the J = 1 ← 0 line at 9098.1152 MHz, reference code dZ71 in Tamassia et al.'s table).
    expect(bands[0].B).toBeCloseTo(0.151741, 5);
    // CH3CN B″ ≈ 9198.9 MHz = 0.30684 cm^-1 and PH3 B″ ≈ 4.452 cm^-1 (from memory), here fitted to
    // HITRAN's lower-state energies.
    expect(bands[7].B).toBeCloseTo(0.30684, 4);
    expect(bands[8].B).toBeCloseTo(4.452, 2);
    // Band origins (from memory: HC3N ν1 3327.37, ν5 663.2, ν7 222.4; CH3CN ν4 920.29; PH3 ν2 992.13 cm^-1).
    expect(bands[0].origin).toBeCloseTo(3327.37, 1);
    expect(bands[4].origin).toBeCloseTo(663.2, 0);
    expect(bands[6].origin).toBeCloseTo(222.4, 0);
    expect(bands[7].origin).toBeCloseTo(920.29, 1);
    expect(bands[8].origin).toBeCloseTo(992.13, 1);
    // The HC3N lists leave some J out (ν4 stops at J = 51): those are placed from the fit.
    expect(bands[3].filled).toBeGreaterThan(100);
    expect(bands[0].filled).toBeLessThan(100);
  });

  it('never gives a wrong profile or band type at medium or high confidence', () => {
    for (const w of readings) {
      if (w.r.confidence === 'low') continue;
      expect(w.r.profile, label(w)).toBe(w.band.profile);
      expect(w.r.type, label(w)).toBe(w.band.type);
    }
  });

  it('names the profile right on every band but PH3 ν4, and flags that one low', () => {
    // Measured: 72 of 72 right on HC3N ν1–ν7, CH3CN ν4 and PH3 ν2 (71 before this check: HC3N ν1 at
    // L = 4 cm, Norton–Beer, read PQR at medium, its tallest R line taken for a Q branch). PH3 ν4, a
    // perpendicular band of the Coriolis-coupled ν2/ν4 dyad whose central sub-band Q branches pile up,
    // reads PQR, rated low.
    for (const w of readings) {
      if (w.band.name === 'PH3 ν4') {
        if (w.r.profile !== 'Q-series') expect(w.r.confidence, label(w)).toBe('low');
      } else expect(w.r.profile, label(w)).toBe(w.band.profile);
    }
  });

  it('calls B determined only within 10 % and with the truth inside its range, and gives every other B with the truth inside', () => {
    let given = 0;
    let determined = 0;
    for (const w of readings) {
      const { r, band } = w;
      if (r.B === null) continue;
      given++;
      if (r.bDetermined) {
        determined++;
        expect(Math.abs(r.B / band.B - 1), label(w)).toBeLessThan(0.1);
      }
      // PH3 ν4 read as J lines of a PR/PQR band (low): B +21 % at L = 0.9 cm, Norton–Beer, not determined.
      if (band.name === 'PH3 ν4') expect(r.bDetermined, label(w)).toBe(false);
      else {
        expect(band.B, label(w)).toBeGreaterThanOrEqual(r.bLow!);
        expect(band.B, label(w)).toBeLessThanOrEqual(r.bHigh!);
      }
    }
    // Measured: B given on 55 of 80 readings, 13 determined (−1.9 … +1.7 %); the others' ranges hold
    // the truth though three Π–Σ envelopes miss it by 11–16 %. Before this check 7 determined B's had
    // the truth outside their range, 6 of them 11–15 % off (HC3N ν2 and CH3CN ν4 at L = 2.5–4 cm).
    expect(given).toBeGreaterThanOrEqual(45);
    expect(determined).toBeGreaterThanOrEqual(10);
  });

  it('puts the origin within 1 cm^-1 of the published one', () => {
    // Measured: within 0.53 cm^-1 on all but HC3N ν2 at L = 4 cm (0.68 and −0.75 cm^-1, the centre of
    // the empty stretch the weak low-J lines leave).
    for (const w of readings) {
      if (w.band.origin === null) continue;
      expect(Math.abs(w.r.origin - w.band.origin), label(w)).toBeLessThan(1);
    }
  });
});

describe('bandShapeClassify on real bands recorded through the transmittance (lines optically thick at their own width)', () => {
  // The same published lines as a spectrometer records them (realBandTraceThick): Doppler-limited lines
  // (HC3N 51, CH3CN 41, PH3 34 amu; 296 K) whose strongest line reaches τ = 0.3, 3 or 30 at its centre,
  // the boxcar instrument line shape of L = 0.9 or 2.5 cm applied to the transmittance, 1 % noise. Thick
  // lines flatten and widen the P and R maxima: before the two-lobe template was given a saturation, the
  // Σ–Σ bands of HC3N were read PQR at τ = 3 (8 of 8) and at τ = 30 (2 of 8), and B from their spread
  // came out +14 % (τ = 3) and +60 % (τ = 30); 44 of 60 profiles right.
  const MASS: Record<string, number> = { HC3N: 51, CH3CN: 41, PH3: 34 };
  const thick: (Reading & { tau: number })[] = [];
  for (const band of realBands())
    for (const opdCm of [0.9, 2.5])
      for (const tau of [0.3, 3, 30]) {
        const t = realBandTraceThick(band, opdCm, 'boxcar', 0.01, 7, MASS[band.name.split(' ')[0]], tau);
        thick.push({ band, opdCm, apodization: 'boxcar', tau, r: bandShapeClassify(t.x, t.y, t.fromCm1, t.toCm1, { temperatureK: 296 }) });
      }
  const thickLabel = (w: (typeof thick)[number]) => `${label(w)}, τ ${w.tau}`;

  it('reads the Σ–Σ bands PR at every optical depth, with B from the unsaturated lobes', () => {
    for (const w of thick.filter((v) => v.band.profile === 'PR')) {
      expect(w.r.profile, thickLabel(w)).toBe('PR');
      if (w.r.B === null) continue;
      // Measured: −2.5 … +1.1 % at τ ≤ 3; +12 … +17 % at τ = 30, inside the range given (±20 %), never
      // called determined. Since the envelope fit also tries B′ ≠ B″ (−1.5 … +0.5 %), −2.5 … +3.1 % at
      // τ ≤ 3 (one step of its 2 % grid of B higher on 6 of the 8 at τ = 0.3; HC3N's own B′ − B″ is
      // under 0.1 %).
      if (w.tau <= 3) expect(Math.abs(w.r.B / w.band.B - 1), thickLabel(w)).toBeLessThan(0.035);
      expect(w.band.B, thickLabel(w)).toBeGreaterThanOrEqual(w.r.bLow!);
      expect(w.band.B, thickLabel(w)).toBeLessThanOrEqual(w.r.bHigh!);
      expect(w.r.bDetermined, thickLabel(w)).toBe(false);
    }
  });

  it('names 54 of 60 profiles right, and is never wrong at medium or high', () => {
    const right = thick.filter((w) => w.r.profile === w.band.profile);
    expect(right.length).toBeGreaterThanOrEqual(54);
    // Measured wrong at medium before (a wrong answer given with confidence): PH3 ν2 at L = 0.9 cm, τ = 30
    // (its flat-topped Q branch not taken for one: PR, B −31 % called determined from K-split lines 0.62×
    // the spacing the band's spread gives; now rated low, as a PR from resolved lines under 0.85× is),
    // and PH3 ν4 at L = 0.9 cm, τ = 30 and at L = 2.5 cm, τ = 0.3 (the Coriolis-coupled band whose Q
    // branches pile up, read PQR as on the thin traces, there rated low; on traces from the corrected
    // generator, line areas following the strengths, it is rated low at every setting).
    const wrongConfident = thick.filter((w) => w.r.profile !== w.band.profile && w.r.confidence !== 'low').map(thickLabel);
    expect(wrongConfident, wrongConfident.join('; ')).toEqual([]);
  });
});
