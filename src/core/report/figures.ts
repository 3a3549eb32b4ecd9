/**
 * Report figures as SVG strings (no DOM): trace board with picks, travel time with layer fits, Vs/Vp
 * profile with error bars, Gmax and Vs1. Each figure carries its own title, legend and axis units, so it
 * can stand alone as an SVG file or a PNG. Values are drawn in the report's unit system.
 */
import { toDisplay, unitSpec, type UnitSystem } from '../units';
import type { ReportData, ReportProfileRow, ReportTrace, ReportWave } from './data';
import { reportedText } from './digits';
import { vsBarMps } from '../velocity/sdCalibration';
import {
  axes,
  c,
  clipFor,
  COLOURS,
  errorBar,
  esc,
  figureRoot,
  legend,
  lineSwatch,
  marker,
  niceRange,
  sx,
  sy,
  type LegendItem,
  type MarkerKind,
  type Panel,
} from './svg';

export interface Figure {
  id: 'trace-board' | 'travel-time' | 'profile' | 'stiffness';
  /** Short name (file names, buttons). */
  name: string;
  title: string;
  caption: string;
  svg: string;
  width: number;
  height: number;
}

export const FIGURE_WIDTH = 1600;
/** Most traces drawn per trace-board panel; more are thinned to every k-th depth (said in the caption). */
export const MAX_TRACES_PER_PANEL = 48;
/** Time columns per trace: each keeps the lowest and highest sample it covers (min-max decimation). */
export const TRACE_COLUMNS = 320;

function holeText(d: ReportData): string {
  return d.title.holes.length ? `${d.title.holes.length > 1 ? 'holes' : 'hole'} ${d.title.holes.join(', ')}` : '';
}

function heading(title: string, sub: string): string {
  return (
    `<text x="40" y="48" font-size="32" font-weight="700">${esc(title)}</text>` +
    `<text x="40" y="84" font-size="22" fill="${COLOURS.ink}">${esc(sub)}</text>`
  );
}

function subline(d: ReportData): string {
  return [d.title.project, d.title.site, holeText(d), d.title.testDate].filter(Boolean).join(' · ');
}

const swatchMarker = (kind: MarkerKind, wave: ReportWave, alt = false) =>
  `<g>${marker(kind, wave, 22, 12, 8, alt)}</g>`;

/** The figure record around its drawn parts (the SVG root carries the id and the title). */
function figureOf(f: Omit<Figure, 'svg'> & { parts: readonly string[] }): Figure {
  return {
    id: f.id,
    name: f.name,
    title: f.title,
    caption: f.caption,
    svg: figureRoot(f.id, f.width, f.height, f.parts.join(''), f.title),
    width: f.width,
    height: f.height,
  };
}

// ------------------------------------------------------------------ trace board

/**
 * Min-max decimation of one trace over [t0S, t1S] into `columns` columns: each column gives its lowest
 * and highest sample (in time order), so peaks survive; fewer samples than 2 x columns are kept as they are.
 * Amplitudes are divided by the trace's largest absolute value in the window.
 */
export function decimateTrace(
  samples: ArrayLike<number>,
  sampleIntervalS: number,
  delayS: number,
  t0S: number,
  t1S: number,
  columns: number,
): { tS: number[]; a: number[] } {
  const i0 = Math.max(0, Math.ceil((t0S - delayS) / sampleIntervalS));
  const i1 = Math.min(samples.length - 1, Math.floor((t1S - delayS) / sampleIntervalS));
  const tS: number[] = [];
  const a: number[] = [];
  if (i1 < i0) return { tS, a };
  let peak = 0;
  for (let i = i0; i <= i1; i++) peak = Math.max(peak, Math.abs(samples[i]));
  const scale = peak > 0 ? 1 / peak : 0;
  const n = i1 - i0 + 1;
  if (n <= 2 * columns) {
    for (let i = i0; i <= i1; i++) {
      tS.push(delayS + i * sampleIntervalS);
      a.push(samples[i] * scale);
    }
    return { tS, a };
  }
  for (let col = 0; col < columns; col++) {
    const s = i0 + Math.floor((col * n) / columns);
    const e = i0 + Math.floor(((col + 1) * n) / columns) - 1;
    let lo = s;
    let hi = s;
    for (let i = s; i <= e; i++) {
      if (samples[i] < samples[lo]) lo = i;
      if (samples[i] > samples[hi]) hi = i;
    }
    for (const i of lo <= hi ? [lo, hi] : [hi, lo]) {
      tS.push(delayS + i * sampleIntervalS);
      a.push(samples[i] * scale);
    }
  }
  return { tS, a };
}

