/**
 * Export tables: picks, intervals, profile (CSV) and the site summary (JSON). One header row, the unit
 * in every column name, a column for the method and one for flags. Non-finite numbers never reach a
 * cell: they become empty cells and the row carries a flag. Cells a spreadsheet would run as a formula
 * are neutralised in toCsv(). Every export carries the cautions.
 */
import Papa from 'papaparse';
import type { Station } from '../survey/stations';
import type { Derived, ProfileRow } from '../pipeline';
import type { Settings } from '../settings';
import { SITE_CAUTIONS } from '../stiffness/site';

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

export function picksTable(stations: readonly Station[], d: Derived): Table {
  const byKey = new Map(stations.map((s) => [s.key, s]));
  const columns = ['station', 'receiver', 'depth_m', 'component', 'wave', 'method', 'origin', 'time_ms', 'uncertainty_ms', 'snr', 'polarity', 'flags'];
  const rows: Cell[][] = d.picks.map((p) => {
    const s = byKey.get(p.stationKey);
    const flags = [...p.flags];
    if (!Number.isFinite(p.timeS)) flags.push('no value');
    return [p.stationKey, s?.receiver ?? '', num(s?.depthM, 3), s?.component ?? '', p.wave, p.method, p.origin, ms(p.timeS), ms(p.uncertaintyS), num(p.snr, 2), p.polarity ?? null, flags.join('; ')];
  });
  return { columns, rows };
}

export function intervalsTable(d: Derived): Table {
  const columns = ['depth_top_m', 'depth_bottom_m', 'wave', 'kind', 'method', 'chosen', 'station_a', 'station_b', 'path_a_m', 'path_b_m', 'dt_ms',
    'vs_mps', 'vs_sd_mps', 'vp_mps', 'vp_sd_mps', 'flags'];
  const rows: Cell[][] = d.intervals.map((r) => {
    const v = num(r.velocityMps, 2);
    const sd = num(r.velocitySdMps, 2);
    const flags = [...r.flags];
    if (v === null && !flags.length) flags.push('no value');
    return [num(r.topM, 3), num(r.bottomM, 3), r.wave, r.kind, r.method, r.chosen ? 1 : 0, r.stationA, r.stationB, num(r.pathAM, 4), num(r.pathBM, 4), ms(r.dtS),
      r.wave === 'S' ? v : null, r.wave === 'S' ? sd : null, r.wave === 'P' ? v : null, r.wave === 'P' ? sd : null, flags.join('; ')];
  });
  return { columns, rows };
}

export function profileTable(d: Derived): Table {
  const columns = ['depth_top_m', 'depth_bottom_m', 'depth_mid_m', 'method', 'vs_mps', 'vs_sd_mps', 'vp_mps', 'vp_method', 'density_mg_m3', 'sigma_v_kpa',
    'pore_pressure_kpa', 'sigma_v_eff_kpa', 'gmax_mpa', 'gmax_sd_mpa', 'poisson_ratio', 'poisson_source', 'young_mpa', 'constrained_mpa', 'bulk_mpa',
    'vs1_mps', 'stress_exponent', 'flags'];
  const mpa = (kpa: number | null) => (kpa === null ? null : num(kpa / 1000, 3));
  const rows: Cell[][] = d.profile.map((r: ProfileRow) => [num(r.topM, 3), num(r.bottomM, 3), num(r.midM, 3), r.method, num(r.vsMps, 2), num(r.vsSdMps, 2),
    num(r.vpMps, 2), r.vpMethod ?? '', num(r.densityMgM3, 4), num(r.sigmaVKpa, 2), num(r.porePressureKpa, 2), num(r.sigmaVEffKpa, 2), mpa(r.gmaxKpa),
    mpa(r.gmaxSdKpa), num(r.poissonRatio, 4), r.poissonSource, mpa(r.youngKpa), mpa(r.constrainedKpa), mpa(r.bulkKpa), num(r.vs1Mps, 2),
    num(r.stressExponent, 3), r.flags.join('; ')]);
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
          differences: d.comparison.differences.map((x) => ({ depthM: num(x.depthM, 3), vsMps: num(x.vsMps, 2), comparisonVsMps: num(x.comparisonVsMps, 2), differencePct: num(x.differencePct, 2) })),
        }
      : null,
    cautions: EXPORT_CAUTIONS,
  };
}
