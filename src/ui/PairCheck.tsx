/**
 * Pair check: the two working traces of the focused interval overlaid after shifting the deeper one
 * back by the chosen travel-time difference, with the cross-correlation coefficient from the core; and
 * the reversed hits of the selected station overlaid (first direction solid, second dashed).
 */
import { methodInfo } from '../core';
import { useMemo } from 'react';
import { reversedDirections } from '../core';
import { useDeferredResults } from '../state/derived';
import { rawRecords } from '../state/raw';
import { useApp } from '../state/store';
import { decimateMinMax, mean, peakAbs } from './decimate';
import { focusInterval, pickFor } from './picks';
import { pulseWindow } from './traceDisplay';
import type { WorkingTrace } from '../core';

/** How far after an onset the pulse's main peak is looked for, s (common practice for 20–200 Hz pulses). */
const PEAK_LOOK_S = 0.03;

/** The window fitted to a working trace's pulse from its onset pick, else from its search window. */
export function tracePulseWindow(
  w: WorkingTrace,
  onsetS: number | undefined,
  shiftS = 0,
): { t0S: number; t1S: number } {
  const onset = onsetS ?? w.searchStartS;
  const r = pulseWindow(w.samples, w.delayS, w.sampleIntervalS, onset, PEAK_LOOK_S);
  return { t0S: r.t0S - shiftS, t1S: r.t1S - shiftS };
}
import { BASE_LAYOUT, COLOURS, Plot, type PlotData } from './plot';
import { fmt, label, useUnits } from './units';

const COLUMNS = 700;

function normalisedLine(
  samples: ArrayLike<number>,
  delayS: number,
  dtS: number,
  shiftS: number,
  t0S: number,
  t1S: number,
  dash: string | undefined,
  colour: string,
  name: string,
  xaxis = 'x',
  yaxis = 'y',
): PlotData {
  const m = mean(samples);
  const c = new Float64Array(samples.length);
  for (let i = 0; i < c.length; i++) c[i] = samples[i] - m;
  const peak = Math.max(1e-30, peakAbs(c));
  const d = decimateMinMax(c, delayS - shiftS, dtS, t0S, t1S, COLUMNS);
  const x: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < d.length; i++) {
    x.push(d.t[i] * 1000);
    y.push(d.v[i] / peak);
  }
  return {
    type: 'scatter',
    mode: 'lines',
    x,
    y,
    name,
    xaxis,
    yaxis,
    line: { width: 1.4, color: colour, dash },
    hoverinfo: 'skip',
  };
}

export { normalisedLine };

