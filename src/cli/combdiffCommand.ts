import { combinationDifferences, type CombDiffState } from '../fit/combinationDifferences';
import type { TopShape } from '../physics/model';
import { CliError, cliParseArgs, cliRequire, type CliCommand } from './cliIo';
import { cliLoadLines } from './fitCommand';
import { systemCombinationDifferences } from '../fit/systemCombinationDifferences';
import { cliLoadSystem, cliLoadSystemLines, cliResolveSystemLines } from './cliModel';
import type { CliIo } from './cliIo';

/**
 * `combdiff --lines L.csv --state lower|upper [--shape prolate|oblate]`: B, DJ, DJK (cm^-1)
 * of one state from ground- (lower) or upper-state combination differences of the assigned
 * lines. JSON on stdout: {"B": {value, sigma, fixed}, "DJ": …, "DJK": …, "nPairs": …} plus
 * sigmaW, rms (cm^-1), the pairs (diagnostic-plot data), suspect pairs and warnings.
 *
 * `combdiff --model S.json --lines L.csv --state NAME [--species NAME]`: combination differences of
 * the named state of a system file (or `lower`/`upper` of a single-band model file) from every band
 * that shares it (fit/systemCombinationDifferences.ts). JSON: species, state, parameters (by fit
 * key, {value, sigma, fixed}: the constants the differences see), B, DJ, DJK (as above, null when
 * the state has no such constant), nPairs, sigmaW, rms, warnings, pairs (band, J_high, J_low, K, l,
 * tag, line numbers, difference, sigma, calc, isSuspect).
 */
export const combdiffCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['lines', 'state', 'shape', 'model', 'species']);
  const linesPath = cliRequire(opts, 'lines');
  const state = cliRequire(opts, 'state');
  if (opts.model !== undefined) return combdiffSystem(String(opts.model), linesPath, state, opts, io);
  if (opts.species !== undefined) throw new CliError('option --species needs --model (a system file)');
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

function combdiffSystem(modelPath: string, linesPath: string, state: string, opts: Record<string, string | true>, io: CliIo): number {
  if (opts.shape !== undefined) throw new CliError('option --shape is not used with --model (the shape comes from the model file)');
  const system = cliLoadSystem(modelPath, io);
  const speciesName = opts.species;
  let speciesIndex = 0;
  if (typeof speciesName === 'string') {
    speciesIndex = system.model.species.findIndex((s) => s.name === speciesName);
    if (speciesIndex < 0)
      throw new CliError(
        `option --species: no species '${speciesName}' in ${modelPath} (species: ${system.model.species.map((s) => s.name).join(', ')})`,
      );
  } else if (system.model.species.length > 1) {
    throw new CliError(`${modelPath} holds ${system.model.species.length} species; choose one with --species`);
  }
  const table = cliLoadSystemLines(linesPath, io);
  const lines = cliResolveSystemLines(system, table, linesPath);
  const outcome = systemCombinationDifferences(system.model, system.parameters, lines, speciesIndex, state);
  if (!outcome.ok) throw new CliError(`${linesPath}: ${outcome.message}`);
  const r = outcome.result;
  const pick = (name: string) => {
    const entry = Object.entries(r.parameters).find(([k]) => k.endsWith(`${state}.${name}`));
    return entry ? entry[1] : null;
  };
  const out = {
    species: r.species,
    state: r.state,
    parameters: r.parameters,
    B: pick('B'),
    DJ: pick('DJ'),
    DJK: pick('DJK'),
    nPairs: r.nPairs,
    sigmaW: r.sigmaW,
    rms: r.rmsCm1,
    warnings: r.warnings,
    pairs: r.pairs.map((p) => ({
      band: p.band,
      J_high: p.jHigh,
      J_low: p.jLow,
      K: p.K,
      l: p.l,
      tag: p.tag,
      lines: p.lines.map((i) => table.lineNumbers[i]),
      difference: p.differenceCm1,
      sigma: p.sigmaCm1,
      calc: p.calcCm1,
      isSuspect: p.isSuspect,
    })),
  };
  io.stdout(JSON.stringify(out, null, 2) + '\n');
  return 0;
}
