import { describe, expect, it } from 'vitest';
import { bandShapeClassify } from '../../src/analysis/bandShapeClassify';
import { contourHandle } from '../../src/workers/contour.worker';
import { classifyInputOf } from '../../src/workers/contourClient';
import type { ContourResponse } from '../../src/workers/contourProtocol';
import { traceGenerate } from '../fit/contourTraces';

describe('classifyInputOf', () => {
  // A parallel band of a prolate top (generator of test/fit/contourTraces.ts), diagnosed on a region
  // that leaves out points on both sides of the trace.
  const c = traceGenerate({
    shape: 'prolate',
    band: 'parallel',
    B: 0.25,
    unique: 5.1,
    temperatureK: 296,
    opdCm: 1,
    apodization: 'boxcar',
    origin: 1250,
    noiseRel: 0.01,
    seed: 3,
  });
  const x = c.x;
  const fromCm1 = x[40] - 1e-9;
  const toCm1 = x[x.length - 41];
  const options = { temperatureK: 296 };

  it('sends the worker only the points inside the region, ends included', () => {
    const input = classifyInputOf({ wavenumberCm1: x, absorbance: c.noisy }, fromCm1, toCm1, options);
    expect(input.wavenumberCm1.length).toBe(x.length - 80);
    expect(input.wavenumberCm1[0]).toBe(x[40]);
    expect(input.wavenumberCm1[input.wavenumberCm1.length - 1]).toBe(x[x.length - 41]);
    expect(Array.from(input.absorbance)).toEqual(Array.from(c.noisy.subarray(40, x.length - 40)));
    expect([input.fromCm1, input.toCm1, input.options]).toEqual([fromCm1, toCm1, options]);
  });

  it('gets from the worker the diagnosis a direct call on the whole trace gives', () => {
    const out: ContourResponse[] = [];
    contourHandle(
      { type: 'classify', id: 4, input: classifyInputOf({ wavenumberCm1: x, absorbance: c.noisy }, fromCm1, toCm1, options) },
      (m) => out.push(m),
    );
    const last = out[out.length - 1];
    expect(last.type).toBe('classify-result');
    expect(last.type === 'classify-result' && last.output).toEqual(bandShapeClassify(x, c.noisy, fromCm1, toCm1, options));
  });
});
