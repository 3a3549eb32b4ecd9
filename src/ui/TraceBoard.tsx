/**
 * Trace board: working traces stacked by depth (depth down, time right), picks drawn on them by origin
 * (auto = hollow circle, edited = filled circle with a dark rim, excluded = small grey cross), click to
 * place a pick on the nearest trace, drag to move it, keys to nudge (see KeyboardHelp).
 */
import { EDITABLE_METHODS, methodInfo } from '../core';
import { useEffect, useMemo, useRef, useState } from 'react';
import type { Wave } from '../core';
import type { EditablePickMethod } from '../core';
import type { TestKind } from '../core';
import type { IntervalKey } from '../core';
import type { Station } from '../core';
import { reversedDirections } from '../core';
import { stationWaveKey } from '../core';
import { currentDerived, useDeferredResults } from '../state/derived';
import type { IntervalValue } from '../core';
import { beginPickDrag, movePickDrag } from '../state/edits';
import { rawRecords } from '../state/raw';
import { setView, useApp, useResults } from '../state/store';
import { decimateMinMax, dropFlatRuns, mean, medianStep, peakAbs } from './decimate';
import { boardStations, effectiveReceiver, isMethod, pickFor, receiversOf, workingTraceLabel } from './picks';
import { HitsDetail } from './HitsDetail';
import { agc, fittedWindow, timeVariantGain } from './traceDisplay';
import { BASE_LAYOUT, bandShapes, COLOURS, hoveredBand, Plot, pointerToData, type PlotData } from './plot';
import { disp, fmt, label, useUnits } from './units';
import { hardwareWebgl } from './gl';

/** Above this many traces the wiggles are drawn with WebGL (scattergl) when the GPU does the drawing. */
export const WEBGL_TRACE_THRESHOLD = 40;

/** Excluded-pick cross: a grey dark enough to see on the wiggles, still clearly not a pick colour. */
const EXCLUDED_GREY = '#616e7c';
/** An excluded station's trace. */
const GREYED_TRACE = '#b8c2cc';

// Double-click and the axis buttons are handled by the board itself ("see all" = whole record, every
// station), so the drawn traces are always decimated for the window on screen.
const BOARD_CONFIG = {
  doubleClick: false,
  // Zoom and pan are the board's own tools (Pick / Zoom / Pan), so the mode bar keeps only zoom in/out.
  modeBarButtonsToRemove: [
    'lasso2d',
    'select2d',
    'toImage',
    'sendDataToCloud',
    'autoScale2d',
    'resetScale2d',
    'zoom2d',
    'pan2d',
  ],
};
const OVERLAY_CONFIG = { staticPlot: true, responsive: true };

interface Range {
  t0S: number;
  t1S: number;
}

function fullRange(stations: readonly Station[]): Range | null {
  if (!stations.length) return null;
  let t0 = Infinity;
  let t1 = -Infinity;
  for (const s of stations) {
    const w = s.working;
    t0 = Math.min(t0, w.delayS);
    t1 = Math.max(t1, w.delayS + (w.samples.length - 1) * w.sampleIntervalS);
  }
  return { t0S: t0, t1S: t1 };
}

interface WiggleInput {
  stations: Station[];
  range: Range;
  columns: number;
  stepDisp: number;
  depthOf: (s: Station) => number;
  normalise: 'trace' | 'common' | 'agc' | 'tvg';
  /** Samples after the display gain (AGC or t-power) per station key, when that mode is on. */
  gained: ReadonlyMap<string, Float64Array> | null;
  /** Station keys whose pick is excluded: drawn greyed. */
  excluded: ReadonlySet<string>;
  gain: number;
  /** Clip level in trace spacings. */
  clip: number;
  fill: boolean;
  hitView: 'working' | 'both';
  kind: TestKind;
  gl: boolean;
  colour: string;
  /** A third of a pixel in depth units: flat runs closer than this to a straight line are not drawn point by point. */
  flatTolY: number;
}

