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

  it('recovers scale and baseline of a trace made from the same spectrum', () => {
    const opts = { temperatureK: 200, massAmu: 50, lorentzHwhmCm1: 0.002 };
    const unit = simulationBuild(lines, null, opts)!;
    const raw = unit.absorbance.map((v) => v / unit.scale); // unscaled line sum
    const trace = { wavenumberCm1: unit.xCm1, absorbance: raw.map((v) => 0.37 * v + 0.02) };
    const fit = simulationBuild(lines, trace, opts)!;
    // Same profile on a grid rebuilt from the trace's range (round-off can move its nodes, so the
    // trace is read by linear interpolation): scale 0.37 and offset 0.02 to 1e-5 relative, obs − sim
    // below 1e-5 of the peak.
    expect(fit.scale / 0.37).toBeCloseTo(1, 5);
    expect(fit.offset / 0.02).toBeCloseTo(1, 5);
    let worst = 0;
    for (const v of fit.obsMinusSim!) worst = Math.max(worst, Math.abs(v));
    expect(worst).toBeLessThan(0.37 * 1e-5);
  });
});

describe('simulationBuild with a first-guess model', () => {
  it('keeps the simulated lines as strong as the observed ones even when their positions miss', () => {
    // Trace from the model, simulation from the model shifted by 0.05 cm^-1 (more than a line
    // width): a least-squares scale would fall towards 0; matching levels keeps it near 1.
    const model = smallModel();
    const lines = bandLines(model, { minIntensity: 0.02 });
    const opts = { temperatureK: 200, massAmu: 50, lorentzHwhmCm1: 0.002 };
    const unit = simulationBuild(lines, null, opts)!;
    const trace = { wavenumberCm1: unit.xCm1, absorbance: unit.absorbance };
    const shifted = { ...lines, wavenumberCm1: lines.wavenumberCm1.map((v) => v + 0.05) };
    const sim = simulationBuild(shifted, trace, opts)!;
    expect(sim.scale / unit.scale).toBeGreaterThan(0.9);
    expect(sim.scale / unit.scale).toBeLessThan(1.1);
  });
});
