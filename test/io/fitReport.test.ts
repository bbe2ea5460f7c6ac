import { describe, expect, it } from 'vitest';
import { fitBand } from '../../src/fit/fitBand';
import { fitReportMarkdown, markdownEscape } from '../../src/io/fitReport';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';

// The value(σ) notation itself is tested in test/io/numberFormat.test.ts (formatValueUncertainty).
describe('markdownEscape', () => {
  it('turns markup and table breaks into inert text', () => {
    expect(markdownEscape('<img src=x onerror=alert(1)>|a\nb')).toBe('&lt;img src=x onerror=alert(1)&gt;\\|a b');
  });
});

describe('fitReportMarkdown', () => {
  // Invented constants; lines computed from them with 1e-4 cm^-1 alternating offsets so σ_w is finite.
  const truth: BandModel = {
    shape: 'prolate',
    band: 'parallel',
    lower: stateConstantsFrom({ B: 0.25, A: 4 }),
    upper: stateConstantsFrom({ origin: 950, B: 0.249, A: 3.99 }),
    temperatureK: 300,
    jMax: 15,
    kMax: 3,
    spinWeights: [1],
  };
  const lines = bandLines(truth);
  const input = {
    model: truth,
    floated: ['upper.origin', 'upper.B', 'lower.B'],
    lines: Array.from({ length: lines.count }, (_, i) => ({
      jUpper: lines.jUpper[i],
      kUpper: lines.kUpper[i],
      jLower: lines.jLower[i],
      kLower: lines.kLower[i],
      observedCm1: lines.wavenumberCm1[i] + (i % 2 ? 1e-4 : -1e-4),
      uncertaintyCm1: 1e-4,
    })),
  };
  const outcome = fitBand(input);
  if (!outcome.ok) throw new Error(outcome.error.message);
  const result = outcome.result;
  const md = fitReportMarkdown(result, 'prolate', { modelName: 'Test <script>', appVersion: '0.1.0', dateIso: '2024-05-06T07:08:09.000Z' });

  it('names the date, version, N and σ_w', () => {
    expect(md).toContain('- Date: 2024-05-06T07:08:09.000Z');
    expect(md).toContain('Ladder Bench 0.1.0');
    expect(md).toContain(`N = ${result.nLines}`);
    expect(md).toContain(`σ_w = ${result.sigmaW!.toPrecision(4)}`);
    expect(md).toContain(`Degrees of freedom ν = N − P = ${result.nLines - result.nParameters}`);
    expect(md).toMatch(result.sigmaW! > 1 ? /scaled up by σ_w/ : /not scaled down by σ_w/);
    expect(md).toContain('# Fit report: Test &lt;script&gt;');
  });

  it('lists every constant with its exact value and σ', () => {
    for (const [key, p] of Object.entries(result.parameters)) {
      const row = md.split('\n').find((l) => l.includes(`\`${key}\``) && l.startsWith('| ') && l.includes(p.fixed ? 'fixed' : 'floated'));
      expect(row, key).toBeDefined();
      const cells = row!.split('|').map((c) => c.trim());
      expect(Number(cells[4])).toBe(p.value);
      // σ is printed to 3 significant digits: relative rounding ≤ 0.5 %.
      if (!p.fixed) expect(Math.abs(Number(cells[5]) - p.sigma!) / p.sigma!).toBeLessThan(5e-3);
    }
  });

  it('prints the lower triangle of the correlation matrix with a unit diagonal', () => {
    const start = md.indexOf('## Correlation matrix');
    const rows = md
      .slice(start)
      .split('\n')
      .filter((l) => l.startsWith('| `'));
    expect(rows.length).toBe(result.floated.length);
    rows.forEach((r, i) => {
      const cells = r
        .split('|')
        .map((c) => c.trim())
        .slice(2, -1);
      expect(Number(cells[i])).toBe(1);
      for (let j = 0; j < i; j++) expect(Number(cells[j])).toBeCloseTo(result.correlation[i][j], 4);
    });
  });

  it('has one line row per input line', () => {
    const body = md.slice(md.indexOf('## Lines'));
    expect(body.split('\n').filter((l) => /^\| [pqr]?[PQR]\d*\(\d+\)/.test(l)).length).toBe(lines.count);
  });
});