/** One long polyline per style with NaN gaps between traces (few Plotly traces draw fastest). */
function wiggles(inp: WiggleInput): PlotData[] {
  const { stations, range, columns, stepDisp, gain } = inp;
  const halfAmp = 0.5 * stepDisp * gain;
  const clip = inp.clip * stepDisp;
  const type = inp.gl ? 'scattergl' : 'scatter';
  const commonPeak =
    inp.normalise === 'common' ? Math.max(1e-30, ...stations.map((s) => peakAbs(s.working.samples))) : 0;
  const parts = {
    solid: [] as number[][],
    dashed: [] as number[][],
    lobes: [] as number[][],
    hatch: [] as number[][],
    greyed: [] as number[][],
  };
  const push = (arr: number[][], t: Float64Array, y: Float64Array, n: number) => {
    const xs: number[] = new Array(n + 1);
    const ys: number[] = new Array(n + 1);
    for (let i = 0; i < n; i++) {
      xs[i] = t[i] * 1000;
      ys[i] = y[i];
    }
    xs[n] = NaN;
    ys[n] = NaN;
    arr.push(xs, ys);
  };
  for (const s of stations) {
    const base = inp.depthOf(s);
    if (inp.hitView === 'both' && s.hits.length > 1) {
      const [first, second] = reversedDirections(inp.kind);
      const raws = s.hits
        .map((h) => ({ h, tr: rawRecords.get(h.recordId)?.traces.find((t) => t.channel === h.channel) }))
        .filter((x): x is { h: typeof x.h; tr: NonNullable<typeof x.tr> } => !!x.tr);
      const centred = raws.map((r) => {
        const m = mean(r.tr.samples);
        const c = new Float64Array(r.tr.samples.length);
        for (let i = 0; i < c.length; i++) c[i] = r.tr.samples[i] - m;
        return { ...r, c };
      });
      const peak = Math.max(1e-30, ...centred.map((r) => peakAbs(r.c)));
      for (const r of centred) {
        const d = decimateMinMax(r.c, r.tr.delayS, r.tr.sampleIntervalS, range.t0S, range.t1S, columns);
        const y = new Float64Array(d.length);
        for (let i = 0; i < d.length; i++) y[i] = base - Math.max(-clip, Math.min(clip, (d.v[i] / peak) * halfAmp));
        push(r.h.hit === second && r.h.hit !== first ? parts.dashed : parts.solid, d.t, y, d.length);
      }
      continue;
    }
    const w = s.working;
    const samples = inp.gained?.get(s.key) ?? w.samples;
    const peak = inp.normalise === 'common' ? commonPeak : Math.max(1e-30, peakAbs(samples));
    const dec = decimateMinMax(samples, w.delayS, w.sampleIntervalS, range.t0S, range.t1S, columns);
    const y = new Float64Array(dec.length);
    for (let i = 0; i < dec.length; i++) y[i] = base - Math.max(-clip, Math.min(clip, (dec.v[i] / peak) * halfAmp));
    const d = { t: dec.t, length: dropFlatRuns(dec.t, y, dec.length, inp.flatTolY) };
    const greyed = inp.excluded.has(s.key);
    push(greyed ? parts.greyed : parts.solid, d.t, y, d.length);
    if (inp.fill && !greyed && d.length > 1) {
      if (inp.gl) {
        // WebGL: the positive lobes as one short vertical stroke per pixel column (reads as a fill;
        // a 'toself' fill of hundreds of segments is very slow in the WebGL renderer).
        const lt = new Float64Array(3 * d.length);
        const ly = new Float64Array(3 * d.length);
        let k = 0;
        for (let i = 0; i < d.length; i++) {
          if (!(y[i] < base)) continue;
          lt[k] = d.t[i];
          ly[k++] = base;
          lt[k] = d.t[i];
          ly[k++] = y[i];
          lt[k] = NaN;
          ly[k++] = NaN;
        }
        if (k) push(parts.hatch, lt, ly, k);
      } else {
        // Variable-area fill of the positive lobes: the positive envelope closed along the baseline.
        // Runs along the baseline keep only their two ends (same polygon, far fewer points).
        const ly = new Float64Array(d.length + 2);
        const lt = new Float64Array(d.length + 2);
        let k = 0;
        lt[k] = d.t[0];
        ly[k++] = base;
        for (let i = 0; i < d.length; i++) {
          const yi = Math.min(base, y[i]);
          const onBase = yi === base;
          if (
            onBase &&
            i > 0 &&
            i + 1 < d.length &&
            Math.min(base, y[i - 1]) === base &&
            Math.min(base, y[i + 1]) === base
          )
            continue;
          lt[k] = d.t[i];
          ly[k++] = yi;
        }
        lt[k] = d.t[d.length - 1];
        ly[k++] = base;
        push(parts.lobes, lt, ly, k);
      }
    }
  }
  const flat = (arr: number[][], k: 0 | 1) => {
    const out: number[] = [];
    for (let i = k; i < arr.length; i += 2) for (const v of arr[i]) out.push(v);
    return out;
  };
  const out: PlotData[] = [];
  if (parts.lobes.length) {
    out.push({
      type,
      mode: 'lines',
      x: flat(parts.lobes, 0),
      y: flat(parts.lobes, 1),
      fill: 'toself',
      fillcolor: inp.colour + '55',
      line: { width: 0, color: inp.colour },
      hoverinfo: 'skip',
      name: 'lobes',
    });
  }
  if (parts.hatch.length) {
    out.push({
      type,
      mode: 'lines',
      x: flat(parts.hatch, 0),
      y: flat(parts.hatch, 1),
      line: { width: 1, color: inp.colour + '77' },
      hoverinfo: 'skip',
      name: 'lobes',
      connectgaps: false,
    });
  }
  out.push({
    type,
    mode: 'lines',
    x: flat(parts.solid, 0),
    y: flat(parts.solid, 1),
    line: { width: 1, color: COLOURS.ink },
    hoverinfo: 'skip',
    name: 'wiggles',
    connectgaps: false,
  });
  if (parts.greyed.length) {
    // Traces whose pick is excluded: pale grey, no fill (still readable, clearly out of the result).
    out.push({
      type,
      mode: 'lines',
      x: flat(parts.greyed, 0),
      y: flat(parts.greyed, 1),
      line: { width: 1, color: GREYED_TRACE },
      hoverinfo: 'skip',
      name: 'excluded traces',
      connectgaps: false,
    });
  }
  if (parts.dashed.length) {
    out.push({
      type,
      mode: 'lines',
      x: flat(parts.dashed, 0),
      y: flat(parts.dashed, 1),
      line: { width: 1, color: '#52606d', dash: 'dash' },
      hoverinfo: 'skip',
      name: 'second direction',
      connectgaps: false,
    });
  }
  return out;
}

