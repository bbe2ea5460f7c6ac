/**
 * Area-normalised line profiles on a wavenumber offset: each integrates to 1 over cm^-1, so a
 * profile value is in cm (1/cm^-1). Widths are half widths at half maximum (HWHM) in cm^-1 unless
 * a name says FWHM.
 */
import { ATOMIC_MASS_KG, BOLTZMANN_J_PER_K, SPEED_OF_LIGHT_M_PER_S } from './constants';
import { faddeevaRe } from './faddeeva';

const LN2 = Math.LN2;
const SQRT_LN2 = Math.sqrt(Math.LN2);
const SQRT_LN2_OVER_PI = Math.sqrt(Math.LN2 / Math.PI);
const INV_SQRT_PI = 1 / Math.sqrt(Math.PI);

function checkWidth(fn: string, name: string, value: number, allowZero: boolean): void {
  if (!Number.isFinite(value) || value < 0 || (!allowZero && value === 0)) {
    throw new RangeError(`${fn}: ${name} must be finite and ${allowZero ? '>= 0' : '> 0'}, got ${value}`);
  }
}

function checkOffset(fn: string, dxCm1: number): void {
  if (Number.isNaN(dxCm1)) throw new RangeError(`${fn}: dxCm1 must be a number, got NaN`);
}

/**
 * Area-normalised Gaussian G(Δν) = √(ln2/π)/α · exp(−ln2 Δν²/α²).
 * Source: standard Doppler profile, e.g. W. Demtröder, Laser Spectroscopy (Springer), ch. 3 (Doppler
 * broadening), written with the HWHM α.
 * @param dxCm1 offset from the line centre, cm^-1
 * @param hwhmCm1 half width at half maximum α, cm^-1 (> 0)
 * @returns profile value, cm (integrates to 1 over cm^-1)
 */
export function lineShapeGaussian(dxCm1: number, hwhmCm1: number): number {
  checkOffset('lineShapeGaussian', dxCm1);
  checkWidth('lineShapeGaussian', 'hwhmCm1', hwhmCm1, false);
  const r = dxCm1 / hwhmCm1;
  return (SQRT_LN2_OVER_PI / hwhmCm1) * Math.exp(-LN2 * r * r);
}

/**
 * Area-normalised Lorentzian L(Δν) = (γ/π) / (Δν² + γ²).
 * Source: standard pressure/lifetime profile, e.g. W. Demtröder, Laser Spectroscopy (Springer), ch. 3.
 * @param dxCm1 offset from the line centre, cm^-1
 * @param hwhmCm1 half width at half maximum γ, cm^-1 (> 0)
 * @returns profile value, cm (integrates to 1 over cm^-1)
 */
export function lineShapeLorentzian(dxCm1: number, hwhmCm1: number): number {
  checkOffset('lineShapeLorentzian', dxCm1);
  checkWidth('lineShapeLorentzian', 'hwhmCm1', hwhmCm1, false);
  return hwhmCm1 / Math.PI / (dxCm1 * dxCm1 + hwhmCm1 * hwhmCm1);
}

/**
 * Area-normalised Voigt profile, the convolution of a Gaussian (HWHM α) and a Lorentzian (HWHM γ):
 * V(Δν) = √(ln2/π)/α · K(x, y), x = √ln2 Δν/α, y = √ln2 γ/α, K = Re w (Faddeeva function).
 * Falls back to the exact Lorentzian when α = 0 and to the exact Gaussian when γ = 0.
 * Source: B. H. Armstrong, J. Quant. Spectrosc. Radiat. Transfer 7, 61 (1967), eqs. (1)–(4) (numbers from memory);
 * w(z) by Weideman (1994), see faddeeva.ts.
 * @param dxCm1 offset from the line centre, cm^-1
 * @param gaussHwhmCm1 Gaussian (Doppler) HWHM α, cm^-1 (≥ 0)
 * @param lorentzHwhmCm1 Lorentzian HWHM γ, cm^-1 (≥ 0; not both zero)
 * @returns profile value, cm (integrates to 1 over cm^-1)
 */