/** Every k-th trace so that at most `max` remain (the deepest is always kept). */
export function thinTraces<T>(list: readonly T[], max: number): { kept: T[]; every: number } {
  if (list.length <= max) return { kept: [...list], every: 1 };
  const every = Math.ceil(list.length / max);
  const kept = list.filter((_, i) => i % every === 0);
  if ((list.length - 1) % every !== 0) kept.push(list[list.length - 1]);
  return { kept, every };
}

function traceGroups(traces: readonly ReportTrace[]): { wave: ReportWave; receiver: string; traces: ReportTrace[] }[] {
  const groups: { wave: ReportWave; receiver: string; traces: ReportTrace[] }[] = [];
  for (const wave of ['S', 'P'] as ReportWave[]) {
    const receivers = [...new Set(traces.filter((t) => t.wave === wave).map((t) => t.receiver))];
    for (const receiver of receivers)
      groups.push({
        wave,
        receiver,
        traces: traces.filter((t) => t.wave === wave && t.receiver === receiver).sort((a, b) => a.depthM - b.depthM),
      });
  }
  return groups.slice(0, 4);
}

export function traceBoardFigure(d: ReportData): Figure {
  const units = d.title.units;
  const dep = unitSpec('depth', units).label;
  const groups = traceGroups(d.traces);
  const W = FIGURE_WIDTH;
  const H = 1500;
  const items: LegendItem[] = [
    { label: 'S working trace (difference of reversed hits)', swatch: lineSwatch(COLOURS.S) },
    { label: 'P working trace (sum)', swatch: lineSwatch(COLOURS.P) },
    { label: 'automatic pick', swatch: swatchMarker('auto', 'S') },
    { label: 'edited pick', swatch: swatchMarker('edited', 'S') },
    { label: 'excluded station (trace greyed)', swatch: swatchMarker('excluded', 'S') },
  ];
  const leg = legend(items, 40, 104, W - 80);
  const top = 104 + leg.height + 40;
  const bottom = H - 100;
  const gap = 40;
  const left = 120;
  const panelW = groups.length ? (W - left - 40 - gap * (groups.length - 1)) / groups.length : W - left - 40;
  const parts: string[] = [heading('Trace board with first-arrival picks', subline(d)), leg.svg];
  let thinned = 1;
  const allDepths = d.traces.map((t) => toDisplay('depth', units, t.depthM));
  const dMin = allDepths.length ? Math.min(...allDepths) : 0;
  const dMax = allDepths.length ? Math.max(...allDepths) : 1;
  groups.forEach((g, gi) => {
    const { kept, every } = thinTraces(g.traces, MAX_TRACES_PER_PANEL);
    thinned = Math.max(thinned, every);
    const depths = kept.map((t) => toDisplay('depth', units, t.depthM));
    const steps = depths
      .slice(1)
      .map((v, i) => v - depths[i])
      .filter((s) => s > 1e-9);
    const step = steps.length ? steps.sort((a, b) => a - b)[Math.floor(steps.length / 2)] : 1;
    const picks = kept.map((t) => t.pick?.timeS).filter((x): x is number => x !== undefined && Number.isFinite(x));
    const t0 = Math.min(0, ...kept.map((t) => t.delayS));
    const traceEnd = Math.max(...kept.map((t) => t.delayS + (t.samples.length - 1) * t.sampleIntervalS), 0.01);
    const t1 = picks.length ? Math.min(traceEnd, Math.max(...picks) * 1.6 + 0.005) : traceEnd;
    const p: Panel = {
      x: left + gi * (panelW + gap),
      y: top,
      w: panelW,
      h: bottom - top,
      xRange: niceRange(t0 * 1000, t1 * 1000, 4),
      yRange: [dMin - step, dMax + step],
    };
    const clip = `tb${gi}`;
    parts.push(`<defs>${clipFor(clip, p)}</defs>`);
    parts.push(axes(p, 'Time after trigger (ms)', gi === 0 ? `Depth (${dep})` : '', { yTicks: gi === 0 }));
    parts.push(
      `<text x="${c(p.x + p.w / 2)}" y="${c(p.y - 12)}" text-anchor="middle" font-size="22" font-weight="600">${esc(`${g.wave} · ${g.receiver}`)}</text>`,
    );
    const halfPx = Math.abs(sy(p, step) - sy(p, 0)) * 0.45;
    const r = Math.max(4, Math.min(9, halfPx * 0.35));
    const colour = COLOURS[g.wave];
    const body: string[] = [];
    const marks: string[] = [];
    for (const t of kept) {
      const y0 = sy(p, toDisplay('depth', units, t.depthM));
      const dec = decimateTrace(
        t.samples,
        t.sampleIntervalS,
        t.delayS,
        p.xRange[0] / 1000,
        p.xRange[1] / 1000,
        TRACE_COLUMNS,
      );
      if (dec.tS.length > 1) {
        let path = '';
        for (let i = 0; i < dec.tS.length; i++)
          path += `${i ? 'L' : 'M'}${c(sx(p, dec.tS[i] * 1000))} ${c(y0 - dec.a[i] * halfPx)}`;
        body.push(
          `<path d="${path}" fill="none" stroke="${t.excluded ? COLOURS.muted : colour}" stroke-width="${t.excluded ? 1.2 : 1.6}"/>`,
        );
      }
      if (t.pick && Number.isFinite(t.pick.timeS)) {
        const x = sx(p, t.pick.timeS * 1000);
        const kind: MarkerKind = t.excluded ? 'excluded' : t.pick.origin;
        const tick = halfPx * 0.9;
        marks.push(
          `<line x1="${c(x)}" y1="${c(y0 - tick)}" x2="${c(x)}" y2="${c(y0 + tick)}" stroke="${kind === 'excluded' ? COLOURS.muted : COLOURS.rim}" stroke-width="2.5"/>`,
        );
        marks.push(marker(kind, g.wave, x, y0 - tick - r - 2, r));
      }
    }
    parts.push(`<g clip-path="url(#${clip})">${body.join('')}${marks.join('')}</g>`);
  });
  if (!groups.length)
    parts.push(`<text x="${W / 2}" y="${H / 2}" text-anchor="middle" font-size="28">No working traces.</text>`);
  const title = 'Trace board with first-arrival picks';
  const caption =
    `Working traces by receiver depth (each scaled to its own largest value in the window shown), with the first-arrival pick ` +
    `of each: a tick across the trace at the pick time and its symbol above it. ` +
    (thinned > 1 ? `Every ${thinned}th depth is drawn (and the deepest); the tables list them all. ` : '') +
    `Traces are drawn from their lowest and highest sample per time column (min-max decimation), so peaks are kept.`;
  return figureOf({ id: 'trace-board', name: 'trace-board', title, caption, width: W, height: H, parts });
}

