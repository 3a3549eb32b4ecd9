/**
 * Attenuation between two traces of the SAME hit (two-receiver pairs; crosshole near and far
 * receivers), and the cross-correlation delay freed of pulse broadening.
 *
 * Spectral ratio (Bath 1974, Spectral Analysis in Geophysics; compared with other Q methods by Tonn
 * 1991, Geophys. Prospect. 39(1), from memory): with the same source spectrum at both receivers,
 *   ln |B(f)| / |A(f)| = c - pi f dt* ,   dt* = dt / Q,
 * so a straight line through the log spectral ratio over the pulses' common band gives dt* from its
 * slope and Q = dt / dt* (dt: the travel-time difference). Between different hits (one receiver per
 * hit) the source spectrum changes from hit to hit: Q is not estimated there.
 *
 * Broadening: under constant Q (Kjartansson 1979, J. Geophys. Res. 84(B9), from memory) the farther
 * pulse is broader and its correlation peak lags the reference-frequency travel time. The bias is
 * measured on the data: the nearer pulse is propagated through the constant-Q operator for (dt, Q)
 * with its bulk delay removed, and the lag of its correlation peak against the unpropagated pulse is
 * the bias subtracted from the measured delay (iterated once with the corrected dt).
 */
import { BorewaveError } from '../errors';
import { inverseToReal, nextPow2, realSpectrum } from './fft';

export interface SpectralRatioOptions {
  /** Travel-time difference b - a, s (e.g. the correlation delay). */
  delayS: number;
  /** A frequency counts in the common band where both amplitude spectra exceed this share of their peaks. */
  minShare?: number;
  /** Optional outer limits of the band, Hz. */
  bandHz?: [number, number];
  /**
   * Weight each frequency by the inverse variance of its log ratio under additive white noise,
   * var(ln B/A) ~ s^2 (1/A^2 + 1/B^2) (first order), instead of equally (default true: better on the
   * bank's training seeds).
   */
  weighted?: boolean;
  /**
   * Keep only the contiguous band around the peak of |A| |B| where both spectra exceed minShare of their
   * peaks (default false: every such frequency), so isolated noise peaks far from the pulse do not count.
   */
  contiguous?: boolean;
  /**
   * Prior on the intercept c of ln |B| / |A| = c - pi f dt*: c ~ N(value, sd^2). Between two receivers of
   * one probe c is the geometric spreading ratio ln(rA / rB) plus the receivers' coupling ratio, which is
   * the same at every depth: pinning c gives the slope the lever arm from f = 0 (common practice in
   * spectral-ratio work: correct for spreading before the ratio).
   */
  intercept?: { value: number; sd: number };
}

export type SpectralRatioResult =
  | {
      ok: true;
      q: number;
      qSd: number;
      tStarS: number;
      tStarSdS: number;
      bandHz: [number, number];
      points: number;
      /** Intercept c of the line (free fit, or with the intercept prior). */
      interceptLn: number;
    }
  | { ok: false; reason: string; tStarS?: number; tStarSdS?: number; interceptLn?: number };

function tapered(x: ArrayLike<number>): Float64Array {
  // Hann taper over the outer 10% at each end (common practice against spectral leakage)
  const n = x.length;
  const out = new Float64Array(n);
  const m = Math.max(1, Math.floor(0.1 * n));
  for (let i = 0; i < n; i++) {
    let w = 1;
    if (i < m) w = 0.5 * (1 - Math.cos((Math.PI * i) / m));
    else if (i >= n - m) w = 0.5 * (1 - Math.cos((Math.PI * (n - 1 - i)) / m));
    out[i] = x[i] * w;
  }
  return out;
}

function amplitude(x: ArrayLike<number>, nfft: number): Float64Array {
  const s = realSpectrum(tapered(x), nfft);
  const a = new Float64Array(nfft / 2 + 1);
  for (let k = 0; k <= nfft / 2; k++) a[k] = Math.hypot(s[2 * k], s[2 * k + 1]);
  return a;
}

/**
 * Q between two windowed pulses of one hit (a nearer, b farther), sampled at dtS. The windows should
 * hold each pulse whole (same length), with little else.
 */
