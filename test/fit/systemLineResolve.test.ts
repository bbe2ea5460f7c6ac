import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { systemLineResolve } from '../../src/fit/systemLineResolve';
import { modelFileParse } from '../../src/io/modelFile';
import { systemFileFromModelFile } from '../../src/io/systemFile';

const read = (p: string) => readFileSync(new URL(p, import.meta.url), 'utf8');

describe('systemLineResolve', () => {
  const system = systemFileFromModelFile(modelFileParse(read('../fixtures/lines/hcl-fundamental/model.json')));
  const q = { band: null, species: null, lUpper: null, lLower: null, tagUpper: null, tagLower: null };
  it('names the rule a row breaks', () => {
    const r = systemLineResolve(system.model, { ...q, jUpper: 3, kUpper: 0, jLower: 3, kLower: 0 });
    // Σ–Σ has no Q branch (Hönl–London factor (2J+1)K²/(J(J+1)) = 0 at K = 0; Herzberg II (1945) eq. (IV,61)).
    expect(!r.ok && r.message).toMatch(/not an allowed line of band 'band'/);
    const s = systemLineResolve(system.model, { ...q, jUpper: 5, kUpper: 0, jLower: 3, kLower: 0 });
    expect(!s.ok && s.message).toMatch(/differ by 2/);
    const t = systemLineResolve(system.model, { ...q, band: 'nu9', jUpper: 1, kUpper: 0, jLower: 0, kLower: 0 });
    expect(!t.ok && t.message).toMatch(/band 'nu9' is not a band of species/);
  });
});
