import { describe, expect, it } from 'vitest';
import { faddeeva, faddeevaRe } from '../../src/physics/faddeeva';

// References (A&S = M. Abramowitz and I. A. Stegun, Handbook of Mathematical Functions, NBS 1964):
// values recalled from memory are marked so; each was re-checked against mpmath 1.3.0 at 30 digits.

/** Seeded LCG (Numerical Recipes "quick and dirty" constants), values in [0, 1). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

type C = [number, number];
const cAdd = (a: C, b: C): C => [a[0] + b[0], a[1] + b[1]];
const cMul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const cDiv = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
};

/** Power series w(z) = Σ_n (iz)^n / Γ(n/2 + 1), A&S eq. 7.1.8. */
function wTaylor(x: number, y: number): C {
  const iz: C = [-y, x];
  let p: C = [1, 0];
  let s: C = [0, 0];
  // g[n] = Γ(n/2 + 1): g[0] = 1, g[1] = √π/2, g[n] = g[n−2]·n/2.
  const g = [1, Math.sqrt(Math.PI) / 2];
  for (let n = 2; n < 140; n++) g.push(g[n - 2] * (n / 2));
  for (let n = 0; n < 140; n++) {
    s = cAdd(s, [p[0] / g[n], p[1] / g[n]]);
    p = cMul(p, iz);
  }
  return s;
}

/**
 * Laplace continued fraction e^{u²} erfc(u) = (1/√π) / (u + (1/2)/(u + 1/(u + (3/2)/(u + …)))),
 * Re u > 0, A&S eq. 7.1.14 (equation number from memory); w(z) is this at u = −iz.
 */
function wContinuedFraction(x: number, y: number, terms: number): C {
  const u: C = [y, -x];
  let t: C = u;
  for (let k = terms; k >= 1; k--) t = cAdd(u, cDiv([k / 2, 0], t));
  return cDiv([1 / Math.sqrt(Math.PI), 0], t);
}

/**
 * Adaptive Simpson quadrature (Lyness 1969 stopping rule |S2 − S1| ≤ 15 ε, Richardson-corrected).
 * Throws instead of hanging if ε is out of reach (more than 4e6 evaluations).
 */
function integrate(f: (t: number) => number, a: number, b: number, eps: number): number {
  let evaluations = 0;
  const fe = (t: number) => {
    if (++evaluations > 4e6) throw new Error(`integrate: tolerance ${eps} not reached`);
    return f(t);
  };
  const simpson = (fa: number, fm: number, fb: number, h: number) => ((fa + 4 * fm + fb) * h) / 6;
  const rec = (a0: number, b0: number, fa: number, fm: number, fb: number, whole: number, e: number): number => {
    const m = 0.5 * (a0 + b0);
    const flm = fe(0.5 * (a0 + m));
    const frm = fe(0.5 * (m + b0));
    const left = simpson(fa, flm, fm, m - a0);
    const right = simpson(fm, frm, fb, b0 - m);
    if (Math.abs(left + right - whole) <= 15 * e) return left + right + (left + right - whole) / 15;
    return rec(a0, m, fa, flm, fm, left, e / 2) + rec(m, b0, fm, frm, fb, right, e / 2);
  };
  const fa = fe(a);
  const fb = fe(b);
  const fm = fe(0.5 * (a + b));
  return rec(a, b, fa, fm, fb, simpson(fa, fm, fb, b - a), eps);
}

