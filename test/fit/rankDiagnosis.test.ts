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

describe('rankDiagnosisStructural (through fitBand): structure before line count', () => {
  // Same physics as above (Herzberg II (1945) ch. IV): ΔK = 0 lines depend on A′ and A″ only
  // through A′ − A″, so no number of them determines both. With fewer lines than constants the
  // refusal must say that, not ask for more lines.
  it('gives the structural words, not "assign more lines", for A′ and A″ floated with 5 parallel-band lines', () => {
    const truth = inventedModel('prolate', 'parallel');
    const floated = ['upper.origin', 'upper.B', 'upper.A', 'lower.B', 'lower.A', 'upper.DJ', 'lower.DJ'];
    // Three K″ = 1 and two K″ = 2 lines (two K values, so origin and A′ − A″ are separable).
    const all = simulatedLines(truth, 400, 0.001, 3);
    const lines = [...all.filter((l) => l.kLower === 1).slice(0, 3), ...all.filter((l) => l.kLower === 2).slice(0, 2)];
    const e = refused({ model: truth, floated, lines });
    expect(e.kind).toBe('underdetermined');
    expect(e.parameters.sort()).toEqual(['lower.A', 'upper.A']);
    expect(e.fixSuggested).toEqual(['lower.A']);
    expect(e.message).toMatch(/only on A′ − A″/);
    expect(e.message).toMatch(/cannot change this/);
    expect(e.suggestion).not.toMatch(/more line/);
    expectNoNumbers(e);
  });

  it('names A as unused when every one of the few lines has K = 0', () => {
    const truth = inventedModel('prolate', 'parallel');
    const k0 = simulatedLines(truth, 3000, 0.001, 4)
      .filter((l) => l.kLower === 0)
      .slice(0, 3);
    const e = refused({ model: truth, floated: ['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'upper.DJ'], lines: k0 });
    expect(e.kind).toBe('unused-parameter');
    expect(e.parameters).toEqual(['upper.A']);
  });

  it('still asks for more lines when more lines of the same kinds would determine the set', () => {
    const truth = inventedModel('prolate', 'parallel');
    const floated = ['upper.origin', 'upper.B', 'lower.B', 'upper.DJ', 'lower.DJ'];
    const e = refused({ model: truth, floated, lines: simulatedLines(truth, 3, 0.001, 5) });
    expect(e.kind).toBe('too-few-lines');
    expect(e.suggestion).toMatch(/at least 2 more lines/);
  });
});
