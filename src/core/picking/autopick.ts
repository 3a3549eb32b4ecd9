/**
 * Survey-wide automatic picking: one onset and three feature picks per station trace, and
 * correlation (and optionally phase-slope) delays per station pair. Called by the pipeline.
 *
 * Per station (analyseStation):
 * 1. Search window [searchStartS, searchEndS] (times after trigger) -> samples [i0, i1).
 * 2. Onset: AIC (Maeda 1985) from a quarter of the search length before the window to the largest
 *    |x| in the window (see aicInside), minimum taken inside the window; or STA/LTA (Allen 1978)
 *    inside the window. No STA/LTA trigger
 *    -> no onset pick, features searched from the window start and flagged 'no onset'.
 * 3. Pulse span after the onset: pulseSpanS if set, else the search-window length, at least 32
 *    samples and at least 1.5 dominant periods. Dominant period = 1 / spectral peak of the span.
 * 4. SNR over one dominant period after vs before the onset; uncertainty by pickUncertaintyS.
 * 5. Peak, trough and zero crossing (characteristicPoints) searched over the pulse span.
 *
 * Per pair (pairDelays): see pairWindows for the window rule.
 */
import { BorewaveError, toErrorInfo, type ErrorInfo } from '../errors';
import type { PickFlag } from '../flags';
import type { DelayRequest, PairDelay, Pick, PickMethod, Wave, WorkingTrace } from '../model';
import { cosineTaper } from '../signal/filter';
import { correlationDelay, phaseSlopeDelay } from './delay';
import { characteristicPoints, spectrumSummary } from './features';
import { aicOnsetIndex, staLtaOnsetIndex } from './onset';
import { delayUncertaintyS, pickUncertaintyS, signalToNoise } from './quality';

export interface PickingSettings {
  onsetMethod: 'aic' | 'stalta';
  staS: number;
  ltaS: number;
  staLtaThreshold: number;
  /** Band for the phase-slope delay, Hz; null = correlation delay only. */
  phaseBandHz: [number, number] | null;
  /** Optional: time after the onset searched for features and used for the dominant period, s (default: the search-window length). */
  pulseSpanS?: number;
}

export interface AutoPickResult {
  picks: Pick[];
  delays: PairDelay[];
  /** Traces or pairs that could not be processed, one entry each (file = station or pair key). */
  problems: ErrorInfo[];
}

/** SNR below which a pick is flagged 'low snr' (common practice: an arrival hardly above noise). */
export const LOW_SNR = 3;
/** Correlation coefficient below which a delay is flagged 'low correlation' (common practice). */
export const LOW_CORRELATION = 0.7;
/** Mean coherence below which a phase delay is flagged 'low coherence' (common practice). */
export const LOW_COHERENCE = 0.5;
/** Share of each end of a correlation window that is cosine-tapered. */
export const PAIR_TAPER_FRACTION = 0.2;

/** Result of analysing one station trace, reused by the pair delays. */
export interface StationAnalysis {
  trace: WorkingTrace;
  /** Onset sample, or null when the onset picker found none. */
  onsetIdx: number | null;
  /** Sample the features and windows start from: the onset, else the search-window start. */
  anchorIdx: number;
  /** Dominant period of the pulse, s. */
  periodS: number;
  snr: number;
  picks: Pick[];
}

function checkTrace(t: WorkingTrace): void {
  const fail = (field: string, problem: string): never => {
    throw new BorewaveError('PICK_TRACE', `Station ${t.stationKey} (${t.wave}): ${problem}.`, t.stationKey, field);
  };
  if (!(t.sampleIntervalS > 0) || !Number.isFinite(t.sampleIntervalS))
    fail('sampleIntervalS', `sample interval ${t.sampleIntervalS} s is not positive`);
  if (!Number.isFinite(t.delayS)) fail('delayS', 'delay of the first sample is not a number');
  if (t.samples.length < 16) fail('samples', `only ${t.samples.length} samples`);
  if (!(t.searchEndS > t.searchStartS))
    fail('searchWindow', `search window ${t.searchStartS}..${t.searchEndS} s is empty`);
}

