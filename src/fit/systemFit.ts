import { MHZ_PER_CM1 } from '../physics/constants';
import type { SystemModel } from '../physics/system/systemModel';
import { systemStateProvider } from '../physics/system/systemStateLevels';
import { speciesLevelSources, type StateLevelSource } from '../physics/interaction/speciesLevelSources';
import { FIT_DEFAULTS, type FitConvergence, type FitError, type FitHooks, type FitOptions } from './fitTypes';
import { leastSquaresSolve } from './leastSquares';
import { fitStatistics, fitStatisticsWarnings } from './fitStatistics';
import type { Linearisation } from './leastSquaresLinearise';
import { systemRankDiagnosis } from './systemRankDiagnosis';
import { systemFitLevelTable, type SystemFitLevelRef, type SystemFitStatePlan } from './systemFitLevels';
import { systemFitCompress, type SystemFitBlock } from './systemFitCompress';
import type {
  SystemFitBandSummary,
  SystemFitLine,
  SystemFitLineResult,
  SystemFitOutcome,
  SystemFitParameterResult,
  SystemParameter,
} from './systemFitTypes';

/** Everything a joint fit needs (plain data). */
export interface SystemFitInput {
  /** Start values and structure (constants in cm^-1). */
  model: SystemModel;
  /** Every constant's key, value and status (io/systemFile.ts). */
  parameters: readonly SystemParameter[];
  /** Observed lines with fully labelled levels (fit/systemLineResolve.ts). */
  lines: readonly SystemFitLine[];
  options?: FitOptions;
}

const CONVERGENCE_WORDS: Record<FitConvergence, string> = {
  'chi2-change': 'converged: the last step changed χ² by less than the tolerance',
  'step-size': 'converged: the last step moved every constant by a negligible fraction of its uncertainty',
  'no-further-decrease': 'converged: χ² cannot be lowered further (the minimum is reached to round-off)',
  'max-iterations': 'stopped at the iteration limit before meeting the convergence tests',
  'nothing-floated': 'nothing floated: positions calculated from the given constants',
};

/** Condition numbers above this earn a "nearly undetermined" warning. */
const CONDITION_WARN = 1e8;
/** |correlation| above this earns a warning. */
const CORRELATION_WARN = 0.9999;

function refuse(
  kind: FitError['kind'],
  message: string,
  parameters: string[] = [],
  suggestion = '',
  fixSuggested: string[] = [],
): SystemFitOutcome {
  return { ok: false, error: { kind, message, parameters, suggestion, fixSuggested } };
}

/**
 * Fit the constants of several bands of one or more species to their assigned lines at once, by
 * weighted least squares (weights 1/σ²; microwave lines enter in cm^-1 with their own σ). A
 * constant of a state shared by several bands is one parameter; tied constants ({"same": …}) are
 * one parameter; fixed constants stay at their values. Line positions are E′ − E″ of the states'
 * level providers, the Jacobian their ∂E/∂p. Refuses in words (FitError) when the data cannot
 * determine the floated set; never throws for bad data.
 * Statistics: χ² = Σ((o − c)/σ)², σ_w = sqrt(χ²/(N − P)); covariance (JᵀWJ)⁻¹ scaled by σ_w²
 * only when σ_w > 1 (the stated σ are then taken as too small; never scaled down).
 * Source: Bevington & Robinson, Data Reduction and Error Analysis, 3rd ed. (2003), ch. 7–8; solver
 * fit/leastSquares.ts.
 * @param input model, parameters, lines
 * @param hooks progress and cancellation
 */
