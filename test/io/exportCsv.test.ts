import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { simulatedLinesCsv, spectrumCsv, SIMULATED_LINES_COLUMNS } from '../../src/io/exportCsv';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';

const model: BandModel = {
  shape: 'oblate',
  band: 'perpendicular',
  lower: stateConstantsFrom({ B: 0.4, C: 0.2 }),
  upper: stateConstantsFrom({ origin: 700, B: 0.399, C: 0.199, zeta: -0.3 }),
  temperatureK: 250,
  jMax: 8,
  kMax: 3,
  spinWeights: [1, 1, 2],
};

describe('simulatedLinesCsv', () => {
  it('writes every line once, ascending, and papaparse reads back the same numbers', () => {
    const lines = bandLines(model);
    const csv = simulatedLinesCsv(lines, 'oblate');
    // Ref: papaparse (general-purpose CSV parser) as the independent reader.
    const parsed = Papa.parse<Record<string, number | string>>(csv.trim(), { header: true, dynamicTyping: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.meta.fields).toEqual([...SIMULATED_LINES_COLUMNS]);
    expect(parsed.data.length).toBe(lines.count);
    const byQ = new Map<string, number>();
    for (let i = 0; i < lines.count; i++) byQ.set(`${lines.jUpper[i]},${lines.kUpper[i]},${lines.jLower[i]},${lines.kLower[i]}`, i);
    let prev = -Infinity;
    for (const row of parsed.data) {
      const i = byQ.get(`${row.J_up},${row.K_up},${row.J_lo},${row.K_lo}`)!;
      expect(i).toBeDefined();
      // Shortest round-trip decimal (ECMA-262 Number::toString) reads back exactly.
      expect(row['wavenumber_cm-1']).toBe(lines.wavenumberCm1[i]);
      expect(row.intensity_rel).toBe(lines.intensity[i]);
      expect(row.wavenumber_cm1 ?? row['wavenumber_cm-1']).toBeGreaterThanOrEqual(prev);
      prev = row['wavenumber_cm-1'] as number;
    }
  });
  it('writes only the header for an empty list', () => {
    const empty = bandLines({ ...model, spinWeights: [0] });
    expect(simulatedLinesCsv(empty, 'oblate')).toBe(SIMULATED_LINES_COLUMNS.join(',') + '\n');
  });
});

describe('spectrumCsv', () => {
  it('writes x and named columns exactly', () => {
    const x = Float64Array.of(1000, 1000.1, 1000.2);
    const csv = spectrumCsv(x, { absorbance_sim: [0.1, 1 / 3, 2e-17] });
    const parsed = Papa.parse<number[]>(csv.trim(), { dynamicTyping: true });
    expect(parsed.data[0]).toEqual(['wavenumber_cm-1', 'absorbance_sim']);
    expect(parsed.data.slice(1)).toEqual([
      [1000, 0.1],
      [1000.1, 1 / 3],
      [1000.2, 2e-17],
    ]);
  });
  it('refuses a column of the wrong length or a name with a comma, naming it', () => {
    expect(() => spectrumCsv(Float64Array.of(1, 2), { a: [1] })).toThrow(/column 'a' has 1 values, expected 2/);
    expect(() => spectrumCsv(Float64Array.of(1), { 'a,b': [1] })).toThrow(/spectrumCsv: column name/);
  });
});