/** Search window in samples [i0, i1), clipped to the trace. */
function searchWindow(t: WorkingTrace): [number, number] {
  const n = t.samples.length;
  const i0 = Math.max(0, Math.ceil((t.searchStartS - t.delayS) / t.sampleIntervalS - 1e-9));
  const i1 = Math.min(n, Math.floor((t.searchEndS - t.delayS) / t.sampleIntervalS + 1e-9) + 1);
  if (i1 - i0 < 8) {
    throw new BorewaveError(
      'PICK_WINDOW',
      `Station ${t.stationKey} (${t.wave}): the search window ${t.searchStartS}..${t.searchEndS} s holds ${Math.max(0, i1 - i0)} samples of the trace (need 8).`,
      t.stationKey,
      'searchWindow',
    );
  }
  return [i0, i1];
}

/**
 * AIC onset inside [i0, i1): the AIC window runs from a quarter of the search length before i0 (more
 * noise for the first segment) to just after the largest |x| in the search window, so its second
 * segment is the rising pulse and not pulse-then-coda (Maeda's model is one change of variance).
 */
function aicInside(x: Float64Array, i0: number, i1: number): { index: number; atEdge: boolean } {
  const n = x.length;
  let iMax = i0;
  for (let i = i0 + 1; i < i1; i++) if (Math.abs(x[i]) > Math.abs(x[iMax])) iMax = i;
  const ext = Math.max(8, Math.round(0.25 * (i1 - i0)));
  const a0 = Math.max(0, i0 - ext);
  const a1 = Math.min(n, Math.max(iMax + 2, a0 + 5));
  const { aic } = aicOnsetIndex(x, a0, a1);
  const len = a1 - a0;
  const jFrom = Math.max(2, i0 - a0);
  const jTo = Math.max(jFrom, Math.min(len - 2, iMax - a0));
  let best = jFrom;
  for (let j = jFrom + 1; j <= jTo; j++) if (aic[j] < aic[best]) best = j;
  return { index: a0 + best, atEdge: best === i0 - a0 || a0 + best >= i1 - 1 };
}

function onsetPick(
  t: WorkingTrace,
  s: PickingSettings,
  i0: number,
  i1: number,
): { index: number | null; atEdge: boolean } {
  if (s.onsetMethod === 'stalta') {
    const dt = t.sampleIntervalS;
    const sta = Math.max(1, Math.round(s.staS / dt));
    const lta = Math.max(sta + 1, Math.round(s.ltaS / dt));
    const r = staLtaOnsetIndex(t.samples, i0, i1, { staSamples: sta, ltaSamples: lta, threshold: s.staLtaThreshold });
    return r ? { index: r.index, atEdge: r.index === i0 } : { index: null, atEdge: false };
  }
  const r = aicInside(t.samples, i0, i1);
  return { index: r.index, atEdge: r.atEdge };
}

