/**
 * Unresolved-band tab: a region of the trace seen through the spectrometer's instrument line shape;
 * band-shape diagnosis (and a starting model from it), the contour fit in its worker with progress
 * and cancel, the fitted contour and residual over the trace, the Q-branch sub-band analysis and the
 * infrared-active fundamentals of candidate structures.
 */
import { useMemo, useState } from 'react';
import type { BandShapeClassification } from '../analysis/bandShapeClassify';
import { qBranchOrigin } from '../fit/qBranchFit';
import { constantKeysToNames, constantNameText } from '../io/constantName';
import { formulaAtoms } from '../io/formulaAtoms';
import { gammaVibParse } from '../io/gammaVibParse';
import { formatValueUncertainty } from '../io/numberFormat';
import { APODIZATION_NAMES, type ApodizationName } from '../physics/instrumentLineShape';
import { shapeUniqueName } from '../physics/model';
import { vibrationalActivity } from '../physics/vibrationalActivity';
import {
  contourApplyStartModel,
  contourDemoLoad,
  contourDiagnose,
  contourDiagnoseCancel,
  contourDiagnoseThroughInstrument,
  contourFitAccept,
  contourFitCancel,
  contourFitStart,
  contourQFind,
  contourQFitRun,
  contourQSetIndex,
  contourRegionFromView,
  contourSetApodization,
  contourSetOpd,
  contourSetRegion,
} from '../state/actionsContour';
import { useBench } from '../state/store';
import { contourFigure, contourRelayoutRegion } from './plot/contourFigure';
import { PlotlyChart } from './PlotlyChart';

const fmt = (v: number, s: number) => formatValueUncertainty(v, s > 0 ? s : null);

function RegionRow() {
  const region = useBench((s) => s.contourRegion);
  const opd = useBench((s) => s.contourOpdCm);
  const apodization = useBench((s) => s.contourApodization);
  const [from, setFrom] = useState(region ? String(region[0]) : '');
  const [to, setTo] = useState(region ? String(region[1]) : '');
  const [opdText, setOpdText] = useState(String(opd));
  const [error, setError] = useState<string | null>(null);
  const [shown, setShown] = useState(region);
  // Follow region changes made elsewhere (plot range, demo) without an effect.
  if (shown !== region) {
    setShown(region);
    setFrom(region ? String(region[0]) : '');
    setTo(region ? String(region[1]) : '');
  }
  const applyRegion = () => {
    if (from.trim() === '' && to.trim() === '') setError(contourSetRegion(null));
    else setError(contourSetRegion([Number(from), Number(to)]));
  };
  return (
    <div className="row contour-region">
      <label>
        from <input size={9} value={from} onChange={(e) => setFrom(e.target.value)} onBlur={applyRegion} data-testid="contour-from" />
      </label>
      <label>
        to <input size={9} value={to} onChange={(e) => setTo(e.target.value)} onBlur={applyRegion} data-testid="contour-to" /> cm⁻¹
      </label>
      <button type="button" onClick={contourRegionFromView} title="Use the range the main plot shows (zoom in on the band first)">
        Use the plot’s range
      </button>
      <button type="button" onClick={() => setError(contourSetRegion(null))}>
        Whole trace
      </button>
      <label>
        max. optical path difference L{' '}
        <input
          size={5}
          value={opdText}
          onChange={(e) => setOpdText(e.target.value)}
          onBlur={() => setError(contourSetOpd(Number(opdText)))}
          data-testid="contour-opd"
        />{' '}
        cm
      </label>
      <label>
        apodization{' '}
        <select
          value={apodization}
          onChange={(e) => contourSetApodization(e.target.value as ApodizationName)}
          data-testid="contour-apodization"
        >
          {APODIZATION_NAMES.map((n) => (
            <option key={n} value={n}>
              {n}
            </option>
          ))}
        </select>
      </label>
      <span className="muted small">or zoom the plot below onto the band</span>
      <button type="button" onClick={() => void contourDemoLoad()} data-testid="contour-demo">
        Load the low-resolution demo
      </button>
      {error && <span className="inline-error">{error}</span>}
    </div>
  );
}

