/**
 * Usage of every CLI command, kept in one place: `cli --help` lists the synopses, `cli <command> --help`
 * (or `-h`) prints the whole entry. Each option gives its unit and default.
 */

/** One option of a command. */
export interface CliOptionHelp {
  /** Name without the dashes. */
  name: string;
  /** Placeholder of the value (e.g. 'FILE', 'S'); absent for a flag. */
  value?: string;
  /** What it is for. */
  text: string;
  /** Unit of the value ('cm^-1', 'amu', 'σ', 'file path', 'dimensionless', 'flag' …). */
  unit: string;
  /** Default, in words; 'required' for an option that must be given. */
  default: string;
}

/** Help of one command. */
export interface CliCommandHelp {
  /** What the command does, one sentence. */
  summary: string;
  options: CliOptionHelp[];
  /** What goes to stdout and stderr. */
  output: string;
  /** One command line that works from the repository root (public/demo holds the demo files). */
  example: string;
}

const WARNINGS = 'stderr: problems with the input, one line each ("warning: FILE: …"); the exit status stays 0 while the data are usable.';

/** Help of every command, in the order `cli --help` lists them. */
export const CLI_HELP: Record<string, CliCommandHelp> = {
  simulate: {
    summary: 'List the lines of the band the model describes, strongest = 1.',
    options: [
      { name: 'model', value: 'M.json', text: 'model file or system file (see DEVELOPERS.md)', unit: 'file path', default: 'required' },
      {
        name: 'min-intensity',
        value: 'X',
        text: 'leave out lines weaker than this',
        unit: 'relative intensity (strongest line = 1)',
        default: '0 (all lines)',
      },
    ],
    output: 'stdout: CSV J_up,K_up,J_lo,K_lo,wavenumber,intensity,E_lo,label, ascending wavenumber; wavenumber and E_lo in cm^-1.',
    example: 'npm run --silent cli -- simulate --model public/demo/model.json --min-intensity 0.001',
  },
  spectrum: {
    summary: 'Compute the band spectrum on an even grid (Voigt profiles: Doppler width from temperature and mass, Lorentz width given).',
    options: [
      { name: 'model', value: 'M.json', text: 'model file or system file (every band is summed)', unit: 'file path', default: 'required' },
      { name: 'from', value: 'X1', text: 'first grid point', unit: 'cm^-1', default: 'required' },
      { name: 'to', value: 'X2', text: 'last grid point (> X1)', unit: 'cm^-1', default: 'required' },
      {
        name: 'step',
        value: 'DX',
        text: 'grid step; adjusted (with a note) when it does not divide X2 − X1',
        unit: 'cm^-1',
        default: 'required',
      },
      {
        name: 'mass',
        value: 'AMU',
        text: 'molecular mass for the Doppler width',
        unit: 'amu',
        default: 'the model file\'s "mass"; required without it',
      },
      { name: 'lorentz', value: 'HWHM', text: 'Lorentz half width at half maximum', unit: 'cm^-1', default: '0 (pure Doppler)' },
      {
        name: 'opd',
        value: 'L',
        text: 'show the band through a Fourier-transform spectrometer of this maximum optical path difference (applied to transmittance)',
        unit: 'cm',
        default: 'none (no instrument line shape)',
      },
      {
        name: 'apodization',
        value: 'NAME',
        text: 'with --opd: boxcar, triangular, happ-genzel, norton-beer-weak, norton-beer-medium or norton-beer-strong',
        unit: 'word',
        default: 'boxcar',
      },
      {
        name: 'depth-scale',
        value: 'S',
        text: 'with --opd: true optical depth = S × y',
        unit: 'per (relative intensity × cm)',
        default: '1',
      },
    ],
    output:
      'stdout: CSV x,y; x in cm^-1, y in relative intensity × cm (with --opd: the apparent optical depth −ln T, a note on stderr says so).',
    example: 'npm run --silent cli -- spectrum --model public/demo/model.json --from 1140 --to 1160 --step 0.002',
  },
  peaks: {
    summary: 'Find the lines of a measured trace (delimited text or JCAMP-DX; UTF-8, or UTF-16 with a byte-order mark).',
    options: [
      { name: 'trace', value: 'FILE', text: 'trace file', unit: 'file path', default: 'required' },
      { name: 'min-snr', value: 'S', text: 'smallest peak height above the local baseline', unit: 'noise σ (dimensionless)', default: '5' },
      { name: 'noise', value: 'SIGMA', text: 'noise 1σ of the trace', unit: 'absorbance', default: 'estimated from the trace' },
      { name: 'baseline', text: 'subtract a smooth baseline before the search', unit: 'flag (no value)', default: 'off' },
    ],
    output: `stdout: CSV wavenumber,height,fwhm,snr,blend,wavenumber_sigma; wavenumber, fwhm and wavenumber_sigma in cm^-1, height in absorbance. ${WARNINGS}`,
    example: 'npm run --silent cli -- peaks --trace public/demo/trace.csv --min-snr 8',
  },
  fit: {
    summary: "Fit the model's floated constants to assigned lines by weighted least squares.",
    options: [
      {
        name: 'model',
        value: 'M.json',
        text: 'model file; its plain-number constants are floated',
        unit: 'file path',
        default: 'required',
      },
      {
        name: 'lines',
        value: 'L.csv',
        text: 'line table (J_up,K_up,J_lo,K_lo,wavenumber[,uncertainty])',
        unit: 'file path; wavenumber and uncertainty in cm^-1',
        default: 'required; uncertainty 0.001 cm^-1 where blank',
      },
    ],
    output: `stdout: JSON with every constant {value, sigma, fixed} in cm^-1, rms (cm^-1), sigmaW, residuals and warnings. ${WARNINGS}`,
    example: 'npm run --silent cli -- fit --model public/demo/model.json --lines lines.csv   (lines.csv as written by assign)',
  },
  combdiff: {
    summary: 'B, DJ and DJK of one state from the combination differences of assigned lines.',
    options: [
      { name: 'lines', value: 'L.csv', text: 'line table', unit: 'file path; wavenumber in cm^-1', default: 'required' },
      { name: 'state', value: 'lower|upper', text: 'state whose constants are wanted', unit: 'word', default: 'required' },
      { name: 'shape', value: 'prolate|oblate', text: 'rotor shape (linear is also accepted)', unit: 'word', default: 'prolate' },
      {
        name: 'model',
        value: 'S.json',
        text: 'system file: pool every band that shares the state named by --state (a state name of the system file then)',
        unit: 'file path',
        default: 'none (one band, from the line table alone)',
      },
      {
        name: 'species',
        value: 'NAME',
        text: 'species of the state, when the system file has several',
        unit: 'word',
        default: 'the only species',
      },
    ],
    output: `stdout: JSON {B, DJ, DJK: {value, sigma, fixed} in cm^-1, nPairs, sigmaW, rms, pairs, warnings}. ${WARNINGS}`,
    example: 'npm run --silent cli -- combdiff --lines lines.csv --state lower   (lines.csv as written by assign)',
  },
  assign: {
    summary: 'Assign the lines of a measured trace from a model (and optional seed lines), fitting as it goes.',
    options: [
      {
        name: 'model',
        value: 'M.json',
        text: 'model file (first guess) or system file (every band it can run on, strongest first, then one joint fit); its plain-number constants are floated',
        unit: 'file path',
        default: 'required',
      },
      { name: 'trace', value: 'FILE', text: 'trace file (delimited text or JCAMP-DX)', unit: 'file path', default: 'required' },
      {
        name: 'lines',
        value: 'SEED.csv',
        text: 'seed lines, never changed; with a system file, a band (and species) column says which band each seeds',
        unit: 'file path; wavenumber in cm^-1',
        default: 'seeds picked from the model alone (per band)',
      },
      {
        name: 'tolerance',
        value: 'K',
        text: 'half width of the matching window, K·σ (from 0.5 to 20)',
        unit: 'σ (dimensionless)',
        default: '3',
      },
    ],
    output: `stdout: CSV of the confident lines (J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,status,label,calc,obs_minus_calc,distance_sigma,flags,note); stderr: the final fit's summary. With a system file, band and species columns follow, calc is from the joint fit, and stderr reports each band, the lines two bands' predictions share (review) and the joint fit. ${WARNINGS}`,
    example: 'npm run --silent cli -- assign --model public/demo/model.json --trace public/demo/trace.csv > lines.csv',
  },
  contour: {
    summary: 'Fit the band contour of the model, seen through a Fourier-transform instrument line shape, to a region of the trace.',
    options: [
      {
        name: 'model',
        value: 'M.json',
        text: 'model file (start values; its floated constants among origin, B, A/C, ζ are fitted)',
        unit: 'file path',
        default: 'required',
      },
      { name: 'trace', value: 'FILE', text: 'measured trace', unit: 'file path', default: 'required' },
      { name: 'from', value: 'X1', text: 'start of the region', unit: 'cm^-1', default: 'required' },
      { name: 'to', value: 'X2', text: 'end of the region (> X1)', unit: 'cm^-1', default: 'required' },
      { name: 'opd', value: 'L', text: 'maximum optical path difference of the instrument', unit: 'cm', default: 'required' },
      {
        name: 'apodization',
        value: 'NAME',
        text: 'boxcar, triangular, happ-genzel, norton-beer-weak, norton-beer-medium or norton-beer-strong',
        unit: 'word',
        default: 'boxcar',
      },
      { name: 'mass', value: 'AMU', text: 'molecular mass for the Doppler width', unit: 'amu', default: 'the model file\'s "mass"' },
      { name: 'lorentz', value: 'HWHM', text: 'Lorentz half width; when given it is also fitted', unit: 'cm^-1', default: '0, not fitted' },
      {
        name: 'float',
        value: 'K1,K2',
        text: "keys to float instead of the model file's choice",
        unit: 'comma-separated keys',
        default: "the model file's floated constants",
      },
      { name: 'baseline-degree', value: 'D', text: 'degree of the baseline polynomial', unit: 'dimensionless', default: '1 (linear)' },
    ],
    output: `stdout: JSON {parameters {key: {value, sigma, fixed}}, rms, nPoints, scale, baseline, warnings, combinations, correlations, noiseSigma, status, route}; cm^-1, rms and baseline in absorbance. ${WARNINGS}`,
    example:
      'npm run --silent cli -- contour --model model.json --trace lowres.csv --from 1100 --to 1200 --opd 2 --apodization happ-genzel',
  },
  classify: {
    summary:
      'Say what a band region looks like (P and R only, P, Q and R, or a series of Q branches), what that implies, and rough constants.',
    options: [
      { name: 'trace', value: 'FILE', text: 'measured trace', unit: 'file path', default: 'required' },
      { name: 'from', value: 'X1', text: 'start of the region', unit: 'cm^-1', default: 'required' },
      { name: 'to', value: 'X2', text: 'end of the region (> X1)', unit: 'cm^-1', default: 'required' },
      {
        name: 'temperature',
        value: 'K',
        text: 'temperature of the gas, for B from the P–R separation or the envelope fit',
        unit: 'K',
        default: '296, and the output says it was assumed',
      },
      {
        name: 'q-envelope',
        text: 'also fit the envelope of a series of Q branches for B and A − B (C − B); about 1–4 s more per band',
        unit: 'flag',
        default: 'off',
      },
      {
        name: 'opd',
        value: 'L',
        text: "the spectrometer's maximum optical path difference: a series of Q branches then gets B from a contour fit through the instrument (several seconds to a minute more per band)",
        unit: 'cm',
        default: 'none (no contour fit)',
      },
      {
        name: 'apodization',
        value: 'NAME',
        text: 'with --opd: boxcar, triangular, happ-genzel, norton-beer-weak, norton-beer-medium or norton-beer-strong',
        unit: 'word',
        default: 'boxcar',
      },
      {
        name: 'spin-weights',
        value: 'W0,W1,W2',
        text: "with --opd: the molecule's nuclear-spin weights, K weighted by W[K mod their count] (e.g. 4,2,2 for a C3v top with three equivalent protons), which set the Q branches' heights over K in the contour fit",
        unit: 'numbers',
        default: 'all K weighted alike',
      },
    ],
    output: `stdout: JSON {profile, type, origin, B, qSpacing, evidence, confidence, alternativeType, bMethod, bLow, bHigh, bDetermined, temperature, temperatureAssumed, implication, qSeriesEnvelope (with --q-envelope or --opd), qSeriesContour (with --opd)}; cm^-1. ${WARNINGS}`,
    example: 'npm run --silent cli -- classify --trace lowres.csv --from 1100 --to 1200 --temperature 296',
  },
  perturbations: {
    summary:
      "Fit the lines, then look for perturbed levels of one state: local crossings along J, jumps between K stacks, stacks drifting with J; the state's levels as reduced term values.",
    options: [
      {
        name: 'model',
        value: 'M.json',
        text: 'model file (start values; plain numbers are floated)',
        unit: 'file path',
        default: 'required',
      },
      { name: 'lines', value: 'L.csv', text: 'assigned lines', unit: 'file path', default: 'required' },
      { name: 'state', value: 'S', text: "which state's levels to scan: upper or lower", unit: 'word', default: 'upper' },
    ],
    output: `stdout: JSON {state, rounds, rmsFirst, rmsLast, noise (cm^-1), setAside (line numbers), findings [{kind, k, kFrom, component, jFrom, jTo, jPeak, size (cm^-1), significance, description}], levels [{J, K, component, obs, calc, obsMinusCalc, sigma, nLines, spread, reducedObs, reducedCalc} (cm^-1)]}. ${WARNINGS}`,
    example: 'npm run --silent cli -- perturbations --model model.json --lines lines.csv --state upper',
  },
};

