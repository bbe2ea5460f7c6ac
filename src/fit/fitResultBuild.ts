import { lineLabelAscii } from '../physics/lineLabel';
import type { BandModel } from '../physics/model';
import { transitionWavenumber } from '../physics/termValues';
import { fitKeyParse, fitParameterKeys } from './bandDesign';
import type { FitConvergence, FitInput, FitLineResult, FitOptions, FitParameterResult, FitResult } from './fitTypes';
import { fitStatistics, fitStatisticsWarnings } from './fitStatistics';
import type { Linearisation } from './leastSquaresLinearise';

const CONVERGENCE_WORDS: Record<FitConvergence, string> = {
  'chi2-change': 'converged: the last step changed χ² by less than the tolerance',
  'step-size': 'converged: the last step moved every constant by a negligible fraction of its uncertainty',
  'no-further-decrease': 'converged: χ² cannot be lowered further (the minimum is reached to round-off)',
  'max-iterations': 'stopped at the iteration limit before meeting the convergence tests',
  'nothing-floated': 'nothing floated: positions calculated from the given constants',
};

export { FIT_FEW_DOF } from './fitStatistics';
/** Condition numbers above this earn a "nearly undetermined" warning. */
const CONDITION_WARN = 1e8;
/** |correlation| above this earns a warning. */
const CORRELATION_WARN = 0.9999;

/**
 * Assemble the FitResult of a finished fit: fitted model, standard errors, covariance and
 * correlation, per-line obs − calc, outliers and plain-language warnings.
 *
 * Statistics: χ² = Σ ((o − c)/σ_i)²; ν = N − P degrees of freedom; σ_w = sqrt(χ²/ν);
 * covariance C = (JᵀWJ)⁻¹ · max(1, σ_w²); σ_p = sqrt(C_pp); correlation ρ_ab = C_ab / (σ_a σ_b);
 * rms = sqrt(mean (o − c)²) (cm^-1, unweighted). With N = P no σ is given (sigma null). An outlier
 * has |o − c| > outlierSigma·σ_i.
 * The covariance is scaled up by σ_w² when the lines scatter more than their stated σ (σ_w > 1:
 * the stated σ are taken as too small), but never scaled down: σ_w < 1 with few degrees of
 * freedom is mostly chance (a 1-dof fit gave σ_w = 0.0035), and shrinking every σ by it claims a
 * precision the data cannot back. (JᵀWJ)⁻¹ alone is the covariance implied by the stated σ.
 * Source: Bevington & Robinson, Data Reduction and Error Analysis, 3rd ed. (2003), ch. 7–8
 * (covariance as the inverse curvature matrix; with known σ_i it is used unscaled, the reduced-χ²
 * scaling estimates σ_i when they are not known), from memory; one-sided scaling: common practice.
 * @param input the fit input (start model, floated keys, all lines)
 * @param used indices of the lines in the fit
 * @param values fitted values of the floated keys
 * @param lin linearisation at the solution (null when nothing was floated)
 */
