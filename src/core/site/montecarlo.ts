/**
 * Monte Carlo uncertainty of Vs30 and site class: each interval's Vs is drawn independently from
 * N(vs, sd), truncated below at VS_FLOOR_MPS by redrawing (then clamped after 16 tries). Vs30 and
 * the Vs-based class (with the answers applied) are evaluated for every draw.
 * Where intervals come from one joint inversion (velocity/joint.ts) their errors are correlated: the
 * draws are then v = mu + L z with L the Cholesky factor of the covariance sd_i sd_j rho_ij (any
 * multivariate-statistics text), clamped below at VS_FLOOR_MPS.
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
  /** Correlation between the Vs errors of intervals (by depth span), e.g. from the joint inversion. */
  correlation?: SpanCorrelation | null;
}

/** Correlation matrix (row-major) between the Vs errors of the listed depth spans. */
export interface SpanCorrelation {
  spans: { topM: number; bottomM: number }[];
  matrix: number[];
}

/** Lower Cholesky factor of a symmetric positive semi-definite matrix (zero columns where a pivot vanishes). */
export function choleskyLower(a: ArrayLike<number>, n: number): Float64Array {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) {
      let s = a[i * n + j];
      for (let k = 0; k < j; k++) s -= l[i * n + k] * l[j * n + k];
      if (i === j) l[i * n + i] = s > 0 ? Math.sqrt(s) : 0;
      else l[i * n + j] = l[j * n + j] > 0 ? s / l[j * n + j] : 0;
    }
  return l;
}

function correlationOf(
  c: SpanCorrelation,
  a: { topM: number; bottomM: number },
  b: { topM: number; bottomM: number },
): number {
  const at = (x: { topM: number; bottomM: number }) =>
    c.spans.findIndex((s) => Math.abs(s.topM - x.topM) < 1e-9 && Math.abs(s.bottomM - x.bottomM) < 1e-9);
  const i = at(a);
  const j = at(b);
  if (i < 0 || j < 0) return 0;
  const r = c.matrix[i * c.spans.length + j];
  return Number.isFinite(r) ? Math.max(-1, Math.min(1, r)) : 0;
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
  // correlated draws where a correlation is given and some pair of segments is correlated
  let chol: Float64Array | null = null;
  if (o.correlation) {
    const cov = new Float64Array(k * k);
    let any = false;
    for (let i = 0; i < k; i++)
      for (let j = 0; j < k; j++) {
        const r = i === j ? 1 : correlationOf(o.correlation, intervals[seg.index[i]], intervals[seg.index[j]]);
        if (i !== j && r !== 0) any = true;
        cov[i * k + j] = r * sd[i] * sd[j];
      }
    if (any) chol = choleskyLower(cov, k);
  }
  if (chol) {
    const z = new Float64Array(k);
    for (let n = 0; n < draws; n++) {
      for (let j = 0; j < k; j++) z[j] = normal();
      let slowness = 0;
      for (let i = 0; i < k; i++) {
        let v = mu[i];
        for (let j = 0; j <= i; j++) v += chol[i * k + j] * z[j];
        slowness += d[i] / Math.max(v, VS_FLOOR_MPS);
      }
      vs30[n] = seg.depthM / slowness;
    }
  }
  for (let n = 0; n < (chol ? 0 : draws); n++) {
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
