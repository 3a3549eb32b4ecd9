/**
 * Field damping: Qs and the small-strain damping ratio D = 1 / (2 Q) per interval of one hit (two
 * receivers of a probe or cone; crosshole near and far receivers) by the spectral ratio
 * (src/core/signal/attenuation.ts, after Bath 1974), and per layer of the layered model as the
 * inverse-variance weighted mean of 1/Q over the intervals inside it.
 *
 * One-receiver surveys (a different hit at every depth) are not estimated: the source spectrum changes
 * from hit to hit and the ratio would carry that change (docs/methods.md, field damping).
 *
 * Field attenuation includes scattering and geometric effects that are not removed here, so field D is
 * an upper bound on material damping (common practice).
 */
import type { PairDelay, Pick } from '../model';
import type { IntervalKey } from '../keys';
import type { StationPair } from './intervals';
import type { FittedLayer } from './layering';
import { realSpectrum, nextPow2 } from '../signal/fft';
import { broadeningCorrectedDelay, dampingFromQ, peakLagS, spectralRatioQ } from '../signal/attenuation';

export const FIELD_DAMPING_CAUTION =
  'Field damping from the spectral ratio includes scattering and geometric effects that are not removed: it is an upper bound on material damping.';

export interface IntervalDamping {
  intervalKey: IntervalKey;
  topM: number;
  bottomM: number;
  qS: number | null;
  qSdS: number | null;
  /** D = 1 / (2 Q), ratio (not %). */
  damping: number | null;
  dampingSd: number | null;
  /** Common band of the spectral ratio, Hz. */
  bandHz: [number, number] | null;
  /** Dominant frequency of the nearer pulse (the frequency the Q stands for), Hz. */
  frequencyHz?: number | null;
  /** The fitted t* (may be <= 0 where noise dominates) and its sd, and the delay it is set against, s. */
  tStarS: number | null;
  tStarSdS: number | null;
  delayS: number | null;
  reason: string | null;
  /** 'interval': this pair's own spectral ratio; 'layer stack': the Q stacked over its layer (stackOnLayers). */
  qScope?: 'interval' | 'layer stack';
  /** The pair's own Q where qScope is 'layer stack'. */
  ownQS?: number | null;
  /** Correlation-delay bias from pulse broadening removed from this interval's xcorr delay, s (null: none applied). */
  biasS?: number | null;
  /** Nearer pulse window and reference (dominant) frequency, kept for the broadening correction. */
  pulse?: { a: Float64Array; dtS: number; fRefHz: number };
  /** Intercept of the log spectral ratio's line (kept for the survey's common coupling ratio). */
  interceptLn?: number | null;
}

export interface LayerDamping {
  topM: number;
  bottomM: number;
  qS: number | null;
  damping: number | null;
  dampingSd: number | null;
  intervals: number;
}

export interface SurveyDamping {
  intervals: IntervalDamping[];
  layers: LayerDamping[];
  /** Why there is no estimate for the survey (one-receiver surveys), or null. */
  reason: string | null;
  caution: string;
}

/** Dominant frequency of x from the peak of its amplitude spectrum (Hz). */
export function dominantHz(x: ArrayLike<number>, dtS: number): number | null {
  const nfft = nextPow2(4 * x.length);
  const s = realSpectrum(x, nfft);
  let best = 0;
  let bestK = 0;
  for (let k = 1; k <= nfft / 2; k++) {
    const a = Math.hypot(s[2 * k], s[2 * k + 1]);
    if (a > best) {
      best = a;
      bestK = k;
    }
  }
  return bestK > 0 ? bestK / (nfft * dtS) : null;
}

function slice(x: Float64Array, start: number, len: number): Float64Array | null {
  if (start < 0 || start + len > x.length) return null;
  return x.slice(start, start + len);
}

export interface PairDampingOptions {
  /** Window length in dominant periods (from half a period before the onset). */
  periods: number;
  /** Only the contiguous common band around the spectra's peak (attenuation.ts spectralRatioQ). */
  contiguous?: boolean;
  /** Prior on the log spectral ratio's intercept (attenuation.ts spectralRatioQ). */
  intercept?: { value: number; sd: number };
}

