/**
 * Small radix-2 fast Fourier transforms for the tail convolution of spectrumSynthesize.
 * Convention: forward X[k] = Σ_n x[n] e^{−2πi kn/N}; the inverse carries the 1/N factor.
 * Complex data are interleaved [re0, im0, re1, im1, …]. Real transforms work in place in the
 * packed layout x[0] = Re X[0], x[1] = Re X[N/2], x[2k], x[2k+1] = Re, Im X[k] for 0 < k < N/2,
 * so a length-N real convolution needs only N doubles of data plus the twiddle table.
 * Source: J. W. Cooley and J. W. Tukey, Math. Comp. 19, 297 (1965) (iterative decimation in time
 * with bit reversal); real-input packing as in W. H. Press et al., Numerical Recipes, 3rd ed. (2007),
 * §12.3.2 ("FFT of a single real function").
 */

function checkPow2(fn: string, what: string, n: number): void {
  if (!Number.isInteger(n) || n < 1 || (n & (n - 1)) !== 0) {
    throw new RangeError(`${fn}: ${what} must be a power of two >= 1, got ${n}`);
  }
}

/**
 * Twiddle table e^{−2πik/N} for k = 0 … N/2 − 1, interleaved (cos, −sin), for transforms of real
 * length N (and complex length N/2 or less). Filled from one octant by symmetry, so only N/8 sines
 * and cosines are evaluated.
 * @param n real transform length N (power of two ≥ 2)
 * @returns Float64Array of length N
 */
export function spectrumFftTwiddles(n: number): Float64Array {
  checkPow2('spectrumFftTwiddles', 'n', n);
  if (n < 2) throw new RangeError(`spectrumFftTwiddles: n must be >= 2, got ${n}`);
  const half = n >> 1;
  const w = new Float64Array(n);
  const put = (k: number, c: number, s: number): void => {
    if (k < half) {
      w[2 * k] = c;
      w[2 * k + 1] = -s;
    }
  };
  const q = n >> 2;
  const e = n >> 3;
  for (let k = 0; k <= Math.max(e, 0); k++) {
    const a = (2 * Math.PI * k) / n;
    const c = Math.cos(a);
    const s = Math.sin(a);
    put(k, c, s);
    if (q > 0) put(q - k, s, c); // angle π/2 − a
    if (q > 0) put(q + k, -s, c); // angle π/2 + a
    put(half - k, -c, s); // angle π − a
  }
  if (n === 2) put(0, 1, 0);
  return w;
}

/**
 * In-place complex FFT of interleaved data of complex length L (a power of two).
 * Source: Cooley & Tukey (1965), radix-2 decimation in time.
 * @param data interleaved complex values, length 2L (overwritten with the transform)
 * @param inverse true for the inverse transform (includes the 1/L factor)
 * @param twiddles optional table from spectrumFftTwiddles(M) with M ≥ 2L (M a power of two)
 */
export function spectrumFftComplex(data: Float64Array, inverse = false, twiddles?: Float64Array): void {
  const n = data.length >> 1;
  if (data.length !== 2 * n) throw new RangeError(`spectrumFftComplex: data length must be even, got ${data.length}`);
  checkPow2('spectrumFftComplex', 'complex length', n);
  if (n === 1) return;
  const tw = twiddles ?? spectrumFftTwiddles(2 * n);
  const twN = tw.length; // = M, table holds e^{−2πik/M}, k < M/2
  if (twN < 2 * n || (twN & (twN - 1)) !== 0) {
    throw new RangeError(`spectrumFftComplex: twiddle table for length ${twN} is too short for ${n} points`);
  }
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      const a = 2 * i;
      const b = 2 * j;
      let t = data[a];
      data[a] = data[b];
      data[b] = t;
      t = data[a + 1];
      data[a + 1] = data[b + 1];
      data[b + 1] = t;
    }
  }
  const sign = inverse ? -1 : 1;
  for (let len = 2; len <= n; len <<= 1) {
    const h = len >> 1;
    // e^{−2πik/len} = table entry k·(M/len).
    const stride = twN / len;
    for (let start = 0; start < n; start += len) {
      for (let k = 0; k < h; k++) {
        const t = 2 * k * stride;
        const wr = tw[t];
        const wi = sign * tw[t + 1];
        const a = 2 * (start + k);
        const b = a + 2 * h;
        const br = data[b];
        const bi = data[b + 1];
        const xr = br * wr - bi * wi;
        const xi = br * wi + bi * wr;
        data[b] = data[a] - xr;
        data[b + 1] = data[a + 1] - xi;
        data[a] += xr;
        data[a + 1] += xi;
      }
    }
  }
  if (inverse) {
    const s = 1 / n;
    for (let i = 0; i < 2 * n; i++) data[i] *= s;
  }
}

