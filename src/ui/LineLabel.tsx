/** A line label in trade notation ^ΔK ΔJ_K''(J'') with real super- and subscripts (React elements, no markup strings). */
import { lineLabelParts } from '../physics/lineLabel';
import type { TopShape, TransitionQuanta } from '../physics/model';

export function LineLabel({ q, shape }: { q: TransitionQuanta; shape: TopShape }) {
  const p = lineLabelParts(q.kUpper - q.kLower, q.jUpper - q.jLower, q.kLower, q.jLower, shape);
  return (
    <span className="line-label">
      {p.deltaKLetter && <sup>{p.deltaKLetter}</sup>}
      {p.branchLetter}
      {p.kLower !== null && <sub>{p.kLower}</sub>}({p.jLower})
    </span>
  );
}