export const DEFAULT_PAIR_DAMPING: PairDampingOptions = { periods: 3 };

/**
 * Q of one same-hit pair: windows of `periods` dominant periods from T/2 before the nearer trace's
 * onset, the farther window shifted by the measured delay (so both hold the same part of the pulse).
 */
export function pairDamping(
  pair: StationPair,
  onsetA: Pick | undefined,
  delay: PairDelay | undefined,
  o: PairDampingOptions = DEFAULT_PAIR_DAMPING,
): IntervalDamping {
  const base = {
    intervalKey: pair.key,
    topM: pair.topM,
    bottomM: pair.bottomM,
    qS: null,
    qSdS: null,
    damping: null,
    dampingSd: null,
    bandHz: null,
    tStarS: null,
    tStarSdS: null,
    delayS: null,
  };
  if (!onsetA) return { ...base, reason: 'no onset on the nearer receiver' };
  if (!delay || !(delay.delayS > 0)) return { ...base, reason: 'no positive delay between the receivers' };
  const ta = pair.a.working;
  const tb = pair.b.working;
  const dt = ta.sampleIntervalS;
  if (Math.abs(tb.sampleIntervalS - dt) > 1e-9 * dt) return { ...base, reason: 'different sample intervals' };
  const i0 = Math.round((onsetA.timeS - ta.delayS) / dt);
  const probe = slice(ta.samples, Math.max(0, i0), Math.min(ta.samples.length - Math.max(0, i0), 1024));
  const f = probe && probe.length >= 16 ? dominantHz(probe, dt) : null;
  if (!f) return { ...base, reason: 'no dominant frequency after the onset' };
  const periodS = 1 / f;
  const len = Math.max(16, Math.round((o.periods * periodS) / dt));
  const startA = i0 - Math.round((0.5 * periodS) / dt);
  const startB = Math.round((onsetA.timeS + delay.delayS - tb.delayS) / dt) - Math.round((0.5 * periodS) / dt);
  const wa = slice(ta.samples, startA, len);
  const wb = slice(tb.samples, startB, len);
  if (!wa || !wb) return { ...base, reason: 'the pulse window runs off the trace' };
  const pulse = { a: wa, dtS: dt, fRefHz: f };
  // The whole common band: limiting it to 0.3-3 times the dominant frequency was worse on the bank's training seeds.
  const r = spectralRatioQ(wa, wb, dt, { delayS: delay.delayS, contiguous: o.contiguous, intercept: o.intercept });
  if (!r.ok)
    return {
      ...base,
      tStarS: r.tStarS ?? null,
      tStarSdS: r.tStarSdS ?? null,
      delayS: r.tStarS === undefined ? null : delay.delayS,
      reason: r.reason,
      pulse,
      interceptLn: r.interceptLn ?? null,
    };
  const d = dampingFromQ(r.q, r.qSd);
  return {
    ...base,
    qS: r.q,
    qSdS: r.qSd,
    damping: d.damping,
    dampingSd: d.dampingSd,
    bandHz: r.bandHz,
    frequencyHz: f,
    tStarS: r.tStarS,
    tStarSdS: r.tStarSdS,
    delayS: delay.delayS,
    reason: null,
    pulse,
    interceptLn: r.interceptLn,
  };
}

/** A layer's ratio-of-sums 1/Q with the intervals it rests on. */
interface LayerStack {
  parts: IntervalDamping[];
  invQ: number;
  sumDtS: number;
  /** The ratio of sums' own sd (Birge-inflated), 1/Q units. */
  ownSd: number;
}

function layerStack(intervals: readonly IntervalDamping[], l: FittedLayer): LayerStack | null {
  const parts = intervals.filter((iv) => {
    const mid = (iv.topM + iv.bottomM) / 2;
    return mid >= l.topM && mid < l.bottomM && iv.tStarS !== null && iv.delayS !== null && iv.tStarSdS! > 0;
  });
  const n = parts.length;
  if (!n) return null;
  const sumT = parts.reduce((a, iv) => a + iv.tStarS!, 0);
  const sumDt = parts.reduce((a, iv) => a + iv.delayS!, 0);
  const invQ = sumT / sumDt;
  const sdInvQ = Math.sqrt(parts.reduce((a, iv) => a + iv.tStarSdS! ** 2, 0)) / sumDt;
  const chi2 = parts.reduce((a, iv) => a + ((iv.tStarS! - invQ * iv.delayS!) / iv.tStarSdS!) ** 2, 0);
  const inflate = n > 1 ? Math.max(1, Math.sqrt(chi2 / (n - 1))) : 1;
  return { parts, invQ, sumDtS: sumDt, ownSd: inflate * sdInvQ };
}

