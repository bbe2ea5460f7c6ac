import { describe, expect, it } from 'vitest';
import {
  APODIZATION_NAMES,
  NORTON_BEER_COEFFICIENTS,
  apodizationWeight,
  instrumentLineShape,
  instrumentLineShapeFwhm,
} from '../../src/physics/instrumentLineShape';

/** Simpson integral of f over [a, b] with n (even) panels. */
function simpson(f: (x: number) => number, a: number, b: number, n: number): number {
  const h = (b - a) / n;
  let s = f(a) + f(b);
  for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

describe('apodizationWeight', () => {
  it('is 1 at zero path difference and 0 beyond L for every apodization', () => {
    for (const name of APODIZATION_NAMES) {
      // A(0) = 1 makes the ILS area 1 (Griffiths & de Haseth 2007, ch. 2); tolerance: the 6-digit coefficients.
      expect(apodizationWeight(name, 0)).toBeCloseTo(1, 6);
      expect(apodizationWeight(name, 1.0001)).toBe(0);
    }
  });

  it('has Norton–Beer coefficients that sum to 1', () => {
    // Norton & Beer, JOSA 66, 259 (1976): A(0) = Σ C_i = 1 by construction; 6 printed decimals → 1e-6.
    for (const c of Object.values(NORTON_BEER_COEFFICIENTS)) expect(Math.abs(c.reduce((a, b) => a + b, 0) - 1)).toBeLessThan(1e-6);
  });
});

describe('instrumentLineShape', () => {
  it('rejects an unknown apodization and a non-positive L', () => {
    expect(() => instrumentLineShape('hann' as never, 1, 0)).toThrow(/unknown apodization 'hann'/);
    expect(() => instrumentLineShape('boxcar', 0, 0)).toThrow(/opdCm must be finite and > 0/);
  });

  it('peaks at 2L for boxcar and L for triangular', () => {
    // 2L sinc(2πνL) and L sinc²(πνL): Griffiths & de Haseth (2007) ch. 2; exact closed forms.
    expect(instrumentLineShape('boxcar', 2.5, 0)).toBe(5);
    expect(instrumentLineShape('triangular', 2.5, 0)).toBe(2.5);
  });

  it('has the first zero of the boxcar sinc at 1/(2L) and of the triangular sinc² at 1/L', () => {
    // Same source; tolerance 1e-12 of the peak (round-off of sin near π).
    expect(Math.abs(instrumentLineShape('boxcar', 1.7, 1 / (2 * 1.7)))).toBeLessThan(1e-12 * 3.4);
    expect(Math.abs(instrumentLineShape('triangular', 1.7, 1 / 1.7))).toBeLessThan(1e-12 * 1.7);
  });

  it('matches the closed form when the quadrature route is checked on boxcar-like weights', () => {
    // Happ–Genzel at Δν = 0: 2L ∫_0^1 (0.54 + 0.46 cos πu) du = 2L · 0.54 (elementary integral).
    expect(instrumentLineShape('happ-genzel', 1.3, 0)).toBeCloseTo(2 * 1.3 * 0.54, 10);
  });

  it('has area 1 for every apodization', () => {
    // ∫ILS dν = A(0) = 1 (Fourier inversion at x = 0). Integrated over ±X, X = 50/L, the wings left
    // out are known: the step A(1) at u = 1 gives a wing 2L·A(1)·sin(2πνL)/(2πνL), whose cut removes
    // A(1)/(π²XL) = A(1)/(50π²) (Si(z) → π/2 − cos z/z); the triangular sinc² wings (A(1) = 0) hold
    // 2∫_X^∞ dν/(2π²ν²L) = 1/(50π²). Tolerance 3e-5: the next, 1/X², terms and Simpson's error.
    const L = 0.9;
    for (const name of APODIZATION_NAMES) {
      const area = simpson((v) => instrumentLineShape(name, L, v), -50 / L, 50 / L, 4_000);
      const cut = name === 'triangular' ? 1 : apodizationWeight(name, 1);
      expect(Math.abs(area - (1 - cut / (50 * Math.PI ** 2)))).toBeLessThan(3e-5);
    }
  });

  it('has the published FWHMs of the sinc and sinc² line shapes', () => {
    // Griffiths & de Haseth (2007) ch. 2: boxcar FWHM 1.207/(2L), triangular 1.772/(2L)
    // (3 decimals printed → tolerance 6e-4 in units of 1/(2L)).
    for (const L of [0.9, 2, 4]) {
      expect(Math.abs(instrumentLineShapeFwhm('boxcar', L) * 2 * L - 1.207)).toBeLessThan(6e-4);
      expect(Math.abs(instrumentLineShapeFwhm('triangular', L) * 2 * L - 1.772)).toBeLessThan(6e-4);
    }
  });

  it('gives the Happ–Genzel FWHM of about 1.82/(2L)', () => {
    // Griffiths & de Haseth (2007) ch. 2 table of apodization functions, value from memory (1.82, 2 decimals).
    expect(Math.abs(instrumentLineShapeFwhm('happ-genzel', 1) * 2 - 1.82)).toBeLessThan(0.006);
  });

  it('gives the Norton–Beer FWHMs 1.2, 1.4 and 1.6 times the boxcar FWHM', () => {
    // Norton & Beer (1976; erratum 1977): weak, medium and strong are defined by these FWHM ratios;
    // the 6-digit coefficients reproduce them to < 1e-4 (tolerance 2e-4).
    const box = instrumentLineShapeFwhm('boxcar', 1);
    expect(Math.abs(instrumentLineShapeFwhm('norton-beer-weak', 1) / box - 1.2)).toBeLessThan(2e-4);
    expect(Math.abs(instrumentLineShapeFwhm('norton-beer-medium', 1) / box - 1.4)).toBeLessThan(2e-4);
    expect(Math.abs(instrumentLineShapeFwhm('norton-beer-strong', 1) / box - 1.6)).toBeLessThan(2e-4);
  });
});
