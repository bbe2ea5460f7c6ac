import { bandShapeClassify } from '../analysis/bandShapeClassify';
import { cliApodization } from './contourCommand';
import { cliLoadTrace } from './cliTrace';
import { CliError, cliNumber, cliParseArgs, cliRequire, type CliCommand } from './cliIo';

/**
 * `classify --trace FILE --from X1 --to X2 [--temperature K] [--q-envelope] [--opd L [--apodization NAME] [--spin-weights W0,W1,W2]]`: say what the band between X1 and X2
 * (cm^-1) looks like. Prints JSON {"profile": "PR" | "PQR" | "Q-series", "type", "origin", "B",
 * "qSpacing" (Q-series only), "evidence"} plus "confidence" (high, medium, low), "alternativeType"
 * (when another type fits too), "bMethod", "bLow" and "bHigh" (the range B is good to, when B is given), "bDetermined" (that range within ±15 %; ±10 % for a Π–Σ or Q-series envelope), "temperature", "temperatureAssumed" and "implication".
 * origin, B and qSpacing in cm^-1; B is null when the trace does not show it, and a rough value (never
 * determined, with a wide bLow–bHigh) when the profile is rated low. Without
 * --temperature, B from an unresolved contour assumes 296 K and says so. With --q-envelope a
 * Q-branch series' envelope is also fitted for B and A − B (C − B), reported as "qSeriesEnvelope"
 * {shape, shapesFitting, uniqueMinusB, uniqueMinusBLow, uniqueMinusBHigh, zeta, B, bLow, bHigh,
 * rmsOverNoise, origin} (cm^-1; B from it only when that fit is good enough, see bandShapeClassify).
 * With --opd (maximum optical path difference, cm) and --apodization (default boxcar) a Q-branch
 * series is also fitted as a contour through that instrument (the envelope fit above starts it), and
 * B comes from that fit; reported as "qSeriesContour" {B, bSigma, bLow, bHigh, otherMinimaB, determined, fitsBand,
 * whyNot, rmsOverNoise, uniqueZetaMinusB, uniqueZetaMinusBSigma, unique, shape, status} (cm^-1).
 * --spin-weights gives that fit the molecule's nuclear-spin weights by K mod 3 (without it every K
 * is weighted alike, and a band whose Q branches alternate in height fits poorly: B is then withheld).
 */
export const classifyCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['trace', 'from', 'to', 'temperature', 'opd', 'apodization', 'spin-weights'], ['q-envelope']);
  const tracePath = cliRequire(opts, 'trace');
  const fromCm1 = cliNumber(opts, 'from');
  const toCm1 = cliNumber(opts, 'to');
  if (!(toCm1 > fromCm1)) throw new CliError(`--to must be greater than --from, got --from ${fromCm1} --to ${toCm1}`);
  const temperatureK = opts.temperature === undefined ? undefined : cliNumber(opts, 'temperature');
  if (temperatureK !== undefined && !(temperatureK > 0)) throw new CliError(`--temperature must be > 0 K, got ${temperatureK}`);
  const opdCm = opts.opd === undefined ? undefined : cliNumber(opts, 'opd');
  if (opdCm !== undefined && !(opdCm > 0)) throw new CliError(`--opd must be a maximum optical path difference > 0 cm, got ${opdCm}`);
  if (opts.apodization !== undefined && opdCm === undefined) throw new CliError('--apodization needs --opd (the instrument it describes)');
  const apodization = cliApodization(opts);
  let spinWeights: number[] | undefined;
  if (opts['spin-weights'] !== undefined) {
    if (opdCm === undefined) throw new CliError('--spin-weights needs --opd (they are used by the contour fit through the instrument)');
    const text = String(opts['spin-weights']);
    spinWeights = text.split(',').map((w) => Number(w.trim()));
    if (
      !(spinWeights.length >= 1 && spinWeights.length <= 3) ||
      spinWeights.some((w) => !(w >= 0 && Number.isFinite(w))) ||
      !spinWeights.some((w) => w > 0)
    )
      throw new CliError(
        `--spin-weights must be one to three numbers ≥ 0 (K weighted by W[K mod their count]), not all 0, separated by commas; got '${text}'`,
      );
  }
  const trace = cliLoadTrace(tracePath, io);
  let r;
  try {
    r = bandShapeClassify(trace.wavenumberCm1, trace.absorbance, fromCm1, toCm1, {
      temperatureK,
      qSeriesEnvelope: opts['q-envelope'] === true,
      ...(opdCm !== undefined ? { opdCm, apodization, spinWeights } : {}),
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
    ...(r.qSeriesContour ? { qSeriesContour: r.qSeriesContour } : {}),
  };
  io.stdout(JSON.stringify(out, null, 2) + '\n');
  return 0;
};
