/**
 * Mapping between the store and a ProjectSession (the project file's and the autosave's content).
 */
import type { ProjectSession } from '../io/projectFile';
import type { TraceImportOptions } from '../io/traceImportOptions';
import { assignmentsSliceInitial } from './assignmentsSlice';
import { fitSliceInitial } from './fitSlice';
import { modelSliceInitial } from './modelSlice';
import { spectrumSliceInitial, type TraceSource } from './spectrumSlice';
import type { BenchState } from './store';
import { systemBandEntries, systemFloatedToView } from './systemBands';
import { systemSliceInitial } from './systemSlice';
import { viewSliceInitial, type BenchTab, type TableQuery } from './viewSlice';

/** Everything worth saving from the store. */
export function sessionOf(s: BenchState): ProjectSession {
  return {
    model: s.model,
    floated: s.floated,
    modelName: s.modelName,
    massAmu: s.massAmu,
    massSource: s.massSource,
    lorentzHwhmCm1: s.lorentzHwhmCm1,
    minIntensity: s.minIntensity,
    symmetry: s.symmetry,
    trace: s.trace,
    traceReport: s.traceReport,
    traceSource: s.traceSource,
    importOverrides: s.importOverrides as Record<string, unknown>,
    peakMinSnr: s.peakMinSnr,
    peakBaseline: s.peakBaseline,
    assignments: s.assignments,
    nextAssignmentNumber: s.nextAssignmentNumber,
    farToleranceCm1: s.farToleranceCm1,
    fit: {
      outcome: s.fitOutcome,
      lineIds: s.fitLineIds,
      finishedAt: s.fitFinishedAt,
      modelBeforeAccept: s.modelBeforeAccept,
      isAccepted: s.isFitAccepted,
    },
    view: {
      xRange: s.xRange,
      ordinate: s.ordinate,
      hiddenRows: s.hiddenRows,
      showSimulated: s.showSimulated,
      showObsMinusSim: s.showObsMinusSim,
      showPeaks: s.showPeaks,
      theme: s.theme,
      tab: s.tab,
      loomisSeriesKey: s.loomisSeriesKey,
      loomisHalfWidthCm1: s.loomisHalfWidthCm1,
      combinationState: s.combinationState,
      tableQuery: s.tableQuery as unknown as Record<string, unknown>,
    },
    system: s.system
      ? { model: s.system, floated: s.systemFloated, ties: s.systemTies, activeBandKey: s.activeBandKey, hiddenBands: s.hiddenBands }
      : null,
  };
}

const TABS: BenchTab[] = [
  'assignments',
  'solve',
  'combination',
  'loomis',
  'levels',
  'export',
  'import',
  'calibration',
  'assistant',
  'contour',
];

/**
 * Store fields for a (possibly partial) session; absent fields take their initial values.
 * Undo history, messages and running jobs are not part of a session and are reset.
 */
export function stateFromSession(p: Partial<ProjectSession> & { model: ProjectSession['model'] }): Partial<BenchState> {
  const m = modelSliceInitial();
  const sp = spectrumSliceInitial();
  const a = assignmentsSliceInitial();
  const f = fitSliceInitial();
  const v = viewSliceInitial();
  const pv: Partial<ProjectSession['view']> = p.view ?? {};
  const nextNumber = Math.max(
    p.nextAssignmentNumber ?? 1,
    1 + Math.max(0, ...(p.assignments ?? []).map((x) => Number(/^a(\d+)$/.exec(x.id)?.[1] ?? 0))),
  );
  return {
    model: p.model,
    floated: p.floated ?? m.floated,
    modelName: p.modelName ?? m.modelName,
    massAmu: p.massAmu ?? m.massAmu,
    // A project without the field (older files) kept a mass it had from somewhere: count it as set.
    massSource: p.massSource ?? (p.massAmu !== undefined ? 'file' : m.massSource),
    lorentzHwhmCm1: p.lorentzHwhmCm1 ?? m.lorentzHwhmCm1,
    minIntensity: p.minIntensity ?? m.minIntensity,
    symmetry: p.symmetry ?? null,
    trace: p.trace ?? null,
    traceReport: p.traceReport ?? null,
    traceSource: (p.traceSource as TraceSource | undefined) ?? (p.trace ? 'project' : 'none'),
    importOverrides: (p.importOverrides as Partial<TraceImportOptions> | undefined) ?? sp.importOverrides,
    peakMinSnr: p.peakMinSnr ?? sp.peakMinSnr,
    peakBaseline: p.peakBaseline ?? sp.peakBaseline,
    traceImport: null,
    assignments: p.assignments ?? [],
    nextAssignmentNumber: nextNumber,
    farToleranceCm1: p.farToleranceCm1 ?? a.farToleranceCm1,
    selectedAssignmentId: null,
    cursor: null,
    candidateTarget: null,
    isFitRunning: false,
    fitProgress: null,
    fitOutcome: p.fit?.outcome ?? f.fitOutcome,
    fitLineIds: p.fit?.lineIds ?? f.fitLineIds,
    fitFinishedAt: p.fit?.finishedAt ?? f.fitFinishedAt,
    modelBeforeAccept: p.fit?.modelBeforeAccept ?? null,
    isFitAccepted: p.fit?.isAccepted ?? false,
    xRange: pv.xRange ?? null,
    ordinate: pv.ordinate ?? v.ordinate,
    hiddenRows: pv.hiddenRows ?? v.hiddenRows,
    showSimulated: pv.showSimulated ?? v.showSimulated,
    showObsMinusSim: pv.showObsMinusSim ?? v.showObsMinusSim,
    showPeaks: pv.showPeaks ?? v.showPeaks,
    theme: pv.theme ?? v.theme,
    tab: TABS.includes(pv.tab as BenchTab) ? (pv.tab as BenchTab) : v.tab,
    loomisSeriesKey: pv.loomisSeriesKey ?? null,
    loomisHalfWidthCm1: pv.loomisHalfWidthCm1 ?? v.loomisHalfWidthCm1,
    combinationState: pv.combinationState ?? v.combinationState,
    tableQuery: { ...v.tableQuery, ...(pv.tableQuery as Partial<TableQuery> | undefined) },
    ...systemFieldsOf(p),
    past: [],
    future: [],
  };
}

/**
 * The several-band fields of a session: its system when it has one whose active band has a
 * single-band view (the active band's view then becomes `model`), else a single-band session.
 */
function systemFieldsOf(p: Partial<ProjectSession> & { model: ProjectSession['model'] }): Partial<BenchState> {
  const ps = p.system;
  if (!ps) return systemSliceInitial();
  const entries = systemBandEntries(ps.model);
  const active = entries.find((e) => e.key === ps.activeBandKey && e.view) ?? entries.find((e) => e.view);
  if (!active?.view) return systemSliceInitial();
  return {
    system: ps.model,
    systemFloated: ps.floated,
    systemTies: ps.ties,
    activeBandKey: active.key,
    hiddenBands: ps.hiddenBands.filter((k) => entries.some((e) => e.key === k)),
    systemBeforeAccept: null,
    model: active.view,
    floated: systemFloatedToView(ps.model, ps.floated, active),
  };
}
