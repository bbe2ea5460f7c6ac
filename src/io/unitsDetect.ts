/**
 * Guessing the abscissa unit and the ordinate quantity of a trace from header words or from the values.
 */
import type { TraceOrdinate, TraceXUnit } from './trace';

/** What a label says about the abscissa; 'wavelength' means a wavelength without a stated unit. */
export type UnitsXHint = TraceXUnit | 'wavelength';
/** What a label says about the ordinate; 'transmittance' leaves fraction vs percent to the values. */
export type UnitsOrdinateHint = 'absorbance' | 'transmittance' | 'percent-transmittance';

const word = (re: string) => new RegExp(`(^|[^a-z])(${re})([^a-z]|$)`);
const RE_CM1 = /cm\s*(\^|\*\*)?\s*[-−‑]\s*1|cm⁻¹|1\s*\/\s*cm|wavenumber|wave number|cm-1/;
const RE_UM = word('um|µm|μm|micron|microns|micrometers?|micrometres?|mu|mum');
const RE_NM = word('nm|nanometers?|nanometres?');
const RE_WAVELENGTH = /wavelength|lambda|λ/;

/**
 * Abscissa unit named in a header field or a JCAMP ##XUNITS value ("wavenumber (cm-1)", "1/CM",
 * "wavelength (um)", "MICROMETERS", "nm").
 * @param label untrusted header text
 * @returns the unit, 'wavelength' when only the quantity is named, or undefined when the label says nothing
 */
export function unitsXFromLabel(label: string): UnitsXHint | undefined {
  const s = label.toLowerCase();
  if (RE_CM1.test(s)) return 'cm-1';
  if (RE_UM.test(s)) return 'um';
  if (RE_NM.test(s)) return 'nm';
  if (RE_WAVELENGTH.test(s)) return 'wavelength';
  return undefined;
}

/**
 * Ordinate quantity named in a header field or a JCAMP ##YUNITS value ("%T", "transmittance",
 * "PERCENT TRANSMITTANCE", "absorbance", "Abs").
 * @param label untrusted header text
 * @returns the quantity, or undefined when the label says nothing recognisable
 */
export function unitsOrdinateFromLabel(label: string): UnitsOrdinateHint | undefined {
  const s = label.toLowerCase();
  // log(1/T) names transmittance inside an absorbance label, so it is tested first.
  if (/log\s*\(?\s*1\s*\/\s*t/.test(s) || /absorbance|absorption/.test(s) || word('abs').test(s)) return 'absorbance';
  const isTrans = /transmit|transmission/.test(s) || word('t').test(s.replace(/%/g, ' '));
  if (isTrans && /%|percent|per cent/.test(s)) return 'percent-transmittance';
  if (isTrans) return 'transmittance';
  return undefined;
}

/** Result of guessing the ordinate from its values, with the evidence for the report. */
export interface UnitsOrdinateGuess {
  ordinate: TraceOrdinate;
  /** Plain-language evidence, e.g. "values in [0.12, 1.01], median 0.95". */
  reason: string;
}

/** Summary statistics of ordinate values used by the guess. */
export interface UnitsValueStats {
  min: number;
  max: number;
  /** Median of a strided sample of at most ~10 000 finite values. */
  median: number;
  count: number;
}

/**
 * Min, max and (sampled) median of the finite values.
 * @param values ordinate values in file units
 */
export function unitsValueStats(values: Float64Array): UnitsValueStats {
  let min = Infinity;
  let max = -Infinity;
  let count = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v === v && v !== Infinity && v !== -Infinity) {
      if (v < min) min = v;
      if (v > max) max = v;
      count++;
    }
  }
  // The median is taken on a strided sample: exact enough for a yes/no guess and O(n) instead of a full sort.
  const stride = Math.max(1, Math.floor(values.length / 10001));
  const sample: number[] = [];
  for (let i = 0; i < values.length; i += stride) {
    const v = values[i];
    if (Number.isFinite(v)) sample.push(v);
  }
  sample.sort((a, b) => a - b);
  const median = sample.length === 0 ? NaN : sample[sample.length >> 1];
  return { min, max, median, count };
}

const fmt = (v: number) => Number(v.toPrecision(4)).toString();

/** Fewest values for which the ordinate is guessed from the shape of the data. */
export const UNITS_GUESS_MIN_VALUES = 5;

/**
 * Guess whether ordinate values are transmittance, percent transmittance or absorbance.
 * Rule (common practice, stated as a heuristic): transmittance spectra sit near their maximum with bands
 * dipping down, so the median is high and closer to the maximum than to the minimum; T fits in
 * [−0.05, 1.05] with median ≥ 0.5, %T fits in [−5, 110] with median ≥ 10; anything else is absorbance.
 * Fewer than `UNITS_GUESS_MIN_VALUES` values say too little about a shape: they are taken as absorbance.
 * @param stats statistics from `unitsValueStats`
 */
export function unitsOrdinateFromValues(stats: UnitsValueStats): UnitsOrdinateGuess {
  const { min, max, median } = stats;
  const range = `values in [${fmt(min)}, ${fmt(max)}], median ${fmt(median)}`;
  if (stats.count < UNITS_GUESS_MIN_VALUES) return { ordinate: 'absorbance', reason: `only ${stats.count} values, too few to judge` };
  const dipsDown = median - min >= max - median;
  if (min >= -0.05 && max <= 1.05 && median >= 0.5 && dipsDown) return { ordinate: 'transmittance', reason: range };
  if (min >= -5 && max <= 110 && max > 1.05 && median >= 10 && dipsDown) return { ordinate: 'percent-transmittance', reason: range };
  return { ordinate: 'absorbance', reason: range };
}

/**
 * Decide fraction vs percent for a label that only says "transmittance": values above 1.5 mean percent.
 * @param stats statistics from `unitsValueStats`
 */
export function unitsTransmittanceScale(stats: UnitsValueStats): 'transmittance' | 'percent-transmittance' {
  return stats.max > 1.5 ? 'percent-transmittance' : 'transmittance';
}
