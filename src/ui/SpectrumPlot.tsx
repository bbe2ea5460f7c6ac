/**
 * The main plot: trace, peaks, simulated spectrum and the ladders; clicks become assignment
 * actions, zoom/pan becomes the view range (which re-decimates the trace).
 */
import type { Config, PlotRelayoutEvent } from 'plotly.js';
import { useMemo, useRef, useState } from 'react';
import { useShallow } from 'zustand/react/shallow';
import { peakClick, rungClick, traceClickAt } from '../state/actionsAssign';
import { selectProposalMarks } from '../state/actionsAssistant';
import { viewSetXRange } from '../state/actionsView';
import { peakIdAt, peakIdPosition } from '../state/assignLogic';
import { messagePost } from '../state/actionsCore';
import { bandActivate } from '../state/actionsSystem';
import { selectAssignmentRows, selectBand, selectPeaks, selectSimulated, type AssignmentRow } from '../state/selectors';
import { assignmentBandKey, selectAssignmentDrawnLines, selectDrawnBands, type DrawnBands } from '../state/selectorsSystem';
import { benchStore, useBench, type BenchState } from '../state/store';
import { CandidateList } from './CandidateList';
import { BandSwitches } from './BandSwitches';
import { bandRowsBuild } from './plot/bandRows';
import { ladderRowsBuild, type LadderRow } from './plot/ladderGeometry';
import { ladderMarkersUpdate, ladderSceneBuild, type LadderMarkersState } from './plot/ladderScene';
import { rungSymmetryTexts } from './plot/rungSymmetryLabels';
import { peakLayerBase, peakLayerUpdate, type PeakLayerState } from './plot/peakLayer';
import { plotMarks } from './plot/plotMarks';
import { spectrumFigure } from './plot/toTraces';
import { PlotlyChart } from './PlotlyChart';
import { PlotOverlay, type PlotOverlayHandle } from './PlotOverlay';
import { assignmentLevelLabels, lineLevelLabel } from '../state/systemLevelLabels';
import { PlotToolbar } from './PlotToolbar';

let relayoutFrame = 0;
let relayoutRange: [number, number] | null | undefined;

/** The x range a plotly relayout event sets: a range, null for autorange, undefined for none. */
function relayoutRangeOf(e: PlotRelayoutEvent): [number, number] | null | undefined {
  const r = e as Record<string, unknown>;
  if (r['xaxis.autorange']) return null;
  if (r['xaxis.range[0]'] !== undefined && r['xaxis.range[1]'] !== undefined)
    return [Number(r['xaxis.range[0]']), Number(r['xaxis.range[1]'])];
  if (Array.isArray(r['xaxis.range'])) return [Number(r['xaxis.range'][0]), Number(r['xaxis.range'][1])];
  return undefined;
}

/**
 * plotly has moved the x axis itself to this range (a pan or a wheel zoom in progress): the overlay
 * follows. During a box-zoom drag plotly reports the box's prospective range while the plot still
 * shows the old one, so the overlay stays with the plot (it followed the box before, ladders
 * against the wrong trace, and repainted on every pointer move of the drag).
 */
function isAxisMovedTo(el: HTMLElement, range: [number, number]): boolean {
  const live = (el as unknown as { _fullLayout?: { xaxis?: { range?: unknown[] } } })._fullLayout?.xaxis?.range;
  return Array.isArray(live) && Number(live[0]) === range[0] && Number(live[1]) === range[1];
}

// A finished zoom or pan is applied at once (its redraw should not wait a frame); a burst of
// relayouts (scroll zoom) is then applied at most once per animation frame, the last range winning.
function onRelayout(e: PlotRelayoutEvent): void {
  const range = relayoutRangeOf(e);
  if (range === undefined) return;
  if (relayoutFrame) {
    relayoutRange = range;
    return;
  }
  viewSetXRange(range);
  relayoutFrame = requestAnimationFrame(() => {
    relayoutFrame = 0;
    const last = relayoutRange;
    relayoutRange = undefined;
    if (last !== undefined) viewSetXRange(last);
  });
}

