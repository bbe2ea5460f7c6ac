/**
 * Traces of real bands: published line positions (and intensities where published) of
 * test/fixtures/real, seen through an instrument line shape written apart from src/physics
 * (traceIls of contourTraces.ts), with seeded noise. They check the unresolved-band readings against
 * bands no generator of ours made.
 *
 * - HITRAN 2012 (L. S. Rothman et al., J. Quant. Spectrosc. Radiat. Transfer 130, 4 (2013)): CH3CN ν4,
 *   PH3 ν2 and ν4, with their published intensities at 296 K. True B″ from the published lower-state
 *   energies of the K = 0 levels, E″ = B″J(J+1) − D″[J(J+1)]²; true origin E′(J=0, K=0) = ν[P(1), K=0]
 *   + E″(J=1, K=0) (ν4 of PH3, with no K = 0 level in its upper state, has none).
 * - HC3N fundamentals (F. Tamassia et al., J. Quant. Spectrosc. Radiat. Transfer (2022) 108044; see
 *   test/fixtures/real/hc3n_tamassia2022/README.md): positions
 *   only. Lines the study did not list (blended or beyond its J range) are placed by a quartic in m
 *   (m = J″+1 for R, −J″ for P), ν = ν0 + (B′+B″)m + (B′−B″)m² + …, and Q lines by a quadratic in
 *   J(J+1), each fitted to the listed lines (Herzberg, Molecular Spectra and Molecular Structure II
 *   (1945), ch. IV). Intensities are Hönl–London factors times the Boltzmann factor of the lower level
 *   at 296 K: Σ–Σ, R(J) J+1 and P(J) J; Π–Σ, R (J+2)/2, Q (2J+1)/2, P (J−1)/2 (Herzberg, Spectra of
 *   Diatomic Molecules (1950), ch. IV; from memory), with E″ = B″J(J+1). True B″ from the listed
 *   J = 1 ← 0 rotational line, 9098.1152 MHz = 2B″ (to 4D″, 2 × 10^-9 relative); true origin the
 *   quartic's constant term (plus B′ for a Π upper state, whose levels are G′ + B′[J(J+1) − 1]).
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { gaussian, seededRandom, traceIls, traceThickAbsorbance, traceThickReach, type TraceApodization } from './contourTraces';

/** A real band: its lines (cm^-1, relative intensity), what its trace should read as, and true constants. */
export interface RealBand {
  name: string;
  lines: { nu: number; s: number }[];
  /** Profile the trace shows and band type of the band (published assignment). */
  profile: 'PR' | 'PQR' | 'Q-series';
  type: 'linear-parallel' | 'linear-perpendicular' | 'symmetric-top-parallel' | 'symmetric-top-perpendicular';
  /** Lower-state B, cm^-1, and band origin, cm^-1 (null where the data give none). */
  B: number;
  /**
   * Upper-state B, cm^-1 (null where the data give none): HITRAN, fitted to E′ = ν + E″ of the K = 0
   * upper levels; HC3N Σ, B″ plus the quartic's m² term; HC3N Π, the mean of the e levels' (P, R) and
   * f levels' (Q: B″ plus the quadratic's J(J+1) term) B, as src/physics/termValues.ts puts them at
   * ±q/2·J(J+1).
   */
  upperB: number | null;
  /** l-type doubling constant q = B_e − B_f of a Π upper state, cm^-1 (null otherwise). */
  upperQ: number | null;
  /** Lower-state centrifugal distortion DJ, cm^-1 (HC3N: fitted to the ground state's rotational lines; null otherwise). */
  DJ: number | null;
  origin: number | null;
  /** HC3N: lines placed from the fit because the study did not list them. */
  filled: number;
}

/** Second radiation constant hc/k, cm K (CODATA 2018). */
const C2 = 1.438776877;
/** Speed of light in MHz per cm^-1 (exact, SI). */
const MHZ_PER_CM1 = 29979.2458;

function tsv(path: string): Record<string, string>[] {
  const [head, ...rows] = readFileSync(fileURLToPath(new URL(`../fixtures/real/${path}`, import.meta.url)), 'utf8')
    .trim()
    .split('\n');
  const cols = head.split('\t');
  return rows.map((r) => Object.fromEntries(r.split('\t').map((v, i) => [cols[i], v])));
}

/** Least squares of y on the given basis functions (normal equations, Gauss–Jordan with pivoting). */
function leastSquares(xs: number[], ys: number[], basis: ((x: number) => number)[]): number[] {
  const n = basis.length;
  const a = Array.from({ length: n }, () => new Array<number>(n + 1).fill(0));
  for (let i = 0; i < xs.length; i++) {
    const f = basis.map((b) => b(xs[i]));
    for (let r = 0; r < n; r++) {
      for (let c = 0; c < n; c++) a[r][c] += f[r] * f[c];
      a[r][n] += f[r] * ys[i];
    }
  }
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r][c]) > Math.abs(a[p][c])) p = r;
    [a[c], a[p]] = [a[p], a[c]];
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = a[r][c] / a[c][c];
      for (let k = c; k <= n; k++) a[r][k] -= f * a[c][k];
    }
  }
  return a.map((row, i) => row[n] / row[i]);
}