export function lineShapeVoigt(dxCm1: number, gaussHwhmCm1: number, lorentzHwhmCm1: number): number {
  checkOffset('lineShapeVoigt', dxCm1);
  checkWidth('lineShapeVoigt', 'gaussHwhmCm1', gaussHwhmCm1, true);
  checkWidth('lineShapeVoigt', 'lorentzHwhmCm1', lorentzHwhmCm1, true);
  if (gaussHwhmCm1 === 0) {
    if (lorentzHwhmCm1 === 0) {
      throw new RangeError('lineShapeVoigt: gaussHwhmCm1 and lorentzHwhmCm1 are both 0 (a delta function)');
    }
    return lorentzHwhmCm1 / Math.PI / (dxCm1 * dxCm1 + lorentzHwhmCm1 * lorentzHwhmCm1);
  }
  if (!Number.isFinite(dxCm1)) return 0;
  if (lorentzHwhmCm1 === 0) {
    const r = dxCm1 / gaussHwhmCm1;
    return (SQRT_LN2_OVER_PI / gaussHwhmCm1) * Math.exp(-LN2 * r * r);
  }
  const x = (SQRT_LN2 * dxCm1) / gaussHwhmCm1;
  const y = (SQRT_LN2 * lorentzHwhmCm1) / gaussHwhmCm1;
  return ((SQRT_LN2 * INV_SQRT_PI) / gaussHwhmCm1) * faddeevaRe(x, y);
}

/**
 * Doppler (Gaussian) HWHM of a line: α_D = ν/c · √(2 ln2 k T / m).
 * Equivalent to the handbook FWHM 7.16e-7 · ν · √(T/M) with M in amu.
 * Source: W. Demtröder, Laser Spectroscopy (Springer), Doppler width of a thermal gas (ch. 3);
 * constants CODATA 2018 (constants.ts).
 * @param nuCm1 line position, cm^-1 (its absolute value is used)
 * @param temperatureK translational temperature, K (≥ 0)
 * @param massAmu molecular mass, amu (> 0; Infinity gives 0)
 * @returns Doppler HWHM, cm^-1
 */
export function lineShapeDopplerHwhm(nuCm1: number, temperatureK: number, massAmu: number): number {
  if (!Number.isFinite(nuCm1)) throw new RangeError(`lineShapeDopplerHwhm: nuCm1 must be finite, got ${nuCm1}`);
  if (!Number.isFinite(temperatureK) || temperatureK < 0) {
    throw new RangeError(`lineShapeDopplerHwhm: temperatureK must be finite and >= 0, got ${temperatureK}`);
  }
  if (!(massAmu > 0)) throw new RangeError(`lineShapeDopplerHwhm: massAmu must be > 0, got ${massAmu}`);
  return (Math.abs(nuCm1) / SPEED_OF_LIGHT_M_PER_S) * Math.sqrt((2 * LN2 * BOLTZMANN_J_PER_K * temperatureK) / (massAmu * ATOMIC_MASS_KG));
}

/**
 * Approximate FWHM of a Voigt profile from the FWHMs of its Lorentzian and Gaussian parts:
 * f_V ≈ 0.5346 f_L + √(0.2166 f_L² + f_G²), stated accurate to 0.02 %.
 * Source: J. J. Olivero and R. L. Longbothum, J. Quant. Spectrosc. Radiat. Transfer 17, 233 (1977).
 * The same relation holds for HWHMs (it is homogeneous of degree 1).
 * @param fwhmLorentz Lorentzian FWHM, cm^-1 (≥ 0)
 * @param fwhmGauss Gaussian FWHM, cm^-1 (≥ 0)
 * @returns Voigt FWHM, cm^-1
 */
export function lineShapeVoigtFwhm(fwhmLorentz: number, fwhmGauss: number): number {
  checkWidth('lineShapeVoigtFwhm', 'fwhmLorentz', fwhmLorentz, true);
  checkWidth('lineShapeVoigtFwhm', 'fwhmGauss', fwhmGauss, true);
  return 0.5346 * fwhmLorentz + Math.sqrt(0.2166 * fwhmLorentz * fwhmLorentz + fwhmGauss * fwhmGauss);
}
