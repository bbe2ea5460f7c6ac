/**
 * The page never assigns what the user did not mean, and states numbers it can back: a
 * double-click only zooms; the keyboard walk says how sure it is or declines; impossible rows of a
 * line table are refused by name; the candidate list ranks in σ, finds the right line from the
 * demo's first guess and keeps off the ladders; a fit shows its degrees of freedom, does not
 * shrink σ with σ_w < 1, and explains a set no number of lines can determine.
 */
import { readFileSync } from 'node:fs';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { modelFileParse } from '../../src/io/modelFile';
import { bandLines } from '../../src/physics/bandLines';
import { lineLabelAscii } from '../../src/physics/lineLabel';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { transitionWavenumber } from '../../src/physics/termValues';
import { assignedCount, clickARung, gotoApp, launch, openPage, SHOTS, zoomPlot } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

const xRange = (page: Page) =>
  page.evaluate(() =>
    (
      document.querySelector('[data-testid=spectrum-plot]') as unknown as { _fullLayout: { xaxis: { range: number[] } } }
    )._fullLayout.xaxis.range.map((v) => Math.round(v)),
  );

/** Canvas-relative positions of free peak markers in the middle of the view, as page coordinates. */
async function freePeaksInMiddle(page: Page): Promise<[number, number][]> {
  const overlay = page.locator('[data-testid=plot-overlay]');
  const box = (await overlay.boundingBox())!;
  const list = ((await overlay.getAttribute('data-free-peaks')) ?? '').split(';').filter(Boolean);
  return list
    .map((p) => p.split(',').map(Number) as [number, number])
    .filter(([x]) => x > box.width * 0.3 && x < box.width * 0.7)
    .map(([x, y]) => [box.x + x, box.y + y]);
}

const messages = async (page: Page) => (await page.locator('[data-testid=messages]').textContent()) ?? '';

/** Load a text file through the page's file input. */
async function openText(page: Page, name: string, text: string): Promise<void> {
  await page.locator('[data-testid=file-input]').setInputFiles({ name, mimeType: 'text/plain', buffer: Buffer.from(text) });
}

