import { bandProblem } from './bandDesign';
import { fitCheck } from './fitCheck';
import { fitResultBuild } from './fitResultBuild';
import { FIT_DEFAULTS, type FitHooks, type FitInput, type FitOutcome } from './fitTypes';
import { leastSquaresSolve } from './leastSquares';
import { rankDiagnosis, rankDiagnosisStructural } from './rankDiagnosis';

/**
 * Fit the constants of a symmetric-top (or linear) band to assigned line positions by weighted
 * least squares (weights 1/σ²), floating the keys in input.floated and keeping all others at the
 * model's values. Refuses, with a plain-language FitError and no numbers for undetermined
 * constants, when the data cannot determine the floated set (too few lines, a constant no line
 * depends on, a null space of the Jacobian) or the input is invalid; never throws for bad data.
 *
 * Model: ν = E'(J', K') − F''(J'', K'') of physics/termValues.ts; statistics as in fitResultBuild.
 * Source: weighted least squares as in P. R. Bevington and D. K. Robinson, Data Reduction and
 * Error Analysis, 3rd ed. (2003), ch. 7–8; solver in fit/leastSquares.ts.
 * @param input start model (cm^-1), floated keys and observed lines (cm^-1)
 * @param hooks optional progress callback (iteration, χ²) and cancellation check
 * @returns {ok: true, result} or {ok: false, error}
 */
export function fitBand(input: FitInput, hooks: FitHooks = {}): FitOutcome {
  const bad = fitCheck(input);
  if (bad) return { ok: false, error: bad };
  const options = { ...FIT_DEFAULTS, ...input.options };
  const { model, floated, lines } = input;
  const used: number[] = [];
  for (let i = 0; i < lines.length; i++) if (!lines[i].isExcluded) used.push(i);
  const nLines = used.length;
  const nParameters = floated.length;
  if (nLines === 0) {
    return {
      ok: false,
      error: {
        kind: 'too-few-lines',
        message: lines.length === 0 ? 'There are no lines to fit.' : `All ${lines.length} lines are excluded; there is nothing to fit.`,
        parameters: [...floated],
        suggestion: 'Assign lines (or include excluded ones) and fit again.',
        fixSuggested: [],
      },
    };
  }
  if (nLines < nParameters) {
    // A set no number of lines of these kinds can determine gets the structural words, not a count.
    const structural = rankDiagnosisStructural(
      model,
      floated,
      used.map((i) => lines[i]),
      options.rankRelativeTolerance,
    );
    if (structural) return { ok: false, error: structural };
    return {
      ok: false,
      error: {
        kind: 'too-few-lines',
        message: `${nLines} line${nLines === 1 ? '' : 's'} cannot determine ${nParameters} floated constants (${floated.join(', ')}): at least ${nParameters} lines are needed, and more to obtain uncertainties.`,
        parameters: [...floated],
        suggestion: `Assign at least ${nParameters - nLines} more line${nParameters - nLines === 1 ? '' : 's'} or fix ${nParameters - nLines} of the floated constants (higher-order ones such as H or D first).`,
        fixSuggested: [],
      },
    };
  }

  const observedCm1 = new Float64Array(nLines);
  const uncertaintyCm1 = new Float64Array(nLines);
  const quanta = used.map((i, k) => {
    observedCm1[k] = lines[i].observedCm1;
    uncertaintyCm1[k] = lines[i].uncertaintyCm1;
    return lines[i];
  });
  if (nParameters === 0) {
    return { ok: true, result: fitResultBuild(input, used, new Float64Array(0), null, 0, 'nothing-floated', options) };
  }
  const posed = bandProblem(model, floated, { quanta, observedCm1, uncertaintyCm1 });
  const solution = leastSquaresSolve(posed.problem, posed.start, {
    maxIterations: options.maxIterations,
    chi2RelativeTolerance: options.chi2RelativeTolerance,
    stepToleranceSigma: options.stepToleranceSigma,
    rankRelativeTolerance: options.rankRelativeTolerance,
    onIteration: hooks.onProgress,
    shouldCancel: hooks.shouldCancel,
  });
  switch (solution.status) {
    case 'rank-deficient':
      return { ok: false, error: rankDiagnosis(solution.linearisation!, floated, model, options.rankRelativeTolerance) };
    case 'cancelled':
      return {
        ok: false,
        error: { kind: 'cancelled', message: 'The fit was cancelled.', parameters: [], suggestion: '', fixSuggested: [] },
      };
    case 'non-finite':
      return {
        ok: false,
        error: {
          kind: 'diverged',
          message: 'The calculated line positions are not finite numbers at the start values.',
          parameters: [...floated],
          suggestion: 'Check the start values in the model.',
          fixSuggested: [],
        },
      };
    default:
      return {
        ok: true,
        result: fitResultBuild(input, used, solution.parameters, solution.linearisation, solution.iterations, solution.status, options),
      };
  }
}
