import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { lineLabelAscii, lineLabelHtml, lineLabelParse, lineLabelParts, seriesLabelAscii } from '../../src/physics/lineLabel';

// Notation ^ΔK ΔJ_K''(J''): lower-case p, q, r for ΔK = −1, 0, +1 and capital P, Q, R for ΔJ, as in
// Herzberg II (1945) ch. IV and common practice in symmetric-top papers.
describe('lineLabel', () => {
  it('formats the ASCII labels of the trade notation', () => {
    expect(lineLabelAscii(1, 0, 3, 12, 'prolate')).toBe('rQ3(12)');
    expect(lineLabelAscii(-1, -1, 5, 7, 'oblate')).toBe('pP5(7)');
    expect(lineLabelAscii(0, 1, 0, 0, 'prolate')).toBe('qR0(0)');
    expect(lineLabelAscii(0, 1, 0, 12, 'linear')).toBe('R(12)');
    expect(lineLabelAscii(1, 0, 0, 4, 'linear')).toBe('Q(4)');
  });

  it('formats series labels without J', () => {
    expect(seriesLabelAscii(1, 0, 3, 'prolate')).toBe('rQ3');
    expect(seriesLabelAscii(0, -1, 0, 'linear')).toBe('P');
  });

  it('formats HTML labels with super- and subscripts', () => {
    expect(lineLabelHtml(1, 0, 3, 12, 'prolate')).toBe('<sup>r</sup>Q<sub>3</sub>(12)');
    expect(lineLabelHtml(0, -1, 0, 9, 'linear')).toBe('P(9)');
  });

  it('marks impossible ΔK or ΔJ with "?" rather than failing', () => {
    expect(lineLabelParts(2, 0, 1, 1, 'prolate').deltaKLetter).toBe('?');
    expect(lineLabelParts(0, 3, 1, 1, 'prolate').branchLetter).toBe('?');
  });

  it('parses labels with surrounding spaces and rejects other text', () => {
    expect(lineLabelParse('  rQ3(12) ')).toEqual({ deltaK: 1, deltaJ: 0, kLower: 3, jLower: 12 });
    expect(lineLabelParse('P(7)')).toEqual({ deltaK: null, deltaJ: -1, kLower: null, jLower: 7 });
    for (const bad of ['', 'rQ3', 'xQ3(1)', 'rq3(1)', 'rQ3(-1)', 'rQ3(1.5)', 'RQ3(1)', 'rQ3(12)x']) {
      expect(lineLabelParse(bad)).toBeNull();
    }
  });

  it('round-trips ASCII labels of symmetric tops and linear molecules (seeded property test)', () => {
    fc.assert(
      fc.property(fc.constantFrom(-1, 0, 1), fc.constantFrom(-1, 0, 1), fc.nat(200), fc.nat(500), (deltaK, deltaJ, kLower, jLower) => {
        const top = lineLabelParse(lineLabelAscii(deltaK, deltaJ, kLower, jLower, 'prolate'));
        expect(top).toEqual({ deltaK, deltaJ, kLower, jLower });
        const lin = lineLabelParse(lineLabelAscii(deltaK, deltaJ, kLower, jLower, 'linear'));
        expect(lin).toEqual({ deltaK: null, deltaJ, kLower: null, jLower });
      }),
      { seed: 20_241_201, numRuns: 500 },
    );
  });
});
