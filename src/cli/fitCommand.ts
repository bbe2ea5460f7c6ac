import { assignmentCheck } from '../fit/assignment';
import { fitBand } from '../fit/fitBand';
import type { FitError, FitLineResult } from '../fit/fitTypes';
import { lineTableParse, LineTableError, type LineTable } from '../io/lineTable';
import { lineLabelAscii } from '../physics/lineLabel';
import type { TopShape } from '../physics/model';
import { systemFit } from '../fit/systemFit';
import { systemFileFromModelFile, type SystemFile } from '../io/systemFile';
import type { LevelSet } from '../physics/system/levelTypes';
import { systemStateProvider, systemStateValues } from '../physics/system/systemStateLevels';
import { cliLoadModelOrSystem, cliLoadSystemLines, cliResolveSystemLines } from './cliModel';
import { CliError, cliParseArgs, cliRequire, type CliCommand, type CliIo } from './cliIo';

/**
 * Read a line table for a CLI command; errors become one-line CliErrors naming file, line and field;
 * the table's warnings (one per kind of problem, naming the file and lines) go to stderr as `warning: …`.
 */
export function cliLoadLines(path: string, io: CliIo): LineTable {
  const text = io.readFile(path);
  try {
    const table = lineTableParse(text, { fileName: path });
    for (const w of table.warnings) io.stderr(`warning: ${w}\n`);
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
 * With a system file (JSON with "species"; or a line table with MHz rows) every band is fitted at
 * once (fit/systemFit.ts): the same JSON keys (parameters keyed "<state>.<constant>", a tied one
 * with "same"), plus degreesOfFreedom, covarianceScale, bands (per-band rms) and, per line, band,
 * species, l_up, l_lo, tag_up, tag_lo, unit and for MHz lines obsMHz, calcMHz, obsMinusCalcMHz, sigmaMHz,
 * and sym_up, sym_lo (the levels' symmetry species) when the line's species declares a point group.
 * σ of the constants are scaled by σ_w only when σ_w > 1.
 */
export const fitCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['model', 'lines']);
  const modelPath = cliRequire(opts, 'model');
  const linesPath = cliRequire(opts, 'lines');
  const loaded = cliLoadModelOrSystem(modelPath, io);
  if (loaded.kind === 'system') return fitSystem(loaded.file, linesPath, io);
  const file = loaded.file;
  const table = cliLoadLines(linesPath, io);
  // A table with MHz rows cannot be read as cm^-1: fit it as a one-band system instead.
  const unitColumn = table.extraColumns.find((c) => c.toLowerCase() === 'unit');
  if (unitColumn && table.extras.some((e) => (e[unitColumn] ?? '').trim().toLowerCase() === 'mhz')) {
    return fitSystem(systemFileFromModelFile(file), linesPath, io);
  }
  table.assignments.forEach((a, i) => {
    const why = assignmentCheck(a, file.model);
    if (why) throw new CliError(`${linesPath}: line ${table.lineNumbers[i]}: ${why}`);
  });
  const outcome = fitBand({ model: file.model, floated: file.floated, lines: table.assignments });
  if (!outcome.ok) throw fitRefusal(outcome.error);
  const r = outcome.result;
  const shape = file.model.shape;
  const out = {
    parameters: r.parameters,
    rms: r.rmsCm1,
    sigmaW: r.sigmaW,
    nLines: r.nLines,
    residuals: r.lines.map((l) => l.obsMinusCalc),
    warnings: r.warnings,
    lines: r.lines.map((l) => fitLineJson(l, shape)),
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

/** The joint fit of a system file's bands to a system line table; JSON as the single-band fit plus the system fields. */
function fitSystem(system: SystemFile, linesPath: string, io: CliIo): number {
  const table = cliLoadSystemLines(linesPath, io);
  const lines = cliResolveSystemLines(system, table, linesPath);
  const outcome = systemFit({ model: system.model, parameters: system.parameters, lines });
  if (!outcome.ok) throw fitRefusal(outcome.error);
  const r = outcome.result;
  const signed = (l: number) => (l > 0 ? '+1' : l < 0 ? '-1' : '0');
  const symmetryOf = levelSymmetryLookup(system);
  const out = {
    parameters: r.parameters,
    rms: r.rmsCm1,
    sigmaW: r.sigmaW,
    nLines: r.nLines,
    residuals: r.lines.map((l) => l.obsMinusCalc),
    warnings: r.warnings,
    lines: r.lines.map((l) => ({
      ...fitLineJson(l, system.model.species[l.speciesIndex].shape),
      band: l.band,
      species: l.species,
      l_up: signed(l.lUpper),
      l_lo: signed(l.lLower),
      tag_up: l.tagUpper,
      tag_lo: l.tagLower,
      unit: l.unit ?? 'cm-1',
      ...(l.unit === 'MHz' ? { obsMHz: l.obsMHz, calcMHz: l.calcMHz, obsMinusCalcMHz: l.obsMinusCalcMHz, sigmaMHz: l.sigmaMHz } : {}),
      ...(system.model.species[l.speciesIndex].pointGroup
        ? {
            sym_up: symmetryOf(l.speciesIndex, l.band, 'upper', l.jUpper, l.kUpper, l.lUpper, l.tagUpper),
            sym_lo: symmetryOf(l.speciesIndex, l.band, 'lower', l.jLower, l.kLower, l.lLower, l.tagLower),
          }
        : {}),
    })),
    iterations: r.iterations,
    convergence: r.convergenceMessage,
    conditionNumber: r.conditionNumber,
    floated: r.floated,
    correlation: r.correlation,
    nParameters: r.nParameters,
    chi2: r.chi2,
    isExactlyDetermined: r.isExactlyDetermined,
    degreesOfFreedom: r.degreesOfFreedom,
    covarianceScale: r.covarianceScale,
    bands: r.bands,
  };
  io.stdout(JSON.stringify(out, null, 2) + '\n');
  return 0;
}

/**
 * The symmetry species of a labelled level of a band's upper or lower state ('' when unknown), from
 * the file's constants (species do not depend on them); level sets cached per state and J.
 */
function levelSymmetryLookup(system: SystemFile) {
  const cache = new Map<string, LevelSet>();
  return (speciesIndex: number, bandName: string, side: 'upper' | 'lower', J: number, K: number, l: number, tag: string): string => {
    const species = system.model.species[speciesIndex];
    const band = species.bands.find((b) => b.name === bandName);
    const state = band && species.states.find((st) => st.name === band[side]);
    if (!state) return '';
    const id = `${speciesIndex}/${state.name}/${J}`;
    let set = cache.get(id);
    if (!set) {
      const provider = systemStateProvider(species.shape, state);
      set = provider.levels(J, systemStateValues(provider, state), J, false);
      cache.set(id, set);
    }
    for (let i = 0; i < set.count; i++) if (set.K[i] === K && set.l[i] === l && set.tag[i] === tag) return set.species?.[i] ?? '';
    return '';
  };
}

/** A fit's refusal as one CliError line: message, the parameters involved, and the suggestion. */
function fitRefusal(e: FitError): CliError {
  const params = e.parameters.length ? ` Parameters involved: ${e.parameters.join(', ')}.` : '';
  return new CliError(`${e.message}${params} ${e.suggestion}`.trim().replace(/\s*\n\s*/g, ' '));
}

/** One fitted line as the fit JSON prints it (both the single-band and the joint fit). */
function fitLineJson(l: FitLineResult, shape: TopShape) {
  return {
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
  };
}
