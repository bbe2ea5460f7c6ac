import { describe, expect, it } from 'vitest';
import { assistantPeaksUsable } from '../../src/analysis/assistantPeakContext';
import { assistantParallelStart } from '../../src/analysis/assistantParallelStart';
import { assistantSeedFromModel } from '../../src/analysis/assistantSeedFromModel';
import type { PeakList } from '../../src/analysis/peaksFind';
import type { BandModel } from '../../src/physics/model';
import { transitionWavenumber } from '../../src/physics/termValues';
import { syntheticBand, syntheticIsCorrect, syntheticParallelTruthModel } from './assistantSyntheticBand';

const FLOATABLE = ['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'upper.DJ', 'lower.DJ', 'upper.DJK', 'lower.DJK'];

/**
 * A user's first guess within the error ranges: origin +0.3 cm^-1, B″ +0.4 %, B′ +0.5 %,
 * A″ +0.8 % and A′ +1.0 % (so A′ − A″ is off by +0.0056 cm^-1: K = 3 moves by 0.05 cm^-1, about 5
 * widths, against K = 0), DJ and DJK 0.
 */
function guessOf(truth: BandModel): BandModel {
  return {
    ...truth,
    lower: { ...truth.lower, B: truth.lower.B * 1.004, A: truth.lower.A * 1.008, DJ: 0, DJK: 0 },
    upper: { ...truth.upper, origin: truth.upper.origin + 0.3, B: truth.upper.B * 1.005, A: truth.upper.A * 1.01, DJ: 0, DJK: 0 },
  };
}

describe('assistantParallelStart', () => {
  const truth = syntheticParallelTruthModel();
  const band = syntheticBand(truth, 1 / 300, 7);
  const peaks = assistantPeaksUsable(band.peaks).peaks;
  const guess = guessOf(truth);

  it('places the J numbering and the K offsets from the model alone and picks right seeds over several K', () => {
    const r = assistantParallelStart(guess, peaks, FLOATABLE);
    expect(r.text).toMatch(/^parallel start: /);
    expect(r.lines.length).toBeGreaterThanOrEqual(6);
    // Every seed carries its true quanta (a J numbering one rung off or K labels one sub-band off fail here).
    for (const s of r.lines) expect(syntheticIsCorrect(band, s, s.observedCm1)).toBe(true);
    expect(new Set(r.lines.map((s) => s.kLower)).size).toBeGreaterThanOrEqual(3);
    // The corrected model puts the low clusters' K = 0…5 lines within half a line width of the truth
    // (the first guess had them up to several widths off).
    for (const m of [-6, -3, -1, 1, 3, 6]) {
      const jLower = m > 0 ? m - 1 : -m;
      const jUpper = m > 0 ? m : -m - 1;
      for (let k = 0; k <= Math.min(5, jLower, jUpper); k++) {
        const err = transitionWavenumber(r.model, jUpper, k, jLower, k) - transitionWavenumber(truth, jUpper, k, jLower, k);
        expect(Math.abs(err)).toBeLessThan(0.5 * band.fwhmCm1);
      }
    }
    // The first guess itself was several widths off at K = 5 (the test would prove nothing otherwise).
    const guessErr = transitionWavenumber(guess, 6, 5, 5, 5) - transitionWavenumber(truth, 6, 5, 5, 5);
    expect(Math.abs(guessErr)).toBeGreaterThan(5 * band.fwhmCm1);
  });

  it('refuses other band types, fixed constants and a peak list with no band in it', () => {
    expect(assistantParallelStart({ ...guess, band: 'perpendicular' }, peaks, FLOATABLE).lines).toEqual([]);
    expect(assistantParallelStart({ ...guess, shape: 'linear' }, peaks, FLOATABLE).lines).toEqual([]);
    const fixedA = assistantParallelStart(guess, peaks, ['upper.origin', 'upper.B', 'lower.B']);
    expect(fixedA.lines).toEqual([]);
    expect(fixedA.text).toMatch(/upper\.A is held fixed/);
    // Peaks spread evenly with no band structure: nothing may be seeded.
    const n = 600;
    const even: PeakList = {
      ...peaks,
      count: n,
      wavenumberCm1: Float64Array.from({ length: n }, (_, i) => 1030 + i * 0.0437),
      height: new Float64Array(n).fill(0.5),
      fwhmCm1: new Float64Array(n).fill(band.fwhmCm1),
      snr: new Float64Array(n).fill(100),
      prominence: new Float64Array(n).fill(0.5),
      isBlend: new Uint8Array(n),
      centreSigmaCm1: new Float64Array(n).fill(1e-4),
    };
    const none = assistantParallelStart(guess, even, FLOATABLE);
    expect(none.lines).toEqual([]);
    expect(none.text).toMatch(/^parallel start refused: /);
  });

  it('succeeds where the shared shift of all K finds no isolated line or a wrong start', () => {
    const shared = assistantSeedFromModel(guess, peaks, FLOATABLE);
    const wrong = shared.lines.filter((s) => !syntheticIsCorrect(band, s, s.observedCm1)).length;
    const staged = assistantParallelStart(guess, peaks, FLOATABLE);
    expect(staged.lines.length).toBeGreaterThan(shared.lines.length - wrong);
  });
});
