/**
 * Profile: Vs and Vp step profile with bars (Vs: the 95% range, or one sigma where an interval has no
 * range; Vp and Gmax: one sigma), Gmax and Vs1 beside it, and the method comparison table (every
 * method's interval velocity, the one used, flags as short words).
 */
import { CurrentSetupProblems } from './Setup';
import { unitText } from './unitText';
import { memo, useMemo, useRef, useState } from 'react';
import { INTERVAL_METHODS, methodApplies, methodInfo, profileMethodFor, type IntervalMethod } from '../core';
import type { IntervalKey, StationKey } from '../core';
import type { IntervalValue } from '../core';
import type { ComparisonResult, ProfileRow } from '../core';
import type { ComparisonProfile } from '../core';
import { DEFAULT_RAYLEIGH_POISSON } from '../core';
import type { ErrorInfo } from '../core';
import { useDerived } from '../state/derived';
import {
  loadComparison,
  removeComparison,
  setIntervalMethod,
  toggleIntervalExcluded,
  updateSettings,
} from '../state/edits';
import { setView, useApp } from '../state/store';
import { BASE_LAYOUT, bandShapes, COLOURS, hoveredBand, Plot, pointerToData, type PlotData } from './plot';
import { fromDisplay } from '../core';
import { disp, fmt, fmtRange95, label, useUnits } from './units';
import { vsBars } from './profileBars';
import type { UnitSystem } from '../core';

function stepLine(
  rows: readonly ProfileRow[],
  value: (r: ProfileRow) => number | null,
  units: UnitSystem,
  kind: 'velocity' | 'modulus',
): { x: (number | null)[]; y: (number | null)[] } {
  const x: (number | null)[] = [];
  const y: (number | null)[] = [];
  let lastBottom: number | null = null;
  for (const r of rows) {
    const v = value(r);
    if (v === null || !Number.isFinite(v)) {
      x.push(null);
      y.push(null);
      lastBottom = null;
      continue;
    }
    if (lastBottom !== null && Math.abs(lastBottom - r.topM) > 1e-6) {
      x.push(null);
      y.push(null);
    }
    x.push(disp(kind, units, v), disp(kind, units, v));
    y.push(disp('depth', units, r.topM), disp('depth', units, r.bottomM));
    lastBottom = r.bottomM;
  }
  return { x, y };
}

/** The comparison profile as a step line: point i holds from its depth to the next point; the last to bottomM. */
function comparisonSteps(cmp: ComparisonProfile, bottomM: number, units: UnitSystem): { x: number[]; y: number[] } {
  const pts = [...cmp.points].sort((a, b) => a.depthM - b.depthM);
  const x: number[] = [];
  const y: number[] = [];
  pts.forEach((p, i) => {
    const bottom = i + 1 < pts.length ? pts[i + 1].depthM : Math.max(bottomM, p.depthM);
    x.push(disp('velocity', units, p.vsMps), disp('velocity', units, p.vsMps));
    y.push(disp('depth', units, p.depthM), disp('depth', units, bottom));
  });
  return { x, y };
}

/** A stepped line of the profile (null values break the line). */
function stepTrace(
  name: string,
  xy: { x: (number | null)[]; y: (number | null)[] },
  line: PlotData,
  o: { xaxis?: string; visible?: boolean } = {},
): PlotData {
  return {
    type: 'scatter',
    mode: 'lines',
    name,
    x: xy.x,
    y: xy.y,
    ...(o.xaxis ? { xaxis: o.xaxis } : {}),
    ...(o.visible !== undefined ? { visible: o.visible } : {}),
    line,
    hoverinfo: 'skip',
  };
}

/**
 * Bars across x at each (x, y), drawn without a marker at their centre (mode 'none'): Plotly styles every
 * marker on each redraw, which made the markers most of the time a pick edit took to show here. `plus`
 * is the arm towards higher x; `minus`, when given, the arm towards lower x (asymmetric bars), else the
 * same as `plus`. `width` is the length of the bars' end caps in pixels.
 */
