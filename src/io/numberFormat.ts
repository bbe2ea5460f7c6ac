/**
 * Numbers as the trade prints them: a value with its standard uncertainty in parentheses in the
 * last digits, and a power of ten for very small or very large magnitudes, e.g. 2.0921(51)×10⁻⁷
 * for (2.0921 ± 0.0051)×10⁻⁷. One place for every constant shown on the page and in the report.
 * Pure: numbers in, text out.
 */

/** The pieces of a formatted number: mantissa, uncertainty digits and power of ten. */
export interface NumberParts {
  /** Mantissa as decimal text, e.g. "2.0921" or "-0.35" (never "-0"); "NaN", "∞" or "-∞" for non-finite values. */
  mantissa: string;
  /** The uncertainty in units of the mantissa's last digit, e.g. "51"; null when there is none. */
  uncertainty: string | null;
  /** Power of ten the mantissa is multiplied by (0: none). */
  exponent: number;
}

/** Options of numberParts. */
export interface NumberFormatOptions {
  /** Significant digits of a value shown without an uncertainty. @default 10 */
  significant?: number;
  /** Magnitudes below this use a power of ten. @default 1e-3 */
  smallBelow?: number;
  /** Magnitudes at or above this use a power of ten. @default 1e6 */
  largeFrom?: number;
}

const SUPERSCRIPT_DIGITS = '⁰¹²³⁴⁵⁶⁷⁸⁹';

/** An integer in superscript characters, e.g. -7 → "⁻⁷". */
export function superscriptInteger(n: number): string {
  const digits = String(Math.abs(Math.trunc(n)))
    .split('')
    .map((d) => SUPERSCRIPT_DIGITS[Number(d)])
    .join('');
  return n < 0 ? `⁻${digits}` : digits;
}

