/**
 * Plotly in React: one div per plot, Plotly.react on every change (data arrays are memoised by the
 * callers so unchanged traces are not recomputed), and a registry of plot divs for image export.
 */
import { useEffect, useRef } from 'react';
import Plotly from 'plotly.js-dist-min';

export type PlotData = Record<string, unknown>;
export type PlotLayout = Record<string, unknown>;

/** Plot divs by name, for Export ("each plot as PNG/SVG"). */
export const plotRegistry = new Map<string, HTMLDivElement>();

export const PLOT_NAMES: Record<string, string> = {
  'trace-board': 'Trace board',
  'pair-check': 'Pair check',
  'travel-time': 'Travel time',
  profile: 'Profile',
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
}

export function Plot({ name, data, layout, config, className, onReady, onRelayout, onDrawn }: PlotProps) {
  const ref = useRef<HTMLDivElement>(null);
  const relayoutRef = useRef(onRelayout);
  relayoutRef.current = onRelayout;
  useEffect(() => {
    const div = ref.current!;
    plotRegistry.set(name, div);
    return () => {
      plotRegistry.delete(name);
      Plotly.purge(div);
    };
  }, [name]);
  useEffect(() => {
    const div = ref.current!;
    const t0 = performance.now();
    let alive = true;
    void Plotly.react(div, data as never, layout as never, { ...PLOT_CONFIG, ...(config ?? {}) } as never).then(() => {
      if (!alive) return;
      const ms = performance.now() - t0;
      onDrawn?.(ms);
      div.dataset.lastDrawMs = ms.toFixed(0);
      div.dataset.drawn = String(Number(div.dataset.drawn ?? '0') + 1);
      const d = div as unknown as { on?: (ev: string, f: (e: Record<string, unknown>) => void) => void; __bwRelayout?: boolean };
      if (!d.__bwRelayout && d.on) {
        d.__bwRelayout = true;
        d.on('plotly_relayout', (e) => relayoutRef.current?.(e));
      }
      onReady?.(div);
    });
    return () => {
      alive = false;
    };
  }, [data, layout, config]);
  return <div ref={ref} className={className ?? 'plot'} data-plot={name} />;
}

/** Pixel -> data conversion from Plotly's laid-out axes (x, y of the main subplot). */
export function pointerToData(div: HTMLDivElement, clientX: number, clientY: number): { x: number; y: number; inside: boolean } | null {
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

export function downloadPlot(name: string, format: 'png' | 'svg', fileName: string): Promise<unknown> {
  const div = plotRegistry.get(name);
  if (!div) return Promise.reject(new Error(`${PLOT_NAMES[name] ?? name} is not on screen.`));
  return Plotly.downloadImage(div as never, { format, filename: fileName, width: div.clientWidth || 900, height: div.clientHeight || 600 } as never);
}
