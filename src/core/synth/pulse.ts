/**
 * Source pulse and constant-Q propagation for the synthetic records.
 *
 * Pulse: a Berlage wavelet of order 1 (Aldridge 1990, Geophysics 55(11), from memory):
 *   w(t) = A t exp(-a t) sin(2 pi f0 t) for t >= 0, w(t) = 0 for t < 0,
 * with decay a = pi f0 (about one and a half visible cycles) and A chosen so that max |w| = 1.
 * It is causal: the onset (true arrival) is t = 0, where w rises as t^2 (w and w' are 0 there,
 * w'' is not). Its first lobe is positive and the largest (peak near 0.25/f0), the second is
 * about 0.6 of it with opposite sign.
 *
 * Attenuation: the constant-Q model of Kjartansson (1979, J. Geophys. Res. 84(B9), from memory).
 * For travel time tR at the reference frequency fR and quality factor Q, gamma = atan(1/Q)/pi:
 *   phase delay  tF(f) = tR (f/fR)^(-gamma)            (causal velocity dispersion)
 *   amplitude    exp(-2 pi f tF(f) tan(pi gamma / 2))  (= exp(-pi f t / Q) for large Q)
 * The true arrival time of an attenuated pulse is tR: the time at which the reference frequency
 * (the pulse's own f0 by default) has travelled at the model velocity. Higher frequencies run
 * slightly ahead and are damped; the pulse broadens, so its visible onset lies near tR and its
 * peaks come later (rise time grows about as 0.5 t/Q, Gladwin & Stacey 1974, from memory).
 */
import FFT from 'fft.js';

/** Decay rate of the Berlage envelope per unit of 2 pi f0. */
const DECAY_PER_OMEGA = 1 / 2;

export interface PulseShape {
  /** Dominant (carrier) frequency f0, Hz. */
  frequencyHz: number;
}

function decayRate(frequencyHz: number): number {
  return 2 * Math.PI * frequencyHz * DECAY_PER_OMEGA;
}

/**
 * Peak of t exp(-a t) sin(w0 t), found on a dense grid and refined by golden-section search
 * (the first, positive lobe carries the peak for this decay rate).
 */
function rawPeak(frequencyHz: number): number {
  const a = decayRate(frequencyHz);
  const w0 = 2 * Math.PI * frequencyHz;
  const g = (t: number) => Math.abs(t * Math.exp(-a * t) * Math.sin(w0 * t));
  const span = 3 / frequencyHz;
  const n = 3000;
  let best = 0;
  for (let i = 1; i < n; i++) if (g((i * span) / n) > g((best * span) / n)) best = i;
  let lo = ((best - 1) * span) / n;
  let hi = ((best + 1) * span) / n;
  const r = (Math.sqrt(5) - 1) / 2;
  for (let it = 0; it < 100; it++) {
    const m1 = hi - r * (hi - lo);
    const m2 = lo + r * (hi - lo);
    if (g(m1) > g(m2)) hi = m2;
    else lo = m1;
  }
  return g(0.5 * (lo + hi));
}

const scales = new Map<number, number>();

/** Normalising constant A of the wavelet (max |w| = 1); computed once per frequency. */
export function pulseScale(frequencyHz: number): number {
  let a = scales.get(frequencyHz);
  if (a === undefined) {
    a = 1 / rawPeak(frequencyHz);
    scales.set(frequencyHz, a);
  }
  return a;
}

/** The causal pulse at time t after its onset (0 for t < 0), peak magnitude 1. */
export function pulseAt(t: number, frequencyHz: number, scale = pulseScale(frequencyHz)): number {
  if (t <= 0) return 0;
  return scale * t * Math.exp(-decayRate(frequencyHz) * t) * Math.sin(2 * Math.PI * frequencyHz * t);
}

/**
 * Fourier transform W(f) = integral w(t) exp(-i 2 pi f t) dt of the pulse, in closed form:
 * integral t exp(-(a + i w) t) dt over t >= 0 = 1/(a + i w)^2, and sin = (e^{i w0 t} - e^{-i w0 t})/(2i).
 * Returns [re, im].
 */
export function pulseSpectrum(f: number, frequencyHz: number, scale = pulseScale(frequencyHz)): [number, number] {
  const a = decayRate(frequencyHz);
  const w = 2 * Math.PI * f;
  const w0 = 2 * Math.PI * frequencyHz;
  const invSq = (re: number, im: number): [number, number] => {
    // 1/(re + i im)^2 = (re - i im)^2 / (re^2 + im^2)^2
    const d = re * re + im * im;
    return [(re * re - im * im) / (d * d), (-2 * re * im) / (d * d)];
  };
  const [r1, i1] = invSq(a, w - w0);
  const [r2, i2] = invSq(a, w + w0);
  // (z1 - z2) / (2i) = (im part) - i (re part), halved
  const dr = r1 - r2;
  const di = i1 - i2;
  return [(scale * di) / 2, (-scale * dr) / 2];
}

