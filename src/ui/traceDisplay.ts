/**
 * Trace board display helpers (view shaping only, pure): the time window fitted to the arrivals and the
 * display gains (automatic gain control, time-variant gain). Nothing here changes a pick or a result.
 */

export interface TimeWindow {
  t0S: number;
  t1S: number;
}

export interface WindowTrace {
  /** First and last sample time after the trigger, s. */
  startS: number;
  endS: number;
  /** Arrival search window from geometry and the plausible velocities, s (core: WorkingTrace). */
  searchStartS: number;
  searchEndS: number;
}

/** Smallest margin either side of the arrivals, s (about one S pulse at a few hundred m/s: common practice). */
export const MIN_MARGIN_S = 0.004;

/**
 * Time window fitted to the arrivals: from the picks when there are any, else from every trace's
 * plausible-velocity search window; a margin before the earliest arrival (a quarter of the arrival
 * spread, at least MIN_MARGIN_S) so the pre-arrival noise is seen, and more after the latest (the
 * spread, at least 3 MIN_MARGIN_S) so the pulse body is seen. When the earliest arrival is close to the
 * trigger relative to the latest (under 40 %), the window starts at the record start so the trigger
 * stays in view. Clipped to the records' time span.
 */
export function fittedWindow(traces: readonly WindowTrace[], pickTimesS: readonly number[]): TimeWindow | null {
  if (!traces.length) return null;
  let recStart = Infinity;
  let recEnd = -Infinity;
  for (const t of traces) {
    recStart = Math.min(recStart, t.startS);
    recEnd = Math.max(recEnd, t.endS);
  }
  if (!(recEnd > recStart)) return null;
  const times = pickTimesS.filter((t) => Number.isFinite(t));
  let first: number;
  let last: number;
  if (times.length) {
    first = Math.min(...times);
    last = Math.max(...times);
  } else {
    first = Math.min(...traces.map((t) => t.searchStartS));
    last = Math.max(...traces.map((t) => t.searchEndS));
  }
  if (!Number.isFinite(first) || !Number.isFinite(last)) return { t0S: recStart, t1S: recEnd };
  const spread = Math.max(0, last - first);
  const before = Math.max(MIN_MARGIN_S, 0.25 * spread);
  const after = Math.max(3 * MIN_MARGIN_S, spread);
  let t0 = first - before;
  if (first - recStart < 0.4 * (last - recStart)) t0 = recStart;
  const t1 = last + after;
  const out = { t0S: Math.max(recStart, t0), t1S: Math.min(recEnd, t1) };
  return out.t1S > out.t0S ? out : { t0S: recStart, t1S: recEnd };
}

/**
 * Automatic gain control: each sample divided by the RMS amplitude in a centred window of windowS
 * (the RMS form; Yilmaz, Seismic Data Analysis, 2001, section 1.4). Windows with no energy give 0.
 * Running sums keep it O(n).
 */
export function agc(samples: ArrayLike<number>, dtS: number, windowS: number): Float64Array {
  const n = samples.length;
  const out = new Float64Array(n);
  if (!n) return out;
  const half = Math.max(1, Math.round(windowS / dtS / 2));
  const cum = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) cum[i + 1] = cum[i] + samples[i] * samples[i];
  for (let i = 0; i < n; i++) {
    const a = Math.max(0, i - half);
    const b = Math.min(n, i + half + 1);
    const rms = Math.sqrt((cum[b] - cum[a]) / (b - a));
    out[i] = rms > 0 ? samples[i] / rms : 0;
  }
  return out;
}

/**
 * Time-variant gain: each sample multiplied by its time after the trigger to the given power (a t^n
 * gain; n = 1 undoes spherical spreading at constant velocity, 1/r ~ 1/t: common practice).
 * Samples before the trigger get no gain.
 */
export function timeVariantGain(samples: ArrayLike<number>, delayS: number, dtS: number, power: number): Float64Array {
  const out = new Float64Array(samples.length);
  for (let i = 0; i < samples.length; i++) {
    const t = delayS + i * dtS;
    out[i] = t > 0 ? samples[i] * t ** power : 0;
  }
  return out;
}

/** The x range of drawn data (finite values) of a set of Plotly-like traces (for checks and tests). */
export function drawnRange(traces: readonly { x?: ArrayLike<number> }[]): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const tr of traces) {
    const x = tr.x;
    if (!x) continue;
    for (let i = 0; i < x.length; i++) {
      const v = x[i];
      if (Number.isFinite(v)) {
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
    }
  }
  return lo <= hi ? [lo, hi] : null;
}

/**
 * Window fitted to one pulse: from the onset time, the largest absolute sample within lookS after it
 * (the pulse's main peak); the window starts max(3 ms, 1.5 rise) before the onset and ends
 * max(8 ms, 5 rise) after the peak, where rise = peak time − onset (a pulse's main peak follows its
 * onset by about a quarter period, so this shows about one period before and two after: common
 * practice for judging an onset). Clipped to the trace.
 */
export function pulseWindow(
  samples: ArrayLike<number>,
  delayS: number,
  dtS: number,
  onsetS: number,
  lookS: number,
): TimeWindow {
  const n = samples.length;
  const endS = delayS + (n - 1) * dtS;
  const i0 = Math.max(0, Math.min(n - 1, Math.round((onsetS - delayS) / dtS)));
  const i1 = Math.max(i0, Math.min(n - 1, Math.round((onsetS + lookS - delayS) / dtS)));
  let best = i0;
  for (let i = i0; i <= i1; i++) if (Math.abs(samples[i]) > Math.abs(samples[best])) best = i;
  const peakS = delayS + best * dtS;
  const rise = Math.max(0, peakS - onsetS);
  return {
    t0S: Math.max(delayS, onsetS - Math.max(0.003, 1.5 * rise)),
    t1S: Math.min(endS, peakS + Math.max(0.008, 5 * rise)),
  };
}
