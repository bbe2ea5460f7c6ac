/**
 * Is the centre of a two-branch band filled by a Q branch? A model comparison of the band's envelope
 * against a blurred two-lobe P/R template and the same template plus a central Q component.
 */

/** Result of bandCentreTemplate. */
export interface BandCentreTemplate {
  /** 1 − RSS(P+Q+R) / RSS(P+R): how much of the two-lobe template's misfit a central Q takes up. */
  improvement: number;
  /** Share of the fitted P+Q+R model's area in the Q component. */
  qShare: number;
  /** Fitted centre of the P+Q+R model, cm^-1. */
  origin: number;
  /** Fitted lobe parameter s of the P+Q+R model, cm^-1 (maxima of |x|·exp(−x²/2s²) at ±s before blur). */
  lobeS: number;
  /** Fitted Gaussian blur σ of the P+Q+R model, cm^-1. */
  blur: number;
  /** Fitted lobe parameter and blur of the two-lobe model alone, cm^-1. */
  prLobeS: number;
  prBlur: number;
  /** Fitted saturation κ of the two-lobe model alone (0: the lobes as the lines' intensities). */
  prSaturation: number;
}

/** Saturation κ of the lobes searched on this grid, then refined; at most KAPPA_MAX. */
const KAPPA_GRID = [0, 1, 3];
const KAPPA_MAX = 20;

function gaussBlur(t: Float64Array, sigmaSamples: number): Float64Array {
  if (sigmaSamples < 0.3) return t;
  const r = Math.ceil(3.5 * sigmaSamples);
  const k = new Float64Array(2 * r + 1);
  let ks = 0;
  for (let j = -r; j <= r; j++) ks += k[j + r] = Math.exp(-(j * j) / (2 * sigmaSamples * sigmaSamples));
  const m = t.length;
  const out = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let s = 0;
    for (let j = -r; j <= r; j++) {
      const q = i + j;
      if (q >= 0 && q < m) s += t[q] * k[j + r];
    }
    out[i] = s / ks;
  }
  return out;
}

/** Least squares of y on the columns (normal equations, Gauss–Jordan); RSS and coefficients. */
function lsq(cols: Float64Array[], y: Float64Array): { rss: number; coef: number[] } {
  const p = cols.length;
  const a: number[][] = [];
  for (let i = 0; i < p; i++) {
    const row: number[] = [];
    for (let j = 0; j < p; j++) {
      let s = 0;
      for (let q = 0; q < y.length; q++) s += cols[i][q] * cols[j][q];
      row.push(s);
    }
    let s = 0;
    for (let q = 0; q < y.length; q++) s += cols[i][q] * y[q];
    row.push(s);
    a.push(row);
  }
  for (let c = 0; c < p; c++) {
    let piv = c;
    for (let r = c + 1; r < p; r++) if (Math.abs(a[r][c]) > Math.abs(a[piv][c])) piv = r;
    [a[c], a[piv]] = [a[piv], a[c]];
    if (!(Math.abs(a[c][c]) > 1e-300)) return { rss: Infinity, coef: new Array<number>(p).fill(0) };
    for (let r = 0; r < p; r++) {
      if (r === c) continue;
      const f = a[r][c] / a[c][c];
      for (let q = c; q <= p; q++) a[r][q] -= f * a[c][q];
    }
  }
  const coef = a.map((row, i) => row[p] / row[i]);
  let rss = 0;
  for (let q = 0; q < y.length; q++) {
    let f = 0;
    for (let i = 0; i < p; i++) f += coef[i] * cols[i][q];
    rss += (y[q] - f) ** 2;
  }
  return { rss, coef };
}

/**
 * Fit the envelope y(x) (baseline removed) with two models and compare them:
 * P+R: a·|u|e^{−u²/2s²} (u < 0) + b·u e^{−u²/2s²} (u > 0), u = x − ν0, blurred by a Gaussian of σ w,
 * plus a constant; P+Q+R: the same plus q·Gaussian(ν0, √(w² + w_Q²)), q ≥ 0. The two-lobe shape is
 * the Σ–Σ intensity distribution of an unresolved band (Herzberg II (1945) ch. IV: I ∝ |m|·e^{−B m(m+1)hc/kT},
 * x ≈ 2Bm); the blur stands for the instrument function and unresolved structure; separate P and R
 * amplitudes let the branches differ. ν0, s, w and w_Q are searched on a grid, the amplitudes are
 * linear (variable projection). Grid and comparison: common practice.
 * @param x ascending axis, cm^-1
 * @param y envelope, baseline removed
 * @param centreGuess first guess of ν0, cm^-1
 * @param sGuess first guess of s (half the P–R maximum separation), cm^-1
 * @returns the comparison
 */
