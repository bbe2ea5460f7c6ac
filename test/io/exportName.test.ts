import { describe, expect, it } from 'vitest';
import { exportStem } from '../../src/io/exportName';

describe('exportStem', () => {
  it('names exports after the trace file, without folders or extensions', () => {
    expect(exportStem('runs/band-2.csv', 'x.model_guess.json')).toBe('band-2');
    expect(exportStem('C:\\data\\v4 band.jdx', 'm')).toBe('v4_band');
    expect(exportStem('session.ladderbench.json', 'm')).toBe('session');
  });
  it('falls back to the model name, then to a fixed stem', () => {
    expect(exportStem(null, 'x.model_guess.json')).toBe('x.model_guess');
    expect(exportStem(null, 'LB-7 (fictitious prolate top)')).toBe('LB-7_fictitious_prolate_top');
    expect(exportStem('', '<>')).toBe('ladder-bench');
  });
});