const powers = (k: number, scale: number) => Array.from({ length: k + 1 }, (_, p) => (x: number) => (x / scale) ** p);

function hitranBand(file: string, name: string, profile: RealBand['profile'], type: RealBand['type']): RealBand {
  const rows = tsv(`hitran2012/${file}`);
  const lines = rows.map((r) => ({ nu: +r['nu_cm-1'], s: +r['S296_cm/molecule'] }));
  // B″ from the K = 0 lower levels (each J once).
  const levels = new Map<number, number>();
  for (const r of rows) if (+r.K_lo === 0) levels.set(+r.J_lo, +r['E_lower_cm-1']);
  const js = [...levels.keys()].filter((j) => j > 0);
  const [B] = leastSquares(
    js.map((j) => j * (j + 1)),
    js.map((j) => levels.get(j)!),
    [(x) => x, (x) => -x * x],
  );
  const p1 = rows.find((r) => +r.J_lo === 1 && +r.J_up === 0 && +r.K_lo === 0 && +r.K_up === 0);
  const upper = new Map<number, number>();
  for (const r of rows) if (+r.K_up === 0 && +r.K_lo === 0 && levels.has(+r.J_lo)) upper.set(+r.J_up, +r['nu_cm-1'] + levels.get(+r.J_lo)!);
  const ju = [...upper.keys()];
  const upperB =
    ju.length >= 5
      ? leastSquares(
          ju.map((j) => j * (j + 1)),
          ju.map((j) => upper.get(j)!),
          [() => 1, (x) => x, (x) => -x * x],
        )[1]
      : null;
  return { name, lines, profile, type, B, upperB, upperQ: null, DJ: null, origin: p1 ? +p1['nu_cm-1'] + levels.get(1)! : null, filled: 0 };
}

function hc3nBand(band: number, temperatureK = 296): RealBand {
  const ground = tsv('hc3n_tamassia2022/hc3n_ground_state.tsv').find((r) => r.J_up === '1' && r.J_lo === '0' && r.unit === 'MHz');
  if (!ground) throw new Error('hc3n_ground_state.tsv: no J = 1 ← 0 line');
  const B = +ground.observed / 2 / MHZ_PER_CM1;
  // DJ from every ground-state line in MHz: ν(J+1 ← J) = 2B(J+1) − 4DJ(J+1)³ + ≈6HJ(J+1)⁵ (Herzberg II ch. I).
  const mw = tsv('hc3n_tamassia2022/hc3n_ground_state.tsv').filter((r) => r.unit === 'MHz');
  const dj = leastSquares(
    mw.map((r) => +r.J_up),
    mw.map((r) => +r.observed / MHZ_PER_CM1),
    [(j) => 2 * j, (j) => -4 * j ** 3, (j) => j ** 5],
  )[1];
  const rows = tsv(`hc3n_tamassia2022/hc3n_nu_${band}.tsv`);
  const pi = rows.some((r) => r.J_up === r.J_lo);
  const pr = rows.filter((r) => r.J_up !== r.J_lo);
  const mOf = (r: Record<string, string>) => (+r.J_up > +r.J_lo ? +r.J_lo + 1 : -+r.J_lo);
  const cPr = leastSquares(
    pr.map(mOf),
    pr.map((r) => +r.observed),
    powers(4, 100),
  );
  const q = rows.filter((r) => r.J_up === r.J_lo);
  const cQ = q.length
    ? leastSquares(
        q.map((r) => +r.J_lo * (+r.J_lo + 1)),
        q.map((r) => +r.observed),
        powers(2, 1e4),
      )
    : [];
  const evalAt = (c: number[], x: number, scale: number) => c.reduce((s, a, k) => s + a * (x / scale) ** k, 0);
  const listed = new Map(rows.map((r) => [`${+r.J_up - +r.J_lo}:${r.J_lo}`, +r.observed]));
  const lines: { nu: number; s: number }[] = [];
  let filled = 0;
  for (let j = 0; j <= 130; j++) {
    for (const d of pi ? [-1, 0, 1] : [-1, 1]) {
      if ((d === -1 && j < (pi ? 2 : 1)) || (d === 0 && j < 1)) continue;
      let nu = listed.get(`${d}:${j}`);
      if (nu === undefined) {
        filled++;
        nu = d === 0 ? evalAt(cQ, j * (j + 1), 1e4) : evalAt(cPr, d === 1 ? j + 1 : -j, 100);
      }
      const hl = pi ? (d === 1 ? (j + 2) / 2 : d === 0 ? (2 * j + 1) / 2 : (j - 1) / 2) : d === 1 ? j + 1 : j;
      lines.push({ nu, s: hl * Math.exp((-C2 * B * j * (j + 1)) / temperatureK) });
    }
  }
  return {
    name: `HC3N ν${band}`,
    lines,
    profile: pi ? 'PQR' : 'PR',
    type: pi ? 'linear-perpendicular' : 'linear-parallel',
    B,
    upperB: B + (pi ? (cPr[2] + cQ[1]) / 2e4 : cPr[2] / 1e4),
    upperQ: pi ? (cPr[2] - cQ[1]) / 1e4 : null,
    DJ: dj,
    // G′ − G″: a Π state's levels are G′ + B′[J(J+1) − 1] (l = 1), so its P and R lines' constant term
    // lies B′ below the vibrational origin (Herzberg II ch. IV; as src/physics/termValues.ts).
    origin: cPr[0] + (pi ? B + cPr[2] / 1e4 : 0),
    filled,
  };
}

