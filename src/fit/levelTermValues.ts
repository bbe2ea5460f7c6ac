/**
 * Observed and calculated term values of the levels of one state that assigned lines reach, and
 * their reduced form E − B̄·J(J+1): the plot in which a perturbation shows as a kink or a jump in
 * one K stack while the others run smooth.
 *
 * Upper state: E'_obs = ν_obs + F''_calc(J'', K''), E'_calc = ν_calc + F''_calc (the lower state is
 * taken as known from the fitted constants). Lower state: E''_obs = E'_calc − ν_obs. Lines that
 * reach the same level are averaged with weights 1/σ²; their spread says whether they agree.
 * Source: reduced term values as used in perturbation analysis, H. Lefebvre-Brion and R. W. Field,
 * The Spectra and Dynamics of Diatomic Molecules (2004), ch. 6 (from memory); term values of
 * physics/termValues.ts.
 */
import { levelEnergy } from '../physics/termValues';
import type { FitResult } from './fitTypes';

/** Which state's levels to list. */
export type LevelState = 'upper' | 'lower';

/** One level reached by at least one fitted line. */
export interface LevelTermValue {
  state: LevelState;
  j: number;
  /** K of the level (unsigned; |l| = 1 for a linear Π state). */
  k: number;
  /**
   * Which of two levels of equal (J, K) the lines reach: in a perpendicular band of a symmetric
   * top the sign of ΔK (+1: the level reached with ΔK = +1, −1: with ΔK = −1), for a linear Π
   * state +1 for the e levels (P and R lines) and −1 for the f levels (Q lines); 0 otherwise.
   */
  component: number;
  /** Observed term value, cm^-1 (weighted mean over the lines reaching the level). */
  energyObsCm1: number;
  /** Term value from the fitted constants, cm^-1. */
  energyCalcCm1: number;
  /** energyObs − energyCalc, cm^-1. */
  obsMinusCalcCm1: number;
  /** 1σ of energyObs from the lines' uncertainties, cm^-1. */
  sigmaCm1: number;
  /** Lines (not excluded) that reach this level. */
  nLines: number;
  /** Largest minus smallest o − c among those lines, cm^-1 (0 for one line). */
  spreadCm1: number;
  /** energyObs − B̄·J(J+1), cm^-1. */
  reducedObsCm1: number;
  /** energyCalc − B̄·J(J+1), cm^-1. */
  reducedCalcCm1: number;
}

/** Options of levelTermValues. */
export interface LevelTermValuesOptions {
  /** B̄ subtracted in the reduced term value, cm^-1. @default the state's fitted B */
  bBarCm1?: number;
}

/**
 * The levels of one state reached by the (not excluded) lines of a fit, sorted by component, K, J.
 * @param result a successful fit (its model holds the fitted constants, its lines obs and calc)
 * @param state 'upper' or 'lower'
 * @returns one entry per level; energies in cm^-1
 */
export function levelTermValues(result: FitResult, state: LevelState, options: LevelTermValuesOptions = {}): LevelTermValue[] {
  const { model } = result;
  const bBar = options.bBarCm1 ?? model[state].B;
  if (!Number.isFinite(bBar)) throw new Error(`levelTermValues: bBarCm1 must be finite, got ${bBar}`);
  const isPerpendicular = model.band === 'perpendicular';
  const isLinear = model.shape === 'linear';
  interface Acc {
    j: number;
    k: number;
    component: number;
    sumW: number;
    sumWObs: number;
    calc: number;
    min: number;
    max: number;
    n: number;
  }
  const groups = new Map<string, Acc>();
  for (const line of result.lines) {
    if (line.isExcluded) continue;
    const isUpper = state === 'upper';
    const j = isUpper ? line.jUpper : line.jLower;
    const k = isUpper ? line.kUpper : line.kLower;
    let component = 0;
    if (isUpper && isPerpendicular) component = isLinear ? (line.jUpper === line.jLower ? -1 : 1) : Math.sign(line.kUpper - line.kLower);
    const lowerCalc = levelEnergy(model.lower, model.shape, line.jLower, line.kLower);
    // Upper: E' = ν + F''. Lower: F'' = E' − ν with E' from the calculated line.
    const upperCalc = line.calc + lowerCalc;
    const obs = isUpper ? line.obs + lowerCalc : upperCalc - line.obs;
    const calc = isUpper ? upperCalc : lowerCalc;
    const key = `${component},${k},${j}`;
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { j, k, component, sumW: 0, sumWObs: 0, calc, min: Infinity, max: -Infinity, n: 0 }));
    const w = 1 / (line.sigma * line.sigma);
    g.sumW += w;
    g.sumWObs += w * obs;
    const d = obs - calc;
    if (d < g.min) g.min = d;
    if (d > g.max) g.max = d;
    g.n++;
  }
  const out: LevelTermValue[] = [];
  for (const g of groups.values()) {
    const energyObs = g.sumWObs / g.sumW;
    const x = g.j * (g.j + 1);
    out.push({
      state,
      j: g.j,
      k: g.k,
      component: g.component,
      energyObsCm1: energyObs,
      energyCalcCm1: g.calc,
      obsMinusCalcCm1: energyObs - g.calc,
      sigmaCm1: 1 / Math.sqrt(g.sumW),
      nLines: g.n,
      spreadCm1: g.max - g.min,
      reducedObsCm1: energyObs - bBar * x,
      reducedCalcCm1: g.calc - bBar * x,
    });
  }
  out.sort((a, b) => a.component - b.component || a.k - b.k || a.j - b.j);
  return out;
}
