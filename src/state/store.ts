/**
 * The one workbench store, built from slices. State only: actions are module-level functions
 * (actions*.ts) that call `benchStore.setState`, so components, worker callbacks and tests use them
 * without a hook.
 */
import { create } from 'zustand';
import { createAnalysisSlice, type AnalysisSlice } from './analysisSlice';
import { createAssignmentsSlice, type AssignmentsSlice } from './assignmentsSlice';
import { createAssistantSlice, type AssistantSlice } from './assistantSlice';
import { createContourSlice, type ContourSlice } from './contourSlice';
import { createFitSlice, type FitSlice } from './fitSlice';
import { createHistorySlice, type HistorySlice } from './history';
import { createModelSlice, type ModelSlice } from './modelSlice';
import { createSpectrumSlice, type SpectrumSlice } from './spectrumSlice';
import { createSystemSlice, type SystemSlice } from './systemSlice';
import { createViewSlice, type ViewSlice } from './viewSlice';

/** The whole workbench state. */
export type BenchState = SpectrumSlice &
  ModelSlice &
  AssignmentsSlice &
  FitSlice &
  ViewSlice &
  HistorySlice &
  AnalysisSlice &
  AssistantSlice &
  ContourSlice &
  SystemSlice;

/** The store hook (`useBench(s => s.x)`) with getState/setState/subscribe/getInitialState. */
export const useBench = create<BenchState>()((...a) => ({
  ...createSpectrumSlice(...a),
  ...createModelSlice(...a),
  ...createAssignmentsSlice(...a),
  ...createFitSlice(...a),
  ...createViewSlice(...a),
  ...createHistorySlice(...a),
  ...createAnalysisSlice(...a),
  ...createAssistantSlice(...a),
  ...createContourSlice(...a),
  ...createSystemSlice(...a),
}));

/** The same store, for non-React callers. */
export const benchStore = useBench;

/** Reset everything to the initial state (tests, "new session"). */
export function benchReset(): void {
  benchStore.setState(benchStore.getInitialState(), true);
}
