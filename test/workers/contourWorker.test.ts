import { describe, expect, it } from 'vitest';
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
});
