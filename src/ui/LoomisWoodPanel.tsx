/** Loomis–Wood diagram of one series: strips of the trace around each predicted rung, stacked by J″; click to assign. */
import { useMemo } from 'react';
import type { PlotMouseEvent } from 'plotly.js';
import { assignNearPosition } from '../state/actionsAssign';
import { viewSetLoomis } from '../state/actionsView';
import { selectAssignmentRows } from '../state/selectors';
import { selectLoomisBand } from '../state/selectorsSystem';
import { selectSystemPrediction } from '../state/systemPredict';
import { benchStore, useBench } from '../state/store';
import { loomisWoodGrid } from './plot/loomisWood';
import { loomisFigure } from './plot/solveTraces';
import { NumberField } from './NumberField';
import { PlotlyChart } from './PlotlyChart';

const BINS = 240;

/** Several bands: which band the view shows (any band, or the panels' band followed). */
function LoomisBandChooser() {
  const entries = useBench((s) => selectSystemPrediction(s)?.entries ?? null);
  const chosen = useBench((s) => s.loomisBandKey);
  const active = useBench((s) => s.activeBandKey);
  if (!entries) return null;
  return (
    <label>
      Band
      <select
        value={chosen ?? ''}
        onChange={(e) => viewSetLoomis({ bandKey: e.target.value === '' ? null : e.target.value, seriesKey: null })}
        data-testid="loomis-band"
      >
        <option value="">the panels' band ({active ?? 'none'})</option>
        {entries.map((e) => (
          <option key={e.key} value={e.key} disabled={!e.view} title={e.viewWhyNot ?? undefined}>
            {e.band} ({e.species}){e.view ? '' : ' — no single-band view'}
          </option>
        ))}
      </select>
    </label>
  );
}

export function LoomisWoodPanel() {
  const loomis = useBench(selectLoomisBand);
  const band = loomis.band;
  const trace = useBench((s) => s.trace);
  const seriesKey = useBench((s) => s.loomisSeriesKey);
  const halfWidth = useBench((s) => s.loomisHalfWidthCm1);
  const rows = useBench(selectAssignmentRows);
  const cursor = useBench((s) => s.cursor);
  const isDark = useBench((s) => s.theme === 'dark');
  const cursorKey = cursor
    ? `${'pqr'[cursor.kUpper - cursor.kLower + 1]}:${cursor.kLower}:${'PQR'[cursor.jUpper - cursor.jLower + 1]}`
    : null;
  const strongestKey = useMemo(() => {
    let best: string | null = null;
    let bestI = -1;
    for (const l of band.ladders)
      for (const i of l.lineIndex) {
        if (band.lines.intensity[i] > bestI) {
          bestI = band.lines.intensity[i];
          best = l.key;
        }
      }
    return best;
  }, [band]);
  const key = seriesKey && band.ladderByKey.has(seriesKey) ? seriesKey : (cursorKey ?? strongestKey);
  const ladder = key ? band.ladderByKey.get(key) : undefined;

  // The strips depend on the trace and the series only, so a new assignment redraws the markers
  // without re-binning the trace.
  const grid = useMemo(() => {
    if (!ladder || !trace) return null;
    const centres = Array.from(ladder.lineIndex, (i) => ({ jLower: band.lines.jLower[i], centreCm1: band.lines.wavenumberCm1[i] }));
    return loomisWoodGrid(trace, centres, halfWidth, BINS);
  }, [ladder, trace, halfWidth, band]);
  const marks = useMemo(() => {
    const m = { offsetCm1: [] as number[], jLower: [] as number[], text: [] as string[] };
    if (!ladder) return m;
    const inLadder = new Set(ladder.lineIndex);
    const ref = loomis.ref;
    const activeKey = benchStore.getState().activeBandKey;
    for (const r of rows) {
      // Several bands: only the shown band's rows (a row without a band belongs to the panels' band).
      if (ref && (r.a.band !== undefined && r.a.species !== undefined ? `${r.a.species}/${r.a.band}` : activeKey) !== loomis.key) continue;
      const li = band.indexOf.get(`${r.a.jUpper},${r.a.kUpper},${r.a.jLower},${r.a.kLower}`);
      if (li === undefined || !inLadder.has(li)) continue;
      m.offsetCm1.push(r.a.observedCm1 - band.lines.wavenumberCm1[li]);
      m.jLower.push(r.a.jLower);
      m.text.push(`${r.labelHtml}<br>obs − calc ${r.omcCm1.toExponential(2)} cm⁻¹`);
    }
    return m;
  }, [ladder, rows, band, loomis.ref, loomis.key]);
  const fig = useMemo(() => (grid ? loomisFigure(grid, marks, isDark) : null), [grid, marks, isDark]);

  const onClick = (e: PlotMouseEvent) => {
    const p = e.points?.[0];
    if (!p || !ladder) return;
    const j = Number(p.y);
    const offset = Number(p.x);
    const l = selectLoomisBand(benchStore.getState());
    const b = l.band;
    const li = Array.from(ladder.lineIndex).find((i) => b.lines.jLower[i] === j);
    if (li === undefined) return;
    const q = { jUpper: b.lines.jUpper[li], kUpper: b.lines.kUpper[li], jLower: j, kLower: b.lines.kLower[li], ...(l.ref ?? {}) };
    assignNearPosition(q, b.lines.wavenumberCm1[li] + offset, Math.max(((2 * halfWidth) / BINS) * 4, 0.005));
  };

  return (
    <div className="loomis">
      <div className="panel-row">
        <LoomisBandChooser />
        <label>
          Series
          <select value={key ?? ''} onChange={(e) => viewSetLoomis({ seriesKey: e.target.value })} data-testid="loomis-series">
            {band.ladders.map((l) => (
              <option key={l.key} value={l.key}>
                {l.label} ({l.lineIndex.length} lines)
              </option>
            ))}
          </select>
        </label>
        <NumberField
          label="Half width / cm⁻¹"
          className="narrow"
          value={halfWidth}
          onCommit={(v) => (v > 0 && v <= 50 ? (viewSetLoomis({ halfWidthCm1: v }), null) : 'half width must be between 0 and 50 cm⁻¹')}
        />
        <span className="muted small">
          A correct series lines up on the dotted centre line. Click a line in a strip to assign that strip's J″ to the peak there.
        </span>
      </div>
      {loomis.whyNot && <p className="muted">{loomis.whyNot}</p>}
      {!trace ? (
        <p className="muted">Load a trace to see the Loomis–Wood diagram.</p>
      ) : fig ? (
        <PlotlyChart
          data={fig.data}
          layout={fig.layout}
          onClick={onClick}
          label={`Loomis–Wood diagram of series ${ladder?.label ?? ''}${loomis.ref ? ` of band ${loomis.ref.band} (${loomis.ref.species})` : ''}`}
          className="loomis-plot"
          testId="loomis-plot"
        />
      ) : (
        <p className="muted">No series in the model.</p>
      )}
    </div>
  );
}
