/**
 * Physical constants, CODATA 2018 recommended values (exact where the 2019 SI fixes them).
 * Source: E. Tiesinga et al., "CODATA recommended values of the fundamental physical constants: 2018",
 * Rev. Mod. Phys. 93, 025010 (2021).
 */

/** Speed of light in vacuum, m s^-1 (exact). */
export const SPEED_OF_LIGHT_M_PER_S = 299_792_458;
/** Speed of light in vacuum, cm s^-1 (exact). */
export const SPEED_OF_LIGHT_CM_PER_S = 29_979_245_800;
/** Planck constant, J s (exact). */
export const PLANCK_J_S = 6.626_070_15e-34;
/** Boltzmann constant, J K^-1 (exact). */
export const BOLTZMANN_J_PER_K = 1.380_649e-23;
/** Atomic mass constant m_u, kg (CODATA 2018: 1.660 539 066 60(50) e-27). */
export const ATOMIC_MASS_KG = 1.660_539_066_6e-27;
/** Second radiation constant c2 = hc/k, cm K (CODATA 2018: 1.438 776 877... e-2 m K). */
export const SECOND_RADIATION_CM_K = 1.438_776_877;
/** MHz per cm^-1: c in cm/s divided by 1e6. */
export const MHZ_PER_CM1 = SPEED_OF_LIGHT_CM_PER_S / 1e6;

/** Convert a frequency in MHz to a wavenumber in cm^-1. */
export function mhzToWavenumber(frequencyMhz: number): number {
  return frequencyMhz / MHZ_PER_CM1;
}

/** Convert a wavenumber in cm^-1 to a frequency in MHz. */
export function wavenumberToMhz(wavenumberCm1: number): number {
  return wavenumberCm1 * MHZ_PER_CM1;
}
