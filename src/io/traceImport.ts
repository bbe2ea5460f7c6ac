/**
 * Entry point of trace import: text in, an ascending cm^-1 / absorbance `Trace` and a report out.
 */
import type { TraceDelimiter, TraceImportIssue, TraceImportOutcome, TraceImportReport, TraceOrdinate, TraceXUnit } from './trace';
import { traceImportWarnings } from './traceImportWarnings';
import { traceImportOptionsResolve, type TraceImportOptions } from './traceImportOptions';
import { TraceSkipLog, type TraceSkipReason, traceSkipMessage } from './traceSkipLog';
import { traceAssemble } from './traceAssemble';
import { delimitedParseNumeric } from './delimitedParseNumeric';
import { delimitedParse } from './delimitedParse';
import { delimitedFieldClean, delimitedIsCommentAt } from './delimitedField';
import { delimitedSplitLine } from './delimitedSniff';
import { jcampDetect, jcampParse, type JcampLabel } from './jcampParse';
import { inputExcerpt } from './inputLimits';
import { traceCommentHeader } from './traceCommentHeader';
import { unitsOrdinateFromLabel, unitsOrdinateFromValues, unitsTransmittanceScale, unitsValueStats, unitsXFromLabel } from './unitsDetect';

/** Raw columns from either reader, before units and ordering are handled. */
interface RawTrace {
  x: Float64Array;
  y: Float64Array;
  lines: Int32Array | { firstLine: number };
  skipped: TraceSkipLog;
  noun: 'row' | 'point';
  nonFiniteReason: TraceSkipReason;
  messages: string[];
  xLabel?: string;
  yLabel?: string;
  xUnitsLabel?: JcampLabel;
  yUnitsLabel?: JcampLabel;
  title?: string;
  extra: Partial<TraceImportReport>;
}

const PREAMBLE_MAX_LINES = 1000;

/**
 * Read a measured trace file (delimited text or JCAMP-DX) into an ascending wavenumber axis (cm^-1, vacuum)
 * with absorbance (−log10 T). Never throws for bad content: a refusal comes back as `{ ok: false, error }`
 * with a one-line message naming the file and, where there is one, the line.
 *
 * Format: JCAMP-DX when ##TITLE= or ##JCAMP-DX= labels appear near the top, else delimited text.
 * Abscissa: cm^-1 unless the header/##XUNITS or `options.xUnit` says µm (ν̃ = 1e4/λ) or nm (ν̃ = 1e7/λ);
 * wavelengths are taken as vacuum wavelengths. Ordinate: absorbance, transmittance or %T from the header,
 * ##YUNITS, `options.ordinate`, or guessed from the values; stored as A = −log10 T.
 * Rows or points that cannot be used (text, NaN/Infinity, duplicate x) are skipped and listed by line.
 * Every problem (rows skipped, by reason; axis re-ordered; values clamped; a flat trace) is in
 * `report.issues` and, worded by `traceImportWarnings`, among `report.messages`. A refusal for too few
 * rows names an overlong line and the file's line breaks (`traceLongLineNote`).
 * @param text whole file text (not modified)
 * @param fileName shown in messages
 * @param options overrides, see `TraceImportOptions` (defaults in `TRACE_IMPORT_DEFAULTS`)
 * @param onProgress called with fractions 0..1, at least every ~2 % of the text on large inputs
 * @returns trace and report, or an error
 * Source: ν̃ = 1/λ (IUPAC Green Book, Cohen et al. 2007, §2.7); A = −log10 T (IUPAC Gold Book).
 */
export function importTrace(
  text: string,
  fileName: string,
  options?: Partial<TraceImportOptions>,
  onProgress?: (fraction: number) => void,
): TraceImportOutcome {
  // Shown verbatim (HTML included: the page escapes it), but kept on one line.
  const name = typeof fileName === 'string' && fileName !== '' ? inputExcerpt(fileName, 1000) : '(unnamed)';
  try {
    return importTraceChecked(text, name, options, onProgress);
  } catch (err) {
    // A bug, not bad content: still one line, never an exception across the API.
    return {
      ok: false,
      error: { message: `importTrace: internal error reading ${name}: ${err instanceof Error ? err.message : String(err)}` },
    };
  }
}

