/**
 * Design view (centre tab): modulus reduction and damping curves per soil layer on a log-strain axis
 * (strain in percent), the per-layer table with working-strain G and field damping beside the laboratory
 * Dmin, and the Vs-based liquefaction screen as depth plots of CSR and CRR with the factor of safety.
 * Everything shown comes from derive() (Derived.design); this view only draws it.
 */
import { useMemo, useState } from 'react';
import type { LayerDesign, LiquefactionResult } from '../core';
import { CURVE_CAUTIONS } from '../core';
import { LIQUEFACTION_CAUTIONS } from '../core';
import { CURVE_MODEL_SOURCES } from '../core';
import type { Derived } from '../core';
import { useDerived } from '../state/derived';
import { setView } from '../state/store';
import { BASE_LAYOUT, COLOURS, Plot, type PlotData } from './plot';
import { disp, fmt, label, useUnits } from './units';
import type { UnitSystem } from '../core';

/** Layer line colours (ours): distinct hues in the app's muted register. */
const LAYER_COLOURS = ['#0f766e', '#7c3aed', '#b45309', '#1d4ed8', '#be185d', '#4d7c0f', '#57534e', '#0e7490'];

/** Liquefaction screen colours (ours). */
export const SCREEN_COLOURS = {
  csr: '#c2410c',
  crr: '#1e40af',
  fsLow: '#9f1239',
  fsNear: '#ca8a04',
  fsOk: '#0f766e',
  limit: '#52606d',
};

/** Factors of safety above this are drawn at the axis edge (right-pointing triangle). */
const FS_AXIS_MAX = 3;

/** FS below 1: triggering indicated; 1-1.25: marginal; above: not indicated (by this screen). */
export function fsColour(fs: number): string {
  return fs < 1 ? SCREEN_COLOURS.fsLow : fs < 1.25 ? SCREEN_COLOURS.fsNear : SCREEN_COLOURS.fsOk;
}

/** Cautions as a list, one item each. */
function CautionList({ items, className }: { items: readonly string[]; className?: string }) {
  return (
    <ul className={className}>
      {items.map((c) => (
        <li key={c}>{c}</li>
      ))}
    </ul>
  );
}

const pct = (x: number | null | undefined, d = 3) =>
  x === null || x === undefined || !Number.isFinite(x) ? '–' : x.toFixed(d);

/** A value on the curves: G/Gmax for the left panel, damping for the right. */
type CurveValue = { modulusRatio: number; dampingPct: number };

/**
 * One trace on both panels of the curves plot: G/Gmax on the left (x, y), damping on the right (x2, y2).
 * `make` gets the value to draw and whether the trace is the left one.
 */
function onBothPanels(make: (y: (v: CurveValue) => number, left: boolean) => PlotData): PlotData[] {
  return [
    { ...make((v) => v.modulusRatio, true), xaxis: 'x', yaxis: 'y' },
    { ...make((v) => v.dampingPct, false), xaxis: 'x2', yaxis: 'y2' },
  ];
}

/** The log shear-strain axis of both curve panels. */
const strainAxis = () => ({
  type: 'log',
  title: { text: 'Shear strain (%)' },
  range: [-4, 0],
  gridcolor: COLOURS.grid,
  dtick: 1,
  exponentformat: 'none',
});

