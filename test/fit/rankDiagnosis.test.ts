import { describe, expect, it } from 'vitest';
import { fitBand } from '../../src/fit/fitBand';
import type { FitError, FitInput } from '../../src/fit/fitTypes';
import { inventedModel, simulatedLines } from './fitTestData';

function refused(input: FitInput): FitError {
  const o = fitBand(input);
  if (o.ok) throw new Error('expected the fit to be refused');
  return o.error;
}

/** The refusal carries no number for any constant (it must never print values for undetermined ones). */
function expectNoNumbers(e: FitError): void {
  expect(Object.keys(e).sort()).toEqual(['fixSuggested', 'kind', 'message', 'parameters', 'suggestion']);
  expect(e.message).not.toMatch(/\d\.\d/);
}

describe('rankDiagnosis (through fitBand)', () => {
  // Physics of the checks: in a parallel band ν depends on A′K² − A″K² only through A′ − A″
  // (and on DK through DK′ − DK″); in a perpendicular band the K-dependent terms are
  // (A′ − A″)K² + 2A′(1 − ζ)KΔK + const, so A″, A′ and ζ give only two combinations.
  // Ref: Herzberg II (1945) ch. IV (symmetric-top band structure); common practice is to fix A″.

  it('refuses a parallel band with A′ and A″ both floated and suggests fixing lower.A', () => {
    const truth = inventedModel('prolate', 'parallel');
    const e = refused({
      model: truth,
      floated: ['upper.origin', 'upper.B', 'upper.A', 'lower.B', 'lower.A', 'upper.DJ', 'lower.DJ'],
      lines: simulatedLines(truth, 400, 0.001, 1),
    });
    expect(e.kind).toBe('underdetermined');
    expect(e.parameters.sort()).toEqual(['lower.A', 'upper.A']);
    expect(e.fixSuggested).toEqual(['lower.A']);
    expect(e.message).toMatch(/only on A′ − A″/);
    expectNoNumbers(e);
  });

  it('with DK′ and DK″ also floated suggests fixing lower.A and lower.DK', () => {
    const truth = inventedModel('prolate', 'parallel');
    const e = refused({
      model: truth,
      floated: ['upper.origin', 'upper.B', 'upper.A', 'upper.DK', 'lower.B', 'lower.A', 'lower.DK'],
      lines: simulatedLines(truth, 400, 0.001, 1),
    });
    expect(e.parameters.sort()).toEqual(['lower.A', 'lower.DK', 'upper.A', 'upper.DK']);
    expect(e.fixSuggested).toEqual(['lower.A', 'lower.DK']);
    expect(e.message).toMatch(/2 directions/);
  });

  for (const shape of ['prolate', 'oblate'] as const) {
    const u = shape === 'prolate' ? 'A' : 'C';
    it(`refuses a ${shape} perpendicular band with ${u}″, ${u}′ and ζ floated and suggests fixing lower.${u}`, () => {
      const truth = inventedModel(shape, 'perpendicular');
      const lines = simulatedLines(truth, 500, 0.001, 2);
      const floated = [
        'upper.origin',
        'upper.B',
        `upper.${u}`,
        'upper.zeta',
        'upper.DJ',
        'upper.DJK',
        'lower.B',
        `lower.${u}`,
        'lower.DJ',
        'lower.DJK',
      ];
      const e = refused({ model: truth, floated, lines });
      expect(e.kind).toBe('underdetermined');
      expect(e.parameters).toEqual(expect.arrayContaining([`upper.${u}`, `lower.${u}`, 'upper.zeta']));
      expect(e.fixSuggested).toEqual([`lower.${u}`]);
      expect(e.message).toMatch(new RegExp(`not ${u}″, ${u}′ and ζ separately`));
      expectNoNumbers(e);
      // Following the suggestion makes the fit work.
      const fixed = fitBand({ model: truth, floated: floated.filter((k) => k !== `lower.${u}`), lines });
      expect(fixed.ok).toBe(true);
    });
  }

  it('names ζ in a parallel band as a constant no line depends on', () => {
    const truth = inventedModel('prolate', 'parallel');
    const e = refused({ model: truth, floated: ['upper.origin', 'upper.B', 'upper.zeta'], lines: simulatedLines(truth, 50, 0.001, 3) });
    expect(e).toMatchObject({ kind: 'unused-parameter', parameters: ['upper.zeta'], fixSuggested: ['upper.zeta'] });
    expect(e.message).toMatch(/ζ acts only in a perpendicular band/);
  });

  it('names lower.DK when every line has K″ = 0', () => {
    const truth = inventedModel('prolate', 'parallel');
    const lines = simulatedLines(truth, 400, 0.001, 3).filter((l) => l.kLower === 0);
    const e = refused({ model: truth, floated: ['upper.origin', 'upper.B', 'lower.B', 'lower.DK'], lines });
    expect(e).toMatchObject({ kind: 'unused-parameter', parameters: ['lower.DK'] });
    expect(e.message).toMatch(/every fitted line has K″ = 0/);
  });

  it('names B′ and B″ when all lines are of one J″ (only B′ − B″ combinations are seen)', () => {
    // With J″ = J′ fixed (Q lines of one J), B′ and B″ enter as B′x − B″x: one combination.
    const truth = inventedModel('prolate', 'parallel');
    const lines = simulatedLines(truth, 2000, 0.001, 3).filter((l) => l.jLower === 10 && l.jUpper === 10);
    const e = refused({ model: truth, floated: ['upper.origin', 'upper.B', 'lower.B'], lines });
    expect(e.kind).toBe('underdetermined');
    expect(e.parameters).toEqual(expect.arrayContaining(['upper.B', 'lower.B']));
    expect(e.fixSuggested).toHaveLength(1);
  });
});
