import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

/** One ν2 line of the ¹⁴NH3 fixture (cm⁻¹) with its two levels. */
export interface Nh3Line {
  nuCm1: number;
  uncCm1: number;
  upper: { J: number; K: number; inv: 's' | 'a'; sym: string; energyCm1: number };
  lower: { J: number; K: number; inv: 's' | 'a'; sym: string; energyCm1: number };
}

/** Read test/fixtures/real/nh3_marvel/nh3_nu2_levels_jlo15.tsv (see its README). Species get ASCII primes. */
export function nh3LinesRead(): Nh3Line[] {
  const path = fileURLToPath(new URL('../../fixtures/real/nh3_marvel/nh3_nu2_levels_jlo15.tsv', import.meta.url));
  const rows = readFileSync(path, 'utf8').trim().split('\n').slice(1);
  const sym = (s: string) => s.replace('"', "''");
  return rows.map((row) => {
    const f = row.split('\t');
    return {
      nuCm1: Number(f[0]),
      uncCm1: Number(f[1]),
      upper: { J: Number(f[2]), K: Number(f[3]), inv: f[4] as 's' | 'a', sym: sym(f[5]), energyCm1: Number(f[7]) },
      lower: { J: Number(f[10]), K: Number(f[11]), inv: f[12] as 's' | 'a', sym: sym(f[13]), energyCm1: Number(f[15]) },
    };
  });
}
