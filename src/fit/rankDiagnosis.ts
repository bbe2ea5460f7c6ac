/**
 * Explain in words why a band fit is under-determined, and which constants to fix.
 */
import type { BandModel, TransitionQuanta } from '../physics/model';
import { bandProblem, fitKeyParse } from './bandDesign';
import { quantaQuickValid } from './fitCheck';
import type { FitError } from './fitTypes';
import { jacobiSvd } from './jacobiSvd';
import { lineariserCreate, type Linearisation } from './leastSquaresLinearise';

/** A parameter counts as part of a null direction when its (column-scaled) component exceeds this. */
export const NULL_SPACE_COMPONENT_MIN = 0.05;

/** Order in which constants are proposed for fixing (earliest first), lower state before upper. */
const FIX_PREFERENCE = ['A', 'C', 'DK', 'HK', 'HKJ', 'HJK', 'DJK', 'zeta', 'q', 'HJ', 'DJ', 'B', 'origin'];

function fixRank(key: string): number {
  const k = fitKeyParse(key);
  if (!k) return 1e6;
  const byName = FIX_PREFERENCE.indexOf(k.name);
  return (k.side === 'lower' ? 0 : 100) + (byName < 0 ? 50 : byName);
}

/** Numerical rank of the scaled Jacobian restricted to the given columns (via R of its QR). */
function rankOfColumns(lin: Linearisation, columns: number[], tol: number): number {
  const n = lin.nParameters;
  const sub = new Float64Array(n * columns.length);
  columns.forEach((c, j) => sub.set(lin.rTriangular.subarray(c * n, c * n + n), j * n));
  if (columns.length === 0) return 0;
  const { s } = jacobiSvd(sub, n, columns.length);
  let rank = 0;
  while (rank < s.length && s[rank] > tol * s[0]) rank++;
  return rank;
}

function whyUnused(key: string, model: Pick<BandModel, 'band' | 'shape'>): string {
  const k = fitKeyParse(key);
  if (!k) return '';
  if (k.name === 'zeta') {
    return model.band === 'parallel'
      ? 'the Coriolis constant ζ acts only in a perpendicular band'
      : 'the Coriolis term is 2A′ζK′, so ζ has no effect while the upper-state unique constant is 0';
  }
  if (k.name === 'q') return 'l-type doubling acts only on the Π upper state of a perpendicular band of a linear molecule';
  if (['A', 'C', 'DK', 'HK', 'DJK', 'HJK', 'HKJ'].includes(k.name)) return `every fitted line has K${k.side === 'upper' ? '′' : '″'} = 0`;
  return 'no fitted line depends on it';
}

/**
 * Turn a rank-deficient linearisation into a FitError: either constants no line depends on
 * ('unused-parameter'), or a null space of the Jacobian ('underdetermined'), naming the
 * constants in it and a smallest set to fix (chosen greedily in FIX_PREFERENCE order, each
 * choice checked to raise the rank).
 * @param lin the deficient linearisation
 * @param floated fit keys in the order of the Jacobian columns
 * @param model band type and shape (for the explanations)
 * @param rankRelativeTolerance the threshold used by the rank test
 */
export function rankDiagnosis(
  lin: Linearisation,
  floated: readonly string[],
  model: Pick<BandModel, 'band' | 'shape'>,
  rankRelativeTolerance: number,
): FitError {
  if (lin.zeroColumns.length > 0) {
    const keys = lin.zeroColumns.map((j) => floated[j]);
    const reasons = keys.map((k) => `${k} (${whyUnused(k, model)})`);
    return {
      kind: 'unused-parameter',
      message: `No fitted line depends on ${reasons.join('; ')}, so the data cannot determine ${keys.length > 1 ? 'them' : 'it'}.`,
      parameters: keys,
      suggestion: `Fix ${keys.join(', ')} (keep ${keys.length > 1 ? 'their' : 'its'} model-file value${keys.length > 1 ? 's' : ''}) and fit again.`,
      fixSuggested: keys,
    };
  }
  const n = lin.nParameters;
  const involved = new Set<number>();
  for (let j = lin.rank; j < n; j++) {
    let max = 0;
    for (let i = 0; i < n; i++) max = Math.max(max, Math.abs(lin.svd.v[j * n + i]));
    for (let i = 0; i < n; i++) if (Math.abs(lin.svd.v[j * n + i]) >= NULL_SPACE_COMPONENT_MIN * max) involved.add(i);
  }
  const involvedKeys = [...involved].sort((a, b) => a - b).map((i) => floated[i]);
  // Greedy: drop the most-preferred candidate whenever dropping it keeps the rank (removes one null direction).
  const remaining = Array.from({ length: n }, (_, i) => i);
  const toFix: string[] = [];
  const rank = lin.rank;
  for (const i of [...involved].sort((a, b) => fixRank(floated[a]) - fixRank(floated[b]))) {
    if (rank === remaining.length) break;
    const without = remaining.filter((c) => c !== i);
    if (rankOfColumns(lin, without, rankRelativeTolerance) === rank) {
      remaining.splice(remaining.indexOf(i), 1);
      toFix.push(floated[i]);
    }
  }
  const nullity = n - lin.rank;
  const has = (k: string) => involvedKeys.includes(k);
  const unique = model.shape === 'oblate' ? 'C' : 'A';
  const notes: string[] = [];
  if (model.band === 'parallel' && has(`upper.${unique}`) && has(`lower.${unique}`)) {
    notes.push(
      `in a parallel band (ΔK = 0) the lines depend only on ${unique}′ − ${unique}″${has('upper.DK') && has('lower.DK') ? ' and DK′ − DK″' : ''}, not on each state's value`,
    );
  } else if (model.band === 'parallel' && has('upper.DK') && has('lower.DK')) {
    notes.push('in a parallel band (ΔK = 0) the lines depend only on DK′ − DK″');
  }
  if (model.band === 'perpendicular' && has(`upper.${unique}`) && has(`lower.${unique}`) && has('upper.zeta')) {
    notes.push(
      `one perpendicular band determines only ${unique}′ − ${unique}″ and ${unique}′(1 − ζ), not ${unique}″, ${unique}′ and ζ separately`,
    );
  }
  const message =
    `The fit is under-determined: the lines fix only ${involvedKeys.length - nullity} combination${involvedKeys.length - nullity === 1 ? '' : 's'} of ` +
    `${involvedKeys.join(', ')}; ${nullity === 1 ? 'one direction' : `${nullity} directions`} in these constants leave${nullity === 1 ? 's' : ''} every line unchanged` +
    (notes.length ? ` (${notes.join('; ')})` : '') +
    '. No values are given for them.';
  const suggestion = toFix.length
    ? `Fix ${toFix.join(' and ')} at ${toFix.length > 1 ? 'values' : 'a value'} known from elsewhere (another band, microwave or ground-state combination differences) and fit again.`
    : `Fix one of ${involvedKeys.join(', ')} and fit again.`;
  return { kind: 'underdetermined', message, parameters: involvedKeys, suggestion, fixSuggested: toFix };
}