/** B of a diagnosis in words: its value and method, the range it is good to, and whether it is only a rough value. */
function diagnosisBText(d: BandShapeClassification): string {
  if (d.B === null) return 'not read from this trace';
  const range = d.bLow !== undefined && d.bHigh !== undefined ? `, between ${d.bLow.toPrecision(3)} and ${d.bHigh.toPrecision(3)}` : '';
  const rough = d.confidence === 'low' ? ' — a rough value only: the profile is rated low' : d.bDetermined ? '' : ' — not determined';
  return `≈ ${d.B.toPrecision(4)} cm⁻¹ (${d.bMethod}${range})${rough}`;
}

function DiagnosisBox() {
  const d = useBench((s) => s.contourDiagnosis);
  const error = useBench((s) => s.contourDiagnosisError);
  const temperature = useBench((s) => s.model.temperatureK);
  const running = useBench((s) => s.contourDiagnosing);
  return (
    <div className="contour-diagnosis" data-testid="contour-diagnosis" data-running={running}>
      <div className="row">
        <button type="button" onClick={() => void contourDiagnose()} data-testid="contour-diagnose">
          {running ? 'Diagnose again' : 'Diagnose band shape'}
        </button>
        <span className="muted small" role="status">
          {running ? 'diagnosing in the background…' : `at the model’s temperature, ${temperature} K`}
        </span>
      </div>
      {error && <p className="inline-error">{error}</p>}
      {d && (
        <>
          <p data-testid="contour-profile" data-profile={d.profile} data-confidence={d.confidence}>
            <strong>{d.profile}</strong> — {d.type.replace(/-/g, ' ')} band (confidence {d.confidence}
            {d.alternativeType ? `; could also be ${d.alternativeType.replace(/-/g, ' ')}` : ''}). {d.implication}
          </p>
          <p data-testid="contour-b-estimate" data-b={d.B ?? ''} data-determined={d.bDetermined === true}>
            origin ≈ {d.origin.toFixed(3)} cm⁻¹; B {diagnosisBText(d)}
            {d.qSpacing !== undefined ? `; Q-branch spacing ${d.qSpacing.toPrecision(5)} cm⁻¹` : ''}
          </p>
          <QSeriesContourLine />
          <p className="muted small">Evidence: {d.evidence}</p>
          <button type="button" onClick={() => void contourApplyStartModel()} data-testid="contour-start-model">
            Build a starting model from these estimates…
          </button>
        </>
      )}
    </div>
  );
}

/** B of a series of Q branches from the contour fit through the instrument: the offer to run it, its progress, its answer. */
function QSeriesContourLine() {
  const d = useBench((s) => s.contourDiagnosis);
  const refine = useBench((s) => s.contourRefine);
  const opd = useBench((s) => s.contourOpdCm);
  const apodization = useBench((s) => s.contourApodization);
  if (!d || d.profile !== 'Q-series') return null;
  const c = d.qSeriesContour;
  return (
    <div className="contour-qseries-b" data-testid="contour-qseries-b" data-status={refine.status}>
      {c && (
        <p data-testid="contour-qseries-b-result" data-b={c.B} data-sigma={c.bSigma} data-determined={c.determined}>
          Contour fit of the whole band through the instrument: B = {fmt(c.B, c.bSigma)} cm⁻¹, range {c.bLow.toPrecision(4)} …{' '}
          {c.bHigh.toPrecision(4)} cm⁻¹
          {c.otherMinimaB.length
            ? ` (B ± 2σ widened over other minima about as deep, at B = ${c.otherMinimaB.map((v) => v.toPrecision(4)).join(', ')} cm⁻¹)`
            : ' (B ± 2σ)'}
          , residual {c.rmsOverNoise.toFixed(2)}× the noise.{' '}
          {c.determined ? <strong>B determined.</strong> : <span className="inline-error">B not determined: {c.whyNot}.</span>}
        </p>
      )}
      {refine.status !== 'running' && (
        <div className="row">
          <button type="button" onClick={() => void contourDiagnoseThroughInstrument()} data-testid="contour-qseries-b-run">
            {c ? 'Read B again through the instrument…' : 'Read B from a contour fit through the instrument…'}
          </button>
          <span className="muted small">
            L = {opd} cm, {apodization}; several contour fits in a worker, some seconds
          </span>
        </div>
      )}
      {refine.status === 'running' && (
        <div className="row">
          <span role="status" data-testid="contour-qseries-b-progress">
            contour fit {refine.runsDone + 1} of about {Math.max(refine.runsPlanned, refine.runsDone + 1)}
          </span>
          <button type="button" onClick={contourDiagnoseCancel} data-testid="contour-qseries-b-cancel">
            Cancel
          </button>
        </div>
      )}
      {refine.status === 'cancelled' && <span className="muted">Cancelled; the diagnosis is as it was.</span>}
      {refine.status === 'error' && <span className="inline-error">{refine.error}</span>}
    </div>
  );
}

