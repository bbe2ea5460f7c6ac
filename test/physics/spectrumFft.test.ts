import { describe, expect, it } from 'vitest';
import { spectrumFftComplex, spectrumFftReal, spectrumFftRealInverse, spectrumFftTwiddles } from '../../src/physics/spectrumFft';

/** Seeded LCG (Numerical Recipes "quick and dirty" constants), values in [−0.5, 0.5). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296 - 0.5;
  };
}

/** Direct DFT X[k] = Σ x[j] e^{−2πi kj/N} (the definition), angle reduced mod N for accuracy. */
function dft(re: Float64Array, im: Float64Array): [Float64Array, Float64Array] {
  const n = re.length;
  const Xr = new Float64Array(n);
  const Xi = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    for (let j = 0; j < n; j++) {
      const a = (-2 * Math.PI * ((k * j) % n)) / n;
      const c = Math.cos(a);
      const s = Math.sin(a);
      Xr[k] += re[j] * c - im[j] * s;
      Xi[k] += re[j] * s + im[j] * c;
    }
  }
  return [Xr, Xi];
}

describe('spectrumFftComplex', () => {
  it('leaves a single point unchanged', () => {
    const d = new Float64Array([0.3, -0.2]);
    spectrumFftComplex(d);
    expect(Array.from(d)).toEqual([0.3, -0.2]);
  });

  it('matches the direct DFT for lengths 2 … 256', () => {
    // Ref: DFT definition; Cooley & Tukey (1965). tol = 1e-13 (≈ N log N rounding on O(1) data).
    const rnd = lcg(1);
    for (let n = 2; n <= 256; n *= 2) {
      const re = new Float64Array(n).map(() => rnd());
      const im = new Float64Array(n).map(() => rnd());
      const d = new Float64Array(2 * n);
      for (let j = 0; j < n; j++) {
        d[2 * j] = re[j];
        d[2 * j + 1] = im[j];
      }
      spectrumFftComplex(d);
      const [Xr, Xi] = dft(re, im);
      for (let k = 0; k < n; k++) {
        expect(Math.abs(d[2 * k] - Xr[k])).toBeLessThan(1e-13);
        expect(Math.abs(d[2 * k + 1] - Xi[k])).toBeLessThan(1e-13);
      }
      spectrumFftComplex(d, true);
      for (let j = 0; j < n; j++) {
        expect(Math.abs(d[2 * j] - re[j])).toBeLessThan(1e-15);
        expect(Math.abs(d[2 * j + 1] - im[j])).toBeLessThan(1e-15);
      }
    }
  });

  it("satisfies Parseval's theorem for 2^14 points", () => {
    // Ref: Σ|x|² = (1/N) Σ|X|² (Parseval). rel. tol = 1e-13.
    const rnd = lcg(3);
    const n = 1 << 14;
    const d = new Float64Array(2 * n).map(() => rnd());
    const e0 = d.reduce((s, v) => s + v * v, 0);
    spectrumFftComplex(d);
    const e1 = d.reduce((s, v) => s + v * v, 0) / n;
    expect(Math.abs(e1 / e0 - 1)).toBeLessThan(1e-13);
  });

  it('rejects a length that is not a power of two', () => {
    expect(() => spectrumFftComplex(new Float64Array(6))).toThrow(/spectrumFftComplex: complex length must be a power of two >= 1, got 3/);
  });
});

describe('spectrumFftReal', () => {
  it('matches the direct DFT of a real sequence in the packed layout and inverts', () => {
    // Ref: DFT definition; packing of Press et al., Numerical Recipes 3rd ed. §12.3.2. tol 1e-13.
    const rnd = lcg(5);
    for (let n = 2; n <= 512; n *= 2) {
      const x = new Float64Array(n).map(() => rnd());
      const [Xr, Xi] = dft(x, new Float64Array(n));
      const p = x.slice();
      spectrumFftReal(p);
      expect(Math.abs(p[0] - Xr[0])).toBeLessThan(1e-13);
      expect(Math.abs(p[1] - Xr[n / 2])).toBeLessThan(1e-13);
      for (let k = 1; k < n / 2; k++) {
        expect(Math.abs(p[2 * k] - Xr[k])).toBeLessThan(1e-13);
        expect(Math.abs(p[2 * k + 1] - Xi[k])).toBeLessThan(1e-13);
      }
      spectrumFftRealInverse(p);
      for (let j = 0; j < n; j++) expect(Math.abs(p[j] - x[j])).toBeLessThan(1e-15);
    }
  });

  it('turns a product of spectra into a circular convolution', () => {
    // Ref: convolution theorem; direct circular sum as the reference. tol 1e-13.
    const rnd = lcg(8);
    const n = 128;
    const a = new Float64Array(n).map(() => rnd());
    const b = new Float64Array(n).map(() => rnd());
    const direct = new Float64Array(n);
    for (let k = 0; k < n; k++) for (let j = 0; j < n; j++) direct[k] += a[j] * b[(k - j + n) % n];
    const tw = spectrumFftTwiddles(n);
    const A = a.slice();
    const B = b.slice();
    spectrumFftReal(A, tw);
    spectrumFftReal(B, tw);
    A[0] *= B[0];
    A[1] *= B[1];
    for (let k = 2; k < n; k += 2) {
      const re = A[k] * B[k] - A[k + 1] * B[k + 1];
      const im = A[k] * B[k + 1] + A[k + 1] * B[k];
      A[k] = re;
      A[k + 1] = im;
    }
    spectrumFftRealInverse(A, tw);
    for (let k = 0; k < n; k++) expect(Math.abs(A[k] - direct[k])).toBeLessThan(1e-13);
  });

  it('rejects a twiddle table made for another length', () => {
    expect(() => spectrumFftReal(new Float64Array(16), spectrumFftTwiddles(8))).toThrow(
      /spectrumFftReal: twiddle table is for length 8, data 16/,
    );
  });
});

describe('spectrumFftTwiddles', () => {
  it('holds e^{−2πik/N} for every k < N/2', () => {
    // Ref: definition; octant symmetry must reproduce Math.cos/Math.sin to rounding. tol 1e-15.
    for (const n of [2, 4, 8, 64, 1024]) {
      const w = spectrumFftTwiddles(n);
      for (let k = 0; k < n / 2; k++) {
        expect(Math.abs(w[2 * k] - Math.cos((2 * Math.PI * k) / n))).toBeLessThan(1e-15);
        expect(Math.abs(w[2 * k + 1] + Math.sin((2 * Math.PI * k) / n))).toBeLessThan(1e-15);
      }
    }
  });
});
