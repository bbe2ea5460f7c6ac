import type { LevelProvider } from '../physics/system/levelTypes';

/** One state's place in a joint fit: its provider and where each of its constants comes from. */
export interface SystemFitStatePlan {
  speciesIndex: number;
  state: string;
  provider: LevelProvider;
  /** The state's constants in provider order (cm^-1; ζ dimensionless), updated from p on every evaluation. */
  values: Float64Array;
  /** Per provider constant: floated parameter index, or −1 when fixed. */
  column: Int32Array;
}

/** The level a line ends on, as given by the line. */
export interface SystemFitLevelRef {
  plan: SystemFitStatePlan;
  J: number;
  K: number;
  l: number;
  tag: string;
}

/**
 * The distinct levels that a joint fit's lines reach, each computed once per evaluation: levels are
 * grouped by state and J (one provider call per group, as a provider returns all of a J at once), and
 * a line names its two levels by slot index, so a lower level shared by its P, Q and R lines is
 * looked up and copied once. Flat typed arrays, allocated once per fit.
 */
export interface SystemFitLevelTable {
  /** Number of distinct levels. */
  count: number;
  /** Columns per gradient row (the widest provider's constant count). */
  width: number;
  /** Slot of each referenced level, in the order of the refs given to systemFitLevelTable. */
  slotOfRef: Int32Array;
  /** Plan of each slot. */
  planOfSlot: SystemFitStatePlan[];
  /** Energy of each slot at the last evaluation, cm^-1 (NaN when the provider has no such level). */
  energyCm1: Float64Array;
  /** ∂E/∂(provider constant) of each slot, row-major slot·width + constant index. */
  gradient: Float64Array;
  /**
   * Compute every slot's energy and gradient at the parameters p (floated values by column).
   * @returns null, or the first level a provider does not have, in words
   */
  evaluate(p: Float64Array): string | null;
}

interface Group {
  plan: SystemFitStatePlan;
  J: number;
  kTop: number;
  first: number;
  count: number;
}

/**
 * Build the level table of a joint fit from the levels its lines end on.
 * @param refs every line's two levels (any order; duplicates share a slot)
 */
export function systemFitLevelTable(refs: readonly SystemFitLevelRef[]): SystemFitLevelTable {
  // Slots grouped by (plan, J) so that each provider call fills a contiguous run; within a J a level
  // is keyed by the number (K·3 + l + 1)·nTags + tag index (string keys cost more than the fit).
  const tagIndex = new Map<string, number>();
  for (const r of refs) if (!tagIndex.has(r.tag)) tagIndex.set(r.tag, tagIndex.size);
  const nTags = Math.max(1, tagIndex.size);
  const byPlan = new Map<SystemFitStatePlan, Map<number, Map<number, SystemFitLevelRef>>>();
  const refLabel: Map<number, SystemFitLevelRef>[] = [];
  const refKey = new Float64Array(refs.length);
  refs.forEach((r, i) => {
    let byJ = byPlan.get(r.plan);
    if (!byJ) byPlan.set(r.plan, (byJ = new Map()));
    let byLabel = byJ.get(r.J);
    if (!byLabel) byJ.set(r.J, (byLabel = new Map()));
    const key = (r.K * 3 + r.l + 1) * nTags + tagIndex.get(r.tag)!;
    if (!byLabel.has(key)) byLabel.set(key, r);
    refLabel.push(byLabel);
    refKey[i] = key;
  });
  const groups: Group[] = [];
  const K: number[] = [];
  const l: number[] = [];
  const tag: string[] = [];
  const planOfSlot: SystemFitStatePlan[] = [];
  const slotOf = new Map<Map<number, SystemFitLevelRef>, Map<number, number>>();
  for (const [plan, byJ] of byPlan) {
    for (const [J, byLabel] of byJ) {
      const first = K.length;
      let kTop = 0;
      const slots = new Map<number, number>();
      for (const [key, r] of byLabel) {
        slots.set(key, K.length);
        K.push(r.K);
        l.push(r.l);
        tag.push(r.tag);
        planOfSlot.push(plan);
        kTop = Math.max(kTop, r.K);
      }
      slotOf.set(byLabel, slots);
      groups.push({ plan, J, kTop, first, count: K.length - first });
    }
  }
  const count = K.length;
  const slotOfRef = Int32Array.from(refs, (_, i) => slotOf.get(refLabel[i])!.get(refKey[i])!);
  const width = Math.max(1, ...[...byPlan.keys()].map((p) => p.provider.parameterNames.length));
  const energyCm1 = new Float64Array(count);
  const gradient = new Float64Array(count * width);
  // The level index found last time; a provider keeps its level order, so it is checked and rarely searched again.
  const lastIndex = new Int32Array(count).fill(-1);
  const evaluate = (p: Float64Array): string | null => {
    let missing: string | null = null;
    let lastPlan: SystemFitStatePlan | null = null;
    for (const g of groups) {
      const plan = g.plan;
      if (plan !== lastPlan) {
        for (let c = 0; c < plan.column.length; c++) if (plan.column[c] >= 0) plan.values[c] = p[plan.column[c]];
        lastPlan = plan;
      }
      const nC = plan.provider.parameterNames.length;
      const set = plan.provider.levels(g.J, plan.values, g.kTop);
      for (let s = g.first; s < g.first + g.count; s++) {
        let found = lastIndex[s];
        if (!(found >= 0 && found < set.count && set.K[found] === K[s] && set.l[found] === l[s] && set.tag[found] === tag[s])) {
          found = -1;
          for (let i = 0; i < set.count && found < 0; i++) if (set.K[i] === K[s] && set.l[i] === l[s] && set.tag[i] === tag[s]) found = i;
          lastIndex[s] = found;
        }
        if (found < 0) {
          missing ??= `state '${plan.state}' has no level J=${g.J} K=${K[s]} l=${l[s]}${tag[s] ? ' ' + tag[s] : ''}`;
          energyCm1[s] = NaN;
          continue;
        }
        energyCm1[s] = set.energyCm1[found];
        const from = found * nC;
        const to = s * width;
        for (let c = 0; c < nC; c++) gradient[to + c] = set.gradient[from + c];
      }
    }
    return missing;
  };
  return { count, width, slotOfRef, planOfSlot, energyCm1, gradient, evaluate };
}
