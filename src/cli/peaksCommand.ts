import { peaksFind } from '../analysis/peaksFind';
import { CliError, cliNumber, cliParseArgs, cliRequire, type CliCommand } from './cliIo';
import { cliPrintTraceWarnings, cliReadTrace } from './cliTrace';

/**
 * `peaks --trace FILE [--min-snr S] [--noise SIGMA] [--baseline]`: find the lines of a measured trace.
 * Prints CSV `wavenumber,height,fwhm,snr,blend,wavenumber_sigma`, one row per peak, ascending
 * wavenumber: wavenumber and its 1σ and fwhm in cm^-1, height in absorbance above the local
 * baseline, snr = height / noise σ, blend 1 for an overlap of lines else 0.
 * A file the importer refuses gives one line naming the file and the line or field at fault, exit 1.
 */
export const peaksCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['trace', 'min-snr', 'noise'], ['baseline']);
  const file = cliRequire(opts, 'trace');
  const minSnr = cliNumber(opts, 'min-snr', 5);
  if (minSnr < 0) throw new CliError(`option --min-snr must be >= 0, got ${minSnr}`);
  const noiseSigma = opts.noise === undefined ? undefined : cliNumber(opts, 'noise');
  if (noiseSigma !== undefined && noiseSigma < 0) throw new CliError(`option --noise must be >= 0, got ${noiseSigma}`);
  const outcome = cliReadTrace(file, io);
  if (!outcome.ok) {
    const { message, line, field } = outcome.error;
    const where: string[] = [];
    if (line !== undefined && !new RegExp(`\\bline ${line}\\b`).test(message)) where.push(`line ${line}`);
    if (field !== undefined && !message.includes(field)) where.push(`field ${field}`);
    // The importer's messages already name the file; add it (and the place) only when missing.
    const named = message.includes(file) ? message : `${file}: ${message}`;
    throw new CliError(`${named}${where.length ? ` (${where.join(', ')})` : ''}`);
  }
  cliPrintTraceWarnings(outcome.report, io);
  const peaks = peaksFind(outcome.trace, { minSnr, noiseSigma, baseline: opts.baseline === true });
  const rows: string[] = ['wavenumber,height,fwhm,snr,blend,wavenumber_sigma'];
  for (let k = 0; k < peaks.count; k++) {
    rows.push(
      `${peaks.wavenumberCm1[k].toFixed(7)},${peaks.height[k].toPrecision(7)},${peaks.fwhmCm1[k].toPrecision(6)},` +
        `${Number.isFinite(peaks.snr[k]) ? peaks.snr[k].toFixed(2) : 'inf'},${peaks.isBlend[k]},` +
        `${peaks.centreSigmaCm1[k].toPrecision(3)}`,
    );
  }
  io.stdout(rows.join('\n') + '\n');
  return 0;
};
