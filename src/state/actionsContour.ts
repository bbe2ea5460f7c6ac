/**
 * Actions of the unresolved-band tab: region and instrument, band-shape diagnosis and the starting
 * model built from it, the contour fit in its worker (progress, cancel), the Q-branch analysis and
 * the low-resolution demo. Computation lives in analysis/ and fit/; these only read the store, call
 * it and write the results back.
 */
import { bandShapeStartModel } from '../analysis/bandShapeStartModel';
import { qBranchAssign, qBranchFind } from '../analysis/qBranchFind';
import { contourDefaultFloat } from '../fit/contourFit';
import { qBranchFit } from '../fit/qBranchFit';
import { modelFileParse } from '../io/modelFile';
import type { ApodizationName } from '../physics/instrumentLineShape';
import { bandShapeClassifyRun, classifyInputOf, contourFitRun, traceRegion } from '../workers/contourClient';
import { benchUpdate, messagePost } from './actionsCore';
import { traceOpenAsking } from './actionsImport';
import { modelReplace } from './actionsModel';
import { confirmAsk } from './actionsSession';
import { contourSliceInitial, type ContourFitState, type ContourQMaximum, type ContourRefineState } from './contourSlice';
import { benchStore } from './store';

const set = (patch: Parameters<typeof benchUpdate>[1]) => benchUpdate('unresolved band', patch, { history: false });

/** The region analysed: the one set, else the whole trace; null without a trace. */
export function contourRegionOf(): [number, number] | null {
  const s = benchStore.getState();
  if (s.contourRegion) return s.contourRegion;
  const x = s.trace?.wavenumberCm1;
  return x && x.length > 1 ? [x[0], x[x.length - 1]] : null;
}

/**
 * Set the region (cm^-1); null = the whole trace. Refuses, with a message, an empty or inverted one.
 * @returns null when set, else what is wrong
 */
export function contourSetRegion(region: [number, number] | null): string | null {
  if (region && !(Number.isFinite(region[0]) && Number.isFinite(region[1]) && region[1] > region[0])) {
    return `the region needs "to" greater than "from", got ${region[0]} … ${region[1]} cm⁻¹`;
  }
  set(() => ({ contourRegion: region }));
  return null;
}

/** Take the main plot's visible range as the region. */
export function contourRegionFromView(): void {
  const r = benchStore.getState().xRange;
  if (!r) messagePost('info', 'The plot shows the whole trace: zoom in on the band first, or type the region.');
  contourSetRegion(r);
}

/**
 * Set the spectrometer's maximum optical path difference (cm, > 0).
 * @returns null when set, else what is wrong
 */
export function contourSetOpd(opdCm: number): string | null {
  if (!(opdCm > 0) || !Number.isFinite(opdCm)) return `the optical path difference must be a number > 0 cm, got ${opdCm}`;
  set(() => ({ contourOpdCm: opdCm }));
  return null;
}

/** Set the apodization. */
export function contourSetApodization(name: ApodizationName): void {
  set(() => ({ contourApodization: name }));
}

let diagnoseAbort: AbortController | null = null;
let refineAbort: AbortController | null = null;

/**
 * Diagnose the band shape of the region at the model's temperature, in the contour worker (a heavy
 * parallel band's envelope fits took 300 ms of the page's main thread). A diagnosis already running
 * is replaced; a running contour fit goes on. The diagnosis shown stays until the new one arrives.
 */
export async function contourDiagnose(): Promise<void> {
  const s = benchStore.getState();
  const region = contourRegionOf();
  if (!s.trace || !region) {
    set(() => ({ contourDiagnosis: null, contourDiagnosisError: 'Load a trace first.' }));
    return;
  }
  diagnoseAbort?.abort();
  refineAbort?.abort();
  const ctrl = new AbortController();
  diagnoseAbort = ctrl;
  set(() => ({ contourDiagnosing: true }));
  try {
    const d = await bandShapeClassifyRun(
      classifyInputOf(s.trace, region[0], region[1], { temperatureK: s.model.temperatureK }),
      ctrl.signal,
    );
    // A diagnosis of a trace no longer open is dropped.
    if (benchStore.getState().trace !== s.trace) return;
    // A diagnosis through the instrument stopped by this one is forgotten with the diagnosis it refined.
    set(() => ({ contourDiagnosis: d, contourDiagnosisError: null, contourRefine: contourSliceInitial().contourRefine }));
  } catch (err) {
    if ((err as Error).name !== 'AbortError')
      set(() => ({ contourDiagnosis: null, contourDiagnosisError: (err as Error).message.replace(/^bandShapeClassify: /, '') }));
  } finally {
    if (diagnoseAbort === ctrl) {
      diagnoseAbort = null;
      set(() => ({ contourDiagnosing: false }));
    }
  }
}