export function bandCentreTemplate(x: Float64Array, y: Float64Array, centreGuess: number, sGuess: number): BandCentreTemplate {
  // Resample onto 120 uniform points over centre ± 4.5 s (inside the data).
  const lo = Math.max(x[0], centreGuess - 4.5 * sGuess);
  const hi = Math.min(x[x.length - 1], centreGuess + 4.5 * sGuess);
  const m = 120;
  const h = (hi - lo) / (m - 1);
  const xs = new Float64Array(m);
  const ys = new Float64Array(m);
  let j = 0;
  for (let i = 0; i < m; i++) {
    const xi = lo + i * h;
    while (j < x.length - 2 && x[j + 1] < xi) j++;
    const f = Math.min(1, Math.max(0, (xi - x[j]) / (x[j + 1] - x[j])));
    xs[i] = xi;
    ys[i] = y[j] + f * (y[j + 1] - y[j]);
  }
  const ones = new Float64Array(m).fill(1);
  // Both models at (ν0, s, w, κ[, w_Q]): RSS and amplitudes; q < 0 (a dip) is not a Q branch. κ ≥ 0
  // saturates the lobes before the blur, g → (1 − e^{−κg})/κ with g scaled to 1 at its maximum (κ = 0:
  // g): lines optically thick at their own width, which a spectrometer's trace shows when the
  // instrument acts on the transmittance, add less than their strength to the envelope (a curve of
  // growth, Herzberg II (1945) ch. IV), flattening and widening the P and R maxima; without κ the
  // two-lobe template leaves that misfit to the central Q component (HC3N ν1 through an instrument at
  // τ = 3, test/fit/realBandTraces.ts, read PQR). The Q component is not saturated: a weak Q branch is thin.
  const lobes = (c: number, s: number, w: number, kappa: number): [Float64Array, Float64Array] => {
    const pRaw = new Float64Array(m);
    const rRaw = new Float64Array(m);
    // |u|e^{−u²/2s²} peaks at u = ±s with s·e^{−1/2}.
    const gMax = s * Math.exp(-0.5);
    for (let i = 0; i < m; i++) {
      const u = xs[i] - c;
      const g0 = (Math.abs(u) * Math.exp((-u * u) / (2 * s * s))) / gMax;
      const g = kappa > 1e-9 ? (1 - Math.exp(-kappa * g0)) / kappa : g0;
      if (u < 0) pRaw[i] = g;
      else rRaw[i] = g;
    }
    return [gaussBlur(pRaw, w / h), gaussBlur(rRaw, w / h)];
  };
  const prModel = (v: number[]): { rss: number; coef: number[] } => {
    if (!(v[1] > 0.2 * sGuess && v[2] >= 0 && v[3] >= 0 && v[3] <= KAPPA_MAX)) return { rss: Infinity, coef: [0, 0, 0] };
    const [p, r] = lobes(v[0], v[1], v[2], v[3]);
    return lsq([p, r, ones], ys);
  };
  const pqrModel = (v: number[]): { rss: number; coef: number[] } => {
    if (!(v[1] > 0.2 * sGuess && v[2] >= 0 && v[3] >= 0 && v[3] <= KAPPA_MAX && v[4] > 0.02 * sGuess))
      return { rss: Infinity, coef: [0, 0, 0, 0] };
    const [p, r] = lobes(v[0], v[1], v[2], v[3]);
    const sq = Math.hypot(v[2], v[4]);
    const q = new Float64Array(m);
    for (let i = 0; i < m; i++) q[i] = Math.exp(-((xs[i] - v[0]) ** 2) / (2 * sq * sq));
    const fit = lsq([p, r, q, ones], ys);
    if (fit.coef[2] > 0) return fit;
    const pr = lsq([p, r, ones], ys);
    return { rss: pr.rss, coef: [pr.coef[0], pr.coef[1], 0, pr.coef[2]] };
  };
  // Coarse grid, then coordinate descent with halving steps from the best grid point (so that the
  // comparison is not decided by the grid's spacing).
  const refine = (f: (v: number[]) => { rss: number }, start: number[], steps: number[]): { v: number[]; rss: number } => {
    let v = [...start];
    let rss = f(v).rss;
    const st = [...steps];
    for (let round = 0; round < 6; round++) {
      for (let k = 0; k < v.length; k++) {
        for (const dir of [1, -1]) {
          for (;;) {
            const t = [...v];
            t[k] += dir * st[k];
            const r = f(t).rss;
            if (r < rss) {
              v = t;
              rss = r;
            } else break;
          }
        }
      }
      for (let k = 0; k < st.length; k++) st[k] /= 2;
    }
    return { v, rss };
  };
  let gridPr = { rss: Infinity, v: [centreGuess, sGuess, 0, 0] };
  let gridPqr = { rss: Infinity, v: [centreGuess, sGuess, 0, 0, 0.1 * sGuess] };
  for (let ci = -3; ci <= 3; ci++) {
    for (const sf of [0.5, 0.65, 0.8, 0.95, 1.1, 1.3]) {
      for (const wf of [0.05, 0.2, 0.4, 0.7]) {
        for (const kappa of KAPPA_GRID) {
          const v = [centreGuess + 0.1 * ci * sGuess, sf * sGuess, wf * sGuess, kappa];
          const pr = prModel(v).rss;
          if (pr < gridPr.rss) gridPr = { rss: pr, v };
          for (const qf of [0.08, 0.2, 0.4]) {
            const vq = [...v, qf * sGuess];
            const r = pqrModel(vq).rss;
            if (r < gridPqr.rss) gridPqr = { rss: r, v: vq };
          }
        }
      }
    }
  }
  const d = 0.05 * sGuess;
  const prBest = refine(prModel, gridPr.v, [d, d, d, 0.5]);
  let pqrBest = refine(pqrModel, gridPqr.v, [d, d, d, 0.5, d]);
  // The P+Q+R model contains the P+R one: never worse than it.
  if (pqrBest.rss > prBest.rss) pqrBest = { v: [...prBest.v, 0.1 * sGuess], rss: prBest.rss };
  const fit = pqrModel(pqrBest.v);
  const best = {
    rss: pqrBest.rss,
    coef: fit.coef,
    c: pqrBest.v[0],
    s: pqrBest.v[1],
    w: pqrBest.v[2],
    kappa: pqrBest.v[3],
    wq: Math.hypot(pqrBest.v[2], pqrBest.v[4]),
  };
  const bestPr = { rss: prBest.rss, s: prBest.v[1], w: prBest.v[2], kappa: prBest.v[3] };
  // Areas of the fitted components (the blur keeps areas): ∫|u|e^{−u²/2s²} over one side = s², in
  // units of the scaled lobe g/gMax; saturated, summed numerically.
  const lobeArea = (() => {
    const gMax = best.s * Math.exp(-0.5);
    if (!(best.kappa > 1e-9)) return (best.s * best.s) / gMax;
    let a = 0;
    const du = best.s / 50;
    for (let u = du / 2; u < 8 * best.s; u += du) {
      const g0 = (u * Math.exp((-u * u) / (2 * best.s * best.s))) / gMax;
      a += ((1 - Math.exp(-best.kappa * g0)) / best.kappa) * du;
    }
    return a;
  })();
  const aP = Math.max(0, best.coef[0]) * lobeArea;
  const aR = Math.max(0, best.coef[1]) * lobeArea;
  const aQ = best.coef[2] * best.wq * Math.sqrt(2 * Math.PI);
  return {
    improvement: bestPr.rss > 0 ? Math.max(0, 1 - best.rss / bestPr.rss) : 0,
    qShare: aQ > 0 ? aQ / (aP + aR + aQ) : 0,
    origin: best.c,
    lobeS: best.s,
    blur: best.w,
    prLobeS: bestPr.s,
    prBlur: bestPr.w,
    prSaturation: bestPr.kappa,
  };
}
