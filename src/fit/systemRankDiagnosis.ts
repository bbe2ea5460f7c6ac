import type { FitError } from './fitTypes';
import { jacobiSvd } from './jacobiSvd';
import type { Linearisation } from './leastSquaresLinearise';
import { NULL_SPACE_COMPONENT_MIN } from './rankDiagnosis';
import type { SystemFitLine, SystemParameter } from './systemFitTypes';
import type { SystemModel } from '../physics/system/systemModel';

/** Order in which constants are proposed for fixing (earliest first), as in rankDiagnosis. */
const FIX_PREFERENCE = ['A', 'C', 'DK', 'HK', 'HKJ', 'HJK', 'DJK', 'zeta', 'qJ', 'q', 'HJ', 'DJ', 'B', 'origin'];
const K_CONSTANTS = ['A', 'C', 'DK', 'HK', 'DJK', 'HJK', 'HKJ'];

function rankOfColumns(lin: Linearisation, columns: number[], tol: number): number {
  const n = lin.nParameters;
  if (columns.length === 0) return 0;
  const sub = new Float64Array(n * columns.length);
  columns.forEach((c, j) => sub.set(lin.rTriangular.subarray(c * n, c * n + n), j * n));
  const { s } = jacobiSvd(sub, n, columns.length);
  let rank = 0;
  while (rank < s.length && s[rank] > tol * s[0]) rank++;
  return rank;
}

/**
 * Explain in words why a joint fit is under-determined and which constants to fix: constants no
 * fitted line depends on (with the reason: no line reaches the state, every line has K = 0 there,
 * ζ or q without the levels that show them), or a null space of the Jacobian, naming its constants
 * and a smallest set to fix (greedy, in the same preference order as the single-band diagnosis,
 * each choice checked to raise the rank).
 * @param lin the deficient linearisation
 * @param floated keys in Jacobian-column order (a tied group appears under its leading key)
 * @param input the fit's model, parameters and lines
 * @param used indices of the lines in the fit
 * @param rankRelativeTolerance threshold of the rank test
 */