export function fitResultBuild(
  input: FitInput,
  used: number[],
  values: Float64Array,
  lin: Linearisation | null,
  iterations: number,
  convergence: FitConvergence,
  options: Required<FitOptions>,
): FitResult {
  const { floated, lines } = input;
  const model: BandModel = { ...input.model, lower: { ...input.model.lower }, upper: { ...input.model.upper } };
  floated.forEach((key, j) => {
    const k = fitKeyParse(key)!;
    model[k.side][k.name] = values[j];
  });
  const nLines = used.length;
  const nParameters = floated.length;
  const dof = nLines - nParameters;
  const isExactlyDetermined = dof === 0 && nParameters > 0;

  const usedSet = new Uint8Array(lines.length);
  for (const i of used) usedSet[i] = 1;
  let chi2 = 0;
  let sumSq = 0;
  const lineResults: FitLineResult[] = lines.map((line, i) => {
    const calc = transitionWavenumber(model, line.jUpper, line.kUpper, line.jLower, line.kLower);
    const obsMinusCalc = line.observedCm1 - calc;
    const normalisedResidual = obsMinusCalc / line.uncertaintyCm1;
    const inFit = usedSet[i] === 1;
    if (inFit) {
      chi2 += normalisedResidual * normalisedResidual;
      sumSq += obsMinusCalc * obsMinusCalc;
    }
    return {
      jUpper: line.jUpper,
      kUpper: line.kUpper,
      jLower: line.jLower,
      kLower: line.kLower,
      obs: line.observedCm1,
      calc,
      obsMinusCalc,
      sigma: line.uncertaintyCm1,
      normalisedResidual,
      isOutlier: inFit && !isExactlyDetermined && Math.abs(normalisedResidual) > options.outlierSigma,
      isExcluded: !inFit,
    };
  });
  const rmsCm1 = Math.sqrt(sumSq / nLines);
  const { sigmaW, covarianceScale, sigmas, covariance, correlation } = fitStatistics(chi2, nLines, nParameters, lin, isExactlyDetermined);

  const floatIndex = new Map(floated.map((k, j) => [k, j]));
  const parameters: Record<string, FitParameterResult> = {};
  for (const key of fitParameterKeys(model.shape)) {
    const k = fitKeyParse(key)!;
    const j = floatIndex.get(key);
    parameters[key] =
      j === undefined
        ? { value: model[k.side][k.name], sigma: 0, fixed: true }
        : { value: values[j], sigma: isExactlyDetermined ? null : sigmas[j], fixed: false };
  }

  const outliers: number[] = [];
  lineResults.forEach((l, i) => l.isOutlier && outliers.push(i));
  const warnings = fitWarnings({
    model,
    floated,
    lineResults,
    outliers,
    lin,
    correlation,
    sigmaW,
    isExactlyDetermined,
    convergence,
    iterations,
    nLines,
    options,
  });
  return {
    parameters,
    floated: [...floated],
    covariance,
    correlation,
    nLines,
    nParameters,
    degreesOfFreedom: dof,
    covarianceScale,
    chi2,
    rmsCm1,
    sigmaW,
    isExactlyDetermined,
    lines: lineResults,
    outliers,
    iterations,
    convergence,
    convergenceMessage: CONVERGENCE_WORDS[convergence],
    conditionNumber: lin ? lin.conditionNumber : 1,
    model,
    warnings,
  };
}

interface WarningContext {
  model: BandModel;
  floated: readonly string[];
  lineResults: FitLineResult[];
  outliers: number[];
  lin: Linearisation | null;
  correlation: number[][];
  sigmaW: number | null;
  isExactlyDetermined: boolean;
  convergence: FitConvergence;
  iterations: number;
  nLines: number;
  options: Required<FitOptions>;
}

function fitWarnings(c: WarningContext): string[] {
  const w: string[] = [];
  w.push(
    ...fitStatisticsWarnings({
      convergence: c.convergence,
      iterations: c.iterations,
      isExactlyDetermined: c.isExactlyDetermined,
      sigmaW: c.sigmaW,
      nLines: c.nLines,
      nParameters: c.floated.length,
    }),
  );
  if (c.outliers.length > 0) {
    const labels = c.outliers
      .slice(0, 10)
      .map((i) => {
        const l = c.lineResults[i];
        return `${lineLabelAscii(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, l.jLower, c.model.shape)} (${l.normalisedResidual.toFixed(1)}σ)`;
      })
      .join(', ');
    w.push(
      `${c.outliers.length} line${c.outliers.length === 1 ? '' : 's'} deviate${c.outliers.length === 1 ? 's' : ''} from the fit by more than ${c.options.outlierSigma} times ${c.outliers.length === 1 ? 'its' : 'their'} uncertainty: ${labels}${c.outliers.length > 10 ? ', …' : ''}. Possible misassignments or blends.`,
    );
  }
  if (c.lin && c.lin.conditionNumber > CONDITION_WARN && Number.isFinite(c.lin.conditionNumber)) {
    const n = c.lin.nParameters;
    const j = n - 1;
    let max = 0;
    for (let i = 0; i < n; i++) max = Math.max(max, Math.abs(c.lin.svd.v[j * n + i]));
    const keys = c.floated.filter((_, i) => Math.abs(c.lin!.svd.v[j * n + i]) >= 0.2 * max);
    w.push(
      `Nearly undetermined (condition number ${c.lin.conditionNumber.toExponential(1)}): the data barely separate ${keys.join(', ')}; their uncertainties are large and fixing one of them may be wiser.`,
    );
  }
  const pairs: string[] = [];
  for (let a = 0; a < c.correlation.length; a++) {
    for (let b = a + 1; b < c.correlation.length; b++) {
      if (Math.abs(c.correlation[a][b]) > CORRELATION_WARN)
        pairs.push(`${c.floated[a]}/${c.floated[b]} (${c.correlation[a][b].toFixed(5)})`);
    }
  }
  if (pairs.length) w.push(`Very strongly correlated constants: ${pairs.slice(0, 6).join(', ')}${pairs.length > 6 ? ', …' : ''}.`);
  return w;
}
