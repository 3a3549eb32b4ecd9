/**
 * Delay between two traces: cross-correlation peak (time domain, by FFT) and cross-spectrum phase
 * slope (frequency domain). Convention everywhere: "b later than a by delayS", i.e. b(t) = a(t - delayS).
 * References: Knapp & Carter (1976), IEEE Trans. ASSP 24(4) (memory); Campanella & Stewart (1992),
 * Can. Geotech. J. 29 (memory); formulas in the domain notes section 3.
 */
import { BorewaveError } from '../errors';
import { fftPlan, inverseToRealInto, nextPow2, realSpectrumInto } from '../signal/fft';
import { parabolicOffset, parabolicVertexValue } from './parabola';

interface Workspace {
  specA: Float64Array;
  specB: Float64Array;
  cross: Float64Array;
  corr: Float64Array;
}

const workspaces = new Map<number, Workspace>();

function workspace(nfft: number): Workspace {
  let w = workspaces.get(nfft);
  if (!w) {
    fftPlan(nfft);
    w = {
      specA: new Float64Array(2 * nfft),
      specB: new Float64Array(2 * nfft),
      cross: new Float64Array(2 * nfft),
      corr: new Float64Array(nfft),
    };
    workspaces.set(nfft, w);
  }
  return w;
}

/** Spectra of a and b (zero-padded to nfft) into the workspace, and the cross spectrum conj(A) B. */
function crossSpectrum(a: ArrayLike<number>, b: ArrayLike<number>, nfft: number): Workspace {
  const w = workspace(nfft);
  realSpectrumInto(a, nfft, w.specA);
  realSpectrumInto(b, nfft, w.specB);
  const A = w.specA;
  const B = w.specB;
  const G = w.cross;
  for (let i = 0; i < 2 * nfft; i += 2) {
    const ar = A[i];
    const ai = A[i + 1];
    const br = B[i];
    const bi = B[i + 1];
    G[i] = ar * br + ai * bi;
    G[i + 1] = ar * bi - ai * br;
  }
  return w;
}

/**
 * Circular correlation c[m] = sum_n a(n) b(n+m) (indices mod nfft) in the workspace buffer `corr`.
 * With nfft >= len(a) + len(b) - 1 it holds the linear correlation: lag k >= 0 at c[k], k < 0 at c[nfft + k].
 */
function circularCorrelation(a: ArrayLike<number>, b: ArrayLike<number>, nfft: number): Float64Array {
  const w = crossSpectrum(a, b, nfft);
  return inverseToRealInto(w.cross, nfft, w.corr);
}

function energy(x: ArrayLike<number>): number {
  let e = 0;
  for (let i = 0; i < x.length; i++) e += x[i] * x[i];
  return e;
}

/**
 * Full cross-correlation r(k) = sum_n a(n) b(n+k) for k = -(len(a)-1) .. len(b)-1, by FFT
 * (the same as scipy.signal.correlate(b, a, 'full')). lags[j] is the lag of r[j].
 */
export function crossCorrelate(a: ArrayLike<number>, b: ArrayLike<number>): { lags: Int32Array; r: Float64Array } {
  if (a.length === 0 || b.length === 0) {
    throw new BorewaveError('DELAY_EMPTY', 'Cross-correlation needs two non-empty traces.', undefined, 'samples');
  }
  const total = a.length + b.length - 1;
  const nfft = Math.max(2, nextPow2(total));
  const c = circularCorrelation(a, b, nfft);
  const lags = new Int32Array(total);
  const r = new Float64Array(total);
  for (let j = 0; j < total; j++) {
    const k = j - (a.length - 1);
    lags[j] = k;
    r[j] = c[k >= 0 ? k : nfft + k];
  }
  return { lags, r };
}

/**
 * Delay of b after a from the cross-correlation peak.
 * - Only lags inside [minDelayS, maxDelayS] are searched (guard against a cycle skip: the bounds come
 *   from the geometry and a plausible velocity range).
 * - The largest positive correlation is taken (same polarity expected); it is refined to a fraction
 *   of a sample by a parabola through the peak and its neighbours (not when the peak sits on a bound).
 * - coefficient = r(peak) / sqrt(sum a^2 sum b^2), the normalised correlation (1 = same shape).
 * - atBound: the best lag is the first or last lag searched, so the true peak may lie outside.
 */