function bars(
  name: string,
  x: number[],
  y: number[],
  plus: number[],
  o: { color: string; width: number; minus?: number[]; xaxis?: string; visible?: boolean },
): PlotData {
  return {
    type: 'scatter',
    mode: 'none',
    name,
    x,
    y,
    ...(o.xaxis ? { xaxis: o.xaxis } : {}),
    ...(o.visible !== undefined ? { visible: o.visible } : {}),
    error_x: {
      type: 'data',
      ...(o.minus ? { symmetric: false, arrayminus: o.minus } : {}),
      array: plus,
      color: o.color,
      thickness: 1,
      width: o.width,
    },
    hoverinfo: 'skip',
  };
}

export function ProfilePlot() {
  const d = useDerived();
  const units = useUnits();
  const hoveredKey = useApp((s) => s.view.hoveredInterval);
  const comparison = useApp((s) => s.comparison);
  const showVp = useApp((s) => s.view.showVp);
  // Memoised on the profile array itself: the late Vs30 spread (same profile) does not redraw the plot.
  const profile = d?.profile;
  const intervals = d?.intervals;
  const rows = useMemo(() => [...(profile ?? [])].sort((a, b) => a.topM - b.topM), [profile]);

  const data = useMemo(() => {
    const mid = rows.map((r) => disp('depth', units, r.midM));
    const vs = stepLine(rows, (r) => r.vsMps, units, 'velocity');
    const vp = stepLine(rows, (r) => r.vpMps, units, 'velocity');
    const g = stepLine(rows, (r) => r.gmaxKpa, units, 'modulus');
    const vs1 = stepLine(rows, (r) => r.vs1Mps, units, 'velocity');
    const withVp = rows.filter((r) => r.vpMps !== null && Number.isFinite(r.vpMps));
    // Vs: the 95% range from the core rows; +-1 sd only where a row has none (its own trace, named so).
    const vsBar = vsBars(rows, units);
    const out: PlotData[] = [
      stepTrace('Vs', vs, { color: COLOURS.S, width: 2 }),
      bars('Vs 95% range', vsBar.range95.x, vsBar.range95.y, vsBar.range95.plus, {
        color: COLOURS.S,
        width: 3,
        minus: vsBar.range95.minus,
      }),
      ...(vsBar.sdOnly.x.length
        ? [
            bars('Vs ± 1 sd (no 95% range)', vsBar.sdOnly.x, vsBar.sdOnly.y, vsBar.sdOnly.plus, {
              color: COLOURS.S,
              width: 3,
            }),
          ]
        : []),
      stepTrace('Vp', vp, { color: COLOURS.P, width: 1.6, dash: 'dash' }, { xaxis: 'x4', visible: showVp }),
      bars(
        'Vp ± 1 sd',
        withVp.map((r) => disp('velocity', units, r.vpMps!)),
        withVp.map((r) => disp('depth', units, r.midM)),
        withVp.map((r) => (r.vpSdMps !== null && Number.isFinite(r.vpSdMps) ? disp('velocity', units, r.vpSdMps) : 0)),
        { color: COLOURS.P, width: 3, xaxis: 'x4', visible: showVp },
      ),
      stepTrace('Gmax', g, { color: COLOURS.ink, width: 1.6 }, { xaxis: 'x2' }),
      bars(
        'Gmax ± 1 sd',
        rows.map((r) => disp('modulus', units, r.gmaxKpa)),
        mid,
        rows.map((r) => disp('modulus', units, r.gmaxSdKpa)),
        { color: COLOURS.ink, width: 2, xaxis: 'x2' },
      ),
      stepTrace('Vs1', vs1, { color: '#52606d', width: 1.6 }, { xaxis: 'x3' }),
    ];
    if (comparison) {
      const bottomM = rows.length ? rows[rows.length - 1].bottomM : 30;
      const c = comparisonSteps(comparison, bottomM, units);
      out.push(stepTrace(`compared: ${comparison.name}`, c, { color: COLOURS.compare, width: 1.6, dash: 'dash' }));
    }
    return out;
  }, [rows, units, comparison, showVp]);

  const [bandTopM, bandBottomM] = hoveredBand(intervals, hoveredKey);
  const layout = useMemo(() => {
    const v = label('velocity', units);
    return {
      ...BASE_LAYOUT,
      uirevision: 'profile',
      margin: { l: 48, r: 10, t: 44, b: 8 },
      // Vs and Vp on their own axes: a noisy Vp (thousands of m/s) never squeezes the Vs column.
      xaxis: { domain: showVp ? [0, 0.32] : [0, 0.5], title: { text: `Vs (${v})`, standoff: 4 }, ...TOP_AXIS },
      xaxis4: {
        domain: [0.38, 0.6],
        title: { text: `Vp (${v})`, standoff: 4 },
        ...TOP_AXIS,
        nticks: 3,
        anchor: 'y',
        visible: showVp,
      },
      xaxis2: {
        domain: showVp ? [0.66, 0.81] : [0.56, 0.77],
        title: { text: `Gmax (${label('modulus', units)})`, standoff: 4 },
        ...TOP_AXIS,
        nticks: 3,
        anchor: 'y',
      },
      xaxis3: {
        domain: showVp ? [0.86, 1] : [0.83, 1],
        title: { text: `Vs1 (${v})`, standoff: 4 },
        ...TOP_AXIS,
        nticks: 3,
        anchor: 'y',
      },
      yaxis: {
        title: { text: `Depth (${label('depth', units)})` },
        autorange: 'reversed',
        gridcolor: COLOURS.grid,
        zeroline: false,
      },
      shapes: bandShapes(bandTopM, bandBottomM, (m) => disp('depth', units, m)),
    };
  }, [bandTopM, bandBottomM, units, showVp]);

  const wave = useApp((s) => s.view.wave);
  const onMove = (ev: React.MouseEvent<HTMLDivElement>) => {
    const div = ev.currentTarget.querySelector('[data-plot="profile"]') as HTMLDivElement | null;
    const p = div && pointerToData(div, ev.clientX, ev.clientY);
    if (!p || !intervals) return;
    const depthM = fromDisplay('depth', units, p.y);
    const r = intervals.find((x) => x.wave === wave && x.chosen && depthM >= x.topM && depthM < x.bottomM);
    const key = r?.key ?? null;
    if (key !== useApp.getState().view.hoveredInterval) setView({ hoveredInterval: key });
  };
  return (
    <div
      className="profile-plot"
      onMouseMove={onMove}
      onMouseLeave={() => useApp.getState().view.hoveredInterval && setView({ hoveredInterval: null })}
    >
      <Plot name="profile" data={data} layout={layout} className="plot" />
    </div>
  );
}

