/**
 * The unresolved-band tab on the low-resolution demo (public/demo/lowres-*): diagnosis, the contour
 * fit in its worker (cancel, then a full run), the fitted contour and residual drawn over the trace,
 * the fitted constants within their σ of the demo's truth, and the Q-branch analysis; then a real band
 * (HC3N ν1 from the published line list of Tamassia et al. 2022, test/fit/realBandTraces.ts) taken
 * from the trace file to fitted constants on the page; and a band made outside this program
 * (test/fixtures/independent_traces) diagnosed on the page.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { realBands, realBandTraceThick } from '../fit/realBandTraces';
import { gotoApp, launch, openPage, SHOTS } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

const truth = JSON.parse(readFileSync(join(__dirname, '..', '..', 'public', 'demo', 'lowres-truth.json'), 'utf8'));

describe('unresolved-band tab', () => {
  it('diagnoses the low-resolution demo, cancels and runs a contour fit, and draws the fit over the trace', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    await page.locator('[data-testid=tab-contour]').click();
    await page.locator('[data-testid=contour-demo]').click();
    await page.waitForFunction(() => document.querySelector('[data-testid=file-name]')?.textContent?.includes('lowres'), null, {
      timeout: 60_000,
    });
    await expect.poll(() => page.locator('[data-testid=contour-from]').inputValue(), { timeout: 20_000 }).toBe('1085');

    await page.locator('[data-testid=contour-diagnose]').click();
    const profile = page.locator('[data-testid=contour-profile]');
    await expect.poll(() => profile.getAttribute('data-profile'), { timeout: 20_000 }).toBe('Q-series');
    expect(await profile.textContent()).toMatch(/symmetric top perpendicular/);

    // B of the Q-branch series from the contour fit through the instrument, in the worker: cancel
    // leaves the diagnosis as it was; a full run shows B with σ, determined, the demo's B″ inside
    // B ± 2σ (the model's spin weights 4, 2, 2 passed to the fit).
    const qb = page.locator('[data-testid=contour-qseries-b]');
    await page.locator('[data-testid=contour-qseries-b-run]').click();
    await page.locator('[data-testid=contour-qseries-b-cancel]').click();
    await expect.poll(() => qb.getAttribute('data-status'), { timeout: 20_000 }).toBe('cancelled');
    expect(await page.locator('[data-testid=contour-qseries-b-result]').count()).toBe(0);
    await page.locator('[data-testid=contour-qseries-b-run]').click();
    await expect.poll(() => page.locator('[data-testid=contour-qseries-b-progress]').count(), { timeout: 20_000 }).toBe(1);
    const qbResult = page.locator('[data-testid=contour-qseries-b-result]');
    await expect.poll(() => qbResult.count(), { timeout: 300_000, interval: 1000 }).toBe(1);
    expect(await qbResult.getAttribute('data-determined')).toBe('true');
    const bFit = Number(await qbResult.getAttribute('data-b'));
    const bSigma = Number(await qbResult.getAttribute('data-sigma'));
    expect(Math.abs(bFit - truth.lower.B)).toBeLessThan(2 * bSigma);
    expect(await qbResult.textContent()).toMatch(/B determined/);
    expect(await profile.getAttribute('data-profile')).toBe('Q-series');
    await page.locator('[data-testid=contour-diagnosis]').screenshot({ path: `${SHOTS}/contour-qseries-b.png` });

    // Cancel: start, cancel at once; the worker is terminated and nothing changes.
    await page.locator('[data-testid=contour-fit-start]').click();
    await page.locator('[data-testid=contour-fit-cancel]').click();
    const fitBox = page.locator('[data-testid=contour-fit]');
    await expect.poll(() => fitBox.getAttribute('data-status'), { timeout: 20_000 }).toBe('cancelled');
    expect(await page.locator('[data-testid=contour-parameters]').count()).toBe(0);

    // The full fit.
    await page.locator('[data-testid=contour-fit-start]').click();
    await expect.poll(() => fitBox.getAttribute('data-status'), { timeout: 120_000, interval: 500 }).toBe('done');
    // The fitted contour and the residual are drawn over the trace (three line traces).
    await expect
      .poll(() => page.locator('[data-testid=contour-plot] .scatterlayer .trace').count(), { timeout: 20_000 })
      .toBeGreaterThanOrEqual(3);
    // Each floated constant within 4σ of the truth (the contour-fit target of issue 18).
    const rows = page.locator('[data-testid=contour-parameters] tr[data-key]');
    const n = await rows.count();
    let checked = 0;
    for (let i = 0; i < n; i++) {
      const key = (await rows.nth(i).getAttribute('data-key'))!;
      if ((await rows.nth(i).getAttribute('data-fixed')) === 'true' || key === 'lorentz') continue;
      const [side, name] = key.split('.');
      const value = Number(await rows.nth(i).getAttribute('data-value'));
      const sigma = Number(await rows.nth(i).getAttribute('data-sigma'));
      expect(sigma, key).toBeGreaterThan(0);
      expect(Math.abs(value - truth[side][name]) / sigma, key).toBeLessThan(4);
      checked++;
    }
    expect(checked).toBe(5);
    await page.screenshot({ path: `${SHOTS}/contour-fit.png`, fullPage: true });

    // Q-branch analysis: maxima found, indices proposed as guesses, the quadratic fitted.
    await page.locator('[data-testid=contour-q-find]').click();
    await expect.poll(() => page.locator('[data-testid=contour-q-table] tbody tr').count(), { timeout: 20_000 }).toBeGreaterThan(5);
    expect(await page.locator('[data-testid=contour-q-table]').textContent()).toMatch(/guess/);
    await page.locator('[data-testid=contour-q-fit]').click();
    const q = (await page.locator('[data-testid=contour-q-result]').textContent()) ?? '';
    expect(q).toMatch(/A′\(1 − ζ\) − B′ = 2\.1/);

    // A starting model from the diagnosis replaces the model only after the in-page question, as
    // one undo step.
    await page.locator('[data-testid=contour-start-model]').click();
    await page.locator('[data-testid=confirm-cancel]').click();
    expect(await page.locator('[data-testid=undo]').getAttribute('title')).not.toMatch(/starting model/);
    await page.locator('[data-testid=contour-start-model]').click();
    await page.locator('[data-testid=confirm-replace]').click();
    await expect
      .poll(() => page.locator('[data-testid=undo]').getAttribute('title'), { timeout: 20_000 })
      .toMatch(/starting model from the band shape/);
    await page.locator('[data-testid=undo]').click();
    await expect.poll(() => page.locator('[data-testid=undo]').getAttribute('title'), { timeout: 20_000 }).not.toMatch(/starting model/);
    expect(log.pageErrors).toEqual([]);
    await context.close();
  }, 600_000);

  it('takes a real band from its trace to fitted constants: HC3N ν1 seen at L = 0.9 cm, boxcar', async () => {
    // The trace: HC3N ν1's published lines (Tamassia et al. 2022) as a spectrometer records them:
    // Doppler-limited lines (m = 51 amu, 296 K) optically thick at their centres (τ = 3 for the strongest),
    // the boxcar instrument line shape of L = 0.9 cm (resolution 0.67 cm^-1, J lines 0.30 cm^-1 apart
    // unresolved) applied to the transmittance, 1 % noise. True values from the same data:
    // B″ = 0.151740 cm^-1 (the ground state's microwave lines), ν0 = 3327.37 cm^-1.
    const band = realBands()[0];
    expect(band.name).toBe('HC3N ν1');
    const t = realBandTraceThick(band, 0.9, 'boxcar', 0.01, 7, 51, 3);
    const csv = ['wavenumber_cm-1,absorbance', ...Array.from(t.x, (x, k) => `${x.toFixed(5)},${t.y[k].toExponential(6)}`)].join('\n');
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    await page
      .locator('[data-testid=file-input]')
      .setInputFiles({ name: 'hc3n-nu1-L0.9.csv', mimeType: 'text/plain', buffer: Buffer.from(csv) });
    await page.waitForFunction(() => document.querySelector('[data-testid=file-name]')?.textContent?.includes('hc3n'), null, {
      timeout: 60_000,
    });
    // What the user knows of the sample: the molecule's mass, and lines narrower than Doppler (low pressure).
    for (const [label, value] of [
      ['Mass / amu', '51'],
      ['Lorentz HWHM / cm⁻¹', '0.0001'],
    ]) {
      await page.getByLabel(label, { exact: true }).fill(value);
      await page.getByLabel(label, { exact: true }).press('Enter');
    }
    await page.locator('[data-testid=tab-contour]').click();
    const setField = async (id: string, value: string) => {
      await page.locator(`[data-testid=${id}]`).fill(value);
      await page.locator(`[data-testid=${id}]`).blur();
    };
    await setField('contour-from', t.fromCm1.toFixed(2));
    await setField('contour-to', t.toCm1.toFixed(2));
    await setField('contour-opd', '0.9');
    await page.locator('[data-testid=contour-apodization]').selectOption('boxcar');

    // Diagnosis: P and R only (a Σ–Σ band of a linear molecule), rated low (a weak Q branch is not
    // ruled out without resolved lines), B within 10 % of the microwave value, origin within 0.5 cm^-1.
    await page.locator('[data-testid=contour-diagnose]').click();
    const profile = page.locator('[data-testid=contour-profile]');
    await expect.poll(() => profile.getAttribute('data-profile'), { timeout: 20_000 }).toBe('PR');
    expect(await profile.textContent()).toMatch(/linear parallel/);
    expect(await profile.getAttribute('data-confidence')).toBe('low');
    const diagnosis = (await page.locator('[data-testid=contour-diagnosis]').textContent()) ?? '';
    const bRead = Number(/B\s*≈\s*([0-9.]+)/.exec(diagnosis)?.[1]);
    expect(Math.abs(bRead / band.B - 1)).toBeLessThan(0.1);
    // A B read off a profile rated low is shown as a rough value with its range, not as determined.
    const bLine = page.locator('[data-testid=contour-b-estimate]');
    expect(await bLine.getAttribute('data-determined')).toBe('false');
    expect(await bLine.textContent()).toMatch(/between [0-9.]+ and [0-9.]+\) — a rough value only: the profile is rated low/);
    const originRead = Number(/origin ≈ ([0-9.]+)/.exec(diagnosis)?.[1]);
    expect(Math.abs(originRead - band.origin!)).toBeLessThan(0.5);

    // The starting model from the diagnosis, then the contour fit through the instrument in the worker.
    await page.locator('[data-testid=contour-start-model]').click();
    await page.locator('[data-testid=confirm-replace]').click();
    await expect.poll(() => page.locator('[data-testid=undo]').getAttribute('title'), { timeout: 20_000 }).toMatch(/starting model/);
    const fitBox = page.locator('[data-testid=contour-fit]');
    await page.locator('[data-testid=contour-fit-start]').click();
    // The diagnosis runs in the worker beside the fit: asked for again while the fit runs, it comes
    // back (the same reading) and the fit goes on to its end.
    await expect.poll(() => fitBox.getAttribute('data-status'), { timeout: 20_000 }).toBe('running');
    await page.locator('[data-testid=contour-diagnose]').click();
    await page.waitForSelector('[data-testid=contour-diagnosis][data-running=true]', { timeout: 10_000 });
    await page.waitForSelector('[data-testid=contour-diagnosis][data-running=false]', { timeout: 60_000 });
    expect(await profile.getAttribute('data-profile')).toBe('PR');
    expect(await fitBox.getAttribute('data-status')).not.toBe('cancelled');
    await expect.poll(() => fitBox.getAttribute('data-status'), { timeout: 300_000, interval: 500 }).toBe('done');
    await page.screenshot({ path: `${SHOTS}/contour-real-hc3n-nu1.png`, fullPage: true });
    // The fitted contour leaves the noise: rms within 1.5× its σ (the simulation target of issue 18).
    const rms = Number(await page.locator('[data-testid=contour-fit-summary]').getAttribute('data-rms'));
    expect(rms / t.noiseSigma).toBeLessThan(1.5);
    const row = (key: string) => page.locator(`[data-testid=contour-parameters] tr[data-key="${key}"]`);
    const value = async (key: string) => Number(await row(key).getAttribute('data-value'));
    const sigma = async (key: string) => Number(await row(key).getAttribute('data-sigma'));
    // B″ and the origin within 4σ (the contour-fit target of issue 18) of the published values; B″
    // also within 2 % (measured −0.22 %, 0.8σ, from the diagnosis's −0.2 %; ν0 1.2σ; rms 1.01× the noise).
    expect(Math.abs((await value('lower.B')) - band.B) / (await sigma('lower.B'))).toBeLessThan(4);
    expect(Math.abs((await value('lower.B')) / band.B - 1)).toBeLessThan(0.02);
    expect(Math.abs((await value('upper.origin')) - band.origin!) / (await sigma('upper.origin'))).toBeLessThan(4);
    expect(log.pageErrors).toEqual([]);
    await context.close();
  }, 600_000);
  it('diagnoses a band made outside this program on the page, in the worker: a CH3I ν3-like parallel band at L = 1 cm', async () => {
    // test/fixtures/independent_traces/prolate_heavy_par.csv (make_traces.py: its own term values,
    // Hönl–London factors and Fourier-transform instrument; B″ = 0.2502 cm^-1, B′ − B″ = −0.7 %, ν0 =
    // 533 cm^-1, 296 K, Happ–Genzel): the J lines 0.5 cm^-1 apart are not resolved. The diagnosis that
    // took 65–309 ms of the main thread now runs in the worker; the page reads P, Q and R, a symmetric
    // top's parallel band, B within 10 % (the classify target) and the origin within 1 cm^-1.
    const dir = join(__dirname, '..', 'fixtures', 'independent_traces');
    const c = (
      JSON.parse(readFileSync(join(dir, 'cases.json'), 'utf8')) as { name: string; lower: { B: number }; upper: { origin: number } }[]
    ).find((x) => x.name === 'prolate_heavy_par')!;
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    await page.locator('[data-testid=file-input]').setInputFiles(join(dir, 'prolate_heavy_par.csv'));
    await page.waitForFunction(() => document.querySelector('[data-testid=file-name]')?.textContent?.includes('prolate_heavy_par'), null, {
      timeout: 60_000,
    });
    await page.getByLabel('T / K', { exact: true }).fill('296');
    await page.getByLabel('T / K', { exact: true }).press('Enter');
    await page.locator('[data-testid=tab-contour]').click();
    for (const [id, value] of [
      ['contour-from', '487'],
      ['contour-to', '563'],
    ]) {
      await page.locator(`[data-testid=${id}]`).fill(value);
      await page.locator(`[data-testid=${id}]`).blur();
    }
    await page.locator('[data-testid=contour-diagnose]').click();
    const profile = page.locator('[data-testid=contour-profile]');
    await expect.poll(() => profile.getAttribute('data-profile'), { timeout: 30_000 }).toBe('PQR');
    expect(await profile.textContent()).toMatch(/symmetric top parallel/);
    expect(await page.locator('[data-testid=contour-diagnosis]').getAttribute('data-running')).toBe('false');
    const bRead = Number(await page.locator('[data-testid=contour-b-estimate]').getAttribute('data-b'));
    expect(Math.abs(bRead / c.lower.B - 1)).toBeLessThan(0.1);
    const diagnosis = (await page.locator('[data-testid=contour-diagnosis]').textContent()) ?? '';
    expect(Math.abs(Number(/origin ≈ ([0-9.]+)/.exec(diagnosis)?.[1]) - c.upper.origin)).toBeLessThan(1);
    expect(log.pageErrors).toEqual([]);
    await context.close();
  }, 300_000);
});