function importTraceChecked(
  text: string,
  fileName: string,
  partial: Partial<TraceImportOptions> | undefined,
  onProgress: ((fraction: number) => void) | undefined,
): TraceImportOutcome {
  const refuse = (message: string, line?: number, field?: string): TraceImportOutcome => ({
    ok: false,
    error: { message: `${fileName}: ${message}`, line, field },
  });
  const resolved = traceImportOptionsResolve(partial);
  if (!resolved.ok) return { ok: false, error: { message: resolved.message, field: resolved.field } };
  const options = resolved.options;
  if (typeof text !== 'string') return refuse(`importTrace: text must be a string, got ${typeof text}`, undefined, 'text');
  if (text.length > options.maxChars)
    return refuse(`the text is ${text.length} characters long, above the limit of ${options.maxChars} (maxChars)`, undefined, 'maxChars');
  if (text.trim() === '') return refuse('the file is empty');

  let last = -1;
  const report = (f: number) => {
    // Monotone and clamped, whatever the phases report.
    const v = Math.min(1, Math.max(0, f));
    if (onProgress && v > last) {
      last = v;
      onProgress(v);
    }
  };
  report(0);
  const parseProgress = (f: number) => report(0.95 * f);

  const isJcamp = options.format === 'jcamp-dx' || (options.format === 'auto' && jcampDetect(text));
  let raw: RawTrace;
  if (isJcamp) {
    const r = jcampParse(text, { maxPoints: options.maxPoints, onProgress: parseProgress });
    if (!r.ok) return refuse(r.error.message, r.error.line, r.error.field);
    const c = r.columns;
    raw = {
      x: c.x,
      y: c.y,
      lines: c.lines,
      skipped: new TraceSkipLog(),
      noun: 'point',
      nonFiniteReason: "invalid value '?'",
      messages: [`read as JCAMP-DX${c.version ? ` ${c.version}` : ''}`, ...c.messages],
      xUnitsLabel: c.xUnits,
      yUnitsLabel: c.yUnits,
      title: c.title,
      extra: {},
    };
  } else {
    const r = readDelimited(text, options, parseProgress);
    if ('error' in r) return refuse(r.error.message, r.error.line, r.error.field);
    raw = r;
  }
  report(0.95);

  // Abscissa unit.
  const xr = resolveXUnit(raw, options);
  if ('error' in xr) return refuse(xr.error, xr.line, xr.field);
  // Ordinate.
  const or = resolveOrdinate(raw, options);

  const assembled = traceAssemble({
    x: raw.x,
    y: raw.y,
    lines: raw.lines,
    xUnit: xr.xUnit,
    ordinate: or.ordinate,
    skipped: raw.skipped,
    nonFiniteReason: raw.nonFiniteReason,
  });
  if (!assembled.ok) {
    const skipNote = traceSkipMessage(raw.skipped, raw.noun);
    const lineNote = traceLongLineNote(text);
    return refuse(assembled.message + (skipNote ? ` (${skipNote})` : '') + (lineNote ? `; ${lineNote}` : ''), assembled.line);
  }
  report(0.99);
  const { trace, wasDescending } = assembled.value;
  const n = trace.wavenumberCm1.length;
  const issues: TraceImportIssue[] = raw.skipped.kinds().map((k) => ({
    kind: 'skipped' as const,
    reason: k.reason,
    noun: raw.noun,
    count: k.count,
    lines: k.lines,
    lineCount: k.lineCount,
    ...(k.firstText ? { firstText: { line: k.firstText.line, text: inputExcerpt(k.firstText.text, 40) } } : {}),
    ...(k.reason === 'duplicate x' ? { differentY: assembled.value.duplicateDifferentY } : {}),
  }));
  issues.push(...assembled.value.issues);
  const flat = traceFlatValue(trace.absorbance);
  if (flat !== undefined) issues.push({ kind: 'flat', points: n, absorbance: flat });
  const messages = [...raw.messages, ...xr.messages, ...or.messages];
  if (wasDescending) messages.push('the axis ran from high to low in the file; it is stored ascending');
  messages.push(...traceImportWarnings({ issues }));
  const out: TraceImportReport = {
    fileName,
    format: isJcamp ? 'jcamp-dx' : 'delimited',
    xUnit: xr.xUnit,
    ordinate: or.ordinate,
    points: n,
    rangeCm1: [trace.wavenumberCm1[0], trace.wavenumberCm1[n - 1]],
    skipped: { count: raw.skipped.count, lines: raw.skipped.sortedLines() },
    wasDescending,
    messages,
    issues,
    ...raw.extra,
  };
  if (raw.title !== undefined) out.title = raw.title;
  report(1);
  return { ok: true, trace, report: out };
}

