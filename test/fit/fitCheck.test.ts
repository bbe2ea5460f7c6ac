import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fitCheck, quantaQuickValid } from '../../src/fit/fitCheck';
import { ASSIGNMENT_MAX_J, assignmentCheck } from '../../src/fit/assignment';
import { inventedModel } from './fitTestData';

describe('quantaQuickValid', () => {
  it('accepts exactly what assignmentCheck accepts (property test, 20,000 cases)', () => {
    // The reference is assignmentCheck (physics/transitionCheck's selection rules plus the J limit);
    // quantaQuickValid is only a faster first pass and must never accept a line it refuses (or the reverse).
    const qn = fc.oneof(fc.integer({ min: -2, max: 12 }), fc.constantFrom(0.5, 1.5, NaN, ASSIGNMENT_MAX_J, ASSIGNMENT_MAX_J + 1));
    fc.assert(
      fc.property(
        qn,
        qn,
        qn,
        qn,
        fc.constantFrom('parallel', 'perpendicular'),
        fc.constantFrom('prolate', 'oblate', 'linear'),
        (ju, ku, jl, kl, band, shape) => {
          const reference = assignmentCheck({ jUpper: ju, kUpper: ku, jLower: jl, kLower: kl }, { band, shape }) === null;
          expect(quantaQuickValid(ju, ku, jl, kl, band, shape)).toBe(reference);
        },
      ),
      { numRuns: 20000, seed: 7 },
    );
  });
});

describe('quantaQuickValid at the J limit', () => {
  it('accepts J = ASSIGNMENT_MAX_J and refuses one above, as assignmentCheck does', () => {
    const max = ASSIGNMENT_MAX_J;
    expect(quantaQuickValid(max, 0, max - 1, 0, 'parallel', 'prolate')).toBe(true);
    expect(quantaQuickValid(max + 1, 0, max, 0, 'parallel', 'prolate')).toBe(false);
    expect(assignmentCheck({ jUpper: max + 1, kUpper: 0, jLower: max, kLower: 0 }, { band: 'parallel', shape: 'prolate' })).not.toBeNull();
  });
});

describe('fitCheck', () => {
  it('accepts a valid input', () => {
    const model = inventedModel('prolate', 'parallel');
    expect(
      fitCheck({ model, floated: ['upper.B'], lines: [{ jUpper: 3, kUpper: 1, jLower: 2, kLower: 1, observedCm1: 1, uncertaintyCm1: 1 }] }),
    ).toBeNull();
  });

  it('refuses an unknown shape and a missing constant', () => {
    const model = inventedModel('prolate', 'parallel');
    expect(fitCheck({ model: { ...model, shape: 'spherical' as never }, floated: [], lines: [] })?.message).toMatch(
      /model.shape must be prolate, oblate or linear, got 'spherical'/,
    );
    const { DJ: _drop, ...lower } = model.lower;
    expect(fitCheck({ model: { ...model, lower: lower as never }, floated: [], lines: [] })?.message).toMatch(
      /lower.DJ must be a finite number, got undefined/,
    );
  });
});