export function spectralRatioQ(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  dtS: number,
  o: SpectralRatioOptions,
): SpectralRatioResult {
  if (!(o.delayS > 0)) return { ok: false, reason: 'the delay between the traces is not positive' };
  const n = Math.max(a.length, b.length);
  if (n < 8) return { ok: false, reason: 'windows too short for a spectrum' };
  const pad = 4;
  const nfft = nextPow2(pad * n);
  const A = amplitude(a, nfft);
  const B = amplitude(b, nfft);
  const share = o.minShare ?? 0.1;
  let maxA = 0;
  let maxB = 0;
  for (let k = 1; k < A.length; k++) {
    maxA = Math.max(maxA, A[k]);
    maxB = Math.max(maxB, B[k]);
  }
  const df = 1 / (nfft * dtS);
  const xs: number[] = [];
  const ys: number[] = [];
  const ws: number[] = [];
  const weighted = o.weighted ?? true;
  let kLo = 1;
  let kHi = A.length - 1;
  if (o.contiguous) {
    let kp = 1;
    for (let k = 1; k < A.length; k++) if (A[k] * B[k] > A[kp] * B[kp]) kp = k;
    kLo = kp;
    kHi = kp;
    while (kLo > 1 && A[kLo - 1] >= share * maxA && B[kLo - 1] >= share * maxB) kLo--;
    while (kHi < A.length - 1 && A[kHi + 1] >= share * maxA && B[kHi + 1] >= share * maxB) kHi++;
  }
  for (let k = kLo; k <= kHi; k++) {
    const f = k * df;
    if (o.bandHz && (f < o.bandHz[0] || f > o.bandHz[1])) continue;
    if (A[k] < share * maxA || B[k] < share * maxB) continue;
    xs.push(f);
    ys.push(Math.log(B[k] / A[k]));
    ws.push(weighted ? 1 / (1 / (A[k] / maxA) ** 2 + 1 / (B[k] / maxB) ** 2) : 1);
  }
  if (xs.length < 3) return { ok: false, reason: 'no common band where both pulses carry energy' };
  const m = xs.length;
  const sw = ws.reduce((s, w) => s + w, 0);
  const mx = xs.reduce((s, x, i) => s + ws[i] * x, 0) / sw;
  const my = ys.reduce((s, y, i) => s + ws[i] * y, 0) / sw;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < m; i++) {
    sxx += ws[i] * (xs[i] - mx) ** 2;
    sxy += ws[i] * (xs[i] - mx) * (ys[i] - my);
  }
  const freeSlope = sxy / sxx;
  let sse = 0;
  for (let i = 0; i < m; i++) sse += ws[i] * (ys[i] - my - freeSlope * (xs[i] - mx)) ** 2;
  // weighted regression slope se (weights known up to a scale, estimated from the residuals);
  // zero padding makes neighbouring points dependent: the independent count is m / pad
  const s2 = sse / Math.max(1, m - 2);
  let slope = freeSlope;
  let intercept = my - freeSlope * mx;
  let slopeSe = Math.sqrt(s2 / sxx) * Math.sqrt(pad);
  if (o.intercept && o.intercept.sd > 0 && s2 > 0) {
    // the line with a Gaussian prior on its intercept (a prior enters as one more data row; Tarantola
    // 2005, Inverse Problem Theory, ch. 3, from memory): 2 x 2 normal equations in (c, slope)
    const pc = 1 / o.intercept.sd ** 2;
    const a11 = sw / s2 + pc;
    const a12 = (sw * mx) / s2;
    const a22 = (sxx + sw * mx * mx) / s2;
    const b1 = (sw * my) / s2 + pc * o.intercept.value;
    const b2 = (sxy + sw * mx * my) / s2;
    const det = a11 * a22 - a12 * a12;
    slope = (a11 * b2 - a12 * b1) / det;
    intercept = (b1 * a22 - a12 * b2) / det;
    slopeSe = Math.sqrt((a11 / det) * pad);
  }
  const tStar = -slope / Math.PI;
  const tStarSd = slopeSe / Math.PI;
  const band: [number, number] = [xs[0], xs[m - 1]];
  if (!(tStar > 0))
    return {
      ok: false,
      reason: 'the farther pulse is not the more attenuated one over the common band',
      tStarS: tStar,
      tStarSdS: tStarSd,
      interceptLn: intercept,
    };
  const q = o.delayS / tStar;
  return {
    ok: true,
    q,
    qSd: (q * tStarSd) / tStar,
    tStarS: tStar,
    tStarSdS: tStarSd,
    bandHz: band,
    points: m,
    interceptLn: intercept,
  };
}

