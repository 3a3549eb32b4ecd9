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

export function picksTable(stations: readonly Station[], d: Derived, system: UnitSystem = 'SI'): Table {
  const u = unitColumn(system);
  const byKey = new Map(stations.map((s) => [s.key, s]));
  const columns = [
    'station',
    'receiver',
    u.name('depth', 'depth'),
    'component',
    'wave',
    'method',
    'origin',
    'time_ms',
    'uncertainty_ms',
    'snr',
    'polarity',
    'flags',
  ];
  const rows: Cell[][] = d.picks.map((p) => {
    const s = byKey.get(p.stationKey);
    const flags: Flag[] = [...p.flags];
    if (!Number.isFinite(p.timeS)) flags.push('no value');
    return [
      p.stationKey,
      s?.receiver ?? '',
      u.value('distance', s?.depthM),
      s?.component ?? '',
      p.wave,
      p.method,
      p.origin,
      ms(p.timeS),
      ms(p.uncertaintyS),
      reported('ratio', p.snr),
      p.polarity ?? null,
      flags.join('; '),
    ];
  });
  return { columns, rows };
}

export function intervalsTable(d: Derived, system: UnitSystem = 'SI'): Table {
  const u = unitColumn(system);
  const columns = [
    u.name('depth_top', 'depth'),
    u.name('depth_bottom', 'depth'),
    'wave',
    'kind',
    'method',
    'chosen',
    'station_a',
    'station_b',
    u.name('path_a', 'depth'),
    u.name('path_b', 'depth'),
    'dt_ms',
    u.name('vs', 'velocity'),
    u.name('vs_sd', 'velocity'),
    u.name('vp', 'velocity'),
    u.name('vp_sd', 'velocity'),
    'flags',
  ];
  const rows: Cell[][] = d.intervals.map((r) => {
    const v = u.value('velocity', r.velocityMps);
    const sd = u.value('velocitySd', r.velocitySdMps);
    const flags: Flag[] = [...r.flags];
    if (v === null && !flags.length) flags.push('no value');
    return [
      u.value('distance', r.topM),
      u.value('distance', r.bottomM),
      r.wave,
      r.kind,
      r.method,
      r.chosen ? 1 : 0,
      r.stationA,
      r.stationB,
      u.value('distance', r.pathAM),
      u.value('distance', r.pathBM),
      ms(r.dtS),
      r.wave === 'S' ? v : null,
      r.wave === 'S' ? sd : null,
      r.wave === 'P' ? v : null,
      r.wave === 'P' ? sd : null,
      flags.join('; '),
    ];
  });
  return { columns, rows };
}

export function profileTable(d: Derived, system: UnitSystem = 'SI'): Table {
  const u = unitColumn(system);
  const columns = [
    u.name('depth_top', 'depth'),
    u.name('depth_bottom', 'depth'),
    u.name('depth_mid', 'depth'),
    'method',
    u.name('vs', 'velocity'),
    u.name('vs_sd', 'velocity'),
    u.name('vp', 'velocity'),
    u.name('vp_sd', 'velocity'),
    'vp_method',
    u.name('density', 'density'),
    u.name('sigma_v', 'stress'),
    u.name('pore_pressure', 'stress'),
    u.name('sigma_v_eff', 'stress'),
    u.name('gmax', 'modulus'),
    u.name('gmax_sd', 'modulus'),
    'poisson_ratio',
    'poisson_source',
    u.name('young', 'modulus'),
    u.name('constrained', 'modulus'),
    u.name('bulk', 'modulus'),
    u.name('vs1', 'velocity'),
    'stress_exponent',
    // Field damping of the interval (same-hit pairs only; an upper bound on material damping, see cautions)
    'qs',
    'damping_pct',
    'damping_sd_pct',
    'flags',
  ];
  const damping = new Map((d.damping?.intervals ?? []).map((x) => [x.intervalKey, x]));
  // Moduli are kPa inside; the 'modulus' unit shows MPa (SI) or ksi (US).
  const rows: Cell[][] = d.profile.map((r: ProfileRow) => [
    u.value('distance', r.topM),
    u.value('distance', r.bottomM),
    u.value('distance', r.midM),
    r.method,
    u.value('velocity', r.vsMps),
    u.value('velocitySd', r.vsSdMps),
    u.value('velocity', r.vpMps),
    u.value('velocitySd', r.vpSdMps),
    r.vpMethod ?? '',
    u.value('density', r.densityMgM3),
    u.value('stress', r.sigmaVKpa),
    u.value('stress', r.porePressureKpa),
    u.value('stress', r.sigmaVEffKpa),
    u.value('modulus', r.gmaxKpa),
    u.value('modulusSd', r.gmaxSdKpa),
    reported('poissonRatio', r.poissonRatio),
    r.poissonSource,
    u.value('modulus', r.youngKpa),
    u.value('modulus', r.constrainedKpa),
    u.value('modulus', r.bulkKpa),
    u.value('velocity', r.vs1Mps),
    reported('exponent', r.stressExponent),
    reported('ratio', damping.get(r.intervalKey)?.qS),
    reported('ratio', pct(damping.get(r.intervalKey)?.damping)),
    reported('ratio', pct(damping.get(r.intervalKey)?.dampingSd)),
    r.flags.join('; '),
  ]);
  return { columns, rows };
}

