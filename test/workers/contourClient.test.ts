import { describe, expect, it } from 'vitest';
import { bandShapeClassify } from '../../src/analysis/bandShapeClassify';
import { contourHandle } from '../../src/workers/contour.worker';
import { bandShapeClassifyRun, classifyInputOf } from '../../src/workers/contourClient';
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

describe('the contour worker client', () => {
  // A stand-in for the browser's Worker: answers each request on the next tick with a result (or, for a
  // region with from > to, an error message, as contour.worker does), and counts how many were made
  // and terminated.
  class FakeWorker {
    static made = 0;
    static terminated = 0;
    onmessage: ((e: { data: ContourResponse }) => void) | null = null;
    onerror: ((e: unknown) => void) | null = null;
    isTerminated = false;
    constructor() {
      FakeWorker.made++;
    }
    postMessage(req: { id: number; input: { fromCm1: number; toCm1: number } }) {
      setTimeout(() => {
        if (this.isTerminated) return;
        const { id, input } = req;
        const data: ContourResponse =
          input.fromCm1 > input.toCm1
            ? { type: 'error', id, message: 'bandShapeClassify: the region must have to > from' }
            : ({ type: 'classify-result', id, output: { profile: 'PR' } } as unknown as ContourResponse);
        this.onmessage?.({ data });
      }, 5);
    }
    terminate() {
      this.isTerminated = true;
      FakeWorker.terminated++;
    }
  }
  const input = (fromCm1: number, toCm1: number) =>
    ({ wavenumberCm1: new Float64Array(0), absorbance: new Float64Array(0), fromCm1, toCm1, options: { temperatureK: 296 } }) as never;

  it('keeps a worker whose job ended for the next job of its kind, and terminates one stopped mid-job', async () => {
    const saved = (globalThis as { Worker?: unknown }).Worker;
    (globalThis as { Worker?: unknown }).Worker = FakeWorker;
    try {
      expect((await bandShapeClassifyRun(input(1, 2))).profile).toBe('PR');
      expect((await bandShapeClassifyRun(input(1, 2))).profile).toBe('PR');
      // A refusal is a message from a healthy worker: kept too.
      await expect(bandShapeClassifyRun(input(2, 1))).rejects.toThrow(/to > from/);
      expect((await bandShapeClassifyRun(input(1, 2))).profile).toBe('PR');
      expect([FakeWorker.made, FakeWorker.terminated]).toEqual([1, 0]);
      // Stopped mid-job (cancelled): terminated, and the next job gets a fresh worker.
      const ctrl = new AbortController();
      const stopped = bandShapeClassifyRun(input(1, 2), ctrl.signal);
      ctrl.abort();
      await expect(stopped).rejects.toMatchObject({ name: 'AbortError' });
      expect((await bandShapeClassifyRun(input(1, 2))).profile).toBe('PR');
      expect([FakeWorker.made, FakeWorker.terminated]).toEqual([2, 1]);
    } finally {
      (globalThis as { Worker?: unknown }).Worker = saved;
    }
  });
});
