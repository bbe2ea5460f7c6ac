import { beforeEach, describe, expect, it } from 'vitest';
import { calibrationApplyToTrace, calibrationRevertTrace, calibrationRun } from '../../src/state/actionsCalibration';
import { calibrationCompose, calibrationPairsFormat, calibrationPairsParse } from '../../src/state/calibrationLogic';
import { benchReset, benchStore } from '../../src/state/store';

describe('calibrationPairsParse', () => {
  it('returns nothing for empty text', () => {
    expect(calibrationPairsParse('')).toEqual({ pairs: [], errors: [] });
  });

  it('reads pairs with any separator, skips a header and comments, and names bad lines', () => {
    const r = calibrationPairsParse('observed,reference\n# from a gas cell\n1000.1, 1000.2\n1100.3;1100.4;0.001\n2000 abc\n');
    expect(r.pairs).toEqual([
      { observedCm1: 1000.1, referenceCm1: 1000.2 },
      { observedCm1: 1100.3, referenceCm1: 1100.4, referenceSigmaCm1: 0.001 },
    ]);
    expect(r.errors).toEqual(['line 5: expected "observed, reference[, sigma]" in cm⁻¹, got "2000 abc"']);
  });

  it('formats pairs so that they read back the same', () => {
    const pairs = [
      { observedCm1: 1234.56789, referenceCm1: 1234.5681 },
      { observedCm1: 1300.1, referenceCm1: 1300.1004, referenceSigmaCm1: 0.0002 },
    ];
    expect(calibrationPairsParse(calibrationPairsFormat(pairs)).pairs).toEqual(pairs);
  });
});

describe('calibrationCompose', () => {
  it('equals applying the two corrections one after the other (algebra of (1+δ)ν + o)', () => {
    const a = { delta: 2e-6, offsetCm1: 0.001 };
    const b = { delta: -5e-7, offsetCm1: -0.0004 };
    const c = calibrationCompose(a, b);
    const nu = 1187.42;
    const twoSteps = (1 + b.delta) * ((1 + a.delta) * nu + a.offsetCm1) + b.offsetCm1;
    // Round-off only: a few ulps of 1e3 cm^-1.
    expect(Math.abs((1 + c.delta) * nu + c.offsetCm1 - twoSteps)).toBeLessThan(1e-12);
  });
});

describe('calibration actions', () => {
  beforeEach(() => benchReset());

  it('applies a fitted δ to the trace and assignments, and reverts to the file axis', () => {
    // A known scale error δ = 3e-6 (typical FTIR laser-reference error, common practice) on an
    // invented axis; reference lines are the true positions.
    const delta = 3e-6;
    const axis = Float64Array.from({ length: 101 }, (_, i) => 1000 + i);
    benchStore.setState({ trace: { wavenumberCm1: axis, absorbance: new Float64Array(101) } });
    benchStore.setState({
      assignments: [
        {
          id: 'a1',
          jUpper: 2,
          kUpper: 1,
          jLower: 1,
          kLower: 0,
          observedCm1: 1050,
          uncertaintyCm1: 0.001,
          isBlended: false,
          isExcluded: false,
          note: '',
        },
      ],
    });
    const pairs = [1010, 1040, 1090].map((obs) => ({ observedCm1: obs, referenceCm1: obs * (1 + delta) }));
    const fit = calibrationRun(pairs, false)!;
    expect(fit.delta).toBeCloseTo(delta, 12);
    calibrationApplyToTrace(fit);
    const s = benchStore.getState();
    expect(s.trace!.wavenumberCm1[50]).toBeCloseTo(1050 * (1 + delta), 9);
    expect(s.assignments[0].observedCm1).toBeCloseTo(1050 * (1 + delta), 9);
    expect(s.traceCalibration).not.toBeNull();
    calibrationRevertTrace();
    const r = benchStore.getState();
    // Apply then revert is exact to round-off (1e-12 relative).
    expect(Math.abs(r.trace!.wavenumberCm1[50] - 1050)).toBeLessThan(1e-9);
    expect(Math.abs(r.assignments[0].observedCm1 - 1050)).toBeLessThan(1e-9);
    expect(r.traceCalibration).toBeNull();
  });

  it('reports an unusable set of pairs in the page instead of throwing', () => {
    expect(calibrationRun([], false)).toBeNull();
    expect(benchStore.getState().messages.at(-1)?.text ?? benchStore.getState().messages[0]?.text).toMatch(/Calibration/);
  });
});
