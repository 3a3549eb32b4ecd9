/**
 * Plotly in React: one div per plot, Plotly.react on every change (data arrays are memoised by the
 * callers so unchanged traces are not recomputed), and a registry of plot divs for image export.
 *
 * Plotly (several MB of script) is loaded on demand (loadPlotly: a dynamic import, started by main.tsx
 * once the page has painted), so the first paint does not wait for it; a plot drawn before it arrives
 * draws when it does.
 */
import { useEffect, useRef } from 'react';

// The strict bundle's types: src/ui/plotly-strict.d.ts (its module object is Plotly itself).
type PlotlyModule = typeof import('plotly.js-strict-dist-min');

let plotly: PlotlyModule | null = null;
let plotlyLoading: Promise<PlotlyModule> | null = null;

/** Plotly, loaded once (the same promise for every caller). */
export function loadPlotly(): Promise<PlotlyModule> {
  plotlyLoading ??= import('plotly.js-strict-dist-min').then((m) => {
    plotly = (m as unknown as { default: PlotlyModule }).default;
    return plotly;
  });
  return plotlyLoading;
}

export type PlotData = Record<string, unknown>;
export type PlotLayout = Record<string, unknown>;

/** Plot divs by name, for Export ("each plot as PNG/SVG"). */
export const plotRegistry = new Map<string, HTMLDivElement>();

/**
 * Overlay plots drawn over a base plot (e.g. the pick markers over the Trace board wiggles, so a pick
 * edit redraws only the markers): base name -> overlay name. Export draws both as one figure.
 */
export const OVERLAYS: Record<string, string> = { 'trace-board': 'trace-board-picks' };

export const PLOT_NAMES: Record<string, string> = {
  'trace-board': 'Trace board',
  'pair-check': 'Pair check',
  'travel-time': 'Travel time',
  profile: 'Profile',
  'design-curves': 'Modulus reduction and damping curves',
  'liquefaction-screen': 'Liquefaction screen',
};

export const COLOURS = {
  S: '#0f766e',
  P: '#b45309',
  ink: '#1f2933',
  rim: '#111827',
  muted: '#9aa5b1',
  grid: '#e4e7eb',
  band: 'rgba(253, 224, 71, 0.32)',
  select: 'rgba(15, 118, 110, 0.08)',
  compare: '#7b8794',
};

export const BASE_LAYOUT: PlotLayout = {
  font: { family: 'system-ui, -apple-system, "Segoe UI", Roboto, sans-serif', size: 11, color: COLOURS.ink },
  paper_bgcolor: '#ffffff',
  plot_bgcolor: '#ffffff',
  showlegend: false,
  hovermode: false,
};

export const PLOT_CONFIG = {
  displaylogo: false,
  responsive: true,
  scrollZoom: true,
  modeBarButtonsToRemove: ['lasso2d', 'select2d', 'toImage', 'sendDataToCloud'],
};

interface PlotProps {
  name: string;
  data: PlotData[];
  layout: PlotLayout;
  config?: Record<string, unknown>;
  className?: string;
  onReady?: (div: HTMLDivElement) => void;
  onRelayout?: (ev: Record<string, unknown>) => void;
  /** Milliseconds the last draw took (for the measurements). */
  onDrawn?: (ms: number) => void;
  /**
   * Draw on the next frame instead of at once, keeping only the latest data (the bottom strip, so the
   * Profile shows a pick edit first and a drag does not queue redraws). 'data': only when the data
   * changed and the layout did not (the Trace board's pick markers: they follow an edit one frame after
   * the Profile, but follow a zoom or pan of the board in the same frame). Every plot's first draw
   * (a pane that appears with new results, such as the Trace board) is deferred too, so the plots
   * already on screen (the Profile) show the new results first.
   */
  defer?: boolean | 'data';
}

