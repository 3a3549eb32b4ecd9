/**
 * A comparison Vs profile from another test (e.g. a surface-wave survey or an earlier borehole), read
 * from a delimited text file, and its difference from the measured intervals.
 *
 * Point semantics: the points are the tops of a step profile. Point i gives vsMps from depthM_i down to
 * depthM_{i+1}; the last point's Vs continues downwards; above the first point there is no value.
 */
import Papa from 'papaparse';
import { BorewaveError } from '../errors';
import { M_PER_FT } from '../units';

export interface ComparisonProfile {
  name: string;
  /** Sorted by depth, strictly increasing; vsMps is shear-wave velocity (converted when source = 'rayleigh'). */
  points: { depthM: number; vsMps: number }[];
  source: 'vs' | 'rayleigh';
  /** Poisson's ratio used to convert Rayleigh velocity to Vs. */
  poissonRatio?: number;
  /** Assumptions made while reading (units guessed, columns chosen). */
  notes?: string[];
}

export const DEFAULT_RAYLEIGH_POISSON = 0.3;

/**
 * Vs from Rayleigh-wave velocity with the approximation VR/VS = (0.87 + 1.12 nu)/(1 + nu), attributed to
 * Viktorov (1967), Rayleigh and Lamb Waves (from memory). Within about 0.5 % of the exact Rayleigh root for
 * 0 <= nu <= 0.5 (0.07 % at nu = 0.25).
 */
export function viktorovRatio(poissonRatio: number): number {
  return (0.87 + 1.12 * poissonRatio) / (1 + poissonRatio);
}

export function rayleighToShear(vrMps: number, poissonRatio: number): number {
  if (!Number.isFinite(poissonRatio) || poissonRatio < 0 || poissonRatio >= 0.5) {
    throw new BorewaveError(
      'RAYLEIGH_POISSON',
      `Poisson's ratio ${poissonRatio} must be at least 0 and below 0.5.`,
      'comparison',
      'poissonRatio',
    );
  }
  return vrMps / viktorovRatio(poissonRatio);
}

type DepthUnit = 'm' | 'ft';
type VelocityUnit = 'm/s' | 'ft/s';

function tokens(cell: string): string[] {
  return cell
    .toLowerCase()
    .split(/[^a-z0-9/]+/)
    .filter((t) => t.length > 0);
}

function depthUnit(cell: string): DepthUnit | null {
  const t = tokens(cell);
  if (t.some((x) => x === 'ft' || x === 'feet' || x === 'foot')) return 'ft';
  if (t.some((x) => x === 'm' || x.startsWith('metre') || x.startsWith('meter'))) return 'm';
  return null;
}

function velocityUnit(cell: string): VelocityUnit | null {
  const c = cell.toLowerCase().replace(/\s+/g, '');
  if (/ft\/s|ftps|fps|ft_s|ft\/sec|feetpersecond/.test(c)) return 'ft/s';
  if (/m\/s|mps|m_s|m\/sec|metrespersecond|meterspersecond/.test(c)) return 'm/s';
  return null;
}

function isDepthHeader(cell: string): boolean {
  const t = tokens(cell);
  return t.some((x) => x.startsWith('depth')) || t[0] === 'z';
}

function velocityKindOfHeader(cell: string): 'vs' | 'rayleigh' | null {
  const t = tokens(cell);
  const c = cell.toLowerCase();
  if (t.includes('vr') || c.includes('rayleigh') || c.includes('phase')) return 'rayleigh';
  if (t.includes('vs') || c.includes('shear') || c.startsWith('vs') || c.includes('velocity')) return 'vs';
  return null;
}

function parseNumber(cell: string | undefined): number {
  if (cell === undefined) return NaN;
  const s = cell.trim();
  return s === '' ? NaN : Number(s);
}

/**
 * Reads depth and velocity columns. A header names the columns and their units (m or ft; m/s or ft/s,
 * e.g. 'depth_m, vs_mps' or 'Depth (ft), Vs (ft/s)'); without a header the first two columns are taken
 * as depth in m and Vs in m/s (noted). A column named VR / Rayleigh / phase velocity makes it a Rayleigh
 * profile, converted with rayleighToShear (nu from the options, else 0.3, noted).
 */