export function correlationDelay(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  sampleIntervalS: number,
  o: { minDelayS: number; maxDelayS: number },
): { delayS: number; coefficient: number; atBound: boolean } {
  if (!(sampleIntervalS > 0)) {
    throw new BorewaveError(
      'SIGNAL_SAMPLE_INTERVAL',
      `Sample interval ${sampleIntervalS} s is not a positive number.`,
      undefined,
      'sampleIntervalS',
    );
  }
  const ea = energy(a);
  const eb = energy(b);
  if (!(ea > 0) || !(eb > 0)) {
    throw new BorewaveError(
      'DELAY_NO_SIGNAL',
      'Cross-correlation: one of the two windows is all zeros.',
      undefined,
      'samples',
    );
  }
  const kLo = Math.max(-(a.length - 1), Math.ceil(o.minDelayS / sampleIntervalS - 1e-9));
  const kHi = Math.min(b.length - 1, Math.floor(o.maxDelayS / sampleIntervalS + 1e-9));
  if (!(kLo <= kHi)) {
    throw new BorewaveError(
      'DELAY_BOUNDS',
      `Delay bounds ${o.minDelayS}..${o.maxDelayS} s leave no lag to search for windows of ${a.length} and ${b.length} samples.`,
      undefined,
      'delayBounds',
    );
  }
  const nfft = Math.max(2, nextPow2(a.length + b.length - 1));
  const c = circularCorrelation(a, b, nfft);
  const at = (k: number): number => c[k >= 0 ? k : nfft + k];
  let best = kLo;
  let bestR = at(kLo);
  for (let k = kLo + 1; k <= kHi; k++) {
    const r = at(k);
    if (r > bestR) {
      bestR = r;
      best = k;
    }
  }
  const atBound = best === kLo || best === kHi;
  let offset = 0;
  let peak = bestR;
  if (!atBound) {
    const rm = at(best - 1);
    const rp = at(best + 1);
    offset = parabolicOffset(rm, bestR, rp);
    peak = parabolicVertexValue(rm, bestR, rp, offset);
  }
  const coefficient = Math.max(-1, Math.min(1, peak / Math.sqrt(ea * eb)));
  return { delayS: (best + offset) * sampleIntervalS, coefficient, atBound };
}

/**
 * Delay from the slope of the cross-spectrum phase, G(f) = conj(A(f)) B(f), whose phase is
 * -2 pi f tau for b(t) = a(t - tau).
 * - A first delay tau0 (nearDelayS, else the integer lag of the correlation peak) is taken out, so
 *   the remaining phase is small and unwraps safely.
 * - Auto- and cross-spectra are smoothed over +-m bins (m = nfft / max window length, about one
 *   natural resolution bin each side) to estimate the magnitude-squared coherence
 *   gamma^2 = |<G>|^2 / (<|A|^2> <|B|^2>).
 * - The unwrapped phase of each bin in [minHz, maxHz] (unsmoothed) is fitted by weighted least squares with a
 *   free intercept (group delay: a constant phase rotation does not bias it), weights
 *   gamma^2 / (1 - gamma^2), the inverse phase variance (Carter 1987, Proc. IEEE 75(2) (memory)).
 * Returns null when fewer than 3 bins fall in the band or no bin carries weight.
 * coherence = mean gamma^2 over the band; usedHz = the first and last frequencies used; slopeErrorS =
 * standard error of the delay from the scatter of the phases about the fitted line (weighted
 * residual variance, counting only the independent bins), s.
 */
