import { bandLines } from '../physics/bandLines';
import { APODIZATION_NAMES, apodizationCheck } from '../physics/instrumentLineShape';
import { instrumentSpectrum } from '../physics/instrumentSpectrum';
import { spectrumSynthesize, type SpectrumGrid } from '../physics/spectrum';
import { systemLines } from '../physics/system/systemLines';
import { cliLoadModelOrSystem } from './cliModel';
import { CliError, cliNumber, cliParseArgs, cliRequire, type CliCommand } from './cliIo';

/** Largest grid the spectrum command accepts (about 0.5 GB of CSV text). */
export const SPECTRUM_MAX_POINTS = 20_000_000;

/** Rows written per stdout chunk, so a large spectrum never becomes one huge string. */
const ROWS_PER_CHUNK = 65_536;

/**
 * The grid of the spectrum command: npoints = round((to − from)/step) + 1 points from `from` to `to`
 * inclusive. When `step` does not divide the range, the effective step (to − from)/(npoints − 1)
 * is used so the last point is exactly `to`; `adjusted` says so.
 * @param fromCm1 first point X1, cm^-1
 * @param toCm1 last point X2, cm^-1 (> X1)
 * @param stepCm1 requested step DX, cm^-1 (> 0)
 * @throws CliError with a one-line message for X2 <= X1, DX <= 0, a range under half a step, or
 *   more than SPECTRUM_MAX_POINTS points
 */
export function spectrumCommandGrid(fromCm1: number, toCm1: number, stepCm1: number): SpectrumGrid & { adjusted: boolean } {
  if (!(stepCm1 > 0)) throw new CliError(`--step must be > 0 cm^-1, got ${stepCm1}`);
  if (!(toCm1 > fromCm1)) throw new CliError(`--to must be greater than --from, got --from ${fromCm1} --to ${toCm1}`);
  const intervals = Math.round((toCm1 - fromCm1) / stepCm1);
  if (!(intervals + 1 <= SPECTRUM_MAX_POINTS)) {
    throw new CliError(
      `the grid from ${fromCm1} to ${toCm1} with step ${stepCm1} has ${intervals + 1} points, more than ${SPECTRUM_MAX_POINTS}; use a larger --step or a shorter range`,
    );
  }
  if (intervals < 1) {
    throw new CliError(`the range ${fromCm1} to ${toCm1} is shorter than half of --step ${stepCm1}; nothing to sample`);
  }
  const effective = (toCm1 - fromCm1) / intervals;
  return {
    fromCm1,
    stepCm1: effective,
    npoints: intervals + 1,
    adjusted: Math.abs(effective - stepCm1) > 1e-9 * stepCm1,
  };
}

/**
 * Decimals that print x on a grid of the given step without two points looking alike: one digit
 * finer than the step (step 0.002 → 4 decimals, step 1 → 1 decimal), at most 12.
 * @param stepCm1 grid step, cm^-1
 */
export function spectrumCommandDecimals(stepCm1: number): number {
  return Math.min(12, Math.max(0, Math.ceil(1 - Math.log10(stepCm1) - 1e-9)));
}

/**
 * `spectrum --model M.json --from X1 --to X2 --step DX [--mass AMU] [--lorentz HWHM]`: CSV `x,y` on
 * the grid X1, X1+DX, …, X2 (cm^-1), y = Σ I_i V(x − ν_i) with the band's lines (relative
 * intensities, strongest = 1) and area-normalised Voigt profiles V (cm), so y is in relative
 * intensity × cm. Every line of the model contributes, including the wings of lines outside
 * [X1, X2], to 1e-4 of max y (spectrumSynthesize).
 *
 * Defaults: the Doppler width comes from the model temperature and the mass, taken from --mass,
 * else the model file's "mass" (amu); without either the command stops with an error (there is
 * no sensible default mass). --lorentz is the Lorentz HWHM in cm^-1, default 0 (pure Doppler).
 * If DX does not divide X2 − X1 the step is adjusted to (X2 − X1)/(npoints − 1), with a note on stderr.
 * x is printed with one decimal more than the step resolves, y with 7 significant digits.
 * With a system file (JSON with "species") y sums every band of every species (intensities on one
 * scale, strongest line of all = 1), each species with its own mass (--mass overrides all).
 *
 * With `--opd L [--apodization NAME] [--depth-scale S]` the band is seen through a Fourier-transform
 * spectrometer of maximum optical path difference L (cm) and the named apodization (default boxcar):
 * the true optical depth is τ = S·y (S default 1, i.e. y read as −ln T), the instrument line shape
 * acts on the transmittance e^{−τ}, and the column y becomes the apparent optical depth −ln T_obs
 * (natural-log absorbance, dimensionless; divide by ln 10 for decadic absorbance). For τ ≪ 1 it
 * tends to S × (instrument line shape ⊛ y). A note on stderr says so. Without --opd the output is
 * unchanged.
 */