function FitBox() {
  const fit = useBench((s) => s.contourFit);
  const trace = useBench((s) => s.trace);
  const model = useBench((s) => s.model);
  const r = fit.result;
  return (
    <div className="contour-fit" data-testid="contour-fit" data-status={fit.status}>
      <div className="row">
        <button
          type="button"
          className="primary"
          onClick={() => void contourFitStart()}
          disabled={fit.status === 'running'}
          data-testid="contour-fit-start"
        >
          Fit contour
        </button>
        {fit.status === 'running' && (
          <>
            <span role="status" data-testid="contour-progress">
              stage {fit.stage}, iteration {fit.iteration}
              {Number.isFinite(fit.rms) ? `, rms ${fit.rms.toExponential(2)}` : ''}
            </span>
            <button type="button" onClick={contourFitCancel} data-testid="contour-fit-cancel">
              Cancel
            </button>
          </>
        )}
        {fit.status === 'cancelled' && <span className="muted">Cancelled; nothing changed.</span>}
        {fit.status === 'error' && <span className="inline-error">{fit.error}</span>}
        {r && fit.trace !== trace && <span className="muted">The last fit was made on another trace; fit again.</span>}
        {r && fit.status !== 'running' && fit.trace === trace && (
          <button type="button" onClick={contourFitAccept} data-testid="contour-fit-accept">
            Put the fitted constants into the model
          </button>
        )}
      </div>
      {r && fit.trace === trace && (
        <>
          <p className="muted small" data-testid="contour-fit-summary" data-rms={r.rms}>
            {r.nPoints} points, rms {r.rms.toExponential(3)} (absorbance),{' '}
            {r.route === 'linear' ? 'instrument on τ (optically thin)' : 'instrument on transmittance'}, {r.status}, {r.iterations}{' '}
            iterations. Floated constants with σ; held ones in grey.
          </p>
          <table className="contour-parameters" data-testid="contour-parameters">
            <thead>
              <tr>
                <th>constant</th>
                <th>value (σ)</th>
                <th>start</th>
              </tr>
            </thead>
            <tbody>
              {Object.entries(r.parameters).map(([key, p]) => (
                <tr
                  key={key}
                  className={p.fixed ? 'muted' : ''}
                  data-key={key}
                  data-value={p.value}
                  data-sigma={p.sigma}
                  data-fixed={p.fixed}
                >
                  <td>{key === 'lorentz' ? 'Lorentz HWHM' : constantNameText(key)}</td>
                  <td className="num">{p.fixed ? `${p.value} (held)` : fmt(p.value, p.sigma)}</td>
                  <td className="num muted">{key === 'lorentz' ? '' : String(startOf(model, key) ?? '')}</td>
                </tr>
              ))}
              <tr>
                <td>scale</td>
                <td className="num">{fmt(r.scale, r.scaleSigma)}</td>
                <td />
              </tr>
              {r.baseline.map((c, k) => (
                <tr key={`b${k}`}>
                  <td>baseline c{k}</td>
                  <td className="num">{fmt(c, r.baselineSigma[k])}</td>
                  <td />
                </tr>
              ))}
            </tbody>
          </table>
          <h4>What one contour determines</h4>
          <ul data-testid="contour-combinations">
            {Object.entries(r.combinations).map(([name, v]) => (
              <li key={name}>
                {name.replace(/zeta/g, 'ζ')} = {fmt(v.value, v.sigma)} cm⁻¹
              </li>
            ))}
          </ul>
          {r.correlations.length > 0 && (
            <p className="small">
              Correlations:{' '}
              {r.correlations.map((c) => `${constantKeysToNames(c.a)}–${constantKeysToNames(c.b)} ρ = ${c.rho.toFixed(4)}`).join('; ')}
            </p>
          )}
          {r.warnings.length > 0 && (
            <ul className="contour-warnings" data-testid="contour-warnings">
              {r.warnings.map((w, i) => (
                <li key={i}>{constantKeysToNames(w)}</li>
              ))}
            </ul>
          )}
        </>
      )}
    </div>
  );
}

