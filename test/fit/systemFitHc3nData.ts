/**
 * The HC3N joint-fit problem of test/fixtures/real/hc3n_tamassia2022: every row of the authors' line
 * lists (microwave and seven fundamentals), the system with rough start values, and the resolved lines.
 * Shared by the fit test and the joint-fit benchmark.
 */
import { readFileSync } from 'node:fs';
import type { SystemFitLine } from '../../src/fit/systemFitTypes';
import { systemLineResolve } from '../../src/fit/systemLineResolve';
import { systemFileFromJson } from '../../src/io/systemFile';
import { MHZ_PER_CM1 } from '../../src/physics/constants';

// Ref: F. Tamassia et al., J. Quant. Spectrosc. Radiat. Transfer (2022) 108044, supplementary line list
// (see test/fixtures/real/hc3n_tamassia2022/README.md): observed positions, the authors' σ and their
// global-fit residuals.
const FILES = ['ground_state', 'nu_1', 'nu_2', 'nu_3', 'nu_4', 'nu_5', 'nu_6', 'nu_7'];

export interface Hc3nRow {
  band: string;
  jUp: number;
  jLo: number;
  tagUp: string;
  observed: number;
  residual: number;
  sigma: number;
  unit: 'cm-1' | 'MHz';
}

export function hc3nRows(): Hc3nRow[] {
  const rows: Hc3nRow[] = [];
  for (const f of FILES) {
    const text = readFileSync(new URL(`../fixtures/real/hc3n_tamassia2022/hc3n_${f}.tsv`, import.meta.url), 'utf8');
    const [header, ...body] = text.trim().split('\n');
    const col = Object.fromEntries(header.split('\t').map((h, i) => [h, i]));
    for (const line of body) {
      const c = line.split('\t');
      const kUp = c[col.k_up_parity];
      rows.push({
        band: f === 'ground_state' ? 'rot' : f.replace('_', ''),
        jUp: Number(c[col.J_up]),
        jLo: Number(c[col.J_lo]),
        tagUp: kUp === '0' ? 'e' : kUp.slice(-1),
        observed: Number(c[col.observed]),
        residual: Number(c[col.residual_obs_minus_calc]),
        sigma: Number(c[col.sigma]),
        unit: c[col.unit] as 'cm-1' | 'MHz',
      });
    }
  }
  return rows;
}

/** Rough start values (band centres read off the line lists, B of the ground state for every state). */
export function hc3nSystem() {
  const sigma = (origin: number) => ({ origin, B: 0.1517, DJ: 1.8e-8, HJ: 0 });
  const pi = (origin: number) => ({ ...sigma(origin), degenerate: true, q: 0, qJ: 0 });
  return systemFileFromJson({
    temperature: 296,
    jMax: 130,
    species: [
      {
        name: 'HC3N',
        shape: 'linear',
        mass: 51.0,
        states: {
          ground: { B: 0.1517, DJ: 1.8e-8, HJ: 0 },
          v1: sigma(3327.4),
          v2: sigma(2274.0),
          v3: sigma(2079.3),
          v4: sigma(862.5),
          v5: pi(663.4),
          v6: pi(498.9),
          v7: pi(222.4),
        },
        bands: [
          { name: 'rot', upper: 'ground', lower: 'ground' },
          ...[1, 2, 3, 4, 5, 6, 7].map((v) => ({ name: `nu${v}`, upper: `v${v}`, lower: 'ground' })),
        ],
      },
    ],
  });
}

/** Rows, system and resolved lines (σ and MHz positions converted to cm^-1). */
export function hc3nProblem() {
  const rows = hc3nRows();
  const file = hc3nSystem();
  const lines: SystemFitLine[] = rows.map((r) => {
    const q = systemLineResolve(file.model, {
      band: r.band,
      species: null,
      jUpper: r.jUp,
      kUpper: r.band === 'nu5' || r.band === 'nu6' || r.band === 'nu7' ? 1 : 0,
      jLower: r.jLo,
      kLower: 0,
      lUpper: null,
      lLower: null,
      tagUpper: r.tagUp,
      tagLower: null,
    });
    if (!q.ok) throw new Error(q.message);
    const f = r.unit === 'MHz' ? 1 / MHZ_PER_CM1 : 1;
    return { ...q.line, observedCm1: r.observed * f, uncertaintyCm1: r.sigma * f, unit: r.unit };
  });
  return { rows, file, lines };
}
