import { fitKeyParse } from '../fit/bandDesign';
import { fitBand } from '../fit/fitBand';
import type { FitError, FitLineInput, FitResult } from '../fit/fitTypes';
import { shapeUniqueName, type BandModel, type ParameterName } from '../physics/model';

/** Outcome of assistantRefit: a fit (or why none), the constants floated and why others were held. */
export interface AssistantRefitOutcome {
  fit: FitResult | null;
  error: FitError | null;
  /** Constants floated in the fit that succeeded (or in the last attempt). */
  floated: string[];
  /** Plain words: constants held at their model values and why. */
  notes: string[];
}

/** Constants dropped again when the fit leaves them insignificant (the rest of the staging is kept). */
const HIGHER_ORDER = new Set(['DJ', 'DJK', 'DK', 'HJ', 'HJK', 'HKJ', 'HK']);
/** |value|/σ below which a higher-order constant counts as not determined (common practice: 2–3). */
const SIGNIFICANCE = 2;

/** What the fitted lines span (decides which constants they can determine). */
interface LineSpan {
  n: number;
  distinctK: number;
  jMax: number;
  hasQ: boolean;
  hasPR: boolean;
}

function lineSpan(lines: readonly FitLineInput[]): LineSpan {
  // Distinct (K', K'') pairs: in a perpendicular band the sub-bands rK and pK of one K'' differ.
  const ks = new Set<string>();
  let n = 0;
  let jMax = 0;
  let hasQ = false;
  let hasPR = false;
  for (const l of lines) {
    if (l.isExcluded) continue;
    n++;
    ks.add(`${l.kUpper},${l.kLower}`);
    jMax = Math.max(jMax, l.jLower);
    if (l.jUpper === l.jLower) hasQ = true;
    else hasPR = true;
  }
  return { n, distinctK: ks.size, jMax, hasQ, hasPR };
}

/**
 * Stages of floating, earliest first: each stage's constants and when the lines can carry them.
 * Thresholds are common practice for a bootstrap (the centrifugal terms only once the lines
 * reach J'' ~ 10 and several K); the rank test of the fit then removes what is still undetermined.
 */
function stagedKeys(model: BandModel, span: LineSpan): string[][] {
  const both = (name: ParameterName) => [`upper.${name}`, `lower.${name}`];
  const unique = shapeUniqueName(model.shape);
  const stages: string[][] = [['upper.origin']];
  if (span.n >= 3) stages.push(both('B'));
  if (unique && span.distinctK >= 2) stages.push([...both(unique), 'upper.zeta']);
  if (model.shape === 'linear' && model.band === 'perpendicular' && span.hasQ && span.hasPR && span.n >= 4) stages.push(['upper.q']);
  if (span.n >= 12 && span.jMax >= 10) stages.push(both('DJ'));
  if (unique && span.n >= 20 && span.distinctK >= 3 && span.jMax >= 10) stages.push(both('DJK'));
  if (unique && span.n >= 25 && span.distinctK >= 4) stages.push(both('DK'));
  if (span.n >= 60 && span.jMax >= 25) stages.push(both('HJ'));
  if (unique && span.n >= 80 && span.distinctK >= 4 && span.jMax >= 20) stages.push([...both('HJK'), ...both('HKJ')]);
  if (unique && span.n >= 100 && span.distinctK >= 6) stages.push(both('HK'));
  return stages;
}

/** Every constant in the order of the staging (lowest order first), for a floated set chosen by the data. */
function allKeysInOrder(model: BandModel): string[][] {
  const both = (name: ParameterName) => [`upper.${name}`, `lower.${name}`];
  const unique = shapeUniqueName(model.shape);
  const stages: string[][] = [['upper.origin'], both('B')];
  if (unique) stages.push([...both(unique), 'upper.zeta']);
  if (model.shape === 'linear') stages.push(['upper.q']);
  stages.push(both('DJ'));
  if (unique) stages.push(both('DJK'), both('DK'));
  stages.push(both('HJ'));
  if (unique) stages.push([...both('HJK'), ...both('HKJ')], both('HK'));
  return stages;
}

