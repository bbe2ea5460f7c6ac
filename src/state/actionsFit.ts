/**
 * Fit actions: run the band fit in the solver worker (the page never waits on it), accept the
 * fitted constants into the model or go back to the previous ones.
 */
import { fitKeyParse } from '../fit/bandDesign';
import type { FitInput, FitOutcome } from '../fit/fitTypes';
import { constantKeysToNames } from '../io/constantName';
import type { BandModel, ParameterName } from '../physics/model';
import { solverFit, solverSystemFit } from '../workers/solverClient';
import { systemFitAsFitResult, systemFitInputSliced, systemViewFields, systemWithFitted } from './systemFitInput';
import { benchUpdate, messagePost } from './actionsCore';
import { benchStore, type BenchState } from './store';

let fitAbort: AbortController | null = null;

/** The fit input for the current state: model, floated keys and every assignment (excluded ones are predicted only). */
export function fitInputOf(s: Pick<BenchState, 'model' | 'floated' | 'assignments'>): FitInput {
  return {
    model: s.model,
    floated: [...s.floated],
    lines: s.assignments.map((a) => ({
      jUpper: a.jUpper,
      kUpper: a.kUpper,
      jLower: a.jLower,
      kLower: a.kLower,
      observedCm1: a.observedCm1,
      uncertaintyCm1: a.uncertaintyCm1,
      isExcluded: a.isExcluded,
    })),
  };
}

/** Plain-words summary of a fit outcome for the message area. */
export function fitOutcomeSummary(outcome: FitOutcome): string {
  if (!outcome.ok) {
    const e = outcome.error;
    // Constants named as on the page (D_J′), not by their file keys (upper.DJ).
    return `The fit was refused: ${constantKeysToNames(e.message)}${e.suggestion ? ` Suggestion: ${constantKeysToNames(e.suggestion)}` : ''}`;
  }
  const r = outcome.result;
  const sw = r.sigmaW === null ? 'exactly determined' : `σ_w = ${r.sigmaW.toPrecision(3)}`;
  const out = r.outliers.length ? `, ${r.outliers.length} outlier${r.outliers.length === 1 ? '' : 's'}` : '';
  return `Fit done: ${r.nLines} lines, ${r.nParameters} constants, rms ${r.rmsCm1.toExponential(2)} cm⁻¹, ${sw}${out}.`;
}

/**
 * Start a fit of the current assignments in the worker; a running fit is cancelled first.
 * @param runner the solver (tests pass fitBand wrapped in a promise) @default solverFit
 */
export async function fitStart(
  runner: typeof solverFit = solverFit,
  systemRunner: typeof solverSystemFit = solverSystemFit,
): Promise<void> {
  fitAbort?.abort();
  const ctrl = new AbortController();
  fitAbort = ctrl;
  const s = benchStore.getState();
  const ids = s.assignments.map((a) => a.id);
  let run: (signal: AbortSignal, onProgress: (iteration: number, chi2: number) => void) => Promise<FitOutcome>;
  if (s.system) {
    // Several bands: the joint fit, every band at once (shared states are one set of constants).
    // Rows are resolved to lines in slices (the first fit after a model change resolves them all).
    benchUpdate('fit start', () => ({ isFitRunning: true, fitProgress: null }), { history: false });
    const built = await systemFitInputSliced(s, () => fitAbort !== ctrl || ctrl.signal.aborted);
    if (fitAbort !== ctrl) return;
    if (!built || !built.ok) {
      fitAbort = null;
      benchUpdate('fit not started', () => ({ isFitRunning: false, fitProgress: null }), { history: false });
      if (built) messagePost('error', `The joint fit was not started: ${built.message}`);
      else messagePost('info', 'The fit was cancelled.');
      return;
    }
    const model = s.model;
    run = async (signal, onProgress) => {
      const out = await systemRunner(built.input, signal, onProgress);
      return out.ok ? { ok: true, result: systemFitAsFitResult(out.result, model) } : out;
    };
  } else {
    const input = fitInputOf(s);
    run = (signal, onProgress) => runner(input, signal, onProgress);
  }
  benchUpdate('fit start', () => ({ isFitRunning: true, fitProgress: null }), { history: false });
  let outcome: FitOutcome;
  try {
    outcome = await run(ctrl.signal, (iteration, chi2) => {
      if (fitAbort === ctrl) benchStore.setState({ fitProgress: { iteration, chi2 } });
    });
  } catch (err) {
    if (fitAbort !== ctrl) return;
    fitAbort = null;
    benchUpdate('fit failed', () => ({ isFitRunning: false, fitProgress: null }), { history: false });
    if ((err as Error).name === 'AbortError') messagePost('info', 'The fit was cancelled.');
    else messagePost('error', `The fit could not run: ${(err as Error).message}`);
    return;
  }
  if (fitAbort !== ctrl) return;
  fitAbort = null;
  benchUpdate(
    'fit done',
    () => ({
      isFitRunning: false,
      fitProgress: null,
      fitOutcome: outcome,
      fitLineIds: ids,
      fitFinishedAt: new Date().toISOString(),
      isFitAccepted: false,
    }),
    { history: false },
  );
  messagePost(outcome.ok ? (outcome.result.warnings.length ? 'warning' : 'info') : 'error', fitOutcomeSummary(outcome));
}

