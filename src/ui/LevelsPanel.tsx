/**
 * Levels panel: the reduced term-value plot of the upper or lower state from the last fit and the
 * list of places where that state looks perturbed (analysis/perturbationScan).
 */
import { useMemo, useState } from 'react';
import { perturbationScan } from '../analysis/perturbationScan';
import { levelTermValues, type LevelState } from '../fit/levelTermValues';
import { selectFitResult } from '../state/selectors';
import { useBench } from '../state/store';
import { reducedTermFigure } from './plot/levelFigure';
import { PlotlyChart } from './PlotlyChart';

export function LevelsPanel() {
  const result = useBench(selectFitResult);
  const isDark = useBench((s) => s.theme === 'dark');
  const [state, setState] = useState<LevelState>('upper');
  const [ordinate, setOrdinate] = useState<'reduced' | 'obs-minus-calc'>('reduced');
  const analysis = useMemo(() => {
    if (!result) return null;
    const levels = levelTermValues(result, state);
    return { levels, scan: perturbationScan(levels) };
  }, [result, state]);
  const fig = useMemo(
    () => (analysis ? reducedTermFigure(analysis.levels, analysis.scan.findings, isDark, ordinate) : null),
    [analysis, isDark, ordinate],
  );
  if (!result || !analysis || !fig) {
    return <p className="muted">Fit the assigned lines first: the levels they reach, and where they leave the model, are shown here.</p>;
  }
  const { findings, noiseCm1 } = analysis.scan;
  return (
    <div className="levels-panel" data-testid="levels-panel">
      <div className="row">
        <label>
          State{' '}
          <select value={state} onChange={(e) => setState(e.target.value as LevelState)} data-testid="levels-state">
            <option value="upper">upper (′)</option>
            <option value="lower">lower (″)</option>
          </select>
        </label>
        <label>
          Show{' '}
          <select
            value={ordinate}
            onChange={(e) => setOrdinate(e.target.value as 'reduced' | 'obs-minus-calc')}
            data-testid="levels-ordinate"
          >
            <option value="reduced">reduced term values E − B̄·J(J+1)</option>
            <option value="obs-minus-calc">obs − calc of each level</option>
          </select>
        </label>
        <span className="muted">
          {analysis.levels.length} levels; noise of a level’s obs − calc {noiseCm1.toExponential(1)} cm⁻¹. Found against the current fit,
          which a perturbation pulls towards itself: exclude the lines of a perturbed stack and fit again to see it whole.
        </span>
      </div>
      <PlotlyChart
        data={fig.data}
        layout={fig.layout}
        label="Reduced term values against J, one colour per K"
        testId="levels-plot"
        className="residual-plot"
      />
      <h3>Where the state looks perturbed</h3>
      {findings.length === 0 ? (
        <p data-testid="perturbation-list">No level leaves its stack by more than 5 times the noise.</p>
      ) : (
        <ol data-testid="perturbation-list">
          {findings.slice(0, 50).map((f, i) => (
            <li key={i}>{f.description}</li>
          ))}
        </ol>
      )}
      {findings.length > 50 && <p className="muted">… and {findings.length - 50} smaller ones.</p>}
    </div>
  );
}