/**
 * The main chart's plotly settings: plotly's own double-click (and its "reset axes" button) would
 * restore the range of the first drawing and counts any two clicks within 300 ms anywhere on the
 * chart (a rung, then a peak) as a double-click; the overlay turns a real double-click into
 * "Zoom out" instead.
 */
const SPECTRUM_CONFIG: Partial<Config> = {
  doubleClick: false,
  modeBarButtonsToRemove: ['select2d', 'lasso2d', 'toImage', 'resetScale2d'],
};

function onRungLine(lineIndex: number): void {
  const drawn = selectDrawnBands(benchStore.getState());
  const lines = drawn.lines;
  if (lineIndex < 0 || lineIndex >= lines.count) return;
  const q = {
    jUpper: lines.jUpper[lineIndex],
    kUpper: lines.kUpper[lineIndex],
    jLower: lines.jLower[lineIndex],
    kLower: lines.kLower[lineIndex],
  };
  const e = drawn.entries && drawn.bandOfLine ? drawn.entries[drawn.bandOfLine[lineIndex]] : null;
  if (!e) return rungClick(q);
  // A rung of another band makes that band the active one (its series for the keyboard walk).
  if (!benchStore.getState().candidateTarget) {
    const why = bandActivate(e.key);
    if (why) {
      messagePost('info', `${why}. Click a peak to assign this band's lines from the candidate list.`);
      return;
    }
  }
  const levels = drawn.levels ? assignmentLevelLabels(lineLevelLabel(drawn.levels, lineIndex)) : {};
  rungClick({ ...q, band: e.band, species: e.species, ...levels });
}

/**
 * Observed position of the selected row, cm^-1 (null when none). Run on every store change: the
 * search starts at the end, where a new row (the usual selection) is.
 */
function selectSelectedObservedCm1(s: BenchState): number | null {
  const id = s.selectedAssignmentId;
  if (!id) return null;
  const list = s.assignments;
  for (let i = list.length - 1; i >= 0; i--) if (list[i].id === id) return list[i].observedCm1;
  return null;
}

/** The ladder rows of the drawn bands (several-band session), or null for one band. */
function drawnRows(drawn: DrawnBands, hiddenRows: string[], isDark: boolean): LadderRow[] | null {
  if (!drawn.entries || !drawn.bandLadders) return null;
  const entries = drawn.entries;
  const ladders = drawn.bandLadders;
  const bands = entries
    .map((e, index) => ({ key: e.key, name: e.band, index, shape: e.view?.shape ?? ('prolate' as const), ladders: ladders[index] }))
    .filter((b) => b.ladders.length > 0);
  return bandRowsBuild(bands, hiddenRows, isDark);
}