/**
 * Diagnose the band shape again through the spectrometer (L and apodization of the tab), in the
 * contour worker with progress and cancel: a series of Q branches then gets its contour fit for B
 * (qSeriesContourB, several seconds). The diagnosis is replaced only when the run ends; cancel leaves it.
 */
export async function contourDiagnoseThroughInstrument(): Promise<void> {
  const s = benchStore.getState();
  const region = contourRegionOf();
  const setRefine = (patch: Partial<ContourRefineState>) => set((st) => ({ contourRefine: { ...st.contourRefine, ...patch } }));
  if (!s.trace || !region) {
    set(() => ({ contourDiagnosis: null, contourDiagnosisError: 'Load a trace first.' }));
    return;
  }
  refineAbort?.abort();
  diagnoseAbort?.abort();
  const ctrl = new AbortController();
  refineAbort = ctrl;
  setRefine({ status: 'running', runsDone: 0, runsPlanned: 0, error: null });
  try {
    const d = await bandShapeClassifyRun(
      classifyInputOf(s.trace, region[0], region[1], {
        temperatureK: s.model.temperatureK,
        opdCm: s.contourOpdCm,
        apodization: s.contourApodization,
        spinWeights: s.model.spinWeights,
      }),
      ctrl.signal,
      (runsDone, runsPlanned) => setRefine({ runsDone, runsPlanned }),
    );
    if (refineAbort === ctrl) refineAbort = null;
    if (benchStore.getState().trace === s.trace) set(() => ({ contourDiagnosis: d, contourDiagnosisError: null }));
    setRefine({ status: 'idle' });
  } catch (err) {
    if (refineAbort === ctrl) refineAbort = null;
    if ((err as Error).name === 'AbortError') setRefine({ status: 'cancelled', error: null });
    else setRefine({ status: 'error', error: (err as Error).message.replace(/^bandShapeClassify: /, '') });
  }
}

/** Cancel the running diagnosis through the instrument (its worker is terminated; the diagnosis stays). */
export function contourDiagnoseCancel(): void {
  refineAbort?.abort();
  refineAbort = null;
}

/**
 * Replace the model by a starting model built from the diagnosis, after asking; one undo step.
 * @returns true when replaced
 */
export async function contourApplyStartModel(): Promise<boolean> {
  const s = benchStore.getState();
  const d = s.contourDiagnosis;
  if (!d) return false;
  const { model, changes } = bandShapeStartModel(d, s.model);
  const choice = await confirmAsk({
    title: 'Replace the model by a starting model from the band shape?',
    text: `Changes: ${changes.join('; ')}. Everything else is kept. Undo brings the current model back.`,
    choices: [{ id: 'replace', label: 'Replace the model' }],
  });
  if (choice !== 'replace') return false;
  const floated = contourDefaultFloat(model);
  modelReplace({ model, floated, name: s.modelName, massAmu: s.massAmu }, 'starting model from the band shape');
  messagePost('info', `Starting model from the band shape: ${changes.join('; ')}. Undo brings the previous model back.`);
  return true;
}

let fitAbort: AbortController | null = null;

/** Run the contour fit of the region in the worker (the model's floated constants among those the contour determines). */
export async function contourFitStart(): Promise<void> {
  const s = benchStore.getState();
  const region = contourRegionOf();
  const setFit = (patch: Partial<ContourFitState>) => set((st) => ({ contourFit: { ...st.contourFit, ...patch } }));
  if (!s.trace || !region) {
    setFit({ status: 'error', error: 'Load a trace first.', result: null });
    return;
  }
  fitAbort?.abort();
  const ctrl = new AbortController();
  fitAbort = ctrl;
  const determinable = contourDefaultFloat(s.model);
  const float = [...determinable.filter((k) => s.floated.includes(k) || k === 'upper.origin'), 'scale'];
  setFit({ status: 'running', stage: 0, iteration: 0, rms: NaN, error: null });
  try {
    const result = await contourFitRun(
      {
        model: s.model,
        ...traceRegion(s.trace, region[0], region[1]),
        fromCm1: region[0],
        toCm1: region[1],
        opdCm: s.contourOpdCm,
        apodization: s.contourApodization,
        massAmu: s.massAmu,
        float,
      },
      ctrl.signal,
      (stage, iteration, rms) => setFit({ stage, iteration, rms }),
    );
    if (fitAbort === ctrl) fitAbort = null;
    setFit({ status: 'done', result, error: null, trace: s.trace });
  } catch (err) {
    if (fitAbort === ctrl) fitAbort = null;
    if ((err as Error).name === 'AbortError') setFit({ status: 'cancelled', error: null });
    else setFit({ status: 'error', error: (err as Error).message.replace(/^contourFit: /, '') });
  }
}

