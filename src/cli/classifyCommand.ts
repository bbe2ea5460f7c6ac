import { bandShapeClassify } from '../analysis/bandShapeClassify';
import { cliLoadTrace } from './cliTrace';
import { CliError, cliNumber, cliParseArgs, cliRequire, type CliCommand } from './cliIo';

/**
 * `classify --trace FILE --from X1 --to X2 [--temperature K] [--q-envelope]`: say what the band between X1 and X2
 * (cm^-1) looks like. Prints JSON {"profile": "PR" | "PQR" | "Q-series", "type", "origin", "B",
 * "qSpacing" (Q-series only), "evidence"} plus "confidence" (high, medium, low), "alternativeType"
 * (when another type fits too), "bMethod", "bLow" and "bHigh" (the range B is good to, when B is given), "bDetermined" (that range within ±15 %; ±10 % for a Π–Σ or Q-series envelope), "temperature", "temperatureAssumed" and "implication".
 * origin, B and qSpacing in cm^-1; B is null when the trace does not show it. Without
 * --temperature, B from an unresolved contour assumes 296 K and says so. With --q-envelope a
 * Q-branch series' envelope is also fitted for B and A − B (C − B), reported as "qSeriesEnvelope"
 * {shape, shapesFitting, uniqueMinusB, uniqueMinusBLow, uniqueMinusBHigh, zeta, B, bLow, bHigh,
 * rmsOverNoise} (cm^-1; B from it only when that fit is good enough, see bandShapeClassify).
 */
export const classifyCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['trace', 'from', 'to', 'temperature'], ['q-envelope']);
  const tracePath = cliRequire(opts, 'trace');
  const fromCm1 = cliNumber(opts, 'from');
  const toCm1 = cliNumber(opts, 'to');
  if (!(toCm1 > fromCm1)) throw new CliError(`--to must be greater than --from, got --from ${fromCm1} --to ${toCm1}`);
  const temperatureK = opts.temperature === undefined ? undefined : cliNumber(opts, 'temperature');
  if (temperatureK !== undefined && !(temperatureK > 0)) throw new CliError(`--temperature must be > 0 K, got ${temperatureK}`);
  const trace = cliLoadTrace(tracePath, io);
  let r;
  try {
    r = bandShapeClassify(trace.wavenumberCm1, trace.absorbance, fromCm1, toCm1, {
      temperatureK,
      qSeriesEnvelope: opts['q-envelope'] === true,
    });
  } catch (err) {
    throw new CliError((err instanceof Error ? err.message : String(err)).replace(/^bandShapeClassify: /, ''));
  }
  const out = {
    profile: r.profile,
    type: r.type,
    origin: r.origin,
    B: r.B,
    ...(r.qSpacing !== undefined ? { qSpacing: r.qSpacing } : {}),
    evidence: r.evidence,
    confidence: r.confidence,
    ...(r.alternativeType ? { alternativeType: r.alternativeType } : {}),
    bMethod: r.bMethod,
    ...(r.bLow !== undefined ? { bLow: r.bLow } : {}),
    ...(r.bHigh !== undefined ? { bHigh: r.bHigh } : {}),
    ...(r.bDetermined !== undefined ? { bDetermined: r.bDetermined } : {}),
    temperature: r.temperatureK,
    temperatureAssumed: r.temperatureAssumed,
    implication: r.implication,
    ...(r.qSeriesEnvelope ? { qSeriesEnvelope: r.qSeriesEnvelope } : {}),
  };
  io.stdout(JSON.stringify(out, null, 2) + '\n');
  return 0;
};
