/**
 * Reader for JCAMP-DX 4.24 / 5.x infrared spectra: labelled data records, (X++(Y..Y)) tables in AFFN
 * or ASDF form with the X and DIF y-checks, and (XY..XY) tables.
 *
 * Supported: ##TITLE, ##JCAMP-DX, ##XUNITS, ##YUNITS, ##XFACTOR, ##YFACTOR, ##FIRSTX, ##LASTX, ##DELTAX,
 * ##NPOINTS, ##FIRSTY (checked), ##XYDATA=(X++(Y..Y)), ##XYDATA=(XY..XY), ##XYPOINTS=(XY..XY),
 * ##DATA TABLE= with either form, $$ comments, ##$ private labels (ignored), LINK files (the first
 * block with a data table is read). Not supported (refused with a message): NTUPLES, peak tables only,
 * (X++(R..R)) / (X++(I..I)) NMR tables.
 * Source: McDonald & Wilks, Appl. Spectrosc. 42 (1988) 151 (JCAMP-DX for IR, 4.24); Lampen et al.,
 * Pure Appl. Chem. 71 (1999) 1549 (JCAMP-DX 5.01) — both from memory.
 */
import { jcampAsdfDecodeLine } from './jcampAsdf';
import { TraceColumnBuilder } from './traceColumns';
import { INPUT_LIMITS, inputExcerpt } from './inputLimits';

/** Options of `jcampParse`. */
export interface JcampParseOptions {
  /** Most points accepted; a larger ##NPOINTS is refused before any allocation. @default 5e7 */
  maxPoints: number;
  /** Fraction 0..1 of the lines read. */
  onProgress?: (fraction: number) => void;
}

/** A label value with the 1-based line it was found on. */
export interface JcampLabel {
  value: string;
  line: number;
}

/** Raw columns of a JCAMP-DX trace (factors applied, file units, file order). */
export interface JcampColumns {
  /** Abscissa in ##XUNITS, XFACTOR applied. */
  x: Float64Array;
  /** Ordinate in ##YUNITS, YFACTOR applied; NaN where the file wrote '?'. */
  y: Float64Array;
  /** 1-based line of every point. */
  lines: Int32Array;
  title?: string;
  version?: string;
  xUnits?: JcampLabel;
  yUnits?: JcampLabel;
  /** Notes (checks that failed without making the data unusable, ignored blocks). */
  messages: string[];
}

/** A refusal with the line at fault. */
export interface JcampParseError {
  message: string;
  line?: number;
  field?: string;
}

type Outcome = { ok: true; columns: JcampColumns } | { ok: false; error: JcampParseError };

/**
 * True when the text looks like JCAMP-DX: a ##TITLE= or ##JCAMP-DX= label within its first 16 kB.
 * @param text file text
 */
export function jcampDetect(text: string): boolean {
  return /^[ \t\uFEFF]*##[ \t]*(TITLE|JCAMP[ \t_-]*DX)[ \t]*=/im.test(text.slice(0, 16384));
}

/** Label name compared the JCAMP way: case, blanks, '-', '/' and '_' ignored. */
function labelKey(raw: string): string {
  return raw.toUpperCase().replace(/[\s\-/_]/g, '');
}

function stripComment(line: string): string {
  const k = line.indexOf('$$');
  return k < 0 ? line : line.slice(0, k);
}

const RE_AFFN = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * Read a JCAMP-DX infrared spectrum into raw columns.
 * @param text file text (never modified)
 * @param options see `JcampParseOptions`
 * @returns columns with labels, or an error naming the line (without the file name; the caller prefixes it)
 */
