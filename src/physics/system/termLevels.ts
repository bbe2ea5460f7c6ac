import type { TopShape } from '../model';
import type { LevelProvider, LevelSet } from './levelTypes';

/**
 * Constants of a state in closed form, by shape: symmetric tops carry the unique constant (A for
 * prolate, C for oblate) and the K-dependent distortion terms, and ζ (first-order Coriolis, acts
 * only in a degenerate state); linear molecules carry B, DJ, HJ and, for a Π state, the ℓ-type
 * doubling q and its J dependence qJ.
 */
export function termLevelParameterNames(shape: TopShape): readonly string[] {
  if (shape === 'linear') return ['origin', 'B', 'DJ', 'HJ', 'q', 'qJ'];
  return ['origin', 'B', shape === 'prolate' ? 'A' : 'C', 'DJ', 'DJK', 'DK', 'HJ', 'HJK', 'HKJ', 'HK', 'zeta'];
}

/**
 * A level provider from the closed-form term values of a symmetric-top or linear state.
 *
 *   E = origin + B J(J+1) + (A−B) K² − DJ J²(J+1)² − DJK J(J+1) K² − DK K⁴
 *       + HJ J³(J+1)³ + HJK J²(J+1)² K² + HKJ J(J+1) K⁴ + HK K⁶ − 2 A ζ K l
 *
 * (C for A on an oblate top; l = sign(kℓ), so −2Aζkℓ = −2AζKl; the term is absent, and ζ has no
 * effect, in a nondegenerate state). A linear molecule has A = 0 and K = 0 (Σ, one level 'e')
 * or K = |ℓ| = 1 (Π); a Π state's ℓ-type doubling puts its e levels at +q_eff/2·J(J+1) and its
 * f levels at −q_eff/2·J(J+1), q_eff = q + qJ·J(J+1). This is the same arithmetic as
 * physics/termValues.ts, written per level so both states of a band may be degenerate.
 * Derivatives ∂E/∂p are the closed-form monomials (and ζ·∂(−2AKl) for A, A·(−2Kl) for ζ).
 * Source: Herzberg II (1945) ch. I eqs. (I,31)–(I,33) and ch. IV eq. (IV,45) (Coriolis term);
 * ℓ-type doubling and its J dependence as in J. M. Hollas, High Resolution Spectroscopy, 2nd ed.
 * (1998), sec. 6.2, and G. Amat, H. H. Nielsen, G. Tarrago, Rotation–Vibration of Polyatomic
 * Molecules (1971) (from memory: q_eff = q − q_J J(J+1) with the opposite sign convention there).
 * @param shape rotor shape
 * @param isDegenerate degenerate (ℓ = ±1) state
 */
export function termLevelProvider(shape: TopShape, isDegenerate: boolean): LevelProvider {
  const parameterNames = termLevelParameterNames(shape);
  const nP = parameterNames.length;
  const isLinear = shape === 'linear';
  let capacity = 0;
  let set: LevelSet | null = null;
  const ensure = (n: number): LevelSet => {
    if (!set || n > capacity) {
      capacity = Math.max(n, 2 * capacity, 8);
      set = {
        J: 0,
        count: 0,
        K: new Int32Array(capacity),
        l: new Int8Array(capacity),
        tag: new Array<string>(capacity).fill(''),
        energyCm1: new Float64Array(capacity),
        gradient: new Float64Array(capacity * nP),
        componentCount: new Uint8Array(capacity),
      };
    }
    return set;
  };
  const levels = (J: number, values: Float64Array, kTop: number): LevelSet => {
    if (!(Number.isInteger(J) && J >= 0)) throw new Error(`termLevelProvider: J must be a whole number >= 0, got ${J}`);
    const x = J * (J + 1);
    if (isLinear) {
      const s = ensure(2);
      s.J = J;
      s.gradient.fill(0);
      const [origin, B, DJ, HJ, q, qJ] = values;
      if (!isDegenerate) {
        s.count = 1;
        s.K[0] = 0;
        s.l[0] = 0;
        s.tag[0] = 'e';
        s.componentCount[0] = 1;
        s.energyCm1[0] = origin + (B * x - DJ * x * x + HJ * x * x * x);
        s.gradient[0] = 1;
        s.gradient[1] = x;
        s.gradient[2] = -x * x;
        s.gradient[3] = x * x * x;
        return s;
      }
      if (J < 1 || kTop < 1) {
        s.count = 0;
        return s;
      }
      // Same order of operations as termValues.levelEnergy with A = 0 and K = 1.
      const rot = B * x + (0 - B) * 1 - DJ * x * x + HJ * x * x * x;
      const half = 0.5 * (q + qJ * x) * x;
      s.count = 2;
      for (let i = 0; i < 2; i++) {
        const sign = i === 0 ? 1 : -1;
        s.K[i] = 1;
        s.l[i] = 1;
        s.tag[i] = i === 0 ? 'e' : 'f';
        s.componentCount[i] = 1;
        s.energyCm1[i] = origin + rot + sign * half;
        const g = i * nP;
        s.gradient[g] = 1;
        s.gradient[g + 1] = x - 1;
        s.gradient[g + 2] = -x * x;
        s.gradient[g + 3] = x * x * x;
        s.gradient[g + 4] = sign * 0.5 * x;
        s.gradient[g + 5] = sign * 0.5 * x * x;
      }
      return s;
    }
    const kMax = Math.min(J, kTop);
    const n = isDegenerate ? 2 * kMax + 1 : kMax + 1;
    const s = ensure(n);
    s.J = J;
    s.count = n;
    const [origin, B, unique, DJ, DJK, DK, HJ, HJK, HKJ, HK, zeta] = values;
    let i = 0;
    for (let K = 0; K <= kMax; K++) {
      const k2 = K * K;
      const k4 = k2 * k2;
      // Same order of operations as termValues.levelEnergy, so an old single-band model gives
      // the same numbers to the last bit.
      const f =
        B * x + (unique - B) * k2 - DJ * x * x - DJK * x * k2 - DK * k4 + HJ * x * x * x + HJK * x * x * k2 + HKJ * x * k4 + HK * k4 * k2;
      const nSigns = isDegenerate && K > 0 ? 2 : 1;
      for (let t = 0; t < nSigns; t++) {
        const l = nSigns === 1 ? 0 : t === 0 ? 1 : -1;
        const coriolisUnit = isDegenerate ? -2 * K * l : 0;
        s.K[i] = K;
        s.l[i] = l as -1 | 0 | 1;
        s.tag[i] = '';
        s.componentCount[i] = isDegenerate || K > 0 ? 2 : 1;
        // termValues.upperLevelEnergy adds the Coriolis term last as ∓(2·A·ζ·K).
        const coriolis = 2 * unique * zeta * K;
        s.energyCm1[i] = origin + f + (l > 0 ? -coriolis : l < 0 ? coriolis : 0);
        const g = i * nP;
        s.gradient[g] = 1;
        s.gradient[g + 1] = x - k2;
        s.gradient[g + 2] = k2 + zeta * coriolisUnit;
        s.gradient[g + 3] = -x * x;
        s.gradient[g + 4] = -x * k2;
        s.gradient[g + 5] = -k4;
        s.gradient[g + 6] = x * x * x;
        s.gradient[g + 7] = x * x * k2;
        s.gradient[g + 8] = x * k4;
        s.gradient[g + 9] = k4 * k2;
        s.gradient[g + 10] = unique * coriolisUnit;
        i++;
      }
    }
    return s;
  };
  return { parameterNames, isDegenerate, levels };
}