/** Value axes on top (depth plots read downward), never below zero even when an error bar is wide. */
const TOP_AXIS = {
  gridcolor: COLOURS.grid,
  zeroline: false,
  side: 'top',
  nticks: 4,
  tickangle: 0,
  autorangeoptions: { minallowed: 0 },
  tickfont: { size: 10 },
};

interface IntervalGroup {
  key: IntervalKey;
  topM: number;
  bottomM: number;
  byMethod: Partial<Record<IntervalMethod, IntervalValue>>;
  chosen: IntervalValue | undefined;
}

function groups(intervals: readonly IntervalValue[], wave: 'S' | 'P'): IntervalGroup[] {
  const map = new Map<string, IntervalGroup>();
  for (const r of intervals) {
    if (r.wave !== wave) continue;
    let g = map.get(r.key);
    if (!g) map.set(r.key, (g = { key: r.key, topM: r.topM, bottomM: r.bottomM, byMethod: {}, chosen: undefined }));
    g.byMethod[r.method] = r;
    if (r.chosen) g.chosen = r;
  }
  return [...map.values()].sort((a, b) => a.topM - b.topM);
}

interface RowProps {
  /** Everything the row shows, as one string: the row redraws only when it changes. */
  sig: string;
  groupKey: IntervalKey;
  top: string;
  bottom: string;
  cells: { method: IntervalMethod; chosen: boolean; text: string }[];
  own: IntervalMethod | undefined;
  excluded: boolean;
  selected: boolean;
  hovered: boolean;
  methods: IntervalMethod[];
  profileMethod: IntervalMethod;
  depLabel: string;
  stationB: StationKey | null;
  compare: { other: string; diff: string } | null;
  showCompare: boolean;
  flags: string;
  /** The used value's 95% range as text ('low–high'), '–' without an sd. */
  range95: string;
}