function CurvesPlot({ layers, showAlt }: { layers: LayerDesign[]; showAlt: boolean }) {
  const data = useMemo(() => {
    const out: PlotData[] = [];
    layers.forEach((l, i) => {
      const colour = LAYER_COLOURS[i % LAYER_COLOURS.length];
      const name = `${l.name || `Layer ${i + 1}`}`;
      const x = l.curve.map((p) => p.strainPct);
      out.push(
        ...onBothPanels((y, left) => ({
          type: 'scatter',
          mode: 'lines',
          x,
          y: l.curve.map(y),
          name,
          legendgroup: name,
          ...(left ? {} : { showlegend: false }),
          line: { color: colour, width: 2 },
        })),
      );
      if (showAlt && l.alternative.curve.length) {
        const ax = l.alternative.curve.map((p) => p.strainPct);
        out.push(
          ...onBothPanels((y, left) => ({
            type: 'scatter',
            mode: 'lines',
            x: ax,
            y: l.alternative.curve.map(y),
            ...(left ? { name: `${name} (${CURVE_MODEL_SOURCES[l.alternative.model].label})`, legendgroup: name } : {}),
            showlegend: false,
            line: { color: colour, width: 1, dash: 'dash' },
          })),
        );
      }
      const working = l.working;
      if (working) {
        out.push(
          ...onBothPanels((y) => ({
            type: 'scatter',
            mode: 'markers',
            x: [working.strainPct],
            y: [y(working)],
            showlegend: false,
            marker: { color: colour, size: 8, symbol: 'diamond', line: { color: COLOURS.rim, width: 1 } },
          })),
        );
      }
      if (l.field) {
        out.push({
          type: 'scatter',
          mode: 'markers',
          x: [0.0001],
          y: [l.field.dampingPct],
          error_y:
            l.field.dampingSdPct !== null ? { type: 'data', array: [l.field.dampingSdPct], color: colour } : undefined,
          showlegend: false,
          marker: { color: '#ffffff', size: 8, symbol: 'circle', line: { color: colour, width: 2 } },
          xaxis: 'x2',
          yaxis: 'y2',
        });
      }
    });
    return out;
  }, [layers, showAlt]);
  const layout = useMemo(
    () => ({
      ...BASE_LAYOUT,
      margin: { l: 52, r: 12, t: 16, b: 44 },
      grid: { rows: 1, columns: 2, pattern: 'independent', xgap: 0.12 },
      xaxis: strainAxis(),
      yaxis: { title: { text: 'G/Gmax' }, range: [0, 1.05], gridcolor: COLOURS.grid },
      xaxis2: strainAxis(),
      yaxis2: { title: { text: 'Damping (%)' }, rangemode: 'tozero', gridcolor: COLOURS.grid },
    }),
    [],
  );
  return <Plot name="design-curves" data={data} layout={layout} className="design-plot" />;
}