describe('faddeeva', () => {
  it('is 1 at the origin', () => {
    // Ref: w(0) = erfc(0) = 1, A&S eq. 7.1.3; tol = 5e-14 (method accuracy 4e-14, faddeeva.ts).
    const w = faddeeva(0, 0);
    expect(Math.abs(w.re - 1)).toBeLessThan(5e-14);
    expect(Math.abs(w.im)).toBeLessThan(5e-14);
  });

  it('equals exp(y²) erfc(y) on the imaginary axis', () => {
    // Ref: A&S Table 7.1, erfc(0.5) = 0.4795001222, erfc(1) = 0.1572992071, erfc(2) = 0.004677734981
    // (10 decimals, from memory); w(iy) = e^{y²} erfc(y) by A&S eq. 7.1.3. tol = 1e-10 (table digits).
    for (const [y, erfc] of [
      [0.5, 0.4795001222],
      [1, 0.1572992071],
      [2, 0.004677734981],
    ]) {
      const w = faddeeva(0, y);
      expect(Math.abs(w.re - Math.exp(y * y) * erfc)).toBeLessThan(1e-10 * Math.exp(y * y));
      expect(Math.abs(w.im)).toBeLessThan(1e-14);
    }
  });

  it('has Re w = exp(−x²) and Im w = (2/√π)·Dawson(x) on the real axis', () => {
    // Ref: Dawson's integral F(x), A&S Table 7.5: F(0.5) = 0.4244363835, F(1) = 0.5380795069,
    // F(2) = 0.3013403889, F(5) = 0.1021340744 (from memory); w(x) = e^{−x²} + (2i/√π) F(x),
    // A&S §7.1 (from memory). tol = 1.2e-10 (table digits) for Im, 5e-14 for Re (method accuracy).
    for (const [x, F] of [
      [0.5, 0.4244363835],
      [1, 0.5380795069],
      [2, 0.3013403889],
      [5, 0.1021340744],
    ]) {
      const w = faddeeva(x, 0);
      expect(Math.abs(w.re - Math.exp(-x * x))).toBeLessThan(5e-14);
      expect(Math.abs(w.im - (2 / Math.sqrt(Math.PI)) * F)).toBeLessThan(1.2e-10);
    }
  });

  it('matches tabulated values of w(z) off the axes', () => {
    // Ref: A&S Table 7.9 (6 decimals, from memory; re-checked with mpmath): w(1+i) =
    // 0.304744 + 0.208219i, w(2+i) = 0.140240 + 0.222213i, w(1+2i) = 0.218493 + 0.092998i,
    // w(0.5+0.5i) = 0.533157 + 0.230488i. tol = 6e-7 (half a unit of the 6th decimal + rounding).
    for (const [x, y, re, im] of [
      [1, 1, 0.304744, 0.208219],
      [2, 1, 0.14024, 0.222213],
      [1, 2, 0.218493, 0.092998],
      [0.5, 0.5, 0.533157, 0.230488],
    ]) {
      const w = faddeeva(x, y);
      expect(Math.abs(w.re - re)).toBeLessThan(6e-7);
      expect(Math.abs(w.im - im)).toBeLessThan(6e-7);
    }
    // Ref: w(1+i) = 0.30474420525691259 + 0.20821893820283163i, the common 17-digit test value
    // (from memory; mpmath agrees). tol = 1e-13 (method accuracy 4e-14, see faddeeva.ts).
    const w = faddeeva(1, 1);
    expect(Math.abs(w.re - 0.30474420525691259)).toBeLessThan(1e-13);
    expect(Math.abs(w.im - 0.20821893820283163)).toBeLessThan(1e-13);
  });

  it('agrees with the power series A&S 7.1.8 for |z| ≤ 3', () => {
    // Independent algorithm. tol = 1e-12: the series loses ~e^{|z|²}·1e-16 ≈ 1e-12 to cancellation.
    const rnd = lcg(20240601);
    for (let n = 0; n < 300; n++) {
      const r = 3 * Math.sqrt(rnd());
      const phi = Math.PI * rnd();
      const x = r * Math.cos(phi);
      const y = r * Math.sin(phi);
      const w = faddeeva(x, y);
      const t = wTaylor(x, y);
      expect(Math.abs(w.re - t[0])).toBeLessThan(1e-12);
      expect(Math.abs(w.im - t[1])).toBeLessThan(1e-12);
    }
  });

  it('agrees with the Laplace continued fraction for |z| ≥ 6, y > 0', () => {
    // Independent algorithm (A&S 7.1.14, 200 levels, converged to < 1e-15 here). tol = 1e-13.
    const rnd = lcg(7);
    for (let n = 0; n < 300; n++) {
      const x = -60 + 120 * rnd();
      const y = 0.05 + 60 * rnd() * rnd();
      if (x * x + y * y < 36) continue;
      const w = faddeeva(x, y);
      const t = wContinuedFraction(x, y, 200);
      expect(Math.abs(w.re - t[0])).toBeLessThan(1e-13);
      expect(Math.abs(w.im - t[1])).toBeLessThan(1e-13);
    }
  });

  it('matches the integral representations of K = Re w and L = Im w', () => {
    // Ref: K(x,y) = (y/π) ∫ e^{−t²} / ((x−t)² + y²) dt and
    // L(x,y) = (1/π) ∫ e^{−t²}(x−t) / ((x−t)² + y²) dt,
    // y > 0, real and imaginary parts of w(z) = (i/π) ∫ e^{−t²}/(z − t) dt (A&S eq. 7.1.4, from memory).
    // Folded about t = x (s = |t − x|) so both integrands are smooth, then adaptive Simpson on
    // s ∈ [0, |x| + 10] (the rest is < e^{−100}). tol = 1e-9 (quadrature ε = 1e-12, far tighter than
    // the 1e-5-of-peak requirement of the Voigt profile).
    for (const [x, y] of [
      [0, 0.01],
      [0.3, 0.05],
      [1.7, 0.2],
      [-2.5, 1],
      [4, 0.5],
      [8, 3],
    ]) {
      const gp = (s: number) => Math.exp(-(x - s) * (x - s));
      const gm = (s: number) => Math.exp(-(x + s) * (x + s));
      const kI = (s: number) => ((y / Math.PI) * (gp(s) + gm(s))) / (s * s + y * y);
      const lI = (s: number) => ((gp(s) - gm(s)) * s) / Math.PI / (s * s + y * y);
      const R = Math.abs(x) + 10;
      const K = integrate(kI, 0, R, 1e-12);
      const L = integrate(lI, 0, R, 1e-12);
      const w = faddeeva(x, y);
      expect(Math.abs(w.re - K)).toBeLessThan(1e-9);
      expect(Math.abs(w.im - L)).toBeLessThan(1e-9);
    }
  });

  it('has the reflection symmetry w(−x + iy) = conj w(x + iy)', () => {
    // Ref: A&S eq. 7.1.12, w(−z̄) = conj w(z) (from memory). tol = 1e-15 (same arithmetic, sign flips).
    for (const [x, y] of [
      [0.7, 0.3],
      [12, 0.001],
      [300, 5],
    ]) {
      const a = faddeeva(x, y);
      const b = faddeeva(-x, y);
      expect(Math.abs(a.re - b.re)).toBeLessThan(1e-15);
      expect(Math.abs(a.im + b.im)).toBeLessThan(1e-15);
    }
  });

  it('follows the two-term asymptotic series far from the origin', () => {
    // Ref: w(z) ~ (i/√π)(1/z + 1/(2z³) + 3/(4z⁵) + …), A&S eq. 7.1.23, whose real part gives
    // K ≈ (1/√π)[y/r² + (3x²y − y³)/(2r⁶)], r² = x² + y². The first neglected term is smaller by
    // ~(15/4)/|z|⁴ ≤ 4e-16 at |z| ≥ 1e4. rel. tol = 1e-10: Weideman's series keeps ~12 significant
    // digits out here (cancellation between its two terms; measured 2.6e-12), i.e. an absolute
    // error of ~1e-20, against the 4e-14 absolute accuracy it is built for.
    for (const [x, y] of [
      [1e4, 1],
      [-3e4, 100],
      [5e3, 8e3],
    ]) {
      const r2 = x * x + y * y;
      const k = (y / r2 + (3 * x * x * y - y * y * y) / (2 * r2 * r2 * r2)) / Math.sqrt(Math.PI);
      expect(Math.abs(faddeevaRe(x, y) / k - 1)).toBeLessThan(1e-10);
    }
  });

  it('gives the same real part from the fast path', () => {
    // Same series, no checks: must agree to rounding. tol = 0 ulp difference expected, allow 1e-16.
    const rnd = lcg(99);
    const out = { re: 0, im: 0 };
    for (let n = 0; n < 200; n++) {
      const x = -50 + 100 * rnd();
      const y = 20 * rnd() * rnd();
      faddeeva(x, y, out);
      expect(Math.abs(faddeevaRe(x, y) - out.re)).toBeLessThanOrEqual(1e-16);
    }
  });

  it('rejects a lower-half-plane or non-finite argument with a named error', () => {
    expect(() => faddeeva(1, -0.1)).toThrow(/faddeeva: y must be finite and >= 0.*-0.1/);
    expect(() => faddeeva(Number.NaN, 1)).toThrow(/faddeeva: x must be finite, got NaN/);
    expect(() => faddeeva(1, Infinity)).toThrow(/faddeeva: y/);
  });
});
