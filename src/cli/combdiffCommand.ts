import { combinationDifferences, type CombDiffState } from '../fit/combinationDifferences';
import type { TopShape } from '../physics/model';
import { CliError, cliParseArgs, cliRequire, type CliCommand } from './cliIo';
import { cliLoadLines } from './fitCommand';

/**
 * `combdiff --lines L.csv --state lower|upper [--shape prolate|oblate]`: B, DJ, DJK (cm^-1)
 * of one state from ground- (lower) or upper-state combination differences of the assigned
 * lines. JSON on stdout: {"B": {value, sigma, fixed}, "DJ": …, "DJK": …, "nPairs": …} plus
 * sigmaW, rms (cm^-1), the pairs (diagnostic-plot data), suspect pairs and warnings.
 */
export const combdiffCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['lines', 'state', 'shape']);
  const linesPath = cliRequire(opts, 'lines');
  const state = cliRequire(opts, 'state');
  if (state !== 'lower' && state !== 'upper') throw new CliError(`option --state must be 'lower' or 'upper', got '${state}'`);
  const shapeOpt = opts.shape ?? 'prolate';
  if (shapeOpt !== 'prolate' && shapeOpt !== 'oblate' && shapeOpt !== 'linear') {
    throw new CliError(`option --shape must be 'prolate' or 'oblate' (or 'linear'), got '${String(shapeOpt)}'`);
  }
  const table = cliLoadLines(linesPath, io);
  const outcome = combinationDifferences(table.assignments, state as CombDiffState, {
    shape: shapeOpt as TopShape,
    lineName: (i) => `line ${table.lineNumbers[i]}`,
  });
  if (!outcome.ok) {
    const e = outcome.error;
    const where = e.lineIndex !== undefined ? `${linesPath}: line ${table.lineNumbers[e.lineIndex]}: ` : `${linesPath}: `;
    throw new CliError(where + e.message);
  }
  const r = outcome.result;
  const lineNo = (i: number) => table.lineNumbers[i];
  const out = {
    B: r.B,
    DJ: r.DJ,
    DJK: r.DJK,
    nPairs: r.nPairs,
    state: r.state,
    sigmaW: r.sigmaW,
    rms: r.rmsCm1,
    warnings: r.warnings,
    pairs: r.pairs.map((p) => ({
      J: p.j,
      K: p.k,
      deltaK: p.deltaK,
      lineR: lineNo(p.lineR),
      lineP: lineNo(p.lineP),
      difference: p.differenceCm1,
      sigma: p.sigmaCm1,
      calc: p.calcCm1,
      x: p.x,
      y: p.y,
      sigmaY: p.sigmaY,
      isSuspect: p.isSuspect,
    })),
  };
  io.stdout(JSON.stringify(out, null, 2) + '\n');
  return 0;
};