export function PairCheck() {
  // Deferred: new results reach this plot after the Profile and the Trace board (state/derived.ts).
  const { prepared, derived: d } = useDeferredResults();
  const view = useApp((s) => s.view);
  const kind = useApp((s) => s.survey.kind);
  const units = useUnits();
  const key = focusInterval(d, view.hoveredInterval ?? view.selectedInterval, view.selectedStation, view.wave);
  const chosen = d?.intervals.find((r) => r.key === key && r.chosen) ?? d?.intervals.find((r) => r.key === key);
  const pair = prepared?.pairs.find((p) => p.key === key);
  const xcorr = d?.delays.find((x) => x.pairKey === key && x.method === 'xcorr');
  const station = prepared?.stations.find((s) => s.key === view.selectedStation && s.wave === view.wave) ?? pair?.b;
  // A model method (layered model) has no delay between the two traces: the overlay uses the
  // cross-correlation delay instead, and the note says so.
  const overlayDtS = chosen?.dtS ?? xcorr?.delayS ?? null;

  const data = useMemo(() => {
    const out: PlotData[] = [];
    if (pair && chosen && overlayDtS !== null) {
      const a = pair.a.working;
      const b = pair.b.working;
      // Fitted to the two pulses: the upper trace's pulse and the lower one's, shifted back by Δt.
      const picks = d?.picks ?? [];
      const wa = tracePulseWindow(a, pickFor(picks, pair.a.key, pair.wave, 'onset')?.timeS);
      const wb = tracePulseWindow(b, pickFor(picks, pair.b.key, pair.wave, 'onset')?.timeS, overlayDtS);
      const t0 = Math.min(wa.t0S, wb.t0S);
      const t1 = Math.max(wa.t1S, wb.t1S);
      const colour = pair.wave === 'S' ? COLOURS.S : COLOURS.P;
      out.push(
        normalisedLine(a.samples, a.delayS, a.sampleIntervalS, 0, t0, t1, undefined, COLOURS.ink, 'upper trace'),
      );
      out.push(
        normalisedLine(
          b.samples,
          b.delayS,
          b.sampleIntervalS,
          overlayDtS,
          t0,
          t1,
          'dash',
          colour,
          'lower trace, shifted',
        ),
      );
    }
    if (station && station.hits.length > 1) {
      const [first] = reversedDirections(kind);
      const w = station.working;
      const { t0S: t0, t1S: t1 } = tracePulseWindow(
        w,
        pickFor(d?.picks ?? [], station.key, station.wave, 'onset')?.timeS,
      );
      for (const h of station.hits) {
        const tr = rawRecords.get(h.recordId)?.traces.find((t) => t.channel === h.channel);
        if (!tr) continue;
        out.push(
          normalisedLine(
            tr.samples,
            tr.delayS,
            tr.sampleIntervalS,
            0,
            t0,
            t1,
            h.hit === first ? undefined : 'dash',
            h.hit === first ? COLOURS.ink : '#7b8794',
            `hit ${h.hit}`,
            'x2',
            'y2',
          ),
        );
      }
    }
    return out;
  }, [pair, chosen, station, kind, d?.picks, overlayDtS]);

  const layout = useMemo(
    () => ({
      ...BASE_LAYOUT,
      margin: { l: 36, r: 8, t: 22, b: 34 },
      grid: { rows: 1, columns: 2, pattern: 'independent' },
      xaxis: { title: { text: 'Time (ms)' }, zeroline: false, gridcolor: COLOURS.grid, domain: [0, 0.48] },
      yaxis: { range: [-1.1, 1.1], zeroline: true, showticklabels: false },
      xaxis2: { title: { text: 'Time (ms)' }, zeroline: false, gridcolor: COLOURS.grid, domain: [0.54, 1] },
      yaxis2: { range: [-1.1, 1.1], zeroline: true, showticklabels: false, anchor: 'x2' },
      annotations: [
        {
          text: 'Interval traces, lower shifted by Δt',
          xref: 'paper',
          yref: 'paper',
          x: 0,
          y: 1.08,
          showarrow: false,
          xanchor: 'left',
          font: { size: 11 },
        },
        {
          text: 'Reversed hits at the station',
          xref: 'paper',
          yref: 'paper',
          x: 0.54,
          y: 1.08,
          showarrow: false,
          xanchor: 'left',
          font: { size: 11 },
        },
      ],
    }),
    [],
  );

  return (
    <section className="strip-pane" aria-label="Pair check">
      <h2>Pair check</h2>
      <div className="pane-note" data-testid="pair-summary">
        {pair && chosen ? (
          <>
            {fmt('depth', units, pair.topM)}–{fmt('depth', units, pair.bottomM)} {label('depth', units)} ·{' '}
            {chosen.dtS !== null
              ? `${methodInfo(chosen.method).label} Δt = ${(chosen.dtS * 1000).toFixed(3)} ms`
              : `${methodInfo(chosen.method).label} (no trace delay; overlay shifted by the cross-correlation Δt = ${xcorr ? (xcorr.delayS * 1000).toFixed(3) : '–'} ms)`}{' '}
            · cross-correlation r = {xcorr ? xcorr.coefficient.toFixed(3) : '–'}
          </>
        ) : (
          'Select a trace or an interval.'
        )}
      </div>
      <Plot name="pair-check" data={data} layout={layout} className="plot small" defer />
    </section>
  );
}