/** Onset, dominant period, SNR and the four automatic picks of one station trace. */
export function analyseStation(t: WorkingTrace, s: PickingSettings): StationAnalysis {
  checkTrace(t);
  const x = t.samples;
  const n = x.length;
  const dt = t.sampleIntervalS;
  const [i0, i1] = searchWindow(t);
  const onset = onsetPick(t, s, i0, i1);
  const anchor = onset.index ?? i0;

  // Dominant period from the main lobe: the largest |x| after the anchor within the search window,
  // and the zero crossings on either side of it (half a period apart for a pulse; common practice).
  // A spectrum over the whole search window was tried first and locked onto its lowest bin on some
  // traces (0.1-0.2 s "periods" on the demo), which inflated uncertainties tenfold.
  const windowEnd = Math.min(n, Math.max(i1, anchor + 32));
  let periodS = lobePeriodS(x, anchor, windowEnd, dt);
  if (periodS === null) {
    const sum = spectrumSummary(x, anchor, windowEnd, dt);
    periodS = sum && sum.peakHz > 0 ? 1 / sum.peakHz : (windowEnd - anchor) * dt;
  }
  // Features are searched over 1.5 periods after the anchor, at least 32 samples (or pulseSpanS if set).
  const span = Math.max(
    32,
    s.pulseSpanS && s.pulseSpanS > 0 ? Math.round(s.pulseSpanS / dt) : Math.ceil((1.5 * periodS) / dt),
  );
  const periodSamples = Math.max(4, Math.round(periodS / dt));
  const snr = signalToNoise(x, anchor, periodSamples);
  const uncertaintyS = pickUncertaintyS(snr, dt, periodS);
  const cp = characteristicPoints(x, anchor, dt, t.delayS, { searchS: span * dt });

  const common: PickFlag[] = [];
  if (snr < LOW_SNR) common.push('low snr');
  if (onset.index === null) common.push('no onset');
  const make = (method: PickMethod, timeS: number, polarity: 1 | -1, extra: PickFlag[] = []): Pick => ({
    stationKey: t.stationKey,
    wave: t.wave,
    method,
    timeS,
    origin: 'auto',
    snr,
    uncertaintyS,
    polarity,
    flags: [...common, ...extra],
  });
  const picks: Pick[] = [];
  if (onset.index !== null) {
    picks.push(
      make(s.onsetMethod, t.delayS + onset.index * dt, cp.firstPolarity, onset.atEdge ? ['onset at window edge'] : []),
    );
  }
  if (cp.peakS !== null) picks.push(make('peak', cp.peakS, 1));
  if (cp.troughS !== null) picks.push(make('trough', cp.troughS, -1));
  if (cp.zeroCrossingS !== null) picks.push(make('zero-crossing', cp.zeroCrossingS, cp.firstPolarity));
  return { trace: t, onsetIdx: onset.index, anchorIdx: anchor, periodS, snr, picks };
}

/** Twice the width between the zero crossings around the largest |x| in [from, to); null when no lobe is closed. */
export function lobePeriodS(x: ArrayLike<number>, from: number, to: number, dt: number): number | null {
  let k = -1;
  let best = 0;
  for (let i = from; i < to; i++) {
    const v = Math.abs(x[i]);
    if (v > best) {
      best = v;
      k = i;
    }
  }
  if (k < 0 || !(best > 0)) return null;
  const sign = Math.sign(x[k]);
  let l = k;
  while (l > 0 && Math.sign(x[l - 1]) === sign) l--;
  let r = k;
  while (r + 1 < x.length && Math.sign(x[r + 1]) === sign) r++;
  if (l === 0 || r === x.length - 1) return null;
  // Linear interpolation of the two crossings.
  const left = l - 1 + x[l - 1] / (x[l - 1] - x[l]);
  const right = r + x[r] / (x[r] - x[r + 1]);
  const half = right - left;
  return half > 1 ? 2 * half * dt : null;
}

/** One onset pick (method 'aic' or 'stalta') and 'peak', 'trough', 'zero-crossing' picks, origin 'auto'. */
export function autoPickStation(t: WorkingTrace, s: PickingSettings): Pick[] {
  return analyseStation(t, s).picks;
}

/** Copy of x[start .. start+len) with zeros where the range leaves the trace. */
function extract(x: Float64Array, start: number, len: number): Float64Array {
  const out = new Float64Array(len);
  const from = Math.max(0, start);
  const to = Math.min(x.length, start + len);
  for (let i = from; i < to; i++) out[i - start] = x[i];
  return out;
}

export interface PairWindows {
  a: Float64Array;
  b: Float64Array;
  /** Start time of window b minus start time of window a, s (add to a delay measured between windows). */
  offsetS: number;
  windowS: number;
  periodS: number;
}