// ------------------------------------------------------------------ travel time

export function travelTimeFigure(d: ReportData): Figure {
  const units = d.title.units;
  const dep = unitSpec('depth', units).label;
  const vel = unitSpec('velocity', units).label;
  const W = FIGURE_WIDTH;
  const H = 1300;
  const receivers = [...new Set(d.travel.map((t) => t.receiver))];
  const items: LegendItem[] = [];
  for (const wave of ['S', 'P'] as ReportWave[])
    receivers.forEach((rc, ri) => {
      if (!d.travel.some((t) => t.wave === wave && t.receiver === rc)) return;
      const who = receivers.length > 1 ? ` (${rc})` : '';
      items.push({ label: `${wave} onset${who}, automatic`, swatch: swatchMarker('auto', wave, ri > 0) });
      if (d.travel.some((t) => t.wave === wave && t.receiver === rc && t.origin === 'edited'))
        items.push({ label: `${wave} onset${who}, edited`, swatch: swatchMarker('edited', wave, ri > 0) });
    });
  const fits = d.layerFits.filter((f) => f.interceptS !== null);
  if (fits.some((f) => f.wave === 'S'))
    items.push({ label: 'S straight-line fit per layer', swatch: lineSwatch(COLOURS.S) });
  if (fits.some((f) => f.wave === 'P'))
    items.push({ label: 'P straight-line fit per layer', swatch: lineSwatch(COLOURS.P, '12 7') });
  const leg = legend(items, 40, 104, W - 80);
  const top = 104 + leg.height + 30;
  const depths = d.travel.map((t) => toDisplay('depth', units, t.depthM));
  const times = d.travel.map((t) => t.timeS * 1000);
  const p: Panel = {
    x: 140,
    y: top,
    w: W - 200,
    h: H - 100 - top,
    xRange: niceRange(0, Math.max(1, ...times) * 1.05, 6),
    yRange: niceRange(0, Math.max(1, ...depths), 8),
  };
  const parts: string[] = [heading('Travel time', subline(d)), leg.svg, `<defs>${clipFor('tt', p)}</defs>`];
  parts.push(axes(p, 'Travel time after trigger (ms)', `Depth (${dep})`));
  const inner: string[] = [];
  for (const f of fits) {
    const receiver0 = d.travel.find((t) => t.wave === f.wave)?.receiver;
    const pts = d.travel
      .filter(
        (t) =>
          t.wave === f.wave && t.receiver === receiver0 && t.depthM >= f.topM - 1e-9 && t.depthM <= f.bottomM + 1e-9,
      )
      .sort((a, b) => a.depthM - b.depthM);
    if (pts.length < 2) continue;
    const path = pts
      .map(
        (t, i) =>
          `${i ? 'L' : 'M'}${c(sx(p, ((f.interceptS ?? 0) + t.pathM / f.velocityMps) * 1000))} ${c(sy(p, toDisplay('depth', units, t.depthM)))}`,
      )
      .join('');
    inner.push(
      `<path d="${path}" fill="none" stroke="${COLOURS[f.wave]}" stroke-width="3"${f.wave === 'P' ? ' stroke-dasharray="12 7"' : ''}/>`,
    );
    const mid = pts[Math.floor(pts.length / 2)];
    const lx = sx(p, ((f.interceptS ?? 0) + mid.pathM / f.velocityMps) * 1000) + 16;
    inner.push(
      `<text x="${c(lx)}" y="${c(sy(p, toDisplay('depth', units, mid.depthM)) + 7)}" font-size="20" fill="${COLOURS[f.wave]}" text-anchor="start">${esc(`${reportedText('velocity', f.velocityMps, units)} ${vel}`)}</text>`,
    );
  }
  for (const t of d.travel)
    inner.push(
      marker(
        t.origin,
        t.wave,
        sx(p, t.timeS * 1000),
        sy(p, toDisplay('depth', units, t.depthM)),
        7,
        receivers.indexOf(t.receiver) > 0,
      ),
    );
  parts.push(`<g clip-path="url(#tt)">${inner.join('')}</g>`);
  const title = 'Travel time';
  const caption =
    'First-arrival (onset) time of each station against depth. ' +
    (fits.length
      ? 'Lines: straight-line fits of time against source-receiver distance within each layer, labelled with the layer velocity.'
      : 'No layer fits for this test kind (crosshole intervals are measured between holes at each depth).');
  return figureOf({ id: 'travel-time', name: 'travel-time', title, caption, width: W, height: H, parts });
}