/**
 * Random-effects pooling of layer 1/Q values (DerSimonian & Laird 1986, Controlled Clinical Trials
 * 7(3), from memory): each layer's estimate x_i has sampling variance v_i; the layers' true values
 * scatter with variance tau^2 about a survey mean mu. tau^2 by the method of moments, mu the
 * inverse-variance mean, and each layer's value the best linear unbiased predictor
 * mu + tau^2 / (tau^2 + v_i) (x_i - mu), with sd sqrt(v_i tau^2 / (v_i + tau^2)). A layer resting
 * on one noisy 1 m interval moves towards the survey's mean; a well-measured one keeps its own value.
 * v_i = n_i sigma_t^2 / (sum dt)^2 with sigma_t the robust scatter (1.4826 MAD) of the intervals' t*
 * about their layers' ratio of sums, over layers with two or more intervals. Returns null where the
 * scatter cannot be measured (then each layer keeps its own value).
 */
export function pooledLayerInvQ(
  stacks: readonly { invQ: number; n: number; sumDtS: number }[],
  residualsS: readonly number[],
): { invQ: number; sd: number }[] | null {
  if (stacks.length < 3 || residualsS.length < 3) return null;
  const sigT = 1.4826 * median(residualsS.map(Math.abs));
  if (!(sigT > 0)) return null;
  const v = stacks.map((x) => (x.n * sigT * sigT) / (x.sumDtS * x.sumDtS));
  const w = v.map((x) => 1 / x);
  const sw = w.reduce((a, b) => a + b, 0);
  const mu = stacks.reduce((a, x, i) => a + w[i] * x.invQ, 0) / sw;
  const qStat = stacks.reduce((a, x, i) => a + w[i] * (x.invQ - mu) ** 2, 0);
  const c = sw - w.reduce((a, b) => a + b * b, 0) / sw;
  const tau2 = Math.max(0, (qStat - (stacks.length - 1)) / c);
  return stacks.map((x, i) =>
    tau2 > 0
      ? { invQ: mu + (tau2 / (tau2 + v[i])) * (x.invQ - mu), sd: Math.sqrt((v[i] * tau2) / (v[i] + tau2)) }
      : { invQ: mu, sd: Math.sqrt(1 / sw) },
  );
}

/**
 * 1/Q of a layer: first stacked over the intervals whose mid-depth lies in it as the ratio of sums
 * sum t*_i / sum dt_i (each interval's t* counts by its own travel time; the regression sds of single
 * intervals are too noisy to weight by). Intervals whose own t* came out <= 0 (noise over a short
 * path) count with their signed value, so dropping them does not bias the layer towards stronger
 * attenuation. Then, with three or more layers, the layers' values are pooled (pooledLayerInvQ): on
 * the bank's training seeds (8) the layer Q's median error fell from 31% to 25% and its P90 from 90% to 62%.
 * Sd: the pooled sd where pooled, else sqrt(sum sd_i^2) / sum dt_i widened by the Birge ratio where
 * the intervals scatter more than their sds say (common practice).
 */