const IntervalRow = memo(
  function IntervalRow(p: RowProps) {
    return (
      <tr
        data-key={p.groupKey}
        className={`${p.selected ? 'sel' : ''} ${p.hovered ? 'hov' : ''} ${p.excluded ? 'off' : ''}`}
        onMouseEnter={() => setView({ hoveredInterval: p.groupKey })}
        onClick={() => setView({ selectedInterval: p.groupKey, selectedStation: p.stationB })}
      >
        <td>{p.top}</td>
        <td>{p.bottom}</td>
        {p.showCompare && (
          <td data-col="compare" className="cmp">
            {p.compare?.other ?? '–'}
          </td>
        )}
        {p.showCompare && (
          <td data-col="difference" className="cmp">
            {p.compare?.diff ?? '–'}
          </td>
        )}
        <td className="flags" title={p.flags}>
          {p.flags}
        </td>
        <td data-col="range95" className="range95">
          {p.range95}
        </td>
        {p.cells.map((c) => (
          <td key={c.method} className={c.chosen ? 'chosen' : ''} data-method={c.method}>
            {c.chosen ? '● ' : ''}
            {c.text}
          </td>
        ))}
        <td>
          <select
            value={p.own ?? ''}
            onClick={(e) => e.stopPropagation()}
            onChange={(e) => setIntervalMethod(p.groupKey, e.target.value ? (e.target.value as IntervalMethod) : null)}
            aria-label={`Method for ${p.top}-${p.bottom} ${p.depLabel}`}
          >
            <option value="">({methodInfo(p.profileMethod).shortLabel})</option>
            {p.methods.map((m) => (
              <option key={m} value={m}>
                {methodInfo(m).shortLabel}
              </option>
            ))}
          </select>
          <button
            className="link"
            title={p.excluded ? 'Put this interval back in the profile' : 'Leave this interval out of the profile'}
            onClick={(e) => {
              e.stopPropagation();
              toggleIntervalExcluded(p.groupKey);
            }}
          >
            {p.excluded ? 'use' : 'omit'}
          </button>
        </td>
      </tr>
    );
  },
  (a, b) => a.sig === b.sig && a.selected === b.selected && a.hovered === b.hovered,
);

/** Comparison difference of the interval (matched by its mid-depth, as the core reports it). */
function differenceAt(
  cmp: ComparisonResult | null | undefined,
  topM: number,
  bottomM: number,
): ComparisonResult['differences'][number] | undefined {
  if (!cmp) return undefined;
  const mid = 0.5 * (topM + bottomM);
  return cmp.differences.find((x) => Math.abs(x.depthM - mid) < 1e-6);
}

