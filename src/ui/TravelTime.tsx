/**
 * Travel time: direct times against depth for one pick method, raw (hollow) and slant-corrected
 * (filled), with the core's layer fits drawn as lines over each layer's stations.
 */
import { methodInfo } from '../core';
import { receiverLabel, receiverSlots } from '../core';
import type { ReceiverSlot } from '../core';
import { useMemo } from 'react';
import { useDerived } from '../state/derived';
import { useApp, useResults } from '../state/store';
import { effectiveReceiver } from './picks';
import { BASE_LAYOUT, COLOURS, hoveredBand, Plot, type PlotData } from './plot';
import { disp, fmt, label, useUnits } from './units';

export function TravelTime() {
  const d = useDerived();
  const view = useApp((s) => s.view);
  const units = useUnits();
  const method = view.editMethod;
  const wave = view.wave;
  const colour = wave === 'S' ? COLOURS.S : COLOURS.P;
  const stations = useResults((s) => s.prepared?.stations);
  const survey = useApp((s) => s.survey);
  const settingsMode = useApp((s) => s.settings.layering.mode);
  const receiver = effectiveReceiver(stations ?? [], wave, view.receiver);
  // Memoised on the arrays, not the result object: the late Vs30 spread does not redraw this plot.
  const travelTimes = d?.travelTimes;
  const layerFits = d?.layerFits;
  const layerModel = d?.layerModel;
  const intervals = d?.intervals;
  const rows = useMemo(
    () =>
      travelTimes
        ? travelTimes.filter((r) => r.wave === wave && r.times[method] && (receiver === '*' || r.receiver === receiver))
        : [],
    [travelTimes, wave, method, receiver],
  );

  const data = useMemo(() => {
    const out: PlotData[] = [];
    const y = rows.map((r) => disp('depth', units, r.depthM));
    out.push({
      type: 'scatter',
      mode: 'markers',
      name: 'time',
      x: rows.map((r) => r.times[method]!.timeS * 1000),
      y,
      marker: { symbol: 'circle-open', size: 7, color: colour, line: { width: 1.5 } },
      hoverinfo: 'skip',
    });
    out.push({
      type: 'scatter',
      mode: 'markers',
      name: 'slant-corrected time',
      x: rows.map((r) => r.times[method]!.correctedS * 1000),
      y,
      marker: { symbol: 'circle', size: 6, color: colour, line: { width: 1, color: COLOURS.rim } },
      hoverinfo: 'skip',
    });
    for (const f of layerFits ?? []) {
      if (f.wave !== wave || f.method !== method) continue;
      const inLayer = rows.filter((r) => r.depthM >= f.topM - 1e-9 && r.depthM <= f.bottomM + 1e-9);
      if (inLayer.length < 2) continue;
      // The core's fitted line: time = interceptS + pathM / velocityMps, at each station of the layer.
      out.push({
        type: 'scatter',
        mode: 'lines',
        name: `fit ${f.topM}-${f.bottomM}`,
        x: inLayer.map((r) => (f.interceptS + r.pathM / f.velocityMps) * 1000),
        y: inLayer.map((r) => disp('depth', units, r.depthM)),
        line: { color: COLOURS.rim, width: 1.5 },
        hoverinfo: 'skip',
      });
    }
    return out;
  }, [rows, layerFits, wave, method, units, colour]);

  const [bandTopM, bandBottomM] = hoveredBand(intervals, view.hoveredInterval);
  const layout = useMemo(() => {
    const fits = (layerFits ?? []).filter((f) => f.wave === wave && f.method === method);
    return {
      ...BASE_LAYOUT,
      uirevision: 'travel-time',
      margin: { l: 48, r: 8, t: 8, b: 34 },
      xaxis: { title: { text: 'Time (ms)' }, zeroline: false, gridcolor: COLOURS.grid, side: 'bottom' },
      yaxis: {
        title: { text: `Depth (${label('depth', units)})` },
        autorange: 'reversed',
        zeroline: false,
        gridcolor: COLOURS.grid,
      },
      shapes:
        bandTopM !== null && bandBottomM !== null
          ? [
              {
                type: 'rect',
                xref: 'paper',
                x0: 0,
                x1: 1,
                yref: 'y',
                y0: disp('depth', units, bandTopM),
                y1: disp('depth', units, bandBottomM),
                fillcolor: COLOURS.band,
                line: { width: 0 },
                layer: 'below',
              },
            ]
          : [],
      annotations: fits.map((f) => {
        // Label on the side the times leave empty: a time-depth curve runs from top left to bottom
        // right, so shallow layers are labelled at the right edge and deep (late) layers at the left.
        const late = midTimeS(f) > 0.5 * Math.max(...fits.map((g) => midTimeS(g)));
        // The refracted-ray layer model (onset times, S) beside the straight-line fit, when it has this layer.
        const ray =
          wave === 'S' && method === 'onset'
            ? layerModel?.layers.find((l) => Math.abs(l.topM - f.topM) < 1e-6 && Math.abs(l.bottomM - f.bottomM) < 1e-6)
            : undefined;
        const text = ray
          ? `V${wave.toLowerCase()} ${fmt('velocity', units, f.velocityMps)} (line fit) · ${fmt('velocity', units, ray.velocityMps)} (ray fit) ${label('velocity', units)}`
          : `V${wave.toLowerCase()} ${fmt('velocity', units, f.velocityMps)} ${label('velocity', units)} (line fit)`;
        return {
          xref: 'paper',
          x: late ? 0.01 : 0.99,
          xanchor: late ? 'left' : 'right',
          yref: 'y',
          y: disp('depth', units, (f.topM + f.bottomM) / 2),
          text,
          showarrow: false,
          font: { size: 10, color: COLOURS.rim },
          bgcolor: 'rgba(255,255,255,0.8)',
        };
      }),
    };
  }, [bandTopM, bandBottomM, layerFits, layerModel, wave, method, units]);

  return (
    <section className="strip-pane" aria-label="Travel time">
      <h2>Travel time</h2>
      <div className="pane-note">
        {methodInfo(method).label} picks, {wave} wave
        {receiver !== '*' && receiverSlots(survey).length > 1
          ? `, ${receiverLabel(survey, receiver as ReceiverSlot)}`
          : ''}
        : ○ time after trigger · ● slant-corrected · lines: layer fits, velocity per layer: line fit = straight line
        through the slant-corrected times
        {layerModel && wave === 'S' && method === 'onset'
          ? `; ray fit = layer model with rays refracted at each boundary (RMS misfit ${(layerModel.rmsMisfitS * 1000).toFixed(2)} ms)`
          : ''}
      </div>
      {wave === 'S' && d?.layering && (d.layering.fit || d.layering.reason) && (
        <div className="pane-note" aria-label="Layered model">
          {d.layering.fit
            ? `Layered model (${settingsMode === 'user' ? 'boundaries entered' : 'boundaries from the travel times'}): ${d.layering.fit.layers
                .map(
                  (l) =>
                    `${fmt('depth', units, l.topM, 2)}–${fmt('depth', units, l.bottomM, 2)} ${label('depth', units)} ${fmt('velocity', units, l.vsMps, 0)} ± ${fmt('velocity', units, l.vsSdMps, 0)}`,
                )
                .join(' · ')} ${label('velocity', units)}`
            : `No layered model: ${d.layering.reason}.`}
        </div>
      )}
      <Plot name="travel-time" data={data} layout={layout} className="plot small" defer />
    </section>
  );
}

/** Time of a layer fit at the layer's mid-depth, s (vertical path; only to choose a label's side). */
function midTimeS(f: { interceptS: number; topM: number; bottomM: number; velocityMps: number }): number {
  return f.interceptS + (0.5 * (f.topM + f.bottomM)) / f.velocityMps;
}
