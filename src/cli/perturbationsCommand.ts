import { perturbationSearch } from '../analysis/perturbationScan';
import { assignmentCheck } from '../fit/assignment';
import { cliLoadModel } from './cliModel';
import { cliLoadLines } from './fitCommand';
import { CliError, cliParseArgs, cliRequire, type CliCommand } from './cliIo';

/**
 * `perturbations --model M.json --lines L.csv [--state upper|lower]`: fit the lines, scan the
 * chosen state's levels for perturbations (fit, set the perturbed levels aside, fit again, scan
 * all levels against that fit) and print JSON: {state, rounds, rmsFirst, rmsLast (cm^-1),
 * noise (cm^-1), setAside (line numbers of the table), findings [{kind, k, kFrom, component,
 * jFrom, jTo, jPeak, size (cm^-1), significance, description}], levels [{J, K, component,
 * obs, calc, obsMinusCalc, sigma, nLines, spread, reducedObs, reducedCalc} (cm^-1)]}.
 * The levels are the points of a reduced term-value plot (E − B·J(J+1) against J per K).
 */
export const perturbationsCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['model', 'lines', 'state']);
  const modelPath = cliRequire(opts, 'model');
  const linesPath = cliRequire(opts, 'lines');
  const state = opts.state ?? 'upper';
  if (state !== 'upper' && state !== 'lower') throw new CliError(`--state must be 'upper' or 'lower', got '${String(state)}'`);
  const file = cliLoadModel(modelPath, io);
  const table = cliLoadLines(linesPath, io);
  table.assignments.forEach((a, i) => {
    const why = assignmentCheck(a, file.model);
    if (why) throw new CliError(`${linesPath}: line ${table.lineNumbers[i]}: ${why}`);
  });
  const outcome = perturbationSearch({ model: file.model, floated: file.floated, lines: table.assignments }, state);
  if (!outcome.ok) throw new CliError(`${outcome.error.message} ${outcome.error.suggestion}`.trim().replace(/\s*\n\s*/g, ' '));
  const r = outcome.result;
  const out = {
    state,
    rounds: r.rounds,
    rmsFirst: r.rmsFirstCm1,
    rmsLast: r.rmsLastCm1,
    noise: r.scan.noiseCm1,
    setAside: r.setAside.map((i) => table.lineNumbers[i]),
    findings: r.scan.findings.map((f) => ({
      kind: f.kind,
      k: f.k,
      kFrom: f.kFrom,
      component: f.component,
      jFrom: f.jFrom,
      jTo: f.jTo,
      jPeak: f.jPeak,
      size: f.sizeCm1,
      significance: f.significance,
      description: f.description,
    })),
    levels: r.levels.map((l) => ({
      J: l.j,
      K: l.k,
      component: l.component,
      obs: l.energyObsCm1,
      calc: l.energyCalcCm1,
      obsMinusCalc: l.obsMinusCalcCm1,
      sigma: l.sigmaCm1,
      nLines: l.nLines,
      spread: l.spreadCm1,
      reducedObs: l.reducedObsCm1,
      reducedCalc: l.reducedCalcCm1,
    })),
  };
  io.stdout(JSON.stringify(out, null, 2) + '\n');
  return 0;
};
