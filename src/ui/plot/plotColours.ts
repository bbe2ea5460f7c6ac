/**
 * The workbench's own colour scheme: ladder hue by K'' (eight hues, cycling), shade by ΔK (rows of
 * ΔK = −1 drawn darker than ΔK = +1, parallel rows in between), plus theme colours for plotly.
 */

/** Eight well-separated hues (degrees), in the order K'' = 0, 1, 2 … cycles through. */
const HUES = [212, 352, 140, 30, 270, 182, 56, 318];

/**
 * Colour of a ladder row.
 * @param deltaK −1, 0, +1
 * @param kLower K''
 * @param isDark dark theme (lighter tones)
 * @returns a CSS hsl() colour
 */
export function ladderColour(deltaK: number, kLower: number, isDark: boolean): string {
  const hue = HUES[((kLower % HUES.length) + HUES.length) % HUES.length];
  const base = isDark ? 66 : 42;
  const light = deltaK < 0 ? base - 10 : deltaK > 0 ? base + 4 : base;
  return `hsl(${hue}, 70%, ${light}%)`;
}

/** Base hues (degrees) of the colour families of several bands, in band order (cycling). */
const BAND_FAMILY_HUES = [212, 16, 132, 282, 44, 330, 176, 96];

/**
 * Colour of a ladder row of band number `bandIndex` when several bands are drawn: one hue family
 * per band (hue within ±16° of the band's base hue, stepping with K''), shade by ΔK as ladderColour.
 * @param bandIndex band number in the system's order
 * @param deltaK −1, 0, +1
 * @param kLower K''
 * @param isDark dark theme
 * @returns a CSS hsl() colour
 */
export function bandLadderColour(bandIndex: number, deltaK: number, kLower: number, isDark: boolean): string {
  const base = BAND_FAMILY_HUES[((bandIndex % BAND_FAMILY_HUES.length) + BAND_FAMILY_HUES.length) % BAND_FAMILY_HUES.length];
  const hue = base + ((kLower % 3) - 1) * 16;
  const light = (isDark ? 64 : 40) + (deltaK < 0 ? -10 : deltaK > 0 ? 6 : 0) + (kLower % 2) * 6;
  return `hsl(${(hue + 360) % 360}, 72%, ${light}%)`;
}

/** A band's colour for lists and legends (its family's base tone). */
export function bandColour(bandIndex: number, isDark: boolean): string {
  return bandLadderColour(bandIndex, 0, 1, isDark);
}

/**
 * Colour for a K'' value in residual and Loomis–Wood plots (same hues as the ladders).
 * @param kLower K''
 * @param isDark dark theme
 */
export function kColour(kLower: number, isDark: boolean): string {
  return ladderColour(0, kLower, isDark);
}

/** Theme colours handed to plotly layouts. */
export interface PlotTheme {
  isDark: boolean;
  paper: string;
  plot: string;
  text: string;
  grid: string;
  trace: string;
  simulated: string;
  peak: string;
  assigned: string;
  flagged: string;
  cursor: string;
}

/**
 * Plot colours of the light or dark theme (match the CSS variables in ui/theme.css).
 * @param isDark dark theme
 */
export function plotTheme(isDark: boolean): PlotTheme {
  return isDark
    ? {
        isDark,
        paper: '#161a20',
        plot: '#161a20',
        text: '#d8dde6',
        grid: '#2c333d',
        trace: '#e8ecf2',
        simulated: '#f0a44b',
        peak: '#7fb8ff',
        assigned: '#4fd18b',
        flagged: '#ff6b6b',
        cursor: '#ffd84a',
      }
    : {
        isDark,
        paper: '#ffffff',
        plot: '#ffffff',
        text: '#1d232b',
        grid: '#e3e7ec',
        trace: '#1d232b',
        simulated: '#c96a00',
        peak: '#1c64c8',
        assigned: '#0f8a4a',
        flagged: '#d1242f',
        cursor: '#b88600',
      };
}
