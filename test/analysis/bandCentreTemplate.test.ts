import { describe, expect, it } from 'vitest';
import { bandCentreTemplate } from '../../src/analysis/bandCentreTemplate';
import { bandPrSeparation } from '../../src/analysis/bandShapeClassify';
import { gaussian, seededRandom } from '../fit/contourTraces';

/**
 * Envelope of an unresolved Σ–Σ band: I(m) ∝ |m|·exp(−B m(m+1) hc/kT) at x = 2Bm (Herzberg II (1945)
 * ch. IV, from memory), summed as Gaussians of σ `blur` (the instrument), optionally with a Q branch of
 * area share `q` as a Gaussian at the origin; 0.3 % noise.
 */
function envelope(q: number, blur: number, seed: number): { x: Float64Array; y: Float64Array } {
  const B = 0.4;
  const kT = 205.7; // cm^-1 at 296 K (c2 = 1.4388 cm K)
  const x = Float64Array.from({ length: 1200 }, (_, i) => -60 + 0.1 * i);
  const y = new Float64Array(x.length);
  let area = 0;
  for (let m = -60; m <= 60; m++) {
    if (m === 0) continue;
    const J = m > 0 ? m - 1 : -m; // R(J) at m = J + 1, P(J) at m = −J
    const w = Math.abs(m) * Math.exp((-B * J * (J + 1)) / kT);
    area += w;
    for (let i = 0; i < x.length; i++) y[i] += w * Math.exp(-((x[i] - 2 * B * m) ** 2) / (2 * blur * blur));
  }
  const qArea = (q / (1 - q)) * area;
  for (let i = 0; i < x.length; i++) y[i] += (qArea * Math.exp(-(x[i] ** 2) / (2 * 1.5 * blur * 1.5 * blur))) / 1.5;
  const rand = seededRandom(seed);
  const top = Math.max(...y);
  for (let i = 0; i < x.length; i++) y[i] += 0.003 * top * gaussian(rand);
  return { x, y };
}

describe('bandCentreTemplate', () => {
  // First guess of s as bandShapeClassify gives it: half the P–R maximum separation.
  const sGuess = bandPrSeparation(0.4, 296) / 2;
  it('finds no central Q component in a Σ–Σ envelope', () => {
    // Threshold used by bandShapeClassify: improvement ≥ 0.3 and Q share ≥ 0.03 read as PQR.
    for (const blur of [0.8, 2, 4]) {
      const { x, y } = envelope(0, blur, 3);
      const t = bandCentreTemplate(x, y, 0.5, sGuess);
      expect(t.improvement < 0.3 || t.qShare < 0.03, `blur ${blur}`).toBe(true);
    }
  });

  it('finds a Q branch that holds 10 % of the band and places the centre', () => {
    for (const blur of [0.8, 2, 4]) {
      const { x, y } = envelope(0.1, blur, 5);
      const t = bandCentreTemplate(x, y, 0.5, sGuess);
      expect(t.improvement, `blur ${blur}`).toBeGreaterThan(0.3);
      // Its share: within 30 % while the blur is small against the lobes; a blur of a third of the
      // lobe distance trades Q area for lobe width, so there only that it is seen (≥ 0.03, the threshold).
      if (blur <= 2) expect(Math.abs(t.qShare / 0.1 - 1), `blur ${blur}`).toBeLessThan(0.3);
      else expect(t.qShare).toBeGreaterThan(0.03);
      expect(Math.abs(t.origin)).toBeLessThan(1);
    }
  });
});