export function systemFit(input: SystemFitInput, hooks: FitHooks = {}): SystemFitOutcome {
  const options = { ...FIT_DEFAULTS, ...input.options };
  const { model, parameters, lines } = input;
  // Parameters: one column per floated constant; a tie follows its target's column or value.
  const floated = parameters.filter((p) => p.status === 'floated').map((p) => p.key);
  const columnOfKey = new Map(floated.map((k, j) => [k, j]));
  const byKey = new Map(parameters.map((p) => [p.key, p]));
  for (const p of parameters) {
    if (!Number.isFinite(p.value)) return refuse('bad-input', `systemFit: ${p.key} must be a finite number, got ${p.value}`, [p.key]);
    if (p.status === 'tied' && (!p.same || !byKey.has(p.same)))
      return refuse('bad-input', `systemFit: ${p.key} is tied to an unknown constant '${p.same}'`, [p.key]);
  }
  const columnOf = (p: SystemParameter): number => columnOfKey.get(p.status === 'tied' ? p.same! : p.key) ?? -1;
  const plans = new Map<string, SystemFitStatePlan>();
  // States joined by interactions share one coupled provider per group (physics/interaction).
  const coupledSources = new Map<number, Map<string, StateLevelSource>>();
  const planOf = (speciesIndex: number, state: string): SystemFitStatePlan => {
    const id = `${speciesIndex}/${state}`;
    let plan = plans.get(id);
    if (!plan) {
      const species = model.species[speciesIndex];
      const st = species.states.find((s) => s.name === state)!;
      let sources = coupledSources.get(speciesIndex);
      if (!sources && species.interactions?.length)
        coupledSources.set(speciesIndex, (sources = speciesLevelSources(species, { isLabelFollowing: true })));
      const source = sources?.get(state);
      const provider = source ? source.provider : systemStateProvider(species.shape, st);
      const values = source ? source.values.slice() : Float64Array.from(provider.parameterNames, (n) => st.constants[n] ?? 0);
      const column = new Int32Array(provider.parameterNames.length).fill(-1);
      provider.parameterNames.forEach((providerName, c) => {
        const owner = source ? source.owners[c].owner : state;
        const name = source ? source.owners[c].name : providerName;
        const p = parameters.find((q) => q.speciesIndex === speciesIndex && q.state === owner && q.name === name);
        if (p) {
          values[c] = p.status === 'tied' ? byKey.get(p.same!)!.value : p.value;
          column[c] = columnOf(p);
        }
      });
      plan = { speciesIndex, state, provider, values, column };
      plans.set(id, plan);
    }
    return plan;
  };

  // Endpoints of every line in the fit: line i ends on refs 2i (upper) and 2i + 1 (lower).
  const used: number[] = [];
  const refs: SystemFitLevelRef[] = [];
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i];
    const species = model.species[line.speciesIndex];
    if (!species) return refuse('bad-input', `systemFit: lines[${i}] names species index ${line.speciesIndex}, which does not exist`);
    const band = species.bands.find((b) => b.name === line.band);
    if (!band)
      return refuse('bad-input', `systemFit: lines[${i}] names band '${line.band}', which species '${species.name}' does not have`);
    if (!Number.isFinite(line.observedCm1))
      return refuse('bad-input', `systemFit: lines[${i}]: observedCm1 must be a finite wavenumber in cm^-1, got ${line.observedCm1}`);
    if (!(line.uncertaintyCm1 > 0) || !Number.isFinite(line.uncertaintyCm1)) {
      return refuse('bad-input', `systemFit: lines[${i}]: uncertaintyCm1 must be a finite number > 0 (cm^-1), got ${line.uncertaintyCm1}`);
    }
    refs.push({ plan: planOf(line.speciesIndex, band.upper), J: line.jUpper, K: line.kUpper, l: line.lUpper, tag: line.tagUpper });
    refs.push({ plan: planOf(line.speciesIndex, band.lower), J: line.jLower, K: line.kLower, l: line.lLower, tag: line.tagLower });
    if (!line.isExcluded) used.push(i);
  }
  const nLines = used.length;
  const nP = floated.length;
  if (nLines === 0) {
    return refuse(
      'too-few-lines',
      lines.length === 0 ? 'There are no lines to fit.' : `All ${lines.length} lines are excluded; there is nothing to fit.`,
      [...floated],
      'Assign lines (or include excluded ones) and fit again.',
    );
  }
  if (nLines < nP) {
    return refuse(
      'too-few-lines',
      `${nLines} line${nLines === 1 ? '' : 's'} cannot determine ${nP} floated constants (${floated.join(', ')}): at least ${nP} lines are needed, and more to obtain uncertainties.`,
      [...floated],
      `Assign at least ${nP - nLines} more line${nP - nLines === 1 ? '' : 's'} or fix ${nP - nLines} of the floated constants (higher-order ones such as H or D first).`,
    );
  }

  // Every distinct level once per evaluation (one provider call per state and J); lines index them.
  const levels = systemFitLevelTable(refs);
  const { energyCm1: energy, gradient: grad, width } = levels;
  const upperSlot = new Int32Array(lines.length);
  const lowerSlot = new Int32Array(lines.length);
  for (let i = 0; i < lines.length; i++) {
    upperSlot[i] = levels.slotOfRef[2 * i];
    lowerSlot[i] = levels.slotOfRef[2 * i + 1];
  }
  const usedIndex = Int32Array.from(used);
  const observed = Float64Array.from(used, (i) => lines[i].observedCm1);
  const sigma = Float64Array.from(used, (i) => lines[i].uncertaintyCm1);
  const calcAll = (p: Float64Array): Float64Array => {
    levels.evaluate(p);
    const out = new Float64Array(lines.length);
    for (let i = 0; i < lines.length; i++) out[i] = energy[upperSlot[i]] - energy[lowerSlot[i]];
    return out;
  };
  const start = Float64Array.from(floated, (k) => byKey.get(k)!.value);
  const missing = levels.evaluate(start);
  if (missing) return refuse('bad-input', `systemFit: ${missing}`);

  const problem = {
    nObservations: nLines,
    nParameters: nP,
    residuals(p: Float64Array, out: Float64Array) {
      levels.evaluate(p);
      for (let r = 0; r < nLines; r++) {
        const i = usedIndex[r];
        out[r] = (observed[r] - (energy[upperSlot[i]] - energy[lowerSlot[i]])) / sigma[r];
      }
    },
    jacobian(p: Float64Array, out: Float64Array) {
      levels.evaluate(p);
      out.fill(0);
      for (let r = 0; r < nLines; r++) {
        const i = usedIndex[r];
        const w = 1 / sigma[r];
        for (let side = 0; side < 2; side++) {
          const slot = side === 0 ? upperSlot[i] : lowerSlot[i];
          const column = levels.planOfSlot[slot].column;
          const row = slot * width;
          const sign = side === 0 ? w : -w;
          for (let c = 0; c < column.length; c++) {
            const j = column[c];
            if (j >= 0) out[j * nLines + r] += sign * grad[row + c];
          }
        }
      }
    },
  };

  // Lines of one band touch only their two states' columns: the solver works on each band's R
  // factor instead of its rows (systemFitCompress; same χ², JᵀJ and Jᵀr, far fewer flops).
  const blocks = systemFitBlocks(used, refs, nP);
  const compressed = systemFitCompress(nP, blocks, {
    evaluate: (p) => levels.evaluate(p),
    fill(block, res, jac) {
      const mb = block.rows.length;
      const local = new Int32Array(nP).fill(-1);
      block.columns.forEach((j, c) => (local[j] = c));
      jac.fill(0, 0, mb * block.columns.length);
      for (let b = 0; b < mb; b++) {
        const r = block.rows[b];
        const i = usedIndex[r];
        res[b] = (observed[r] - (energy[upperSlot[i]] - energy[lowerSlot[i]])) / sigma[r];
        const w = 1 / sigma[r];
        for (let side = 0; side < 2; side++) {
          const slot = side === 0 ? upperSlot[i] : lowerSlot[i];
          const column = levels.planOfSlot[slot].column;
          const row = slot * width;
          const sign = side === 0 ? w : -w;
          for (let c = 0; c < column.length; c++) {
            const j = column[c];
            if (j >= 0) jac[local[j] * mb + b] += sign * grad[row + c];
          }
        }
      }
    },
  });
  // Floated constants no line touches leave the compressed problem with fewer rows than columns;
  // the full problem then reaches the rank test that names them.
  const solved = compressed.nObservations >= nP ? compressed : problem;

  let values: Float64Array = start;
  let lin: Linearisation | null = null;
  let iterations = 0;
  let convergence: FitConvergence = 'nothing-floated';
  if (nP > 0) {
    const solution = leastSquaresSolve(solved, start, {
      maxIterations: options.maxIterations,
      chi2RelativeTolerance: options.chi2RelativeTolerance,
      stepToleranceSigma: options.stepToleranceSigma,
      rankRelativeTolerance: options.rankRelativeTolerance,
      onIteration: hooks.onProgress,
      shouldCancel: hooks.shouldCancel,
    });
    switch (solution.status) {
      case 'rank-deficient':
        return { ok: false, error: systemRankDiagnosis(solution.linearisation!, floated, input, used, options.rankRelativeTolerance) };
      case 'cancelled':
        return refuse('cancelled', 'The fit was cancelled.');
      case 'non-finite':
        return refuse(
          'diverged',
          'The calculated line positions are not finite numbers at the start values.',
          [...floated],
          'Check the start values in the system file.',
        );
      default:
        values = solution.parameters;
        lin = solution.linearisation;
        iterations = solution.iterations;
        convergence = solution.status;
    }
  }
  return { ok: true, result: buildResult(input, floated, used, values, lin, iterations, convergence, calcAll(values), options) };
}

