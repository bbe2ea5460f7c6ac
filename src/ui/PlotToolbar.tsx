/** Controls above the plot: ordinate, overlays, peak threshold, keyboard-walk tolerance, zoom out, typed range, ladder rows. */
import { memo, useMemo, useState, type KeyboardEvent } from 'react';
import { walkToleranceSet } from '../state/actionsAssign';
import { benchUpdate } from '../state/actionsCore';
import { viewSet, viewSetHiddenRows, viewSetOrdinate, viewSetRowHidden, viewSetXRange } from '../state/actionsView';
import type { Ladder } from '../physics/bandLadders';
import { selectPeaks } from '../state/selectors';
import { useBench } from '../state/store';
import { ladderRowsBuild } from './plot/ladderGeometry';
import { ladderColour } from './plot/plotColours';
import { NumberField } from './NumberField';

/** Text of a range end in the fields (3 decimals: 0.001 cm⁻¹ is finer than a line's width here). */
const rangeText = (v: number) => v.toFixed(3);

/**
 * Two fields to type the x range to zoom to (cm⁻¹); Enter or "Zoom" applies them. They show the
 * visible range while not being edited. A range that is not two increasing numbers is refused in words.
 */
function XRangeFields() {
  const xRange = useBench((s) => s.xRange);
  const trace = useBench((s) => s.trace);
  const shown: [number, number] | null =
    xRange ??
    (trace && trace.wavenumberCm1.length > 1 ? [trace.wavenumberCm1[0], trace.wavenumberCm1[trace.wavenumberCm1.length - 1]] : null);
  const [draft, setDraft] = useState<[string, string] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const from = draft ? draft[0] : shown ? rangeText(shown[0]) : '';
  const to = draft ? draft[1] : shown ? rangeText(shown[1]) : '';
  const apply = () => {
    const a = Number(from.trim() === '' ? NaN : from);
    const b = Number(to.trim() === '' ? NaN : to);
    if (!Number.isFinite(a) || !Number.isFinite(b)) {
      setError('type two numbers in cm⁻¹');
      return;
    }
    if (!(b > a)) {
      setError(`"to" must be above "from" (${a} to ${b} cm⁻¹)`);
      return;
    }
    setError(null);
    setDraft(null);
    viewSetXRange([a, b]);
  };
  const edit = (i: 0 | 1, v: string) => setDraft(i === 0 ? [v, to] : [from, v]);
  const onKey = (e: KeyboardEvent<HTMLInputElement>) => {
    e.stopPropagation();
    if (e.key === 'Enter') apply();
    if (e.key === 'Escape') {
      setDraft(null);
      setError(null);
    }
  };
  return (
    <form
      className={`x-range ${error ? 'invalid' : ''}`}
      aria-label="Zoom to a wavenumber range"
      onSubmit={(e) => {
        e.preventDefault();
        apply();
      }}
    >
      <label>
        <span className="visually-hidden">Zoom from (cm⁻¹)</span>
        <input
          type="text"
          inputMode="decimal"
          value={from}
          onChange={(e) => edit(0, e.target.value)}
          onKeyDown={onKey}
          data-testid="x-from"
        />
      </label>
      <span aria-hidden="true">–</span>
      <label>
        <span className="visually-hidden">Zoom to (cm⁻¹)</span>
        <input type="text" inputMode="decimal" value={to} onChange={(e) => edit(1, e.target.value)} onKeyDown={onKey} data-testid="x-to" />
      </label>
      <button type="submit" data-testid="x-zoom" title="Zoom to this range (or press Enter in a field)">
        cm⁻¹ ↵
      </button>
      {error && (
        <span className="field-error" role="alert">
          {error}
        </span>
      )}
    </form>
  );
}