/**
 * At most a third of a screen pixel in depth units (the plot shows the depths plus one trace step each
 * side), rounded down to a power of two so that small changes of the board's height (a message bar
 * appearing) do not decimate and draw the traces again.
 */
function flatTolerance(depths: number[], stepDisp: number, plotHeightPx: number): number {
  if (!depths.length || !(plotHeightPx > 0)) return 0;
  const span = Math.max(...depths) - Math.min(...depths) + 2 * stepDisp;
  const tol = span / plotHeightPx / 3;
  return tol > 0 && Number.isFinite(tol) ? 2 ** Math.floor(Math.log2(tol)) : 0;
}

/** The chosen interval whose two stations are both on the board and bracket the pointer's depth. */
function intervalAtDepth(
  intervals: readonly IntervalValue[],
  wave: Wave,
  stations: readonly Station[],
  depthOf: (s: Station) => number,
  y: number,
): IntervalKey | null {
  const onBoard = new Map(stations.map((s) => [s.key, depthOf(s)]));
  for (const r of intervals) {
    if (r.wave !== wave || !r.chosen) continue;
    const a = onBoard.get(r.stationA);
    const b = onBoard.get(r.stationB);
    const lo = Math.min(a ?? NaN, b ?? NaN);
    const hi = Math.max(a ?? NaN, b ?? NaN);
    if (y >= lo && y <= hi) return r.key;
  }
  return null;
}

/** A number input that commits on Enter or leaving the field (typing does not redraw at every key). */
function NumberBox({ value, label, onCommit }: { value: number; label: string; onCommit: (v: number) => void }) {
  const [text, setText] = useState<string | null>(null);
  const commitText = () => {
    if (text === null) return;
    const v = Number(text);
    setText(null);
    if (Number.isFinite(v)) onCommit(v);
  };
  return (
    <input
      className="num"
      type="text"
      inputMode="decimal"
      size={5}
      aria-label={label}
      value={text ?? value.toFixed(value >= 100 ? 0 : 1)}
      onChange={(e) => setText(e.target.value)}
      onBlur={commitText}
      onKeyDown={(e) => {
        if (e.key === 'Enter') commitText();
        if (e.key === 'Escape') setText(null);
      }}
    />
  );
}