export function SpectrumPlot() {
  const [size, setSize] = useState({ width: 1000, height: 500 });
  const trace = useBench((s) => s.trace);
  const xRange = useBench((s) => s.xRange);
  const ordinate = useBench((s) => s.ordinate);
  const band = useBench(selectBand);
  const drawn = useBench(selectDrawnBands);
  const activeBandKey = useBench((s) => s.activeBandKey);
  const peaks = useBench((s) => selectPeaks(s).peaks);
  const hiddenRows = useBench((s) => s.hiddenRows);
  const shape = useBench((s) => s.model.shape);
  const rowsA = useBench(selectAssignmentRows);
  const drawnLineOf = useBench(selectAssignmentDrawnLines);
  const selectedObservedCm1 = useBench(selectSelectedObservedCm1);
  const cursor = useBench((s) => s.cursor);
  const candidatePeakCm1 = useBench((s) => s.candidateTarget?.peakCm1 ?? null);
  const { showSimulated, showObsMinusSim, showPeaks } = useBench(
    useShallow((s) => ({ showSimulated: s.showSimulated, showObsMinusSim: s.showObsMinusSim, showPeaks: s.showPeaks })),
  );
  const isDark = useBench((s) => s.theme === 'dark');
  const sim = useBench((s) => (s.showSimulated || s.showObsMinusSim ? selectSimulated(s).sim : null));
  const proposals = useBench(selectProposalMarks);
  const selectedProposalCm1 = useBench((s) => s.assistantProposals.find((p) => p.id === s.assistantSelectedId)?.observedCm1 ?? null);

  const rows = useMemo(
    () => drawnRows(drawn, hiddenRows, isDark) ?? ladderRowsBuild(drawn.ladders, shape, new Set(hiddenRows)),
    [drawn, shape, hiddenRows, isDark],
  );
  // The row chooser lists every row of every drawn band (rows are hidden by ΔK and K″ in all bands at
  // once), not only the active band's: else "None" would leave rows of the other bands drawn.
  const chooserLadders = useMemo(
    () => (drawn.entries ? drawn.ladders.map((l) => ({ ...l, key: l.key.slice(l.key.lastIndexOf('|') + 1) })) : band.ladders),
    [drawn, band.ladders],
  );
  const scene = useMemo(() => ladderSceneBuild(rows, drawn.lines, isDark, drawn.bandOfLine ?? undefined), [rows, drawn, isDark]);
  // Each assignment's band index (its line tag in the scene), −1 when its band is not drawn.
  const tagOf = useMemo(() => {
    const entries = drawn.entries;
    if (!entries) return undefined;
    const indexOfKey = new Map(entries.map((e, i) => [e.key, i]));
    return (r: AssignmentRow) => indexOfKey.get(assignmentBandKey({ activeBandKey }, r.a) ?? '') ?? -1;
  }, [drawn.entries, activeBandKey]);
  // Markers of the table's rows, updated from the previous ones (ladderMarkersUpdate: a new row is
  // placed alone, the others' markers copied as blocks), with the rung of each assignment object kept
  // while the scene and the band index stay. In a several-band session each row's drawn line places
  // its marker instead (the members of a split A1/A2 or s/a pair share J and K).
  const markersLast = useRef<LadderMarkersState | null>(null);
  const rungOfAssignment = useRef(new WeakMap<AssignmentRow['a'], number>());
  // Rows and drawn lines are both parallel to the assignments (until the next render brings both anew).
  const markers = useMemo(() => {
    const lineOf = drawnLineOf && drawnLineOf.length === rowsA.length ? drawnLineOf : null;
    const last = markersLast.current;
    if (last && (last.scene !== scene || last.tagOf !== tagOf)) rungOfAssignment.current = new WeakMap();
    markersLast.current = ladderMarkersUpdate(last, rowsA, scene, tagOf, lineOf, rungOfAssignment.current);
    return markersLast.current.markers;
  }, [rowsA, drawnLineOf, scene, tagOf]);
  const cursorKey = cursor ? `${cursor.jUpper},${cursor.kUpper},${cursor.jLower},${cursor.kLower}` : '';
  const cursorLine = cursor ? (drawn.indexOf.get(drawn.entries ? `${activeBandKey}|${cursorKey}` : cursorKey) ?? -1) : -1;
  const levels = drawn.levels;
  const levelsOf = useMemo(
    () => (levels ? (i: number) => (i >= 0 && i < levels.tagUpper.length ? lineLevelLabel(levels, i) : null) : undefined),
    [levels],
  );
  const rungLabels = useMemo(() => rungSymmetryTexts(levels, drawn.lines.count), [levels, drawn.lines.count]);
  const overlayRef = useRef<PlotOverlayHandle>(null);
  const peakBase = useMemo(
    () => (showPeaks && peaks && trace ? peakLayerBase(peaks, trace, ordinate) : null),
    [showPeaks, peaks, trace, ordinate],
  );
  // Updated from the previous layer: a new row marks its own peak only (peakLayerUpdate).
  const peakLayerLast = useRef<PeakLayerState | null>(null);
  const peakLayer = useMemo(() => {
    if (!peakBase) return null;
    peakLayerLast.current = peakLayerUpdate(peakLayerLast.current, peakBase, rowsA, peakIdAt, peakIdPosition);
    return peakLayerLast.current.layer;
  }, [peakBase, rowsA]);
  // The vertical marks: painted by the overlay, never a reason for plotly to draw again.
  const cursorCm1 = cursorLine >= 0 && cursorLine < drawn.lines.count ? drawn.lines.wavenumberCm1[cursorLine] : null;
  const marks = useMemo(
    () => plotMarks(cursorCm1, candidatePeakCm1, selectedObservedCm1),
    [cursorCm1, candidatePeakCm1, selectedObservedCm1],
  );
  // What the plotly figure depends on; the visible range first (see isRangeOnly).
  const inputs: unknown[] = [
    xRange,
    trace,
    size,
    ordinate,
    rows,
    drawn.lines,
    sim,
    showSimulated,
    showObsMinusSim,
    isDark,
    proposals,
    selectedProposalCm1,
  ];
  const figure = useMemo(
    () =>
      spectrumFigure({
        trace,
        xRange,
        columns: size.width - 90,
        heightPx: size.height,
        ordinate,
        rows,
        lines: drawn.lines,
        sim,
        proposals,
        selectedProposalCm1,
        showSimulated,
        showObsMinusSim,
        isDark,
      }),
    // `inputs` lists exactly the values read above; it is kept as one array so the range-only test
    // below compares the same list.
    // eslint-disable-next-line react-hooks/exhaustive-deps
    inputs,
  );

  // A change of the visible range alone (zoom, pan) is drawn at once; anything else after the page
  // has painted (see PlotlyChart). A new trace waits too: drawing it in the task that rendered it
  // made one main-thread task of both (over 100 ms for the demo), for one frame gained.
  const prevInputs = useRef<unknown[]>([]);
  const prev = prevInputs.current;
  const isRangeOnly = prev.length > 0 && inputs[0] !== prev[0] && inputs.every((v, i) => i === 0 || v === prev[i]);
  prevInputs.current = inputs;

  return (
    <section className="spectrum-panel" aria-label="Spectrum and ladders">
      <PlotToolbar rows={chooserLadders} />
      {drawn.entries && <BandSwitches />}
      <div className="spectrum-plot-wrap">
        <PlotlyChart
          data={figure.data}
          layout={figure.layout}
          config={SPECTRUM_CONFIG}
          onRelayout={onRelayout}
          isUrgent={isRangeOnly}
          onAfterPlot={(el) => overlayRef.current?.paint(el)}
          onRelayouting={(el, e) => {
            const r = relayoutRangeOf(e);
            if (r && isAxisMovedTo(el, r)) overlayRef.current?.paint(el, r);
          }}
          onSize={(width, height) => setSize((o) => (o.width === width && o.height === height ? o : { width, height }))}
          label="Trace with predicted sub-branch ladders. Click a peak to see candidate assignments, or a rung and then a peak to assign it."
          testId="spectrum-plot"
          className="spectrum-plot"
        />
        <PlotOverlay
          ref={overlayRef}
          scene={scene}
          markers={markers}
          cursorLine={cursorLine}
          marks={marks}
          lines={drawn.lines}
          shape={shape}
          peaks={peakLayer}
          isDark={isDark}
          onRungClick={onRungLine}
          levelsOf={levelsOf}
          rungLabels={rungLabels}
          onPeakClick={peakClick}
          // Look for a peak within 1 % of the visible width (at least 0.01 cm^-1) of the click.
          onTraceClick={(nu, widthCm1) => traceClickAt(nu, Math.max(0.01, 0.01 * widthCm1))}
          onDoubleClick={() => viewSetXRange(null)}
        />
        <CandidateList />
        {band.error && (
          <div className="plot-note error" role="status">
            No lines from this model: {band.error}
          </div>
        )}
      </div>
    </section>
  );
}