// ------------------------------------------------------------------ profile

function steps(
  p: Panel,
  rows: readonly { topM: number; bottomM: number; v: number | null }[],
  units: UnitSystem,
  toX: (v: number) => number,
): string {
  let path = '';
  let prevBottom: number | null = null;
  for (const r of rows) {
    if (r.v === null || !Number.isFinite(r.v)) {
      prevBottom = null;
      continue;
    }
    const x = sx(p, toX(r.v));
    const y0 = sy(p, toDisplay('depth', units, r.topM));
    const y1 = sy(p, toDisplay('depth', units, r.bottomM));
    path +=
      prevBottom !== null && Math.abs(prevBottom - r.topM) < 1e-6 ? `H${c(x)}V${c(y1)}` : `M${c(x)} ${c(y0)}V${c(y1)}`;
    prevBottom = r.bottomM;
  }
  return path;
}

/** A profile column drawn as a stepped line (one step per interval, a gap where the value is missing). */
function profileLine(
  p: Panel,
  d: ReportData,
  value: (r: ReportProfileRow) => number | null,
  toX: (v: number) => number,
  stroke: string,
  dash = '',
): string {
  const rows = d.profile.map((r) => ({ topM: r.topM, bottomM: r.bottomM, v: value(r) }));
  const dashed = dash ? ` stroke-dasharray="${dash}"` : '';
  return `<path d="${steps(p, rows, d.title.units, toX)}" fill="none" stroke="${stroke}" stroke-width="4"${dashed}/>`;
}