/** The one ordinate every point has, or undefined when they differ (a flat trace holds no peaks). */
function traceFlatValue(y: Float64Array): number | undefined {
  const first = y[0];
  for (let i = 1; i < y.length; i++) if (y[i] !== first) return undefined;
  return first;
}

/** Longest line (in characters) above which a refusal says how the text is broken into lines. */
export const TRACE_LONG_LINE_CHARS = 1000;

/**
 * Why a text with too few data rows may have them: its longest line is very long and it has no (or few)
 * line breaks, as when a file's line ends were lost. LF, CRLF and CR-only line ends count.
 * @returns e.g. "line 1 is 52,428,800 characters long and the file has no line breaks (a trace needs one
 *   line per point)", or undefined when no line is longer than TRACE_LONG_LINE_CHARS
 */
export function traceLongLineNote(text: string): string | undefined {
  const eol = text.indexOf('\n') >= 0 ? '\n' : '\r';
  let breaks = 0;
  let longest = 0;
  let longestLine = 1;
  for (let pos = 0, line = 1; pos <= text.length; line++) {
    let end = text.indexOf(eol, pos);
    if (end < 0) end = text.length;
    else breaks++;
    if (end - pos > longest) {
      longest = end - pos;
      longestLine = line;
    }
    pos = end + 1;
  }
  if (longest <= TRACE_LONG_LINE_CHARS) return undefined;
  const breakText = breaks === 0 ? 'the file has no line breaks' : `the file has only ${breaks} line break${breaks === 1 ? '' : 's'}`;
  return `line ${longestLine} is ${longest.toLocaleString('en')} characters long and ${breakText} (a trace needs one line per point)`;
}