/**
 * The structural rank test: can lines of the kinds given determine the floated constants at all,
 * however many of them are assigned? Each (K′, K″, ΔJ) series present among the lines is filled
 * out with P + 4 consecutive J″ values from its lowest one (every line allowed by the band's
 * selection rules, J″ ≤ model.jMax + P + 4), and the rank test of the fit is run on the Jacobian
 * of that set at the model's values. A deficiency there is one no number of further lines of these
 * series can remove (A″ from ΔK = 0 lines only; A from K = 0 lines only); rankDiagnosis words it.
 * Run before the line-count test, so "assign more lines" is never advised where more lines
 * cannot help.
 * Source: rank of the design matrix (Golub & Van Loan 2013 §5.5); the series fill-out is derived
 * here: within one series, positions are polynomials in J(J+1) of degree ≤ 3, and P + 4 distinct
 * J values exceed every such degree.
 * @param model band model (cm^-1) at which the Jacobian is taken
 * @param floated fit keys in order
 * @param quanta the lines' quantum numbers (those in the fit)
 * @param rankRelativeTolerance the fit's rank threshold
 * @returns the FitError of a structural deficiency, or null when enough lines could determine the set
 */
export function rankDiagnosisStructural(
  model: BandModel,
  floated: readonly string[],
  quanta: readonly TransitionQuanta[],
  rankRelativeTolerance: number,
): FitError | null {
  const nP = floated.length;
  if (nP === 0 || quanta.length === 0) return null;
  const series = new Map<string, TransitionQuanta>();
  for (const q of quanta) {
    const key = `${q.kUpper},${q.kLower},${q.jUpper - q.jLower}`;
    const seen = series.get(key);
    if (!seen || q.jLower < seen.jLower) series.set(key, q);
  }
  const filled: TransitionQuanta[] = [];
  for (const q of series.values()) {
    const dj = q.jUpper - q.jLower;
    let added = 0;
    for (let j = q.jLower; added < nP + 4 && j <= q.jLower + 4 * (nP + 4) + 10; j++) {
      if (!quantaQuickValid(j + dj, q.kUpper, j, q.kLower, model.band, model.shape)) continue;
      filled.push({ jUpper: j + dj, kUpper: q.kUpper, jLower: j, kLower: q.kLower });
      added++;
    }
  }
  const n = filled.length;
  if (n < nP) return null;
  const posed = bandProblem(model, floated, {
    quanta: filled,
    observedCm1: new Float64Array(n),
    uncertaintyCm1: new Float64Array(n).fill(1),
  });
  const m = posed.problem.nObservations;
  if (m < nP) return null;
  const jac = new Float64Array(m * nP);
  const residuals = new Float64Array(m);
  posed.problem.jacobian(posed.start, jac);
  posed.problem.residuals(posed.start, residuals);
  const lin = lineariserCreate(m, nP, rankRelativeTolerance).linearise(jac, residuals);
  if (lin.rank === nP && lin.zeroColumns.length === 0) return null;
  const e = rankDiagnosis(lin, floated, model, rankRelativeTolerance);
  return {
    ...e,
    message: `${e.message} More lines of the same kinds (ΔK, K″ and branch) cannot change this.`,
  };
}
