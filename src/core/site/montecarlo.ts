/**
 * Monte Carlo uncertainty of Vs30 and site class: each interval's Vs is drawn independently from
 * N(vs, sd), truncated below at VS_FLOOR_MPS by redrawing (then clamped after 16 tries). Vs30 and
 * the Vs-based class (with the answers applied) are evaluated for every draw.
 * PRNG: mulberry32 (a small public-domain 32-bit generator); normals by the Box-Muller transform
 * (Box & Muller 1958, Ann. Math. Stat. 29).
 */
import { mulberry32 } from '../random';
import { BorewaveError } from '../errors';
import {
  applySiteAnswers,
  averagingSegments,
  SITE_STANDARDS,
  vsSiteClass,
  type SiteAnswers,
  type SiteStandard,
  type Vs30Rule,
} from './classes';

export interface SiteUncertainty {
  vs30P05Mps: number;
  vs30P50Mps: number;
  vs30P95Mps: number;
  classProbabilities: Record<SiteStandard, Record<string, number>>;
}

export interface MonteCarloOptions {
  draws: number;
  seed: number;
  toDepthM: number;
  rule: Vs30Rule;
  answers: SiteAnswers;
}

export const DEFAULT_DRAWS = 10000;
export const VS_FLOOR_MPS = 1;

/** Quantile p of sorted values with linear interpolation between order statistics (Hyndman & Fan type 7). */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

export function siteUncertainty(
  intervals: { topM: number; bottomM: number; vsMps: number; vsSdMps: number }[],
  o: MonteCarloOptions,
): SiteUncertainty {
  const draws = Math.floor(o.draws);
  if (!Number.isFinite(draws) || draws < 1) {
    throw new BorewaveError('MC_DRAWS', `Number of draws ${o.draws} must be at least 1.`, 'site', 'draws');
  }
  const seg = averagingSegments(intervals, o.toDepthM, o.rule);
  if (seg === null)
    throw new BorewaveError('MC_NO_INTERVALS', 'No usable velocity interval for Vs30.', 'site', 'intervals');
  const k = seg.index.length;
  const mu = new Float64Array(k);
  const sd = new Float64Array(k);
  const d = new Float64Array(seg.thicknessM);
  for (let j = 0; j < k; j++) {
    const iv = intervals[seg.index[j]];
    if (!Number.isFinite(iv.vsMps) || iv.vsMps <= 0) {
      const item = `interval ${iv.topM}-${iv.bottomM} m`;
      throw new BorewaveError('VSZ_VELOCITY', `${item}: Vs ${iv.vsMps} m/s must be positive.`, item, 'vsMps');
    }
    mu[j] = iv.vsMps;
    sd[j] = Number.isFinite(iv.vsSdMps) && iv.vsSdMps > 0 ? iv.vsSdMps : 0;
  }
  const normal = mulberry32(o.seed).normal;
  const vs30 = new Float64Array(draws);
  for (let n = 0; n < draws; n++) {
    let slowness = 0;
    for (let j = 0; j < k; j++) {
      let v = mu[j];
      if (sd[j] > 0) {
        v += sd[j] * normal();
        // Truncation below at VS_FLOOR_MPS: redraw (rare unless sd is comparable with Vs), then clamp.
        for (let tries = 0; v < VS_FLOOR_MPS && tries < 16; tries++) v = mu[j] + sd[j] * normal();
        if (v < VS_FLOOR_MPS) v = VS_FLOOR_MPS;
      }
      slowness += d[j] / v;
    }
    vs30[n] = seg.depthM / slowness;
  }
  const classProbabilities = {} as Record<SiteStandard, Record<string, number>>;
  for (const std of SITE_STANDARDS) {
    const counts: Record<string, number> = {};
    for (let n = 0; n < draws; n++) {
      const c = vsSiteClass(std, vs30[n]);
      counts[c] = (counts[c] ?? 0) + 1;
    }
    const probs: Record<string, number> = {};
    for (const [c, count] of Object.entries(counts)) {
      const final = applySiteAnswers(std, c, o.answers).siteClass;
      probs[final] = (probs[final] ?? 0) + count / draws;
    }
    classProbabilities[std] = probs;
  }
  vs30.sort();
  return {
    vs30P05Mps: quantileSorted(vs30, 0.05),
    vs30P50Mps: quantileSorted(vs30, 0.5),
    vs30P95Mps: quantileSorted(vs30, 0.95),
    classProbabilities,
  };
}
