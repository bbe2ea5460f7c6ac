import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { leastSquaresSolve } from '../../../src/fit/leastSquares';
import { linearPiStateLevels } from '../../../src/physics/hamiltonian/linearPiStateLevels';
import { stateConstantsFrom, type BandModel } from '../../../src/physics/model';
import { upperLevelEnergy } from '../../../src/physics/termValues';

interface PiLine {
  jUp: number;
  parity: 'e' | 'f';
  jLo: number;
  nuCm1: number;
  sigmaCm1: number;
}

function hc3nNu7Read(): PiLine[] {
  const path = fileURLToPath(new URL('../../fixtures/real/hc3n_tamassia2022/hc3n_nu_7_jlo50.tsv', import.meta.url));
  return readFileSync(path, 'utf8')
    .trim()
    .split('\n')
    .slice(1)
    .map((row) => {
      const f = row.split('\t');
      return {
        jUp: Number(f[1]),
        parity: f[5].endsWith('e') ? 'e' : 'f',
        jLo: Number(f[6]),
        nuCm1: Number(f[11]),
        sigmaCm1: Number(f[13]),
      } as PiLine;
    });
}

describe('linearPiStateLevels', () => {
  it('reduces to the contract Π formula of termValues when qJ = 0', () => {
    // Ref: DEVELOPERS.md / termValues.upperLevelEnergy (linear, perpendicular): origin + B[J(J+1) − 1] − DJ [J(J+1)]²
    // ± q/2·J(J+1), e (P, R) with +, f (Q) with −; same arithmetic: tolerance 1e-10 cm⁻¹.
    const up = { origin: 663.2, B: 0.1521, DJ: 1.9e-8, q: 2.2e-4 };
    const model = { shape: 'linear', band: 'perpendicular', upper: stateConstantsFrom(up) } as BandModel;
    for (const J of [1, 2, 17, 60]) {
      const [e, f] = linearPiStateLevels(up, J).levels;
      expect(Math.abs(e.energyCm1 - upperLevelEnergy(model, J, 1, 1, 1))).toBeLessThan(1e-10);
      expect(Math.abs(f.energyCm1 - upperLevelEnergy(model, J, 1, 1, 0))).toBeLessThan(1e-10);
      // e/f parity: e = (−1)^J (Brown et al. 1975, from memory).
      expect(e.species).toBe(J % 2 === 0 ? '+' : '-');
      expect(f.species).toBe(J % 2 === 0 ? '-' : '+');
    }
    expect(() => linearPiStateLevels(up, 0)).toThrow(/J >= 1/);
  });

  it('fits HC3N ν7 (J″ ≤ 50) to its measurement accuracy only with qJ', () => {
    // Ref: Tamassia et al., JQSRT (2022) 108044, supplementary line list (fixture README); σ = 5e-5 cm⁻¹ stated
    // there for these lines. Lower state Σ⁺: B″ x − D″ x². Unit weights; rms in cm⁻¹.
    const lines = hc3nNu7Read();
    const fit = (withQJ: boolean) => {
      const upperNames = ['origin', 'B', 'DJ', 'q', ...(withQJ ? ['qJ'] : [])];
      const n = upperNames.length + 2;
      const evaluate = (p: ArrayLike<number>, res: Float64Array | null, jac: Float64Array | null) => {
        const up = Object.fromEntries(upperNames.map((name, i) => [name, p[i]]));
        const [bLo, dLo] = [p[n - 2], p[n - 1]];
        lines.forEach((line, i) => {
          const lev = linearPiStateLevels(up, line.jUp).levels.find((l) => l.tag === line.parity)!;
          const xLo = line.jLo * (line.jLo + 1);
          if (res) res[i] = line.nuCm1 - (lev.energyCm1 - (bLo * xLo - dLo * xLo * xLo));
          if (jac) {
            upperNames.forEach(
              (name, j) => (jac[j * lines.length + i] = lev.derivatives[['origin', 'B', 'DJ', 'HJ', 'q', 'qJ'].indexOf(name)]),
            );
            jac[(n - 2) * lines.length + i] = -xLo;
            jac[(n - 1) * lines.length + i] = xLo * xLo;
          }
        });
      };
      const start = [222, 0.15, 0, 0, ...(withQJ ? [0] : []), 0.15, 0];
      const s = leastSquaresSolve(
        {
          nObservations: lines.length,
          nParameters: n,
          residuals: (p, out) => evaluate(p, out, null),
          jacobian: (p, out) => evaluate(p, null, out),
        },
        start,
      );
      return { status: s.status, rms: Math.sqrt(s.chi2 / lines.length), p: s.parameters };
    };
    const without = fit(false);
    const withQJ = fit(true);
    console.info(
      `HC3N nu7 J'' <= 50 (${lines.length} lines): rms ${without.rms.toExponential(3)} without qJ, ${withQJ.rms.toExponential(3)} with qJ`,
    );
    expect(withQJ.status).not.toBe('rank-deficient');
    // With qJ the rms reaches the stated σ (5e-5 cm⁻¹; measured 2.9e-5); without it, it is several times larger
    // (measured 1.65e-4).
    expect(withQJ.rms).toBeLessThan(5e-5);
    expect(without.rms).toBeGreaterThan(3 * withQJ.rms);
    // Ref: ground-state B of HC3N = 4549.059 MHz = 0.151740 cm⁻¹ (CDMS, quoted in the fixture's source notes);
    // tolerance 1e-6 cm⁻¹ (≈ 30 kHz; a J'' ≤ 50 IR fit determines B″ to a few 1e-7 cm⁻¹).
    expect(Math.abs(withQJ.p[withQJ.p.length - 2] - 0.15174)).toBeLessThan(1e-6);
  });
});
