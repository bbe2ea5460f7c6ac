/** Solve panel: floated constants, fit in the worker, values ± σ, correlation heatmap, residuals, warnings, accept/keep. */
import { useDeferredValue, useEffect, useMemo, useRef, useState, type RefObject } from 'react';
import type { FitResult } from '../fit/fitTypes';
import { constantDisplayUnit, constantKeysToNames, constantToDisplayUnit } from '../io/constantName';
import { formatNumber, formatValueUncertainty } from '../io/numberFormat';
import { assignmentSelect } from '../state/actionsAssign';
import { fitAccept, fitApplySuggestion, fitCancel, fitRevert, fitStart } from '../state/actionsFit';
import { modelParameterNames, modelSetFloated } from '../state/actionsModel';
import { selectFitResult } from '../state/selectors';
import { benchStore, useBench } from '../state/store';
import { systemValueOf } from '../state/systemBands';
import { correlationFigure, residualFigure, residualFigureBands } from './plot/solveTraces';
import { selectSystemPrediction } from '../state/systemPredict';
import { useShallow } from 'zustand/react/shallow';
import { PlotlyChart } from './PlotlyChart';
import { ConstantName } from './ConstantName';
import { LineLabel } from './LineLabel';

function FloatChooser() {
  const model = useBench((s) => s.model);
  const floated = useBench((s) => s.floated);
  return (
    <fieldset className="float-chooser">
      <legend>Floated constants</legend>
      {(['upper', 'lower'] as const).map((side) => (
        <div key={side} className="float-side">
          <span className="muted">{side === 'upper' ? 'Upper ′' : 'Lower ″'}</span>
          {modelParameterNames(model, side).map((name) => {
            const key = `${side}.${name}`;
            return (
              <label key={key} className="check">
                <input type="checkbox" checked={floated.includes(key)} onChange={(e) => modelSetFloated(key, e.target.checked)} />
                <ConstantName constantKey={key} />
              </label>
            );
          })}
        </div>
      ))}
    </fieldset>
  );
}

