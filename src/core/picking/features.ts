/**
 * Waveform features after an onset: first peak, first trough and the zero crossing after the first
 * significant extremum (Campanella et al. 1986, In Situ '86, ASCE GSP 6: pick the same feature on
 * every trace so interval times difference like with like), and the dominant period of the pulse.
 */
import { BorewaveError } from '../errors';
import { nextPow2, realSpectrumInto } from '../signal/fft';
import { parabolicOffset } from './parabola';

export interface CharacteristicPoints {
  /** Time of the first peak (local maximum >= minFraction * window max |x|), s after trigger; null if none. */
  peakS: number | null;
  /** Time of the first trough (local minimum <= -minFraction * window max |x|), s; null if none. */
  troughS: number | null;
  /** Zero crossing right after the first significant extremum (peak or trough, whichever comes first), s. */
  zeroCrossingS: number | null;
  /** +1 when the first significant extremum is a peak, -1 when it is a trough. */
  firstPolarity: 1 | -1;
}

export interface SpectrumSummary {
  /** Frequency of the largest spectral amplitude (parabolic refinement between bins), Hz. */
  peakHz: number;
  /** Power-weighted mean frequency, Hz. */
  centroidHz: number;
  /** Power-weighted standard deviation of frequency about the centroid, Hz. */
  rmsWidthHz: number;
}

/**
 * Spectral summary of x[startIdx..endIdx): mean removed, 10% cosine taper at each end, zero-padded
 * to a power of two (at least 256 points: finer bins for short segments), power spectrum up to Nyquist (DC excluded).
 * Returns null when the segment is shorter than 4 samples or carries no energy.
 */
export function spectrumSummary(
  x: ArrayLike<number>,
  startIdx: number,
  endIdx: number,
  sampleIntervalS: number,
): SpectrumSummary | null {
  const s = Math.max(0, Math.floor(startIdx));
  const e = Math.min(x.length, Math.floor(endIdx));
  const n = e - s;
  if (n < 4) return null;
  const seg = new Float64Array(n);
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[s + i];
  mean /= n;
  const m = 0.1 * (n - 1);
  for (let i = 0; i < n; i++) {
    let w = 1;
    const j = Math.min(i, n - 1 - i);
    if (j < m) w = 0.5 * (1 - Math.cos((Math.PI * j) / m));
    seg[i] = (x[s + i] - mean) * w;
  }
  const nfft = Math.max(256, nextPow2(n));
  const spec = realSpectrumInto(seg, nfft, new Float64Array(2 * nfft));
  const half = nfft / 2;
  const df = 1 / (nfft * sampleIntervalS);
  let best = 1;
  let bestAmp = -1;
  let sumP = 0;
  let sumFP = 0;
  let sumF2P = 0;
  for (let k = 1; k <= half; k++) {
    const p = spec[2 * k] * spec[2 * k] + spec[2 * k + 1] * spec[2 * k + 1];
    const f = k * df;
    sumP += p;
    sumFP += f * p;
    sumF2P += f * f * p;
    if (p > bestAmp) {
      bestAmp = p;
      best = k;
    }
  }
  if (!(sumP > 0)) return null;
  const amp = (k: number): number => Math.hypot(spec[2 * k], spec[2 * k + 1]);
  const delta = best > 1 && best < half ? parabolicOffset(amp(best - 1), amp(best), amp(best + 1)) : 0;
  const centroidHz = sumFP / sumP;
  const variance = Math.max(0, sumF2P / sumP - centroidHz * centroidHz);
  return { peakHz: (best + delta) * df, centroidHz, rmsWidthHz: Math.sqrt(variance) };
}

/** Dominant period of x[startIdx..endIdx): 1 / spectral peak frequency (see spectrumSummary), s; null if undefined. */
export function dominantPeriodS(
  x: ArrayLike<number>,
  startIdx: number,
  endIdx: number,
  sampleIntervalS: number,
): number | null {
  const sum = spectrumSummary(x, startIdx, endIdx, sampleIntervalS);
  return sum && sum.peakHz > 0 ? 1 / sum.peakHz : null;
}

/**
 * Sub-sample position of the extremum at sample i: least-squares parabola through x[i-h..i+h]
 * (h = 1 is the three-point formula of the domain notes). A wider fit averages noise on
 * oversampled pulses where three neighbouring samples differ by less than the noise.
 */
function refineExtremum(x: ArrayLike<number>, i: number, h: number): number {
  const n = x.length;
  const hh = Math.max(1, Math.min(h, i, n - 1 - i));
  if (hh === 1) return i + parabolicOffset(x[i - 1], x[i], x[i + 1]);
  // Fit x = c0 + c1 u + c2 u^2 over u = -hh..hh (symmetric: odd sums vanish).
  let s2 = 0;
  let s4 = 0;
  let sy = 0;
  let suy = 0;
  let su2y = 0;
  const m = 2 * hh + 1;
  for (let u = -hh; u <= hh; u++) {
    const y = x[i + u];
    s2 += u * u;
    s4 += u * u * u * u;
    sy += y;
    suy += u * y;
    su2y += u * u * y;
  }
  const c1 = suy / s2;
  const c2 = (m * su2y - s2 * sy) / (m * s4 - s2 * s2);
  if (c2 === 0) return i;
  const d = -c1 / (2 * c2);
  return i + Math.max(-hh, Math.min(hh, d));
}

