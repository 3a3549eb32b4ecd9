/**
 * Reversed hits of the selected station, magnified beside the Trace board: both directions overlaid
 * (first solid, second dashed; the S onset is where they part with opposite polarity) and the working
 * trace under them, in a window fitted to the station's pulse.
 */
import { useMemo } from 'react';
import { reversedDirections } from '../core';
import type { Pick as WavePick, TestKind } from '../core';
import type { Station } from '../core';
import { rawRecords } from '../state/raw';
import { normalisedLine, tracePulseWindow } from './PairCheck';
import { BASE_LAYOUT, COLOURS, Plot, type PlotData } from './plot';
import { pickFor, workingTraceLabel } from './picks';

interface Props {
  station: Station;
  picks: readonly WavePick[] | undefined;
  kind: TestKind;
  depthLabel: string;
  onClose: () => void;
}

export function HitsDetail({ station, picks, kind, depthLabel, onClose }: Props) {
  const onsetS = picks ? pickFor(picks, station.key, station.wave, 'onset')?.timeS : undefined;
  const colour = station.wave === 'S' ? COLOURS.S : COLOURS.P;
  const data = useMemo(() => {
    const w = station.working;
    const { t0S, t1S } = tracePulseWindow(w, onsetS);
    const [first] = reversedDirections(kind);
    const out: PlotData[] = [];
    for (const h of station.hits) {
      const tr = rawRecords.get(h.recordId)?.traces.find((t) => t.channel === h.channel);
      if (!tr) continue;
      const line = normalisedLine(
        tr.samples,
        tr.delayS,
        tr.sampleIntervalS,
        0,
        t0S,
        t1S,
        h.hit === first ? undefined : 'dash',
        h.hit === first ? COLOURS.ink : '#52606d',
        `hit ${h.hit}`,
      );
      out.push({ ...line, y: (line.y as number[]).map((v) => v + 1.2) });
    }
    const wl = normalisedLine(w.samples, w.delayS, w.sampleIntervalS, 0, t0S, t1S, undefined, colour, 'working');
    out.push({ ...wl, y: (wl.y as number[]).map((v) => v - 1.2) });
    if (onsetS !== undefined) {
      out.push({
        type: 'scatter',
        mode: 'lines',
        x: [onsetS * 1000, onsetS * 1000],
        y: [-2.4, 2.4],
        line: { width: 1, color: colour, dash: 'dot' },
        hoverinfo: 'skip',
        name: 'onset pick',
      });
    }
    return out;
  }, [station, onsetS, kind, colour]);
  const layout = useMemo(
    () => ({
      ...BASE_LAYOUT,
      margin: { l: 8, r: 8, t: 6, b: 34 },
      xaxis: { title: { text: 'Time (ms)' }, zeroline: false, gridcolor: COLOURS.grid },
      yaxis: { range: [-2.5, 2.5], showticklabels: false, zeroline: false, showgrid: false, fixedrange: true },
      annotations: [
        { text: 'both hits', x: 0, xref: 'paper', y: 2.35, yref: 'y', showarrow: false, xanchor: 'left' },
        {
          text: workingTraceLabel([station]),
          x: 0,
          xref: 'paper',
          y: -0.05,
          yref: 'y',
          showarrow: false,
          xanchor: 'left',
        },
      ],
    }),
    [station],
  );
  return (
    <aside className="hits-detail" aria-label="Reversed hits, magnified">
      <div className="hits-head">
        <strong>
          {station.key} · {depthLabel}
        </strong>
        <button className="link" onClick={onClose} aria-label="Hide the magnified hits">
          hide
        </button>
      </div>
      <div className="hits-legend small muted">
        <span className="ln solid" /> first hit <span className="ln dashed" /> second hit
      </div>
      <Plot name="hits-detail" data={data} layout={layout} className="plot hits" />
    </aside>
  );
}
