/**
 * Abscissa and ordinate conversions used when importing traces.
 * WARNING: wavelengths are taken as vacuum wavelengths. An axis given as air wavelengths would need the
 * refractive index of air (about 1.00027 in the mid-IR), which the importer does not apply.
 */

/**
 * Vacuum wavenumber from a vacuum wavelength in micrometres.
 * @param lambdaUm wavelength, µm (> 0)
 * @returns wavenumber, cm^-1
 * Source: ν̃ = 1/λ (IUPAC Green Book, Cohen et al. 2007, §2.7); 1 cm = 1e4 µm.
 */
export function unitsUmToCm1(lambdaUm: number): number {
  return 1e4 / lambdaUm;
}

/**
 * Vacuum wavenumber from a vacuum wavelength in nanometres.
 * @param lambdaNm wavelength, nm (> 0)
 * @returns wavenumber, cm^-1
 * Source: ν̃ = 1/λ (IUPAC Green Book, Cohen et al. 2007, §2.7); 1 cm = 1e7 nm.
 */
export function unitsNmToCm1(lambdaNm: number): number {
  return 1e7 / lambdaNm;
}

/**
 * Absorbance (decadic) from a transmittance fraction.
 * @param transmittance T = I/I0, dimensionless (> 0)
 * @returns A = −log10 T, dimensionless
 * Source: Beer–Lambert decadic absorbance, IUPAC Gold Book "absorbance".
 */
export function unitsTransmittanceToAbsorbance(transmittance: number): number {
  return 0 - Math.log10(transmittance); // 0 − x, not −x: T = 1 gives +0, not −0
}

/**
 * Absorbance (decadic) from a percent transmittance.
 * @param percentT 100·I/I0, percent (> 0)
 * @returns A = 2 − log10(%T), dimensionless
 * Source: IUPAC Gold Book "absorbance"; %T = 100 T.
 */
export function unitsPercentTransmittanceToAbsorbance(percentT: number): number {
  return 0 - Math.log10(percentT / 100);
}

/**
 * Transmittance fraction from decadic absorbance (inverse of `unitsTransmittanceToAbsorbance`).
 * @param absorbance A, dimensionless
 * @returns T = 10^−A, dimensionless
 * Source: IUPAC Gold Book "absorbance".
 */
export function unitsAbsorbanceToTransmittance(absorbance: number): number {
  return Math.pow(10, -absorbance);
}
