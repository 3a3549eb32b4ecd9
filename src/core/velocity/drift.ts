import type { IntervalValue } from './intervals';
import { fitLine } from './formulas';

/**
 * Onset-based and correlation-based interval times drift apart with depth when attenuation broadens
 * the pulse (rise time grows about as C t/Q, Gladwin & Stacey 1974 (from memory); docs/methods.md s.3).
 * We fit the cumulative difference (xcorr - onset) against depth: a slope that is positive and large
 * against its standard error, and a total above 1% of the travel time, is a real difference between
 * methods, reported once for the survey so the user chooses knowingly.
 */
export interface MethodDrift {
  /** Slope of the cumulative (xcorr - onset) time difference against depth, s/m. */
  slopeSpM: number;
  slopeSeSpM: number;
  /** Total difference over the depth span, s, and as a share of the total xcorr travel time. */
  totalS: number;
  share: number;
  significant: boolean;
}

export function methodDrift(intervals: readonly IntervalValue[]): MethodDrift | null {
  const byKey = new Map<string, { depthM: number; onset?: number; xcorr?: number }>();
  for (const r of intervals) {
    if (r.wave !== 'S' || r.dtS === null || (r.method !== 'onset' && r.method !== 'xcorr')) continue;
    const e = byKey.get(r.key) ?? { depthM: r.bottomM };
    e[r.method] = r.dtS;
    byKey.set(r.key, e);
  }
  const rows = [...byKey.values()]
    .filter((e) => e.onset !== undefined && e.xcorr !== undefined)
    .sort((a, b) => a.depthM - b.depthM);
  if (rows.length < 5) return null;
  let cum = 0;
  let travel = 0;
  const depths: number[] = [];
  const diffs: number[] = [];
  for (const e of rows) {
    cum += e.xcorr! - e.onset!;
    travel += e.xcorr!;
    depths.push(e.depthM);
    diffs.push(cum);
  }
  const fit = fitLine(depths, diffs);
  if (!fit) return null;
  const share = travel > 0 ? cum / travel : 0;
  const significant = fit.slope > 3 * (Number.isFinite(fit.slopeSe) ? fit.slopeSe : Infinity) && Math.abs(share) > 0.01;
  return { slopeSpM: fit.slope, slopeSeSpM: fit.slopeSe, totalS: cum, share, significant };
}