export function phaseSlopeDelay(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  sampleIntervalS: number,
  o: { minHz: number; maxHz: number; nearDelayS?: number },
): { delayS: number; coherence: number; usedHz: [number, number]; slopeErrorS: number } | null {
  if (!(sampleIntervalS > 0)) {
    throw new BorewaveError(
      'SIGNAL_SAMPLE_INTERVAL',
      `Sample interval ${sampleIntervalS} s is not a positive number.`,
      undefined,
      'sampleIntervalS',
    );
  }
  if (!(o.minHz >= 0) || !(o.maxHz > o.minHz)) {
    throw new BorewaveError(
      'DELAY_BAND',
      `Phase band ${o.minHz}-${o.maxHz} Hz is not an increasing pair of frequencies.`,
      undefined,
      'phaseBandHz',
    );
  }
  const nMax = Math.max(a.length, b.length);
  if (nMax < 2) return null;
  const nfft = Math.max(4, nextPow2(2 * nMax));
  const half = nfft / 2;
  const df = 1 / (nfft * sampleIntervalS);
  const kLo = Math.max(1, Math.ceil(o.minHz / df - 1e-9));
  const kHi = Math.min(half - 1, Math.floor(o.maxHz / df + 1e-9));
  if (kHi - kLo + 1 < 3) return null;

  const w = crossSpectrum(a, b, nfft);
  let tau0 = o.nearDelayS;
  if (tau0 === undefined) {
    const c = inverseToRealInto(w.cross, nfft, w.corr);
    let best = 0;
    for (let m = 1; m < nfft; m++) if (c[m] > c[best]) best = m;
    tau0 = (best < half ? best : best - nfft) * sampleIntervalS;
  }
  const m = Math.max(1, Math.round(nfft / nMax));
  const from = Math.max(0, kLo - m);
  const to = Math.min(half, kHi + m);
  const len = to - from + 1;
  const gRe = new Float64Array(len);
  const gIm = new Float64Array(len);
  const pA = new Float64Array(len);
  const pB = new Float64Array(len);
  for (let k = from; k <= to; k++) {
    const i = 2 * k;
    const ph = 2 * Math.PI * k * df * tau0;
    const c = Math.cos(ph);
    const s = Math.sin(ph);
    const gr = w.cross[i];
    const gi = w.cross[i + 1];
    // G * e^{+i 2 pi f tau0}: removes the first delay.
    gRe[k - from] = gr * c - gi * s;
    gIm[k - from] = gr * s + gi * c;
    pA[k - from] = w.specA[i] * w.specA[i] + w.specA[i + 1] * w.specA[i + 1];
    pB[k - from] = w.specB[i] * w.specB[i] + w.specB[i + 1] * w.specB[i + 1];
  }
  const nBand = kHi - kLo + 1;
  const phases = new Float64Array(nBand);
  const weights = new Float64Array(nBand);
  let cohSum = 0;
  for (let k = kLo; k <= kHi; k++) {
    let sr = 0;
    let si = 0;
    let sa = 0;
    let sb = 0;
    for (let j = Math.max(from, k - m); j <= Math.min(to, k + m); j++) {
      sr += gRe[j - from];
      si += gIm[j - from];
      sa += pA[j - from];
      sb += pB[j - from];
    }
    const den = sa * sb;
    const coh = den > 0 ? Math.min(1, (sr * sr + si * si) / den) : 0;
    cohSum += coh;
    // Phase from the bin itself: the smoothed sum would report the phase at a power-weighted mean
    // frequency, not at f_k, and bias the slope wherever the spectrum is steep.
    let phase = Math.atan2(gIm[k - from], gRe[k - from]);
    if (k > kLo) {
      // Unwrap: keep each step within +-pi of the previous bin.
      const prev = phases[k - kLo - 1];
      phase += 2 * Math.PI * Math.round((prev - phase) / (2 * Math.PI));
    }
    phases[k - kLo] = phase;
    weights[k - kLo] = coh / Math.max(1 - coh, 1e-6);
  }
  // Weighted straight line phase = c0 + slope * f, with centred sums for accuracy.
  let sw = 0;
  let swf = 0;
  let swp = 0;
  for (let j = 0; j < nBand; j++) {
    sw += weights[j];
    swf += weights[j] * (kLo + j) * df;
    swp += weights[j] * phases[j];
  }
  if (!(sw > 0)) return null;
  const fMean = swf / sw;
  const pMean = swp / sw;
  let sff = 0;
  let sfp = 0;
  for (let j = 0; j < nBand; j++) {
    const fc = (kLo + j) * df - fMean;
    sff += weights[j] * fc * fc;
    sfp += weights[j] * fc * (phases[j] - pMean);
  }
  if (!(sff > 0)) return null;
  const slope = sfp / sff;
  const delayS = tau0 - slope / (2 * Math.PI);
  // Standard error of the slope from the weighted residual scatter. Zero padding makes neighbouring
  // bins dependent: only about nBand * nMax / nfft of them are independent, which scales the error up.
  let swr2 = 0;
  for (let j = 0; j < nBand; j++) {
    const r = phases[j] - (pMean + slope * ((kLo + j) * df - fMean));
    swr2 += weights[j] * r * r;
  }
  const unitVariance = swr2 / Math.max(1, nBand - 2);
  const slopeErrorS = Math.sqrt(((unitVariance / sff) * nfft) / nMax) / (2 * Math.PI);
  return { delayS, coherence: cohSum / nBand, usedHz: [kLo * df, kHi * df], slopeErrorS };
}
