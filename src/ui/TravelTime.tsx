/**
 * Travel time: direct times against depth for one pick method, raw (hollow) and slant-corrected
 * (filled), with the core's layer fits drawn as lines over each layer's stations.
 *
 * S waves of a downhole survey also show the layered model's boundaries (settings.layering): dashed
 * when chosen from the travel times, solid when set by the user, dotted when the fit left one out.
 * The user adds one (click on the depth axis, or "Add boundary"), drags its handle to move it, removes
 * it (Delete on the handle, or double-click), or goes back to the automatic ones; each is one undo step
 * and the core's fit follows (derive()). Handles are focusable sliders: arrows move, Delete removes.
 */
import { methodApplies, methodInfo } from '../core';
import { receiverLabel, receiverSlots } from '../core';
import type { ReceiverSlot } from '../core';
import { useCallback, useMemo, useRef, useState } from 'react';
import { useDeferredResults } from '../state/derived';
import { setLayerBoundaries } from '../state/edits';
import { useApp } from '../state/store';
import {
  addBoundary,
  type BoundaryMark,
  boundaryMarks,
  clampBoundaryM,
  editableList,
  moveBoundary,
  newBoundaryDepthM,
  plotNoteText,
  removeBoundary,
} from './boundaries';
import { effectiveReceiver } from './picks';
import { BASE_LAYOUT, bandShapes, COLOURS, hoveredBand, Plot, type PlotData, pointerToData } from './plot';
import { unitText } from './unitText';
import { disp, fmt, label, undisp, useUnits } from './units';

/** Line style of a boundary: the style, not the colour, tells automatic, set and unused apart. */
const BOUNDARY_DASH: Record<string, string> = { auto: 'dash', user: 'solid', unused: 'dot' };

function markStyle(m: BoundaryMark): 'auto' | 'user' | 'unused' {
  return !m.used ? 'unused' : m.origin;
}

interface AxisBox {
  /** Plot area within the plot div, px. */
  left: number;
  top: number;
  height: number;
  width: number;
}

function axisBox(div: HTMLDivElement | null): AxisBox | null {
  const fl = (
    div as unknown as {
      _fullLayout?: { xaxis: { _offset: number; _length: number }; yaxis: { _offset: number; _length: number } };
    } | null
  )?._fullLayout;
  if (!fl?.xaxis || !fl.yaxis) return null;
  return { left: fl.xaxis._offset, top: fl.yaxis._offset, height: fl.yaxis._length, width: fl.xaxis._length };
}

/** Pixel row (within the plot div) of a depth in display units; null when Plotly has not laid out. */
function depthToPx(div: HTMLDivElement | null, depthDisp: number): number | null {
  const fl = (div as unknown as { _fullLayout?: { yaxis: { _offset: number; l2p: (v: number) => number } } } | null)
    ?._fullLayout;
  if (!fl?.yaxis) return null;
  return fl.yaxis._offset + fl.yaxis.l2p(depthDisp);
}