/**
 * Window rule for pair delays: both windows have the same length, 2.5 T (T = the larger dominant
 * period of the two stations, at least 16 samples), starting T/2 before the arrival, and are
 * cosine-tapered over 20% at each end, so the correlation sees the first cycles of the pulse and not
 * the noise before it or the later arrivals after it.
 * Window a starts T/2 before a's onset. Window b starts T/2 before a's onset plus the onset
 * difference clamped into [minDelayS, maxDelayS], so a wild onset on b cannot move its window
 * outside the delays the geometry allows.
 */
export function pairWindows(a: StationAnalysis, b: StationAnalysis, req: DelayRequest): PairWindows {
  const dt = a.trace.sampleIntervalS;
  const periodS = Math.max(a.periodS, b.periodS);
  const pre = Math.round((0.5 * periodS) / dt);
  const len = Math.max(16, Math.round((2.5 * periodS) / dt));
  const tA = a.trace.delayS + a.anchorIdx * dt;
  const tB = b.trace.delayS + b.anchorIdx * dt;
  const d0 = Math.min(req.maxDelayS, Math.max(req.minDelayS, tB - tA));
  const startA = a.anchorIdx - pre;
  const startB = Math.round((tA + d0 - b.trace.delayS) / dt) - pre;
  const offsetS = b.trace.delayS + startB * dt - (a.trace.delayS + startA * dt);
  return {
    a: cosineTaper(extract(a.trace.samples, startA, len), PAIR_TAPER_FRACTION),
    b: cosineTaper(extract(b.trace.samples, startB, len), PAIR_TAPER_FRACTION),
    offsetS,
    windowS: len * dt,
    periodS,
  };
}

/** Delays of one pair from analysed stations: 'xcorr', plus 'phase' when a phase band is set. */
export function pairDelaysFromAnalysis(
  a: StationAnalysis,
  b: StationAnalysis,
  req: DelayRequest,
  s: PickingSettings,
): PairDelay[] {
  const dt = a.trace.sampleIntervalS;
  if (Math.abs(b.trace.sampleIntervalS - dt) > 1e-9 * dt) {
    throw new BorewaveError(
      'PAIR_SAMPLE_INTERVAL',
      `Pair ${req.pairKey}: stations ${req.a} and ${req.b} have different sample intervals (${dt} s, ${b.trace.sampleIntervalS} s).`,
      req.pairKey,
      'sampleIntervalS',
    );
  }
  if (!(req.maxDelayS >= req.minDelayS)) {
    throw new BorewaveError(
      'PAIR_BOUNDS',
      `Pair ${req.pairKey}: delay bounds ${req.minDelayS}..${req.maxDelayS} s are reversed.`,
      req.pairKey,
      'delayBounds',
    );
  }
  const w = pairWindows(a, b, req);
  const common: PickFlag[] = [];
  if (a.onsetIdx === null || b.onsetIdx === null) common.push('no onset');
  let lagLoS = req.minDelayS - w.offsetS;
  let lagHiS = req.maxDelayS - w.offsetS;
  if (Math.floor(lagHiS / dt + 1e-9) < Math.ceil(lagLoS / dt - 1e-9)) {
    // Bounds narrower than a sample (a very short path difference): search one sample either side.
    const mid = Math.round((lagLoS + lagHiS) / 2 / dt) * dt;
    lagLoS = mid - dt;
    lagHiS = mid + dt;
  }
  const xc = correlationDelay(w.a, w.b, dt, { minDelayS: lagLoS, maxDelayS: lagHiS });
  const bandwidthHz = s.phaseBandHz ? s.phaseBandHz[1] - s.phaseBandHz[0] : 1 / w.periodS;
  const xcFlags = [...common];
  if (xc.atBound) xcFlags.push('at lag bound');
  if (xc.coefficient < LOW_CORRELATION) xcFlags.push('low correlation');
  const out: PairDelay[] = [
    {
      pairKey: req.pairKey,
      wave: req.wave,
      method: 'xcorr',
      delayS: w.offsetS + xc.delayS,
      coefficient: xc.coefficient,
      uncertaintyS: delayUncertaintyS(xc.coefficient, dt, w.periodS, bandwidthHz, w.windowS),
      flags: xcFlags,
    },
  ];
  if (s.phaseBandHz) {
    // The phase is fitted over the user's band narrowed to the pulse's own band around its
    // dominant frequency band (a third to three times, common practice): outside it the short windows carry little coherent energy.
    const minHz = Math.max(s.phaseBandHz[0], 1 / (3 * w.periodS));
    const maxHz = Math.min(s.phaseBandHz[1], 3 / w.periodS);
    const ph = maxHz > minHz ? phaseSlopeDelay(w.a, w.b, dt, { minHz, maxHz, nearDelayS: xc.delayS }) : null;
    if (ph) {
      const delayS = w.offsetS + ph.delayS;
      const flags = [...common];
      if (ph.coherence < LOW_COHERENCE) flags.push('low coherence');
      if (delayS < req.minDelayS || delayS > req.maxDelayS) flags.push('outside lag bound');
      out.push({
        pairKey: req.pairKey,
        wave: req.wave,
        method: 'phase',
        delayS,
        coefficient: ph.coherence,
        // The larger of the coherence-based bound and the scatter of the phases about the fitted line.
        uncertaintyS: Math.max(
          delayUncertaintyS(Math.sqrt(ph.coherence), dt, w.periodS, ph.usedHz[1] - ph.usedHz[0], w.windowS),
          ph.slopeErrorS,
        ),
        flags,
      });
    }
  }
  return out;
}