/** [first, last] sample of the lobe holding sample i: neighbours with the same sign as x[i]. */
function lobeAround(x: ArrayLike<number>, i: number, sign: 1 | -1): [number, number] {
  let a = i;
  while (a > 0 && x[a - 1] * sign > 0) a--;
  let b = i;
  while (b < x.length - 1 && x[b + 1] * sign > 0) b++;
  return [a, b];
}

/**
 * First peak, first trough and the zero crossing after the first significant extremum, searched in
 * [onsetIdx, onsetIdx + searchS/dt]. How the first peak is chosen: the first sample whose |x| reaches
 * minFraction (default 0.5) of the largest |x| in the search window marks the first significant lobe
 * (the run of samples of that sign around it); its extremum is the first peak (or trough, by its
 * sign). The first lobe of the other sign that reaches the threshold gives the other feature. Small
 * precursors and noise wiggles below the threshold are passed over; a Ricker wavelet's side lobes
 * (0.446 of its peak) are below the default. Lobe extrema are refined by a least-squares parabola over
 * +-h samples, h = 1/5 of the lobe's half-height width (at least 1: the three-point formula), about
 * an eighth of a half period, where a sine lobe still follows a parabola closely; the zero crossing
 * ending the first lobe by linear interpolation between the samples either side.
 * Times are delayS + (index) * sampleIntervalS. The default search window is 1.5 dominant periods of
 * the trace from the onset to its end (spectral peak).
 */
export function characteristicPoints(
  x: ArrayLike<number>,
  onsetIdx: number,
  sampleIntervalS: number,
  delayS: number,
  o?: { searchS?: number; minFraction?: number },
): CharacteristicPoints {
  const n = x.length;
  if (!Number.isInteger(onsetIdx) || onsetIdx < 0 || onsetIdx >= n) {
    throw new BorewaveError(
      'PICK_ONSET_INDEX',
      `Onset index ${onsetIdx} is outside the trace of ${n} samples.`,
      undefined,
      'onsetIdx',
    );
  }
  const minFraction = o?.minFraction ?? 0.5;
  if (!(minFraction > 0 && minFraction <= 1)) {
    throw new BorewaveError(
      'PICK_MIN_FRACTION',
      `Feature threshold ${minFraction} must be in (0, 1].`,
      undefined,
      'minFraction',
    );
  }
  let searchS = o?.searchS;
  if (searchS === undefined) {
    const periodS = dominantPeriodS(x, onsetIdx, n, sampleIntervalS);
    searchS = periodS === null ? (n - onsetIdx) * sampleIntervalS : 1.5 * periodS;
  }
  const last = Math.min(n - 1, onsetIdx + Math.max(2, Math.round(searchS / sampleIntervalS)));
  let maxAbs = 0;
  for (let i = onsetIdx; i <= last; i++) maxAbs = Math.max(maxAbs, Math.abs(x[i]));
  const none: CharacteristicPoints = { peakS: null, troughS: null, zeroCrossingS: null, firstPolarity: 1 };
  if (!(maxAbs > 0)) return none;
  const thr = minFraction * maxAbs;
  const timeAt = (idx: number): number => delayS + idx * sampleIntervalS;

  /** Extremum of the first lobe of the given sign reaching the threshold at or after `from`. */
  const firstLobe = (sign: 1 | -1, from: number): { idx: number; lobe: [number, number] } | null => {
    for (let i = from; i <= last; i++) {
      if (x[i] * sign >= thr) {
        const lobe = lobeAround(x, i, sign);
        let best = i;
        for (let j = Math.max(lobe[0], onsetIdx); j <= lobe[1]; j++) if (x[j] * sign > x[best] * sign) best = j;
        return { idx: best, lobe };
      }
    }
    return null;
  };
  let firstIdx = onsetIdx;
  while (firstIdx <= last && Math.abs(x[firstIdx]) < thr) firstIdx++;
  if (firstIdx > last) return none;
  const firstPolarity: 1 | -1 = x[firstIdx] > 0 ? 1 : -1;
  const first = firstLobe(firstPolarity, firstIdx)!;
  const second = firstLobe(firstPolarity === 1 ? -1 : 1, first.lobe[1] + 1);
  const refinedTime = (e: { idx: number; lobe: [number, number] }): number => {
    // Half-height width of the lobe around its extremum (a sine lobe: 2/3 of the half period).
    const half = 0.5 * Math.abs(x[e.idx]);
    let a = e.idx;
    while (a > e.lobe[0] && Math.abs(x[a - 1]) >= half) a--;
    let b = e.idx;
    while (b < e.lobe[1] && Math.abs(x[b + 1]) >= half) b++;
    const h = Math.max(1, Math.round((b - a + 1) / 5));
    return timeAt(refineExtremum(x, e.idx, h));
  };
  const firstS = refinedTime(first);
  const secondS = second ? refinedTime(second) : null;
  let zeroCrossingS: number | null = null;
  const j = first.lobe[1];
  if (j < n - 1) {
    const a = x[j] * firstPolarity;
    const b = x[j + 1] * firstPolarity;
    zeroCrossingS = timeAt(j + a / (a - b));
  }
  return {
    peakS: firstPolarity === 1 ? firstS : secondS,
    troughS: firstPolarity === 1 ? secondS : firstS,
    zeroCrossingS,
    firstPolarity,
  };
}
