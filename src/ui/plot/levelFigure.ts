/**
 * The reduced term-value plot of one state: E − B̄·J(J+1) (cm^-1) against J, one colour per K,
 * observed levels as markers over the calculated course as a line; levels named by a perturbation
 * finding ringed. Pure: levels and findings in, {data, layout} out.
 */
import type { Data, Layout } from 'plotly.js';
import type { PerturbationFinding } from '../../analysis/perturbationScan';
import type { LevelTermValue } from '../../fit/levelTermValues';
import { kColour, plotTheme } from './plotColours';

/** Is this level inside a finding's J and K range? */
function isFlagged(level: LevelTermValue, findings: readonly PerturbationFinding[]): boolean {
  return findings.some(
    (f) =>
      f.component === level.component &&
      (level.k === f.k || (f.kind === 'stack-jump' && level.k === f.kFrom)) &&
      level.j >= f.jFrom &&
      level.j <= f.jTo,
  );
}

/**
 * Build the figure. Traces per (component, K): calculated line, observed markers (hover gives J, K,
 * o − c and the number of lines), and one trace of rings around flagged levels.
 * @param levels one state's levels (fit/levelTermValues), energies in cm^-1
 * @param findings perturbation findings for the same state (rings)
 * @param ordinate 'reduced': E − B̄·J(J+1) obs over calc; 'obs-minus-calc': E_obs − E_calc (the small
 *   shifts of a perturbation are then not hidden by the K spacing)
 */
export function reducedTermFigure(
  levels: readonly LevelTermValue[],
  findings: readonly PerturbationFinding[],
  isDark: boolean,
  ordinate: 'reduced' | 'obs-minus-calc' = 'reduced',
): { data: Data[]; layout: Partial<Layout> } {
  const isOmc = ordinate === 'obs-minus-calc';
  const t = plotTheme(isDark);
  const stacks = new Map<string, LevelTermValue[]>();
  for (const l of levels) {
    const key = `${l.component},${l.k}`;
    let s = stacks.get(key);
    if (!s) stacks.set(key, (s = []));
    s.push(l);
  }
  const prime = levels[0]?.state === 'lower' ? '″' : '′';
  const data: Data[] = [];
  const keys = [...stacks.keys()].sort((a, b) => {
    const [ca, ka] = a.split(',').map(Number);
    const [cb, kb] = b.split(',').map(Number);
    return ca - cb || ka - kb;
  });
  for (const key of keys) {
    const s = stacks
      .get(key)!
      .slice()
      .sort((a, b) => a.j - b.j);
    const { k, component } = s[0];
    const colour = kColour(k, isDark);
    const name = `K${prime} = ${k}${component > 0 ? ' (+)' : component < 0 ? ' (−)' : ''}`;
    data.push({
      type: 'scatter',
      mode: 'lines',
      x: s.map((l) => l.j),
      y: s.map((l) => (isOmc ? 0 : l.reducedCalcCm1)),
      line: { color: colour, width: 1, dash: component < 0 ? 'dot' : 'solid' },
      name,
      legendgroup: key,
      showlegend: false,
      hoverinfo: 'skip',
    });
    data.push({
      type: 'scatter',
      mode: 'markers',
      x: s.map((l) => l.j),
      y: s.map((l) => (isOmc ? l.obsMinusCalcCm1 : l.reducedObsCm1)),
      marker: { color: colour, size: 5, symbol: component < 0 ? 'triangle-down' : 'circle' },
      name,
      legendgroup: key,
      text: s.map(
        (l) =>
          `J${prime} = ${l.j}, K${prime} = ${l.k}<br>o − c = ${l.obsMinusCalcCm1.toExponential(2)} cm⁻¹ (σ ${l.sigmaCm1.toExponential(1)})<br>${l.nLines} line${l.nLines === 1 ? '' : 's'}`,
      ),
      hovertemplate: '%{text}<extra></extra>',
    });
  }
  const flagged = levels.filter((l) => isFlagged(l, findings));
  if (flagged.length > 0) {
    data.push({
      type: 'scatter',
      mode: 'markers',
      x: flagged.map((l) => l.j),
      y: flagged.map((l) => (isOmc ? l.obsMinusCalcCm1 : l.reducedObsCm1)),
      marker: { color: 'rgba(0,0,0,0)', size: 13, line: { color: t.text, width: 1.5 }, symbol: 'circle-open' },
      name: 'perturbed (see list)',
      hoverinfo: 'skip',
    });
  }
  return {
    data,
    layout: {
      paper_bgcolor: t.paper,
      plot_bgcolor: t.plot,
      font: { color: t.text, size: 11, family: 'system-ui, sans-serif' },
      margin: { l: 80, r: 14, t: 8, b: 44 },
      hovermode: 'closest',
      showlegend: true,
      legend: { orientation: 'v', font: { size: 10 } },
      xaxis: { title: { text: `J${prime}` }, color: t.text, gridcolor: t.grid, zerolinecolor: t.grid },
      yaxis: {
        title: { text: isOmc ? 'E(obs) − E(calc) / cm⁻¹' : 'E − B̄·J(J+1) / cm⁻¹' },
        color: t.text,
        gridcolor: t.grid,
        zerolinecolor: t.grid,
      },
    },
  };
}
