/**
 * The words for what a trace import found wrong and did about it, built in one place so the page and the
 * command line say the same thing.
 */
import type { TraceImportIssue, TraceImportReport } from './trace';
import { traceLineList, type TraceSkipReason } from './traceSkipLog';

/** What each skip reason means, in words. */
const SKIP_WORDS: Record<TraceSkipReason, string> = {
  'non-numeric': 'text where a number belongs',
  'missing column': 'no value in the ordinate column',
  'NaN/Infinity': 'not finite numbers (NaN or Infinity)',
  "invalid value '?'": "missing values ('?')",
  'duplicate x': 'x repeated from an earlier row',
  'non-positive wavelength': 'wavelength zero or negative',
};

const plural = (n: number, noun: string) => `${n} ${noun}${n === 1 ? '' : 's'}`;
const round3 = (v: number) => Number(v.toPrecision(3));

/**
 * One problem in words, e.g. "6 rows skipped, not finite numbers (NaN or Infinity), at lines 102, 103,
 * 1501, 2401, 3334, 4001" (the first ten lines are listed, the rest counted).
 * @param issue one entry of `TraceImportReport.issues`
 * @returns one line of text, no file name, no full stop
 */
export function traceIssueText(issue: TraceImportIssue): string {
  switch (issue.kind) {
    case 'skipped': {
      let what = SKIP_WORDS[issue.reason] ?? issue.reason;
      if (issue.firstText) {
        const t = issue.firstText.text.trim() === '' ? 'an empty field' : `'${issue.firstText.text}'`;
        what += issue.count > 1 ? ` (e.g. ${t} on line ${issue.firstText.line})` : ` (${t})`;
      }
      if (issue.reason === 'duplicate x') {
        const d = issue.differentY;
        const differ =
          d === undefined
            ? ''
            : d === 0
              ? `; each had the same y as the ${issue.noun} kept`
              : `; y differs from the ${issue.noun} kept in ${d} of ${issue.count}`;
        what += ` (the first ${issue.noun} of each x is kept${differ})`;
      }
      return `${plural(issue.count, issue.noun)} skipped, ${what}, at ${traceLineList(issue.lines, issue.lineCount)}`;
    }
    case 'unsorted':
      return `the axis is not monotonic (first reversal at line ${issue.firstLine}); points were sorted by wavenumber`;
    case 'clamped':
      return (
        `${plural(issue.count, 'point')} with transmittance ≤ 0 clamped to T = ${round3(issue.transmittance)} ` +
        `(A = ${round3(0 - Math.log10(issue.transmittance))}): ${traceLineList(issue.lines, issue.count)}`
      );
    case 'flat':
      return `the trace is flat: all ${issue.points} points have the same value (absorbance ${issue.absorbance}), so no peaks can be found in it`;
    case 'undecodable':
      return (
        `${plural(issue.count, 'byte sequence')} ${issue.count === 1 ? 'is' : 'are'} not valid ${issue.encoding} ` +
        `(the first at byte ${issue.firstByte}) and read as the replacement character U+FFFD`
      );
  }
}

/**
 * The warnings of an import report, one line per kind of problem (rows skipped for each reason, axis
 * re-ordered, values clamped, flat trace, undecodable bytes), without the file name. The command line
 * prints each as `warning: <file>: <text>`; the page posts each as a warning message `<file>: <text>`.
 * @param report what `importTrace` returned (reports saved before `issues` existed give none)
 */
export function traceImportWarnings(report: Pick<TraceImportReport, 'issues'>): string[] {
  return (report.issues ?? []).map(traceIssueText);
}