export function jcampParse(text: string, options: JcampParseOptions): Outcome {
  const { maxPoints, onProgress } = options;
  // ASDF DUP counts let a few characters claim millions of points; past a floor, points must be paid for
  // in text (see INPUT_LIMITS.jcampMaxPointsPerChar).
  const expansionCap = Math.max(INPUT_LIMITS.jcampExpansionFloorPoints, INPUT_LIMITS.jcampMaxPointsPerChar * text.length);
  const lines = text.split(/\r\n|\r|\n/);
  const messages: string[] = [];
  let labels = new Map<string, JcampLabel>();
  let lastKey: string | undefined;
  let firstTitle: string | undefined;
  let version: string | undefined;
  let result: JcampColumns | undefined;
  let sawEnd = false;
  let peakTableLine = 0;
  const progressStep = Math.max(1, Math.floor(lines.length / 50));
  let nextProgress = progressStep;

  const tick = (lineIndex: number) => {
    if (onProgress && lineIndex >= nextProgress) {
      onProgress(lineIndex / lines.length);
      nextProgress = lineIndex + progressStep;
    }
  };

  let li = 0;
  scan: while (li < lines.length) {
    tick(li);
    const lineNo = li + 1;
    const t = stripComment(lines[li])
      .trim()
      .replace(/^\uFEFF/, '');
    li++;
    if (!t.startsWith('##')) {
      // A value continued on the next line (long titles); stray text between records is ignored.
      if (t && lastKey && !result) {
        const prev = labels.get(lastKey);
        if (prev) prev.value = `${prev.value} ${t}`;
      }
      continue;
    }
    const eq = t.indexOf('=');
    if (eq < 0) {
      messages.push(`line ${lineNo}: '${inputExcerpt(t, 40)}' has no '=' and was ignored`);
      continue;
    }
    const key = labelKey(t.slice(2, eq));
    const value = t.slice(eq + 1).trim();
    lastKey = undefined;
    switch (key) {
      case 'TITLE':
        if (result) {
          messages.push(`the file holds further blocks (line ${lineNo}); only the first spectrum was read`);
          break scan;
        }
        labels = new Map();
        labels.set(key, { value, line: lineNo });
        firstTitle ??= value;
        lastKey = key;
        continue;
      case 'END':
        if (result) {
          sawEnd = true;
          break scan;
        }
        continue;
      case 'JCAMPDX':
        version ??= value;
        labels.set(key, { value, line: lineNo });
        continue;
      case 'NTUPLES':
        return fail(
          `line ${lineNo}: ##NTUPLES (multi-dimensional) data are not supported; export the spectrum as ##XYDATA`,
          lineNo,
          'NTUPLES',
        );
      case 'PEAKTABLE':
        peakTableLine ||= lineNo;
        while (li < lines.length && !stripComment(lines[li]).trim().startsWith('##')) li++;
        continue;
      case 'XYDATA':
      case 'XYPOINTS':
      case 'DATATABLE': {
        if (result) {
          messages.push(`a second data table at line ${lineNo} was ignored`);
          while (li < lines.length && !stripComment(lines[li]).trim().startsWith('##')) li++;
          continue;
        }
        const form = value.toUpperCase().replace(/\s/g, '').split(',')[0];
        const decoded =
          form === '(X++(Y..Y))'
            ? decodeXpp(lines, li, lineNo, labels, maxPoints, expansionCap, tick)
            : form === '(XY..XY)'
              ? decodeXy(lines, li, lineNo, labels, maxPoints, tick)
              : undefined;
        if (!decoded)
          return fail(
            `line ${lineNo}: data table form '${inputExcerpt(value)}' is not supported (expected (X++(Y..Y)) or (XY..XY))`,
            lineNo,
            key,
          );
        if (!decoded.ok) return decoded;
        li = decoded.next;
        result = {
          x: decoded.x,
          y: decoded.y,
          lines: decoded.lines,
          title: labels.get('TITLE')?.value ?? firstTitle,
          version: labels.get('JCAMPDX')?.value ?? version,
          xUnits: labels.get('XUNITS'),
          yUnits: labels.get('YUNITS'),
          messages,
        };
        messages.push(...decoded.notes);
        continue;
      }
      default:
        labels.set(key, { value, line: lineNo });
        lastKey = key;
    }
  }
  onProgress?.(1);
  if (!result) {
    if (peakTableLine)
      return fail(`line ${peakTableLine}: the file holds only a peak table, no continuous trace`, peakTableLine, 'PEAKTABLE');
    return fail('no ##XYDATA or ##XYPOINTS data table found', undefined, 'XYDATA');
  }
  if (sawEnd)
    for (let k = li; k < lines.length; k++)
      if (/^\s*##\s*TITLE\s*=/i.test(lines[k])) {
        messages.push(`the file holds further blocks (line ${k + 1}); only the first spectrum was read`);
        break;
      }
  if (!sawEnd) messages.push(`no ##END= label after the data (file ends at line ${lines.length}); the file may be truncated`);
  if (!result.version) messages.push('no ##JCAMP-DX= version label');
  return { ok: true, columns: result };
}