export function layerDamping(intervals: readonly IntervalDamping[], layers: readonly FittedLayer[]): LayerDamping[] {
  const stacks = layers.map((l) => layerStack(intervals, l));
  const present = stacks.flatMap((x) => (x ? [x] : []));
  const residuals: number[] = [];
  for (const x of present)
    if (x.parts.length > 1)
      for (const iv of x.parts)
        residuals.push((iv.tStarS! - x.invQ * iv.delayS!) * Math.sqrt(x.parts.length / (x.parts.length - 1)));
  const pooled = pooledLayerInvQ(
    present.map((x) => ({ invQ: x.invQ, n: x.parts.length, sumDtS: x.sumDtS })),
    residuals,
  );
  return layers.map((l, j) => {
    const x = stacks[j];
    const n = x?.parts.length ?? 0;
    const none = { topM: l.topM, bottomM: l.bottomM, qS: null, damping: null, dampingSd: null, intervals: n };
    if (!x) return none;
    const p = pooled?.[present.indexOf(x)];
    const invQ = p ? p.invQ : x.invQ;
    const sd = p ? p.sd : x.ownSd;
    const d = invQ / 2;
    if (!(d > 0)) return none;
    return { topM: l.topM, bottomM: l.bottomM, qS: 1 / (2 * d), damping: d, dampingSd: sd / 2, intervals: n };
  });
}

/**
 * Two-receiver intervals (1 m of travel or so): one interval's spectral ratio is too noisy for a Q of
 * its own (median error about 40% on the bank), so each interval takes the Q stacked over its layer
 * (layerDamping), marked `qScope: 'layer stack'`; its own estimate stays in ownQS. Crosshole intervals
 * (longer, horizontal paths in one layer) keep their own.
 */
export function stackOnLayers(
  intervals: readonly IntervalDamping[],
  layers: readonly LayerDamping[],
): IntervalDamping[] {
  return intervals.map((iv) => {
    const mid = (iv.topM + iv.bottomM) / 2;
    const l = layers.find((x) => mid >= x.topM && mid < x.bottomM);
    if (!l || l.qS === null || l.damping === null || l.dampingSd === null) return iv;
    return {
      ...iv,
      ownQS: iv.qS,
      qScope: 'layer stack' as const,
      qS: l.qS,
      // sd(Q) = sd(D) / (2 D^2), first order
      qSdS: l.dampingSd / (2 * l.damping * l.damping),
      damping: l.damping,
      dampingSd: l.dampingSd,
      reason: null,
    };
  });
}

/**
 * Local 1/Q for the broadening correction: inverse-variance weighted t-star / dt of the intervals whose
 * mid-depth lies within halfWidthM of this one's (signed values kept; null when the mean is not positive).
 */
export function localInvQ(intervals: readonly IntervalDamping[], i: number, halfWidthM: number): number | null {
  const mid = (intervals[i].topM + intervals[i].bottomM) / 2;
  let sw = 0;
  let s = 0;
  for (const iv of intervals) {
    if (Math.abs((iv.topM + iv.bottomM) / 2 - mid) > halfWidthM + 1e-9) continue;
    if (iv.tStarS === null || iv.delayS === null || !(iv.tStarSdS! > 0)) continue;
    const w = (iv.delayS / iv.tStarSdS!) ** 2;
    sw += w;
    s += (w * iv.tStarS) / iv.delayS;
  }
  return sw > 0 && s / sw > 0 ? s / sw : null;
}

/**
 * Cross-correlation delays of same-hit S pairs freed of pulse broadening (attenuation.ts,
 * broadeningCorrectedDelay) with the local Q; the intervals get the bias applied. Other delays pass.
 */
export function broadeningCorrected(
  delays: readonly PairDelay[],
  damping: SurveyDamping,
  halfWidthM: number,
): PairDelay[] {
  const byKey = new Map(damping.intervals.map((x, i) => [x.intervalKey as string, i]));
  return delays.map((d) => {
    if (d.method !== 'xcorr' || d.wave !== 'S') return d;
    const i = byKey.get(d.pairKey);
    if (i === undefined) return d;
    const iv = damping.intervals[i];
    const invQ = localInvQ(damping.intervals, i, halfWidthM);
    if (invQ === null || !iv.pulse || !(d.delayS > 0)) return d;
    const c = broadeningCorrectedDelay(iv.pulse.a, iv.pulse.dtS, d.delayS, 1 / invQ, iv.pulse.fRefHz);
    // a correction larger than a fifth of the delay is not broadening: leave the delay as measured
    if (!(Math.abs(c.biasS) < 0.2 * d.delayS)) return d;
    iv.biasS = c.biasS;
    return { ...d, delayS: c.delayS };
  });
}

