import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fitCheck, quantaQuickValid } from '../../src/fit/fitCheck';
import { transitionCheck } from '../../src/physics/transitionCheck';
import { inventedModel } from './fitTestData';

describe('quantaQuickValid', () => {
  it('accepts exactly what physics/transitionCheck accepts (property test, 20,000 cases)', () => {
    // The reference is the physics module's selection-rule check; quantaQuickValid is only a
    // faster first pass and must never accept a line transitionCheck refuses (or the reverse).
    const qn = fc.oneof(fc.integer({ min: -2, max: 12 }), fc.constantFrom(0.5, 1.5, NaN));
    fc.assert(
      fc.property(qn, qn, qn, qn, fc.constantFrom('parallel', 'perpendicular'), fc.constantFrom('prolate', 'oblate', 'linear'), (ju, ku, jl, kl, band, shape) => {
        const reference = transitionCheck({ jUpper: ju, kUpper: ku, jLower: jl, kLower: kl }, band, shape) === null;
        expect(quantaQuickValid(ju, ku, jl, kl, band, shape)).toBe(reference);
      }),
      { numRuns: 20000, seed: 7 },
    );
  });
});

describe('fitCheck', () => {
  it('accepts a valid input', () => {
    const model = inventedModel('prolate', 'parallel');
    expect(fitCheck({ model, floated: ['upper.B'], lines: [{ jUpper: 3, kUpper: 1, jLower: 2, kLower: 1, observedCm1: 1, uncertaintyCm1: 1 }] })).toBeNull();
  });

  it('refuses an unknown shape and a missing constant', () => {
    const model = inventedModel('prolate', 'parallel');
    expect(fitCheck({ model: { ...model, shape: 'spherical' as never }, floated: [], lines: [] })?.message).toMatch(/model.shape must be prolate, oblate or linear, got 'spherical'/);
    const { DJ: _drop, ...lower } = model.lower;
    expect(fitCheck({ model: { ...model, lower: lower as never }, floated: [], lines: [] })?.message).toMatch(/lower.DJ must be a finite number, got undefined/);
  });
});
