/** Wavenumber calibration: reference pairs typed, picked from the plot or read from a file; fit, apply, revert. */
import { useState } from 'react';
import type { CalibrationFit } from '../analysis/calibrationFit';
import { calibrationApplyToTrace, calibrationRevertTrace, calibrationRun } from '../state/actionsCalibration';
import { calibrationPairsFormat, calibrationPairsParse } from '../state/calibrationLogic';
import { useBench } from '../state/store';

export function CalibrationPanel() {
  const target = useBench((s) => s.candidateTarget);
  const applied = useBench((s) => s.traceCalibration);
  const hasTrace = useBench((s) => s.trace !== null);
  const [text, setText] = useState('');
  const [withOffset, setWithOffset] = useState(false);
  const [fit, setFit] = useState<CalibrationFit | null>(null);
  const parsed = calibrationPairsParse(text);

  const addPicked = () => {
    if (!target) return;
    const line = `${target.peakCm1.toFixed(6)}, `;
    setText(text && !text.endsWith('\n') ? `${text}\n${line}` : text + line);
  };
  const readFile = async (file: File | undefined) => {
    if (!file) return;
    const body = await file.text();
    setText(calibrationPairsFormat(calibrationPairsParse(body).pairs));
  };
  const run = () => setFit(calibrationRun(parsed.pairs, withOffset));

  return (
    <div className="calibration-panel" data-testid="calibration-panel">
      <p className="muted">
        One pair per line: <code>observed, reference[, σ]</code> in cm⁻¹. Click a peak in the plot, then “Add picked peak”, and type its
        reference wavenumber. The fit is ν<sub>true</sub> = (1 + δ) ν<sub>obs</sub>
        {withOffset ? ' + offset' : ''}.
      </p>
      <div className="row">
        <button type="button" onClick={addPicked} disabled={!target}>
          Add picked peak{target ? ` (${target.peakCm1.toFixed(4)} cm⁻¹)` : ''}
        </button>
        <label>
          Reference file{' '}
          <input
            type="file"
            accept=".csv,.txt,.tsv"
            aria-label="Read reference pairs from a file"
            onChange={(e) => readFile(e.target.files?.[0])}
          />
        </label>
        <label>
          <input type="checkbox" checked={withOffset} onChange={(e) => setWithOffset(e.target.checked)} /> fit an offset too
        </label>
      </div>
      <textarea
        aria-label="Reference pairs: observed, reference, optional sigma, in cm-1"
        rows={6}
        cols={60}
        value={text}
        onChange={(e) => setText(e.target.value)}
        spellCheck={false}
      />
      {parsed.errors.length > 0 && (
        <ul className="calibration-errors" role="alert">
          {parsed.errors.map((e) => (
            <li key={e}>{e}</li>
          ))}
        </ul>
      )}
      <div className="row">
        <button type="button" onClick={run} disabled={parsed.pairs.length === 0 || parsed.errors.length > 0}>
          Fit calibration ({parsed.pairs.length} pair{parsed.pairs.length === 1 ? '' : 's'})
        </button>
        <button type="button" onClick={() => fit && calibrationApplyToTrace(fit)} disabled={!fit || !hasTrace}>
          Apply to trace and peaks
        </button>
        <button type="button" onClick={calibrationRevertTrace} disabled={!applied}>
          Revert to the file's axis
        </button>
      </div>
      {applied && (
        <p data-testid="calibration-applied">
          Applied now: δ = {applied.delta.toExponential(4)}, offset = {applied.offsetCm1.toFixed(6)} cm⁻¹.
        </p>
      )}
      {fit && (
        <div data-testid="calibration-result">
          <p>
            δ = {fit.delta.toExponential(5)}
            {fit.deltaSigma !== null ? ` ± ${fit.deltaSigma.toExponential(2)}` : ' (exactly determined: no uncertainty)'}
            {withOffset && (
              <>
                ; offset = {fit.offsetCm1.toFixed(6)}
                {fit.offsetSigmaCm1 !== null ? ` ± ${fit.offsetSigmaCm1.toExponential(2)}` : ''} cm⁻¹
              </>
            )}
            ; rms {fit.rmsCm1.toExponential(2)} cm⁻¹{fit.sigmaW !== null ? `, σ_w ${fit.sigmaW.toFixed(2)}` : ''}; N = {fit.n}
          </p>
          {fit.isExactlyDetermined && (
            <p className="warning">
              As many pairs as parameters: the correction passes through them exactly, so nothing checks it. Add pairs.
            </p>
          )}
          <table className="calibration-residuals">
            <thead>
              <tr>
                <th scope="col">observed / cm⁻¹</th>
                <th scope="col">reference / cm⁻¹</th>
                <th scope="col">reference − calibrated / cm⁻¹</th>
              </tr>
            </thead>
            <tbody>
              {parsed.pairs.map((p, i) => (
                <tr key={i}>
                  <td>{p.observedCm1.toFixed(6)}</td>
                  <td>{p.referenceCm1.toFixed(6)}</td>
                  <td>{fit.residualsCm1[i]?.toExponential(2)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
