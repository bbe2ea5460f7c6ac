/**
 * The page's message area shows the importer's warnings in the words the CLI prints (both come from
 * traceImportWarnings), one message per kind of problem, prefixed by the file name.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { importTrace } from '../../src/io/traceImport';
import { importTraceBytes } from '../../src/io/traceImportBytes';
import { traceImportWarnings } from '../../src/io/traceImportWarnings';
import { importSetParser, lineTableLoadText, traceImport } from '../../src/state/actionsImport';
import { benchReset, benchStore } from '../../src/state/store';
import { parseTraceInWorker } from '../../src/workers/parseClient';

const messages = () => benchStore.getState().messages.map((m) => `${m.level}: ${m.text}`);

describe('import warnings on the page', () => {
  beforeEach(() => benchReset());
  afterEach(() => importSetParser(parseTraceInWorker));

  it('posts each warning of a trace import as "<file>: <words>." after the summary', async () => {
    importSetParser(async (file, name, options) => importTrace(file as string, name, options));
    const text = 'x,y\n1000,0.1\n1001,NaN\n1002,abc\n1003,0.2\n1003,0.3\n1004,0.1\n';
    expect(await traceImport(text, 't.csv')).toBe(true);
    const r = importTrace(text, 't.csv');
    if (!r.ok) throw new Error(r.error.message);
    const words = traceImportWarnings(r.report);
    expect(words).toHaveLength(3);
    expect(messages().slice(1)).toEqual(words.map((w) => `warning: t.csv: ${w}.`));
    expect(messages()[0]).toMatch(
      /^warning: Loaded t\.csv: delimited text, 3 points, 1000\.00–1004\.00 cm⁻¹, absorbance, 3 rows skipped\.$/,
    );
  });

  it('posts nothing more than the summary for a clean trace', async () => {
    importSetParser(async (file, name, options) => importTrace(file as string, name, options));
    expect(await traceImport('x,y\n1000,0.1\n1001,0.3\n1002,0.1\n', 'ok.csv')).toBe(true);
    expect(messages()).toEqual(['info: Loaded ok.csv: delimited text, 3 points, 1000.00–1002.00 cm⁻¹, absorbance.']);
  });

  it('reads a UTF-16 file through the bytes path with no warning', async () => {
    const text = 'x,y\n1000,0.1\n1001,0.3\n1002,0.1\n';
    const bytes = Uint8Array.from([0xfe, 0xff, ...[...text].flatMap((c) => [0, c.charCodeAt(0)])]);
    importSetParser(async (_file, name, options) => importTraceBytes(bytes, name, options));
    expect(await traceImport('(bytes)', 'be.csv')).toBe(true);
    expect(benchStore.getState().traceReport?.messages[0]).toBe('the bytes were read as UTF-16 BE (its byte-order mark)');
    expect(messages()).toEqual(['info: Loaded be.csv: delimited text, 3 points, 1000.00–1002.00 cm⁻¹, absorbance.']);
  });

  it('posts a line table warning in the words the CLI prints', () => {
    // Two R lines the default (perpendicular) model allows: ΔK = +1 from K'' = 0.
    const table = 'J_up,K_up,J_lo,K_lo,wavenumber,id\n1,1,0,0,1000,a\n2,1,1,0,1001,a\n';
    expect(lineTableLoadText(table, 'L.csv')).toBe(true);
    expect(messages()).toContain("warning: L.csv: 1 row renamed, id used by an earlier row ('a' → 'a#3'), at line 3.");
  });
});