/** One-line synopsis, e.g. "peaks --trace FILE [--min-snr S] [--noise SIGMA] [--baseline]". */
export function cliSynopsis(name: string, help: CliCommandHelp): string {
  const parts = help.options.map((o) => {
    const text = `--${o.name}${o.value ? ` ${o.value}` : ''}`;
    return o.default.startsWith('required') ? text : `[${text}]`;
  });
  return [name, ...parts].join(' ');
}

/** The whole help of a command: usage, what it does, each option with unit and default, output, example. */
export function cliHelpText(name: string, help: CliCommandHelp): string {
  const width = Math.max(...help.options.map((o) => `--${o.name}${o.value ? ` ${o.value}` : ''}`.length), '-h, --help'.length) + 2;
  const rows = help.options.map((o) => {
    const left = `--${o.name}${o.value ? ` ${o.value}` : ''}`.padEnd(width);
    const given = o.default.startsWith('required') ? `R${o.default.slice(1)}` : `Default: ${o.default}`;
    return `  ${left}${o.text}. Unit: ${o.unit}. ${given}.`;
  });
  rows.push(`  ${'-h, --help'.padEnd(width)}print this help and exit.`);
  return [
    `usage: cli ${cliSynopsis(name, help)}`,
    '',
    help.summary,
    '',
    'options:',
    ...rows,
    '',
    help.output,
    '',
    'example:',
    `  ${help.example}`,
    '',
  ].join('\n');
}
