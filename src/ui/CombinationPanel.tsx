/** Combination differences of the assigned lines: B, D_J, D_JK of one state and the diagnostic plot Δ2F/(J+½) vs (J+½)². */
import { selectActiveBandAssignments } from '../state/selectorsSystem';
import { useMemo } from 'react';
import { combinationDifferences } from '../fit/combinationDifferences';
import { formatNumber, formatValueUncertainty } from '../io/numberFormat';
import { lineLabelAscii } from '../physics/lineLabel';
import { assignmentSelect } from '../state/actionsAssign';
import { viewSetCombinationState } from '../state/actionsView';
import { combinationHint } from '../state/combinationHint';
import { useBench } from '../state/store';
import { combinationFigure } from './plot/solveTraces';
import { ConstantName } from './ConstantName';
import { PlotlyChart } from './PlotlyChart';

export function CombinationPanel() {
  // Several bands: the active band's lines only (its lower and upper state).
  const assignments = useBench(selectActiveBandAssignments);
  const state = useBench((s) => s.combinationState);
  const shape = useBench((s) => s.model.shape);
  const model = useBench((s) => s.model);
  const isDark = useBench((s) => s.theme === 'dark');
  const outcome = useMemo(
    () =>
      combinationDifferences(assignments, state, {
        shape,
        lineName: (i) => {
          const a = assignments[i];
          return lineLabelAscii(a.kUpper - a.kLower, a.jUpper - a.jLower, a.kLower, a.jLower, shape);
        },
      }),
    [assignments, state, shape],
  );
  const fig = useMemo(() => (outcome.ok ? combinationFigure(outcome.result, isDark) : null), [outcome, isDark]);
  return (
    <div className="combination">
      <div className="panel-row">
        <fieldset className="segmented">
          <legend>State</legend>
          <label>
            <input type="radio" name="cd-state" checked={state === 'lower'} onChange={() => viewSetCombinationState('lower')} />
            Lower Δ₂F″ = R(J−1) − P(J+1)
          </label>
          <label>
            <input type="radio" name="cd-state" checked={state === 'upper'} onChange={() => viewSetCombinationState('upper')} />
            Upper Δ₂F′ = R(J) − P(J)
          </label>
        </fieldset>
      </div>
      {!outcome.ok ? (
        <p className="muted" role="status" data-testid="cd-status">
          {outcome.error.message}
          {outcome.error.lineIndex !== undefined && assignments[outcome.error.lineIndex] && (
            <>
              {' '}
              <button type="button" className="link" onClick={() => assignmentSelect(assignments[outcome.error.lineIndex!].id)}>
                show that line
              </button>
            </>
          )}
          {outcome.error.kind === 'too-few-pairs' && (
            <>
              <br />
              <span data-testid="cd-hint">{combinationHint(assignments, state, shape === 'linear')}</span>
            </>
          )}
        </p>
      ) : (
        <div className="cd-body">
          <div className="cd-summary">
            <table className="fit-table">
              <caption className="visually-hidden">Constants from combination differences</caption>
              <thead>
                <tr>
                  <th scope="col">Constant</th>
                  <th scope="col">Value (σ) / cm⁻¹</th>
                  <th scope="col">Model / cm⁻¹</th>
                </tr>
              </thead>
              <tbody>
                {(['B', 'DJ', 'DJK'] as const).map((k) => {
                  const p = outcome.result[k];
                  return (
                    <tr key={k}>
                      <th scope="row">
                        <ConstantName constantKey={`${state}.${k}`} />
                      </th>
                      <td className="num">{p.fixed ? `${formatNumber(p.value)} (fixed)` : formatValueUncertainty(p.value, p.sigma)}</td>
                      <td className="num muted">{formatNumber(model[state][k], 8)}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
            <p>
              {outcome.result.nPairs} pairs; σ<sub>w</sub> = {outcome.result.sigmaW === null ? 'n/a' : outcome.result.sigmaW.toPrecision(3)}
              ; rms {outcome.result.rmsCm1.toExponential(2)} cm⁻¹
            </p>
            {outcome.result.warnings.length > 0 && (
              <ul className="warnings">
                {outcome.result.warnings.map((w, i) => (
                  <li key={i}>{w}</li>
                ))}
              </ul>
            )}
            {outcome.result.suspects.length > 0 && (
              <ul className="warnings">
                {outcome.result.suspects.map((i) => {
                  const p = outcome.result.pairs[i];
                  return (
                    <li key={i}>
                      Pair J={p.j}, K={p.k} is {p.normalisedResidual.toFixed(1)} σ off: one of its lines is probably misassigned.{' '}
                      <button type="button" className="link" onClick={() => assignmentSelect(assignments[p.lineR].id)}>
                        R line
                      </button>{' '}
                      <button type="button" className="link" onClick={() => assignmentSelect(assignments[p.lineP].id)}>
                        P line
                      </button>
                    </li>
                  );
                })}
              </ul>
            )}
          </div>
          {fig && (
            <PlotlyChart
              data={fig.data}
              layout={fig.layout}
              label="Combination differences Δ2F/(J+½) against (J+½)², one series per K"
              className="cd-plot"
              testId="cd-plot"
            />
          )}
        </div>
      )}
    </div>
  );
}