/** Cancel the running contour fit (its worker is terminated). */
export function contourFitCancel(): void {
  fitAbort?.abort();
  fitAbort = null;
}

/**
 * Put the fitted constants into the model (one undo step).
 */
export function contourFitAccept(): void {
  const r = benchStore.getState().contourFit.result;
  if (!r) return;
  benchUpdate(
    'accept the contour fit',
    (st) => {
      const model = structuredClone(st.model);
      for (const [key, p] of Object.entries(r.parameters)) {
        if (p.fixed) continue;
        const [side, name] = key.split('.') as ['upper' | 'lower', keyof typeof model.upper];
        if ((side === 'upper' || side === 'lower') && name in model[side]) model[side][name] = p.value;
      }
      return { model };
    },
    { history: true },
  );
  messagePost('info', 'The contour fit’s constants are now the model’s; Undo brings the previous ones back.');
}

/** Find the Q-branch maxima of the region and propose each one's sub-band index from the model (a guess). */
export function contourQFind(): void {
  const s = benchStore.getState();
  const region = contourRegionOf();
  if (!s.trace || !region) return;
  let maxima;
  try {
    maxima = qBranchFind(s.trace.wavenumberCm1, s.trace.absorbance, region[0], region[1]);
  } catch (err) {
    set(() => ({ contourQMaxima: [], contourQFit: null, contourQFitError: (err as Error).message }));
    return;
  }
  let rows: ContourQMaximum[] = maxima.map((q) => ({ ...q, m: null, isGuess: false }));
  if (s.model.shape !== 'linear' && s.model.band === 'perpendicular') {
    const assigned = new Map(qBranchAssign(maxima, s.model).map((a) => [a.wavenumberCm1, a]));
    rows = maxima.map((q) => {
      const a = assigned.get(q.wavenumberCm1);
      return { ...q, m: a && !a.isUncertain ? a.m : null, isGuess: !!a && !a.isUncertain };
    });
  }
  set(() => ({
    contourQMaxima: rows,
    contourQFit: null,
    contourQFitError:
      s.model.band === 'perpendicular' && s.model.shape !== 'linear'
        ? null
        : 'The model is not a perpendicular band of a symmetric top, so no index is proposed: give each maximum its index yourself.',
  }));
}

/** Set (or clear, null) the sub-band index of maximum i; it is then the user's, no longer a guess. */
export function contourQSetIndex(i: number, m: number | null): void {
  set((st) => ({
    contourQMaxima: st.contourQMaxima.map((q, j) => (j === i ? { ...q, m, isGuess: false } : q)),
    contourQFit: null,
  }));
}

/** Fit the sub-band quadratic through the maxima that have an index. */
export function contourQFitRun(): void {
  const rows = benchStore.getState().contourQMaxima.filter((q) => q.m !== null);
  try {
    const fit = qBranchFit(rows.map((q) => ({ m: q.m!, wavenumberCm1: q.wavenumberCm1, sigmaCm1: q.sigmaCm1 })));
    set(() => ({ contourQFit: fit, contourQFitError: null }));
  } catch (err) {
    set(() => ({ contourQFit: null, contourQFitError: (err as Error).message.replace(/^qBranchFit: /, '') }));
  }
}

/**
 * Load the low-resolution demo: its trace (asking first when assignments exist), its first-guess
 * model (one undo step) and the instrument it was recorded with.
 */
export async function contourDemoLoad(): Promise<void> {
  const base = import.meta.env?.BASE_URL ?? '/';
  const get = (path: string) =>
    fetch(`${base}${path}`).then(
      (r) => (r.ok ? r : null),
      () => null,
    );
  const [traceRes, modelRes] = await Promise.all([get('demo/lowres-trace.csv'), get('demo/lowres-model.json')]);
  if (!traceRes || !modelRes) {
    messagePost('error', 'The low-resolution demo files (demo/lowres-trace.csv, demo/lowres-model.json) could not be fetched.');
    return;
  }
  const loaded = await traceOpenAsking(await traceRes.blob(), 'demo/lowres-trace.csv');
  if (!loaded) return;
  try {
    const f = modelFileParse(await modelRes.text());
    modelReplace({ ...f, name: f.name ?? 'low-resolution demo model' }, 'load the low-resolution demo model');
  } catch (err) {
    messagePost('error', `The low-resolution demo model could not be read: ${(err as Error).message}`);
  }
  set(() => ({ contourRegion: [1085, 1215], contourOpdCm: 1, contourApodization: 'norton-beer-medium' }));
  messagePost('info', 'Low-resolution demo loaded: L = 1 cm, Norton–Beer medium, region 1085–1215 cm⁻¹.');
}