describe('the page assigns only what the user meant', () => {
  it('a double-click zooms out and never assigns: not the selected rung, not a candidate list left open', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    const whole = await xRange(page);
    await zoomPlot(page, 0.55, 0.57);
    expect(await xRange(page)).not.toEqual(whole);
    // A rung selected, then a double-click on a peak marker (the first click alone would assign it).
    await clickARung(page);
    const [px, py] = (await freePeaksInMiddle(page))[0];
    await page.mouse.dblclick(px, py);
    await expect.poll(() => xRange(page)).toEqual(whole);
    await page.waitForTimeout(400);
    expect(await assignedCount(page)).toBe(0);
    expect(await page.locator('[data-testid=candidates]').count()).toBe(0);

    // No rung selected: a double-click on a peak leaves no candidate list, so a later rung click
    // selects that rung instead of assigning it to the old peak.
    await page.keyboard.press('Escape');
    await zoomPlot(page, 0.55, 0.57);
    const [qx, qy] = (await freePeaksInMiddle(page))[0];
    await page.mouse.dblclick(qx, qy);
    await expect.poll(() => xRange(page)).toEqual(whole);
    await page.waitForTimeout(400);
    expect(await page.locator('[data-testid=candidates]').count()).toBe(0);
    await zoomPlot(page, 0.55, 0.57);
    await clickARung(page);
    await page.waitForTimeout(300);
    expect(await assignedCount(page)).toBe(0);
    expect(await page.locator('[data-testid=plot-overlay]').getAttribute('data-selected-rung')).not.toBe('');
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });

  it('the keyboard walk states its tolerance in σ, declines with a reason where unsure, and takes a new tolerance', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    await zoomPlot(page, 0.45, 0.6);
    await page.locator('body').click({ position: { x: 2, y: 2 } });
    await page.keyboard.press('Escape');
    await page.keyboard.press('ArrowRight'); // the strongest rung
    const field = page.locator('[data-testid=walk-tolerance]');
    expect(await field.inputValue()).toBe('3');
    const seen: string[] = [];
    for (let n = 0; n < 6; n++) {
      const before = await messages(page);
      const count = await assignedCount(page);
      await page.keyboard.press('a');
      await expect.poll(() => messages(page)).not.toBe(before);
      seen.push(await messages(page));
      // Where the walk declined, the user skips the rung (→), as the walk's message suggests.
      if ((await assignedCount(page)) === count) await page.keyboard.press('ArrowRight');
    }
    // Every press either assigned with the σ distance and the tolerance stated, or declined and said why.
    const words = seen.join('\n');
    expect(words).toMatch(
      /Assigned .+: [\d.]+σ from [\d.]+ cm⁻¹ \(within 3σ = ±[\d.e-]+ cm⁻¹, first-guess σ|not assigned: .+\(tolerance 3σ/,
    );
    const n = await assignedCount(page);
    // Every line the walk assigned lies within the stated tolerance of its prediction.
    for (const m of words.matchAll(/Assigned [^:]+: ([\d.]+)σ from/g)) expect(Number(m[1])).toBeLessThanOrEqual(3);
    await field.fill('0.5');
    await field.press('Tab');
    await page.locator('body').click({ position: { x: 2, y: 2 } });
    const before = await messages(page);
    await page.keyboard.press('a');
    await expect.poll(() => messages(page)).not.toBe(before);
    expect(await messages(page)).toMatch(/0\.5σ/);
    expect(await assignedCount(page)).toBeGreaterThanOrEqual(n);
    await page.screenshot({ path: `${SHOTS}/20-walk.png` });
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });

  it('refuses line-table rows whose transition cannot exist, naming each row, and keeps the valid ones', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    // The demo is a perpendicular band: ΔK = ±1 only (Herzberg II (1945) ch. IV; from memory).
    const table = [
      'J_up,K_up,J_lo,K_lo,wavenumber',
      '11,2,12,1,1140.1234', // rP1(12): allowed
      '10,3,11,1,1141.2345', // ΔK = +2: impossible
      '5,0,4,4,1150.3456', // ΔK = −4: impossible
      '5,2,4,1,1152.4567', // rR1(4): allowed
    ].join('\n');
    await openText(page, 'with-impossible.csv', table + '\n');
    await expect.poll(() => assignedCount(page)).toBe(2);
    const text = await messages(page);
    expect(text).toMatch(/refused 2 rows/);
    expect(text).toMatch(/line 3: ΔK = 2 is not allowed in a perpendicular band/);
    expect(text).toMatch(/line 4: ΔK = -4 is not allowed/);
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });

  it('the candidate list ranks in σ, lists the true line of a peak from the demo’s first guess, and keeps off the ladders', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    // The demo's truth (public/demo/truth.json; invented) against its first guess (model.json):
    // the guess is ~0.1 cm^-1 off in the origin, more at high J.
    const truth = modelFileParse(readFileSync('public/demo/truth.json', 'utf8')).model;
    const guess = modelFileParse(readFileSync('public/demo/model.json', 'utf8')).model;
    const lines = bandLines(truth, { minIntensity: 0.002 });
    let strongest = 0;
    for (let i = 0; i < lines.count; i++) strongest = Math.max(strongest, lines.intensity[i]);
    // Truth lines that make a peak of their own (no other line ≥ 1/3 as strong within 0.02 cm^-1,
    // about the demo's line width), are not weak (≥ 5 % of the strongest) and that the first guess
    // puts 0.1–0.4 cm^-1 off: the case reported. Four of them, at least 3 cm^-1 apart.
    const offOf = (i: number) =>
      Math.abs(transitionWavenumber(guess, lines.jUpper[i], lines.kUpper[i], lines.jLower[i], lines.kLower[i]) - lines.wavenumberCm1[i]);
    const targets: number[] = [];
    const order = Array.from({ length: lines.count }, (_, i) => i).sort((a, b) => lines.intensity[b] - lines.intensity[a]);
    for (const i of order) {
      if (targets.length === 4 || lines.intensity[i] < 0.05 * strongest) break;
      const off = offOf(i);
      if (off < 0.1 || off > 0.4) continue;
      let alone = true;
      for (let j = 0; j < lines.count && alone; j++)
        if (j !== i && Math.abs(lines.wavenumberCm1[j] - lines.wavenumberCm1[i]) < 0.02 && 3 * lines.intensity[j] >= lines.intensity[i])
          alone = false;
      if (alone && targets.every((t) => Math.abs(lines.wavenumberCm1[t] - lines.wavenumberCm1[i]) > 3)) targets.push(i);
    }
    expect(targets.length).toBe(4);
    const whole = await xRange(page);
    const ranks: string[] = [];
    for (const i of targets) {
      const nu = lines.wavenumberCm1[i];
      const label = lineLabelAscii(lines.deltaK[i], lines.deltaJ[i], lines.kLower[i], lines.jLower[i], truth.shape);
      await page.keyboard.press('Escape');
      await page.getByRole('button', { name: 'Zoom out', exact: true }).first().click();
      await expect.poll(() => xRange(page)).toEqual(whole);
      // Two drags (a 1 cm^-1 drag on the whole band is too short to count as one): ±8, then ±0.5 cm^-1.
      for (const half of [8, 0.5]) {
        const [r0, r1] = await page.evaluate(
          () =>
            (document.querySelector('[data-testid=spectrum-plot]') as unknown as { _fullLayout: { xaxis: { range: number[] } } })
              ._fullLayout.xaxis.range,
        );
        await zoomPlot(page, (nu - half - r0) / (r1 - r0), (nu + half - r0) / (r1 - r0));
      }
      // Click the trace at the true line's position (the page takes the nearest peak).
      const [x, y] = await page.evaluate((at) => {
        const gd = document.querySelector('[data-testid=spectrum-plot]') as unknown as HTMLElement & {
          _fullLayout: { xaxis: { _offset: number; l2p: (v: number) => number }; yaxis: { _offset: number; _length: number } };
        };
        const r = gd.getBoundingClientRect();
        const xa = gd._fullLayout.xaxis;
        const ya = gd._fullLayout.yaxis;
        return [r.left + xa._offset + xa.l2p(at), r.top + ya._offset + 0.5 * ya._length];
      }, nu);
      await page.mouse.click(x, y);
      const opened = await page
        .waitForSelector('[data-testid=candidates]', { timeout: 5000 })
        .then(() => true)
        .catch(() => false);
      if (!opened) {
        await page.screenshot({ path: `${SHOTS}/21-candidates-missing.png` });
        throw new Error(`no candidate list after a click at ${nu} (${x}, ${y}); messages: ${await messages(page)}`);
      }
      const head = (await page.locator('[data-testid=candidates] .candidate-head strong').textContent()) ?? '';
      const peakCm1 = Number(/([\d.]+) cm⁻¹/.exec(head)?.[1]);
      expect(Math.abs(peakCm1 - nu), `peak for ${label}`).toBeLessThan(0.01);
      expect(await page.locator('[data-testid=candidates] th', { hasText: '|o − c|/σ' }).count()).toBe(1);
      expect(Number(await page.locator('[data-testid=candidate-sigma-0]').textContent())).toBeGreaterThanOrEqual(0);
      // Off the ladders: the list does not cover the peak's column (its ladder rungs are above it).
      const box = (await page.locator('[data-testid=candidates]').boundingBox())!;
      expect(x < box.x || x > box.x + box.width).toBe(true);
      const listed = await page.locator('[data-testid=candidates] tbody tr .line-label').allTextContents();
      expect(listed, `peak ${peakCm1}: true line ${label}, first guess ${offOf(i).toFixed(3)} cm^-1 off`).toContain(label);
      ranks.push(`${label} ${offOf(i).toFixed(2)} cm^-1 off: #${listed.indexOf(label) + 1}`);
    }
    console.info(`candidate list, rank of the true line: ${ranks.join('; ')}`);
    // Before: 29th, 27th, 7th and 19th of a list cut at nine, i.e. missing three times. Now every
    // one within the first five and most in the first three (a first guess alone cannot rank
    // every peak perfectly; state-level figures in test/state/candidateDemo.test.ts).
    const positions = ranks.map((r) => Number(r.split('#')[1]));
    expect(Math.max(...positions)).toBeLessThanOrEqual(5);
    expect(positions.filter((r) => r <= 3).length).toBeGreaterThanOrEqual(3);
    await page.screenshot({ path: `${SHOTS}/21-candidates.png` });
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });
});