function LayerTable({
  layers,
  units,
  fieldQGiven,
}: {
  layers: LayerDesign[];
  units: UnitSystem;
  fieldQGiven: boolean;
}) {
  const st = label('stress', units);
  const mod = label('modulus', units);
  return (
    <div className="table-wrap">
      <table className="num design-table">
        <thead>
          <tr>
            <th>Layer</th>
            <th>Type</th>
            <th>PI (%)</th>
            <th>OCR</th>
            <th>K0</th>
            <th>σ′m ({st})</th>
            <th>Vs ({label('velocity', units)})</th>
            <th>Gmax ({mod})</th>
            <th>γr (%)</th>
            <th>Dmin (%)</th>
            <th>Working γ (%)</th>
            <th>G/Gmax</th>
            <th>G ({mod})</th>
            <th>D (%)</th>
            <th title="Field damping D = 1/(2Q) from the waveforms, ± one standard deviation">Field D (%)</th>
            <th title="Darendeli Dmin at the frequency of the field measurement">Lab Dmin at field f (%)</th>
            <th>Flags</th>
          </tr>
        </thead>
        <tbody>
          {layers.map((l, i) => (
            <tr key={i}>
              <td className="text">
                <span className="swatch" style={{ background: LAYER_COLOURS[i % LAYER_COLOURS.length] }} />{' '}
                {l.name || `Layer ${i + 1}`}
              </td>
              <td className="text">{l.soil.soilType}</td>
              <td className={l.soil.piSource === 'default' ? 'muted' : ''}>{pct(l.soil.plasticityIndexPct, 0)}</td>
              <td className={l.soil.ocrSource === 'default' ? 'muted' : ''}>{pct(l.soil.ocr, 2)}</td>
              <td className={l.soil.k0Source === 'default' ? 'muted' : ''}>{pct(l.soil.k0, 2)}</td>
              <td>{fmt('stress', units, l.meanEffectiveStressKpa)}</td>
              <td>{fmt('velocity', units, l.vsMps)}</td>
              <td>{fmt('modulus', units, l.gmaxKpa)}</td>
              <td>{pct(l.darendeli.referenceStrainPct, 4)}</td>
              <td>{pct(l.darendeli.dminPct, 2)}</td>
              <td>{pct(l.working?.strainPct, 4)}</td>
              <td>{pct(l.working?.modulusRatio, 3)}</td>
              <td>{fmt('modulus', units, l.working?.gKpa)}</td>
              <td>{pct(l.working?.dampingPct, 2)}</td>
              <td>
                {l.field
                  ? `${l.field.dampingPct.toFixed(2)}${l.field.dampingSdPct !== null ? ` ± ${l.field.dampingSdPct.toFixed(2)}` : ''}`
                  : '–'}
              </td>
              <td>{l.field ? `${l.field.labDminPct.toFixed(2)} @ ${l.field.frequencyHz.toFixed(0)} Hz` : '–'}</td>
              <td className="text small">{l.flags.join(', ')}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="small muted">
        Grey PI, OCR and K0 are defaults (enter site values in Geometry → Soil column). γr and Dmin are Darendeli's
        (2001) at the loading frequency and cycles set there.{' '}
        {fieldQGiven
          ? 'Field D includes scattering and is an upper bound on the material damping.'
          : 'Field damping: no attenuation (Q) estimate from the waveforms is available for this survey, so the column is empty. Field D, where given, includes scattering and is an upper bound on the material damping.'}
      </p>
    </div>
  );
}

function ScreenPlot({ q, units }: { q: LiquefactionResult; units: UnitSystem }) {
  const rows = useMemo(() => q.byInterval.filter((r) => r.csr !== null), [q]);
  // Ratio axis to 0.6 (or 1.2 x the largest CSR): CRR rises steeply near Vs1*, and a resistance beyond
  // the axis is drawn at its edge as a right-pointing triangle.
  const xMax = Math.max(0.6, 1.2 * Math.max(0, ...rows.map((r) => r.csr ?? 0)));
  const data = useMemo(() => {
    const y = rows.map((r) => disp('depth', units, r.midM));
    const screened = rows.filter((r) => r.factorOfSafety !== null);
    const ys = screened.map((r) => disp('depth', units, r.midM));
    const resist = screened.map((r) => (r.crr75 as number) * r.msf);
    return [
      {
        type: 'scatter',
        mode: 'lines+markers',
        x: rows.map((r) => r.csr),
        y,
        name: 'CSR (demand)',
        line: { color: SCREEN_COLOURS.csr, width: 2 },
        marker: { size: 6 },
        xaxis: 'x',
        yaxis: 'y',
      },
      {
        type: 'scatter',
        mode: 'markers',
        x: resist.map((v) => Math.min(v, xMax)),
        y: ys,
        name: 'CRR × MSF (resistance)',
        cliponaxis: false,
        marker: {
          color: SCREEN_COLOURS.crr,
          size: 8,
          symbol: resist.map((v) => (v > xMax ? 'triangle-right' : 'square')),
        },
        xaxis: 'x',
        yaxis: 'y',
      },
      {
        type: 'scatter',
        mode: 'markers',
        x: screened.map((r) => Math.min(r.factorOfSafety as number, FS_AXIS_MAX)),
        y: ys,
        name: 'Factor of safety',
        cliponaxis: false,
        marker: {
          symbol: screened.map((r) => ((r.factorOfSafety as number) > FS_AXIS_MAX ? 'triangle-right' : 'circle')),
          color: screened.map((r) => fsColour(r.factorOfSafety as number)),
          size: 10,
          line: { color: COLOURS.rim, width: 1 },
        },
        xaxis: 'x2',
        yaxis: 'y2',
      },
    ] as PlotData[];
  }, [rows, units, xMax]);
  const dep = label('depth', units);
  const maxFs = Math.max(2, ...rows.map((r) => Math.min(r.factorOfSafety ?? 0, FS_AXIS_MAX)));
  const layout = useMemo(
    () => ({
      ...BASE_LAYOUT,
      showlegend: true,
      legend: { orientation: 'h', x: 0, y: -0.18, font: { size: 10 } },
      margin: { l: 52, r: 12, t: 26, b: 66 },
      grid: { rows: 1, columns: 2, pattern: 'independent', xgap: 0.12 },
      xaxis: { title: { text: 'Cyclic stress or resistance ratio' }, range: [0, xMax], gridcolor: COLOURS.grid },
      yaxis: { title: { text: `Depth (${dep})` }, autorange: 'reversed', gridcolor: COLOURS.grid },
      xaxis2: { title: { text: 'Factor of safety (screen)' }, range: [0, maxFs], gridcolor: COLOURS.grid },
      yaxis2: { autorange: 'reversed', matches: 'y', gridcolor: COLOURS.grid },
      shapes: [
        {
          type: 'line',
          xref: 'x2',
          yref: 'paper',
          x0: 1,
          x1: 1,
          y0: 0,
          y1: 1,
          line: { color: SCREEN_COLOURS.limit, width: 1, dash: 'dot' },
        },
      ],
    }),
    [dep, maxFs, xMax],
  );
  return <Plot name="liquefaction-screen" data={data} layout={layout} className="design-plot" />;
}

const STATUS_WORDS: Record<string, string> = {
  screened: 'screened',
  'not-susceptible-type': 'not sand / silty sand',
  'above-water-table': 'above water table',
  'vs1-above-limit': 'Vs1 ≥ Vs1*',
};

function ScreenTable({ q, units }: { q: LiquefactionResult; units: UnitSystem }) {
  const dep = label('depth', units);
  const v = label('velocity', units);
  const rows = [
    ...q.byLayer.map((r) => ({ basis: 'layer', r })),
    ...q.byInterval.map((r) => ({ basis: 'interval', r })),
  ];
  return (
    <div className="table-wrap tall">
      <table className="num design-table">
        <thead>
          <tr>
            <th>Basis</th>
            <th>Top ({dep})</th>
            <th>Bottom ({dep})</th>
            <th>Type</th>
            <th>Status</th>
            <th>Vs1 ({v})</th>
            <th>Vs1* ({v})</th>
            <th>rd</th>
            <th>CSR</th>
            <th>CRR M7.5</th>
            <th>MSF</th>
            <th>FS</th>
            <th>Flags</th>
          </tr>
        </thead>
        <tbody>
          {rows.map(({ basis, r }, i) => (
            <tr key={i} className={basis === 'layer' ? 'layer-row' : ''}>
              <td className="text">{basis}</td>
              <td>{fmt('depth', units, r.topM)}</td>
              <td>{fmt('depth', units, r.bottomM)}</td>
              <td className="text">{r.soilType ?? '–'}</td>
              <td className="text">{STATUS_WORDS[r.status]}</td>
              <td>{fmt('velocity', units, r.vs1Mps)}</td>
              <td>{fmt('velocity', units, r.vs1StarMps)}</td>
              <td>{pct(r.rd, 3)}</td>
              <td>{pct(r.csr, 3)}</td>
              <td>{pct(r.crr75, 3)}</td>
              <td>{pct(r.msf, 2)}</td>
              <td>
                {r.factorOfSafety !== null ? (
                  <span className="fs" style={{ color: fsColour(r.factorOfSafety) }}>
                    {r.factorOfSafety.toFixed(2)}
                  </span>
                ) : (
                  '–'
                )}
              </td>
              <td className="text small">{r.flags.join(', ')}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function DesignPane() {
  const d = useDerived();
  const units = useUnits();
  const [showAlt, setShowAlt] = useState(true);
  const design = d?.design;
  if (!design?.layers.length) {
    return (
      <section className="geometry-pane design-pane" aria-label="Design">
        <p className="empty">Curves and the liquefaction screen appear here once the profile is computed.</p>
      </section>
    );
  }
  const model = CURVE_MODEL_SOURCES[design.curveModel].label;
  const other = CURVE_MODEL_SOURCES[design.curveModel === 'darendeli' ? 'ishibashi-zhang' : 'darendeli'].label;
  const q = design.liquefaction;
  return (
    <section className="geometry-pane design-pane" aria-label="Design">
      <h3>Modulus reduction and damping per layer</h3>
      <div className="form-grid">
        <span>
          {model}, {design.loadingFrequencyHz} Hz, {design.loadingCycles} cycles, scaled to the measured Gmax
        </span>
        <label>
          <input type="checkbox" checked={showAlt} onChange={(e) => setShowAlt(e.target.checked)} /> Compare with{' '}
          {other} (dashed)
        </label>
        <span className="small muted">
          lines: layers (colours in the table) · ◆ working strain · ○ field damping (at the smallest strain)
        </span>
      </div>
      <CurvesPlot layers={design.layers} showAlt={showAlt} />
      <LayerTable layers={design.layers} units={units} fieldQGiven={design.fieldQGiven} />
      <CautionList items={CURVE_CAUTIONS} className="cautions small" />
      <h3>Liquefaction triggering screen (from Vs)</h3>
      <p className="caution-top">{LIQUEFACTION_CAUTIONS[0]}</p>
      {q ? (
        <>
          <p className="small">
            Peak ground acceleration {q.pgaG} g, magnitude {q.magnitude}. CSR by the simplified procedure (Youd et al.
            2001), CRR from Vs1 (n = 0.25, Pa = 100 kPa) by Andrus & Stokoe (2000). Only layers marked sand or silty
            sand below the water table are screened. <span style={{ color: SCREEN_COLOURS.fsLow }}>● FS &lt; 1</span>{' '}
            <span style={{ color: SCREEN_COLOURS.fsNear }}>● 1–1.25</span>{' '}
            <span style={{ color: SCREEN_COLOURS.fsOk }}>● ≥ 1.25</span>
          </p>
          <ScreenPlot q={q} units={units} />
          <ScreenTable q={q} units={units} />
        </>
      ) : (
        <p className="pane-note">
          Enter the peak ground acceleration and the magnitude in{' '}
          <button className="link" onClick={() => setView({ centre: 'geometry' })}>
            Geometry → Shaking and curves
          </button>{' '}
          and mark sand layers in the soil column to run the screen.
        </p>
      )}
      <CautionList items={LIQUEFACTION_CAUTIONS} className="cautions small" />
    </section>
  );
}

/** Section of the printable summary: per-layer curve parameters and working G; the screen by layer. */
export function DesignPrintSection({ design, units }: { design: Derived['design'] | undefined; units: UnitSystem }) {
  if (!design?.layers.length) return null;
  const mod = label('modulus', units);
  const dep = label('depth', units);
  const q = design.liquefaction;
  return (
    <>
      <h2>Stiffness with strain ({CURVE_MODEL_SOURCES[design.curveModel].label})</h2>
      <table className="num">
        <thead>
          <tr>
            <th className="text">Layer</th>
            <th className="text">Type</th>
            <th>PI (%)</th>
            <th>Gmax ({mod})</th>
            <th>γr (%)</th>
            <th>Dmin (%)</th>
            <th>Working γ (%)</th>
            <th>G ({mod})</th>
            <th>D (%)</th>
          </tr>
        </thead>
        <tbody>
          {design.layers.map((l, i) => (
            <tr key={i}>
              <td className="text">{l.name}</td>
              <td className="text">{l.soil.soilType}</td>
              <td>
                {pct(l.soil.plasticityIndexPct, 0)}
                {l.soil.piSource === 'default' ? ' (default)' : ''}
              </td>
              <td>{fmt('modulus', units, l.gmaxKpa)}</td>
              <td>{pct(l.darendeli.referenceStrainPct, 4)}</td>
              <td>{pct(l.darendeli.dminPct, 2)}</td>
              <td>{pct(l.working?.strainPct, 4)}</td>
              <td>{fmt('modulus', units, l.working?.gKpa)}</td>
              <td>{pct(l.working?.dampingPct, 2)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <CautionList items={CURVE_CAUTIONS} />
      {q && (
        <>
          <h2>
            Liquefaction triggering screen from Vs (pga {q.pgaG} g, Mw {q.magnitude})
          </h2>
          <table className="num">
            <thead>
              <tr>
                <th>Top ({dep})</th>
                <th>Bottom ({dep})</th>
                <th className="text">Type</th>
                <th className="text">Status</th>
                <th>CSR</th>
                <th>CRR M7.5</th>
                <th>FS</th>
              </tr>
            </thead>
            <tbody>
              {q.byLayer.map((r, i) => (
                <tr key={i}>
                  <td>{fmt('depth', units, r.topM)}</td>
                  <td>{fmt('depth', units, r.bottomM)}</td>
                  <td className="text">{r.soilType ?? '–'}</td>
                  <td className="text">{STATUS_WORDS[r.status]}</td>
                  <td>{pct(r.csr, 3)}</td>
                  <td>{pct(r.crr75, 3)}</td>
                  <td>{pct(r.factorOfSafety, 2)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <CautionList items={LIQUEFACTION_CAUTIONS} />
        </>
      )}
    </>
  );
}
