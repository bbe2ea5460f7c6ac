import type { StateCreator } from 'zustand';
import type { BenchState } from './store';

/** A message shown in the page's message area. */
export interface BenchMessage {
  id: number;
  level: 'info' | 'warning' | 'error';
  /** Plain text (may quote file text; always rendered as a text node). */
  text: string;
}

/** A question the page asks before it replaces the user's work (an in-page prompt, never window.confirm). */
export interface ConfirmRequest {
  id: number;
  /** One-line question. */
  title: string;
  /** What happens with each answer (plain text). */
  text: string;
  /** The answers besides "Cancel", first = the default; ids are returned by confirmAsk. */
  choices: { id: string; label: string }[];
}

/** Which tab of the lower panel is shown. */
export type BenchTab =
  'assignments' | 'solve' | 'combination' | 'loomis' | 'levels' | 'export' | 'import' | 'calibration' | 'assistant' | 'contour';

/** Sort and filter of the assignments table. */
export interface TableQuery {
  sortKey: 'label' | 'jLower' | 'kLower' | 'obs' | 'calc' | 'omc' | 'absOmc';
  sortDescending: boolean;
  /** '' for all, else 'P' | 'Q' | 'R'. */
  branch: '' | 'P' | 'Q' | 'R';
  /** K'' to show, null for all. */
  kLower: number | null;
  /** J'' range; null ends are open. */
  jMin: number | null;
  jMax: number | null;
  /** Show only rows with |obs − calc| at least this, cm^-1 (0 for all). */
  minAbsOmcCm1: number;
}

/** Everything about how things are shown (never part of undo). */
export interface ViewSlice {
  /** Visible wavenumber range, cm^-1; null = whole trace. */
  xRange: [number, number] | null;
  /** Trace drawn as absorbance or transmittance. */
  ordinate: 'absorbance' | 'transmittance';
  /** Row keys ("r:3") of hidden ladder rows. */
  hiddenRows: string[];
  showSimulated: boolean;
  showObsMinusSim: boolean;
  showPeaks: boolean;
  theme: 'light' | 'dark';
  isHelpOpen: boolean;
  tab: BenchTab;
  /** Ladder key of the Loomis–Wood series, e.g. "r:2:R". */
  loomisSeriesKey: string | null;
  /** Several bands: the band ("species/band") the Loomis–Wood view shows; null follows the panels' band. */
  loomisBandKey: string | null;
  /** Half width of each Loomis–Wood strip, cm^-1. */
  loomisHalfWidthCm1: number;
  /** State whose combination differences are shown. */
  combinationState: 'lower' | 'upper';
  tableQuery: TableQuery;
  messages: BenchMessage[];
  nextMessageId: number;
  /** The question being asked, or null. */
  confirm: ConfirmRequest | null;
  /** Unit of the rotational constants shown (model panel and fit table); ν₀ stays in cm⁻¹, ζ has none. */
  constantUnit: 'cm-1' | 'MHz';
}

/** Initial view state. */
export function viewSliceInitial(): ViewSlice {
  return {
    xRange: null,
    ordinate: 'transmittance',
    hiddenRows: [],
    showSimulated: false,
    showObsMinusSim: false,
    showPeaks: true,
    theme: 'light',
    isHelpOpen: false,
    tab: 'assignments',
    loomisSeriesKey: null,
    loomisBandKey: null,
    loomisHalfWidthCm1: 0.6,
    combinationState: 'lower',
    tableQuery: { sortKey: 'label', sortDescending: false, branch: '', kLower: null, jMin: null, jMax: null, minAbsOmcCm1: 0 },
    messages: [],
    nextMessageId: 1,
    confirm: null,
    constantUnit: 'cm-1',
  };
}

/** Slice creator (state only). */
export const createViewSlice: StateCreator<BenchState, [], [], ViewSlice> = () => viewSliceInitial();