/**
 * In-place FFT of a real sequence of power-of-two length N ≥ 2, result in the packed layout
 * (module comment), via one complex FFT of length N/2.
 * Source: Press et al., Numerical Recipes 3rd ed. (2007) §12.3.2 (section and equation numbers from memory).
 * @param x real input of length N, overwritten with the packed half spectrum
 * @param twiddles optional table from spectrumFftTwiddles(N)
 */
export function spectrumFftReal(x: Float64Array, twiddles?: Float64Array): void {
  const n = x.length;
  checkPow2('spectrumFftReal', 'length', n);
  if (n < 2) throw new RangeError(`spectrumFftReal: length must be >= 2, got ${n}`);
  const tw = twiddles ?? spectrumFftTwiddles(n);
  if (tw.length !== n) throw new RangeError(`spectrumFftReal: twiddle table is for length ${tw.length}, data ${n}`);
  const m = n >> 1;
  spectrumFftComplex(x, false, tw);
  // k = 0 and k = m from Z[0]: X[0] = Re Z0 + Im Z0, X[m] = Re Z0 − Im Z0.
  const z0r = x[0];
  const z0i = x[1];
  x[0] = z0r + z0i;
  x[1] = z0r - z0i;
  for (let k = 1; 2 * k <= m; k++) {
    const kk = m - k;
    const ar = x[2 * k];
    const ai = x[2 * k + 1];
    const br = x[2 * kk];
    const bi = x[2 * kk + 1];
    // E[k] = (Z[k] + conj Z[m−k])/2, O[k] = (Z[k] − conj Z[m−k])/(2i), X[k] = E + W^k O.
    const er = 0.5 * (ar + br);
    const ei = 0.5 * (ai - bi);
    const or = 0.5 * (ai + bi);
    const oi = -0.5 * (ar - br);
    const wr = tw[2 * k];
    const wi = tw[2 * k + 1];
    const tr = or * wr - oi * wi;
    const ti = or * wi + oi * wr;
    // X[m−k] = conj(E[k]) − conj(W^k O[k]) (since W^{m−k} = −conj W^k and E, O are Hermitian).
    x[2 * k] = er + tr;
    x[2 * k + 1] = ei + ti;
    x[2 * kk] = er - tr;
    x[2 * kk + 1] = -(ei - ti);
  }
}

/**
 * In-place inverse of spectrumFftReal: packed half spectrum in, real sequence of length N out.
 * Source: Press et al., Numerical Recipes 3rd ed. (2007) §12.3.2.
 * @param x packed half spectrum of length N (power of two ≥ 2), overwritten with the sequence
 * @param twiddles optional table from spectrumFftTwiddles(N)
 */
export function spectrumFftRealInverse(x: Float64Array, twiddles?: Float64Array): void {
  const n = x.length;
  checkPow2('spectrumFftRealInverse', 'length', n);
  if (n < 2) throw new RangeError(`spectrumFftRealInverse: length must be >= 2, got ${n}`);
  const tw = twiddles ?? spectrumFftTwiddles(n);
  if (tw.length !== n) {
    throw new RangeError(`spectrumFftRealInverse: twiddle table is for length ${tw.length}, data ${n}`);
  }
  const m = n >> 1;
  // Z[0] = E[0] + i O[0] with E[0] = (X0 + Xm)/2, O[0] = (X0 − Xm)/2.
  const x0 = x[0];
  const xm = x[1];
  x[0] = 0.5 * (x0 + xm);
  x[1] = 0.5 * (x0 - xm);
  for (let k = 1; 2 * k <= m; k++) {
    const kk = m - k;
    const ar = x[2 * k];
    const ai = x[2 * k + 1];
    const br = x[2 * kk];
    const bi = -x[2 * kk + 1]; // conj X[m−k]
    const er = 0.5 * (ar + br);
    const ei = 0.5 * (ai + bi);
    // O[k] = (X[k] − conj X[m−k]) · conj(W^k) / 2
    const dr = 0.5 * (ar - br);
    const di = 0.5 * (ai - bi);
    const wr = tw[2 * k];
    const wi = -tw[2 * k + 1];
    const or = dr * wr - di * wi;
    const oi = dr * wi + di * wr;
    // Z[k] = E[k] + i O[k];  Z[m−k] = conj E[k] + i conj O[k]
    x[2 * k] = er - oi;
    x[2 * k + 1] = ei + or;
    x[2 * kk] = er + oi;
    x[2 * kk + 1] = -ei + or;
  }
  spectrumFftComplex(x, true, tw);
}
