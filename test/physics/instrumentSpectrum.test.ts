import { describe, expect, it } from 'vitest';
import { instrumentLineShape, type ApodizationName } from '../../src/physics/instrumentLineShape';
import { instrumentSpectrum, LINEAR_ROUTE_MAX_DEPTH } from '../../src/physics/instrumentSpectrum';
import { lineShapeDopplerHwhm } from '../../src/physics/lineShape';

function grid(from: number, to: number, step: number): Float64Array {
  const n = Math.round((to - from) / step) + 1;
  return Float64Array.from({ length: n }, (_, i) => from + i * step);
}

function lineSet(nu: number[], intensity: number[]) {
  return { count: nu.length, wavenumberCm1: Float64Array.from(nu), intensity: Float64Array.from(intensity) };
}

describe('instrumentSpectrum', () => {
  it('rejects a descending axis and a bad apodization', () => {
    const lines = lineSet([1000], [1]);
    const opts = { opdCm: 1, temperatureK: 296, massAmu: 50, opticalDepthScale: 1e-4 };
    expect(() => instrumentSpectrum(lines, Float64Array.from([1001, 1000]), opts)).toThrow(/strictly ascending; point 1/);
    expect(() => instrumentSpectrum(lines, Float64Array.from([1000]), { ...opts, apodization: 'x' as never })).toThrow(
      /unknown apodization/,
    );
  });

  it('equals the direct sum of instrument line shapes for weak lines (linear route)', () => {
    // Weak-absorption limit: observed τ = Σ S_i ILS(ν − ν_i) (Griffiths & de Haseth 2007, ch. 2), the
    // Doppler width (~1e-3 cm^-1) negligible beside 1/(2L); the direct sum uses the closed-form ILS.
    // Tolerance 1 % of the peak: the Doppler broadening itself changes the peak by ~ (πLα)²/… < 1e-4,
    // the internal grid's aliasing by < 0.3 %, the 12/L cut of far lines by < 1.5 % of a far line.
    const lines = lineSet([1000, 1000.8, 1001.5, 1003.2], [1, 0.5, 0.8, 0.3]);
    const x = grid(997, 1006, 0.01);
    for (const [L, apo] of [
      [1, 'boxcar'],
      [2.5, 'triangular'],
      [0.9, 'norton-beer-medium'],
      [4, 'happ-genzel'],
    ] as [number, ApodizationName][]) {
      const scale = 1e-6; // peak τ at the Doppler width ≈ 5e-4: the 'auto' route is linear
      const r = instrumentSpectrum(lines, x, { opdCm: L, apodization: apo, temperatureK: 296, massAmu: 50, opticalDepthScale: scale });
      expect(r.route).toBe('linear');
      let peak = 0;
      let worst = 0;
      for (let i = 0; i < x.length; i++) {
        let direct = 0;
        for (let j = 0; j < lines.count; j++)
          direct += scale * lines.intensity[j] * instrumentLineShape(apo, L, x[i] - lines.wavenumberCm1[j]);
        peak = Math.max(peak, direct);
        worst = Math.max(worst, Math.abs(r.opticalDepth[i] - direct));
      }
      expect(worst).toBeLessThan(0.01 * peak);
    }
  });

  it('reports the peak optical depth of an isolated line at its Doppler width, which decides the route', () => {
    // One Doppler line of area S: peak τ = S·√(ln2/π)/α (Gaussian of HWHM α, area 1: peak √(ln2/π)/α;
    // Thorne, Spectrophysics, 2nd ed. (1988) ch. 12, from memory). The estimate bins lines one FWHM wide
    // and takes the fullest bin times 0.9394/FWHM (= √(ln2/π)/α): for one line, exactly that peak.
    const nu0 = 1000;
    const alpha = lineShapeDopplerHwhm(nu0, 296, 50);
    const x = grid(998, 1002, 0.01);
    const exact = (S: number) => (S * Math.sqrt(Math.LN2 / Math.PI)) / alpha;
    for (const S of [1e-6, 1e-3, 0.1]) {
      const r = instrumentSpectrum(lineSet([nu0], [1]), x, { opdCm: 1, temperatureK: 296, massAmu: 50, opticalDepthScale: S });
      expect(r.peakDepth / exact(S) - 1).toBeCloseTo(0, 3);
      expect(r.route).toBe(r.peakDepth < LINEAR_ROUTE_MAX_DEPTH ? 'linear' : 'transmittance');
    }
  });

  it('preserves the equivalent width of a saturated line (transmittance route) and not its area', () => {
    // One Doppler line with peak optical depth τ0 = 20: the instrument keeps ∫(1 − T) dν, the
    // equivalent width W = ∫(1 − exp(−τ0 e^{−ln2 ν²/α²})) dν (curve of growth, e.g. Thorne, Spectrophysics,
    // 2nd ed. (1988) ch. 12, from memory), computed here by direct quadrature; W ≪ ∫τ = S.
    // Tolerance 1 % of W (internal grid and the ±12/L cut of the sinc² wings of 1 − T).
    const nu0 = 1000;
    const T = 296;
    const m = 30;
    const alpha = lineShapeDopplerHwhm(nu0, T, m);
    const tau0 = 20;
    const S = (tau0 * alpha) / Math.sqrt(Math.LN2 / Math.PI); // area of a Gaussian with that peak
    let W = 0;
    const h = alpha / 200;
    for (let v = -20 * alpha; v <= 20 * alpha; v += h) W += (1 - Math.exp(-tau0 * Math.exp((-Math.LN2 * v * v) / (alpha * alpha)))) * h;
    const x = grid(nu0 - 12, nu0 + 12, 0.005);
    const exact = instrumentSpectrum(lineSet([nu0], [1]), x, {
      opdCm: 1,
      apodization: 'triangular',
      temperatureK: T,
      massAmu: m,
      opticalDepthScale: S,
    });
    expect(exact.route).toBe('transmittance');
    let w = 0;
    for (let i = 0; i < x.length; i++) w += (1 - Math.exp(-exact.opticalDepth[i])) * 0.005;
    expect(Math.abs(w - W)).toBeLessThan(0.01 * W);
    // The linear route (wrong for this line) would keep the area S instead: much larger here.
    const linear = instrumentSpectrum(lineSet([nu0], [1]), x, {
      opdCm: 1,
      apodization: 'triangular',
      temperatureK: T,
      massAmu: m,
      opticalDepthScale: S,
      route: 'linear',
    });
    let area = 0;
    for (let i = 0; i < x.length; i++) area += linear.opticalDepth[i] * 0.005;
    expect(Math.abs(area - S)).toBeLessThan(0.01 * S);
    expect(S / W).toBeGreaterThan(3);
    const peakExact = Math.max(...exact.opticalDepth);
    const peakLinear = Math.max(...linear.opticalDepth);
    expect(peakLinear / peakExact).toBeGreaterThan(3);
  });

  it('agrees between the two routes for weak lines', () => {
    // e^{−τ} ≈ 1 − τ for τ ≪ 1: with peak τ ≈ 0.005 the routes differ by ~τ/2 relative (tolerance 1 %).
    const lines = lineSet([1000, 1000.3, 1001.1], [1, 0.7, 0.4]);
    const x = grid(998, 1003, 0.01);
    const alpha = lineShapeDopplerHwhm(1000, 296, 50);
    const scale = (0.005 * alpha) / Math.sqrt(Math.LN2 / Math.PI);
    const base = { opdCm: 2, apodization: 'norton-beer-weak' as const, temperatureK: 296, massAmu: 50, opticalDepthScale: scale };
    const a = instrumentSpectrum(lines, x, { ...base, route: 'linear' });
    const b = instrumentSpectrum(lines, x, { ...base, route: 'transmittance' });
    const peak = Math.max(...a.opticalDepth);
    for (let i = 0; i < x.length; i++) expect(Math.abs(a.opticalDepth[i] - b.opticalDepth[i])).toBeLessThan(0.01 * peak);
  });
});
