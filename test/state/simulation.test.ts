import { describe, expect, it } from 'vitest';
import { bandLines } from '../../src/physics/bandLines';
import { simulationBuild } from '../../src/state/simulation';
import { smallModel } from './fixtures';

describe('simulationBuild', () => {
  const model = smallModel();
  const lines = bandLines(model, { minIntensity: 0.02 });

  it('returns null without lines', () => {
    expect(simulationBuild({ ...lines, count: 0 }, null, { temperatureK: 200, massAmu: 50, lorentzHwhmCm1: 0.002 })).toBeNull();
  });

  it('scales to a peak of 1 without a trace and covers every line', () => {
    const s = simulationBuild(lines, null, { temperatureK: 200, massAmu: 50, lorentzHwhmCm1: 0.002 })!;
    expect(Math.max(...s.absorbance)).toBeCloseTo(1, 12);
    expect(s.obsMinusSim).toBeNull();
    for (let i = 0; i < lines.count; i++) {
      expect(lines.wavenumberCm1[i]).toBeGreaterThan(s.xCm1[0]);
      expect(lines.wavenumberCm1[i]).toBeLessThan(s.xCm1[s.xCm1.length - 1]);
    }
  });

  it('recovers the scale of a trace made from the same spectrum (least squares k = Σas/Σs²)', () => {
    const opts = { temperatureK: 200, massAmu: 50, lorentzHwhmCm1: 0.002 };
    const unit = simulationBuild(lines, null, opts)!;
    const raw = unit.absorbance.map((v) => v / unit.scale); // unscaled line sum
    const trace = { wavenumberCm1: unit.xCm1, absorbance: raw.map((v) => 0.37 * v) };
    const fit = simulationBuild(lines, trace, opts)!;
    // Same profile on a grid rebuilt from the trace's range (round-off can move its nodes, so the
    // trace is read by linear interpolation): scale 0.37 to 1e-9, obs − sim below 1e-5 of the peak.
    expect(fit.scale).toBeCloseTo(0.37, 9);
    let worst = 0;
    for (const v of fit.obsMinusSim!) worst = Math.max(worst, Math.abs(v));
    expect(worst).toBeLessThan(0.37 * 1e-5);
  });
});
