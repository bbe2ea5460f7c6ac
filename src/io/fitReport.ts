/**
 * Fit report as Markdown: every constant with its 1σ, σ_w, N, the correlation matrix, warnings,
 * outliers and the residual of every line, with date and app version.
 */
import type { FitResult } from '../fit/fitTypes';
import { lineLabelAscii } from '../physics/lineLabel';
import { constantNameText } from './constantName';
import { formatNumber, formatValueUncertainty } from './numberFormat';
import type { TopShape } from '../physics/model';

/** Context written into the report header. */
export interface FitReportInfo {
  /** Name of the model (untrusted text; escaped). */
  modelName: string;
  /** App version (package.json). */
  appVersion: string;
  /** ISO 8601 date and time of the report. */
  dateIso: string;
  /** When the fit finished (ISO 8601), if known. */
  fitFinishedAt?: string | null;
}

/** Escape text for a Markdown table cell or line (no HTML, no table breaks). */
export function markdownEscape(text: string): string {
  return text
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/\|/g, '\\|')
    .replace(/[\r\n]+/g, ' ');
}

/** A constant's name for the report: as the trade writes it, with its state ("D_J″ (lower)"). */
function constantName(key: string): string {
  const side = key.split('.')[0];
  return `${constantNameText(key)} ${side === 'upper' ? '(upper)' : side === 'lower' ? '(lower)' : ''}`.trim();
}

/**
 * Write the report.
 * @param result a successful fit (constants cm^-1, ζ dimensionless)
 * @param shape rotor shape (labels)
 * @param info model name, app version, date
 * @returns Markdown text
 */
export function fitReportMarkdown(result: FitResult, shape: TopShape, info: FitReportInfo): string {
  const out: string[] = [];
  out.push(`# Fit report: ${markdownEscape(info.modelName || 'unnamed model')}`);
  out.push('');
  out.push(`- Date: ${info.dateIso}`);
  if (info.fitFinishedAt) out.push(`- Fit finished: ${info.fitFinishedAt}`);
  out.push(`- Program: Ladder Bench ${markdownEscape(info.appVersion)}`);
  out.push(`- Rotor: ${result.model.shape} top, ${result.model.band} band`);
  out.push(
    `- Lines fitted N = ${result.nLines}; floated constants P = ${result.nParameters}; lines excluded: ${result.lines.filter((l) => l.isExcluded).length}`,
  );
  out.push(`- Degrees of freedom ν = N − P = ${result.nLines - result.nParameters}`);
  out.push(
    `- Weighted standard deviation σ_w = ${result.sigmaW === null ? 'not defined (N = P, exactly determined)' : result.sigmaW.toPrecision(4)}`,
  );
  out.push(`- rms of obs − calc = ${result.rmsCm1.toExponential(3)} cm⁻¹; χ² = ${result.chi2.toPrecision(5)}`);
  out.push(`- Iterations: ${result.iterations}; ${markdownEscape(result.convergenceMessage)}`);
  out.push(
    `- Condition number of the scaled Jacobian: ${Number.isFinite(result.conditionNumber) ? result.conditionNumber.toExponential(2) : '∞'}`,
  );
  out.push('');
  out.push('## Constants');
  out.push('');
  out.push(
    `Values in cm⁻¹ (ζ dimensionless); σ is the 1σ standard error ${
      result.sigmaW !== null && result.sigmaW > 1
        ? 'scaled up by σ_w (the lines scatter more than their stated uncertainties)'
        : 'from the stated line uncertainties (not scaled down by σ_w, which is not above 1)'
    }.`,
  );
  out.push('');
  out.push('| Constant | Key | Value(σ) | Value | σ | Status |');
  out.push('|---|---|---|---|---|---|');
  for (const [key, p] of Object.entries(result.parameters)) {
    const status = p.fixed ? 'fixed' : 'floated';
    const sigma = p.fixed ? '' : p.sigma === null ? 'n/a' : p.sigma.toPrecision(3);
    out.push(
      `| ${constantName(key)} | \`${key}\` | ${p.fixed ? formatNumber(p.value, 12) : formatValueUncertainty(p.value, p.sigma)} | ${String(p.value)} | ${sigma} | ${status} |`,
    );
  }
  out.push('');
  out.push('## Correlation matrix');
  out.push('');
  if (result.correlation.length === 0) out.push('Not available (exactly determined or nothing floated).');
  else {
    out.push(`| | ${result.floated.map((k) => `\`${k}\``).join(' | ')} |`);
    out.push(`|---|${result.floated.map(() => '---:').join('|')}|`);
    result.correlation.forEach((row, i) => {
      out.push(`| \`${result.floated[i]}\` | ${row.map((v, j) => (j > i ? '' : v.toFixed(4))).join(' | ')} |`);
    });
  }
  out.push('');
  out.push('## Warnings');
  out.push('');
  if (result.warnings.length === 0) out.push('None.');
  for (const w of result.warnings) out.push(`- ${markdownEscape(w)}`);
  out.push('');
  out.push('## Outliers');
  out.push('');
  if (result.outliers.length === 0) out.push('None (no fitted line beyond the outlier limit).');
  for (const i of result.outliers) {
    const l = result.lines[i];
    out.push(
      `- ${lineLabelAscii(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, l.jLower, shape)}: obs − calc = ${l.obsMinusCalc.toExponential(3)} cm⁻¹ = ${l.normalisedResidual.toFixed(2)} σ`,
    );
  }
  out.push('');
  out.push('## Lines');
  out.push('');
  out.push('| Label | J′ | K′ | J″ | K″ | obs / cm⁻¹ | calc / cm⁻¹ | obs − calc / cm⁻¹ | σ / cm⁻¹ | (o − c)/σ | Flags |');
  out.push('|---|---:|---:|---:|---:|---:|---:|---:|---:|---:|---|');
  for (const l of result.lines) {
    const flags = [l.isExcluded && 'excluded', l.isOutlier && 'outlier'].filter(Boolean).join(', ');
    out.push(
      `| ${lineLabelAscii(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, l.jLower, shape)} | ${l.jUpper} | ${l.kUpper} | ${l.jLower} | ${l.kLower} | ${l.obs.toFixed(6)} | ${l.calc.toFixed(6)} | ${l.obsMinusCalc.toFixed(6)} | ${l.sigma} | ${l.normalisedResidual.toFixed(2)} | ${flags} |`,
    );
  }
  out.push('');
  return out.join('\n');
}