/** Every real band of the check: HC3N ν1–ν7, CH3CN ν4, PH3 ν2 and ν4. */
export function realBands(): RealBand[] {
  return [
    ...[1, 2, 3, 4, 5, 6, 7].map((b) => hc3nBand(b)),
    hitranBand('ch3cn_nu4_hitran2012.tsv', 'CH3CN ν4', 'PQR', 'symmetric-top-parallel'),
    hitranBand('ph3_nu2_hitran2012.tsv', 'PH3 ν2', 'PQR', 'symmetric-top-parallel'),
    hitranBand('ph3_nu4_hitran2012.tsv', 'PH3 ν4', 'Q-series', 'symmetric-top-perpendicular'),
  ];
}

/** A real band's lines by position and its trace's sampling: 2 points per 1/(2L), 8/L beyond its outermost lines. */
function realTraceSampling(band: RealBand, opdCm: number) {
  const lines = [...band.lines].sort((a, b) => a.nu - b.nu);
  const fromCm1 = lines[0].nu - 8 / opdCm;
  const toCm1 = lines[lines.length - 1].nu + 8 / opdCm;
  const step = 1 / (4 * opdCm);
  return { lines, fromCm1, toCm1, step, n: Math.floor((toCm1 - fromCm1) / step) + 1 };
}

/**
 * A real band's trace: 2 points per 1/(2L), 8/L beyond its outermost lines, peak absorbance 0.5 on a
 * 0.03 baseline. The instrument line shape is applied to the absorbance, as it acts on optically thin
 * lines (realBandTraceThick for lines thick at their own width).
 */
export function realBandTrace(
  band: RealBand,
  opdCm: number,
  apodization: TraceApodization,
  noiseRel: number,
  seed: number,
): { x: Float64Array; y: Float64Array; fromCm1: number; toCm1: number; noiseSigma: number } {
  const { lines, fromCm1, toCm1, step, n } = realTraceSampling(band, opdCm);
  const ils = traceIls(apodization, opdCm);
  const reach = 40 / opdCm;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  let first = 0;
  for (let k = 0; k < n; k++) {
    x[k] = fromCm1 + k * step;
    while (first < lines.length && lines[first].nu < x[k] - reach) first++;
    let s = 0;
    for (let i = first; i < lines.length && lines[i].nu <= x[k] + reach; i++) s += lines[i].s * ils(x[k] - lines[i].nu);
    y[k] = s;
  }
  let peak = 0;
  for (const v of y) peak = Math.max(peak, v);
  const rand = seededRandom(seed);
  const noiseSigma = noiseRel * 0.5;
  for (let k = 0; k < n; k++) y[k] = (y[k] / peak) * 0.5 + 0.03 + noiseSigma * gaussian(rand);
  return { x, y, fromCm1, toCm1, noiseSigma };
}

/**
 * A real band's trace as a spectrometer records it, for lines that are optically thick at their own
 * width (traceThickAbsorbance: Doppler profiles at 296 K, the deepest line's centre at peakTau, the
 * instrument line shape applied to the transmittance), plus a 0.01 baseline and noise of noiseRel times
 * the band's observed peak absorbance. Same sampling as realBandTrace.
 */
export function realBandTraceThick(
  band: RealBand,
  opdCm: number,
  apodization: TraceApodization,
  noiseRel: number,
  seed: number,
  massAmu: number,
  peakTau: number,
): { x: Float64Array; y: Float64Array; fromCm1: number; toCm1: number; noiseSigma: number } {
  const { lines, fromCm1, toCm1, step, n } = realTraceSampling(band, opdCm);
  const x = Float64Array.from({ length: n }, (_, k) => fromCm1 + k * step);
  const y = traceThickAbsorbance(
    x,
    lines.map((l) => l.nu),
    lines.map((l) => l.s),
    { opdCm, apodization, temperatureK: 296, massAmu, peakTau, reachCm1: traceThickReach(apodization, opdCm, toCm1 - fromCm1) },
  );
  let peak = 0;
  for (const v of y) peak = Math.max(peak, v);
  const rand = seededRandom(seed);
  const noiseSigma = noiseRel * peak;
  for (let k = 0; k < n; k++) y[k] += 0.01 + noiseSigma * gaussian(rand);
  return { x, y, fromCm1, toCm1, noiseSigma };
}
