/**
 * The PH3 ν2/ν4 lines of HITRAN 2012 (test/fixtures/real/hitran2012, see its README) as rows and as
 * joint-fit lines of the dyad system test/fixtures/systems/ph3-dyad.json.
 * Source: L. S. Rothman et al., J. Quant. Spectrosc. Radiat. Transfer 130, 4 (2013) (HITRAN 2012).
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { SystemFitLine } from '../../src/fit/systemFitTypes';

/** One HITRAN row (wavenumber cm⁻¹, intensity cm/molecule at 296 K, E'' cm⁻¹). */
export interface Ph3Row {
  band: 'nu2' | 'nu4';
  nu: number;
  intensity: number;
  eLower: number;
  jUp: number;
  kUp: number;
  lUp: number;
  symUp: string;
  jLo: number;
  kLo: number;
  symLo: string;
  uncertaintyCode: number;
}

/** Both bands' rows, in file order. */
export function ph3Rows(): Ph3Row[] {
  const rows: Ph3Row[] = [];
  for (const band of ['nu2', 'nu4'] as const) {
    const url = new URL(`../fixtures/real/hitran2012/ph3_${band}_hitran2012.tsv`, import.meta.url);
    const lines = readFileSync(fileURLToPath(url), 'utf8').trim().split('\n').slice(1);
    for (const line of lines) {
      const f = line.split('\t');
      rows.push({
        band,
        nu: +f[0],
        intensity: +f[1],
        eLower: +f[3],
        jUp: +f[4],
        kUp: +f[5],
        lUp: +f[6],
        symUp: f[7],
        jLo: +f[8],
        kLo: +f[9],
        symLo: f[11],
        uncertaintyCode: +f[12],
      });
    }
  }
  return rows;
}

/**
 * Whether a level of the dyad is one member of an A1/A2 pair: k − ℓ ≡ 0 (mod 3) with K > 0 for ν2,
 * and for ν4 the (+l) levels with K ≡ 1 and the (−l) levels with K ≡ 2 (mod 3).
 */
export function ph3IsPairLevel(band: 'nu2' | 'nu4', K: number, l: number): boolean {
  if (band === 'nu2') return K > 0 && K % 3 === 0;
  return K > 0 && (((K - l) % 3) + 3) % 3 === 0;
}

/**
 * σv of a level (the phases of physics/interaction) from HITRAN's A+/A− label: σ = w (−1)^J with
 * w = +1 for A+. An inference, not a documented HITRAN rule: it makes every K'' = 0 ground level
 * σ = (−1)^J (as the basis phases require) and every pair line obey σ'σ'' = −1 (checked in the tests).
 */
export function ph3Sigma(sym: string, J: number): number {
  const w = sym === 'A+' ? 1 : -1;
  return J % 2 === 0 ? w : -w;
}

/**
 * Whether a row's labels fit the dyad's level pattern: E levels labelled E, pair members and
 * K = 0 of ν2 labelled A±, ground K'' = 0 labelled A+ and K'' = 3n A±, other ground levels E. A few
 * rows of the list do not (reported by the test) and are left out.
 */
export function ph3RowConsistent(r: Ph3Row): boolean {
  const upA = ph3IsPairLevel(r.band, r.kUp, r.lUp) || (r.band === 'nu2' && r.kUp === 0);
  const loA = r.kLo % 3 === 0;
  // Every ground K'' = 0 level is A+ in the list (σ = (−1)^J); the one row saying A− there is left out.
  if (r.kLo === 0 && r.symLo !== 'A+') return false;
  return upA === (r.symUp !== 'E') && loA === (r.symLo !== 'E') && !(r.band === 'nu4' && r.kUp === 0 && r.lUp !== -1 && r.lUp !== 1);
}

/**
 * The rows as joint-fit lines: duplicates (the A+/A− rows of an unresolved pair at one wavenumber)
 * merged; a pair member's tag 'A1'/'A2' (upper, and ground K'' = 3n) from ph3Sigma; σ from the HITRAN uncertainty code (upper end
 * of its range: code 3 → 0.01, 4 → 0.001, 5 → 1e-4 cm⁻¹), floored at 5e-4 cm⁻¹.
 */
export function ph3FitLines(rows: Ph3Row[]): SystemFitLine[] {
  const seen = new Set<string>();
  const out: SystemFitLine[] = [];
  for (const r of rows) {
    const key = `${r.band} ${r.nu} ${r.jUp} ${r.kUp} ${r.lUp} ${r.jLo} ${r.kLo}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const isPair = ph3IsPairLevel(r.band, r.kUp, r.lUp);
    const l = r.band === 'nu2' || r.kUp === 0 ? 0 : (Math.sign(r.lUp) as -1 | 1);
    out.push({
      speciesIndex: 0,
      band: r.band,
      jUpper: r.jUp,
      kUpper: r.kUp,
      lUpper: l,
      tagUpper: isPair ? (ph3Sigma(r.symUp, r.jUp) > 0 ? 'A1' : 'A2') : '',
      jLower: r.jLo,
      kLower: r.kLo,
      lLower: 0,
      tagLower: r.kLo > 0 && r.kLo % 3 === 0 ? (ph3Sigma(r.symLo, r.jLo) > 0 ? 'A1' : 'A2') : '',
      observedCm1: r.nu,
      uncertaintyCm1: Math.max(5e-4, r.uncertaintyCode === 5 ? 1e-4 : r.uncertaintyCode === 4 ? 1e-3 : 1e-2),
      isExcluded: false,
      unit: 'cm-1',
    });
  }
  return out;
}
