import { describe, expect, it } from 'vitest';
import { TRACE_IMPORT_DEFAULTS, traceImportOptionsResolve } from '../../src/io/traceImportOptions';

describe('traceImportOptionsResolve', () => {
  it('fills every default and treats explicit undefined as not given', () => {
    const r = traceImportOptionsResolve({ yColumn: undefined, xUnit: 'um' });
    expect(r).toEqual({ ok: true, options: { ...TRACE_IMPORT_DEFAULTS, xUnit: 'um' } });
  });
  it('documents the defaults the brief asks for', () => {
    expect(TRACE_IMPORT_DEFAULTS).toMatchObject({ yColumn: 1, decimal: 'auto', maxChars: 500_000_000 });
  });
  it.each([
    [{ yColumn: 0 }, 'yColumn', 'importTrace: options.yColumn must be an integer >= 1 (column 0 is the abscissa), got 0'],
    [{ yColumn: 1.5 }, 'yColumn', 'importTrace: options.yColumn must be an integer >= 1 (column 0 is the abscissa), got 1.5'],
    [{ xUnit: 'furlong' }, 'xUnit', 'importTrace: options.xUnit must be auto | cm-1 | um | nm, got "furlong"'],
    [
      { ordinate: 'T' },
      'ordinate',
      'importTrace: options.ordinate must be auto | absorbance | transmittance | percent-transmittance, got "T"',
    ],
    [{ decimal: ':' }, 'decimal', `importTrace: options.decimal must be auto | '.' | ',', got ":"`],
    [{ maxChars: -1 }, 'maxChars', 'importTrace: options.maxChars must be a positive number, got -1'],
  ])('refuses %o naming the field', (options, field, message) => {
    expect(traceImportOptionsResolve(options as never)).toEqual({ ok: false, field, message });
  });
});
