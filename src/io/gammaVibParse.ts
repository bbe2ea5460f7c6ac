/**
 * Parse a vibrational representation written as a sum, "3A1 + 3E" (also "3 A1 + E", "A1:3, E:3"),
 * into species → count.
 * @param text the representation
 * @returns counts by species label (as written)
 * @throws Error naming the term that does not read
 */
export function gammaVibParse(text: string): Record<string, number> {
  const out: Record<string, number> = {};
  const terms = text
    .split(/[+,;]/)
    .map((t) => t.trim())
    .filter(Boolean);
  if (terms.length === 0) throw new Error('gammaVibParse: Γ_vib is empty; write it like "3A1 + 3E"');
  for (const term of terms) {
    const m = /^(\d*)\s*([A-Za-zΣΠΔσπδ][\w'″′"^+\-{}]*)$/.exec(term) ?? /^([A-Za-zΣΠΔσπδ][\w'″′"^+\-{}]*)\s*:\s*(\d+)$/.exec(term);
    if (!m) throw new Error(`gammaVibParse: "${term}" does not read as a count and a species (e.g. "3A1")`);
    const isColon = term.includes(':');
    const species = isColon ? m[1] : m[2];
    const n = Number(isColon ? m[2] : m[1] || '1');
    out[species] = (out[species] ?? 0) + n;
  }
  return out;
}
