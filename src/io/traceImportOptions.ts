/**
 * Options of `importTrace`, with their defaults in one place so the UI, the parse worker and the CLI
 * all read the same values.
 */
import type { TraceDecimal, TraceDelimiter, TraceFormat, TraceOrdinate, TraceXUnit } from './trace';
import { INPUT_LIMITS } from './inputLimits';

/** Overrides for `importTrace`. Every field is optional at the call site (`Partial<TraceImportOptions>`). */
export interface TraceImportOptions {
  /**
   * File layout. 'auto' reads JCAMP-DX when the text carries ##TITLE= or ##JCAMP-DX= labels, else
   * delimited text.
   * @default 'auto'
   */
  format: TraceFormat | 'auto';
  /**
   * 0-based column of a delimited file read as the ordinate; column 0 is always the abscissa.
   * Ignored for JCAMP-DX.
   * @default 1 (the second column)
   */
  yColumn: number;
  /**
   * Abscissa unit. 'auto' takes it from the header (delimited) or ##XUNITS (JCAMP-DX), else cm^-1.
   * Wavelengths (µm, nm) are taken as vacuum wavelengths and converted to vacuum wavenumbers.
   * @default 'auto'
   */
  xUnit: TraceXUnit | 'auto';
  /**
   * Ordinate quantity. 'auto' takes it from the header words or ##YUNITS, else guesses from the values.
   * @default 'auto'
   */
  ordinate: TraceOrdinate | 'auto';
  /**
   * Field delimiter of a delimited file. 'auto' sniffs it from the first data lines.
   * @default 'auto'
   */
  delimiter: TraceDelimiter | 'auto';
  /**
   * Decimal separator of a delimited file. 'auto' sniffs it; a file using both is refused unless this is set.
   * @default 'auto'
   */
  decimal: TraceDecimal | 'auto';
  /**
   * Longest text accepted, in UTF-16 code units (characters).
   * @default INPUT_LIMITS.maxTextChars (5e8, below the longest string V8 can hold)
   */
  maxChars: number;
  /**
   * Most points accepted (guards JCAMP ##NPOINTS and DUP counts against absurd allocations, and caps
   * the rows of delimited text).
   * @default 5e7 (INPUT_LIMITS.maxTracePoints)
   */
  maxPoints: number;
}

/** Defaults of every `TraceImportOptions` field. */
export const TRACE_IMPORT_DEFAULTS: Readonly<TraceImportOptions> = Object.freeze({
  format: 'auto',
  yColumn: 1,
  xUnit: 'auto',
  ordinate: 'auto',
  delimiter: 'auto',
  decimal: 'auto',
  maxChars: INPUT_LIMITS.maxTextChars,
  maxPoints: INPUT_LIMITS.maxTracePoints,
});

const FORMATS = ['auto', 'delimited', 'jcamp-dx'];
const X_UNITS = ['auto', 'cm-1', 'um', 'nm'];
const ORDINATES = ['auto', 'absorbance', 'transmittance', 'percent-transmittance'];
const DELIMITERS = ['auto', ',', '\t', ';', 'whitespace'];
const DECIMALS = ['auto', '.', ','];

/**
 * Fill defaults into partial options and check each field.
 * An explicit `undefined` counts as "not given".
 * @returns the complete options, or a message naming the bad field and value
 */
export function traceImportOptionsResolve(
  options: Partial<TraceImportOptions> | undefined,
): { ok: true; options: TraceImportOptions } | { ok: false; message: string; field: string } {
  const o: TraceImportOptions = { ...TRACE_IMPORT_DEFAULTS };
  if (options) {
    for (const key of Object.keys(TRACE_IMPORT_DEFAULTS) as (keyof TraceImportOptions)[]) {
      const v = options[key];
      if (v !== undefined) (o as unknown as Record<string, unknown>)[key] = v;
    }
  }
  const bad = (field: string, expected: string, got: unknown) => ({
    ok: false as const,
    field,
    message: `importTrace: options.${field} must be ${expected}, got ${JSON.stringify(got) ?? String(got)}`,
  });
  if (!FORMATS.includes(o.format)) return bad('format', FORMATS.join(' | '), o.format);
  if (!Number.isInteger(o.yColumn) || o.yColumn < 1) return bad('yColumn', 'an integer >= 1 (column 0 is the abscissa)', o.yColumn);
  if (!X_UNITS.includes(o.xUnit)) return bad('xUnit', X_UNITS.join(' | '), o.xUnit);
  if (!ORDINATES.includes(o.ordinate)) return bad('ordinate', ORDINATES.join(' | '), o.ordinate);
  if (!DELIMITERS.includes(o.delimiter)) return bad('delimiter', "auto | ',' | '\\t' | ';' | whitespace", o.delimiter);
  if (!DECIMALS.includes(o.decimal)) return bad('decimal', "auto | '.' | ','", o.decimal);
  if (typeof o.maxChars !== 'number' || !(o.maxChars > 0)) return bad('maxChars', 'a positive number', o.maxChars);
  if (typeof o.maxPoints !== 'number' || !(o.maxPoints >= 2)) return bad('maxPoints', 'a number >= 2', o.maxPoints);
  return { ok: true, options: o };
}
