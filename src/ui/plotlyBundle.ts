/**
 * The plotly.js we ship: its core with the two trace types the workbench draws (scatter for traces,
 * residuals and markers; heatmap for the correlation matrix and the Loomis–Wood strips). The
 * prebuilt "cartesian" bundle registers a dozen more trace types; evaluating it took 330–400 ms of
 * one main-thread task in Chromium here, this one 80–110 ms (see the browser benchmark).
 */
import core from 'plotly.js/lib/core';
import heatmap from 'plotly.js/lib/heatmap';
import scatter from 'plotly.js/lib/scatter';

type PlotlyApi = typeof import('plotly.js');

const Plotly = core as unknown as PlotlyApi & { register: (modules: unknown[]) => void };
Plotly.register([scatter, heatmap]);

export default Plotly as PlotlyApi;
