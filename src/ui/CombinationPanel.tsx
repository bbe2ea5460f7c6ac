/** Combination differences of the assigned lines: B, D_J, D_JK of one state and the diagnostic plot Δ2F/(J+½) vs (J+½)²; with several bands, the state from every band that reaches it. */
import { selectActiveBandAssignments } from '../state/selectorsSystem';
import { useMemo } from 'react';
import { combinationDifferences } from '../fit/combinationDifferences';
import { formatNumber, formatValueUncertainty } from '../io/numberFormat';
import { lineLabelAscii } from '../physics/lineLabel';
import { assignmentSelect } from '../state/actionsAssign';
import { viewSetCombinationState } from '../state/actionsView';
import { combinationHint } from '../state/combinationHint';
import { useBench } from '../state/store';
import { systemCombinationOf } from '../state/systemCombination';
import { combinationFigure } from './plot/solveTraces';
import { ConstantName } from './ConstantName';
import { PlotlyChart } from './PlotlyChart';

/**
 * Several bands: the active band's lower or upper state, differenced from every band of its
 * species that reaches that state; each pair names its band.
 */
function SystemCombinationView() {
  const state = useBench((s) => s.combinationState);
  const system = useBench((s) => s.system);
  const floated = useBench((s) => s.systemFloated);
  const ties = useBench((s) => s.systemTies);
  const assignments = useBench((s) => s.assignments);
  const active = useBench((s) => s.activeBandKey);
  const cd = useMemo(
    () => systemCombinationOf({ system, systemFloated: floated, systemTies: ties, assignments, activeBandKey: active }, state),
    [system, floated, ties, assignments, active, state],
  );
  if (!cd) return <p className="muted">Choose a band for the panels (“to panels” above the plot).</p>;
  const { outcome } = cd;
  const pairs = outcome.ok ? outcome.result.pairs : [];
  const shown = [...pairs].sort((a, b) => Math.abs(b.normalisedResidual) - Math.abs(a.normalisedResidual)).slice(0, 200);
  const select = (lineIndex: number) => assignmentSelect(cd.assignmentIds[lineIndex]);
  return (
    <div className="combination" data-testid="cd-system">
      <div className="panel-row">
        <fieldset className="segmented">
          <legend>State of the band on the panels</legend>
          <label>
            <input type="radio" name="cd-state" checked={state === 'lower'} onChange={() => viewSetCombinationState('lower')} />
            Lower
          </label>
          <label>
            <input type="radio" name="cd-state" checked={state === 'upper'} onChange={() => viewSetCombinationState('upper')} />
            Upper
          </label>
        </fieldset>
        <p data-testid="cd-state-bands">
          State <strong>{cd.state}</strong> of {cd.species}, from the band{cd.bands.length === 1 ? '' : 's'} {cd.bands.join(', ')} (every
          band of {cd.species} that reaches it)
          {cd.skipped > 0 ? `; ${cd.skipped} row${cd.skipped === 1 ? '' : 's'} naming no single line left out` : ''}.
        </p>
      </div>
      {!outcome.ok ? (
        <p className="muted" role="status" data-testid="cd-status">
          {outcome.message}
        </p>
      ) : (
        <div className="cd-body">
          <div className="cd-summary">
            <table className="fit-table">
              <caption className="visually-hidden">Constants of {cd.state} from combination differences</caption>
              <thead>
                <tr>
                  <th scope="col">Constant of {cd.state}</th>
                  <th scope="col">Value (σ) / cm⁻¹</th>
                </tr>
              </thead>
              <tbody>
                {Object.entries(outcome.result.parameters)
                  .filter(([, p]) => !p.fixed || p.value !== 0)
                  .map(([key, p]) => (
                    <tr key={key} data-key={key}>
                      <th scope="row">
                        <ConstantName constantKey={key.slice(key.lastIndexOf('.') + 1)} />
                      </th>
                      <td className="num">
                        {p.fixed
                          ? `${formatNumber(p.value)} (fixed)`
                          : p.sigma === null
                            ? `${formatNumber(p.value)} (σ n/a)`
                            : formatValueUncertainty(p.value, p.sigma)}
                      </td>
                    </tr>
                  ))}
              </tbody>
            </table>
            <p>
              {outcome.result.nPairs} differences; σ<sub>w</sub> ={' '}
              {outcome.result.sigmaW === null ? 'n/a' : outcome.result.sigmaW.toPrecision(3)}; rms {outcome.result.rmsCm1.toExponential(2)}{' '}
              cm⁻¹
            </p>
            {outcome.result.warnings.length > 0 && (
              <ul className="warnings">
                {outcome.result.warnings.map((w, i) => (
                  <li key={i}>{w}</li>
                ))}
              </ul>
            )}
          </div>
          <table className="fit-table" data-testid="cd-pairs">
            <caption>
              Differences, largest |o − c|/σ first{pairs.length > shown.length ? ` (${shown.length} of ${pairs.length})` : ''}
            </caption>
            <thead>
              <tr>
                <th scope="col">Band</th>
                <th scope="col">J</th>
                <th scope="col">K</th>
                <th scope="col">Obs / cm⁻¹</th>
                <th scope="col">(o − c)/σ</th>
                <th scope="col">Lines</th>
              </tr>
            </thead>
            <tbody>
              {shown.map((p, i) => (
                <tr key={i} className={p.isSuspect ? 'suspect' : undefined}>
                  <td>{p.band}</td>
                  <td className="num">
                    {p.jHigh}–{p.jLow}
                  </td>
                  <td className="num">
                    {p.K}
                    {p.l > 0 ? ' (+l)' : p.l < 0 ? ' (−l)' : ''}
                  </td>
                  <td className="num">{p.differenceCm1.toFixed(5)}</td>
                  <td className="num">{p.normalisedResidual.toFixed(1)}</td>
                  <td>
                    {p.lines.map((li, j) => (
                      <button key={li} type="button" className="link" onClick={() => select(li)}>
                        {p.lines.length === 1 ? 'line' : j === 0 ? 'R' : ' P'}
                      </button>
                    ))}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}

export function CombinationPanel() {
  const isSystem = useBench((s) => s.system !== null);
  return isSystem ? <SystemCombinationView /> : <OneBandCombination />;
}

function OneBandCombination() {
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
