/**
 * Export tables: picks, intervals, profile (CSV) and the site summary (JSON). One header row, the unit
 * in every column name, a column for the method and one for flags. Non-finite numbers never reach a
 * cell: they become empty cells and the row carries a flag. Cells a spreadsheet would run as a formula
 * are neutralised in toCsv(). Every export carries the cautions.
 */
import { softwareVersion } from '../version';
import type { Flag } from '../flags';
import Papa from 'papaparse';
import type { Station } from '../survey/stations';
import type { Derived, ProfileRow } from '../pipeline';
import type { Settings } from '../settings';
import { SITE_CAUTIONS } from '../site/classes';
import { csvColumn, type QuantityKind, type UnitSystem } from '../units';
import { reported, type ReportedQuantity } from './digits';

export type Cell = string | number | null;

export interface Table {
  columns: string[];
  rows: Cell[][];
}

/** Plain words carried by every export (docs/conventions.md "Cautions"). */
export const EXPORT_CAUTIONS: string[] = [
  'Results need review by a qualified professional before use in design; local codes and standards govern.',
  ...SITE_CAUTIONS,
];

/** Numbers rounded for export; non-finite -> null (empty cell). */
export function num(x: number | null | undefined, digits: number): number | null {
  if (x === null || x === undefined || !Number.isFinite(x)) return null;
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

/**
 * CSV injection (OWASP "CSV Injection"): a spreadsheet runs a cell that begins with = + - @ tab or CR
 * as a formula. A text cell is also split wherever the reader's list separator is (comma, semicolon
 * or tab; much of Europe uses semicolon), and a naive reader splits at line breaks: every place that
 * can begin a cell is a start. Neutralising: an apostrophe is put at each start (the cell's first
 * character, and right after a comma, semicolon, tab, CR or LF) that is followed, after any spaces, by
 * a formula trigger or by apostrophes and a trigger (so the change can be undone exactly).
 */
const CELL_START_AFTER = /[,;\t\r\n]/;
const NEEDS_APOSTROPHE = /^ *'*[=+\-@\t\r]/;

/** A text cell that a spreadsheet could read as a formula, at its start or after a separator, made inert. */
export function neutraliseText(s: string): string {
  let out = '';
  for (let i = 0; i <= s.length; i++) {
    if ((i === 0 || CELL_START_AFTER.test(s[i - 1])) && NEEDS_APOSTROPHE.test(s.slice(i, i + 64))) out += "'";
    if (i < s.length) out += s[i];
  }
  return out;
}

/** The exact inverse of neutraliseText (tests and round trips). */
export function unneutraliseText(s: string): string {
  let out = '';
  for (let i = 0; i < s.length; i++) {
    const atStart = i === 0 || CELL_START_AFTER.test(s[i - 1]);
    if (atStart && s[i] === "'" && NEEDS_APOSTROPHE.test(s.slice(i + 1, i + 65))) continue;
    out += s[i];
  }
  return out;
}

/** Text that must be quoted in CSV: any separator a reader may use, a quote or a line break (RFC 4180). */
const MUST_QUOTE = /[,;\t"\r\n]/;

/** CSV text: header row, data rows, then the software version and the cautions as '#' comment lines. Numbers stay numbers. */
export function toCsv(t: Table, cautions: string[] = EXPORT_CAUTIONS): string {
  const rows = t.rows.map((r) => r.map((c) => (typeof c === 'string' ? neutraliseText(c) : c)));
  const body = Papa.unparse(
    { fields: t.columns.map(neutraliseText), data: rows },
    { newline: '\n', quotes: (value: unknown) => typeof value === 'string' && MUST_QUOTE.test(value) },
  );
  // The program that made it, then the cautions (last), all as '#' comment lines after the table.
  const notes = [
    `# SOFTWARE: Borewave ${softwareVersion()}`,
    ...cautions.map((c) => `# CAUTION: ${c.replace(/[\r\n]+/g, ' ')}`),
  ];
  return `${body}\n${notes.join('\n')}\n`;
}

/** Times in ms, rounded by the reporting rule (docs/significant-digits.md). */
const ms = (s: number | null | undefined) => reported('time', s);

/** SI column suffixes as the trade writes them (e.g. density_mg_m3); US ones from units.ts (vs_ftps, gmax_ksi). */
const SI_SUFFIX: Partial<Record<QuantityKind, string>> = { density: 'mg_m3', unitWeight: 'kn_m3' };

/** Column name with its unit, and the value converted from SI for the chosen system. */
export function unitColumn(system: UnitSystem) {
  return {
    name: (base: string, kind: QuantityKind) =>
      system === 'SI'
        ? `${base}_${SI_SUFFIX[kind] ?? csvColumn('', kind, 'SI').slice(1)}`
        : csvColumn(base, kind, 'US'),
    /** SI value converted to the system and rounded by the quantity's reporting rule (docs/significant-digits.md). */
    value: (q: ReportedQuantity, si: number | null | undefined) => reported(q, si, system),
  };
}

/** One column of a table: its name and how one row gives its cell. */
export type Column<R> = readonly [name: string, cell: (row: R) => Cell];

/** A table from a list of rows and its columns, each name written beside the value it heads. */
export function tableOf<R>(rows: readonly R[], columns: readonly Column<R>[]): Table {
  return { columns: columns.map(([name]) => name), rows: rows.map((r) => columns.map(([, cell]) => cell(r))) };
}

/** Flags of a row, with 'no value' added when the row's value is missing and nothing else says why. */
function withNoValue(flags: readonly Flag[], missing: boolean, onlyWhenUnflagged = false): Flag[] {
  const out: Flag[] = [...flags];
  if (missing && (!onlyWhenUnflagged || !out.length)) out.push('no value');
  return out;
}

export function picksTable(stations: readonly Station[], d: Derived, system: UnitSystem = 'SI'): Table {
  const u = unitColumn(system);
  const byKey = new Map(stations.map((s) => [s.key, s]));
  const rows = d.picks.map((p) => ({
    p,
    s: byKey.get(p.stationKey),
    flags: withNoValue(p.flags, !Number.isFinite(p.timeS)),
  }));
  return tableOf(rows, [
    ['station', ({ p }) => p.stationKey],
    ['receiver', ({ s }) => s?.receiver ?? ''],
    [u.name('depth', 'depth'), ({ s }) => u.value('distance', s?.depthM)],
    ['component', ({ s }) => s?.component ?? ''],
    ['wave', ({ p }) => p.wave],
    ['method', ({ p }) => p.method],
    ['origin', ({ p }) => p.origin],
    ['time_ms', ({ p }) => ms(p.timeS)],
    ['uncertainty_ms', ({ p }) => ms(p.uncertaintyS)],
    ['snr', ({ p }) => reported('ratio', p.snr)],
    ['polarity', ({ p }) => p.polarity ?? null],
    ['flags', ({ flags }) => flags.join('; ')],
  ]);
}

export function intervalsTable(d: Derived, system: UnitSystem = 'SI'): Table {
  const u = unitColumn(system);
  const rows = d.intervals.map((r) => {
    const v = u.value('velocity', r.velocityMps);
    return {
      r,
      v,
      sd: u.value('velocitySd', r.velocitySdMps),
      low95: u.value('velocity', r.low95Mps),
      high95: u.value('velocity', r.high95Mps),
      flags: withNoValue(r.flags, v === null, true),
    };
  });
  return tableOf(rows, [
    [u.name('depth_top', 'depth'), ({ r }) => u.value('distance', r.topM)],
    [u.name('depth_bottom', 'depth'), ({ r }) => u.value('distance', r.bottomM)],
    ['wave', ({ r }) => r.wave],
    ['kind', ({ r }) => r.kind],
    ['method', ({ r }) => r.method],
    ['chosen', ({ r }) => (r.chosen ? 1 : 0)],
    ['station_a', ({ r }) => r.stationA],
    ['station_b', ({ r }) => r.stationB],
    [u.name('path_a', 'depth'), ({ r }) => u.value('distance', r.pathAM)],
    [u.name('path_b', 'depth'), ({ r }) => u.value('distance', r.pathBM)],
    ['dt_ms', ({ r }) => ms(r.dtS)],
    [u.name('vs', 'velocity'), ({ r, v }) => (r.wave === 'S' ? v : null)],
    [u.name('vs_sd', 'velocity'), ({ r, sd }) => (r.wave === 'S' ? sd : null)],
    // The 95% range (v -+ k95 x sd, velocity/intervals.ts setRange95; docs/true-vs.md "The 95% range") right
    // after the sd, as in profile.csv; each wave's columns hold only its own rows; empty without an sd.
    [u.name('vs_low95', 'velocity'), ({ r, low95 }) => (r.wave === 'S' ? low95 : null)],
    [u.name('vs_high95', 'velocity'), ({ r, high95 }) => (r.wave === 'S' ? high95 : null)],
    [u.name('vp', 'velocity'), ({ r, v }) => (r.wave === 'P' ? v : null)],
    [u.name('vp_sd', 'velocity'), ({ r, sd }) => (r.wave === 'P' ? sd : null)],
    [u.name('vp_low95', 'velocity'), ({ r, low95 }) => (r.wave === 'P' ? low95 : null)],
    [u.name('vp_high95', 'velocity'), ({ r, high95 }) => (r.wave === 'P' ? high95 : null)],
    ['flags', ({ flags }) => flags.join('; ')],
  ]);
}

export function profileTable(d: Derived, system: UnitSystem = 'SI'): Table {
  const u = unitColumn(system);
  const damping = new Map((d.damping?.intervals ?? []).map((x) => [x.intervalKey, x]));
  const field = (r: ProfileRow) => damping.get(r.intervalKey);
  // Moduli are kPa inside; the 'modulus' unit shows MPa (SI) or ksi (US).
  return tableOf<ProfileRow>(d.profile, [
    [u.name('depth_top', 'depth'), (r) => u.value('distance', r.topM)],
    [u.name('depth_bottom', 'depth'), (r) => u.value('distance', r.bottomM)],
    [u.name('depth_mid', 'depth'), (r) => u.value('distance', r.midM)],
    ['method', (r) => r.method],
    [u.name('vs', 'velocity'), (r) => u.value('velocity', r.vsMps)],
    [u.name('vs_sd', 'velocity'), (r) => u.value('velocitySd', r.vsSdMps)],
    // The 95% range of Vs: vs -+ k95 x vs_sd, k95 per test kind and method from the bench (docs/true-vs.md)
    [u.name('vs_low95', 'velocity'), (r) => u.value('velocity', r.vsLow95Mps)],
    [u.name('vs_high95', 'velocity'), (r) => u.value('velocity', r.vsHigh95Mps)],
    [u.name('vp', 'velocity'), (r) => u.value('velocity', r.vpMps)],
    [u.name('vp_sd', 'velocity'), (r) => u.value('velocitySd', r.vpSdMps)],
    ['vp_method', (r) => r.vpMethod ?? ''],
    [u.name('density', 'density'), (r) => u.value('density', r.densityMgM3)],
    [u.name('sigma_v', 'stress'), (r) => u.value('stress', r.sigmaVKpa)],
    [u.name('pore_pressure', 'stress'), (r) => u.value('stress', r.porePressureKpa)],
    [u.name('sigma_v_eff', 'stress'), (r) => u.value('stress', r.sigmaVEffKpa)],
    [u.name('gmax', 'modulus'), (r) => u.value('modulus', r.gmaxKpa)],
    [u.name('gmax_sd', 'modulus'), (r) => u.value('modulusSd', r.gmaxSdKpa)],
    ['poisson_ratio', (r) => reported('poissonRatio', r.poissonRatio)],
    ['poisson_source', (r) => r.poissonSource],
    [u.name('young', 'modulus'), (r) => u.value('modulus', r.youngKpa)],
    [u.name('constrained', 'modulus'), (r) => u.value('modulus', r.constrainedKpa)],
    [u.name('bulk', 'modulus'), (r) => u.value('modulus', r.bulkKpa)],
    [u.name('vs1', 'velocity'), (r) => u.value('velocity', r.vs1Mps)],
    ['stress_exponent', (r) => reported('exponent', r.stressExponent)],
    // Field damping of the interval (same-hit pairs only; an upper bound on material damping, see cautions)
    ['qs', (r) => reported('ratio', field(r)?.qS)],
    ['damping_pct', (r) => reported('ratio', pct(field(r)?.damping))],
    ['damping_sd_pct', (r) => reported('ratio', pct(field(r)?.dampingSd))],
    ['flags', (r) => r.flags.join('; ')],
  ]);
}

const pct = (x: number | null | undefined) => (x === null || x === undefined ? null : 100 * x);

/** Cautions of the profile export: the common ones, and the field-damping one where damping is given. */
export function profileCautions(d: Derived): string[] {
  return d.damping?.intervals.some((x) => x.damping !== null)
    ? [...EXPORT_CAUTIONS, d.damping.caution]
    : EXPORT_CAUTIONS;
}

/** One row of layers.csv: a straight-line fit or a layer of the refracted-ray model. */
interface LayerRow {
  wave: string;
  topM: number | null;
  bottomM: number | null;
  method: string;
  velocityMps: number | null;
  velocitySdMps: number | null;
  stations: number;
  rmsMisfitS: number | null;
  flags: string;
}

/** Layer velocities: straight-line fits of time against slant distance, and the refracted-ray model. */
export function layersTable(d: Derived, system: UnitSystem = 'SI'): Table {
  const u = unitColumn(system);
  const m = d.layerModel;
  const rows: LayerRow[] = [
    ...d.layerFits.map((f) => ({
      wave: f.wave,
      topM: f.topM,
      bottomM: f.bottomM,
      method: `straight-line fit (${f.method})`,
      velocityMps: f.velocityMps,
      velocitySdMps: f.velocitySdMps,
      stations: f.stations,
      rmsMisfitS: f.rmsResidualS,
      flags: f.velocitySdMps === null ? 'two stations: no sd' : '',
    })),
    ...(m?.layers ?? []).map((l) => ({
      wave: 'S',
      topM: l.topM,
      bottomM: l.bottomM,
      method: 'refracted-ray fit (onset)',
      velocityMps: l.velocityMps,
      velocitySdMps: l.velocitySdMps,
      stations: l.receivers,
      rmsMisfitS: m?.rmsMisfitS ?? null,
      flags: m?.converged ? '' : 'not converged',
    })),
  ];
  return tableOf(rows, [
    ['wave', (r) => r.wave],
    [u.name('depth_top', 'depth'), (r) => u.value('distance', r.topM)],
    [u.name('depth_bottom', 'depth'), (r) => u.value('distance', r.bottomM)],
    ['method', (r) => r.method],
    [u.name('velocity', 'velocity'), (r) => u.value('velocity', r.velocityMps)],
    [u.name('velocity_sd', 'velocity'), (r) => u.value('velocitySd', r.velocitySdMps)],
    ['stations', (r) => r.stations],
    ['rms_misfit_ms', (r) => ms(r.rmsMisfitS)],
    ['flags', (r) => r.flags],
  ]);
}

/** Crosshole direct velocities (source to each receiver), one row per station. */
export function directTable(d: Derived, system: UnitSystem = 'SI'): Table {
  const u = unitColumn(system);
  return tableOf(d.direct, [
    ['station', (r) => r.stationKey],
    ['receiver', (r) => r.receiver],
    ['wave', (r) => r.wave],
    [u.name('depth', 'depth'), (r) => u.value('distance', r.depthM)],
    [u.name('path', 'depth'), (r) => u.value('distance', r.pathM)],
    ['time_ms', (r) => ms(r.timeS)],
    [u.name('velocity', 'velocity'), (r) => u.value('velocity', r.velocityMps)],
    [u.name('velocity_sd', 'velocity'), (r) => u.value('velocitySd', r.velocitySdMps)],
    ['flags', (r) => r.flags.join('; ')],
  ]);
}

/** site.json: shape agreed in the site-class issue. */
export function siteJson(d: Derived, settings: Settings): Record<string, unknown> {
  const v = d.site.vs30;
  const classes: Record<string, string> = {};
  for (const c of d.site.classes) classes[c.standard] = c.siteClass;
  const u = d.site.uncertainty;
  return {
    vs30Mps: reported('velocity', v?.vsMps),
    averagedToDepthM: reported('distance', v?.toDepthM),
    profileDepthM: reported('distance', v?.profileDepthM),
    extended: v?.extended ?? false,
    rule: settings.site.vs30Rule,
    flags: v?.flags ?? [],
    classes,
    classNotes: Object.fromEntries(d.site.classes.map((c) => [c.standard, { basis: c.basis, notes: c.notes }])),
    vs30P05Mps: reported('velocity', u?.vs30P05Mps),
    vs30P50Mps: reported('velocity', u?.vs30P50Mps),
    vs30P95Mps: reported('velocity', u?.vs30P95Mps),
    classProbabilities: u?.classProbabilities ?? {},
    monteCarlo: { draws: settings.site.monteCarloDraws, seed: settings.site.monteCarloSeed },
    answers: settings.site.siteAnswers,
    // Present and empty when the set-up checks found nothing; vs30Mps is null while one blocks.
    setupIncomplete: d.site.setupIncomplete ?? null,
    setupProblems: (d.setupProblems ?? []).map((p) => ({
      code: p.code,
      message: p.message,
      count: p.count,
      blocking: p.blocking,
    })),
    // The profile's intervals: Vs, its sd and its 95% range (Vs -+ k95 sd; docs/true-vs.md "The 95% range").
    intervals: (d.profile ?? []).map((r) => ({
      topM: reported('distance', r.topM),
      bottomM: reported('distance', r.bottomM),
      method: r.method,
      vsMps: reported('velocity', r.vsMps),
      vsSdMps: reported('velocitySd', r.vsSdMps),
      vsLow95Mps: reported('velocity', r.vsLow95Mps),
      vsHigh95Mps: reported('velocity', r.vsHigh95Mps),
    })),
    bridgedIntervals: (d.site.bridged ?? []).map((b) => ({
      topM: num(b.topM, 3),
      bottomM: num(b.bottomM, 3),
      vsMps: num(b.vsMps, 2),
    })),
    comparison: d.comparison
      ? {
          name: d.comparison.name,
          source: d.comparison.source,
          vs30Mps: reported('velocity', d.comparison.vs30?.vsMps),
          differences: d.comparison.differences.map((x) => ({
            depthM: reported('distance', x.depthM),
            vsMps: reported('velocity', x.vsMps),
            comparisonVsMps: reported('velocity', x.comparisonVsMps),
            differencePct: reported('ratio', x.differencePct),
          })),
        }
      : null,
    // Field Qs and damping D per layer of the layered model (same-hit surveys), or why there is none.
    fieldDamping: d.damping
      ? {
          reason: d.damping.reason,
          caution: d.damping.caution,
          layers: d.damping.layers.map((l) => ({
            topM: reported('distance', l.topM),
            bottomM: reported('distance', l.bottomM),
            qs: reported('ratio', l.qS),
            dampingPct: reported('ratio', pct(l.damping)),
            dampingSdPct: reported('ratio', pct(l.dampingSd)),
            intervals: l.intervals,
          })),
        }
      : null,
    // The joint travel-time inversion (method 'joint'): per-layer Vs with sd, fit quality, or why there is none;
    // correlatedDraws: the Vs30 Monte Carlo drew the chosen joint intervals with their correlation.
    jointInversion: d.joint
      ? {
          reason: d.joint.reason,
          reducedChiSquare: num(d.joint.reducedChi2, 3),
          correlatedDraws: d.joint.correlation !== null,
          layers: d.joint.layers.map((l) => ({
            topM: reported('distance', l.topM),
            bottomM: reported('distance', l.bottomM),
            vsMps: reported('velocity', l.vsMps),
            vsSdMps: reported('velocity', l.vsSdMps),
          })),
        }
      : null,
    cautions: EXPORT_CAUTIONS,
    softwareVersion: softwareVersion(),
  };
}
