import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { makeDemoLowResFirstGuess, makeDemoLowResTrace, makeDemoLowResTruth, DEMO_LOWRES } from '../../src/cli/makeDemoLowRes';
import { bandShapeClassify } from '../../src/analysis/bandShapeClassify';
import { contourFit } from '../../src/fit/contourFit';

const demoDir = join(__dirname, '..', '..', 'public', 'demo');

describe('the low-resolution demo trace', () => {
  const truth = makeDemoLowResTruth();
  const trace = makeDemoLowResTrace(truth);

  it('is the file the generator writes (deterministic)', () => {
    const rows = readFileSync(join(demoDir, 'lowres-trace.csv'), 'utf8').trim().split('\n').slice(1);
    expect(rows.length).toBe(trace.x.length);
    // 7 significant digits written: compare to 1e-6 relative.
    for (const i of [0, 300, 560, 1120]) {
      const [x, y] = rows[i].split(',').map(Number);
      expect(x).toBeCloseTo(trace.x[i], 4);
      expect(Math.abs(y / trace.noisy[i] - 1)).toBeLessThan(1e-6);
    }
    const guess = JSON.parse(readFileSync(join(demoDir, 'lowres-model.json'), 'utf8'));
    expect(guess.upper.origin).toBe(makeDemoLowResFirstGuess(truth).upper.origin);
  });

  it('is read as a Q-branch series with the spacing 2[A′(1−ζ) − B′] within 3 %', () => {
    // Q-branch spacing of a perpendicular band: Herzberg II (1945) ch. IV; target of issue 18.
    const r = bandShapeClassify(trace.x, trace.noisy, 1085, 1215, { temperatureK: 296 });
    expect(r.profile).toBe('Q-series');
    const q = 2 * (truth.upper.A * (1 - truth.upper.zeta) - truth.upper.B);
    expect(Math.abs(r.qSpacing! / q - 1)).toBeLessThan(0.03);
  });

  it('gives back the true constants within 4σ from the first guess by a contour fit', () => {
    const r = contourFit({
      model: makeDemoLowResFirstGuess(truth),
      wavenumberCm1: trace.x,
      absorbance: trace.noisy,
      fromCm1: 1085,
      toCm1: 1215,
      opdCm: DEMO_LOWRES.opdCm,
      apodization: DEMO_LOWRES.apodization,
      massAmu: DEMO_LOWRES.massAmu,
    });
    // Round trip within the reported σ (4σ: the project's contour-fit target).
    for (const key of ['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'upper.zeta'] as const) {
      const [side, name] = key.split('.') as ['upper' | 'lower', 'origin' | 'B' | 'A' | 'zeta'];
      const p = r.parameters[key];
      expect(p.fixed, key).toBe(false);
      expect(Math.abs(p.value - truth[side][name]) / p.sigma, key).toBeLessThan(4);
    }
    // The fitted simulation matches the noise (rms within 1.5× the noise σ, target of issue 18).
    expect(r.rms).toBeLessThan(1.5 * DEMO_LOWRES.noiseSigma);
  });
});