/** Leading-edge window around each onset, in dominant periods (before, after): chosen on training seeds. */
export const LEADING_EDGE_WINDOW_PERIODS: [number, number] = [0.5, 1];

/**
 * The delay of a same-hit pair measured on the onset-aligned leading edge: both traces windowed from
 * half a dominant period before their own onset to one period after it, and the lag of the windows'
 * correlation peak (within a quarter period) added to the onset difference. The later, broadened part
 * of the farther pulse is left out, so the delay follows the arrival rather than the pulse's centroid.
 * Null where a window runs off a trace or no dominant frequency is found.
 */
export function leadingEdgeDelayS(pair: StationPair, onsetA: Pick, onsetB: Pick): number | null {
  const ta = pair.a.working;
  const tb = pair.b.working;
  const dt = ta.sampleIntervalS;
  if (Math.abs(tb.sampleIntervalS - dt) > 1e-9 * dt) return null;
  const ia = Math.round((onsetA.timeS - ta.delayS) / dt);
  const ib = Math.round((onsetB.timeS - tb.delayS) / dt);
  const probe = slice(ta.samples, Math.max(0, ia), Math.min(ta.samples.length - Math.max(0, ia), 1024));
  const f = probe && probe.length >= 16 ? dominantHz(probe, dt) : null;
  if (!f) return null;
  const pre = Math.round(LEADING_EDGE_WINDOW_PERIODS[0] / f / dt);
  const post = Math.round(LEADING_EDGE_WINDOW_PERIODS[1] / f / dt);
  const wa = slice(ta.samples, ia - pre, pre + post);
  const wb = slice(tb.samples, ib - pre, pre + post);
  if (!wa || !wb) return null;
  const lag = peakLagS(wa, wb, dt, 0.25 / f);
  return (ib - ia) * dt + (tb.delayS - ta.delayS) + lag;
}

/**
 * Same-hit S xcorr delays replaced by the onset-aligned leading-edge delay (leadingEdgeDelayS) where
 * both onsets are picked and the result lies within a fifth of the correlation delay; others pass.
 */
export function leadingEdgeDelays(
  pairs: readonly StationPair[],
  picks: readonly Pick[],
  delays: readonly PairDelay[],
  isOnset: (p: Pick) => boolean,
): PairDelay[] {
  const sameHit = new Map(
    pairs
      .filter((p) => p.wave === 'S' && (p.kind === 'true' || p.kind === 'crosshole'))
      .map((p) => [p.key as string, p]),
  );
  if (!sameHit.size) return [...delays];
  const onsets = new Map<string, Pick>();
  for (const p of picks) if (p.wave === 'S' && p.origin !== 'excluded' && isOnset(p)) onsets.set(p.stationKey, p);
  return delays.map((d) => {
    if (d.method !== 'xcorr' || d.wave !== 'S') return d;
    const pair = sameHit.get(d.pairKey);
    const oa = pair && onsets.get(pair.a.key);
    const ob = pair && onsets.get(pair.b.key);
    if (!pair || !oa || !ob || !(d.delayS > 0)) return d;
    const le = leadingEdgeDelayS(pair, oa, ob);
    if (le === null || !(le > 0) || !(Math.abs(le - d.delayS) < 0.2 * d.delayS)) return d;
    return { ...d, delayS: le };
  });
}

/** Sd of an interval's log-ratio intercept about the survey's common value (chosen on the bank's training seeds). */
export const INTERCEPT_PRIOR_SD = 0.02;

function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/**
 * Q of same-hit pairs. Two-receiver probes (kind 'true'): both receivers ride in one probe, so the
 * intercept of ln |B| / |A| is the geometric spreading ratio ln(rA / rB) (1 / r spreading along the
 * straight paths) plus the receivers' coupling ratio, which is the same at every depth. A first pass
 * of free lines gives the survey's coupling ratio as the median of (intercept - spreading); the second
 * pass fits each interval's line with its intercept held near spreading + coupling (sd
 * INTERCEPT_PRIOR_SD), so a 1 m interval's small slope is no longer traded against a free intercept.
 * Crosshole pairs (receivers in two holes) keep the free line over the whole common band.
 */
