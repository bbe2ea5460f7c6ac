/**
 * Add dir units of the last typed decimal place to a number written as text ("0.2913" ± 1 → "0.2914").
 * @returns the nudged text, or null when the text is not a plain number
 */
export function nudgeText(text: string, dir: number): string | null {
  const m = /^\s*([-+]?)(\d*)(?:\.(\d*))?(?:[eE]([-+]?\d+))?\s*$/.exec(text);
  if (!m || (m[2] === '' && (m[3] ?? '') === '')) return null;
  const decimals = (m[3] ?? '').length;
  const exp = m[4] ? Number(m[4]) : 0;
  const v = Number(text);
  const step = 10 ** (exp - decimals);
  const next = v + dir * step;
  if (m[4]) {
    const mant = next / 10 ** exp;
    return `${mant.toFixed(decimals)}e${exp}`;
  }
  return next.toFixed(decimals);
}