/**
 * The fitted lines grouped by the pair of states they join (one band, or bands sharing both states),
 * each with the floated columns those states' constants use.
 */
function systemFitBlocks(used: readonly number[], refs: readonly SystemFitLevelRef[], nP: number): SystemFitBlock[] {
  const byPair = new Map<SystemFitStatePlan, Map<SystemFitStatePlan, number[]>>();
  used.forEach((i, r) => {
    const up = refs[2 * i].plan;
    const lo = refs[2 * i + 1].plan;
    let inner = byPair.get(up);
    if (!inner) byPair.set(up, (inner = new Map()));
    const list = inner.get(lo);
    if (list) list.push(r);
    else inner.set(lo, [r]);
  });
  const blocks: SystemFitBlock[] = [];
  for (const [up, inner] of byPair) {
    for (const [lo, rows] of inner) {
      const cols = new Set<number>();
      for (const plan of [up, lo]) for (const j of plan.column) if (j >= 0 && j < nP) cols.add(j);
      blocks.push({ rows: Int32Array.from(rows), columns: Int32Array.from([...cols].sort((a, b) => a - b)) });
    }
  }
  return blocks;
}

function buildResult(
  input: SystemFitInput,
  floated: string[],
  used: number[],
  values: Float64Array,
  lin: Linearisation | null,
  iterations: number,
  convergence: FitConvergence,
  calc: Float64Array,
  options: Required<FitOptions>,
) {
  const { model, parameters, lines } = input;
  const nLines = used.length;
  const nParameters = floated.length;
  const dof = nLines - nParameters;
  const isExactlyDetermined = dof === 0 && nParameters > 0;
  const inFit = new Uint8Array(lines.length);
  for (const i of used) inFit[i] = 1;
  let chi2 = 0;
  let sumSq = 0;
  const lineResults: SystemFitLineResult[] = lines.map((line, i) => {
    const obsMinusCalc = line.observedCm1 - calc[i];
    const normalisedResidual = obsMinusCalc / line.uncertaintyCm1;
    if (inFit[i]) {
      chi2 += normalisedResidual * normalisedResidual;
      sumSq += obsMinusCalc * obsMinusCalc;
    }
    // Written out rather than spread: objects built by spreading a line and adding ten fields fall
    // into V8's slow dictionary mode, which made reading 10,000 of them cost hundreds of ms.
    const r: SystemFitLineResult = {
      speciesIndex: line.speciesIndex,
      band: line.band,
      jUpper: line.jUpper,
      kUpper: line.kUpper,
      lUpper: line.lUpper,
      tagUpper: line.tagUpper,
      jLower: line.jLower,
      kLower: line.kLower,
      lLower: line.lLower,
      tagLower: line.tagLower,
      observedCm1: line.observedCm1,
      uncertaintyCm1: line.uncertaintyCm1,
      species: model.species[line.speciesIndex].name,
      isExcluded: !inFit[i],
      obs: line.observedCm1,
      calc: calc[i],
      obsMinusCalc,
      sigma: line.uncertaintyCm1,
      normalisedResidual,
      isOutlier: inFit[i] === 1 && !isExactlyDetermined && Math.abs(normalisedResidual) > options.outlierSigma,
    };
    if (line.unit !== undefined) r.unit = line.unit;
    if (line.unit === 'MHz') {
      r.obsMHz = line.observedCm1 * MHZ_PER_CM1;
      r.calcMHz = calc[i] * MHZ_PER_CM1;
      r.obsMinusCalcMHz = obsMinusCalc * MHZ_PER_CM1;
      r.sigmaMHz = line.uncertaintyCm1 * MHZ_PER_CM1;
    }
    return r;
  });
  const rmsCm1 = Math.sqrt(sumSq / nLines);
  const { sigmaW, covarianceScale, sigmas, covariance, correlation } = fitStatistics(chi2, nLines, nParameters, lin, isExactlyDetermined);
  const column = new Map(floated.map((k, j) => [k, j]));
  const valueOf = (key: string): SystemFitParameterResult => {
    const j = column.get(key);
    if (j !== undefined) return { value: values[j], sigma: isExactlyDetermined ? null : sigmas[j], fixed: false };
    return { value: parameters.find((p) => p.key === key)!.value, sigma: 0, fixed: true };
  };
  const out: Record<string, SystemFitParameterResult> = {};
  for (const p of parameters) out[p.key] = p.status === 'tied' ? { ...valueOf(p.same!), same: p.same } : valueOf(p.key);

  const outliers: number[] = [];
  lineResults.forEach((l, i) => l.isOutlier && outliers.push(i));
  const bands: SystemFitBandSummary[] = [];
  model.species.forEach((species, s) => {
    for (const band of species.bands) {
      let n = 0;
      let sq = 0;
      let nsq = 0;
      for (const i of used) {
        const l = lineResults[i];
        if (l.speciesIndex !== s || l.band !== band.name) continue;
        n++;
        sq += l.obsMinusCalc * l.obsMinusCalc;
        nsq += l.normalisedResidual * l.normalisedResidual;
      }
      if (n > 0)
        bands.push({ species: species.name, band: band.name, nLines: n, rmsCm1: Math.sqrt(sq / n), rmsNormalised: Math.sqrt(nsq / n) });
    }
  });

  const warnings: string[] = [];
  warnings.push(...fitStatisticsWarnings({ convergence, iterations, isExactlyDetermined, sigmaW, nLines, nParameters }));
  if (outliers.length > 0) {
    const labels = outliers
      .slice(0, 10)
      .map((i) => {
        const l = lineResults[i];
        return `${l.band} J'=${l.jUpper} K'=${l.kUpper} ← J"=${l.jLower} K"=${l.kLower} (${l.normalisedResidual.toFixed(1)}σ)`;
      })
      .join(', ');
    warnings.push(
      `${outliers.length} line${outliers.length === 1 ? '' : 's'} deviate${outliers.length === 1 ? 's' : ''} from the fit by more than ${options.outlierSigma} times ${outliers.length === 1 ? 'its' : 'their'} uncertainty: ${labels}${outliers.length > 10 ? ', …' : ''}. Possible misassignments or blends.`,
    );
  }
  if (lin && lin.conditionNumber > CONDITION_WARN && Number.isFinite(lin.conditionNumber)) {
    const n = lin.nParameters;
    const j = n - 1;
    let max = 0;
    for (let i = 0; i < n; i++) max = Math.max(max, Math.abs(lin.svd.v[j * n + i]));
    const keys = floated.filter((_, i) => Math.abs(lin.svd.v[j * n + i]) >= 0.2 * max);
    warnings.push(
      `Nearly undetermined (condition number ${lin.conditionNumber.toExponential(1)}): the data barely separate ${keys.join(', ')}; their uncertainties are large and fixing one of them may be wiser.`,
    );
  }
  const pairs: string[] = [];
  for (let a = 0; a < correlation.length; a++) {
    for (let b = a + 1; b < correlation.length; b++) {
      if (Math.abs(correlation[a][b]) > CORRELATION_WARN) pairs.push(`${floated[a]}/${floated[b]} (${correlation[a][b].toFixed(5)})`);
    }
  }
  if (pairs.length) warnings.push(`Very strongly correlated constants: ${pairs.slice(0, 6).join(', ')}${pairs.length > 6 ? ', …' : ''}.`);
  return {
    parameters: out,
    floated: [...floated],
    covariance,
    correlation,
    nLines,
    nParameters,
    degreesOfFreedom: dof,
    chi2,
    rmsCm1,
    sigmaW,
    covarianceScale,
    isExactlyDetermined,
    lines: lineResults,
    outliers,
    bands,
    iterations,
    convergence,
    convergenceMessage: CONVERGENCE_WORDS[convergence],
    conditionNumber: lin ? lin.conditionNumber : 1,
    warnings,
  };
}
