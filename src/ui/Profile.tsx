/**
 * Profile: Vs and Vp step profile with one-sigma bars, Gmax and Vs1 beside it, and the method
 * comparison table (every method's interval velocity, the one used, flags as short words).
 */
import { useMemo } from 'react';
import { INTERVAL_METHODS, type IntervalMethod } from '../core/settings';
import type { IntervalValue } from '../core/velocity/intervals';
import type { ProfileRow } from '../core/pipeline';
import { useDerived } from '../state/derived';
import { setIntervalMethod, toggleIntervalExcluded, updateSettings } from '../state/edits';
import { setView, useApp } from '../state/store';
import { METHOD_SHORT, METHOD_WORDS } from './picks';
import { BASE_LAYOUT, COLOURS, Plot, pointerToData, type PlotData } from './plot';
import { fromDisplay } from '../core/units';
import { disp, fmt, label, useUnits } from './units';
import type { UnitSystem } from '../core/units';

function stepLine(rows: readonly ProfileRow[], value: (r: ProfileRow) => number | null, units: UnitSystem, kind: 'velocity' | 'modulus'): { x: (number | null)[]; y: (number | null)[] } {
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

export function ProfilePlot() {
  const d = useDerived();
  const units = useUnits();
  const hoveredKey = useApp((s) => s.view.hoveredInterval);
  const rows = useMemo(() => [...(d?.profile ?? [])].sort((a, b) => a.topM - b.topM), [d]);

  const data = useMemo(() => {
    const mid = rows.map((r) => disp('depth', units, r.midM));
    const vs = stepLine(rows, (r) => r.vsMps, units, 'velocity');
    const vp = stepLine(rows, (r) => r.vpMps, units, 'velocity');
    const g = stepLine(rows, (r) => r.gmaxKpa, units, 'modulus');
    const vs1 = stepLine(rows, (r) => r.vs1Mps, units, 'velocity');
    const out: PlotData[] = [
      { type: 'scatter', mode: 'lines', name: 'Vs', x: vs.x, y: vs.y, line: { color: COLOURS.S, width: 2 }, hoverinfo: 'skip' },
      {
        type: 'scatter', mode: 'markers', name: 'Vs ± 1 sd', x: rows.map((r) => disp('velocity', units, r.vsMps)), y: mid,
        marker: { symbol: 'circle', size: 5, color: COLOURS.S }, error_x: { type: 'data', array: rows.map((r) => disp('velocity', units, r.vsSdMps)), color: COLOURS.S, thickness: 1, width: 3 }, hoverinfo: 'skip',
      },
      { type: 'scatter', mode: 'lines', name: 'Vp', x: vp.x, y: vp.y, line: { color: COLOURS.P, width: 1.6, dash: 'dash' }, hoverinfo: 'skip' },
      { type: 'scatter', mode: 'lines', name: 'Gmax', x: g.x, y: g.y, xaxis: 'x2', line: { color: COLOURS.ink, width: 1.6 }, hoverinfo: 'skip' },
      {
        type: 'scatter', mode: 'markers', name: 'Gmax ± 1 sd', x: rows.map((r) => disp('modulus', units, r.gmaxKpa)), y: mid, xaxis: 'x2',
        marker: { size: 4, color: COLOURS.ink }, error_x: { type: 'data', array: rows.map((r) => disp('modulus', units, r.gmaxSdKpa)), color: COLOURS.ink, thickness: 1, width: 2 }, hoverinfo: 'skip',
      },
      { type: 'scatter', mode: 'lines', name: 'Vs1', x: vs1.x, y: vs1.y, xaxis: 'x3', line: { color: '#52606d', width: 1.6 }, hoverinfo: 'skip' },
    ];
    return out;
  }, [rows, units]);

  const layout = useMemo(() => {
    const hovered = hoveredKey ? d?.intervals.find((r) => r.key === hoveredKey) : undefined;
    const v = label('velocity', units);
    return {
      ...BASE_LAYOUT,
      margin: { l: 48, r: 10, t: 44, b: 8 },
      xaxis: { domain: [0, 0.5], title: { text: `Vs, Vp (${v})`, standoff: 4 }, ...TOP_AXIS },
      xaxis2: { domain: [0.56, 0.77], title: { text: `Gmax (${label('modulus', units)})`, standoff: 4 }, ...TOP_AXIS, nticks: 3, anchor: 'y' },
      xaxis3: { domain: [0.83, 1], title: { text: `Vs1 (${v})`, standoff: 4 }, ...TOP_AXIS, nticks: 3, anchor: 'y' },
      yaxis: { title: { text: `Depth (${label('depth', units)})` }, autorange: 'reversed', gridcolor: COLOURS.grid, zeroline: false },
      shapes: hovered
        ? [{ type: 'rect', xref: 'paper', x0: 0, x1: 1, yref: 'y', y0: disp('depth', units, hovered.topM), y1: disp('depth', units, hovered.bottomM), fillcolor: COLOURS.band, line: { width: 0 }, layer: 'below' }]
        : [],
    };
  }, [hoveredKey, d, units]);

  const wave = useApp((s) => s.view.wave);
  const onMove = (ev: React.MouseEvent<HTMLDivElement>) => {
    const div = ev.currentTarget.querySelector('[data-plot="profile"]') as HTMLDivElement | null;
    const p = div && pointerToData(div, ev.clientX, ev.clientY);
    if (!p || !d) return;
    const depthM = fromDisplay('depth', units, p.y);
    const r = d.intervals.find((x) => x.wave === wave && x.chosen && depthM >= x.topM && depthM < x.bottomM);
    const key = r?.key ?? null;
    if (key !== hoveredKey) setView({ hoveredInterval: key });
  };
  return (
    <div className="profile-plot" onMouseMove={onMove} onMouseLeave={() => setView({ hoveredInterval: null })}>
      <Plot name="profile" data={data} layout={layout} className="plot" />
    </div>
  );
}

/** Value axes on top (depth plots read downward), never below zero even when an error bar is wide. */
const TOP_AXIS = { gridcolor: COLOURS.grid, zeroline: false, side: 'top', nticks: 4, tickangle: 0, autorangeoptions: { minallowed: 0 }, tickfont: { size: 10 } };

interface IntervalGroup {
  key: string;
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

export function IntervalsTable() {
  const d = useDerived();
  const units = useUnits();
  const wave = useApp((s) => s.view.wave);
  const selected = useApp((s) => s.view.selectedInterval);
  const hovered = useApp((s) => s.view.hoveredInterval);
  const edits = useApp((s) => s.edits);
  const settings = useApp((s) => s.settings);
  const list = useMemo(() => groups(d?.intervals ?? [], wave), [d, wave]);
  const methods = INTERVAL_METHODS.filter((m) => list.some((g) => g.byMethod[m]));
  const v = label('velocity', units);
  const dep = label('depth', units);
  return (
    <div className="intervals">
      <div className="row-controls">
        <label>
          Profile method{' '}
          <select value={settings.profileMethod} onChange={(e) => updateSettings({ profileMethod: e.target.value as IntervalMethod })} aria-label="Profile method">
            {INTERVAL_METHODS.map((m) => (
              <option key={m} value={m}>
                {METHOD_WORDS[m]}
              </option>
            ))}
          </select>
        </label>
        <span className="muted">{wave} intervals · ● = value in the profile</span>
      </div>
      <div className="table-wrap">
        <table className="num" data-testid="intervals-table" onMouseLeave={() => setView({ hoveredInterval: null })}>
          <thead>
            <tr>
              <th>Top ({dep})</th>
              <th>Bottom ({dep})</th>
              {methods.map((m) => (
                <th key={m} title={METHOD_WORDS[m]}>
                  {METHOD_SHORT[m]} ({v})
                </th>
              ))}
              <th>Used</th>
              <th>Flags</th>
            </tr>
          </thead>
          <tbody>
            {list.map((g) => {
              const own = edits.chosenMethod[g.key];
              const excluded = edits.excludedIntervals.includes(g.key);
              return (
                <tr
                  key={g.key}
                  data-key={g.key}
                  className={`${g.key === selected ? 'sel' : ''} ${g.key === hovered ? 'hov' : ''} ${excluded ? 'off' : ''}`}
                  onMouseEnter={() => setView({ hoveredInterval: g.key })}
                  onClick={() => setView({ selectedInterval: g.key, selectedStation: g.chosen?.stationB ?? g.byMethod.onset?.stationB ?? null })}
                >
                  <td>{fmt('depth', units, g.topM)}</td>
                  <td>{fmt('depth', units, g.bottomM)}</td>
                  {methods.map((m) => {
                    const r = g.byMethod[m];
                    return (
                      <td key={m} className={r?.chosen ? 'chosen' : ''} data-method={m}>
                        {r?.chosen ? '● ' : ''}
                        {fmt('velocity', units, r?.velocityMps)}
                      </td>
                    );
                  })}
                  <td>
                    <select
                      value={own ?? ''}
                      onClick={(e) => e.stopPropagation()}
                      onChange={(e) => setIntervalMethod(g.key, e.target.value ? (e.target.value as IntervalMethod) : null)}
                      aria-label={`Method for ${fmt('depth', units, g.topM)}-${fmt('depth', units, g.bottomM)} ${dep}`}
                    >
                      <option value="">({METHOD_SHORT[settings.profileMethod]})</option>
                      {methods.map((m) => (
                        <option key={m} value={m}>
                          {METHOD_SHORT[m]}
                        </option>
                      ))}
                    </select>
                    <button
                      className="link"
                      title={excluded ? 'Put this interval back in the profile' : 'Leave this interval out of the profile'}
                      onClick={(e) => {
                        e.stopPropagation();
                        toggleIntervalExcluded(g.key);
                      }}
                    >
                      {excluded ? 'use' : 'omit'}
                    </button>
                  </td>
                  <td className="flags">{[...new Set([...(g.chosen?.flags ?? []), ...(excluded ? ['omitted'] : [])])].join(', ')}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </div>
  );
}

export function ProfilePane() {
  const d = useDerived();
  const units = useUnits();
  const vs30 = d?.site.vs30;
  return (
    <section className="profile" aria-label="Profile">
      <div className="pane-head">
        <h2>Profile</h2>
        <span className="muted" data-testid="vs30-line">
          {vs30 ? `Vs30 = ${fmt('velocity', units, vs30.vsMps)} ${label('velocity', units)}` : 'Vs30: –'}
        </span>
        <span className="spacer" />
        <button onClick={() => setView({ sheet: 'site' })}>Site…</button>
        <button onClick={() => setView({ sheet: 'export' })}>Export…</button>
      </div>
      <ProfilePlot />
      <IntervalsTable />
      <p className="caution-line">Results need review by a qualified professional before use; local codes govern.</p>
    </section>
  );
}
