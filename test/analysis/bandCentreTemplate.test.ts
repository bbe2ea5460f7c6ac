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

  it('takes flattened lobes of lines optically thick at their own width for saturation, not for a Q branch, and keeps B', () => {
    // The same Σ–Σ band recorded through the transmittance: each line adds its equivalent width
    // W = ∫(1 − exp(−τ0·e^{−ln2·d²})) dd (a Doppler line of peak optical depth τ0 ∝ its strength, the
    // curve of growth, Herzberg II (1945) ch. IV from memory), summed here by the trapezoid rule, not its
    // strength; the strongest line at τ0 = 3 or 30; no Q branch.
    const B = 0.4;
    const kT = 205.7;
    const strength = (m: number) => {
      const J = m > 0 ? m - 1 : -m;
      return Math.abs(m) * Math.exp((-B * J * (J + 1)) / kT);
    };
    let sMax = 0;
    for (let m = -60; m <= 60; m++) if (m !== 0) sMax = Math.max(sMax, strength(m));
    const width = (tau0: number) => {
      let w = 0;
      for (let d = -8; d <= 8; d += 0.01) w += (1 - Math.exp(-tau0 * Math.exp(-Math.LN2 * d * d))) * 0.01;
      return w;
    };
    for (const tauPeak of [3, 30]) {
      const x = Float64Array.from({ length: 1200 }, (_, i) => -60 + 0.1 * i);
      const y = new Float64Array(x.length);
      for (let m = -60; m <= 60; m++) {
        if (m === 0) continue;
        const w = width((tauPeak * strength(m)) / sMax);
        for (let i = 0; i < x.length; i++) y[i] += w * Math.exp(-((x[i] - 2 * B * m) ** 2) / (2 * 2 * 2));
      }
      const rand = seededRandom(9);
      const top = Math.max(...y);
      for (let i = 0; i < x.length; i++) y[i] += 0.003 * top * gaussian(rand);
      const t = bandCentreTemplate(x, y, 0.5, sGuess);
      expect(t.improvement < 0.09 || t.qShare < 0.04, `τ ${tauPeak}: no Q component`).toBe(true);
      expect(t.prSaturation, `τ ${tauPeak}`).toBeGreaterThan(0.5);
      // s² = 2BkT/hc for |x|·e^{−x²/2s²} (x ≈ 2Bm): B from the unsaturated lobes within 5 % at τ0 = 3
      // (the one-parameter saturation is not the Doppler curve of growth; at 30 within 20 %).
      const bLobes = (t.prLobeS * t.prLobeS) / (2 * kT);
      expect(Math.abs(bLobes / B - 1), `τ ${tauPeak}`).toBeLessThan(tauPeak <= 3 ? 0.05 : 0.2);
    }
  });
});