/** Drop the sign of a text that reads as zero ("-0.000" → "0.000"). */
function unsignedZero(text: string): string {
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/** Trailing zeros of a decimal fraction removed ("2.1300" → "2.13", "5.000" → "5"). */
function trimZeros(text: string): string {
  return text.includes('.') ? text.replace(/\.?0+$/, '') : text;
}

/**
 * Split a value and its 1σ into mantissa, uncertainty digits and power of ten. The uncertainty is
 * rounded to two significant digits (one more digit is dropped when rounding gives 100) and the value
 * to the same decimal place; a power of ten is used when the larger of |value| and σ is below
 * `smallBelow` or at/above `largeFrom`, or when σ reaches past the decimal point (σ ≥ 100 in the last
 * place kept), so that digits are never invented or cut off.
 * Source: BIPM JCGM 100:2008 (GUM) §7.2.2 (notation "100.021 47(35) g"); two significant digits of
 * the uncertainty is common practice.
 * @param value the value (any unit; the unit is the caller's)
 * @param sigma its 1σ in the same unit; null, 0, negative or non-finite means no uncertainty
 * @param options significant digits without σ and the thresholds of the power-of-ten form
 */
export function numberParts(value: number, sigma: number | null, options: NumberFormatOptions = {}): NumberParts {
  const significant = Math.min(17, Math.max(1, Math.round(options.significant ?? 10)));
  const smallBelow = options.smallBelow ?? 1e-3;
  const largeFrom = options.largeFrom ?? 1e6;
  if (Number.isNaN(value)) return { mantissa: 'NaN', uncertainty: null, exponent: 0 };
  if (!Number.isFinite(value)) return { mantissa: value > 0 ? '∞' : '-∞', uncertainty: null, exponent: 0 };
  const hasSigma = sigma !== null && Number.isFinite(sigma) && sigma > 0;
  const s = hasSigma ? (sigma as number) : 0;
  const magnitude = Math.max(Math.abs(value), s);
  if (magnitude === 0) return { mantissa: '0', uncertainty: null, exponent: 0 };
  let isPower = magnitude < smallBelow || magnitude >= largeFrom;
  let exponent = isPower ? Math.floor(Math.log10(magnitude)) : 0;
  // Two passes at most: the power may have to be raised once when rounding gives a mantissa of 10,
  // or introduced when σ reaches past the decimal point.
  for (let pass = 0; pass < 3; pass++) {
    const scale = 10 ** exponent;
    const v = value / scale;
    if (hasSigma) {
      const sv = s / scale;
      let decimals = 1 - Math.floor(Math.log10(sv));
      let digits = Math.round(sv * 10 ** decimals);
      if (digits >= 100) {
        decimals -= 1;
        digits = Math.round(sv * 10 ** decimals);
      }
      if (decimals < 0 || decimals > 20) {
        // σ of 100 or more in the units shown (or absurdly small): use the power of σ's magnitude.
        if (isPower && pass > 0) return { mantissa: unsignedZero(v.toExponential(1)), uncertainty: String(digits), exponent };
        isPower = true;
        exponent = Math.floor(Math.log10(magnitude));
        continue;
      }
      const mantissa = unsignedZero(v.toFixed(decimals));
      if (isPower && Math.abs(Number(mantissa)) >= 10) {
        exponent += 1;
        continue;
      }
      return { mantissa, uncertainty: String(digits), exponent };
    }
    if (!isPower) {
      const rounded = Number(value.toPrecision(significant));
      if (Math.abs(rounded) < largeFrom) return { mantissa: unsignedZero(String(rounded)), uncertainty: null, exponent: 0 };
      isPower = true;
      exponent = Math.floor(Math.log10(Math.abs(rounded)));
      continue;
    }
    const mantissa = unsignedZero(trimZeros(v.toPrecision(significant)));
    if (Math.abs(Number(mantissa)) >= 10) {
      exponent += 1;
      continue;
    }
    return { mantissa, uncertainty: null, exponent };
  }
  // Not reached for finite input; a plain fallback rather than a throw in a display path.
  return { mantissa: String(value), uncertainty: hasSigma ? String(s) : null, exponent: 0 };
}

/** How the power of ten is written: "×10⁻⁷" on screen and in reports, "e-7" in plain ASCII. */
export type NumberStyle = 'unicode' | 'ascii';

/** Join number parts into text, e.g. "2.0921(51)×10⁻⁷" (unicode) or "2.0921(51)e-7" (ascii). */
export function numberPartsText(p: NumberParts, style: NumberStyle = 'unicode'): string {
  const unc = p.uncertainty === null ? '' : `(${p.uncertainty})`;
  if (p.exponent === 0) return `${p.mantissa}${unc}`;
  return style === 'unicode' ? `${p.mantissa}${unc}×10${superscriptInteger(p.exponent)}` : `${p.mantissa}${unc}e${p.exponent}`;
}

/**
 * A value with its 1σ in the trade's compact form, e.g. (2.0921e-7, 5.1e-10) → "2.0921(51)×10⁻⁷",
 * (1148.6001234, 1.53e-5) → "1148.600123(15)". Without σ the value alone (10 significant digits).
 * Source: BIPM JCGM 100:2008 (GUM) §7.2.2.
 * @param value the value
 * @param sigma its 1σ (same unit), or null
 */
export function formatValueUncertainty(value: number, sigma: number | null, style: NumberStyle = 'unicode'): string {
  return numberPartsText(numberParts(value, sigma), style);
}

/**
 * A number without uncertainty, to `significant` digits (trailing zeros dropped), with a power of
 * ten for magnitudes below 10⁻³ or from 10⁶: 2.13475981901e-7 → "2.13475981901×10⁻⁷"; never "-0".
 * @param value the value
 * @param significant significant digits (1…17) @default 10
 */
export function formatNumber(value: number, significant = 10, style: NumberStyle = 'unicode'): string {
  return numberPartsText(numberParts(value, null, { significant }), style);
}

/**
 * A number to a fixed count of decimals without a sign on zero: (-0.000001, 5) → "0.00000", not
 * "-0.00000". Non-finite values read "NaN", "∞", "-∞".
 * @param value the value
 * @param decimals digits after the point (0…20)
 */
export function formatFixed(value: number, decimals: number): string {
  if (Number.isNaN(value)) return 'NaN';
  if (!Number.isFinite(value)) return value > 0 ? '∞' : '-∞';
  return unsignedZero(value.toFixed(decimals));
}
