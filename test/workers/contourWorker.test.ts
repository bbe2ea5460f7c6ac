import { describe, expect, it } from 'vitest';
import { bandShapeClassify } from '../../src/analysis/bandShapeClassify';
import { contourHandle } from '../../src/workers/contour.worker';
import type { ContourRequest, ContourResponse } from '../../src/workers/contourProtocol';
import { traceGenerate } from '../fit/contourTraces';

describe('contour.worker', () => {
  it('answers an unknown request with an error naming it', () => {
    const out: ContourResponse[] = [];
    contourHandle({ type: 'nonsense', id: 3 } as unknown as ContourRequest, (m) => out.push(m));
    expect(out).toEqual([{ type: 'error', id: 3, message: "contour.worker: unknown request type 'nonsense'" }]);
  });

  it('posts progress, then the result, for a small band; and the fit’s refusal as an error', () => {
    const c = traceGenerate({
      shape: 'linear',
      band: 'parallel',
      B: 0.39,
      temperatureK: 296,
      opdCm: 1,
      apodization: 'boxcar',
      origin: 2300,
      noiseRel: 0.01,
      seed: 5,
    });
    const input = { model: c.model, wavenumberCm1: c.x, absorbance: c.noisy, fromCm1: c.fromCm1, toCm1: c.toCm1, opdCm: 1, massAmu: 44 };
    const out: ContourResponse[] = [];
    contourHandle({ type: 'contour', id: 1, input }, (m) => out.push(m));
    expect(out.some((m) => m.type === 'progress')).toBe(true);
    expect(out[out.length - 1].type).toBe('result');
    const bad: ContourResponse[] = [];
    contourHandle({ type: 'contour', id: 2, input: { ...input, fromCm1: 10, toCm1: 5 } }, (m) => bad.push(m));
    expect(bad).toEqual([{ type: 'error', id: 2, message: expect.stringMatching(/to > from/) }]);
  });

  it('runs the band-shape diagnosis through the instrument: progress of its contour-fit runs, then the same diagnosis as a direct call; a refusal as an error', () => {
    // A perpendicular prolate band with a resolved Q-branch comb (generator of test/fit/contourTraces.ts).
    const spec = {
      shape: 'prolate' as const,
      band: 'perpendicular' as const,
      B: 0.115,
      unique: 1.1,
      zeta: 0.3,
      temperatureK: 180,
      opdCm: 2.5,
      apodization: 'boxcar' as const,
      origin: 1100,
      noiseRel: 0.01,
      seed: 12,
    };
    const c = traceGenerate(spec);
    const options = { temperatureK: 180, opdCm: 2.5, apodization: 'boxcar' as const };
    const input = { wavenumberCm1: c.x, absorbance: c.noisy, fromCm1: c.fromCm1, toCm1: c.toCm1, options };
    const out: ContourResponse[] = [];
    contourHandle({ type: 'classify', id: 7, input }, (m) => out.push(m));
    const progress = out.filter((m) => m.type === 'classify-progress');
    expect(progress.length).toBeGreaterThanOrEqual(3);
    const last = out[out.length - 1];
    expect(last.type).toBe('classify-result');
    const direct = bandShapeClassify(c.x, c.noisy, c.fromCm1, c.toCm1, options);
    expect(last.type === 'classify-result' && last.output).toEqual(direct);
    expect(direct.qSeriesContour).toBeDefined();
    const bad: ContourResponse[] = [];
    contourHandle({ type: 'classify', id: 8, input: { ...input, fromCm1: 10, toCm1: 5 } }, (m) => bad.push(m));
    expect(bad).toEqual([{ type: 'error', id: 8, message: expect.stringMatching(/to > from/) }]);
  }, 300_000);
});
