/**
 * The part of a fit report that only a joint fit of several bands has: one row per band (lines,
 * rms) and the outliers named with their band.
 */
import { lineLabelAscii } from '../physics/lineLabel';
import type { TopShape } from '../physics/model';
import type { SystemFitBandSummary } from '../fit/systemFitTypes';
import { markdownEscape } from './fitReport';

/** What the band section reads from a joint-fit result. */
export interface SystemFitReportInput {
  bands: readonly SystemFitBandSummary[];
  lines: readonly {
    jUpper: number;
    kUpper: number;
    jLower: number;
    kLower: number;
    band?: string;
    species?: string;
    obsMinusCalc: number;
    normalisedResidual: number;
  }[];
  outliers: readonly number[];
}

/**
 * Markdown section "Bands" of a joint-fit report.
 * @param shape rotor shape for labels
 */
export function systemFitReportBands(result: SystemFitReportInput, shape: TopShape): string {
  const out: string[] = ['## Bands', '', '| Species | Band | Lines | rms obs − calc / cm⁻¹ | rms (o − c)/σ |', '|---|---|---:|---:|---:|'];
  for (const b of result.bands)
    out.push(
      `| ${markdownEscape(b.species)} | ${markdownEscape(b.band)} | ${b.nLines} | ${b.nLines ? b.rmsCm1.toExponential(3) : '–'} | ${b.nLines ? b.rmsNormalised.toFixed(3) : '–'} |`,
    );
  out.push('');
  if (result.outliers.length > 0) {
    out.push('Outliers by band:', '');
    for (const i of result.outliers) {
      const l = result.lines[i];
      const label = lineLabelAscii(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, l.jLower, shape);
      out.push(`- ${markdownEscape(l.band ?? '')} (${markdownEscape(l.species ?? '')}) ${label}: ${l.normalisedResidual.toFixed(2)} σ`);
    }
    out.push('');
  }
  return out.join('\n');
}
