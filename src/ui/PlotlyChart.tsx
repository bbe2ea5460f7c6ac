/**
 * A plotly chart: hands data and layout to Plotly.react, forwards click/relayout/hover events,
 * resizes with its box. No decisions of its own.
 */
import type { Config, Data, Layout, PlotMouseEvent, PlotRelayoutEvent } from 'plotly.js';
import { useEffect, useRef, useState } from 'react';
import { plotlyLoad } from './plotlyLoader';

type PlotDiv = HTMLDivElement & {
  on?: (event: string, handler: (e: unknown) => void) => void;
  removeAllListeners?: (event: string) => void;
};

export interface PlotlyChartProps {
  data: Data[];
  layout: Partial<Layout>;
  config?: Partial<Config>;
  onClick?: (event: PlotMouseEvent) => void;
  onRelayout?: (event: PlotRelayoutEvent) => void;
  /** Called after every drawing of the chart (plotly's afterplot), with the chart element. */
  onAfterPlot?: (el: HTMLElement) => void;
  /** Called while a pan drags the axes (plotly's relayouting), before the chart is redrawn. */
  onRelayouting?: (el: HTMLElement, event: PlotRelayoutEvent) => void;
  /** Called with the chart's width and height in px after each resize. */
  onSize?: (widthPx: number, heightPx: number) => void;
  className?: string;
  /**
   * Draw this update at once instead of after the browser has painted the rest of the page (for
   * zoom and pan, whose only visible result is the chart). @default false
   */
  isUrgent?: boolean;
  /** Accessible name of the chart. */
  label: string;
  /** data-testid for browser tests. */
  testId?: string;
}

const BASE_CONFIG: Partial<Config> = {
  displaylogo: false,
  responsive: false,
  scrollZoom: true,
  modeBarButtonsToRemove: ['select2d', 'lasso2d', 'toImage'],
  doubleClick: 'reset',
  showTips: false,
};

export function PlotlyChart(props: PlotlyChartProps) {
  const ref = useRef<PlotDiv>(null);
  const handlers = useRef(props);
  handlers.current = props;
  const [isReady, setReady] = useState(false);
  const [loadError, setLoadError] = useState<string | null>(null);

  useEffect(() => {
    let cancelled = false;
    plotlyLoad().then(
      () => !cancelled && setReady(true),
      (err: Error) => !cancelled && setLoadError(err.message),
    );
    return () => {
      cancelled = true;
    };
  }, []);

  useEffect(() => {
    if (!isReady || !ref.current) return;
    const el = ref.current;
    let cancelled = false;
    // Draw after the browser has painted the rest of this update (rAF, then a task): a click that
    // adds a table row shows the row first instead of waiting for the SVG redraw, and a prop change
    // superseded before then is never drawn. An urgent update (zoom, pan) is drawn at once.
    const draw = () =>
      void plotlyLoad().then(async (Plotly) => {
        if (cancelled) return;
        await Plotly.react(el, props.data, { autosize: true, ...props.layout }, { ...BASE_CONFIG, ...props.config });
        if (el.on && !el.dataset.bound) {
          el.dataset.bound = '1';
          el.on('plotly_click', (e) => handlers.current.onClick?.(e as PlotMouseEvent));
          el.on('plotly_relayout', (e) => handlers.current.onRelayout?.(e as PlotRelayoutEvent));
          el.on('plotly_afterplot', () => handlers.current.onAfterPlot?.(el));
          el.on('plotly_relayouting', (e) => handlers.current.onRelayouting?.(el, e as PlotRelayoutEvent));
          // The first drawing's afterplot fired before these listeners existed.
          handlers.current.onAfterPlot?.(el);
        }
      });
    let timer = 0;
    let frame = 0;
    if (props.isUrgent) draw();
    else frame = requestAnimationFrame(() => (timer = window.setTimeout(draw, 0)));
    return () => {
      cancelled = true;
      cancelAnimationFrame(frame);
      clearTimeout(timer);
    };
    // isUrgent only chooses how soon a change of the figure is drawn; on its own it is not a change.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [isReady, props.data, props.layout, props.config]);

  useEffect(() => {
    const el = ref.current;
    if (!el || typeof ResizeObserver === 'undefined') return;
    let frame = 0;
    const ro = new ResizeObserver(() => {
      cancelAnimationFrame(frame);
      frame = requestAnimationFrame(() => {
        handlers.current.onSize?.(el.clientWidth, el.clientHeight);
        void plotlyLoad().then((Plotly) => {
          if (el.isConnected && (el as unknown as { _fullLayout?: unknown })._fullLayout) void Plotly.Plots.resize(el);
        });
      });
    });
    ro.observe(el);
    handlers.current.onSize?.(el.clientWidth, el.clientHeight);
    return () => {
      cancelAnimationFrame(frame);
      ro.disconnect();
    };
  }, []);

  useEffect(() => {
    const el = ref.current;
    return () => {
      if (el) void plotlyLoad().then((Plotly) => Plotly.purge(el));
    };
  }, []);

  return (
    <div className={`plot-box ${props.className ?? ''}`} role="figure" aria-label={props.label}>
      {!isReady && !loadError && <div className="plot-loading">Loading plot…</div>}
      {loadError && <div className="plot-loading error">The plotting library could not be loaded: {loadError}</div>}
      <div ref={ref} className="plot-surface" data-testid={props.testId} />
    </div>
  );
}