export function TravelTime() {
  // Deferred: new results reach this plot after the Profile and the Trace board (state/derived.ts).
  const { prepared, derived: d } = useDeferredResults();
  const view = useApp((s) => s.view);
  const units = useUnits();
  const method = view.editMethod;
  const wave = view.wave;
  const colour = wave === 'S' ? COLOURS.S : COLOURS.P;
  const stations = prepared?.stations;
  const survey = useApp((s) => s.survey);
  const layeringSettings = useApp((s) => s.settings.layering);
  const settingsMode = layeringSettings.mode;
  const receiver = effectiveReceiver(stations ?? [], wave, view.receiver);
  // Memoised on the arrays, not the result object: the late Vs30 spread does not redraw this plot.
  const travelTimes = d?.travelTimes;
  const layerFits = d?.layerFits;
  const layerModel = d?.layerModel;
  const intervals = d?.intervals;
  const layeredFit = d?.layering.fit ?? null;
  const layeringReason = d?.layering.reason ?? null;
  const rows = useMemo(
    () =>
      travelTimes
        ? travelTimes.filter((r) => r.wave === wave && r.times[method] && (receiver === '*' || r.receiver === receiver))
        : [],
    [travelTimes, wave, method, receiver],
  );

  // ------------------------------------------------------------ layer boundaries (S, downhole kinds)
  const editable = wave === 'S' && methodApplies('layer-model', survey.kind) && (travelTimes?.length ?? 0) > 0;
  const fitBoundariesM = useMemo(() => (layeredFit ? layeredFit.layers.slice(1).map((l) => l.topM) : []), [layeredFit]);
  const marks = useMemo(() => {
    const m = boundaryMarks(settingsMode, layeringSettings.boundariesM, fitBoundariesM);
    // A failed fit leaves every boundary out; the plot then says why instead of marking each one.
    return layeredFit ? m : m.map((x) => ({ ...x, used: true }));
  }, [settingsMode, layeringSettings.boundariesM, fitBoundariesM, layeredFit]);
  /** Boundaries lie between the source depth (the core's top) and the deepest receiver, m. */
  const topM = survey.sourceDepthM;
  const bottomM = useMemo(
    () => Math.max(topM, ...(travelTimes ?? []).filter((r) => r.wave === 'S').map((r) => r.depthM)),
    [travelTimes, topM],
  );
  const startList = () => editableList(settingsMode, layeringSettings.boundariesM, fitBoundariesM);
  const divRef = useRef<HTMLDivElement | null>(null);
  // Bumped after every draw, zoom or resize of the plot: the handles follow its axes.
  const [, setAxisTick] = useState(0);
  const bump = useCallback(() => setAxisTick((t) => t + 1), []);
  const [drag, setDrag] = useState<{ index: number; depthM: number } | null>(null);
  const depthAt = (clientY: number): number | null => {
    const div = divRef.current;
    if (!div) return null;
    const p = pointerToData(div, div.getBoundingClientRect().left + 1, clientY);
    return p ? clampBoundaryM(undisp('depth', units, p.y), topM, bottomM) : null;
  };
  /** Keyboard step: 0.1 of the display unit (m or ft), ten times that with shift. */
  const stepM = (big: boolean) => undisp('depth', units, big ? 1 : 0.1);

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
    const band = bandShapes(bandTopM, bandBottomM, (m) => disp('depth', units, m));
    const boundaryLines = editable
      ? marks.map((m) => ({
          type: 'line',
          xref: 'paper',
          x0: 0,
          x1: 1,
          yref: 'y',
          y0: disp('depth', units, m.depthM),
          y1: disp('depth', units, m.depthM),
          line: {
            color: m.used ? COLOURS.ink : COLOURS.muted,
            width: m.origin === 'user' && m.used ? 1.5 : 1,
            dash: BOUNDARY_DASH[markStyle(m)],
          },
          layer: 'below',
        }))
      : [];
    const failed =
      editable && !layeredFit && layeringReason
        ? [
            {
              xref: 'paper',
              yref: 'paper',
              x: 0.5,
              y: 0.5,
              text: plotNoteText(`No layered model: ${unitText(layeringReason, units)}`, 56),
              showarrow: false,
              font: { size: 11, color: '#b91c1c' },
              bgcolor: 'rgba(255,255,255,0.9)',
              bordercolor: '#b91c1c',
              borderpad: 3,
            },
          ]
        : [];
    return {
      ...BASE_LAYOUT,
      uirevision: 'travel-time',
      margin: { l: editable ? 60 : 48, r: 8, t: 8, b: 34 },
      xaxis: { title: { text: 'Time (ms)' }, zeroline: false, gridcolor: COLOURS.grid, side: 'bottom' },
      yaxis: {
        title: { text: `Depth (${label('depth', units)})` },
        autorange: 'reversed',
        zeroline: false,
        gridcolor: COLOURS.grid,
        // Invisible outside ticks keep the labels clear of the boundary handles at the plot's edge.
        ...(editable ? { ticks: 'outside', ticklen: 15, tickcolor: 'rgba(0,0,0,0)' } : {}),
      },
      shapes: [...band, ...boundaryLines],
      annotations: [
        ...fits.map((f) => {
          // Label on the side the times leave empty: a time-depth curve runs from top left to bottom
          // right, so shallow layers are labelled at the right edge and deep (late) layers at the left.
          const late = midTimeS(f) > 0.5 * Math.max(...fits.map((g) => midTimeS(g)));
          // The refracted-ray layer model (onset times, S) beside the straight-line fit, when it has this layer.
          const ray =
            wave === 'S' && method === 'onset'
              ? layerModel?.layers.find(
                  (l) => Math.abs(l.topM - f.topM) < 1e-6 && Math.abs(l.bottomM - f.bottomM) < 1e-6,
                )
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
        ...failed,
      ],
    };
  }, [bandTopM, bandBottomM, layerFits, layerModel, wave, method, units, editable, marks, layeredFit, layeringReason]);

  const dep = label('depth', units);
  const notes = layeredFit?.notes ?? [];
  const div = divRef.current;
  const box = editable ? axisBox(div) : null;
  const legendText = `${methodInfo(method).label} picks, ${wave} wave${
    receiver !== '*' && receiverSlots(survey).length > 1 ? `, ${receiverLabel(survey, receiver as ReceiverSlot)}` : ''
  }: ○ time after trigger · ● slant-corrected · lines: layer fits, velocity per layer: line fit = straight line through the slant-corrected times${
    layerModel && wave === 'S' && method === 'onset'
      ? `; ray fit = layer model with rays refracted at each boundary (RMS misfit ${(layerModel.rmsMisfitS * 1000).toFixed(2)} ms)`
      : ''
  }`;
  const layeredText =
    // Only where the layered model applies (a crosshole survey has none to explain).
    wave === 'S' && methodApplies('layer-model', survey.kind) && (layeredFit || layeringReason)
      ? layeredFit
        ? `Layered model (${settingsMode === 'user' ? (marks.length ? 'your boundaries' : 'one layer: no boundaries set') : 'boundaries from the travel times'}): ${layeredFit.layers
            .map(
              (l) =>
                `${fmt('depth', units, l.topM, 2)}–${fmt('depth', units, l.bottomM, 2)} ${dep} ${fmt('velocity', units, l.vsMps, 0)} ± ${fmt('velocity', units, l.vsSdMps, 0)}`,
            )
            .join(
              ' · ',
            )} ${label('velocity', units)}${notes.length ? ` (${notes.map((n) => unitText(n, units)).join('; ')})` : ''}`
        : `No layered model: ${unitText(layeringReason ?? '', units)}.`
      : null;

  return (
    <section className="strip-pane" aria-label="Travel time">
      <div className="pane-head tt-head">
        <h2>Travel time</h2>
        {editable && (
          <fieldset className="tt-tools" aria-label="Layer boundary tools">
            <span className="small muted tt-legend" aria-hidden="true">
              boundaries: <span className="bnd-key auto" /> from the travel times <span className="bnd-key user" />{' '}
              yours
            </span>
            <button
              type="button"
              title="Add a layer boundary in the middle of the thickest layer (or click on the depth axis)"
              onClick={() => {
                const list = startList();
                const z = newBoundaryDepthM(list, topM, bottomM);
                if (z !== null) setLayerBoundaries(addBoundary(list, z));
              }}
            >
              Add boundary
            </button>
            <button
              type="button"
              disabled={settingsMode === 'auto'}
              title="Let the boundaries be chosen from the travel times again"
              onClick={() => setLayerBoundaries(null)}
            >
              Automatic boundaries
            </button>
          </fieldset>
        )}
      </div>
      <div className="pane-note tt-note" title={legendText}>
        {legendText}
      </div>
      {layeredText && (
        <div
          className="pane-note tt-note"
          role="note"
          aria-label="Layered model"
          data-testid="layered-model-note"
          title={layeredText}
        >
          {layeredFit ? layeredText : <span className="error">{layeredText}</span>}
        </div>
      )}
      <div className="tt-plot-box">
        <Plot
          name="travel-time"
          data={data}
          layout={layout}
          className="plot small"
          defer
          onReady={(el) => {
            divRef.current = el;
            bump();
          }}
          onRelayout={bump}
        />
        {editable && box && div && (
          <div className="bnd-overlay">
            {/* The depth axis: a click adds a boundary at that depth (from the keyboard: "Add boundary"). */}
            {/* biome-ignore lint/a11y/useKeyWithClickEvents: the keyboard way is the Add boundary button and the handles */}
            {/* biome-ignore lint/a11y/noStaticElementInteractions: a pointer target over the plot's axis */}
            <div
              className="bnd-rail"
              data-testid="boundary-rail"
              title="Click to add a layer boundary at this depth"
              style={{ left: 0, width: Math.max(8, box.left - 2), top: box.top, height: box.height }}
              onClick={(e) => {
                if (e.target !== e.currentTarget) return;
                const z = depthAt(e.clientY);
                if (z !== null) setLayerBoundaries(addBoundary(startList(), z));
              }}
            />
            {marks.map((m, i) => {
              const style = markStyle(m);
              const z = drag?.index === i ? drag.depthM : m.depthM;
              const py = depthToPx(div, disp('depth', units, z));
              if (py === null || py < box.top - 1 || py > box.top + box.height + 1) return null;
              const word =
                style === 'auto'
                  ? 'chosen from the travel times'
                  : style === 'user'
                    ? 'set by you'
                    : 'set by you, not used by the fit';
              return (
                <div
                  key={i}
                  className={`bnd-handle ${style}${drag?.index === i ? ' dragging' : ''}`}
                  role="slider"
                  tabIndex={0}
                  aria-orientation="vertical"
                  aria-label={`Layer boundary ${i + 1}, ${word}`}
                  aria-valuemin={Number(disp('depth', units, topM).toFixed(2))}
                  aria-valuemax={Number(disp('depth', units, bottomM).toFixed(2))}
                  aria-valuenow={Number(disp('depth', units, z).toFixed(2))}
                  aria-valuetext={`${fmt('depth', units, z, 2)} ${dep}`}
                  data-depth-m={z}
                  title={`Boundary at ${fmt('depth', units, z, 2)} ${dep} (${word}). Drag to move; Delete or double-click removes; arrows move it.`}
                  style={{ top: py - 6, left: Math.max(0, box.left - 13) }}
                  onPointerDown={(e) => {
                    e.preventDefault();
                    e.currentTarget.setPointerCapture(e.pointerId);
                    e.currentTarget.focus();
                    setDrag({ index: i, depthM: m.depthM });
                  }}
                  onPointerMove={(e) => {
                    if (drag?.index !== i) return;
                    const at = depthAt(e.clientY);
                    if (at !== null) setDrag({ index: i, depthM: at });
                  }}
                  onPointerUp={(e) => {
                    if (drag?.index !== i) return;
                    e.currentTarget.releasePointerCapture(e.pointerId);
                    const at = depthAt(e.clientY) ?? drag.depthM;
                    setDrag(null);
                    // A click without a move changes nothing (no undo step).
                    if (Math.abs(at - m.depthM) >= 0.005) setLayerBoundaries(moveBoundary(startList(), i, at));
                  }}
                  onPointerCancel={() => setDrag(null)}
                  onDoubleClick={() => setLayerBoundaries(removeBoundary(startList(), i))}
                  onKeyDown={(e) => {
                    let next: number[] | null = null;
                    if (e.key === 'ArrowUp' || e.key === 'ArrowDown') {
                      const dz = (e.key === 'ArrowUp' ? -1 : 1) * stepM(e.shiftKey);
                      next = moveBoundary(startList(), i, clampBoundaryM(m.depthM + dz, topM, bottomM));
                    } else if (e.key === 'Delete' || e.key === 'Backspace') next = removeBoundary(startList(), i);
                    else if (e.key === 'Insert' || e.key === '+') {
                      const list = startList();
                      const at = newBoundaryDepthM(list, topM, bottomM);
                      if (at !== null) next = addBoundary(list, at);
                    } else return;
                    e.preventDefault();
                    // The board's own keys (trace up/down, back to the automatic pick) must not fire too.
                    e.stopPropagation();
                    if (next) setLayerBoundaries(next);
                  }}
                />
              );
            })}
            {drag && (
              <>
                <div
                  className="bnd-preview"
                  style={{
                    top: depthToPx(div, disp('depth', units, drag.depthM)) ?? 0,
                    left: box.left,
                    width: box.width,
                  }}
                />
                <div
                  className="bnd-readout"
                  style={{ top: (depthToPx(div, disp('depth', units, drag.depthM)) ?? 0) - 18, left: box.left + 4 }}
                >
                  {fmt('depth', units, drag.depthM, 2)} {dep}
                </div>
              </>
            )}
          </div>
        )}
      </div>
    </section>
  );
}

/** Time of a layer fit at the layer's mid-depth, s (vertical path; only to choose a label's side). */
function midTimeS(f: { interceptS: number; topM: number; bottomM: number; velocityMps: number }): number {
  return f.interceptS + (0.5 * (f.topM + f.bottomM)) / f.velocityMps;
}
