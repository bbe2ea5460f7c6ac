/**
 * View actions: zoom, pan, toggles, panels, theme. None of them enters undo history.
 */
import { benchUpdate } from './actionsCore';
import type { BenchState } from './store';
import type { BenchTab, TableQuery } from './viewSlice';

/**
 * Set the visible wavenumber range (null = whole trace).
 * @param range [from, to] in cm^-1, from < to
 */
export function viewSetXRange(range: [number, number] | null): void {
  if (range && !(range[1] > range[0] && Number.isFinite(range[0]) && Number.isFinite(range[1]))) return;
  benchUpdate('zoom', () => ({ xRange: range }), { history: false });
}

/**
 * Zoom to a window around a position.
 * @param centreCm1 cm^-1
 * @param halfWidthCm1 cm^-1 (> 0)
 */
export function viewZoomTo(centreCm1: number, halfWidthCm1: number): void {
  viewSetXRange([centreCm1 - halfWidthCm1, centreCm1 + halfWidthCm1]);
}

/**
 * Pan (keeping the width) so a position is inside the middle 80 % of the visible range; does
 * nothing when it already is or when the whole trace is shown.
 * @param positionCm1 cm^-1
 */
export function viewEnsureVisible(positionCm1: number): void {
  benchUpdate(
    'pan',
    (s) => {
      const r = s.xRange;
      if (!r) return {};
      const w = r[1] - r[0];
      if (positionCm1 > r[0] + 0.1 * w && positionCm1 < r[1] - 0.1 * w) return {};
      return { xRange: [positionCm1 - w / 2, positionCm1 + w / 2] as [number, number] };
    },
    { history: false },
  );
}

type BooleanViewField = 'showSimulated' | 'showObsMinusSim' | 'showPeaks' | 'isHelpOpen';

/** Switch a boolean view setting. */
export function viewSet(field: BooleanViewField, value: boolean): void {
  benchUpdate(field, () => ({ [field]: value }) as Partial<BenchState>, { history: false });
}

/** Show the trace as absorbance or transmittance. */
export function viewSetOrdinate(ordinate: 'absorbance' | 'transmittance'): void {
  benchUpdate('ordinate', () => ({ ordinate }), { history: false });
}

/** Light or dark theme. */
export function viewSetTheme(theme: 'light' | 'dark'): void {
  benchUpdate('theme', () => ({ theme }), { history: false });
}

/** Show a tab of the lower panel. */
export function viewSetTab(tab: BenchTab): void {
  benchUpdate('tab', () => ({ tab }), { history: false });
}

/** Show or hide one ladder row ("r:3"). */
export function viewSetRowHidden(rowKey: string, isHidden: boolean): void {
  benchUpdate(
    'ladder rows',
    (s) => {
      const has = s.hiddenRows.includes(rowKey);
      if (has === isHidden) return {};
      return { hiddenRows: isHidden ? [...s.hiddenRows, rowKey] : s.hiddenRows.filter((k) => k !== rowKey) };
    },
    { history: false },
  );
}

/** Hide exactly these rows (empty = show all). */
export function viewSetHiddenRows(rowKeys: readonly string[]): void {
  benchUpdate('ladder rows', () => ({ hiddenRows: [...rowKeys] }), { history: false });
}

/** Change the assignments table's sort or filter. */
export function viewSetTableQuery(patch: Partial<TableQuery>): void {
  benchUpdate('table query', (s) => ({ tableQuery: { ...s.tableQuery, ...patch } }), { history: false });
}

/**
 * Choose the Loomis–Wood series (ladder key), strip half width (cm^-1, > 0) and/or, with several
 * bands, the band shown ("species/band"; null follows the panels' band).
 */
export function viewSetLoomis(patch: { seriesKey?: string | null; halfWidthCm1?: number; bandKey?: string | null }): void {
  benchUpdate(
    'loomis-wood',
    (s) => ({
      loomisBandKey: patch.bandKey !== undefined ? patch.bandKey : s.loomisBandKey,
      loomisSeriesKey: patch.seriesKey !== undefined ? patch.seriesKey : s.loomisSeriesKey,
      loomisHalfWidthCm1: patch.halfWidthCm1 !== undefined && patch.halfWidthCm1 > 0 ? patch.halfWidthCm1 : s.loomisHalfWidthCm1,
    }),
    { history: false },
  );
}

/** Which state's combination differences to show. */
export function viewSetCombinationState(state: 'lower' | 'upper'): void {
  benchUpdate('combination state', () => ({ combinationState: state }), { history: false });
}