// Memoised: it reads the store itself, so the plot's re-render on every click does not render it again.
export const PlotToolbar = memo(function PlotToolbar({ rows: ladders }: { rows: Ladder[] }) {
  const ordinate = useBench((s) => s.ordinate);
  const showSimulated = useBench((s) => s.showSimulated);
  const showObsMinusSim = useBench((s) => s.showObsMinusSim);
  const showPeaks = useBench((s) => s.showPeaks);
  const peakMinSnr = useBench((s) => s.peakMinSnr);
  const peakBaseline = useBench((s) => s.peakBaseline);
  const walkTolerance = useBench((s) => s.walkToleranceSigma);
  const peakCount = useBench((s) => selectPeaks(s).peaks?.count ?? 0);
  const peakError = useBench((s) => selectPeaks(s).error);
  const hasTrace = useBench((s) => s.trace !== null);
  const hiddenRows = useBench((s) => s.hiddenRows);
  const shape = useBench((s) => s.model.shape);
  const isDark = useBench((s) => s.theme === 'dark');
  const [isRowsOpen, setRowsOpen] = useState(false);
  const allRows = useMemo(() => ladderRowsBuild(ladders, shape), [ladders, shape]);
  const hidden = new Set(hiddenRows);
  const rowKeys = allRows.map((r) => r.key);
  const keysUpTo = (k: number) => rowKeys.filter((key) => Number(key.split(':')[1]) > k);

  return (
    <div className="plot-toolbar" role="toolbar" aria-label="Plot settings">
      <label>
        <span className="visually-hidden">Ordinate</span>
        <select value={ordinate} onChange={(e) => viewSetOrdinate(e.target.value as 'absorbance' | 'transmittance')}>
          <option value="transmittance">Transmittance</option>
          <option value="absorbance">Absorbance</option>
        </select>
      </label>
      <label className="check">
        <input type="checkbox" checked={showPeaks} onChange={(e) => viewSet('showPeaks', e.target.checked)} /> Peaks (
        {peakCount.toLocaleString('en')})
      </label>
      <NumberField
        label="min SNR"
        className="narrow"
        value={peakMinSnr}
        onCommit={(v) => {
          if (!(v >= 1 && v <= 1000)) return 'SNR threshold must be between 1 and 1000';
          benchUpdate('peak threshold', () => ({ peakMinSnr: v }), { history: false });
          return null;
        }}
      />
      <label className="check" title="Subtract a smooth baseline before finding peaks">
        <input
          type="checkbox"
          checked={peakBaseline}
          onChange={(e) => benchUpdate('peak baseline', () => ({ peakBaseline: e.target.checked }), { history: false })}
        />{' '}
        Baseline
      </label>
      <NumberField
        label="A-key walk ±σ"
        className="narrow"
        value={walkTolerance}
        testId="walk-tolerance"
        onCommit={(v) => walkToleranceSet(v)}
      />
      <label className="check">
        <input
          type="checkbox"
          checked={showSimulated}
          onChange={(e) => viewSet('showSimulated', e.target.checked)}
          data-testid="toggle-sim"
        />{' '}
        Simulated
      </label>
      <label className="check">
        <input
          type="checkbox"
          checked={showObsMinusSim}
          disabled={!hasTrace}
          onChange={(e) => viewSet('showObsMinusSim', e.target.checked)}
        />{' '}
        obs − sim
      </label>
      <XRangeFields />
      <button type="button" onClick={() => viewSetXRange(null)} title="Show the whole trace (double-click the plot does the same)">
        Zoom out
      </button>
      <div className="rows-menu">
        <button type="button" aria-expanded={isRowsOpen} aria-controls="ladder-rows" onClick={() => setRowsOpen(!isRowsOpen)}>
          Ladders ({allRows.length - allRows.filter((r) => hidden.has(r.key)).length}/{allRows.length}) ▾
        </button>
        {isRowsOpen && (
          <div id="ladder-rows" className="rows-popover" role="group" aria-label="Ladder rows shown">
            <div className="rows-quick">
              <button type="button" onClick={() => viewSetHiddenRows([])}>
                All
              </button>
              <button type="button" onClick={() => viewSetHiddenRows(rowKeys)}>
                None
              </button>
              <button type="button" onClick={() => viewSetHiddenRows(keysUpTo(4))}>
                K″ ≤ 4
              </button>
              <button type="button" onClick={() => viewSetHiddenRows(keysUpTo(8))}>
                K″ ≤ 8
              </button>
              <button type="button" onClick={() => setRowsOpen(false)} aria-label="Close ladder list">
                ✕
              </button>
            </div>
            <div className="rows-list">
              {allRows.map((r) => (
                <label key={r.key} className="check row-check">
                  <input type="checkbox" checked={!hidden.has(r.key)} onChange={(e) => viewSetRowHidden(r.key, !e.target.checked)} />
                  <span className="swatch" style={{ background: ladderColour(r.deltaK, r.kLower, isDark) }} aria-hidden="true" />
                  {r.name}
                  <span className="muted">{r.ladders.map((l) => l.label).join(' ')}</span>
                </label>
              ))}
            </div>
          </div>
        )}
      </div>
      {peakError && (
        <span className="inline-error" role="status">
          Peak finding failed: {peakError}
        </span>
      )}
    </div>
  );
});