export function TraceBoard() {
  // Deferred: new results reach the board after the Profile has drawn them (state/derived.ts).
  const { prepared, derived } = useDeferredResults();
  const latestPrepared = useResults((s) => s.prepared);
  const status = useResults((s) => s.status);
  const survey = useApp((s) => s.survey);
  const edits = useApp((s) => s.edits);
  const view = useApp((s) => s.view);
  const units = useUnits();
  // Memoised on the arrays, not the result object: the late Vs30 spread does not redraw the board.
  const picks = derived?.picks;
  const intervals = derived?.intervals;
  // The user's view: time range (ms) and depth range (display units, [bottom, top]); null = the default
  // (time fitted to the arrivals, every station). Always applied as explicit axis ranges, so the traces
  // are decimated for exactly the window on screen.
  const [xMs, setXMs] = useState<[number, number] | null>(null);
  const [yR, setYR] = useState<[number, number] | null>(null);
  const [hitsOpen, setHitsOpen] = useState(true);
  useEffect(() => setHitsOpen(true), [view.selectedStation]);
  const [width, setWidth] = useState(900);
  const [height, setHeight] = useState(600);
  const wrapRef = useRef<HTMLDivElement>(null);
  const divRef = useRef<HTMLDivElement | null>(null);
  const [drawMs, setDrawMs] = useState<number | null>(null);
  const wiggleMs = useRef(0);

  const wave: Wave = view.wave;
  const allStations = prepared?.stations ?? [];
  const receiver = effectiveReceiver(allStations, wave, view.receiver);
  const stations = useMemo(() => boardStations(allStations, wave, receiver), [allStations, wave, receiver]);
  const full = useMemo(() => fullRange(stations), [stations]);
  // Fitted once per board (wave, receiver, records) and when the first picks arrive, not on every edit.
  const picksRef = useRef(picks);
  picksRef.current = picks;
  const hasPicks = !!picks;
  const fitted = useMemo(() => {
    const keys = new Set(stations.map((s) => s.key));
    const times = (picksRef.current ?? [])
      .filter((p) => keys.has(p.stationKey) && p.wave === wave && isMethod(p, 'onset'))
      .map((p) => p.timeS);
    return fittedWindow(
      stations.map((s) => ({
        startS: s.working.delayS,
        endS: s.working.delayS + (s.working.samples.length - 1) * s.working.sampleIntervalS,
        searchStartS: s.working.searchStartS,
        searchEndS: s.working.searchEndS,
      })),
      times,
    );
  }, [stations, wave, hasPicks]);
  // Memoised: a new object on every render would decimate and draw again after every draw.
  const shown: Range | null = useMemo(
    () => (xMs ? { t0S: xMs[0] / 1000, t1S: xMs[1] / 1000 } : (fitted ?? full)),
    [xMs, fitted, full],
  );
  const excludedKeys = useMemo(() => {
    const out = new Set<string>();
    const ex = new Set(edits.excludedStations);
    for (const s of stations) if (ex.has(stationWaveKey(s.key, wave))) out.add(s.key);
    return out;
  }, [stations, wave, edits.excludedStations]);
  const gained = useMemo(() => {
    if (view.normalise !== 'agc' && view.normalise !== 'tvg') return null;
    const out = new Map<string, Float64Array>();
    for (const s of stations) {
      const w = s.working;
      out.set(
        s.key,
        view.normalise === 'agc'
          ? agc(w.samples, w.sampleIntervalS, view.agcMs / 1000)
          : timeVariantGain(w.samples, w.delayS, w.sampleIntervalS, 1),
      );
    }
    return out;
  }, [stations, view.normalise, view.agcMs]);
  const depthOf = useMemo(() => (s: Station) => disp('depth', units, s.depthM), [units]);
  const stepDisp = useMemo(() => medianStep(stations.map(depthOf), 1), [stations, depthOf]);
  const gl =
    view.renderer === 'webgl' ||
    (view.renderer === 'auto' && stations.length > WEBGL_TRACE_THRESHOLD && hardwareWebgl());
  const colour = wave === 'S' ? COLOURS.S : COLOURS.P;
  // "Both directions" only when a station on the board has more than one hit.
  const reversible = stations.some((s) => s.hits.length > 1);
  const hitView = reversible ? view.hitView : 'working';

  useEffect(() => {
    setXMs(null);
    setYR(null);
  }, [wave, receiver, prepared]);

  useEffect(() => {
    const el = wrapRef.current;
    if (!el) return;
    const ro = new ResizeObserver(() => {
      setWidth(Math.max(200, el.clientWidth));
      setHeight(Math.max(100, el.clientHeight));
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, []);

  const flatTolY = useMemo(
    () => flatTolerance(stations.map(depthOf), stepDisp, height - 48),
    [stations, depthOf, stepDisp, height],
  );
  const wiggleData = useMemo(() => {
    if (!shown || !stations.length) return [];
    const t0 = performance.now();
    const out = wiggles({
      stations,
      range: shown,
      columns: Math.max(100, width - 90),
      flatTolY: flatTolY,
      stepDisp,
      depthOf,
      normalise: view.normalise,
      gained,
      excluded: excludedKeys,
      clip: view.clip,
      gain: view.gain,
      fill: view.fill && hitView === 'working' && !gl,
      hitView,
      kind: survey.kind,
      gl,
      colour,
    });
    wiggleMs.current = performance.now() - t0;
    return out;
  }, [
    stations,
    shown,
    width,
    flatTolY,
    stepDisp,
    depthOf,
    view.normalise,
    gained,
    excludedKeys,
    view.clip,
    view.gain,
    view.fill,
    hitView,
    survey.kind,
    gl,
    colour,
  ]);

  // Pick markers (shape first): a short tick across the trace at the pick time, so the onset itself
  // stays visible, and the symbol set just above the trace (auto = hollow circle, edited = filled with
  // a dark rim, excluded = small grey cross; the excluded trace is also greyed).
  const pickData = useMemo(() => {
    if (!picks) return [];
    type Group = { x: number[]; y: number[]; tx: number[]; ty: number[]; text: string[] };
    const g = (): Group => ({ x: [], y: [], tx: [], ty: [], text: [] });
    const groups = { auto: g(), edited: g(), excluded: g() };
    const tick = 0.28 * stepDisp;
    const above = 0.5 * stepDisp;
    for (const s of stations) {
      const p = pickFor(picks, s.key, wave, view.editMethod);
      if (!p) continue;
      const origin = excludedKeys.has(s.key) ? 'excluded' : p.origin;
      const t = p.timeS * 1000;
      const y = depthOf(s);
      const gr = groups[origin];
      gr.x.push(t);
      gr.y.push(y - above);
      gr.text.push(s.key);
      gr.tx.push(t, t, NaN);
      gr.ty.push(y - tick, y + tick, NaN);
    }
    const ticks = (gr: Group, color: string, name: string) => ({
      type: 'scatter',
      mode: 'lines',
      name,
      x: gr.tx,
      y: gr.ty,
      line: { width: 2, color },
      hoverinfo: 'skip',
      connectgaps: false,
    });
    return [
      ticks(groups.auto, colour, 'auto pick ticks'),
      ticks(groups.edited, COLOURS.rim, 'edited pick ticks'),
      ticks(groups.excluded, EXCLUDED_GREY, 'excluded pick ticks'),
      {
        type: 'scatter',
        mode: 'markers',
        name: 'auto picks',
        x: groups.auto.x,
        y: groups.auto.y,
        customdata: groups.auto.text,
        marker: { symbol: 'circle-open', size: 8, color: colour, line: { width: 2, color: colour } },
        hoverinfo: 'skip',
      },
      {
        type: 'scatter',
        mode: 'markers',
        name: 'edited picks',
        x: groups.edited.x,
        y: groups.edited.y,
        customdata: groups.edited.text,
        marker: { symbol: 'circle', size: 8, color: colour, line: { width: 1.5, color: COLOURS.rim } },
        hoverinfo: 'skip',
      },
      {
        type: 'scatter',
        mode: 'markers',
        name: 'excluded picks',
        x: groups.excluded.x,
        y: groups.excluded.y,
        customdata: groups.excluded.text,
        marker: { symbol: 'x-thin-open', size: 7, color: EXCLUDED_GREY, line: { width: 2, color: EXCLUDED_GREY } },
        hoverinfo: 'skip',
      },
    ] as PlotData[];
  }, [picks, stations, wave, view.editMethod, depthOf, colour, excludedKeys, stepDisp]);

  const [bandTopM, bandBottomM] = hoveredBand(intervals, view.hoveredInterval);
  const layout = useMemo(() => {
    const shapes = bandShapes(bandTopM, bandBottomM, (m) => disp('depth', units, m));
    const sel = stations.find((s) => s.key === view.selectedStation);
    if (sel) {
      const y = depthOf(sel);
      shapes.push({
        type: 'rect',
        xref: 'paper',
        x0: 0,
        x1: 1,
        yref: 'y',
        y0: y - stepDisp / 2,
        y1: y + stepDisp / 2,
        fillcolor: COLOURS.select,
        line: { width: 1, color: colour, dash: 'dot' },
        layer: 'below',
      });
    }
    const depths = stations.map(depthOf);
    const yMin = depths.length ? Math.min(...depths) - stepDisp : 0;
    const yMax = depths.length ? Math.max(...depths) + stepDisp : 1;
    return {
      ...BASE_LAYOUT,
      margin: { l: 56, r: 12, t: 8, b: 40 },
      dragmode: view.tool === 'zoom' ? 'zoom' : false,
      xaxis: {
        title: { text: 'Time after trigger (ms)' },
        range: shown ? [shown.t0S * 1000, shown.t1S * 1000] : undefined,
        autorange: false,
        zeroline: false,
        gridcolor: COLOURS.grid,
      },
      yaxis: {
        title: { text: `Depth (${label('depth', units)})` },
        range: yR ?? [yMax, yMin],
        autorange: false,
        zeroline: false,
        gridcolor: COLOURS.grid,
      },
      shapes,
    };
  }, [bandTopM, bandBottomM, view.selectedStation, view.tool, stations, depthOf, stepDisp, units, shown, yR, colour]);

  // The pick markers sit on an overlay plot with the same axes: a pick edit redraws only the markers,
  // never the wiggles (Plotly recomputes every trace of a plot when any trace's data changes).
  const [axes, setAxes] = useState<{ x: number[]; y: number[] } | null>(null);
  const syncAxes = () => {
    const fl = (
      divRef.current as unknown as { _fullLayout?: { xaxis: { range: number[] }; yaxis: { range: number[] } } } | null
    )?._fullLayout;
    if (!fl) return;
    const next = { x: [...fl.xaxis.range], y: [...fl.yaxis.range] };
    setAxes((a) =>
      a && a.x[0] === next.x[0] && a.x[1] === next.x[1] && a.y[0] === next.y[0] && a.y[1] === next.y[1] ? a : next,
    );
  };
  const overlayLayout = useMemo(() => {
    const x = axes?.x ?? (layout.xaxis as { range?: number[] }).range;
    const y = axes?.y ?? (layout.yaxis as { range?: number[] }).range;
    const hidden = { visible: false, fixedrange: true, zeroline: false, showgrid: false };
    return {
      ...BASE_LAYOUT,
      paper_bgcolor: 'rgba(0,0,0,0)',
      plot_bgcolor: 'rgba(0,0,0,0)',
      margin: layout.margin,
      dragmode: false,
      xaxis: { ...hidden, range: x },
      yaxis: { ...hidden, range: y },
    };
  }, [axes, layout]);

  const seeAll = () => {
    setXMs(full ? [full.t0S * 1000, full.t1S * 1000] : null);
    setYR(null);
  };
  const fitArrivals = () => {
    setXMs(null);
    setYR(null);
  };
  const seeAllRef = useRef(seeAll);
  const lastPress = useRef<{ t: number; x: number; y: number } | null>(null);
  seeAllRef.current = seeAll;
  const onRelayout = (e: Record<string, unknown>) => {
    if (e['xaxis.autorange'] || e['yaxis.autorange']) {
      seeAll();
      return;
    }
    const pair = (ax: 'xaxis' | 'yaxis'): [number, number] | null => {
      const a = e[`${ax}.range[0]`];
      const b = e[`${ax}.range[1]`];
      if (typeof a === 'number' && typeof b === 'number') return [a, b];
      const r = e[`${ax}.range`];
      return Array.isArray(r) && typeof r[0] === 'number' && typeof r[1] === 'number' ? [r[0], r[1]] : null;
    };
    const x = pair('xaxis');
    const y = pair('yaxis');
    if (x) setXMs(x[0] < x[1] ? x : [x[1], x[0]]);
    if (y) setYR(y);
    syncAxes();
  };

  // Pick tool: click places a pick on the nearest trace, dragging moves it; one undo step per gesture.
  useEffect(() => {
    const div = wrapRef.current;
    if (!div) return;
    const nearest = (y: number) => {
      let best: Station | null = null;
      for (const s of stations) if (!best || Math.abs(depthOf(s) - y) < Math.abs(depthOf(best) - y)) best = s;
      return best;
    };
    const onDown = (ev: MouseEvent) => {
      const st = useApp.getState().view;
      const plotDiv = divRef.current;
      if (ev.button !== 0 || !plotDiv) return;
      const p = pointerToData(plotDiv, ev.clientX, ev.clientY);
      if (!p || !p.inside) return;
      const s = nearest(p.y);
      if (!s) return;
      if (st.tool !== 'pick') {
        // A second press within 400 ms at the same place: "see all" (Plotly's drag cover takes the
        // browser's dblclick event, so the two presses are timed here).
        const now = performance.now();
        const last = lastPress.current;
        lastPress.current = { t: now, x: ev.clientX, y: ev.clientY };
        if (last && now - last.t < 400 && Math.abs(last.x - ev.clientX) < 6 && Math.abs(last.y - ev.clientY) < 6) {
          lastPress.current = null;
          seeAllRef.current();
          return;
        }
        if (st.tool === 'pan') {
          // Pan is the board's own drag: the traces are decimated and drawn again for the window as it moves.
          ev.preventDefault();
          ev.stopPropagation();
          const fl = (
            plotDiv as unknown as {
              _fullLayout: {
                xaxis: { range: number[]; _length: number };
                yaxis: { range: number[]; _length: number };
              };
            }
          )._fullLayout;
          const xr = [...fl.xaxis.range];
          const yr = [...fl.yaxis.range];
          const vx = (xr[1] - xr[0]) / fl.xaxis._length;
          const vy = (yr[0] - yr[1]) / fl.yaxis._length;
          let frame = 0;
          let last = { x: ev.clientX, y: ev.clientY };
          const apply = () => {
            const dx = (ev.clientX - last.x) * vx;
            const dy = (last.y - ev.clientY) * vy;
            setXMs([xr[0] + dx, xr[1] + dx]);
            setYR([yr[0] - dy, yr[1] - dy]);
          };
          const onMove = (e: MouseEvent) => {
            last = { x: e.clientX, y: e.clientY };
            if (!frame)
              frame = requestAnimationFrame(() => {
                frame = 0;
                apply();
              });
          };
          const onUp = (e: MouseEvent) => {
            if (frame) cancelAnimationFrame(frame);
            window.removeEventListener('mousemove', onMove, true);
            window.removeEventListener('mouseup', onUp, true);
            if (Math.abs(e.clientX - ev.clientX) < 3 && Math.abs(e.clientY - ev.clientY) < 3)
              setView({ selectedStation: s.key, selectedInterval: null });
            else {
              last = { x: e.clientX, y: e.clientY };
              apply();
            }
          };
          window.addEventListener('mousemove', onMove, true);
          window.addEventListener('mouseup', onUp, true);
          return;
        }
        // Zoom: select on a click that did not move (a re-render during Plotly's drag would end it).
        const x0 = ev.clientX;
        const y0 = ev.clientY;
        const onClickUp = (e: MouseEvent) => {
          window.removeEventListener('mouseup', onClickUp, true);
          if (Math.abs(e.clientX - x0) < 3 && Math.abs(e.clientY - y0) < 3)
            setView({ selectedStation: s.key, selectedInterval: null });
        };
        window.addEventListener('mouseup', onClickUp, true);
        return;
      }
      setView({ selectedStation: s.key, selectedInterval: null });
      ev.preventDefault();
      ev.stopPropagation();
      const method = st.editMethod;
      const place = (clientX: number) => {
        const q = pointerToData(plotDiv, clientX, ev.clientY);
        if (!q) return null;
        return q.x / 1000;
      };
      const t0 = place(ev.clientX);
      if (t0 === null) return;
      beginPickDrag(s.key, s.wave, method, t0, st.snap);
      let frame = 0;
      let lastX = ev.clientX;
      const onMove = (e: MouseEvent) => {
        lastX = e.clientX;
        if (frame) return;
        frame = requestAnimationFrame(() => {
          frame = 0;
          const t = place(lastX);
          if (t !== null) movePickDrag(s.key, s.wave, method, t, st.snap);
        });
      };
      const onUp = () => {
        if (frame) cancelAnimationFrame(frame);
        window.removeEventListener('mousemove', onMove, true);
        window.removeEventListener('mouseup', onUp, true);
        if (lastX !== ev.clientX) {
          const t = place(lastX);
          if (t !== null) movePickDrag(s.key, s.wave, method, t, st.snap);
        }
      };
      window.addEventListener('mousemove', onMove, true);
      window.addEventListener('mouseup', onUp, true);
    };
    // Hovering between two traces lights the interval they bound (the same band on every plot).
    const onHover = (ev: MouseEvent) => {
      const plotDiv = divRef.current;
      if (!plotDiv || ev.buttons) return;
      const p = pointerToData(plotDiv, ev.clientX, ev.clientY);
      const d = currentDerived();
      if (!p || !d) return;
      const key = p.inside ? intervalAtDepth(d.intervals, useApp.getState().view.wave, stations, depthOf, p.y) : null;
      if (key !== useApp.getState().view.hoveredInterval) setView({ hoveredInterval: key });
    };
    const onLeave = () => useApp.getState().view.hoveredInterval && setView({ hoveredInterval: null });
    // The browser's double-click may land on Plotly's drag cover (over the whole page): matched by place.
    const onDouble = (ev: MouseEvent) => {
      if (useApp.getState().view.tool === 'pick') return;
      const b = div.getBoundingClientRect();
      if (ev.clientX >= b.left && ev.clientX <= b.right && ev.clientY >= b.top && ev.clientY <= b.bottom)
        seeAllRef.current();
    };
    window.addEventListener('dblclick', onDouble, true);
    div.addEventListener('mousedown', onDown, true);
    div.addEventListener('mousemove', onHover);
    div.addEventListener('mouseleave', onLeave);
    return () => {
      window.removeEventListener('dblclick', onDouble, true);
      div.removeEventListener('mousedown', onDown, true);
      div.removeEventListener('mousemove', onHover);
      div.removeEventListener('mouseleave', onLeave);
    };
  }, [stations, depthOf]);

  const receivers = receiversOf(allStations, wave);
  const selectedOnBoard = stations.find((s) => s.key === view.selectedStation);
  const detailStation = hitsOpen && selectedOnBoard && selectedOnBoard.hits.length > 1 ? selectedOnBoard : null;
  const workingLabel = workingTraceLabel(stations);
  // Also while the board is still to take up results the Profile already shows (a moment).
  const running = status.state === 'running' || prepared !== latestPrepared;

  return (
    <section className="board" aria-label="Trace board">
      <div className="toolbar" role="toolbar" aria-label="Trace board tools">
        <label>
          Wave{' '}
          <select
            value={wave}
            onChange={(e) => setView({ wave: e.target.value as Wave, selectedStation: null })}
            aria-label="Wave"
          >
            <option value="S">S</option>
            <option value="P">P</option>
          </select>
        </label>
        {receivers.length > 1 && (
          <label>
            Receiver{' '}
            <select value={receiver} onChange={(e) => setView({ receiver: e.target.value })} aria-label="Receiver">
              {receivers.map((r) => (
                <option key={r} value={r}>
                  {r}
                </option>
              ))}
              <option value="*">all</option>
            </select>
          </label>
        )}
        <label>
          Editing{' '}
          <select
            value={view.editMethod}
            onChange={(e) => setView({ editMethod: e.target.value as EditablePickMethod })}
            aria-label="Pick method being edited"
          >
            {EDITABLE_METHODS.map((m, i) => (
              <option key={m} value={m}>
                {i + 1} {methodInfo(m).label}
              </option>
            ))}
          </select>
        </label>
        <span className="seg" role="group" aria-label="Mouse tool">
          <button
            className={view.tool === 'pick' ? 'on' : ''}
            onClick={() => setView({ tool: 'pick' })}
            aria-pressed={view.tool === 'pick'}
            title="Click to place a pick, drag to move it (p)"
          >
            Pick
          </button>
          <button
            className={view.tool === 'zoom' ? 'on' : ''}
            onClick={() => setView({ tool: 'zoom' })}
            aria-pressed={view.tool === 'zoom'}
            title="Drag a box to zoom, double-click to see all (m)"
          >
            Zoom
          </button>
          <button
            className={view.tool === 'pan' ? 'on' : ''}
            onClick={() => setView({ tool: 'pan' })}
            aria-pressed={view.tool === 'pan'}
            title="Drag to move the view; the wheel zooms (n)"
          >
            Pan
          </button>
        </span>
        <label title="Snap a placed pick to the nearest peak, trough, zero crossing or onset of the chosen method (s)">
          <input type="checkbox" checked={view.snap} onChange={(e) => setView({ snap: e.target.checked })} /> Snap
        </label>
        <span className="seg" role="group" aria-label="Time window">
          <label title="Time window shown, ms (type to change; Fit = fitted to the arrivals)">
            <NumberBox
              value={shown ? shown.t0S * 1000 : 0}
              label="Window from (ms)"
              onCommit={(v) => shown && v < shown.t1S * 1000 && setXMs([v, shown.t1S * 1000])}
            />
            –
            <NumberBox
              value={shown ? shown.t1S * 1000 : 0}
              label="Window to (ms)"
              onCommit={(v) => shown && v > shown.t0S * 1000 && setXMs([shown.t0S * 1000, v])}
            />{' '}
            ms
          </label>
          <button onClick={fitArrivals} title="Time window fitted to the arrivals, every station">
            Fit
          </button>
          <button onClick={seeAll} title="The whole record, every station (double-click with Zoom or Pan)">
            See all
          </button>
        </span>
        <details className="board-display">
          <summary>Display</summary>
          <div className="board-display-panel">
            <label>
              Gain{' '}
              <select
                value={view.normalise}
                onChange={(e) => setView({ normalise: e.target.value as typeof view.normalise })}
                aria-label="Amplitude scaling"
              >
                <option value="trace">each trace</option>
                <option value="common">common</option>
                <option value="agc">automatic (AGC)</option>
                <option value="tvg">time-variant (× t)</option>
              </select>
            </label>
            {view.normalise === 'agc' && (
              <label title="Automatic gain control window length">
                window{' '}
                <select
                  value={view.agcMs}
                  onChange={(e) => setView({ agcMs: Number(e.target.value) })}
                  aria-label="AGC window (ms)"
                >
                  {[5, 10, 20, 40, 80].map((v) => (
                    <option key={v} value={v}>
                      {v} ms
                    </option>
                  ))}
                </select>
              </label>
            )}
            <label>
              Amplitude{' '}
              <input
                type="range"
                min={0.25}
                max={6}
                step={0.25}
                value={view.gain}
                onChange={(e) => setView({ gain: Number(e.target.value) })}
                aria-label="Gain"
              />
            </label>
            <label title="Clip level: a wiggle never swings further than this many trace spacings">
              Clip{' '}
              <select value={view.clip} onChange={(e) => setView({ clip: Number(e.target.value) })} aria-label="Clip">
                {[0.5, 1, 1.5, 2, 3].map((v) => (
                  <option key={v} value={v}>
                    {v} spacing{v === 1 ? '' : 's'}
                  </option>
                ))}
              </select>
            </label>
            <label>
              Style{' '}
              <select
                value={view.fill && !gl ? 'area' : 'wiggle'}
                onChange={(e) => setView({ fill: e.target.value === 'area' })}
                aria-label="Trace style"
              >
                <option value="wiggle">wiggle</option>
                <option value="area" disabled={gl}>
                  variable area{gl ? ' (not with WebGL)' : ''}
                </option>
              </select>
            </label>
            <label title="How the traces are drawn: auto = WebGL above 40 traces when the graphics processor draws it, else SVG">
              Draw{' '}
              <select
                value={view.renderer}
                onChange={(e) => setView({ renderer: e.target.value as 'auto' | 'svg' | 'webgl' })}
                aria-label="Renderer"
              >
                <option value="auto">auto</option>
                <option value="svg">SVG</option>
                <option value="webgl">WebGL</option>
              </select>
            </label>
          </div>
        </details>
        <label title="The working trace of each station, or both directions of a reversed pair (first solid, second dashed)">
          Hits{' '}
          <select
            value={reversible ? view.hitView : 'working'}
            onChange={(e) => setView({ hitView: e.target.value as 'working' | 'both' })}
            aria-label="Reversed hits"
          >
            <option value="working">{workingLabel}</option>
            <option value="both" disabled={!reversible}>
              both directions
            </option>
          </select>
        </label>
      </div>
      <div className="board-row">
        <div className="board-plot" ref={wrapRef} data-tool={view.tool}>
          {stations.length ? (
            <>
              <Plot
                name="trace-board"
                data={wiggleData}
                layout={layout}
                config={BOARD_CONFIG}
                onReady={(d) => (divRef.current = d)}
                onDrawn={(ms) => {
                  setDrawMs(ms);
                  syncAxes();
                }}
                onRelayout={onRelayout}
              />
              <Plot
                name="trace-board-picks"
                data={pickData}
                layout={overlayLayout}
                config={OVERLAY_CONFIG}
                className="plot overlay"
                defer="data"
              />
            </>
          ) : (
            <div className="empty">
              {running
                ? 'Preparing the working traces…'
                : 'No traces yet: load waveform files or open the demo survey, then give each record a depth in Geometry.'}
            </div>
          )}
        </div>
        {detailStation && (
          <HitsDetail
            station={detailStation}
            picks={picks}
            kind={survey.kind}
            depthLabel={`${fmt('depth', units, detailStation.depthM)} ${label('depth', units)}`}
            onClose={() => setHitsOpen(false)}
          />
        )}
      </div>
      <div className="board-foot" aria-live="polite">
        <span className="legend">
          <span className="mk auto" style={{ borderColor: colour }} /> automatic{' '}
          <span className="mk edited" style={{ background: colour }} /> edited <span className="mk excluded">×</span>{' '}
          excluded
        </span>
        {view.notice && <span className="notice">{view.notice}</span>}
        <span className="muted">
          {stations.length} traces{gl ? ' (WebGL)' : ''}
          {drawMs !== null ? ` · decimated in ${wiggleMs.current.toFixed(0)} ms, drawn in ${drawMs.toFixed(0)} ms` : ''}
        </span>
      </div>
    </section>
  );
}