export function parseComparisonCsv(
  text: string,
  fileName: string,
  o: { kind?: 'vs' | 'rayleigh'; poissonRatio?: number } = {},
): ComparisonProfile {
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: 'greedy', comments: '#' });
  const rows = parsed.data.filter((r) => r.some((c) => c.trim() !== ''));
  if (rows.length === 0) throw new BorewaveError('COMPARISON_EMPTY', `${fileName}: no rows found.`, fileName);
  const notes: string[] = [];
  const first = rows[0];
  const hasHeader = first.some((c) => c.trim() !== '' && !Number.isFinite(parseNumber(c)));
  let depthCol = 0;
  let velCol = 1;
  let dUnit: DepthUnit = 'm';
  let vUnit: VelocityUnit = 'm/s';
  let kind: 'vs' | 'rayleigh' = o.kind ?? 'vs';
  if (hasHeader) {
    depthCol = first.findIndex(isDepthHeader);
    if (depthCol < 0)
      throw new BorewaveError(
        'COMPARISON_COLUMNS',
        `${fileName}: no depth column in the header (${first.join(', ')}).`,
        fileName,
        'header',
      );
    velCol = first.findIndex((c, i) => i !== depthCol && velocityKindOfHeader(c) !== null);
    if (velCol < 0)
      throw new BorewaveError(
        'COMPARISON_COLUMNS',
        `${fileName}: no velocity column (Vs, VR or Rayleigh) in the header (${first.join(', ')}).`,
        fileName,
        'header',
      );
    kind = o.kind ?? velocityKindOfHeader(first[velCol]) ?? 'vs';
    const du = depthUnit(first[depthCol]);
    const vu = velocityUnit(first[velCol]);
    if (du === null) notes.push(`depth unit not in the header '${first[depthCol]}': taken as m`);
    if (vu === null) notes.push(`velocity unit not in the header '${first[velCol]}': taken as m/s`);
    dUnit = du ?? 'm';
    vUnit = vu ?? 'm/s';
  } else {
    notes.push('no header: first column taken as depth in m, second as velocity in m/s');
  }
  const colName = (i: number) => (hasHeader ? first[i] : `column ${i + 1}`);
  const dFactor = dUnit === 'ft' ? M_PER_FT : 1;
  const vFactor = vUnit === 'ft/s' ? M_PER_FT : 1;
  let nu: number | undefined;
  if (kind === 'rayleigh') {
    nu = o.poissonRatio ?? DEFAULT_RAYLEIGH_POISSON;
    if (o.poissonRatio === undefined)
      notes.push(`Rayleigh velocity converted with nu = ${DEFAULT_RAYLEIGH_POISSON} (not given)`);
  }
  const points: { depthM: number; vsMps: number }[] = [];
  for (let r = hasHeader ? 1 : 0; r < rows.length; r++) {
    const row = rows[r];
    const depth = parseNumber(row[depthCol]);
    const vel = parseNumber(row[velCol]);
    const line = `${fileName} row ${r + 1}`;
    if (!Number.isFinite(depth) || depth < 0) {
      throw new BorewaveError(
        'COMPARISON_ROW',
        `${line}: depth '${row[depthCol] ?? ''}' must be a number at or below 0.`,
        fileName,
        colName(depthCol),
      );
    }
    if (!Number.isFinite(vel) || vel <= 0) {
      throw new BorewaveError(
        'COMPARISON_ROW',
        `${line}: velocity '${row[velCol] ?? ''}' must be a positive number.`,
        fileName,
        colName(velCol),
      );
    }
    const vMps = vel * vFactor;
    points.push({ depthM: depth * dFactor, vsMps: kind === 'rayleigh' ? rayleighToShear(vMps, nu as number) : vMps });
  }
  if (points.length === 0)
    throw new BorewaveError('COMPARISON_EMPTY', `${fileName}: a header but no data rows.`, fileName);
  points.sort((a, b) => a.depthM - b.depthM);
  for (let i = 1; i < points.length; i++) {
    if (points[i].depthM === points[i - 1].depthM) {
      throw new BorewaveError(
        'COMPARISON_DEPTH_REPEATED',
        `${fileName}: depth ${points[i].depthM} m appears twice.`,
        fileName,
        colName(depthCol),
      );
    }
  }
  const name = fileName.replace(/\.[^./\\]+$/, '');
  return { name, points, source: kind, ...(nu !== undefined ? { poissonRatio: nu } : {}), notes };
}

/**
 * For each measured interval, the comparison profile's travel-time average over the part of the interval
 * it covers (the step value when the interval lies within one step), and the difference
 * differencePct = 100 (comparison - measured) / measured. depthM is the interval's mid-depth.
 * Intervals entirely above the first comparison point are left out.
 */
export function compareProfiles(
  intervals: { topM: number; bottomM: number; vsMps: number }[],
  cmp: ComparisonProfile,
): { depthM: number; vsMps: number; comparisonVsMps: number; differencePct: number }[] {
  const pts = cmp.points;
  const out: { depthM: number; vsMps: number; comparisonVsMps: number; differencePct: number }[] = [];
  if (pts.length === 0) return out;
  for (const iv of intervals) {
    if (!(iv.bottomM > iv.topM) || !(iv.vsMps > 0)) continue;
    const top = Math.max(iv.topM, pts[0].depthM);
    if (top >= iv.bottomM) continue;
    let thickness = 0;
    let slowness = 0;
    for (let i = 0; i < pts.length; i++) {
      const stepTop = pts[i].depthM;
      const stepBottom = i + 1 < pts.length ? pts[i + 1].depthM : Infinity;
      const h = Math.min(iv.bottomM, stepBottom) - Math.max(top, stepTop);
      if (h > 0) {
        thickness += h;
        slowness += h / pts[i].vsMps;
      }
    }
    const comparisonVsMps = thickness / slowness;
    out.push({
      depthM: 0.5 * (iv.topM + iv.bottomM),
      vsMps: iv.vsMps,
      comparisonVsMps,
      differencePct: (100 * (comparisonVsMps - iv.vsMps)) / iv.vsMps,
    });
  }
  return out;
}