/** The pulse x propagated by constant Q for travel time tS (reference frequency fRefHz), bulk delay tS removed. */
export function constantQPropagate(
  x: ArrayLike<number>,
  dtS: number,
  tS: number,
  q: number,
  fRefHz: number,
): Float64Array {
  if (!(q > 0) || !(fRefHz > 0))
    throw new BorewaveError('SYNTH_BAD_OPTION', 'Q and the reference frequency must be positive.');
  const nfft = nextPow2(2 * x.length);
  const s = realSpectrum(x, nfft);
  const gamma = Math.atan(1 / q) / Math.PI;
  for (let k = 0; k < nfft; k++) {
    const kk = k <= nfft / 2 ? k : nfft - k;
    const f = kk / (nfft * dtS);
    if (f === 0) continue;
    const tF = tS * (f / fRefHz) ** -gamma;
    const gain = Math.exp(-2 * Math.PI * f * tF * Math.tan((Math.PI * gamma) / 2));
    // extra phase delay beyond the bulk tS; the sign follows the half of the spectrum
    const phase = -2 * Math.PI * f * (tF - tS) * (k <= nfft / 2 ? 1 : -1);
    const re = s[2 * k];
    const im = s[2 * k + 1];
    s[2 * k] = gain * (re * Math.cos(phase) - im * Math.sin(phase));
    s[2 * k + 1] = gain * (re * Math.sin(phase) + im * Math.cos(phase));
  }
  return inverseToReal(s, nfft).slice(0, x.length);
}

/** Lag (s) of the correlation peak of y against x near zero (within maxLagS), refined by a parabola. */
export function peakLagS(x: Float64Array, y: Float64Array, dtS: number, maxLagS: number): number {
  const maxK = Math.max(1, Math.round(maxLagS / dtS));
  const r = (k: number) => {
    let s = 0;
    for (let i = 0; i < x.length; i++) {
      const j = i + k;
      if (j >= 0 && j < y.length) s += x[i] * y[j];
    }
    return s;
  };
  let best = 0;
  let bestR = -Infinity;
  for (let k = -maxK; k <= maxK; k++) {
    const v = r(k);
    if (v > bestR) {
      bestR = v;
      best = k;
    }
  }
  const rm = r(best - 1);
  const rp = r(best + 1);
  const den = rm - 2 * bestR + rp;
  const off = den !== 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (rm - rp)) / den)) : 0;
  return (best + off) * dtS;
}

/**
 * The correlation delay corrected for pulse broadening: measured delay minus the lag that constant-Q
 * propagation over (delay, Q) alone puts on the nearer pulse `a` (windowed, reference frequency fRefHz:
 * the frequency at which the velocities are stated; the pulse's dominant frequency by default).
 */
export function broadeningCorrectedDelay(
  a: ArrayLike<number>,
  dtS: number,
  measuredDelayS: number,
  q: number,
  fRefHz: number,
): { delayS: number; biasS: number } {
  const x = Float64Array.from(a);
  let t = measuredDelayS;
  let bias = 0;
  for (let it = 0; it < 2; it++) {
    const y = constantQPropagate(x, dtS, t, q, fRefHz);
    bias = peakLagS(x, y, dtS, Math.max(5 * dtS, 0.5 * t));
    t = measuredDelayS - bias;
  }
  return { delayS: t, biasS: bias };
}

/** Small-strain damping ratio from a quality factor: D = 1 / (2 Q), with its sd (first order). */
export function dampingFromQ(q: number, qSd: number): { damping: number; dampingSd: number } {
  return { damping: 1 / (2 * q), dampingSd: qSd / (2 * q * q) };
}
