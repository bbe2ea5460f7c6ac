import { describe, expect, it } from 'vitest';
import { sortedLowerBound, traceDecimate } from '../../src/ui/plot/traceDecimate';

/** Mulberry32, seeded (T. Ettinger's public-domain generator, from memory). */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function series(n: number, seed: number) {
  const r = rng(seed);
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  let v = 0;
  for (let i = 0; i < n; i++) {
    x[i] = 1000 + i * 0.002 + r() * 0.0005;
    v += r() - 0.5;
    y[i] = v + (r() < 0.001 ? 20 : 0); // random walk with rare spikes (narrow lines)
  }
  return { x, y };
}

describe('sortedLowerBound', () => {
  it('returns 0 for an empty array and the insertion point otherwise', () => {
    expect(sortedLowerBound([], 3)).toBe(0);
    expect(sortedLowerBound([1, 2, 2, 5], 2)).toBe(1);
    expect(sortedLowerBound([1, 2, 2, 5], 6)).toBe(4);
    expect(sortedLowerBound([1, 2, 2, 5], 0)).toBe(0);
  });
});

describe('traceDecimate', () => {
  it('refuses mismatched columns, an empty range and a bad column count, naming the function', () => {
    expect(() => traceDecimate([1, 2], [1], 0, 1, 10)).toThrow(/traceDecimate: x and y differ/);
    expect(() => traceDecimate([1, 2], [1, 2], 1, 1, 10)).toThrow(/toCm1 must exceed fromCm1/);
    expect(() => traceDecimate([1, 2], [1, 2], 0, 1, 0)).toThrow(/columns/);
  });

  it('returns nothing for an empty trace and every sample when they are few', () => {
    expect(traceDecimate([], [], 0, 1, 100).x.length).toBe(0);
    const d = traceDecimate([1, 2, 3], [5, 6, 7], 0, 10, 100);
    expect(Array.from(d.x)).toEqual([1, 2, 3]);
    expect(d.isDecimated).toBe(false);
  });

  it('keeps one sample beyond each edge so the line runs off the plot', () => {
    const x = Float64Array.from({ length: 1000 }, (_, i) => i);
    const y = Float64Array.from({ length: 1000 }, (_, i) => Math.sin(i));
    const d = traceDecimate(x, y, 100.5, 899.5, 50);
    expect(d.x[0]).toBe(100);
    expect(d.x[d.x.length - 1]).toBe(900);
  });

  it('keeps every column extremum of a 1,000,000-point series in at most 2 points per column', () => {
    // Definition of min/max decimation (Jugel et al., PVLDB 7 (2014) 797): the drawn envelope
    // per pixel column equals that of the full series. Checked against a brute-force pass.
    const { x, y } = series(1_000_000, 7);
    const from = 1200;
    const to = 2800;
    const columns = 800;
    const d = traceDecimate(x, y, from, to, columns);
    expect(d.isDecimated).toBe(true);
    expect(d.x.length).toBeLessThanOrEqual(2 * columns + 2);
    const width = (to - from) / columns;
    const lo = new Float64Array(columns).fill(Infinity);
    const hi = new Float64Array(columns).fill(-Infinity);
    for (let i = 0; i < x.length; i++) {
      if (x[i] < from || x[i] >= to) continue;
      const c = Math.min(Math.floor((x[i] - from) / width), columns - 1);
      lo[c] = Math.min(lo[c], y[i]);
      hi[c] = Math.max(hi[c], y[i]);
    }
    const dlo = new Float64Array(columns).fill(Infinity);
    const dhi = new Float64Array(columns).fill(-Infinity);
    for (let k = 0; k < d.x.length; k++) {
      if (d.x[k] < from || d.x[k] >= to) continue;
      const c = Math.min(Math.floor((d.x[k] - from) / width), columns - 1);
      dlo[c] = Math.min(dlo[c], d.y[k]);
      dhi[c] = Math.max(dhi[c], d.y[k]);
    }
    // Exact equality: the kept samples are the original values, no arithmetic on them.
    expect(Array.from(dlo)).toEqual(Array.from(lo));
    expect(Array.from(dhi)).toEqual(Array.from(hi));
    for (let k = 1; k < d.x.length; k++) expect(d.x[k]).toBeGreaterThan(d.x[k - 1]);
  });

  it('applies a monotone transform to the kept values (absorbance to transmittance)', () => {
    const { x, y } = series(20_000, 3);
    const a = y.map((v) => Math.abs(v) / 10);
    const plain = traceDecimate(x, a, 1001, 1030, 100);
    const t = traceDecimate(x, a, 1001, 1030, 100, (v) => 10 ** -v);
    expect(Array.from(t.x)).toEqual(Array.from(plain.x));
    // T = 10^-A (Beer–Lambert with decadic absorbance); round-off only.
    plain.y.forEach((v, k) => expect(t.y[k]).toBeCloseTo(10 ** -v, 15));
  });

  it('skips non-finite values', () => {
    const x = Float64Array.from({ length: 10 }, (_, i) => i);
    const y = Float64Array.from([1, NaN, 3, Infinity, 5, 6, 7, 8, 9, 10]);
    const d = traceDecimate(x, y, 0, 9, 100);
    expect(Array.from(d.y).every(Number.isFinite)).toBe(true);
    expect(d.x.length).toBe(8);
  });
});