function waterLine(p: Panel, d: ReportData): string {
  if (d.waterTableM === null) return '';
  const y = sy(p, toDisplay('depth', d.title.units, d.waterTableM));
  if (y < p.y || y > p.y + p.h) return '';
  return (
    `<line x1="${c(p.x)}" y1="${c(y)}" x2="${c(p.x + p.w)}" y2="${c(y)}" stroke="${COLOURS.water}" stroke-width="2" stroke-dasharray="4 6"/>` +
    `<text x="${c(p.x + p.w - 8)}" y="${c(y - 8)}" font-size="19" text-anchor="end" fill="${COLOURS.water}">water table</text>`
  );
}

function depthRange(d: ReportData): [number, number] {
  const deepest = Math.max(1, ...d.profile.map((r) => r.bottomM));
  return niceRange(0, toDisplay('depth', d.title.units, deepest), 8);
}

export function profileFigure(d: ReportData): Figure {
  const units = d.title.units;
  const dep = unitSpec('depth', units).label;
  const vel = unitSpec('velocity', units).label;
  const W = FIGURE_WIDTH;
  const H = 1500;
  const hasVp = d.profile.some((r) => r.vpMps !== null);
  // Vs bars: the 95% range where the row has one (as the app's Profile plot), else +-1 sd; Vp: +-1 sd
  const vsBar = (r: ReportProfileRow): [number, number] => {
    const b = vsBarMps(r.vsMps, r.vsSdMps, r.vsRange95Mps?.[0] ?? null, r.vsRange95Mps?.[1] ?? null);
    return [b.lowMps, b.highMps];
  };
  const hasRange = d.profile.some((r) => r.vsRange95Mps !== null);
  const hasSdOnly = hasVp || d.profile.some((r) => r.vsRange95Mps === null);
  const items: LegendItem[] = [
    { label: 'Vs (interval)', swatch: lineSwatch(COLOURS.S, '', 4) },
    ...(hasVp ? [{ label: 'Vp (interval)', swatch: lineSwatch(COLOURS.P, '12 7', 4) }] : []),
    ...(hasRange ? [{ label: 'Vs: 95% range', swatch: errorBar(6, 38, 12, COLOURS.S, 6) }] : []),
    ...(hasSdOnly
      ? [
          {
            label: `± 1 standard deviation${hasRange ? ' (Vp; Vs rows without a range)' : ''}`,
            swatch: errorBar(6, 38, 12, COLOURS.ink, 6),
          },
        ]
      : []),
    ...(d.waterTableM !== null ? [{ label: 'water table', swatch: lineSwatch(COLOURS.water, '4 6', 2) }] : []),
  ];
  const leg = legend(items, 40, 104, W - 80);
  const top = 104 + leg.height + 30;
  const v = (x: number) => toDisplay('velocity', units, x);
  const xmax = Math.max(
    1,
    ...d.profile.map((r) => v(vsBar(r)[1])),
    ...d.profile.map((r) => (r.vpMps !== null ? v(r.vpMps + (r.vpSdMps ?? 0)) : 0)),
  );
  const p: Panel = {
    x: 140,
    y: top,
    w: W - 200,
    h: H - 100 - top,
    xRange: niceRange(0, xmax * 1.05, 7),
    yRange: depthRange(d),
  };
  const parts: string[] = [heading('Vs and Vp profile', subline(d)), leg.svg, `<defs>${clipFor('pf', p)}</defs>`];
  parts.push(axes(p, `Velocity (${vel})`, `Depth (${dep})`));
  const inner: string[] = [waterLine(p, d)];
  inner.push(profileLine(p, d, (r) => r.vsMps, v, COLOURS.S));
  if (hasVp) inner.push(profileLine(p, d, (r) => r.vpMps, v, COLOURS.P, '12 7'));
  for (const r of d.profile) {
    const y = sy(p, toDisplay('depth', units, (r.topM + r.bottomM) / 2));
    const [lowMps, highMps] = vsBar(r);
    inner.push(errorBar(sx(p, v(lowMps)), sx(p, v(highMps)), y, COLOURS.S));
    if (r.vpMps !== null && r.vpSdMps !== null)
      inner.push(errorBar(sx(p, v(r.vpMps - r.vpSdMps)), sx(p, v(r.vpMps + r.vpSdMps)), y, COLOURS.P));
  }
  parts.push(`<g clip-path="url(#pf)">${inner.join('')}</g>`);
  const title = 'Vs and Vp profile';
  const caption =
    'Interval velocities used in the profile (one step per interval), with bars at mid-interval: for Vs the 95% range (k95 standard deviations either side, k95 per test kind and method from the calibration in docs/true-vs.md; one standard deviation where a row has no range), for Vp one standard deviation.' +
    (hasVp ? ' Vp is drawn where it was measured and not flagged doubtful.' : '');
  return figureOf({ id: 'profile', name: 'profile', title, caption, width: W, height: H, parts });
}