export function IntervalsTable() {
  const d = useDerived();
  const units = useUnits();
  const wave = useApp((s) => s.view.wave);
  const selected = useApp((s) => s.view.selectedInterval);
  const hovered = useApp((s) => s.view.hoveredInterval);
  const edits = useApp((s) => s.edits);
  const kind = useApp((s) => s.survey.kind);
  // What the profile takes: the settings' method, or the kind's default where that one does not apply.
  const profileMethod = useApp((s) => profileMethodFor(s.settings.intervals.profileMethod, s.survey.kind));
  const intervals = d?.intervals;
  const cmp = d?.comparison;
  const list = useMemo(() => groups(intervals ?? [], wave), [intervals, wave]);
  const methods = useMemo(() => INTERVAL_METHODS.filter((m) => list.some((g) => g.byMethod[m])), [list]);
  const showCompare = !!cmp && wave === 'S';
  const v = label('velocity', units);
  const dep = label('depth', units);
  const rows = useMemo(
    () =>
      list.map((g) => {
        const own = edits.chosenMethod[g.key];
        const excluded = edits.excludedIntervals.includes(g.key);
        const cells = methods.map((m) => ({
          method: m,
          chosen: !!g.byMethod[m]?.chosen,
          text: fmt('velocity', units, g.byMethod[m]?.velocityMps),
        }));
        const diff = showCompare ? differenceAt(cmp, g.topM, g.bottomM) : undefined;
        const compare = diff
          ? {
              other: fmt('velocity', units, diff.comparisonVsMps),
              diff: `${diff.differencePct > 0 ? '+' : ''}${diff.differencePct.toFixed(1)}`,
            }
          : null;
        const flags = [...new Set([...(g.chosen?.flags ?? []), ...(excluded ? ['omitted'] : [])])].join(', ');
        const flagText = unitText(flags, units);
        const top = fmt('depth', units, g.topM);
        const bottom = fmt('depth', units, g.bottomM);
        const stationB = g.chosen?.stationB ?? g.byMethod.onset?.stationB ?? null;
        const c = g.chosen;
        const range95 = c ? fmtRange95(units, c.low95Mps, c.high95Mps) : '–';
        const sig = JSON.stringify([
          top,
          bottom,
          cells,
          own,
          excluded,
          methods,
          profileMethod,
          dep,
          stationB,
          compare,
          showCompare,
          flagText,
          range95,
        ]);
        return {
          sig,
          groupKey: g.key,
          top,
          bottom,
          cells,
          own,
          excluded,
          methods,
          profileMethod,
          depLabel: dep,
          stationB,
          compare,
          showCompare,
          flags: flagText,
          range95,
        };
      }),
    [list, methods, edits.chosenMethod, edits.excludedIntervals, units, cmp, showCompare, profileMethod, dep],
  );
  return (
    <div className="intervals">
      <div className="row-controls">
        <label>
          Profile method{' '}
          <select
            value={profileMethod}
            onChange={(e) => updateSettings({ intervals: { profileMethod: e.target.value as IntervalMethod } })}
            aria-label="Profile method"
          >
            {INTERVAL_METHODS.filter((m) => methodApplies(m, kind)).map((m) => (
              <option key={m} value={m}>
                {methodInfo(m).label}
              </option>
            ))}
          </select>
        </label>
        <span className="muted">{wave} intervals · ● = value in the profile</span>
      </div>
      <div className="table-wrap">
        <table
          className="num"
          data-testid="intervals-table"
          onMouseLeave={() => useApp.getState().view.hoveredInterval && setView({ hoveredInterval: null })}
        >
          <thead>
            <tr>
              <th>Top ({dep})</th>
              <th>Bottom ({dep})</th>
              {showCompare && (
                <th className="cmp" title="Travel-time average of the compared profile over the interval">
                  Compared ({v})
                </th>
              )}
              {showCompare && (
                <th className="cmp" title="(compared - used) / used Vs of the interval">
                  Diff. (%)
                </th>
              )}
              {/* Flags before the method columns so they stay in view in the narrow Profile pane. */}
              <th className="text">Flags</th>
              <th
                className="range95"
                title="95% range of the value in the profile: V ∓ k95 × sd, k95 per test kind and method from the bench's training intervals (heavier-tailed than a Gaussian; docs/true-vs.md)"
              >
                95% ({v})
              </th>
              {methods.map((m) => (
                <th key={m} title={methodInfo(m).label}>
                  {methodInfo(m).shortLabel} ({v})
                </th>
              ))}
              <th>Used</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <IntervalRow
                key={r.groupKey}
                {...r}
                selected={r.groupKey === selected}
                hovered={r.groupKey === hovered}
              />
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}

/** "Compare with another profile...": a CSV of depth and Vs, or depth and Rayleigh-wave velocity. */
export function ComparisonControl() {
  const comparison = useApp((s) => s.comparison);
  const d = useDerived();
  const units = useUnits();
  const [open, setOpen] = useState(false);
  const [kind, setKind] = useState<'vs' | 'rayleigh'>('vs');
  const [nuText, setNuText] = useState(String(DEFAULT_RAYLEIGH_POISSON));
  const [error, setError] = useState<ErrorInfo | null>(null);
  const fileRef = useRef<HTMLInputElement>(null);
  const v = label('velocity', units);
  const nu = Number(nuText.replace(',', '.'));
  const readFile = async (f: File) => {
    setError(null);
    const text = await f.text();
    const err = loadComparison(text, f.name, kind, nu);
    if (err) setError(err);
    else setOpen(false);
  };
  const result = d?.comparison;
  return (
    <div className="compare" data-testid="comparison">
      {comparison ? (
        <div className="compare-line">
          <span className="swatch-dash" aria-hidden="true" /> Compared with <b>{comparison.name}</b>
          {comparison.source === 'rayleigh'
            ? ` (Rayleigh velocity → Vs, Viktorov, ν = ${comparison.poissonRatio ?? DEFAULT_RAYLEIGH_POISSON})`
            : ' (Vs)'}
          : its Vs30 = <span data-testid="comparison-vs30">{fmt('velocity', units, result?.vs30?.vsMps)}</span> {v}
          {d?.site.vs30 ? ` · ours ${fmt('velocity', units, d.site.vs30.vsMps)} ${v}` : ''}{' '}
          <button className="link" onClick={removeComparison}>
            remove
          </button>
          {comparison.notes?.length ? <div className="small muted">{comparison.notes.join('; ')}</div> : null}
        </div>
      ) : (
        <button className="link" onClick={() => setOpen(!open)} aria-expanded={open}>
          Compare with another profile…
        </button>
      )}
      {open && !comparison && (
        <div className="compare-form">
          <label>
            Column holds{' '}
            <select
              value={kind}
              onChange={(e) => setKind(e.target.value as 'vs' | 'rayleigh')}
              aria-label="Comparison velocity kind"
            >
              <option value="vs">Vs (shear-wave velocity)</option>
              <option value="rayleigh">Rayleigh-wave velocity</option>
            </select>
          </label>
          {kind === 'rayleigh' && (
            <label title="Vs = VR (1 + ν) / (0.87 + 1.12 ν), Viktorov's approximation">
              Poisson's ratio ν{' '}
              <input
                className="field"
                size={4}
                value={nuText}
                onChange={(e) => setNuText(e.target.value)}
                aria-label="Poisson's ratio"
              />
            </label>
          )}
          <button onClick={() => fileRef.current?.click()}>Choose CSV…</button>
          <input
            ref={fileRef}
            type="file"
            accept=".csv,.txt,text/csv,text/plain"
            hidden
            data-testid="comparison-input"
            onChange={(e) => {
              const f = e.target.files?.[0];
              if (f) void readFile(f);
              e.target.value = '';
            }}
          />
          <div className="small muted">
            Depth and velocity columns (e.g. depth_m, vs_mps; m or ft, m/s or ft/s in the header); each row is the top
            of a layer.
            {kind === 'rayleigh'
              ? " Converted to Vs with Viktorov's approximation VR/Vs = (0.87 + 1.12 ν)/(1 + ν)."
              : ''}
          </div>
        </div>
      )}
      {error && (
        <div className="error" role="alert">
          The comparison file was not read: {error.message}
        </div>
      )}
    </div>
  );
}

export function ProfilePane() {
  const d = useDerived();
  const showVp = useApp((s) => s.view.showVp);
  const units = useUnits();
  const vs30 = d?.site.vs30;
  const vsRowsWithoutRange = (d?.profile ?? []).some((r) => r.vsLow95Mps === null || r.vsHigh95Mps === null);
  return (
    <section className="profile" aria-label="Profile">
      <div className="pane-head">
        <h2>Profile</h2>
        <span className="muted" data-testid="vs30-line">
          {vs30
            ? `Vs30 = ${fmt('velocity', units, vs30.vsMps)} ${label('velocity', units)}`
            : d?.site.setupIncomplete
              ? 'Vs30 withheld: set-up incomplete'
              : 'Vs30: –'}
        </span>
        <span className="spacer" />
        <button onClick={() => setView({ sheet: 'site' })}>Site…</button>
        <button onClick={() => setView({ sheet: 'export' })}>Export…</button>
      </div>
      <ComparisonControl />
      <div className="pane-note" aria-label="Profile legend">
        <span style={{ color: COLOURS.S }}>━ Vs</span> ·{' '}
        <label title="Show or hide the Vp column">
          <input type="checkbox" checked={showVp} onChange={(e) => setView({ showVp: e.target.checked })} />{' '}
          <span style={{ color: COLOURS.P }}>╍ Vp</span>
        </label>
        {d?.comparison ? (
          <>
            {' '}
            · <span style={{ color: COLOURS.compare }}>╍ compared profile</span>
          </>
        ) : null}{' '}
        <span
          data-testid="profile-bars-legend"
          title="Vs bars: V ∓ k95 × sd of the interval in the profile, k95 per test kind and method from the bench's training intervals (docs/true-vs.md); an interval without a range keeps ±1 sd. Vp and Gmax bars: ±1 sd."
        >
          · Vs bars 95% range{vsRowsWithoutRange ? ' (±1 sd where none)' : ''}; Vp, Gmax ±1 sd
        </span>
      </div>
      <CurrentSetupProblems />
      <div
        className={`profile-plot-box ${d?.site.setupIncomplete ? 'blocked-results' : ''}`}
        data-blocked={!!d?.site.setupIncomplete}
      >
        <ProfilePlot />
      </div>
      <IntervalsTable />
      <p className="caution-line">Results need review by a qualified professional before use; local codes govern.</p>
    </section>
  );
}