/** An invented parallel band (fictitious prolate top; constants in cm^-1). */
function parallelModel(floatBothA: boolean): { json: string; model: BandModel } {
  const lower = { B: 0.2613, A: 3.874 };
  const upper = { origin: 1043.217, B: 0.2596, A: 3.851 };
  const model: BandModel = {
    shape: 'prolate',
    band: 'parallel',
    lower: stateConstantsFrom(lower),
    upper: stateConstantsFrom(upper),
    temperatureK: 270,
    jMax: 40,
    kMax: 6,
    spinWeights: [1],
  };
  const json = JSON.stringify({
    name: 'fictitious parallel band',
    shape: 'prolate',
    band: 'parallel',
    lower: { B: lower.B, A: floatBothA ? lower.A : { value: lower.A, fixed: true } },
    upper: { origin: upper.origin, B: upper.B, A: floatBothA ? upper.A : { value: upper.A, fixed: true } },
    temperature: 270,
    jMax: 40,
    kMax: 6,
  });
  return { json, model };
}

/** A line table of the model's lines at the given (J″, K″, ΔJ), offset by the given amounts (cm^-1). */
function lineTable(model: BandModel, rows: [number, number, number, number][]): string {
  return (
    ['J_up,K_up,J_lo,K_lo,wavenumber,uncertainty']
      .concat(
        rows.map(([jLower, kLower, deltaJ, offset]) => {
          const nu = transitionWavenumber(model, jLower + deltaJ, kLower, jLower, kLower) + offset;
          return `${jLower + deltaJ},${kLower},${jLower},${kLower},${nu.toFixed(6)},0.001`;
        }),
      )
      .join('\n') + '\n'
  );
}

