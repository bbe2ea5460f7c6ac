import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { combinationDifferences } from '../../src/fit/combinationDifferences';
import { systemCombinationDifferences } from '../../src/fit/systemCombinationDifferences';
import type { SystemFitLine } from '../../src/fit/systemFitTypes';
import { systemLineResolve } from '../../src/fit/systemLineResolve';
import { lineTableParse } from '../../src/io/lineTable';
import { modelFileParse } from '../../src/io/modelFile';
import { systemFileFromModelFile } from '../../src/io/systemFile';

const read = (p: string) => readFileSync(new URL(p, import.meta.url), 'utf8');

describe('systemCombinationDifferences', () => {
  it('gives the single-band analysis its own numbers on the HCl fundamental (same pairs, same B″ and DJ″)', () => {
    // The single-band analysis is checked against Herzberg (1950) Δ2F(J) = R(J−1) − P(J+1) in
    // test/fit/combinationDifferences.test.ts; here the pooled version must agree with it on one band
    // (weighted linear least squares on the same pairs: equal to round-off, 1e-9 relative).
    const table = lineTableParse(read('../fixtures/lines/hcl-fundamental/lines.csv'));
    const system = systemFileFromModelFile(modelFileParse(read('../fixtures/lines/hcl-fundamental/model.json')));
    const old = combinationDifferences(table.assignments, 'lower', { shape: 'linear' });
    if (!old.ok) throw new Error(old.error.message);
    const lines: SystemFitLine[] = table.assignments.map((a) => {
      const r = systemLineResolve(system.model, {
        band: null,
        species: null,
        ...a,
        lUpper: null,
        lLower: null,
        tagUpper: null,
        tagLower: null,
      });
      if (!r.ok) throw new Error(r.message);
      return { ...r.line, observedCm1: a.observedCm1, uncertaintyCm1: a.uncertaintyCm1 };
    });
    const neu = systemCombinationDifferences(system.model, system.parameters, lines, 0, 'lower');
    if (!neu.ok) throw new Error(neu.message);
    expect(neu.result.nPairs).toBe(old.result.nPairs);
    expect(Math.abs(neu.result.parameters['lower.B'].value / old.result.B.value - 1)).toBeLessThan(1e-9);
    expect(Math.abs(neu.result.parameters['lower.DJ'].value / old.result.DJ.value - 1)).toBeLessThan(1e-9);
  });

  it('says why when no pair of lines shares a level', () => {
    const system = systemFileFromModelFile(modelFileParse(read('../fixtures/lines/hcl-fundamental/model.json')));
    const one: SystemFitLine = {
      speciesIndex: 0,
      band: 'band',
      jUpper: 1,
      kUpper: 0,
      lUpper: 0,
      tagUpper: 'e',
      jLower: 0,
      kLower: 0,
      lLower: 0,
      tagLower: 'e',
      observedCm1: 2906.25,
      uncertaintyCm1: 0.05,
    };
    const r = systemCombinationDifferences(system.model, system.parameters, [one], 0, 'lower');
    expect(!r.ok && r.message).toMatch(/no pair of lines shares a level/);
  });
});
