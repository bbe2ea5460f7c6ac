/**
 * Atoms of a molecular formula such as "CH3F", "C2H6", "(CH3)3N" or "SF6": element symbols
 * (capital letter, optional lower-case letter), counts, parenthesised groups with a count.
 */

/** What formulaAtoms returns. */
export interface FormulaAtoms {
  /** Total number of atoms N. */
  atoms: number;
  /** Count per element symbol. */
  elements: Record<string, number>;
}

/**
 * Count the atoms of a formula.
 * @param formula e.g. "CH3CN"; spaces ignored
 * @returns N and the count per element
 * @throws Error saying what is wrong and at which character
 */
export function formulaAtoms(formula: string): FormulaAtoms {
  const text = formula.replace(/\s+/g, '');
  if (!text) throw new Error('formulaAtoms: the formula is empty');
  let pos = 0;
  const count = (): number => {
    const m = /^\d+/.exec(text.slice(pos));
    if (!m) return 1;
    pos += m[0].length;
    const n = Number(m[0]);
    if (n < 1) throw new Error(`formulaAtoms: a count must be at least 1, got ${m[0]} at character ${pos}`);
    return n;
  };
  const group = (depth: number): Record<string, number> => {
    const out: Record<string, number> = {};
    const add = (el: string, n: number) => (out[el] = (out[el] ?? 0) + n);
    while (pos < text.length) {
      const c = text[pos];
      if (c === '(') {
        pos++;
        const inner = group(depth + 1);
        if (text[pos] !== ')') throw new Error(`formulaAtoms: '(' without ')' in "${formula}"`);
        pos++;
        const n = count();
        for (const [el, k] of Object.entries(inner)) add(el, k * n);
      } else if (c === ')') {
        if (depth === 0) throw new Error(`formulaAtoms: ')' without '(' at character ${pos + 1} of "${formula}"`);
        return out;
      } else {
        const m = /^[A-Z][a-z]?/.exec(text.slice(pos));
        if (!m)
          throw new Error(`formulaAtoms: '${c}' at character ${pos + 1} of "${formula}" is not an element symbol, a count or a bracket`);
        pos += m[0].length;
        add(m[0], count());
      }
    }
    return out;
  };
  const elements = group(0);
  const atoms = Object.values(elements).reduce((a, b) => a + b, 0);
  return { atoms, elements };
}