function startOf(model: ReturnType<typeof useBench.getState>['model'], key: string): number | null {
  const [side, name] = key.split('.');
  if ((side !== 'upper' && side !== 'lower') || !(name in model[side])) return null;
  return model[side][name as keyof typeof model.upper];
}

function QBranchBox() {
  const rows = useBench((s) => s.contourQMaxima);
  const fit = useBench((s) => s.contourQFit);
  const error = useBench((s) => s.contourQFitError);
  const model = useBench((s) => s.model);
  const u = shapeUniqueName(model.shape);
  const origin = fit && u ? qBranchOrigin(fit, model.upper[u] * model.upper.zeta) : null;
  return (
    <div className="contour-qbranch" data-testid="contour-qbranch">
      <h4>Q-branch sub-band analysis</h4>
      <div className="row">
        <button type="button" onClick={contourQFind} data-testid="contour-q-find">
          Find Q maxima
        </button>
        <button type="button" onClick={contourQFitRun} disabled={rows.every((q) => q.m === null)} data-testid="contour-q-fit">
          Fit sub-band centres
        </button>
        <span className="muted small">
          Index m = K″ for ^rQ_K (ΔK = +1), −K″ for ^pQ_K; proposals from the model’s ladder are marked “guess”.
        </span>
      </div>
      {error && <p className="inline-error">{error}</p>}
      {rows.length > 0 && (
        <table data-testid="contour-q-table">
          <thead>
            <tr>
              <th>maximum / cm⁻¹</th>
              <th>σ</th>
              <th>m</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {rows.map((q, i) => (
              <tr key={i}>
                <td className="num">{q.wavenumberCm1.toFixed(3)}</td>
                <td className="num">{q.sigmaCm1.toExponential(1)}</td>
                <td>
                  <input
                    size={4}
                    defaultValue={q.m ?? ''}
                    key={`${q.wavenumberCm1}:${q.m}`}
                    aria-label={`index m of the maximum at ${q.wavenumberCm1.toFixed(3)} cm⁻¹`}
                    onBlur={(e) => {
                      const t = e.target.value.trim();
                      const m = t === '' ? null : Number(t);
                      if (m === null || Number.isInteger(m)) contourQSetIndex(i, m);
                      else e.target.value = q.m === null ? '' : String(q.m);
                    }}
                  />
                </td>
                <td className="muted small">{q.isGuess ? 'guess' : ''}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {fit && (
        <ul data-testid="contour-q-result">
          <li>sub-band centre c₀ = ν₀ + A′(1 − 2ζ) − B′ = {fmt(fit.subBandCentre.value, fit.subBandCentre.sigma)} cm⁻¹</li>
          <li>
            {u ?? 'A'}′(1 − ζ) − B′ = {fmt(fit.uniqueZetaMinusB.value, fit.uniqueZetaMinusB.sigma)} cm⁻¹
          </li>
          <li>
            ({u ?? 'A'}′ − B′) − ({u ?? 'A'}″ − B″) = {fmt(fit.deltaUniqueMinusB.value, fit.deltaUniqueMinusB.sigma)} cm⁻¹
          </li>
          {origin && (
            <li>
              origin ν₀ = {fmt(origin.value, origin.sigma)} cm⁻¹ (with {u}′ζ = {(model.upper[u!] * model.upper.zeta).toFixed(4)} cm⁻¹ from
              the model, held)
            </li>
          )}
          {fit.warnings.map((w, i) => (
            <li key={i} className="muted">
              {w}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

function ActivityBox() {
  const d = useBench((s) => s.contourDiagnosis);
  const [formula, setFormula] = useState('CH3F');
  const [candidates, setCandidates] = useState('C3v: 3A1 + 3E\nC2v: 4A1 + A2 + 2B1 + 2B2');
  const rows = useMemo(() => {
    let n: number | null = null;
    let formulaError: string | null = null;
    try {
      n = formulaAtoms(formula).atoms;
    } catch (err) {
      formulaError = (err as Error).message.replace(/^formulaAtoms: /, '');
    }
    const list = candidates
      .split('\n')
      .map((l) => l.trim())
      .filter(Boolean)
      .map((line) => {
        const [group, gamma = ''] = line.split(':');
        try {
          const a = vibrationalActivity(group.trim(), gammaVibParse(gamma));
          const linear = /inf|∞/i.test(group);
          const expected = n === null ? null : 3 * n - (linear ? 5 : 6);
          const mismatch =
            expected !== null && expected !== a.degreesOfFreedom
              ? `Γ_vib has ${a.degreesOfFreedom} degrees of freedom, 3N − ${linear ? 5 : 6} = ${expected}`
              : null;
          return { line, text: a.summary, mismatch, error: null as string | null };
        } catch (err) {
          return { line, text: '', mismatch: null, error: (err as Error).message.replace(/^\w+: /, '') };
        }
      });
    return { n, formulaError, list };
  }, [formula, candidates]);
  return (
    <div className="contour-activity" data-testid="contour-activity">
      <h4>Infrared-active fundamentals of candidate structures</h4>
      <div className="row">
        <label>
          formula <input size={10} value={formula} onChange={(e) => setFormula(e.target.value)} data-testid="activity-formula" />
        </label>
        <span className="muted small">{rows.n !== null ? `N = ${rows.n} atoms` : rows.formulaError}</span>
      </div>
      <label className="block">
        one candidate a line, point group: Γ_vib
        <textarea rows={3} cols={50} value={candidates} onChange={(e) => setCandidates(e.target.value)} data-testid="activity-candidates" />
      </label>
      <ul data-testid="activity-result">
        {rows.list.map((r) => (
          <li key={r.line}>
            {r.error ? (
              <span className="inline-error">
                {r.line}: {r.error}
              </span>
            ) : (
              r.text
            )}
            {r.mismatch && <span className="inline-error"> — {r.mismatch}</span>}
          </li>
        ))}
      </ul>
      <p className="muted small">
        The trace shows: {d ? `${d.profile}, i.e. a ${d.type.replace(/-/g, ' ')} band (confidence ${d.confidence})` : 'not diagnosed yet'}.
      </p>
    </div>
  );
}

export function ContourPanel() {
  const trace = useBench((s) => s.trace);
  const regionSet = useBench((s) => s.contourRegion);
  const fit = useBench((s) => (s.contourFit.trace === s.trace ? s.contourFit.result : null));
  const qRows = useBench((s) => s.contourQMaxima);
  const isDark = useBench((s) => s.theme === 'dark');
  const region = useMemo<[number, number] | null>(() => {
    if (regionSet) return regionSet;
    const x = trace?.wavenumberCm1;
    return x && x.length > 1 ? [x[0], x[x.length - 1]] : null;
  }, [regionSet, trace]);
  const figure = useMemo(
    () =>
      trace && region ? contourFigure({ trace, region, fit, qMaxima: qRows.map((q) => q.wavenumberCm1), columns: 900, isDark }) : null,
    [trace, region, fit, qRows, isDark],
  );
  return (
    <div className="contour-panel" data-testid="contour-panel">
      <RegionRow />
      {!trace && <p className="muted">Load a trace (or the low-resolution demo) to analyse an unresolved band.</p>}
      {figure && (
        <PlotlyChart
          data={figure.data}
          layout={figure.layout}
          label="The region with the fitted contour and the residual; zoom to select a region, double-click for the whole trace"
          onRelayout={(e) => {
            const r = contourRelayoutRegion(e);
            if (r !== undefined) contourSetRegion(r);
          }}
          testId="contour-plot"
          className="contour-plot"
        />
      )}
      <div className="contour-columns">
        <DiagnosisBox />
        <FitBox />
      </div>
      <QBranchBox />
      <ActivityBox />
    </div>
  );
}