/** Delays of b after a for one pair of station traces ('xcorr', plus 'phase' when phaseBandHz is set). */
export function pairDelays(a: WorkingTrace, b: WorkingTrace, req: DelayRequest, s: PickingSettings): PairDelay[] {
  return pairDelaysFromAnalysis(analyseStation(a, s), analyseStation(b, s), req, s);
}

const stationId = (wave: Wave, key: string): string => `${wave}\u0000${key}`;

/**
 * Picks for every trace and delays for every requested pair. A trace or pair that fails is left out
 * and reported in `problems` (file = its station or pair key); the rest go on. onProgress(done, total)
 * is called about a hundred times over traces + pairs, and at the end.
 */
export function autoPickSurvey(
  traces: WorkingTrace[],
  pairs: DelayRequest[],
  s: PickingSettings,
  onProgress?: (done: number, total: number) => void,
): AutoPickResult {
  const total = traces.length + pairs.length;
  const every = Math.max(1, Math.floor(total / 100));
  let done = 0;
  const tick = (): void => {
    done++;
    if (onProgress && (done % every === 0 || done === total)) onProgress(done, total);
  };
  const picks: Pick[] = [];
  const delays: PairDelay[] = [];
  const problems: ErrorInfo[] = [];
  const analysed = new Map<string, StationAnalysis>();
  for (const t of traces) {
    try {
      const id = stationId(t.wave, t.stationKey);
      if (analysed.has(id)) {
        throw new BorewaveError(
          'PICK_DUPLICATE_STATION',
          `Station ${t.stationKey} (${t.wave}) appears twice; the first trace is used.`,
          t.stationKey,
          'stationKey',
        );
      }
      const r = analyseStation(t, s);
      analysed.set(id, r);
      for (const p of r.picks) picks.push(p);
    } catch (e) {
      problems.push(toErrorInfo(e, t.stationKey));
    }
    tick();
  }
  for (const req of pairs) {
    try {
      const a = analysed.get(stationId(req.wave, req.a));
      const b = analysed.get(stationId(req.wave, req.b));
      if (!a || !b) {
        const missing = !a ? req.a : req.b;
        throw new BorewaveError(
          'PAIR_MISSING_STATION',
          `Pair ${req.pairKey}: station ${missing} (${req.wave}) has no analysed trace.`,
          req.pairKey,
          'station',
        );
      }
      for (const d of pairDelaysFromAnalysis(a, b, req, s)) delays.push(d);
    } catch (e) {
      problems.push(toErrorInfo(e, req.pairKey));
    }
    tick();
  }
  if (onProgress && total === 0) onProgress(0, 0);
  return { picks, delays, problems };
}