/** Cancel the running fit (terminates the worker). */
export function fitCancel(): void {
  fitAbort?.abort();
}

/**
 * Copy fitted values into a model (only the constants, so edits to temperature or limits made
 * since the fit started survive).
 * @param model current model
 * @param parameters fit result parameters by key "side.name"
 */
export function modelWithFitted(model: BandModel, parameters: Record<string, { value: number }>): BandModel {
  const lower = { ...model.lower };
  const upper = { ...model.upper };
  for (const [key, p] of Object.entries(parameters)) {
    const k = fitKeyParse(key);
    if (k) (k.side === 'lower' ? lower : upper)[k.name as ParameterName] = p.value;
  }
  return { ...model, lower, upper };
}

/** Accept the last fit's constants into the model (ladders move); one undo step. */
export function fitAccept(): void {
  const s = benchStore.getState();
  if (!s.fitOutcome?.ok) return;
  const params = s.fitOutcome.result.parameters;
  if (s.system) {
    const system = systemWithFitted(s.system, s.systemFloated, s.systemTies, params);
    benchUpdate(
      'accept fitted constants',
      (st) => ({ ...systemViewFields({ ...st, system }), system, systemBeforeAccept: st.system, isFitAccepted: true }),
      { history: true, extraKeys: ['systemBeforeAccept', 'isFitAccepted'] },
    );
    return;
  }
  benchUpdate(
    'accept fitted constants',
    (st) => ({ model: modelWithFitted(st.model, params), modelBeforeAccept: st.model, isFitAccepted: true }),
    {
      history: true,
    },
  );
}

/** Go back to the model in force before the fitted constants were accepted; one undo step. */
export function fitRevert(): void {
  const s = benchStore.getState();
  if (s.system && s.systemBeforeAccept) {
    const system = s.systemBeforeAccept;
    benchUpdate(
      'keep previous constants',
      (st) => ({ ...systemViewFields({ ...st, system }), system, systemBeforeAccept: null, isFitAccepted: false }),
      { history: true, extraKeys: ['systemBeforeAccept', 'isFitAccepted'] },
    );
    return;
  }
  if (!s.modelBeforeAccept) return;
  benchUpdate(
    'keep previous constants',
    (st) => ({ model: st.modelBeforeAccept ?? st.model, modelBeforeAccept: null, isFitAccepted: false }),
    {
      history: true,
    },
  );
}

/**
 * Apply a refused fit's suggestion: fix the keys it names (one undo step), then fit again.
 * @param runner as for fitStart
 */
export async function fitApplySuggestion(
  runner: typeof solverFit = solverFit,
  systemRunner: typeof solverSystemFit = solverSystemFit,
): Promise<void> {
  const s = benchStore.getState();
  if (!s.fitOutcome || s.fitOutcome.ok) return;
  const fix = new Set(s.fitOutcome.error.fixSuggested);
  if (fix.size === 0) return;
  if (s.system) {
    // Several bands: the suggestion names system keys ("LB-7/v3.B").
    benchUpdate(
      `fix ${[...fix].join(', ')}`,
      (st) => {
        const systemFloated = st.systemFloated.filter((k) => !fix.has(k));
        return { systemFloated, floated: systemViewFields({ ...st, systemFloated }).floated };
      },
      { history: true },
    );
  } else benchUpdate(`fix ${[...fix].join(', ')}`, (st) => ({ floated: st.floated.filter((k) => !fix.has(k)) }), { history: true });
  await fitStart(runner, systemRunner);
}
