import { describe, expect, it } from 'vitest';
import { faddeevaRe } from '../../src/physics/faddeeva';
import {
  lineShapeVoigtAsymptoticK,
  lineShapeVoigtTable,
  lineShapeVoigtTableScale,
  lineShapeVoigtTableValue,
} from '../../src/physics/lineShapeVoigtTable';
import { lineShapeVoigtFwhm } from '../../src/physics/lineShape';

/** Seeded LCG (Numerical Recipes "quick and dirty" constants), values in [0, 1). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

// The reference throughout is the Weideman series (faddeevaRe), itself checked against A&S tables,
// the power series and the continued fraction in faddeeva.test.ts to 1e-13.

describe('lineShapeVoigtTableScale', () => {
  it('is the Olivero–Longbothum HWHM in units of α/√ln2', () => {
    // Ref: Olivero & Longbothum, JQSRT 17, 233 (1977) with f_G = 2α, f_L = 2γ, y = √ln2 γ/α.
    // tol = 1e-15 relative (same formula, rescaled).
    const a = 0.0012;
    const g = 0.002;
    const y = (Math.sqrt(Math.LN2) * g) / a;
    const hwhm = (lineShapeVoigtTableScale(y) * a) / Math.sqrt(Math.LN2);
    expect(Math.abs(hwhm / (lineShapeVoigtFwhm(2 * g, 2 * a) / 2) - 1)).toBeLessThan(1e-15);
  });
});

describe('lineShapeVoigtTable', () => {
  it('interpolates F(u, y) = s K(u s, y) within 1e-6 of the peak for every y range', () => {
    // Requirement: 1e-5 of the peak; the stated bound of the table is 2.2e-6 (lineShapeVoigtTable.ts)
    // and the measured maximum 9.6e-7, so tol = 1.2e-6 of F(0, y).
    const rnd = lcg(4242);
    for (const [y0, y1] of [
      [0, 0],
      [0, 0.05],
      [1.27, 1.53],
      [0.3, 8],
      [50, 1e4],
    ]) {
      const table = lineShapeVoigtTable(y0, y1);
      for (let n = 0; n < 20000; n++) {
        const y = y0 + (y1 - y0) * rnd() ** 2;
        const u = (rnd() < 0.5 ? 8 : 40) * (2 * rnd() - 1);
        const s = lineShapeVoigtTableScale(y);
        const exact = s * faddeevaRe(Math.abs(u) * s, y);
        const peak = s * faddeevaRe(0, y);
        expect(Math.abs(lineShapeVoigtTableValue(table, u, y) - exact)).toBeLessThan(1.2e-6 * peak);
      }
    }
  });

  it('hits the exact nodes', () => {
    // At a node both interpolation fractions vanish: the value is the Weideman value. tol 1e-15.
    const table = lineShapeVoigtTable(0, 0);
    for (const u of [0, 1, 2.5, 8, 12]) {
      const exact = lineShapeVoigtTableScale(0) * faddeevaRe(u * lineShapeVoigtTableScale(0), 0);
      expect(Math.abs(lineShapeVoigtTableValue(table, u, 0) - exact)).toBeLessThan(1e-15);
    }
  });

  it('rejects an inverted or negative y range', () => {
    expect(() => lineShapeVoigtTable(2, 1)).toThrow(/lineShapeVoigtTable: yMax must be finite and >= yMin \(2\), got 1/);
    expect(() => lineShapeVoigtTable(-1, 1)).toThrow(/lineShapeVoigtTable: yMin .* got -1/);
  });
});

describe('lineShapeVoigtAsymptoticK', () => {
  it('is within 5e-8 of the peak beyond 16 Voigt HWHMs', () => {
    // Ref: two-term asymptotic series, A&S (1964) eq. 7.1.23; first neglected term (3/4)/z⁵.
    // tol 1e-7 of K(0, y) (measured 5.2e-8 at the switch-over u = 16).
    for (let eta = 0; eta < 0.999; eta += 0.01) {
      const y = eta / (1 - eta);
      const s = lineShapeVoigtTableScale(y);
      const peak = faddeevaRe(0, y);
      for (let u = 16; u < 200; u *= 1.1) {
        expect(Math.abs(lineShapeVoigtAsymptoticK(u * s, y) - faddeevaRe(u * s, y))).toBeLessThan(1e-7 * peak);
      }
    }
  });
});
