/** Keyboard and mouse help ("?"). */
import { viewSet } from '../state/actionsView';
import { useBench } from '../state/store';

const KEYS: [string, string][] = [
  ['click a peak', 'list candidate transitions near it, best first'],
  ['1 … 9', 'assign the candidate with that number'],
  ['click a rung, then a peak', 'assign that line to that peak (the cursor then moves to the next J″)'],
  ['→ / ←', 'select the next / previous J″ of the selected series (starts at the strongest line)'],
  ['↑ / ↓', 'the same J″ in the series of the next / previous K″'],
  [
    'A or Enter',
    'assign the selected rung where exactly one peak matches within ±kσ (k in the toolbar; otherwise it says why), or the top candidate',
  ],
  ['Z', 'zoom to the selected rung'],
  ['F', 'fit the assigned lines'],
  ['Delete', 'delete the selected assignment'],
  ['Ctrl+Z / Ctrl+Shift+Z (Ctrl+Y)', 'undo / redo assignments and model edits'],
  ['Esc', 'close the candidate list, deselect, close this help'],
  ['drag on the plot', 'zoom into a range; double-click to zoom out; wheel zooms, shift-drag pans'],
  ['drop a file on the page', 'trace (CSV/TXT/JCAMP-DX), model (JSON), line table (CSV) or project'],
  ['?', 'show or hide this help'],
];

export function HelpOverlay() {
  const isOpen = useBench((s) => s.isHelpOpen);
  if (!isOpen) return null;
  return (
    <div className="overlay" role="dialog" aria-modal="true" aria-labelledby="help-title" onClick={() => viewSet('isHelpOpen', false)}>
      <div className="overlay-card" onClick={(e) => e.stopPropagation()}>
        <div className="panel-head">
          <h2 id="help-title">Keys and clicks</h2>
          <button type="button" className="icon" aria-label="Close help" onClick={() => viewSet('isHelpOpen', false)} autoFocus>
            ✕
          </button>
        </div>
        <table className="help-table">
          <tbody>
            {KEYS.map(([k, v]) => (
              <tr key={k}>
                <th scope="row">
                  <kbd>{k}</kbd>
                </th>
                <td>{v}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <p className="muted small">
          Line labels read <sup>ΔK</sup>ΔJ<sub>K″</sub>(J″): p, q, r for ΔK = −1, 0, +1 and P, Q, R for ΔJ = −1, 0, +1. In the ladders, P
          rungs hang below their row line, R rungs stand above it and Q rungs cross it; rung length grows with intensity. Green dots mark
          assigned lines, red crosses lines assigned far from their prediction.
        </p>
      </div>
    </div>
  );
}