/** Delimited text: the plain-numeric fast path when it can prove the layout, else papaparse. */
function readDelimited(
  text: string,
  options: TraceImportOptions,
  onProgress: (f: number) => void,
): RawTrace | { error: { message: string; line?: number; field?: string } } {
  const canFast =
    (options.delimiter === 'auto' || options.delimiter === ',' || options.delimiter === 'whitespace') && options.decimal !== ',';
  if (canFast) {
    const pre = preambleEnd(text);
    if (pre) {
      const fast = delimitedParseNumeric(text, {
        start: pre.start,
        yColumn: options.yColumn,
        maxRows: options.maxPoints,
        delimiter: options.delimiter === ',' ? ',' : options.delimiter === 'whitespace' ? 'whitespace' : 'auto',
        onProgress,
      });
      if (fast?.isOverLimit) {
        const line = pre.firstLine + options.maxPoints;
        return {
          error: { message: `more than ${options.maxPoints} data rows (limit maxPoints), at line ${line}`, line, field: 'maxPoints' },
        };
      }
      if (fast) {
        let eol = text.indexOf('\n', pre.start);
        if (eol < 0) eol = text.length;
        // Blank-separated rows that use tabs are reported (and their header split) as tab-separated.
        const delimiter: TraceDelimiter =
          fast.delimiter === 'whitespace' &&
          text.slice(pre.start, eol).trim().includes('\t') &&
          !/ /.test(text.slice(pre.start, eol).trim())
            ? '\t'
            : fast.delimiter;
        const headerNames = pre.header ? delimitedSplitLine(pre.header, delimiter).map(delimitedFieldClean) : undefined;
        const comment = pre.header === undefined ? traceCommentHeader(text, pre.firstLine, delimiter, fast.columns) : undefined;
        const columnNames = comment ? comment.names : headerNames && headerNames.length >= 2 ? headerNames : undefined;
        const labels = headerLabels(comment ? comment.text : pre.header, columnNames, fast.columns, options.yColumn);
        return {
          x: fast.x,
          y: fast.y,
          lines: { firstLine: pre.firstLine },
          skipped: new TraceSkipLog(),
          noun: 'row',
          nonFiniteReason: 'NaN/Infinity',
          messages: [describeDelimited(delimiter, '.', columnNames), ...commentHeaderNote(comment)],
          ...labels,
          extra: { columnNames, yColumn: options.yColumn, delimiter, decimal: '.', usedFastPath: true },
        };
      }
    }
  }
  const r = delimitedParse(text, {
    yColumn: options.yColumn,
    delimiter: options.delimiter,
    decimal: options.decimal,
    maxPoints: options.maxPoints,
    onProgress,
  });
  if (!r.ok) return { error: r.error };
  const c = r.columns;
  const comment = c.columnNames === undefined ? traceCommentHeader(text, c.lines[0], c.delimiter, c.columns) : undefined;
  const columnNames = comment ? comment.names : c.columnNames;
  return {
    x: c.x,
    y: c.y,
    lines: c.lines,
    skipped: c.skipped,
    noun: 'row',
    nonFiniteReason: 'NaN/Infinity',
    messages: [describeDelimited(c.delimiter, c.decimal, columnNames), ...commentHeaderNote(comment)],
    ...headerLabels(comment ? comment.text : c.columnNames?.join(' '), columnNames, c.columns, options.yColumn),
    extra: { columnNames, yColumn: options.yColumn, delimiter: c.delimiter, decimal: c.decimal, usedFastPath: false },
  };
}

/** The report line saying the column names came from a comment. */
function commentHeaderNote(comment: ReturnType<typeof traceCommentHeader>): string[] {
  return comment
    ? [`column names read from the comment on line ${comment.line} ('${inputExcerpt(comment.text, 80)}'); the file has no header row`]
    : [];
}

/**
 * Header text used for unit hints: the x and y column names when the header splits into as many
 * names as the data has columns, else the whole header line for both (a blank-separated header such
 * as "wavenumber (cm-1) absorbance" does not split cleanly).
 */
function headerLabels(
  header: string | undefined,
  names: string[] | undefined,
  columns: number,
  yColumn: number,
): { xLabel?: string; yLabel?: string } {
  if (names && names.length === columns) return { xLabel: names[0], yLabel: names[yColumn] };
  if (header !== undefined && header.trim() !== '') return { xLabel: header, yLabel: header };
  return {};
}

function describeDelimited(delimiter: TraceDelimiter, decimal: string, names?: string[]): string {
  const d = delimiter === '\t' ? 'tab' : delimiter === 'whitespace' ? 'blank' : `'${delimiter}'`;
  const header = names ? `, header: ${names.map((s) => inputExcerpt(s, 40)).join(' | ')}` : ', no header';
  return `read as delimited text (${d}-separated, '${decimal}' decimals${header})`;
}

/**
 * Where the data rows start: after blank lines, comment lines and non-numeric preamble lines.
 * @returns offset, 1-based line and the last preamble line (header candidate), or null when the
 * preamble is too long to scan cheaply (the general reader handles that)
 */
function preambleEnd(text: string): { start: number; firstLine: number; header?: string } | null {
  const n = text.length;
  let pos = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let header: string | undefined;
  for (let line = 1; line <= PREAMBLE_MAX_LINES && pos < n; line++) {
    let eol = text.indexOf('\n', pos);
    if (eol < 0) eol = n;
    const content = text.slice(pos, eol).replace(/\r$/, '');
    const t = content.trim();
    if (t !== '' && !delimitedIsCommentAt(text, pos)) {
      const c = t.charCodeAt(0);
      if ((c >= 48 && c <= 57) || c === 43 || c === 45 || c === 46) return { start: pos, firstLine: line, header };
      // A quoted number ("1000","0.1") is a data row, not a header: only the general reader reads quotes.
      const q = t.charCodeAt(1);
      if (c === 34 && ((q >= 48 && q <= 57) || q === 43 || q === 45 || q === 46)) return null;
      header = content;
    }
    pos = eol + 1;
  }
  return null;
}

