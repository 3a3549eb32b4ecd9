/**
 * Export tables: picks, intervals, profile (CSV) and the site summary (JSON). One header row, the unit
 * in every column name, a column for the method and one for flags. Non-finite numbers never reach a
 * cell: they become empty cells and the row carries a flag. Cells a spreadsheet would run as a formula
 * are neutralised in toCsv(). Every export carries the cautions.
 */
import type { Flag } from '../flags';
import Papa from 'papaparse';
import type { Station } from '../survey/stations';
import type { Derived, ProfileRow } from '../pipeline';
import type { Settings } from '../settings';
import { SITE_CAUTIONS } from '../stiffness/site';
import { csvColumn, toDisplay, type QuantityKind, type UnitSystem } from '../units';

export type Cell = string | number | null;

export interface Table {
  columns: string[];
  rows: Cell[][];
}

/** Plain words carried by every export (design.md "Cautions"). */
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

const FORMULA_START = /^[=+\-@\t\r]/;

/** A text cell that a spreadsheet would read as a formula gets a leading apostrophe (OWASP "CSV injection" guidance). */
export function neutraliseText(s: string): string {
  return FORMULA_START.test(s) ? `'${s}` : s;
}

/** CSV text: header row, data rows, then the cautions as '#' comment lines. Numbers stay numbers. */
export function toCsv(t: Table, cautions: string[] = EXPORT_CAUTIONS): string {
  const rows = t.rows.map((r) => r.map((c) => (typeof c === 'string' ? neutraliseText(c) : c)));
  const body = Papa.unparse({ fields: t.columns.map(neutraliseText), data: rows }, { newline: '\n', quotes: false });
  const notes = cautions.map((c) => `# CAUTION: ${c.replace(/[\r\n]+/g, ' ')}`).join('\n');
  return `${body}\n${notes}\n`;
}

const ms = (s: number | null | undefined) => (s === null || s === undefined ? null : num(s * 1000, 4));

/** SI column suffixes as the trade writes them (e.g. density_mg_m3); US ones from units.ts (vs_ftps, gmax_ksi). */
const SI_SUFFIX: Partial<Record<QuantityKind, string>> = { density: 'mg_m3', unitWeight: 'kn_m3' };

/** Column name with its unit, and the value converted from SI for the chosen system. */
export function unitColumn(system: UnitSystem) {
  return {
    name: (base: string, kind: QuantityKind) =>
      system === 'SI'
        ? `${base}_${SI_SUFFIX[kind] ?? csvColumn('', kind, 'SI').slice(1)}`
        : csvColumn(base, kind, 'US'),
    value: (kind: QuantityKind, si: number | null | undefined, digits: number) =>
      si === null || si === undefined ? null : num(toDisplay(kind, system, si), digits),
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
      u.value('depth', s?.depthM, 3),
      s?.component ?? '',
      p.wave,
      p.method,
      p.origin,
      ms(p.timeS),
      ms(p.uncertaintyS),
      num(p.snr, 2),
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
    const v = u.value('velocity', r.velocityMps, 2);
    const sd = u.value('velocity', r.velocitySdMps, 2);
    const flags: Flag[] = [...r.flags];
    if (v === null && !flags.length) flags.push('no value');
    return [
      u.value('depth', r.topM, 3),
      u.value('depth', r.bottomM, 3),
      r.wave,
      r.kind,
      r.method,
      r.chosen ? 1 : 0,
      r.stationA,
      r.stationB,
      u.value('depth', r.pathAM, 4),
      u.value('depth', r.pathBM, 4),
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
    'flags',
  ];
  // Moduli are kPa inside; the 'modulus' unit shows MPa (SI) or ksi (US).
  const rows: Cell[][] = d.profile.map((r: ProfileRow) => [
    u.value('depth', r.topM, 3),
    u.value('depth', r.bottomM, 3),
    u.value('depth', r.midM, 3),
    r.method,
    u.value('velocity', r.vsMps, 2),
    u.value('velocity', r.vsSdMps, 2),
    u.value('velocity', r.vpMps, 2),
    u.value('velocity', r.vpSdMps, 2),
    r.vpMethod ?? '',
    u.value('density', r.densityMgM3, 4),
    u.value('stress', r.sigmaVKpa, 2),
    u.value('stress', r.porePressureKpa, 2),
    u.value('stress', r.sigmaVEffKpa, 2),
    u.value('modulus', r.gmaxKpa, 3),
    u.value('modulus', r.gmaxSdKpa, 3),
    num(r.poissonRatio, 4),
    r.poissonSource,
    u.value('modulus', r.youngKpa, 3),
    u.value('modulus', r.constrainedKpa, 3),
    u.value('modulus', r.bulkKpa, 3),
    u.value('velocity', r.vs1Mps, 2),
    num(r.stressExponent, 3),
    r.flags.join('; '),
  ]);
  return { columns, rows };
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
    u.value('depth', f.topM, 3),
    u.value('depth', f.bottomM, 3),
    `straight-line fit (${f.method})`,
    u.value('velocity', f.velocityMps, 2),
    u.value('velocity', f.velocitySdMps, 2),
    f.stations,
    ms(f.rmsResidualS),
    f.velocitySdMps === null ? 'two stations: no sd' : '',
  ]);
  const m = d.layerModel;
  if (m) {
    for (const l of m.layers) {
      rows.push([
        'S',
        u.value('depth', l.topM, 3),
        u.value('depth', l.bottomM, 3),
        'refracted-ray fit (onset)',
        u.value('velocity', l.velocityMps, 2),
        u.value('velocity', l.velocitySdMps, 2),
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
    u.value('depth', r.depthM, 3),
    u.value('depth', r.pathM, 4),
    ms(r.timeS),
    u.value('velocity', r.velocityMps, 2),
    u.value('velocity', r.velocitySdMps, 2),
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
    vs30Mps: num(v?.vsMps, 2),
    averagedToDepthM: num(v?.toDepthM, 3),
    profileDepthM: num(v?.profileDepthM, 3),
    extended: v?.extended ?? false,
    rule: settings.vs30Rule,
    flags: v?.flags ?? [],
    classes,
    classNotes: Object.fromEntries(d.site.classes.map((c) => [c.standard, { basis: c.basis, notes: c.notes }])),
    vs30P05Mps: num(u?.vs30P05Mps, 2),
    vs30P50Mps: num(u?.vs30P50Mps, 2),
    vs30P95Mps: num(u?.vs30P95Mps, 2),
    classProbabilities: u?.classProbabilities ?? {},
    monteCarlo: { draws: settings.monteCarloDraws, seed: settings.monteCarloSeed },
    answers: settings.siteAnswers,
    comparison: d.comparison
      ? {
          name: d.comparison.name,
          source: d.comparison.source,
          vs30Mps: num(d.comparison.vs30?.vsMps, 2),
          differences: d.comparison.differences.map((x) => ({
            depthM: num(x.depthM, 3),
            vsMps: num(x.vsMps, 2),
            comparisonVsMps: num(x.comparisonVsMps, 2),
            differencePct: num(x.differencePct, 2),
          })),
        }
      : null,
    cautions: EXPORT_CAUTIONS,
  };
}