// ------------------------------------------------------------------ Gmax and Vs1

export function stiffnessFigure(d: ReportData): Figure {
  const units = d.title.units;
  const dep = unitSpec('depth', units).label;
  const vel = unitSpec('velocity', units).label;
  const mod = unitSpec('modulus', units).label;
  const W = FIGURE_WIDTH;
  const H = 1400;
  const items: LegendItem[] = [
    { label: 'Gmax = ρ Vs²', swatch: lineSwatch(COLOURS.S, '', 4) },
    { label: '± 1 standard deviation (from Vs)', swatch: errorBar(6, 38, 12, COLOURS.S, 6) },
    { label: 'Vs1 = Vs (Pa/σ′v)^n, Pa = 101.325 kPa', swatch: lineSwatch(COLOURS.rim, '3 5', 4) },
  ];
  const leg = legend(items, 40, 104, W - 80);
  const top = 104 + leg.height + 40;
  const g = (x: number) => toDisplay('modulus', units, x);
  const v = (x: number) => toDisplay('velocity', units, x);
  const gmax = Math.max(1e-6, ...d.profile.map((r) => g(r.gmaxKpa + r.gmaxSdKpa)));
  const vs1max = Math.max(1, ...d.profile.map((r) => (r.vs1Mps !== null ? v(r.vs1Mps) : 0)));
  const pw = (W - 140 - 60 - 80) / 2;
  const yRange = depthRange(d);
  const pg: Panel = { x: 140, y: top, w: pw, h: H - 100 - top, xRange: niceRange(0, gmax * 1.05, 5), yRange };
  const pv: Panel = {
    x: 140 + pw + 80,
    y: top,
    w: pw,
    h: H - 100 - top,
    xRange: niceRange(0, vs1max * 1.05, 5),
    yRange,
  };
  const parts: string[] = [
    heading('Small-strain shear modulus Gmax and stress-normalised Vs1', subline(d)),
    leg.svg,
    `<defs>${clipFor('gm', pg)}${clipFor('v1', pv)}</defs>`,
  ];
  parts.push(axes(pg, `Gmax (${mod})`, `Depth (${dep})`));
  parts.push(axes(pv, `Vs1 (${vel})`, '', { yTicks: true }));
  const gi: string[] = [waterLine(pg, d)];
  gi.push(profileLine(pg, d, (r) => r.gmaxKpa, g, COLOURS.S));
  for (const r of d.profile) {
    const y = sy(pg, toDisplay('depth', units, (r.topM + r.bottomM) / 2));
    gi.push(errorBar(sx(pg, g(r.gmaxKpa - r.gmaxSdKpa)), sx(pg, g(r.gmaxKpa + r.gmaxSdKpa)), y, COLOURS.S));
  }
  const vi: string[] = [waterLine(pv, d), profileLine(pv, d, (r) => r.vs1Mps, v, COLOURS.rim, '3 5')];
  parts.push(`<g clip-path="url(#gm)">${gi.join('')}</g><g clip-path="url(#v1)">${vi.join('')}</g>`);
  const title = 'Gmax and Vs1';
  const caption =
    'Left: small-strain shear modulus from the interval Vs and the soil column’s density, with the bar from the Vs uncertainty only. ' +
    'Right: stress-normalised shear-wave velocity with each layer’s exponent n.';
  return figureOf({ id: 'stiffness', name: 'gmax-vs1', title, caption, width: W, height: H, parts });
}

/** Every report figure, in report order. */
export function reportFigures(d: ReportData): Figure[] {
  return [traceBoardFigure(d), travelTimeFigure(d), profileFigure(d), stiffnessFigure(d)];
}