function fail(message: string, line?: number, field?: string): { ok: false; error: JcampParseError } {
  return { ok: false, error: { message, line, field } };
}

type Decoded =
  { ok: true; x: Float64Array; y: Float64Array; lines: Int32Array; next: number; notes: string[] } | { ok: false; error: JcampParseError };

/** Numeric label value, undefined when absent, or an error when present but not a number. */
function numLabel(
  labels: Map<string, JcampLabel>,
  key: string,
): { ok: true; value?: number; line?: number } | { ok: false; error: JcampParseError } {
  const l = labels.get(key);
  if (!l) return { ok: true };
  const v = l.value.trim();
  if (!RE_AFFN.test(v)) return fail(`line ${l.line}: ##${key}= '${inputExcerpt(l.value)}' is not a number`, l.line, key);
  return { ok: true, value: Number(v), line: l.line };
}

interface TableHeader {
  xFactor: number;
  yFactor: number;
  nPoints?: number;
  nPointsLine?: number;
}

function tableHeader(
  labels: Map<string, JcampLabel>,
  maxPoints: number,
): { ok: true; h: TableHeader } | { ok: false; error: JcampParseError } {
  const xf = numLabel(labels, 'XFACTOR');
  if (!xf.ok) return xf;
  const yf = numLabel(labels, 'YFACTOR');
  if (!yf.ok) return yf;
  const np = numLabel(labels, 'NPOINTS');
  if (!np.ok) return np;
  for (const [key, f] of [
    ['XFACTOR', xf],
    ['YFACTOR', yf],
  ] as const)
    if (f.value !== undefined && (f.value === 0 || !Number.isFinite(f.value)))
      return fail(`line ${f.line}: ##${key}=${f.value} must be a non-zero finite number`, f.line, key);
  if (np.value !== undefined) {
    if (!Number.isInteger(np.value) || np.value < 1)
      return fail(`line ${np.line}: ##NPOINTS=${np.value} must be a positive integer`, np.line, 'NPOINTS');
    if (np.value > maxPoints)
      return fail(`line ${np.line}: ##NPOINTS=${np.value} is above the limit of ${maxPoints} points (maxPoints)`, np.line, 'NPOINTS');
  }
  return { ok: true, h: { xFactor: xf.value ?? 1, yFactor: yf.value ?? 1, nPoints: np.value, nPointsLine: np.line } };
}

const fmt = (v: number) => Number(v.toPrecision(8)).toString();

