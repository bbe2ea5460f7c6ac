import { describe, expect, it } from 'vitest';
import {
  unitsOrdinateFromLabel,
  unitsOrdinateFromValues,
  unitsTransmittanceScale,
  unitsValueStats,
  unitsXFromLabel,
} from '../../src/io/unitsDetect';

describe('unitsXFromLabel', () => {
  it('says nothing for a label without unit words', () => {
    expect(unitsXFromLabel('x')).toBeUndefined();
    expect(unitsXFromLabel('')).toBeUndefined();
  });
  it('recognises wavenumber spellings, including JCAMP 1/CM', () => {
    for (const s of ['wavenumber (cm-1)', 'Wavenumbers', 'cm^-1', 'CM-1', '1/CM', 'nu / cm⁻¹', 'cm**-1'])
      expect(unitsXFromLabel(s), s).toBe('cm-1');
  });
  it('recognises micrometre spellings', () => {
    for (const s of ['um', 'wavelength (um)', 'λ / µm', 'Wavelength [μm]', 'MICROMETERS', 'microns'])
      expect(unitsXFromLabel(s), s).toBe('um');
  });
  it('recognises nanometre spellings', () => {
    for (const s of ['nm', 'wavelength (nm)', 'NANOMETERS']) expect(unitsXFromLabel(s), s).toBe('nm');
  });
  it('flags a bare wavelength', () => {
    expect(unitsXFromLabel('Wavelength')).toBe('wavelength');
  });
});

describe('unitsOrdinateFromLabel', () => {
  it('recognises absorbance words, including log(1/T)', () => {
    for (const s of ['absorbance', 'ABSORBANCE', 'Abs', 'log(1/T)', 'absorbance (a.u.)'])
      expect(unitsOrdinateFromLabel(s), s).toBe('absorbance');
  });
  it('recognises percent transmittance', () => {
    for (const s of ['%T', 'T%', 'transmittance (%)', 'PERCENT TRANSMITTANCE', '% transmission'])
      expect(unitsOrdinateFromLabel(s), s).toBe('percent-transmittance');
  });
  it('leaves plain transmittance to the values', () => {
    for (const s of ['transmittance', 'TRANSMITTANCE', 'T']) expect(unitsOrdinateFromLabel(s), s).toBe('transmittance');
  });
  it('says nothing for unrelated words', () => {
    for (const s of ['intensity', 'signal', 'ARBITRARY UNITS', 'y']) expect(unitsOrdinateFromLabel(s), s).toBeUndefined();
  });
});

describe('unitsOrdinateFromValues', () => {
  // The rule is a heuristic (common practice): transmittance spectra have a high baseline with bands
  // dipping down; absorbance spectra a low baseline with bands rising.
  const band = (base: number, depth: number, n = 201) =>
    Float64Array.from({ length: n }, (_, i) => base + depth / (1 + ((i - 100) / 6) ** 2));

  it('takes a baseline near 1 with dips as transmittance', () => {
    expect(unitsOrdinateFromValues(unitsValueStats(band(0.98, -0.7))).ordinate).toBe('transmittance');
  });
  it('takes a baseline near 100 with dips as percent transmittance', () => {
    expect(unitsOrdinateFromValues(unitsValueStats(band(97, -60))).ordinate).toBe('percent-transmittance');
  });
  it('takes a low baseline with rising bands as absorbance', () => {
    expect(unitsOrdinateFromValues(unitsValueStats(band(0.02, 1.3))).ordinate).toBe('absorbance');
  });
  it('takes a high baseline with rising bands (all within [0, 1]) as absorbance, not transmittance', () => {
    expect(unitsOrdinateFromValues(unitsValueStats(band(0.6, 0.4))).ordinate).toBe('absorbance');
  });
  it('takes fewer than five values as absorbance whatever they look like', () => {
    expect(unitsOrdinateFromValues(unitsValueStats(Float64Array.from([0.98, 0.5, 0.97, 0.99]))).ordinate).toBe('absorbance');
    expect(unitsOrdinateFromValues(unitsValueStats(Float64Array.from([0.98, 0.5, 0.97, 0.99, 0.96]))).ordinate).toBe('transmittance');
  });
  it('ignores NaN and Infinity in the statistics', () => {
    const s = unitsValueStats(Float64Array.from([0.5, NaN, Infinity, 0.9, -Infinity, 0.7]));
    expect([s.min, s.max, s.count]).toEqual([0.5, 0.9, 3]);
  });
  it('chooses percent for a transmittance label only when values exceed 1.5', () => {
    expect(unitsTransmittanceScale(unitsValueStats(band(0.98, -0.7)))).toBe('transmittance');
    expect(unitsTransmittanceScale(unitsValueStats(band(97, -60)))).toBe('percent-transmittance');
  });
});