export function Plot({ name, data, layout, config, className, onReady, onRelayout, onDrawn, defer }: PlotProps) {
  const ref = useRef<HTMLDivElement>(null);
  const relayoutRef = useRef(onRelayout);
  relayoutRef.current = onRelayout;
  const drawnLayout = useRef<PlotLayout | null>(null);
  // Plot lifecycle: a draw may still be running (Plotly finishes some steps, e.g. auto-margins, after
  // its promise starts) when the component unmounts (a tab switch) or remounts (React's strict mode).
  // Purging then leaves that step a plot without its layout, so the purge waits for the last draw and
  // is skipped when the component came back meanwhile.
  const life = useRef<{ pending: Promise<unknown>; mounted: boolean }>({ pending: Promise.resolve(), mounted: false });
  useEffect(() => {
    const div = ref.current!;
    const l = life.current;
    l.mounted = true;
    plotRegistry.set(name, div);
    // Follow the container's size (pane splitters, a message line appearing), not only the window's.
    let frame = 0;
    const ro = new ResizeObserver(() => {
      cancelAnimationFrame(frame);
      frame = requestAnimationFrame(() => {
        const gd = div as unknown as { _fullLayout?: unknown };
        if (plotly && l.mounted && div.isConnected && gd._fullLayout && div.clientWidth > 0 && div.clientHeight > 0)
          void Promise.resolve(plotly.Plots.resize(div as never) as unknown).catch(() => undefined);
      });
    });
    ro.observe(div);
    return () => {
      ro.disconnect();
      cancelAnimationFrame(frame);
      l.mounted = false;
      if (plotRegistry.get(name) === div) plotRegistry.delete(name);
      void l.pending
        .catch(() => undefined)
        .then(() => {
          if (!l.mounted) plotly?.purge(div);
        });
    };
  }, [name]);
  useEffect(() => {
    const div = ref.current!;
    let alive = true;
    const draw = () => {
      if (!alive || !div.isConnected) return;
      if (!plotly) {
        void loadPlotly().then(() => {
          if (alive) draw();
        });
        return;
      }
      const Plotly = plotly;
      const t0 = performance.now();
      // The config only when it is new to this div: Plotly.react given a config copies and compares the
      // plot's whole context on every call (about 15 ms a draw), and keeps the context when given none.
      const gd = div as unknown as { _fullLayout?: unknown; __bwConfig?: unknown };
      const newConfig = !gd._fullLayout || gd.__bwConfig !== config;
      gd.__bwConfig = config;
      const drawing = newConfig
        ? Plotly.react(div, data as never, layout as never, { ...PLOT_CONFIG, ...(config ?? {}) } as never)
        : Plotly.react(div, data as never, layout as never);
      life.current.pending = drawing;
      div.dataset.startedAt = t0.toFixed(1);
      div.dataset.syncMs = (performance.now() - t0).toFixed(1);
      // The frame that shows this draw (its callback runs just before that frame is painted).
      requestAnimationFrame(() => {
        div.dataset.paintedAt = performance.now().toFixed(1);
        div.dataset.painted = String(Number(div.dataset.painted ?? '0') + 1);
      });
      void drawing.then(() => {
        // Counted even when a newer draw has started meanwhile: this one was on screen.
        const ms = performance.now() - t0;
        div.dataset.lastDrawMs = ms.toFixed(0);
        div.dataset.drawn = String(Number(div.dataset.drawn ?? '0') + 1);
        if (!alive) return;
        onDrawn?.(ms);
        const d = div as unknown as {
          on?: (ev: string, f: (e: Record<string, unknown>) => void) => void;
          __bwRelayout?: boolean;
        };
        if (!d.__bwRelayout && d.on) {
          d.__bwRelayout = true;
          d.on('plotly_relayout', (e) => relayoutRef.current?.(e));
        }
        onReady?.(div);
      });
    };
    const first = drawnLayout.current === null;
    const later = first || (defer === 'data' ? drawnLayout.current === layout : !!defer);
    drawnLayout.current = layout;
    if (!later) {
      draw();
      return () => {
        alive = false;
      };
    }
    // A frame callback, then a timer: the timer runs after that frame is painted, so the frame that
    // shows the Profile is not held back by these draws (a bare timer can run before the frame).
    let timer: ReturnType<typeof setTimeout> | undefined;
    const frame = requestAnimationFrame(() => {
      timer = setTimeout(draw, 0);
    });
    return () => {
      alive = false;
      cancelAnimationFrame(frame);
      if (timer !== undefined) clearTimeout(timer);
    };
  }, [data, layout, config, defer]);
  return <div ref={ref} className={className ?? 'plot'} data-plot={name} />;
}