/** Decode an (X++(Y..Y)) table whose first data line is lines[start]; at most expansionCap points. */
function decodeXpp(
  lines: string[],
  start: number,
  tableLine: number,
  labels: Map<string, JcampLabel>,
  maxPoints: number,
  expansionCap: number,
  tick: (lineIndex: number) => void,
): Decoded {
  const hr = tableHeader(labels, maxPoints);
  if (!hr.ok) return hr;
  const { xFactor, yFactor, nPoints, nPointsLine } = hr.h;
  const firstX = numLabel(labels, 'FIRSTX');
  if (!firstX.ok) return firstX;
  const lastX = numLabel(labels, 'LASTX');
  if (!lastX.ok) return lastX;
  const deltaX = numLabel(labels, 'DELTAX');
  if (!deltaX.ok) return deltaX;
  const firstY = numLabel(labels, 'FIRSTY');
  if (!firstY.ok) return firstY;
  if (firstX.value === undefined)
    return fail(`line ${tableLine}: ##FIRSTX is missing (required for an (X++(Y..Y)) table)`, tableLine, 'FIRSTX');
  if (lastX.value === undefined && deltaX.value === undefined)
    return fail(`line ${tableLine}: ##LASTX and ##DELTAX are both missing (one is required for (X++(Y..Y)))`, tableLine, 'LASTX');

  const claimed = nPoints ?? maxPoints;
  const budget = Math.min(claimed, expansionCap);
  const out = new TraceColumnBuilder(Math.min(budget, 1 << 16));
  const lineX: { line: number; x: number; index: number }[] = [];
  let prevEndsDif = false;
  let prevLast = NaN;
  let prevLine = 0;
  let firstDataLine = 0;
  let lastDataLine = 0;
  let j = start;
  for (; j < lines.length; j++) {
    tick(j);
    const raw = stripComment(lines[j]);
    const t = raw.trim();
    if (t.startsWith('##')) break;
    if (t === '') continue;
    const lineNo = j + 1;
    firstDataLine ||= lineNo;
    lastDataLine = lineNo;
    const room = budget - out.length + (prevEndsDif ? 1 : 0);
    const dec = jcampAsdfDecodeLine(t, room);
    if (!dec.ok) {
      const column = dec.error.column + (raw.length - raw.trimStart().length);
      if (dec.error.isOverflow && budget < claimed)
        return fail(
          `line ${lineNo}: the compressed data expand to more than ${budget} points, over ` +
            `${INPUT_LIMITS.jcampMaxPointsPerChar} points per character of the file (limit jcampMaxPointsPerChar); ` +
            'a measured spectrum does not compress this far, so the file is damaged or not a spectrum',
          lineNo,
          'NPOINTS',
        );
      if (dec.error.isOverflow)
        return fail(
          nPoints !== undefined
            ? `line ${lineNo}: the data table holds more than ##NPOINTS=${nPoints} (line ${nPointsLine}) points`
            : `line ${lineNo}: the data table holds more than ${maxPoints} points (limit maxPoints)`,
          lineNo,
          'NPOINTS',
        );
      return fail(`line ${lineNo}, column ${column}: ${dec.error.message}`, lineNo);
    }
    const ys = dec.value.y;
    let from = 0;
    let index = out.length;
    if (prevEndsDif && ys.length > 0) {
      const a = prevLast;
      const b = ys[0];
      const same = a === b || (a !== a && b !== b) || Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a));
      if (!same)
        return fail(
          `line ${lineNo}: DIF y-check failed: the first ordinate ${fmt(b)} should repeat the last ordinate ` +
            `${fmt(a)} of line ${prevLine}`,
          lineNo,
        );
      from = 1;
      index = out.length - 1;
    }
    lineX.push({ line: lineNo, x: dec.value.x * xFactor, index });
    for (let k = from; k < ys.length; k++) out.push(NaN, ys[k] * yFactor, lineNo);
    if (ys.length > 0) {
      prevEndsDif = dec.value.endsWithDif;
      prevLast = ys[ys.length - 1];
      prevLine = lineNo;
    }
  }
  const count = out.length;
  if (count === 0) return fail(`line ${tableLine}: the data table has no data lines`, tableLine, 'XYDATA');

  const n = nPoints ?? count;
  const step = lastX.value !== undefined ? (n > 1 ? (lastX.value - firstX.value) / (n - 1) : 0) : (deltaX.value as number);
  // X check: a line whose abscissa is more than half a point spacing from its point index means data
  // were lost or added before it (writers round X, so smaller differences are normal).
  let xFail: { line: number; x: number; expected: number; offPoints: number } | undefined;
  if (step !== 0)
    for (const l of lineX) {
      const expected = firstX.value + l.index * step;
      const off = (l.x - expected) / step;
      if (Math.abs(off) > 0.5) {
        xFail = { line: l.line, x: l.x, expected, offPoints: off };
        break;
      }
    }
  const xFailText = xFail
    ? `the abscissa check first fails at line ${xFail.line} (X = ${fmt(xFail.x)}, expected ${fmt(xFail.expected)}, ` +
      `${Math.abs(xFail.offPoints).toFixed(1)} points ${xFail.offPoints > 0 ? 'ahead' : 'behind'})`
    : '';
  const truncated = j >= lines.length;
  if (nPoints !== undefined && count !== nPoints) {
    const at = xFail?.line ?? lastDataLine;
    return fail(
      `line ${at}: ##NPOINTS=${nPoints} (line ${nPointsLine}) but the data table (lines ${firstDataLine}–${lastDataLine}) ` +
        `holds ${count} points` +
        (xFailText ? `; ${xFailText}` : '') +
        (truncated ? `; the file ends at line ${lines.length} without ##END= (truncated?)` : ''),
      at,
      'NPOINTS',
    );
  }
  const notes: string[] = [];
  if (nPoints === undefined) notes.push(`no ##NPOINTS label: ${count} points decoded`);
  if (xFailText) notes.push(`${xFailText}; abscissae were taken from ##FIRSTX/##LASTX/##NPOINTS`);
  if (lastX.value !== undefined && deltaX.value !== undefined && n > 1) {
    const rel = Math.abs(deltaX.value - step) / Math.abs(step);
    if (rel > 1e-3) notes.push(`##DELTAX=${deltaX.value} differs from (LASTX − FIRSTX)/(NPOINTS − 1) = ${fmt(step)}; the latter was used`);
  }
  const cols = out.finish();
  for (let i = 0; i < count; i++) cols.x[i] = firstX.value + i * step;
  if (firstY.value !== undefined && Number.isFinite(cols.y[0])) {
    // FIRSTY is the first ordinate in real units; allow one count of YFACTOR plus writer rounding (1e-4 relative).
    const tol = Math.abs(yFactor) + 1e-4 * Math.abs(firstY.value);
    if (Math.abs(cols.y[0] - firstY.value) > tol)
      notes.push(
        `##FIRSTY=${firstY.value} (line ${firstY.line}) but the first ordinate decodes to ${fmt(cols.y[0])} ` +
          `(YFACTOR ${yFactor}); check the factors`,
      );
  }
  return { ok: true, ...cols, next: j, notes };
}