describe('the fit states numbers it can back', () => {
  it('shows ν = N − P, keeps σ unscaled by σ_w < 1 and warns in words with one degree of freedom', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    const { json, model } = parallelModel(false);
    await openText(page, 'parallel.json', json);
    await expect.poll(() => messages(page)).toMatch(/parallel/);
    // 4 lines, 3 floated constants (origin, B′, B″): one degree of freedom; offsets of 1e-5 cm^-1
    // against a stated 1e-3 give σ_w far below 1.
    await openText(
      page,
      'four-lines.csv',
      lineTable(model, [
        [5, 0, 1, 1e-5],
        [9, 0, 1, -1e-5],
        [7, 0, -1, 1e-5],
        [12, 0, -1, -1e-5],
      ]),
    );
    await expect.poll(() => assignedCount(page)).toBe(4);
    await page.locator('[data-testid=tab-solve]').click();
    await page.locator('[data-testid=fit-run]').click();
    await page.waitForSelector('[data-testid=fit-summary]', { timeout: 60_000 });
    expect(await page.locator('[data-testid=fit-dof]').textContent()).toMatch(/ν = N − P = 1$/);
    expect(await page.locator('[data-testid=fit-sigma-scaling]').textContent()).toMatch(/not scaled down/);
    const warnings = (await page.locator('.fit-result .warnings').textContent()) ?? '';
    expect(warnings).toMatch(/Only 1 degree of freedom/);
    expect(warnings).not.toMatch(/set too large/);
    await page.screenshot({ path: `${SHOTS}/22-fit-dof.png` });
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });

  it('explains a set no number of lines can determine (A′ and A″ from ΔK = 0 lines) instead of asking for more lines', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    const { json, model } = parallelModel(true);
    await openText(page, 'parallel-both-A.json', json);
    await expect.poll(() => messages(page)).toMatch(/parallel/);
    // 4 lines for 5 floated constants (origin, B′, B″, A′, A″): too few, but the structural
    // defect (only A′ − A″ enters a parallel band; Herzberg II (1945) ch. IV) comes first.
    await openText(
      page,
      'k1-k2-lines.csv',
      lineTable(model, [
        [5, 1, 1, 0],
        [9, 1, -1, 0],
        [7, 2, 1, 0],
        [12, 2, -1, 0],
      ]),
    );
    await expect.poll(() => assignedCount(page)).toBe(4);
    await page.locator('[data-testid=tab-solve]').click();
    await page.locator('[data-testid=fit-run]').click();
    const refusal = page.locator('[data-testid=fit-refusal]');
    await refusal.waitFor({ timeout: 60_000 });
    const text = (await refusal.textContent()) ?? '';
    expect(text).toMatch(/only on A′ − A″/);
    expect(text).toMatch(/cannot change this/);
    expect(text).not.toMatch(/more line/);
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });
});
