import { describe, expect, it } from 'vitest';
import { traceAssemble, type TraceAssembleInput } from '../../src/io/traceAssemble';
import { TraceSkipLog } from '../../src/io/traceSkipLog';

const input = (x: number[], y: number[], o: Partial<TraceAssembleInput> = {}): TraceAssembleInput => ({
  x: Float64Array.from(x),
  y: Float64Array.from(y),
  lines: { firstLine: 1 },
  xUnit: 'cm-1',
  ordinate: 'absorbance',
  skipped: new TraceSkipLog(),
  nonFiniteReason: 'NaN/Infinity',
  ...o,
});
const run = (i: TraceAssembleInput) => {
  const r = traceAssemble(i);
  if (!r.ok) throw new Error(r.message);
  return r.value;
};

describe('traceAssemble', () => {
  it('refuses no points and a single point', () => {
    expect(traceAssemble(input([], []))).toEqual({ ok: false, message: 'no numeric data rows found' });
    expect(traceAssemble(input([1, NaN], [1, 2]))).toEqual({
      ok: false,
      message: 'only 1 usable data point (line 1); at least 2 are needed',
      line: 1,
    });
  });
  it('keeps an ascending axis as it is', () => {
    const v = run(input([1, 2, 3], [0.1, 0.2, 0.3]));
    expect([Array.from(v.trace.wavenumberCm1), Array.from(v.trace.absorbance), v.wasDescending]).toEqual([
      [1, 2, 3],
      [0.1, 0.2, 0.3],
      false,
    ]);
  });
  it('reverses a descending axis and says so', () => {
    const v = run(input([3, 2, 1], [0.3, 0.2, 0.1]));
    expect([Array.from(v.trace.wavenumberCm1), Array.from(v.trace.absorbance), v.wasDescending]).toEqual([
      [1, 2, 3],
      [0.1, 0.2, 0.3],
      true,
    ]);
  });
  it('sorts an unordered axis, naming the first reversal, and accepts uneven spacing', () => {
    const v = run(input([1, 2.5, 2, 7], [1, 2.5, 2, 7], { lines: Int32Array.from([10, 11, 12, 13]) }));
    expect(Array.from(v.trace.wavenumberCm1)).toEqual([1, 2, 2.5, 7]);
    expect(Array.from(v.trace.absorbance)).toEqual([1, 2, 2.5, 7]);
    expect(v.messages).toEqual(['the axis is not monotonic (first reversal at line 12); points were sorted by wavenumber']);
  });
  it('drops later duplicates of an abscissa, keeping the first in the file, for either direction', () => {
    const up = input([1, 2, 2, 3], [10, 20, 21, 30]);
    expect(Array.from(run(up).trace.absorbance)).toEqual([10, 20, 30]);
    expect(up.skipped.sortedLines()).toEqual([3]);
    const down = input([3, 2, 2, 1], [30, 20, 21, 10]);
    expect(Array.from(run(down).trace.absorbance)).toEqual([10, 20, 30]);
    expect(down.skipped.sortedLines()).toEqual([3]);
  });
  it('converts µm and nm to wavenumbers (ν̃ = 1e4/λ, 1e7/λ) and stores them ascending', () => {
    // Ref: ν̃ = 1/λ (IUPAC Green Book §2.7); exact quotients, so exact comparison.
    const um = run(input([2.5, 5, 10], [1, 2, 3], { xUnit: 'um' }));
    expect([Array.from(um.trace.wavenumberCm1), Array.from(um.trace.absorbance), um.wasDescending]).toEqual([
      [1000, 2000, 4000],
      [3, 2, 1],
      false,
    ]);
    const nm = run(input([5000, 2500, 2000], [1, 2, 3], { xUnit: 'nm' }));
    expect([Array.from(nm.trace.wavenumberCm1), Array.from(nm.trace.absorbance), nm.wasDescending]).toEqual([
      [2000, 4000, 5000],
      [1, 2, 3],
      true,
    ]);
  });
  it('skips non-positive wavelengths and non-finite values with their reasons', () => {
    const i = input([0, 2, -1, 4, 5], [1, Infinity, 1, 1, 1], { xUnit: 'um' });
    run(i);
    expect([i.skipped.sortedLines(), Object.fromEntries(i.skipped.byReason)]).toEqual([
      [1, 2, 3],
      { 'non-positive wavelength': 2, 'NaN/Infinity': 1 },
    ]);
  });
  it('converts transmittance and percent transmittance to absorbance (A = −log10 T)', () => {
    // Ref: IUPAC Gold Book "absorbance"; tolerance 1e-15 for log10 round-off.
    const t = run(input([1, 2, 3], [1, 0.1, 0.01], { ordinate: 'transmittance' })).trace.absorbance;
    const p = run(input([1, 2, 3], [100, 10, 1], { ordinate: 'percent-transmittance' })).trace.absorbance;
    for (const a of [t, p]) {
      expect(Object.is(a[0], 0)).toBe(true);
      expect(a[1]).toBeCloseTo(1, 15);
      expect(a[2]).toBeCloseTo(2, 15);
    }
  });
  it('clamps T ≤ 0 to the floor and names the count and lines', () => {
    const v = run(input([1, 2, 3, 4], [0.5, 0, -0.01, 0.9], { ordinate: 'transmittance' }));
    expect(v.trace.absorbance[1]).toBeCloseTo(6, 12);
    expect(v.trace.absorbance[2]).toBeCloseTo(6, 12);
    expect(v.messages).toEqual(['2 points with transmittance ≤ 0 clamped to T = 0.000001 (A = 6): lines 2, 3']);
  });
  it('clamps below the smallest measured T when that is under 1e-6', () => {
    const v = run(input([1, 2], [1e-8, 0], { ordinate: 'transmittance' }));
    expect(v.trace.absorbance[1]).toBeCloseTo(8, 12);
  });
});
