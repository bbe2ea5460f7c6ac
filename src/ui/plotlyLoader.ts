/**
 * Lazy loading of plotly (our partial bundle, plotlyBundle.ts): the page paints first, plotly
 * arrives in its own chunk.
 */
type PlotlyApi = typeof import('plotly.js');

let loading: Promise<PlotlyApi> | null = null;

/** Load plotly once; every chart awaits the same promise. */
export function plotlyLoad(): Promise<PlotlyApi> {
  loading ??= import('./plotlyBundle').then((m) => m.default);
  return loading;
}

// Start the download at boot (this module is imported by the first chart), in parallel with the
// demo fetch and parse, rather than when the first chart mounts.
void plotlyLoad().catch(() => undefined);
