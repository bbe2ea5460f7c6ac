/** The ranked candidate transitions for the clicked peak; a click or a number key assigns. */
import { candidateAssign, selectCandidates, selectionClear } from '../state/actionsAssign';
import { selectFitResult } from '../state/selectors';
import { useBench } from '../state/store';
import { LineLabel } from './LineLabel';

export function CandidateList() {
  const target = useBench((s) => s.candidateTarget);
  const cands = useBench(selectCandidates);
  const shape = useBench((s) => s.model.shape);
  const hasFit = useBench((s) => selectFitResult(s) !== null);
  if (!target) return null;
  return (
    <div
      className="candidate-list"
      role="dialog"
      aria-label={`Candidates for the peak at ${target.peakCm1.toFixed(4)} cm⁻¹`}
      data-testid="candidates"
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
              {hasFit && <th scope="col">σ</th>}
              <th scope="col">Int.</th>
            </tr>
          </thead>
          <tbody>
            {cands.map((c, n) => (
              <tr key={c.lineIndex} className={`${c.isAssigned ? 'is-assigned' : ''} ${c.isWeak ? 'is-weak' : ''}`}>
                <td>
                  <button
                    type="button"
                    className="assign-btn"
                    onClick={() => candidateAssign(n)}
                    aria-label={`Assign ${c.labelAscii} (key ${n + 1})`}
                    data-testid={`candidate-${n}`}
                  >
                    {n + 1}
                  </button>
                </td>
                <td>
                  <LineLabel q={c} shape={shape} />
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
                {hasFit && <td className="num">{c.distanceSigma === null ? '–' : c.distanceSigma.toFixed(1)}</td>}
                <td className="num">{c.intensity.toPrecision(2)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <p className="hint">Press 1–9 or click to assign; click a rung to assign that line instead; Esc closes.</p>
    </div>
  );
}