/**
 * Top and bottom (m) of the hovered interval, as plain numbers so a layout that draws the band changes
 * only when the band moves (not on every new result).
 */
export function hoveredBand(
  intervals: readonly { key: string; topM: number; bottomM: number }[] | undefined,
  key: string | null,
): [number | null, number | null] {
  const r = key ? intervals?.find((x) => x.key === key) : undefined;
  return r ? [r.topM, r.bottomM] : [null, null];
}

/**
 * The hovered interval as a band across the whole plot width, below the data: one shape, or none when
 * nothing is hovered. `toAxis` turns a depth in m into the plot's depth axis (the user's unit).
 */
export function bandShapes(
  topM: number | null,
  bottomM: number | null,
  toAxis: (depthM: number) => number,
): Record<string, unknown>[] {
  if (topM === null || bottomM === null) return [];
  return [
    {
      type: 'rect',
      xref: 'paper',
      x0: 0,
      x1: 1,
      yref: 'y',
      y0: toAxis(topM),
      y1: toAxis(bottomM),
      fillcolor: COLOURS.band,
      line: { width: 0 },
      layer: 'below',
    },
  ];
}

/** Pixel -> data conversion from Plotly's laid-out axes (x, y of the main subplot). */
export function pointerToData(
  div: HTMLDivElement,
  clientX: number,
  clientY: number,
): { x: number; y: number; inside: boolean } | null {
  const fl = (div as unknown as { _fullLayout?: { xaxis: Axis; yaxis: Axis } })._fullLayout;
  if (!fl) return null;
  const box = div.getBoundingClientRect();
  const px = clientX - box.left - fl.xaxis._offset;
  const py = clientY - box.top - fl.yaxis._offset;
  const inside = px >= 0 && py >= 0 && px <= fl.xaxis._length && py <= fl.yaxis._length;
  return { x: fl.xaxis.p2l(px), y: fl.yaxis.p2l(py), inside };
}

/** Data -> pixel (relative to the div) on the main subplot. */
export function dataToPixel(div: HTMLDivElement, x: number, y: number): { px: number; py: number } | null {
  const fl = (div as unknown as { _fullLayout?: { xaxis: Axis; yaxis: Axis } })._fullLayout;
  if (!fl) return null;
  return { px: fl.xaxis._offset + fl.xaxis.l2p(x), py: fl.yaxis._offset + fl.yaxis.l2p(y) };
}

interface Axis {
  _offset: number;
  _length: number;
  p2l: (p: number) => number;
  l2p: (v: number) => number;
}

export async function downloadPlot(name: string, format: 'png' | 'svg', fileName: string): Promise<unknown> {
  const Plotly = await loadPlotly();
  const div = plotRegistry.get(name);
  if (!div) return Promise.reject(new Error(`${PLOT_NAMES[name] ?? name} is not on screen.`));
  const size = { format, filename: fileName, width: div.clientWidth || 900, height: div.clientHeight || 600 };
  const over = OVERLAYS[name] ? plotRegistry.get(OVERLAYS[name]) : undefined;
  if (over) {
    // Base and overlay as one figure, with the axes as the user sees them.
    const base = div as unknown as {
      data: PlotData[];
      layout: PlotLayout;
      _fullLayout: { xaxis: { range: number[] }; yaxis: { range: number[] } };
    };
    const top = over as unknown as { data: PlotData[] };
    const layout = {
      ...base.layout,
      xaxis: { ...(base.layout.xaxis as object), range: [...base._fullLayout.xaxis.range] },
      yaxis: { ...(base.layout.yaxis as object), range: [...base._fullLayout.yaxis.range] },
    };
    return Plotly.downloadImage({ data: [...base.data, ...top.data], layout } as never, size as never);
  }
  return Plotly.downloadImage(div as never, size as never);
}
