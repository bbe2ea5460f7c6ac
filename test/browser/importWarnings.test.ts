/**
 * The page shows an import's warnings in the words the CLI prints (traceImportWarnings), and reads a
 * UTF-16 trace chosen by the user. The files are written by the test (UTF-16 LE with a byte-order mark,
 * and a trace with NaN rows).
 */
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importTrace } from '../../src/io/traceImport';
import { traceImportWarnings } from '../../src/io/traceImportWarnings';
import { gotoApp, launch, openPage, SHOTS } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

/** 2001 points of invented Lorentzian lines every 0.5 cm^-1; rows at the given lines hold NaN. */
function traceText(nanLines: number[] = []): string {
  const rows = ['wavenumber,absorbance'];
  for (let i = 0; i <= 2000; i++) {
    const x = 2000 + i * 0.005;
    const d = x - 0.5 * Math.round(x / 0.5);
    const line = i + 2;
    rows.push(`${x.toFixed(3)},${nanLines.includes(line) ? 'NaN' : (0.02 + 0.4 / (1 + (d / 0.01) ** 2)).toFixed(5)}`);
  }
  return rows.join('\n') + '\n';
}

/** UTF-16 LE with the byte-order mark FF FE (Unicode Standard 15.0, §23.8). */
function utf16le(text: string): Buffer {
  const units = '\uFEFF' + text;
  const out = Buffer.alloc(units.length * 2);
  for (let i = 0; i < units.length; i++) out.writeUInt16LE(units.charCodeAt(i), 2 * i);
  return out;
}

describe('import warnings on the page', () => {
  it('a UTF-16 trace loads; a trace with NaN rows shows the CLI warning words in the message area and the panel', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);

    // UTF-16 LE: refused before ("no numeric data rows found"), now read like its UTF-8 twin.
    await page
      .locator('[data-testid=file-input]')
      .setInputFiles({ name: 'trace16.csv', mimeType: 'text/plain', buffer: utf16le(traceText()) });
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent(), { timeout: 30_000 }).toBe('trace16.csv');
    await page.locator('[data-testid=tab-import]').click();
    await expect.poll(() => page.locator('[data-testid=import-facts]').textContent()).toContain('2,001');
    expect(await page.locator('.import-info .warnings').textContent()).toContain('the bytes were read as UTF-16 LE (its byte-order mark)');

    // NaN rows: the same words as `cli peaks` prints after "warning: nan.csv: ".
    const text = traceText([102, 103, 1501]);
    const reference = importTrace(text, 'nan.csv');
    if (!reference.ok) throw new Error(reference.error.message);
    const [words] = traceImportWarnings(reference.report);
    expect(words).toBe('3 rows skipped, not finite numbers (NaN or Infinity), at lines 102, 103, 1501');
    await page.locator('[data-testid=file-input]').setInputFiles({ name: 'nan.csv', mimeType: 'text/plain', buffer: Buffer.from(text) });
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent(), { timeout: 30_000 }).toBe('nan.csv');
    await expect
      .poll(() => page.locator('.message.warning .message-text').allTextContents(), { timeout: 30_000 })
      .toContain(`nan.csv: ${words}.`);
    await expect.poll(() => page.locator('.import-info .warnings').textContent()).toContain(words);
    await page.screenshot({ path: `${SHOTS}/30-import-warnings.png` });
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });
});
