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
 * to at least twice its length (finer bins for the peak), power spectrum up to Nyquist (DC excluded).
 * Returns null when the segment is shorter than 4 samples or carries no energy.
 */
export function spectrumSummary(x: ArrayLike<number>, startIdx: number, endIdx: number, sampleIntervalS: number): SpectrumSummary | null {
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
  const nfft = Math.max(256, nextPow2(2 * n));
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
export function dominantPeriodS(x: ArrayLike<number>, startIdx: number, endIdx: number, sampleIntervalS: number): number | null {
  const sum = spectrumSummary(x, startIdx, endIdx, sampleIntervalS);
  return sum && sum.peakHz > 0 ? 1 / sum.peakHz : null;
}

/**
 * First peak, first trough and the zero crossing after the first significant extremum, searched in
 * [onsetIdx, onsetIdx + searchS/dt]. "Significant" (how the first peak is chosen): a local extremum
 * whose absolute value reaches minFraction (default 0.5) of the largest |x| in the search window,
 * so small precursors and noise wiggles before the main pulse are passed over. A Ricker wavelet's
 * side lobes (0.446 of its peak) are below the default. Peak and trough times are refined by a
 * parabola through three samples; the zero crossing by linear interpolation between the samples
 * either side. Times are delayS + (index) * sampleIntervalS. The default search window is 1.5
 * dominant periods of the trace from the onset to its end (spectral peak).
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
    throw new BorewaveError('PICK_ONSET_INDEX', `Onset index ${onsetIdx} is outside the trace of ${n} samples.`, undefined, 'onsetIdx');
  }
  const minFraction = o?.minFraction ?? 0.5;
  if (!(minFraction > 0 && minFraction <= 1)) {
    throw new BorewaveError('PICK_MIN_FRACTION', `Feature threshold ${minFraction} must be in (0, 1].`, undefined, 'minFraction');
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
  let peakIdx = -1;
  let troughIdx = -1;
  for (let i = Math.max(1, onsetIdx); i <= last && i < n - 1 && (peakIdx < 0 || troughIdx < 0); i++) {
    const v = x[i];
    if (peakIdx < 0 && v >= thr && v > x[i - 1] && v >= x[i + 1]) peakIdx = i;
    if (troughIdx < 0 && v <= -thr && v < x[i - 1] && v <= x[i + 1]) troughIdx = i;
  }
  const timeAt = (idx: number): number => delayS + idx * sampleIntervalS;
  const refined = (i: number): number => timeAt(i + parabolicOffset(x[i - 1], x[i], x[i + 1]));
  const peakS = peakIdx >= 0 ? refined(peakIdx) : null;
  const troughS = troughIdx >= 0 ? refined(troughIdx) : null;
  let first = -1;
  let firstPolarity: 1 | -1 = 1;
  if (peakIdx >= 0 && (troughIdx < 0 || peakIdx < troughIdx)) first = peakIdx;
  else if (troughIdx >= 0) {
    first = troughIdx;
    firstPolarity = -1;
  }
  let zeroCrossingS: number | null = null;
  if (first >= 0) {
    for (let j = first; j < n - 1; j++) {
      const a = x[j] * firstPolarity;
      const b = x[j + 1] * firstPolarity;
      if (a > 0 && b <= 0) {
        zeroCrossingS = timeAt(j + a / (a - b));
        break;
      }
    }
  }
  return { peakS, troughS, zeroCrossingS, firstPolarity };
}
