import { assignmentCheck } from '../fit/assignment';
import { fitBand } from '../fit/fitBand';
import { lineTableParse, LineTableError, type LineTable } from '../io/lineTable';
import { lineLabelAscii } from '../physics/lineLabel';
import { cliLoadModel } from './cliModel';
import { CliError, cliParseArgs, cliRequire, type CliCommand, type CliIo } from './cliIo';

/** Read a line table for a CLI command; errors become one-line CliErrors naming file, line and field. */
export function cliLoadLines(path: string, io: CliIo): LineTable {
  const text = io.readFile(path);
  try {
    const table = lineTableParse(text, { fileName: path });
    for (const w of table.warnings) io.stderr(`${w}\n`);
    return table;
  } catch (err) {
    if (err instanceof LineTableError) throw new CliError(err.message);
    throw err;
  }
}

/**
 * `fit --model M.json --lines L.csv`: weighted least-squares fit of the model's floated
 * constants (plain numbers in the model file) to the lines; JSON on stdout with every constant
 * ({value, sigma, fixed}, cm^-1), rms (cm^-1, unweighted), sigmaW (dimensionless), nLines,
 * residuals (obs − calc, cm^-1, input order), per-line details, iterations, conditionNumber,
 * correlation (in the order of "floated"), nParameters, warnings, degreesOfFreedom (N − P) and
 * covarianceScale (σ_w² when σ_w > 1, else 1: uncertainties are never scaled down).
 * Refusals (under-determined, too few lines) end with exit 1 and one stderr line naming the
 * constants involved.
 */
export const fitCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['model', 'lines']);
  const modelPath = cliRequire(opts, 'model');
  const linesPath = cliRequire(opts, 'lines');
  const file = cliLoadModel(modelPath, io);
  const table = cliLoadLines(linesPath, io);
  table.assignments.forEach((a, i) => {
    const why = assignmentCheck(a, file.model);
    if (why) throw new CliError(`${linesPath}: line ${table.lineNumbers[i]}: ${why}`);
  });
  const outcome = fitBand({ model: file.model, floated: file.floated, lines: table.assignments });
  if (!outcome.ok) {
    const e = outcome.error;
    const params = e.parameters.length ? ` Parameters involved: ${e.parameters.join(', ')}.` : '';
    throw new CliError(`${e.message}${params} ${e.suggestion}`.trim().replace(/\s*\n\s*/g, ' '));
  }
  const r = outcome.result;
  const shape = file.model.shape;
  const out = {
    parameters: r.parameters,
    rms: r.rmsCm1,
    sigmaW: r.sigmaW,
    nLines: r.nLines,
    residuals: r.lines.map((l) => l.obsMinusCalc),
    warnings: r.warnings,
    lines: r.lines.map((l) => ({
      J_up: l.jUpper,
      K_up: l.kUpper,
      J_lo: l.jLower,
      K_lo: l.kLower,
      label: lineLabelAscii(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, l.jLower, shape),
      obs: l.obs,
      calc: l.calc,
      obsMinusCalc: l.obsMinusCalc,
      sigma: l.sigma,
      normalisedResidual: l.normalisedResidual,
      isOutlier: l.isOutlier,
      isExcluded: l.isExcluded,
    })),
    iterations: r.iterations,
    convergence: r.convergenceMessage,
    conditionNumber: r.conditionNumber,
    floated: r.floated,
    correlation: r.correlation,
    nParameters: r.nParameters,
    chi2: r.chi2,
    isExactlyDetermined: r.isExactlyDetermined,
    // Added keys (the older ones above keep their names and meaning).
    degreesOfFreedom: r.nLines - r.nParameters,
    covarianceScale: r.covarianceScale,
  };
  io.stdout(JSON.stringify(out, null, 2) + '\n');
  return 0;
};
