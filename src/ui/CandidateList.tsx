/**
 * The ranked candidate transitions for the clicked peak; a click or a number key assigns. The list
 * sits in the lower corner on the far side of the peak, off the ladder panel, so the rungs it
 * names stay visible.
 */
import { memo } from 'react';
import { candidateAssign, selectCandidates, selectionClear } from '../state/actionsAssign';
import { selectFitResult } from '../state/selectors';
import { useBench } from '../state/store';
import { LineLabel } from './LineLabel';

// Memoised: it reads the store itself, so the plot's re-render on every click does not render it again.
export const CandidateList = memo(function CandidateList() {
  const target = useBench((s) => s.candidateTarget);
  const cands = useBench(selectCandidates);
  const shape = useBench((s) => s.model.shape);
  const hasFit = useBench((s) => selectFitResult(s) !== null);
  const xRange = useBench((s) => s.xRange);
  const traceFrom = useBench((s) => s.trace?.wavenumberCm1[0] ?? NaN);
  const traceTo = useBench((s) => s.trace?.wavenumberCm1[s.trace.wavenumberCm1.length - 1] ?? NaN);
  if (!target) return null;
  const [x0, x1] = xRange ?? [traceFrom, traceTo];
  // Peak in the right half of the view: list on the left, and the other way round.
  const side = Number.isFinite(x0) && Number.isFinite(x1) && (target.peakCm1 - x0) / (x1 - x0) > 0.5 ? 'left' : 'right';
  const hasHeights = cands.some((c) => c.heightRatio !== null);
  return (
    <div
      className="candidate-list"
      role="dialog"
      aria-label={`Candidates for the peak at ${target.peakCm1.toFixed(4)} cm⁻¹`}
      data-testid="candidates"
      data-side={side}
      style={{ top: 'auto', bottom: 8, maxHeight: '45%', ...(side === 'left' ? { left: 60, right: 'auto' } : { right: 18, left: 'auto' }) }}
    >
      <div className="candidate-head">
        <strong>Peak {target.peakCm1.toFixed(4)} cm⁻¹</strong>
        <button type="button" className="icon" aria-label="Close candidate list" onClick={selectionClear}>
          ✕
        </button>
      </div>
      {cands.length === 0 ? (
        <p className="muted">No predicted line near this peak.</p>
      ) : (
        <table>
          <thead>
            <tr>
              <th scope="col">Key</th>
              <th scope="col">Line</th>
              <th scope="col">calc / cm⁻¹</th>
              <th scope="col">obs − calc</th>
              <th
                scope="col"
                title={
                  hasFit
                    ? '|obs − calc| in units of the prediction σ from the current fit (⊕ peak σ)'
                    : '|obs − calc| in units of the first-guess σ (no fit yet: a tenth of the line spacing)'
                }
              >
                {hasFit ? '|o − c|/σ' : '|o − c|/σ₀'}
              </th>
              <th scope="col">Int.</th>
              {hasHeights && (
                <th
                  scope="col"
                  title="Observed peak height over the height this line's intensity predicts (a rough scale until three lines on single peaks are assigned)"
                >
                  obs/pred
                </th>
              )}
            </tr>
          </thead>
          <tbody>
            {cands.map((c, n) => (
              <tr
                key={`${c.band ?? ''}|${c.species ?? ''}|${c.lineIndex}`}
                className={`${c.isAssigned ? 'is-assigned' : ''} ${c.isWeak ? 'is-weak' : ''}`}
              >
                <td>
                  <button
                    type="button"
                    className="assign-btn"
                    onClick={() => candidateAssign(n)}
                    aria-label={`Assign ${c.labelAscii}${c.symmetryText ? ` ${c.symmetryText}` : ''}${c.band !== undefined ? ` of ${c.band} (${c.species})` : ''} (key ${n + 1})`}
                    data-testid={`candidate-${n}`}
                  >
                    {n + 1}
                  </button>
                </td>
                <td>
                  <LineLabel q={c} shape={shape} />
                  {c.symmetryText && (
                    <span className="sym-tag" title="level symmetry, upper ← lower" data-testid={`candidate-sym-${n}`}>
                      {c.symmetryText}
                    </span>
                  )}
                  {c.band !== undefined && (
                    <span className="band-tag" data-testid={`candidate-band-${n}`}>
                      {c.band}·{c.species}
                    </span>
                  )}
                  {c.isAssigned && (
                    <span className="badge" title="Already assigned">
                      assigned
                    </span>
                  )}
                </td>
                <td className="num">{c.predictedCm1.toFixed(4)}</td>
                <td className="num">
                  {c.distanceCm1 >= 0 ? '+' : '−'}
                  {Math.abs(c.distanceCm1).toFixed(4)}
                </td>
                <td className="num" data-testid={`candidate-sigma-${n}`}>
                  {c.distanceSigma === null ? '–' : c.distanceSigma.toFixed(1)}
                </td>
                <td className="num">{c.intensity.toPrecision(2)}</td>
                {hasHeights && <td className="num">{c.heightRatio === null ? '–' : c.heightRatio.toPrecision(2)}</td>}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <p className="hint">
        Ranked by distance in σ and agreement of height. Press 1–9 or click to assign; click a rung to assign that line instead; Esc closes.
      </p>
    </div>
  );
});
