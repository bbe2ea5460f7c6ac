/**
 * File names of exports, built from what the session is about (the trace's file name, else the
 * model's name) rather than from a model file's name with its extension in the middle.
 * Pure: names in, a name out.
 */

/** Extensions dropped from the end of a name (a project's ".ladderbench.json" as one). */
const EXTENSIONS = /(\.ladderbench\.json|\.(csv|tsv|txt|dat|prn|jdx|dx|jcamp|json|md|gz|zip))+$/i;

/**
 * The stem of export file names: the trace file's base name without folders and extensions, else the
 * model's name likewise; only letters, digits, dot, dash and underscore (at most 60); "ladder-bench"
 * when nothing usable is left.
 * @param traceFileName the current trace's file name, or null (untrusted text)
 * @param modelName the model's name (untrusted text)
 */
export function exportStem(traceFileName: string | null, modelName: string): string {
  for (const raw of [traceFileName, modelName]) {
    if (!raw) continue;
    const base = raw.split(/[\\/]/).pop() ?? '';
    const stem = base
      .replace(EXTENSIONS, '')
      .replace(/[^A-Za-z0-9._-]+/g, '_')
      .replace(/^[_.]+|[_.]+$/g, '')
      .slice(0, 60);
    if (stem) return stem;
  }
  return 'ladder-bench';
}