/**
 * Fit the band to the current lines, floating only what they can determine.
 *
 * Staging: origin first, then B′ and B″ (≥ 3 lines), the unique-axis constants and ζ (≥ 2 sub-bands, i.e. distinct (K′, K″)),
 * DJ (≥ 12 lines reaching J'' ≥ 10), DJK, DK, then H terms as the set grows; only keys in
 * `floatable` are ever floated, at most N − 2 of them from 5 lines on, N − 1 below (the rest wait). A refusal of the fit
 * for an under-determined set (rank diagnosis of fitBand) fixes the constants it suggests, or the
 * latest-staged one involved, and tries again; too few lines drops the latest-staged key; a
 * centrifugal constant (D, H) the fit leaves below 2σ is held at its model value and the fit
 * repeated (a t-test, common practice when building up a fit). Never
 * throws for an under-determined set; a set no constant can be fitted to gives fit null and the error.
 * With `determined` (the keys a prior-regularised fit finds pinned down by the lines, see
 * assistantPosteriorDetermined) the staging by counts is replaced by that set.
 * Source: weighted least squares and rank diagnosis of fit/fitBand.ts; staging is common practice
 * of bootstrapping a band analysis (low-order constants first).
 * @param model start model; constants not floated stay at these values (cm^-1)
 * @param floatable keys ("upper.B", …) the user allows to float
 * @param lines lines of the fit (cm^-1)
 * @param previous optional earlier fit: its values start the floated constants (faster, same answer)
 * @param determined optional keys to float in place of the count-based staging
 */
export function assistantRefit(
  model: BandModel,
  floatable: readonly string[],
  lines: readonly FitLineInput[],
  previous?: FitResult | null,
  determined?: readonly string[],
): AssistantRefitOutcome {
  const allowed = new Set(floatable);
  const span = lineSpan(lines);
  const notes: string[] = [];
  const staged = (determined ? allKeysInOrder(model) : stagedKeys(model, span)).map((keys) =>
    keys.filter((k) => allowed.has(k) && (!determined || determined.includes(k))),
  );
  let floated = staged.flat();
  // Two degrees of freedom once there are 5 lines (the Student factor is 6.5 at one, 2.2 at two).
  const cap = span.n >= 5 ? span.n - 2 : span.n >= 2 ? span.n - 1 : span.n;
  if (floated.length > cap) {
    notes.push(
      `${floated.length - cap} constant(s) wait for more lines (${floated.slice(cap).join(', ')}): ${span.n} lines keep at most ${cap} floated`,
    );
    floated = floated.slice(0, cap);
  }
  const waiting = floatable.filter((k) => !floated.includes(k) && !staged.flat().includes(k));
  if (waiting.length) notes.push(`not yet floated (the lines do not reach far enough in J or K): ${waiting.join(', ')}`);

  const start = (keys: string[]): BandModel => {
    const m: BandModel = { ...model, lower: { ...model.lower }, upper: { ...model.upper } };
    if (previous) {
      for (const key of keys) {
        if (!previous.floated.includes(key)) continue;
        const k = fitKeyParse(key)!;
        m[k.side][k.name] = previous.model[k.side][k.name];
      }
    }
    return m;
  };
  const rankOf = (key: string) => staged.findIndex((s) => s.includes(key));
  let lastError: FitError | null = null;
  for (let attempt = 0; attempt < 20; attempt++) {
    const outcome = fitBand({ model: start(floated), floated, lines });
    if (outcome.ok) {
      // Centrifugal constants the lines do not yet determine (|value| < 2σ) are held at the model
      // value: floated, they would only blur every prediction beyond the data.
      const weak = outcome.result.isExactlyDetermined
        ? []
        : floated.filter((k) => {
            const name = fitKeyParse(k)?.name ?? '';
            if (!HIGHER_ORDER.has(name)) return false;
            const p = outcome.result.parameters[k];
            return p.sigma !== null && Math.abs(p.value) < SIGNIFICANCE * p.sigma;
          });
      if (weak.length === 0) return { fit: outcome.result, error: null, floated, notes };
      notes.push(
        `${weak.join(', ')} held at the model value${weak.length > 1 ? 's' : ''}: not yet determined by the lines (|value| < ${SIGNIFICANCE}σ)`,
      );
      floated = floated.filter((k) => !weak.includes(k));
      continue;
    }
    const e = outcome.error;
    lastError = e;
    if (e.kind === 'underdetermined' || e.kind === 'unused-parameter') {
      let drop = e.fixSuggested.filter((k) => floated.includes(k));
      if (drop.length === 0) {
        const involved = e.parameters.filter((k) => floated.includes(k));
        if (involved.length === 0) break;
        drop = [involved.reduce((a, b) => (rankOf(b) > rankOf(a) ? b : a))];
      }
      notes.push(`${drop.join(', ')} held at the model value${drop.length > 1 ? 's' : ''}: ${e.message}`);
      floated = floated.filter((k) => !drop.includes(k));
    } else if (e.kind === 'too-few-lines' && floated.length > 0) {
      notes.push(`${floated[floated.length - 1]} held at the model value: ${e.message}`);
      floated = floated.slice(0, -1);
    } else {
      break;
    }
  }
  return { fit: null, error: lastError, floated, notes };
}