export function systemRankDiagnosis(
  lin: Linearisation,
  floated: readonly string[],
  input: { model: SystemModel; parameters: readonly SystemParameter[]; lines: readonly SystemFitLine[] },
  used: readonly number[],
  rankRelativeTolerance: number,
): FitError {
  const spec = new Map(input.parameters.map((p) => [p.key, p]));
  const touching = (p: SystemParameter) =>
    used
      .map((i) => input.lines[i])
      .flatMap((l) => {
        if (l.speciesIndex !== p.speciesIndex) return [];
        const band = input.model.species[l.speciesIndex].bands.find((b) => b.name === l.band)!;
        const out: { K: number; l: number; tag: string }[] = [];
        if (band.upper === p.state) out.push({ K: l.kUpper, l: l.lUpper, tag: l.tagUpper });
        if (band.lower === p.state) out.push({ K: l.kLower, l: l.lLower, tag: l.tagLower });
        return out;
      });
  const whyUnused = (key: string): string => {
    const p = spec.get(key);
    if (!p) return 'no fitted line depends on it';
    const interaction = input.model.species[p.speciesIndex]?.interactions?.find((it) => it.name === p.state);
    if (interaction)
      return `the ${interaction.type} interaction '${interaction.name}' (${interaction.states.join(' ↔ ')}) changes no fitted level through ${p.name}: no fitted line reaches a level its matrix elements join, or the levels it joins are not mixed at these values (a coupling whose levels are otherwise unmixed has zero slope at 0: start it at a small non-zero value)`;
    const levels = touching(p);
    const tied = input.parameters.filter((q) => q.same === key).map((q) => q.key);
    const also = tied.length ? ` (nor ${tied.join(', ')}, tied to it)` : '';
    if (levels.length === 0) return `no fitted line reaches state '${p.state}'${also}`;
    if (p.name === 'zeta') return `the Coriolis term −2AζKl needs fitted lines with K > 0 in state '${p.state}' and a non-zero A (or C)`;
    if (p.name === 'q' || p.name === 'qJ') return `ℓ-type doubling shows only in the e/f splitting of Π levels of '${p.state}'`;
    if (K_CONSTANTS.includes(p.name)) return `every fitted line has K = 0 in state '${p.state}'`;
    return 'no fitted line depends on it';
  };
  if (lin.zeroColumns.length > 0) {
    const keys = lin.zeroColumns.map((j) => floated[j]);
    return {
      kind: 'unused-parameter',
      message: `No fitted line depends on ${keys.map((k) => `${k} (${whyUnused(k)})`).join('; ')}, so the data cannot determine ${keys.length > 1 ? 'them' : 'it'}.`,
      parameters: keys,
      suggestion: `Fix ${keys.join(', ')} (keep ${keys.length > 1 ? 'their' : 'its'} file value${keys.length > 1 ? 's' : ''}) and fit again.`,
      fixSuggested: keys,
    };
  }
  const n = lin.nParameters;
  const involved = new Set<number>();
  for (let j = lin.rank; j < n; j++) {
    let max = 0;
    for (let i = 0; i < n; i++) max = Math.max(max, Math.abs(lin.svd.v[j * n + i]));
    for (let i = 0; i < n; i++) if (Math.abs(lin.svd.v[j * n + i]) >= NULL_SPACE_COMPONENT_MIN * max) involved.add(i);
  }
  const rankOf = (key: string) => {
    const name = spec.get(key)?.name ?? '';
    const byName = FIX_PREFERENCE.indexOf(name);
    return byName < 0 ? 50 : byName;
  };
  const involvedKeys = [...involved].sort((a, b) => a - b).map((i) => floated[i]);
  const remaining = Array.from({ length: n }, (_, i) => i);
  const toFix: string[] = [];
  const rank = lin.rank;
  for (const i of [...involved].sort((a, b) => rankOf(floated[a]) - rankOf(floated[b]) || a - b)) {
    if (rank === remaining.length) break;
    const without = remaining.filter((c) => c !== i);
    if (rankOfColumns(lin, without, rankRelativeTolerance) === rank) {
      remaining.splice(remaining.indexOf(i), 1);
      toFix.push(floated[i]);
    }
  }
  const nullity = n - lin.rank;
  const notes: string[] = [];
  const uniqueKeys = involvedKeys.filter((k) => ['A', 'C'].includes(spec.get(k)?.name ?? ''));
  const zetaKeys = involvedKeys.filter((k) => spec.get(k)?.name === 'zeta');
  const isPerpendicular = used.some((i) => input.lines[i].kUpper !== input.lines[i].kLower);
  if (uniqueKeys.length >= 2 && zetaKeys.length > 0 && isPerpendicular) {
    // Sub-band origins of a perpendicular band: ν0 + A′(1 − 2ζ) − B′ ± 2[A′(1 − ζ) − B′]K + [(A′ − B′) − (A″ − B″)]K²,
    // so with the origin floated the K structure gives A′(1 − ζ) and A′ − A″ only.
    // Source: Herzberg II (1945) ch. IV, perpendicular bands of symmetric tops (from memory).
    notes.push(
      `the ΔK = ±1 lines of a perpendicular band fix only A′(1 − ζ) and A′ − A″ (A for C in an oblate top; the origin takes up A′(1 − 2ζ)), so ${uniqueKeys.join(', ')} and ${zetaKeys.join(', ')} cannot all be found from it`,
    );
  } else if (uniqueKeys.length >= 2) {
    notes.push(
      `lines with ΔK = 0 depend only on differences of A (or C) between their two states, so a chain of such bands fixes ${uniqueKeys.join(', ')} only relative to one another`,
    );
  }
  const message =
    `The fit is under-determined: the lines fix only ${involvedKeys.length - nullity} combination${involvedKeys.length - nullity === 1 ? '' : 's'} of ` +
    `${involvedKeys.join(', ')}; ${nullity === 1 ? 'one direction' : `${nullity} directions`} in these constants leave${nullity === 1 ? 's' : ''} every line unchanged` +
    (notes.length ? ` (${notes.join('; ')})` : '') +
    '. No values are given for them.';
  const suggestion = toFix.length
    ? `Fix ${toFix.join(' and ')} at ${toFix.length > 1 ? 'values' : 'a value'} known from elsewhere (another band, microwave lines or combination differences), or tie ${toFix.length > 1 ? 'them' : 'it'} to another state's constant ({"same": …}), and fit again.`
    : `Fix one of ${involvedKeys.join(', ')} and fit again.`;
  return { kind: 'underdetermined', message, parameters: involvedKeys, suggestion, fixSuggested: toFix };
}