const fmtNum = (v: number) => Number(v.toPrecision(4)).toString();

function xRange(x: Float64Array): { min: number; max: number } {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { min, max };
}

function resolveXUnit(
  raw: RawTrace,
  options: TraceImportOptions,
): { xUnit: TraceXUnit; messages: string[] } | { error: string; line?: number; field?: string } {
  if (options.xUnit !== 'auto') return { xUnit: options.xUnit, messages: [] };
  const label = raw.xUnitsLabel?.value ?? raw.xLabel;
  const hint = label !== undefined ? unitsXFromLabel(label) : undefined;
  const messages: string[] = [];
  if (hint === 'wavelength') {
    const { max } = xRange(raw.x);
    const unit: TraceXUnit = max <= 100 ? 'um' : 'nm';
    messages.push(
      `the abscissa is named a wavelength without a unit ('${inputExcerpt(label ?? '')}'); values up to ${fmtNum(max)} read as ${unit === 'um' ? 'µm' : 'nm'}`,
    );
    return { xUnit: unit, messages };
  }
  if (hint) {
    if (hint !== 'cm-1') messages.push(`${hint === 'um' ? 'µm' : 'nm'} (vacuum) wavelengths converted to wavenumbers`);
    return { xUnit: hint, messages };
  }
  if (raw.xUnitsLabel)
    return {
      error:
        `line ${raw.xUnitsLabel.line}: ##XUNITS=${inputExcerpt(raw.xUnitsLabel.value)} is not an infrared abscissa unit ` +
        `(expected 1/CM, MICROMETERS or NANOMETERS); set the xUnit option to override`,
      line: raw.xUnitsLabel.line,
      field: 'XUNITS',
    };
  const { min, max } = xRange(raw.x);
  if (min > 0 && max <= 50)
    messages.push(
      `the abscissa runs from ${fmtNum(min)} to ${fmtNum(max)} and was read as cm^-1; if these are wavelengths in µm, set xUnit to 'um'`,
    );
  else if (raw.xUnitsLabel === undefined && raw.noun === 'point') messages.push('no ##XUNITS label; abscissa read as cm^-1');
  return { xUnit: 'cm-1', messages };
}

const ORDINATE_WORDS: Record<TraceOrdinate, string> = {
  absorbance: 'absorbance',
  transmittance: 'transmittance (fraction)',
  'percent-transmittance': 'percent transmittance',
};

function resolveOrdinate(raw: RawTrace, options: TraceImportOptions): { ordinate: TraceOrdinate; messages: string[] } {
  const stats = unitsValueStats(raw.y);
  const messages: string[] = [];
  if (options.ordinate !== 'auto') {
    if (options.ordinate === 'transmittance' && stats.max > 1.5)
      messages.push(`ordinate set to transmittance but values reach ${fmtNum(stats.max)}; percent transmittance?`);
    return { ordinate: options.ordinate, messages };
  }
  const label = raw.yUnitsLabel?.value ?? raw.yLabel;
  const hint = label !== undefined ? unitsOrdinateFromLabel(label) : undefined;
  if (hint === 'transmittance') {
    const ordinate = unitsTransmittanceScale(stats);
    if (ordinate === 'percent-transmittance')
      messages.push(`'${inputExcerpt(label ?? '')}' with values up to ${fmtNum(stats.max)} read as percent transmittance`);
    return { ordinate, messages };
  }
  if (hint) return { ordinate: hint, messages };
  const guess = unitsOrdinateFromValues(stats);
  const what = raw.yUnitsLabel
    ? `##YUNITS=${inputExcerpt(raw.yUnitsLabel.value)} is not recognised`
    : 'the ordinate is not named in the file';
  messages.push(
    `${what}; read as ${ORDINATE_WORDS[guess.ordinate]} from the values (${guess.reason}); set the ordinate option to override`,
  );
  return { ordinate: guess.ordinate, messages };
}