/** Decode an (XY..XY) table of AFFN pairs whose first data line is lines[start]. */
function decodeXy(
  lines: string[],
  start: number,
  tableLine: number,
  labels: Map<string, JcampLabel>,
  maxPoints: number,
  tick: (lineIndex: number) => void,
): Decoded {
  const hr = tableHeader(labels, maxPoints);
  if (!hr.ok) return hr;
  const { xFactor, yFactor, nPoints, nPointsLine } = hr.h;
  const budget = nPoints ?? maxPoints;
  const out = new TraceColumnBuilder(Math.min(budget, 1 << 16));
  let pendingX = NaN;
  let pendingLine = 0;
  let hasPending = false;
  let lastDataLine = 0;
  let j = start;
  for (; j < lines.length; j++) {
    tick(j);
    const t = stripComment(lines[j]).trim();
    if (t.startsWith('##')) break;
    if (t === '') continue;
    const lineNo = j + 1;
    lastDataLine = lineNo;
    for (const tok of t.split(/[\s,;]+/)) {
      if (tok === '') continue;
      let v: number;
      if (tok === '?') v = NaN;
      else if (RE_AFFN.test(tok)) v = Number(tok);
      else return fail(`line ${lineNo}: '${inputExcerpt(tok, 20)}' is not a number in the (XY..XY) table`, lineNo);
      if (!hasPending) {
        pendingX = v;
        pendingLine = lineNo;
        hasPending = true;
        continue;
      }
      if (out.length >= budget)
        return fail(
          nPoints !== undefined
            ? `line ${lineNo}: the data table holds more than ##NPOINTS=${nPoints} (line ${nPointsLine}) points`
            : `line ${lineNo}: the data table holds more than ${maxPoints} points (limit maxPoints)`,
          lineNo,
          'NPOINTS',
        );
      out.push(pendingX * xFactor, v * yFactor, pendingLine);
      hasPending = false;
    }
  }
  if (hasPending) return fail(`line ${pendingLine}: the (XY..XY) table ends with an abscissa without its ordinate`, pendingLine);
  if (out.length === 0) return fail(`line ${tableLine}: the data table has no data lines`, tableLine, 'XYDATA');
  if (nPoints !== undefined && out.length !== nPoints) {
    const truncated = j >= lines.length;
    return fail(
      `line ${lastDataLine}: ##NPOINTS=${nPoints} (line ${nPointsLine}) but the data table holds ${out.length} points` +
        (truncated ? `; the file ends at line ${lines.length} without ##END= (truncated?)` : ''),
      lastDataLine,
      'NPOINTS',
    );
  }
  return { ok: true, ...out.finish(), next: j, notes: [] };
}