function ResultTable({ result }: { result: FitResult }) {
  const model = useBench((s) => s.model);
  const system = useBench((s) => s.system);
  const unit = useBench((s) => s.constantUnit);
  const unitText = unit === 'cm-1' ? 'cm⁻¹' : 'MHz';
  const rows = Object.entries(result.parameters).filter(([, p]) => !p.fixed || p.value !== 0);
  return (
    <table className="fit-table" data-testid="fit-constants">
      <caption className="visually-hidden">Fitted constants</caption>
      <thead>
        <tr>
          <th scope="col">Constant</th>
          <th scope="col">Value (σ) / {unitText}</th>
          <th scope="col">σ / {unitText}</th>
          <th scope="col">Current model / {unitText}</th>
        </tr>
      </thead>
      <tbody>
        {rows.map(([key, p]) => {
          const [side, name] = key.split('.') as ['lower' | 'upper', string];
          // Several bands: keys name the system's states ("LB-7/v4.B").
          const current = system ? systemValueOf(system, key) : (model[side] as Record<string, number>)[name];
          const shownUnit = constantDisplayUnit(key, unit);
          const inUnit = (v: number) => constantToDisplayUnit(key, v, unit);
          return (
            <tr key={key} className={p.fixed ? 'fixed' : ''} data-key={key}>
              <th scope="row" title={key}>
                <ConstantName constantKey={key} />
                {shownUnit !== unitText && <span className="muted small"> {shownUnit ? `/ ${shownUnit}` : '(no unit)'}</span>}
              </th>
              <td className="num">
                {p.fixed
                  ? `${formatNumber(inUnit(p.value), 10)} (fixed)`
                  : formatValueUncertainty(inUnit(p.value), p.sigma === null ? null : inUnit(p.sigma))}
              </td>
              <td className="num">{p.fixed ? '' : p.sigma === null ? 'n/a' : formatNumber(inUnit(p.sigma), 2)}</td>
              <td className={`num ${current !== p.value ? 'muted' : ''}`}>{formatNumber(inUnit(current), 12)}</td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

/**
 * Above this many points the residual plot is drawn (and redrawn after a new fit) only while it is
 * on screen: plotly's SVG markers cost about 25 µs each to draw (Chromium, measured here), so
 * 5,000 of them would block the page for over 0.1 s after every fit even when scrolled out of view.
 */
const RESIDUAL_DRAW_ON_SCREEN_ABOVE = 1500;

/** Whether the element is at least partly inside the viewport and its scrolling ancestors (true where IntersectionObserver is missing). */
function useIsOnScreen(ref: RefObject<HTMLElement | null>): boolean {
  const [isOnScreen, setOnScreen] = useState(typeof IntersectionObserver === 'undefined');
  useEffect(() => {
    const el = ref.current;
    if (!el || typeof IntersectionObserver === 'undefined') return;
    const io = new IntersectionObserver((entries) => setOnScreen(entries[entries.length - 1].isIntersecting));
    io.observe(el);
    return () => io.disconnect();
  }, [ref]);
  return isOnScreen;
}

function ResidualPlot({ result, lineIds }: { result: FitResult; lineIds: string[] }) {
  const shape = useBench((s) => s.model.shape);
  const isDark = useBench((s) => s.theme === 'dark');
  const box = useRef<HTMLDivElement>(null);
  const isOnScreen = useIsOnScreen(box);
  const isLarge = result.lines.length > RESIDUAL_DRAW_ON_SCREEN_ABOVE;
  // The inputs of the figure last drawn: off screen, a large plot keeps the previous ones.
  const [drawn, setDrawn] = useState<{ result: FitResult; lineIds: string[] } | null>(isLarge ? null : { result, lineIds });
  const isCurrent = drawn !== null && drawn.result === result && drawn.lineIds === lineIds;
  const shouldDraw = !isCurrent && (!isLarge || isOnScreen);
  useEffect(() => {
    if (shouldDraw) setDrawn({ result, lineIds });
  }, [shouldDraw, result, lineIds]);
  // Several bands: coloured by band (the band switches' colours), one legend entry per band.
  const bandKeys = useBench(useShallow((s) => selectSystemPrediction(s)?.entries.map((e) => e.key) ?? null));
  const fig = useMemo(
    () =>
      drawn
        ? bandKeys
          ? residualFigureBands(drawn.result, drawn.lineIds, bandKeys, shape, isDark)
          : residualFigure(drawn.result, drawn.lineIds, shape, isDark)
        : null,
    [drawn, shape, isDark, bandKeys],
  );
  return (
    <div ref={box}>
      {fig ? (
        <PlotlyChart
          data={fig.data}
          layout={fig.layout}
          label={
            bandKeys
              ? 'Residuals obs − calc against J″, coloured by band (one legend entry per band), marker by branch (P ◀, Q ●, R ▶); click a point to select its line'
              : 'Residuals obs − calc against J″, one series per sub-branch: colour by K″ and ΔK, marker by branch (P ◀, Q ●, R ▶); click a point to select its line'
          }
          className="residual-plot"
          testId="residual-plot"
          onClick={(e) => {
            const id = e.points?.[0]?.customdata as unknown as string | undefined;
            if (id && benchStore.getState().assignments.some((a) => a.id === id)) assignmentSelect(id);
          }}
        />
      ) : (
        <div className="plot-box residual-plot">
          <div className="plot-loading">
            The residuals of {result.lines.length} lines are drawn when this part of the panel is on screen.
          </div>
        </div>
      )}
    </div>
  );
}

export function SolvePanel() {
  const isRunning = useBench((s) => s.isFitRunning);
  const progress = useBench((s) => s.fitProgress);
  const outcome = useBench((s) => s.fitOutcome);
  const result = useBench(selectFitResult);
  const lineIds = useBench((s) => s.fitLineIds);
  // The plots of a new result render after the summary has painted (a deferred render).
  const plotted = useDeferredValue(useMemo(() => ({ result, lineIds }), [result, lineIds]));
  const plotResult = plotted.result;
  const shape = useBench((s) => s.model.shape);
  const isDark = useBench((s) => s.theme === 'dark');
  const nAssigned = useBench((s) => s.assignments.length);
  const canRevert = useBench((s) => s.modelBeforeAccept !== null);
  const isAccepted = useBench((s) => s.isFitAccepted);
  const finishedAt = useBench((s) => s.fitFinishedAt);
  const corr = useMemo(
    () => (plotResult && plotResult.correlation.length > 0 ? correlationFigure(plotResult, isDark) : null),
    [plotResult, isDark],
  );

  return (
    <div className="solve">
      <div className="solve-controls">
        <FloatChooser />
        <div className="solve-run">
          <button type="button" className="primary" onClick={() => void fitStart()} disabled={nAssigned === 0} data-testid="fit-run">
            {isRunning ? 'Fit again' : 'Fit'} <kbd>F</kbd>
          </button>
          {isRunning && (
            <>
              <button type="button" onClick={fitCancel}>
                Cancel
              </button>
              <span role="status" className="muted">
                Fitting… {progress ? `iteration ${progress.iteration}, χ² ${progress.chi2.toPrecision(4)}` : 'starting'}
              </span>
            </>
          )}
          {result && (
            <>
              <button type="button" onClick={fitAccept} disabled={isAccepted} data-testid="fit-accept">
                Accept fitted constants
              </button>
              <button type="button" onClick={fitRevert} disabled={!canRevert}>
                Keep previous constants
              </button>
            </>
          )}
        </div>
      </div>
      {!outcome && !isRunning && (
        <p className="muted">
          Assign at least as many lines as floated constants, then press Fit. The fit runs in the background; the page stays usable.
        </p>
      )}
      {outcome && !outcome.ok && (
        <div className="refusal" role="alert" data-testid="fit-refusal">
          <p>
            <strong>The fit was refused.</strong> {constantKeysToNames(outcome.error.message)}
          </p>
          {outcome.error.suggestion && <p>Suggestion: {constantKeysToNames(outcome.error.suggestion)}</p>}
          {outcome.error.fixSuggested.length > 0 && (
            <button type="button" onClick={() => void fitApplySuggestion()} data-testid="fit-apply-suggestion">
              Fix {outcome.error.fixSuggested.map((k) => constantKeysToNames(k)).join(', ')} and fit again
            </button>
          )}
        </div>
      )}
      {result && (
        <div className="fit-result">
          <div className="fit-summary" data-testid="fit-summary">
            <span>
              N = <b>{result.nLines}</b>
            </span>
            <span>
              P = <b>{result.nParameters}</b>
            </span>
            <span data-testid="fit-dof" title="Degrees of freedom: lines in the fit minus floated constants">
              ν = N − P = <b>{result.nLines - result.nParameters}</b>
            </span>
            <span>
              σ<sub>w</sub> = <b>{result.sigmaW === null ? 'n/a' : result.sigmaW.toPrecision(3)}</b>
            </span>
            {result.sigmaW !== null && result.nParameters > 0 && (
              <span className="muted" data-testid="fit-sigma-scaling">
                {result.sigmaW > 1 ? 'σ scaled up by σ_w' : 'σ from the stated line uncertainties (not scaled down by σ_w < 1)'}
              </span>
            )}
            <span>
              rms = <b>{result.rmsCm1.toExponential(2)}</b> cm⁻¹
            </span>
            <span className="muted">
              {result.iterations} iterations; {result.convergenceMessage}
              {finishedAt ? ` (${new Date(finishedAt).toLocaleTimeString()})` : ''}
            </span>
          </div>
          {(result.warnings.length > 0 || result.outliers.length > 0) && (
            <ul className="warnings">
              {result.warnings.map((w, i) => (
                <li key={i}>{constantKeysToNames(w)}</li>
              ))}
              {result.outliers.map((i) => {
                const l = result.lines[i];
                return (
                  <li key={`o${i}`}>
                    Outlier <LineLabel q={l} shape={shape} />: obs − calc = {l.obsMinusCalc.toExponential(2)} cm⁻¹ (
                    {l.normalisedResidual.toFixed(1)} σ){' '}
                    <button type="button" className="link" onClick={() => assignmentSelect(lineIds[i])}>
                      show
                    </button>
                  </li>
                );
              })}
            </ul>
          )}
          <div className="fit-grid">
            <ResultTable result={result} />
            {corr && (
              <PlotlyChart
                data={corr.data}
                layout={corr.layout}
                label="Correlation matrix of the floated constants"
                className="corr-plot"
                testId="corr-plot"
              />
            )}
          </div>
          {plotResult && <ResidualPlot result={plotResult} lineIds={plotted.lineIds} />}
        </div>
      )}
    </div>
  );
}
