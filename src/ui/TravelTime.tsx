/**
 * Travel time: direct times against depth for one pick method, raw (hollow) and slant-corrected
 * (filled), with the core's layer fits drawn as lines over each layer's stations.
 */
import { useMemo } from 'react';
import { useDerived } from '../state/derived';
import { useApp, useResults } from '../state/store';
import { effectiveReceiver } from './picks';
import { METHOD_WORDS } from './picks';
import { BASE_LAYOUT, COLOURS, Plot, type PlotData } from './plot';
import { disp, fmt, label, useUnits } from './units';

export function TravelTime() {
  const d = useDerived();
  const view = useApp((s) => s.view);
  const units = useUnits();
  const method = view.editMethod;
  const wave = view.wave;
  const colour = wave === 'S' ? COLOURS.S : COLOURS.P;
  const stations = useResults((s) => s.prepared?.stations);
  const receiver = effectiveReceiver(stations ?? [], wave, view.receiver);
  const rows = useMemo(() => (d ? d.travelTimes.filter((r) => r.wave === wave && r.times[method] && (receiver === '*' || r.receiver === receiver)) : []), [d, wave, method, receiver]);

  const data = useMemo(() => {
    const out: PlotData[] = [];
    const y = rows.map((r) => disp('depth', units, r.depthM));
    out.push({ type: 'scatter', mode: 'markers', name: 'time', x: rows.map((r) => r.times[method]!.timeS * 1000), y, marker: { symbol: 'circle-open', size: 7, color: colour, line: { width: 1.5 } }, hoverinfo: 'skip' });
    out.push({ type: 'scatter', mode: 'markers', name: 'slant-corrected time', x: rows.map((r) => r.times[method]!.correctedS * 1000), y, marker: { symbol: 'circle', size: 6, color: colour, line: { width: 1, color: COLOURS.rim } }, hoverinfo: 'skip' });
    for (const f of d?.layerFits ?? []) {
      if (f.wave !== wave || f.method !== method) continue;
      const inLayer = rows.filter((r) => r.depthM >= f.topM - 1e-9 && r.depthM <= f.bottomM + 1e-9);
      if (inLayer.length < 2) continue;
      // The least-squares line passes through the centroid of its points; slope 1/V (core's fit).
      const pBar = inLayer.reduce((a, r) => a + r.pathM, 0) / inLayer.length;
      const tBar = inLayer.reduce((a, r) => a + r.times[method]!.timeS, 0) / inLayer.length;
      out.push({
        type: 'scatter',
        mode: 'lines',
        name: `fit ${f.topM}-${f.bottomM}`,
        x: inLayer.map((r) => (tBar + (r.pathM - pBar) / f.velocityMps) * 1000),
        y: inLayer.map((r) => disp('depth', units, r.depthM)),
        line: { color: COLOURS.rim, width: 1.5 },
        hoverinfo: 'skip',
      });
    }
    return out;
  }, [rows, d, wave, method, units, colour]);

  const layout = useMemo(() => {
    const hovered = view.hoveredInterval ? d?.intervals.find((r) => r.key === view.hoveredInterval) : undefined;
    const fits = (d?.layerFits ?? []).filter((f) => f.wave === wave && f.method === method);
    return {
      ...BASE_LAYOUT,
      margin: { l: 48, r: 8, t: 8, b: 34 },
      xaxis: { title: { text: 'Time (ms)' }, zeroline: false, gridcolor: COLOURS.grid, side: 'bottom' },
      yaxis: { title: { text: `Depth (${label('depth', units)})` }, autorange: 'reversed', zeroline: false, gridcolor: COLOURS.grid },
      shapes: hovered
        ? [{ type: 'rect', xref: 'paper', x0: 0, x1: 1, yref: 'y', y0: disp('depth', units, hovered.topM), y1: disp('depth', units, hovered.bottomM), fillcolor: COLOURS.band, line: { width: 0 }, layer: 'below' }]
        : [],
      annotations: fits.map((f) => ({
        xref: 'paper',
        x: 0.99,
        xanchor: 'right',
        yref: 'y',
        y: disp('depth', units, (f.topM + f.bottomM) / 2),
        text: `${fmt('velocity', units, f.velocityMps)} ${label('velocity', units)}`,
        showarrow: false,
        font: { size: 10, color: COLOURS.rim },
        bgcolor: 'rgba(255,255,255,0.8)',
      })),
    };
  }, [view.hoveredInterval, d, wave, method, units]);

  return (
    <section className="strip-pane" aria-label="Travel time">
      <h2>Travel time</h2>
      <div className="pane-note">
        {METHOD_WORDS[method]} picks, {wave} wave{receiver !== '*' && receiver !== 'R' ? `, receiver ${receiver}` : ''}: ○ time after trigger · ● slant-corrected · lines: layer fits
      </div>
      <Plot name="travel-time" data={data} layout={layout} className="plot small" />
    </section>
  );
}