export const spectrumCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['model', 'from', 'to', 'step', 'mass', 'lorentz', 'opd', 'apodization', 'depth-scale']);
  const modelPath = cliRequire(opts, 'model');
  const grid = spectrumCommandGrid(cliNumber(opts, 'from'), cliNumber(opts, 'to'), cliNumber(opts, 'step'));
  const lorentzHwhmCm1 = cliNumber(opts, 'lorentz', 0);
  if (lorentzHwhmCm1 < 0) throw new CliError(`--lorentz must be a half width >= 0 cm^-1, got ${lorentzHwhmCm1}`);
  const instrument = spectrumCommandInstrument(opts);
  const noteAdjusted = () => {
    if (grid.adjusted) {
      io.stderr(
        `spectrum: --step ${cliNumber(opts, 'step')} does not divide the range; using ${grid.stepCm1} cm^-1 so the last point is ${cliNumber(opts, 'to')}\n`,
      );
    }
  };
  const loaded = cliLoadModelOrSystem(modelPath, io);
  let y: Float64Array;
  if (loaded.kind === 'system') {
    if (instrument) throw new CliError('--opd (instrument line shape) takes a single-band model file for now, not a system file');
    // Every band of every species summed, each species with its own Doppler width.
    const model = loaded.file.model;
    const massOption = opts.mass !== undefined ? cliNumber(opts, 'mass') : undefined;
    if (massOption !== undefined && !(massOption > 0)) throw new CliError(`--mass must be > 0 amu, got ${massOption}`);
    for (const sp of model.species) {
      if (massOption === undefined && sp.massAmu === undefined) {
        throw new CliError(
          `no molecular mass for the Doppler width of species '${sp.name}': give --mass AMU or "mass" (amu) for it in ${modelPath}`,
        );
      }
    }
    noteAdjusted();
    const all = systemLines(model);
    y = new Float64Array(grid.npoints);
    model.species.forEach((sp, s) => {
      const pick: number[] = [];
      for (let i = 0; i < all.count; i++) if (all.bandRefs[all.bandIndex[i]].speciesIndex === s) pick.push(i);
      if (pick.length === 0) return;
      const part = spectrumSynthesize(
        {
          count: pick.length,
          wavenumberCm1: Float64Array.from(pick, (i) => all.wavenumberCm1[i]),
          intensity: Float64Array.from(pick, (i) => all.intensity[i]),
        },
        grid,
        { temperatureK: model.temperatureK, massAmu: massOption ?? sp.massAmu!, lorentzHwhmCm1 },
      );
      for (let k = 0; k < grid.npoints; k++) y[k] += part[k];
    });
  } else {
    const file = loaded.file;
    const massAmu = opts.mass !== undefined ? cliNumber(opts, 'mass') : file.massAmu;
    if (massAmu === undefined) {
      throw new CliError(`no molecular mass for the Doppler width: give --mass AMU or "mass" (amu) in ${modelPath}`);
    }
    if (!(massAmu > 0)) throw new CliError(`--mass must be > 0 amu, got ${massAmu}`);
    noteAdjusted();
    const lines = bandLines(file.model);
    if (instrument) {
      const x = new Float64Array(grid.npoints);
      for (let k = 0; k < grid.npoints; k++) x[k] = grid.fromCm1 + k * grid.stepCm1;
      const seen = instrumentSpectrum(lines, x, {
        opdCm: instrument.opdCm,
        apodization: instrument.apodization,
        temperatureK: file.model.temperatureK,
        massAmu,
        lorentzHwhmCm1,
        opticalDepthScale: instrument.depthScale,
        route: 'transmittance',
      });
      y = seen.opticalDepth;
      io.stderr(
        `spectrum: y is the apparent optical depth −ln T (natural-log absorbance) through the instrument line shape ` +
          `(L = ${instrument.opdCm} cm, ${instrument.apodization}), true optical depth = ${instrument.depthScale} × relative intensity × cm` +
          (seen.isUnderResolved ? '; WARNING: the internal grid is coarser than the line width, saturation is approximate' : '') +
          '\n',
      );
    } else {
      y = spectrumSynthesize(lines, grid, { temperatureK: file.model.temperatureK, massAmu, lorentzHwhmCm1 });
    }
  }

  const decimals = spectrumCommandDecimals(grid.stepCm1);
  const last = grid.npoints - 1;
  const to = cliNumber(opts, 'to');
  let chunk = 'x,y\n';
  for (let k = 0; k <= last; k++) {
    // Compute x_k from k (no accumulated round-off) and print the requested end exactly.
    const x = k === last ? to : grid.fromCm1 + k * grid.stepCm1;
    chunk += `${x.toFixed(decimals)},${y[k].toPrecision(7)}\n`;
    if ((k + 1) % ROWS_PER_CHUNK === 0) {
      io.stdout(chunk);
      chunk = '';
    }
  }
  if (chunk) io.stdout(chunk);
  return 0;
};

/**
 * The instrument options of the spectrum command, or null without --opd.
 * @throws CliError for --apodization or --depth-scale without --opd, L ≤ 0, an unknown apodization
 *   or a negative depth scale
 */
export function spectrumCommandInstrument(
  opts: Record<string, string | true>,
): { opdCm: number; apodization: (typeof APODIZATION_NAMES)[number]; depthScale: number } | null {
  if (opts.opd === undefined) {
    for (const name of ['apodization', 'depth-scale']) {
      if (opts[name] !== undefined) throw new CliError(`--${name} needs --opd L (the maximum optical path difference, cm)`);
    }
    return null;
  }
  const opdCm = cliNumber(opts, 'opd');
  if (!(opdCm > 0)) throw new CliError(`--opd must be a maximum optical path difference > 0 cm, got ${opdCm}`);
  const name = typeof opts.apodization === 'string' ? opts.apodization : 'boxcar';
  let apodization: (typeof APODIZATION_NAMES)[number];
  try {
    apodization = apodizationCheck('spectrum', name);
  } catch {
    throw new CliError(`--apodization must be one of ${APODIZATION_NAMES.join(', ')}, got '${name}'`);
  }
  const depthScale = cliNumber(opts, 'depth-scale', 1);
  if (!(depthScale >= 0)) throw new CliError(`--depth-scale must be >= 0, got ${depthScale}`);
  return { opdCm, apodization, depthScale };
}
