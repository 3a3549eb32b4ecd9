/**
 * Calibration of interval sds: the share of intervals whose true value lies within k sd, and the one
 * scale per test kind and method that the bench (bench/bank.ts) tunes on TRAINING seeds of its bank of
 * random earths. Held-out figures are in docs/true-vs.md.
 *
 * Target (issue 14): within 1 sd 60-80%, within 2 sd 90-99%. A Gaussian gives 68.3% / 95.4%. The
 * errors of field intervals are heavier-tailed than a Gaussian (cycle skips, thin layers, boundaries);
 * for such a distribution the sd is wider than the core, so stating the sd of the whole distribution
 * (not of its core) puts more than 68% within 1 sd and about 95% within 2 sd (a Student t with 4
 * degrees of freedom: 77% / 95%). The tuning rule therefore aims at 95% within 2 sd, kept between the
 * 62% and 74% quantiles of |error| / sd so that 1-sd coverage stays in its band with a margin for the
 * spread between seed sets.
 */
import type { TestKind } from '../model';
import type { IntervalMethod } from '../catalogue/methods';

/** Share of |error| <= k sd over rows with an sd > 0 (null when none). */
export function withinShare(rows: readonly { errorMps: number; sdMps: number | null }[], k: number): number | null {
  const ok = rows.filter((r) => r.sdMps !== null && r.sdMps > 0 && Number.isFinite(r.errorMps));
  if (!ok.length) return null;
  return ok.filter((r) => Math.abs(r.errorMps) <= k * r.sdMps!).length / ok.length;
}

function quantile(xs: readonly number[], q: number): number {
  const s = [...xs].sort((a, b) => a - b);
  const pos = (s.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return s[lo] + (s[hi] - s[lo]) * (pos - lo);
}

/**
 * The sd scale that calibrates standardised errors z = |error| / sd: half the 95% quantile (95% within
 * 2 sd), clamped to the 62%-74% quantiles (1-sd coverage inside its band). null for no data.
 */
export function calibrationScale(zAbs: readonly number[]): number | null {
  const z = zAbs.filter((x) => Number.isFinite(x) && x >= 0);
  if (z.length < 5) return null;
  const s = Math.min(Math.max(quantile(z, 0.95) / 2, quantile(z, 0.62)), quantile(z, 0.74));
  return s > 0 ? s : null;
}

/**
 * Sd scale per test kind and interval method, from the bench's 12 training seeds (`npm run bench --
 * --bank-only --bank-seeds 12 --json`, key bank.sdScale, rounded to 2 digits). A method missing here
 * keeps scale 1. Below 1 where the error model's terms are bounds (path model, trigger prior, model
 * floor); above 1 where a method's own sd is optimistic (crosshole phase slope and first peak). The
 * joint method's scales are the products of the two factors tuned on the same training seeds (one inside
 * the joint fit, one here) before they were folded into this table.
 *
 * The layer model (the default of the downhole kinds) keeps the 2-sd side of the rule: its |error| / sd
 * has a tail too heavy for one scale to put both shares in their bands (a layer missed between receivers
 * or a gradient, that nothing in the travel times flags), and an sd that leaves more than 5% outside
 * 2 sd is the unsafe side. So its scales are the ones that give 93-95% within 2 sd on the training seeds
 * (the rule's upper clamp lifted); 1-sd coverage then runs above 80% for the cone (docs/true-vs.md).
 */
export const SD_SCALE: Partial<Record<TestKind, Partial<Record<IntervalMethod, number>>>> = {
  downhole: {
    onset: 0.98,
    peak: 0.61,
    trough: 1.06,
    'zero-crossing': 0.57,
    xcorr: 0.74,
    phase: 0.73,
    'ray-fit': 0.85,
    'layer-model': 0.33,
    joint: 0.87,
  },
  'downhole-pair': {
    onset: 0.72,
    peak: 0.47,
    trough: 0.84,
    'zero-crossing': 0.4,
    xcorr: 0.61,
    phase: 0.74,
    'layer-model': 0.18,
    joint: 1.07,
  },
  'seismic-cone': {
    onset: 1.02,
    peak: 0.68,
    trough: 0.91,
    'zero-crossing': 0.72,
    xcorr: 0.85,
    phase: 0.79,
    'ray-fit': 1.03,
    'layer-model': 0.34,
    joint: 0.63,
  },
  crosshole: { onset: 0.77, peak: 1.76, trough: 1.04, 'zero-crossing': 0.88, xcorr: 0.84, phase: 3.04, joint: 0.66 },
};

export function sdScale(kind: TestKind, method: IntervalMethod): number {
  return SD_SCALE[kind]?.[method] ?? 1;
}

/**
 * The stated 95% range of an interval Vs: k95 x sd either side, k95 per test kind and method the 95%
 * point of |error| / sd on the bench's TRAINING seeds (bench/bank.ts tailFactor; `npm run bench --
 * --bank-only --bank-seeds 24 --json`, key bank.k95Table, rounded up to 2 decimals; the bench also
 * prints this table ready to paste). The errors are heavier-tailed than a Gaussian (docs/true-vs.md),
 * so 2 sd does not hold 95% for every method; k95 is below 1.96 where a method's training errors are
 * lighter-tailed. Measured on 24 training seeds per kind with the sd as SD_SCALE above makes it: measure
 * again after any change to SD_SCALE or the error model. A method missing here takes the Gaussian 1.96.
 */
export const TAIL_K95: Partial<Record<TestKind, Partial<Record<IntervalMethod, number>>>> = {
  downhole: {
    onset: 1.86,
    peak: 2.08,
    trough: 1.74,
    'zero-crossing': 2.12,
    xcorr: 2,
    phase: 2.13,
    'ray-fit': 2.15,
    'layer-model': 2.28,
    joint: 1.89,
  },
  'downhole-pair': {
    onset: 2.12,
    peak: 2.18,
    trough: 2.03,
    'zero-crossing': 2.34,
    xcorr: 2.54,
    phase: 2.15,
    'layer-model': 2.09,
    joint: 2.16,
  },
  'seismic-cone': {
    onset: 2.35,
    peak: 2.06,
    trough: 2.33,
    'zero-crossing': 1.81,
    xcorr: 1.96,
    phase: 2.1,
    'ray-fit': 2,
    'layer-model': 2.27,
    joint: 3.28,
  },
  crosshole: { onset: 2.04, peak: 1.88, trough: 3.18, 'zero-crossing': 6.44, xcorr: 1.65, phase: 1.73, joint: 2.58 },
};

/** The two-sided 95% point of a standard normal (any table of the normal distribution). */
export const GAUSSIAN_K95 = 1.96;

/** k95 for a test kind and interval method: the bench's entry, else the Gaussian 1.96. */
export function tailFactor95(kind: TestKind, method: IntervalMethod): number {
  return TAIL_K95[kind]?.[method] ?? GAUSSIAN_K95;
}

/** The 95% range v -+ k95 sd, the low end floored at 0; null without a value or an sd > 0. */
export function range95Mps(
  vMps: number | null,
  sdMps: number | null,
  k95: number,
): { lowMps: number; highMps: number } | null {
  if (vMps === null || sdMps === null || !Number.isFinite(vMps) || !Number.isFinite(sdMps) || !(sdMps > 0)) return null;
  return { lowMps: Math.max(0, vMps - k95 * sdMps), highMps: vMps + k95 * sdMps };
}