export function twoReceiverDamping(
  pairs: readonly StationPair[],
  onsets: ReadonlyMap<string, Pick>,
  xcorr: ReadonlyMap<string, PairDelay>,
): IntervalDamping[] {
  const contiguous = { ...DEFAULT_PAIR_DAMPING, contiguous: true };
  const first = pairs.map((p) =>
    pairDamping(p, onsets.get(p.a.key), xcorr.get(p.key), p.kind === 'true' ? contiguous : DEFAULT_PAIR_DAMPING),
  );
  const spreading = (p: StationPair) =>
    p.a.straightPathM > 0 && p.b.straightPathM > 0 ? Math.log(p.a.straightPathM / p.b.straightPathM) : null;
  const coupling: number[] = [];
  pairs.forEach((p, i) => {
    const g = spreading(p);
    const c = first[i].interceptLn;
    if (p.kind === 'true' && g !== null && c !== null && c !== undefined && Number.isFinite(c)) coupling.push(c - g);
  });
  if (coupling.length < 3) return first;
  const c0 = median(coupling);
  return pairs.map((p, i) => {
    const g = spreading(p);
    if (p.kind !== 'true' || g === null) return first[i];
    return pairDamping(p, onsets.get(p.a.key), xcorr.get(p.key), {
      ...contiguous,
      intercept: { value: g + c0, sd: INTERCEPT_PRIOR_SD },
    });
  });
}

/** Field damping for the S intervals of a survey (same-hit pairs only). */
export function fieldDamping(
  pairs: readonly StationPair[],
  picks: readonly Pick[],
  delays: readonly PairDelay[],
  layers: readonly FittedLayer[] | null,
  isOnset: (p: Pick) => boolean,
): SurveyDamping {
  const sPairs = pairs.filter((p) => p.wave === 'S');
  const sameHit = sPairs.filter((p) => p.kind === 'true' || p.kind === 'crosshole');
  if (!sameHit.length)
    return {
      intervals: [],
      layers: [],
      reason: sPairs.length
        ? 'one receiver per hit: the source spectrum changes from hit to hit, so Q is not estimated per interval'
        : 'no S intervals',
      caution: FIELD_DAMPING_CAUTION,
    };
  const onsets = new Map<string, Pick>();
  for (const p of picks) if (p.wave === 'S' && p.origin !== 'excluded' && isOnset(p)) onsets.set(p.stationKey, p);
  const xcorr = new Map<string, PairDelay>();
  for (const d of delays) if (d.method === 'xcorr') xcorr.set(d.pairKey, d);
  const intervals = twoReceiverDamping(sameHit, onsets, xcorr);
  return {
    intervals,
    layers: layers ? layerDamping(intervals, layers) : [],
    reason: null,
    caution: FIELD_DAMPING_CAUTION,
  };
}

/**
 * The field Q for the design outputs (stiffness/curves.ts: field D beside the laboratory-model Dmin):
 * per layer of the layered model where there is one, else per interval; with the mean dominant frequency.
 */
export function fieldQForDesign(
  d: SurveyDamping,
): { topM: number; bottomM: number; q: number; qSd: number | null; frequencyHz: number }[] {
  const fs = d.intervals.flatMap((x) => (x.frequencyHz ? [x.frequencyHz] : []));
  if (!fs.length) return [];
  const fHz = fs.reduce((a, b) => a + b, 0) / fs.length;
  const rows = d.layers.length
    ? d.layers.map((l) => ({ topM: l.topM, bottomM: l.bottomM, damping: l.damping, dampingSd: l.dampingSd }))
    : d.intervals.map((x) => ({ topM: x.topM, bottomM: x.bottomM, damping: x.damping, dampingSd: x.dampingSd }));
  return rows.flatMap((r) =>
    r.damping !== null && r.damping > 0
      ? [
          {
            topM: r.topM,
            bottomM: r.bottomM,
            q: 1 / (2 * r.damping),
            // first order: sd(Q) = sd(D) / (2 D^2)
            qSd: r.dampingSd === null ? null : r.dampingSd / (2 * r.damping * r.damping),
            frequencyHz: fHz,
          },
        ]
      : [],
  );
}
