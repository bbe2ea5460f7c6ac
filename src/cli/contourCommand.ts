import { noiseSigmaEstimate } from '../analysis/noiseSigmaEstimate';
import { contourDefaultFloat, contourFit } from '../fit/contourFit';
import { APODIZATION_NAMES, apodizationCheck, type ApodizationName } from '../physics/instrumentLineShape';
import { cliLoadModel } from './cliModel';
import { cliLoadTrace } from './cliTrace';
import { CliError, cliNumber, cliParseArgs, cliRequire, type CliCommand } from './cliIo';

/** The --apodization option (default boxcar) or a CliError listing the known names. */
export function cliApodization(opts: Record<string, string | true>): ApodizationName {
  const name = typeof opts.apodization === 'string' ? opts.apodization : 'boxcar';
  try {
    return apodizationCheck('cli', name);
  } catch {
    throw new CliError(`--apodization must be one of ${APODIZATION_NAMES.join(', ')}, got '${name}'`);
  }
}

/**
 * `contour --model M.json --trace FILE --from X1 --to X2 --opd L [--apodization NAME] [--mass AMU]
 * [--lorentz HWHM] [--float key1,key2,...] [--baseline-degree D]`: fit the band contour of the model,
 * seen through the instrument line shape, to the trace between X1 and X2 (cm^-1).
 *
 * Prints JSON {"parameters": {key: {value, sigma, fixed}}, "rms", "nPoints", "scale", "baseline",
 * "warnings"} plus "scaleSigma", "baselineSigma", "combinations" (A′(1−ζ), B′−B″, … with σ),
 * "correlations" (|ρ| ≥ 0.95), "noiseSigma", "status" and "route". Values in cm^-1 (ζ
 * dimensionless); rms, noiseSigma and the baseline coefficients (of t = (2x − X1 − X2)/(X2 − X1))
 * in absorbance; scale in absorbance per unit of relative intensity × cm.
 *
 * Defaults: floated are the model file's floated constants among origin, B′, B″, A′/C′ and ζ
 * (contourDefaultFloat), the scale, and the Lorentz HWHM only when --lorentz is given; the mass
 * comes from --mass or the model file's "mass"; the baseline is linear.
 */
export const contourCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['model', 'trace', 'from', 'to', 'opd', 'apodization', 'mass', 'lorentz', 'float', 'baseline-degree']);
  const modelPath = cliRequire(opts, 'model');
  const tracePath = cliRequire(opts, 'trace');
  const fromCm1 = cliNumber(opts, 'from');
  const toCm1 = cliNumber(opts, 'to');
  if (!(toCm1 > fromCm1)) throw new CliError(`--to must be greater than --from, got --from ${fromCm1} --to ${toCm1}`);
  const opdCm = cliNumber(opts, 'opd');
  if (!(opdCm > 0)) throw new CliError(`--opd must be a maximum optical path difference > 0 cm, got ${opdCm}`);
  const apodization = cliApodization(opts);
  const lorentzGiven = opts.lorentz !== undefined;
  const lorentzHwhmCm1 = cliNumber(opts, 'lorentz', 0);
  if (lorentzHwhmCm1 < 0) throw new CliError(`--lorentz must be a half width >= 0 cm^-1, got ${lorentzHwhmCm1}`);
  const degree = cliNumber(opts, 'baseline-degree', 1);
  if (!Number.isInteger(degree) || degree < 0 || degree > 6)
    throw new CliError(`--baseline-degree must be a whole number 0 … 6, got ${degree}`);
  const file = cliLoadModel(modelPath, io);
  const massAmu = opts.mass !== undefined ? cliNumber(opts, 'mass') : file.massAmu;
  if (massAmu === undefined) throw new CliError(`no molecular mass for the Doppler width: give --mass AMU or "mass" (amu) in ${modelPath}`);
  if (!(massAmu > 0)) throw new CliError(`--mass must be > 0 amu, got ${massAmu}`);
  let float: string[];
  if (typeof opts.float === 'string') {
    float = opts.float
      .split(',')
      .map((k) => k.trim())
      .filter((k) => k.length > 0);
    if (float.length === 0) throw new CliError('--float needs at least one key, e.g. upper.origin,lower.B,scale');
  } else {
    float = [...contourDefaultFloat(file.model).filter((k) => file.floated.includes(k)), 'scale', ...(lorentzGiven ? ['lorentz'] : [])];
  }
  const trace = cliLoadTrace(tracePath, io);
  const first = trace.wavenumberCm1[0];
  const last = trace.wavenumberCm1[trace.wavenumberCm1.length - 1];
  if (toCm1 <= first || fromCm1 >= last) {
    throw new CliError(`the region ${fromCm1} … ${toCm1} cm^-1 lies outside the trace (${first} … ${last} cm^-1)`);
  }
  let noiseSigma: number;
  try {
    noiseSigma = noiseSigmaEstimate(trace.wavenumberCm1, trace.absorbance);
  } catch {
    noiseSigma = 0;
  }
  let result;
  try {
    result = contourFit({
      model: file.model,
      wavenumberCm1: trace.wavenumberCm1,
      absorbance: trace.absorbance,
      fromCm1,
      toCm1,
      opdCm,
      apodization,
      massAmu,
      lorentzHwhmCm1,
      float,
      baselineDegree: degree,
      noiseSigma: noiseSigma > 0 ? noiseSigma : undefined,
    });
  } catch (err) {
    throw new CliError((err instanceof Error ? err.message : String(err)).replace(/^contourFit: /, ''));
  }
  const warnings = [...result.warnings];
  if (noiseSigma > 0 && result.rms > 2 * noiseSigma) {
    warnings.push(
      `The rms residual (${result.rms.toPrecision(3)}) is ${(result.rms / noiseSigma).toFixed(1)} times the trace's noise (${noiseSigma.toPrecision(3)}): the model misses structure (another band, hot band, wrong band type or temperature); treat the values with care.`,
    );
  }
  const out = {
    parameters: result.parameters,
    rms: result.rms,
    nPoints: result.nPoints,
    scale: result.scale,
    baseline: result.baseline,
    warnings,
    scaleSigma: result.scaleSigma,
    baselineSigma: result.baselineSigma,
    combinations: result.combinations,
    correlations: result.correlations,
    noiseSigma,
    status: result.status,
    route: result.route,
    opd: opdCm,
    apodization,
  };
  io.stdout(JSON.stringify(out, null, 2) + '\n');
  return 0;
};