const pct = (x: number | null | undefined) => (x === null || x === undefined ? null : 100 * x);

/** Cautions of the profile export: the common ones, and the field-damping one where damping is given. */
export function profileCautions(d: Derived): string[] {
  return d.damping?.intervals.some((x) => x.damping !== null)
    ? [...EXPORT_CAUTIONS, d.damping.caution]
    : EXPORT_CAUTIONS;
}

/** Layer velocities: straight-line fits of time against slant distance, and the refracted-ray model. */
export function layersTable(d: Derived, system: UnitSystem = 'SI'): Table {
  const u = unitColumn(system);
  const columns = [
    'wave',
    u.name('depth_top', 'depth'),
    u.name('depth_bottom', 'depth'),
    'method',
    u.name('velocity', 'velocity'),
    u.name('velocity_sd', 'velocity'),
    'stations',
    'rms_misfit_ms',
    'flags',
  ];
  const rows: Cell[][] = d.layerFits.map((f) => [
    f.wave,
    u.value('distance', f.topM),
    u.value('distance', f.bottomM),
    `straight-line fit (${f.method})`,
    u.value('velocity', f.velocityMps),
    u.value('velocitySd', f.velocitySdMps),
    f.stations,
    ms(f.rmsResidualS),
    f.velocitySdMps === null ? 'two stations: no sd' : '',
  ]);
  const m = d.layerModel;
  if (m) {
    for (const l of m.layers) {
      rows.push([
        'S',
        u.value('distance', l.topM),
        u.value('distance', l.bottomM),
        'refracted-ray fit (onset)',
        u.value('velocity', l.velocityMps),
        u.value('velocitySd', l.velocitySdMps),
        l.receivers,
        ms(m.rmsMisfitS),
        m.converged ? '' : 'not converged',
      ]);
    }
  }
  return { columns, rows };
}

/** Crosshole direct velocities (source to each receiver), one row per station. */
export function directTable(d: Derived, system: UnitSystem = 'SI'): Table {
  const u = unitColumn(system);
  const columns = [
    'station',
    'receiver',
    'wave',
    u.name('depth', 'depth'),
    u.name('path', 'depth'),
    'time_ms',
    u.name('velocity', 'velocity'),
    u.name('velocity_sd', 'velocity'),
    'flags',
  ];
  const rows: Cell[][] = d.direct.map((r) => [
    r.stationKey,
    r.receiver,
    r.wave,
    u.value('distance', r.depthM),
    u.value('distance', r.pathM),
    ms(r.timeS),
    u.value('velocity', r.velocityMps),
    u.value('velocitySd', r.velocitySdMps),
    r.flags.join('; '),
  ]);
  return { columns, rows };
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