export interface ConstantQ {
  /** Travel time at the reference frequency, s. */
  travelTimeS: number;
  /** Path-averaged quality factor. */
  q: number;
  /** Frequency at which the model velocity holds, Hz. */
  referenceHz: number;
}

/**
 * Kjartansson constant-Q transfer function relative to a pulse that arrives at travelTimeS without
 * loss: returns [gain, extra phase delay in s] at frequency f >= 0.
 */
export function constantQResponse(f: number, cq: ConstantQ): { gain: number; extraDelayS: number } {
  if (f <= 0) return { gain: 1, extraDelayS: 0 };
  const gamma = Math.atan(1 / cq.q) / Math.PI;
  const tF = cq.travelTimeS * Math.pow(f / cq.referenceHz, -gamma);
  return { gain: Math.exp(-2 * Math.PI * f * tF * Math.tan((Math.PI * gamma) / 2)), extraDelayS: tF - cq.travelTimeS };
}

export interface ArrivalRender {
  /** Time of the (reference) arrival on the record clock, s. */
  arrivalS: number;
  frequencyHz: number;
  /** null = no attenuation: the pulse keeps its exact shape. */
  attenuation: ConstantQ | null;
}

function nextPow2(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

/** fft.js objects (with their twiddle tables) by size: a survey renders hundreds of arrivals of one size. */
const ffts = new Map<number, FFT>();

function fftOf(nfft: number): FFT {
  let f = ffts.get(nfft);
  if (!f) {
    f = new FFT(nfft);
    ffts.set(nfft, f);
  }
  return f;
}

/** pulseSpectrum at f_k = k / (nfft dtS), k = 0..nfft/2, as [re, im] pairs: the same for every arrival of a survey. */
const spectra = new Map<string, Float64Array>();

function spectrumOnGrid(nfft: number, dtS: number, frequencyHz: number, scale: number): Float64Array {
  const key = `${nfft}:${dtS}:${frequencyHz}:${scale}`;
  let w = spectra.get(key);
  if (!w) {
    w = new Float64Array(nfft + 2);
    for (let k = 0; k <= nfft / 2; k++) {
      const [re, im] = pulseSpectrum(k / (nfft * dtS), frequencyHz, scale);
      w[2 * k] = re;
      w[2 * k + 1] = im;
    }
    if (spectra.size > 16) spectra.clear();
    spectra.set(key, w);
  }
  return w;
}

/**
 * The pulse (peak 1 before attenuation) sampled at t_i = firstSampleS + i dtS.
 * Without attenuation it is evaluated in the time domain (exact onset). With attenuation it is built
 * in the frequency domain from the closed-form spectrum times the constant-Q response and a delay,
 * inverted by FFT (fft.js) on a grid of at least twice the record length so nothing wraps into it.
 */
export function renderArrival(nSamples: number, dtS: number, firstSampleS: number, r: ArrivalRender): Float64Array {
  const out = new Float64Array(nSamples);
  const scale = pulseScale(r.frequencyHz);
  if (r.attenuation === null) {
    for (let i = 0; i < nSamples; i++) out[i] = pulseAt(firstSampleS + i * dtS - r.arrivalS, r.frequencyHz, scale);
    return out;
  }
  const nfft = nextPow2(2 * nSamples);
  const fft = fftOf(nfft);
  const spec = new Float64Array(2 * nfft);
  const delayS = r.arrivalS - firstSampleS;
  const w = spectrumOnGrid(nfft, dtS, r.frequencyHz, scale);
  const cq = r.attenuation;
  // constantQResponse, with its per-arrival constants taken out of the loop (the same figures).
  const gamma = Math.atan(1 / cq.q) / Math.PI;
  const tanHalf = Math.tan((Math.PI * gamma) / 2);
  for (let k = 0; k <= nfft / 2; k++) {
    const f = k / (nfft * dtS);
    const wr = w[2 * k];
    const wi = w[2 * k + 1];
    let gain = 1;
    let extraDelayS = 0;
    if (f > 0) {
      const tF = cq.travelTimeS * Math.pow(f / cq.referenceHz, -gamma);
      gain = Math.exp(-2 * Math.PI * f * tF * tanHalf);
      extraDelayS = tF - cq.travelTimeS;
    }
    const phase = -2 * Math.PI * f * (delayS + extraDelayS);
    const c = Math.cos(phase);
    const s = Math.sin(phase);
    // X(f_k) / dtS so that the inverse DFT (which divides by nfft) approximates the inverse Fourier integral.
    const re = ((wr * c - wi * s) * gain) / dtS;
    let im = ((wr * s + wi * c) * gain) / dtS;
    if (k === nfft / 2) im = 0;
    spec[2 * k] = re;
    spec[2 * k + 1] = im;
    if (k > 0 && k < nfft / 2) {
      spec[2 * (nfft - k)] = re;
      spec[2 * (nfft - k) + 1] = -im;
    }
  }
  const time = new Float64Array(2 * nfft);
  fft.inverseTransform(time, spec);
  for (let i = 0; i < nSamples; i++) out[i] = time[2 * i];
  return out;
}
