/**
 * Trace conditioning before picking: remove the least-squares line, taper both ends, then a
 * zero-phase Butterworth band-pass (forward-backward, so arrival times are not shifted).
 * Order matters: the trend is removed first so the taper does not turn an offset into a pulse, and
 * the taper comes before the filter so the filter does not ring on a step at the trace ends
 * (common practice).
 */
import { BorewaveError } from '../errors';
import { butterworthBandpassSos, cosineTaper, removeTrend, sosFiltFilt } from './filter';

export interface ConditionSettings {
  detrend: boolean;
  /** Share of the trace tapered at EACH end, 0..0.5 (0 = no taper). */
  taperFraction: number;
  /** Band-pass corners (-3 dB of one pass; the zero-phase result is -6 dB there) and prototype order; null = none. */
  bandpass: { lowHz: number; highHz: number; order: number } | null;
}

const designCache = new Map<string, Float64Array>();

/** Band-pass SOS, cached by (order, corners, rate): a survey usually shares one design. */
function cachedBandpass(order: number, lowHz: number, highHz: number, sampleRateHz: number): Float64Array {
  const key = `${order}|${lowHz}|${highHz}|${sampleRateHz}`;
  let sos = designCache.get(key);
  if (!sos) {
    sos = butterworthBandpassSos(order, lowHz, highHz, sampleRateHz);
    if (designCache.size > 64) designCache.clear();
    designCache.set(key, sos);
  }
  return sos;
}

/** Conditioned copy of x (never modifies x). Throws BorewaveError for bad settings or a too-short trace. */
export function conditionTrace(x: ArrayLike<number>, sampleIntervalS: number, s: ConditionSettings): Float64Array {
  if (!(sampleIntervalS > 0) || !Number.isFinite(sampleIntervalS)) {
    throw new BorewaveError(
      'SIGNAL_SAMPLE_INTERVAL',
      `Sample interval ${sampleIntervalS} s is not a positive number.`,
      undefined,
      'sampleIntervalS',
    );
  }
  let y: Float64Array = s.detrend ? removeTrend(x) : Float64Array.from(x);
  if (s.taperFraction !== 0) y = cosineTaper(y, s.taperFraction);
  if (s.bandpass) {
    const sos = cachedBandpass(s.bandpass.order, s.bandpass.lowHz, s.bandpass.highHz, 1 / sampleIntervalS);
    y = sosFiltFilt(sos, y);
  }
  return y;
}
