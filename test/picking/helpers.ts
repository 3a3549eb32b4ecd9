/**
 * Test-only signal makers: a seeded generator, Gaussian noise, closed-form pulses, and a direct-DFT
 * fractional shift (independent of the project's FFT wrapper).
 */

/** Mulberry32 generator: uniform [0, 1) from a 32-bit seed (public-domain algorithm). */
export function uniform(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** n samples of zero-mean Gaussian noise with standard deviation sigma (Box-Muller). */
export function gaussianNoise(n: number, sigma: number, seed: number): Float64Array {
  const u = uniform(seed);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i += 2) {
    const r = Math.sqrt(-2 * Math.log(1 - u()));
    const th = 2 * Math.PI * u();
    out[i] = sigma * r * Math.cos(th);
    if (i + 1 < n) out[i + 1] = sigma * r * Math.sin(th);
  }
  return out;
}

/** Ricker wavelet (1 - 2 pi^2 f^2 t^2) exp(-pi^2 f^2 t^2), t from its centre. */
export function ricker(tS: number, peakHz: number): number {
  const a = Math.PI * Math.PI * peakHz * peakHz * tS * tS;
  return (1 - 2 * a) * Math.exp(-a);
}

/** Samples of a Ricker centred at centreS on the grid t_i = i * dtS. */
export function rickerTrace(n: number, dtS: number, peakHz: number, centreS: number, amplitude = 1): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = amplitude * ricker(i * dtS - centreS, peakHz);
  return out;
}

/**
 * Pulse with a sharp onset at onsetS: A sin(2 pi f (t - t0)) exp(-f (t - t0)) for t >= t0, 0 before.
 * Dominant period about 1/f; starts at zero with slope 2 pi f A.
 */
export function onsetPulse(n: number, dtS: number, freqHz: number, onsetS: number, amplitude = 1): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = i * dtS - onsetS;
    if (t >= 0) out[i] = amplitude * Math.sin(2 * Math.PI * freqHz * t) * Math.exp(-freqHz * t);
  }
  return out;
}

/**
 * x delayed by `shift` samples (may be fractional) through a direct DFT: X_k e^{-i 2 pi k shift / n}
 * with k taken as the signed frequency (Nyquist bin kept real). Circular: keep the pulse away from the ends.
 */
export function dftShift(x: ArrayLike<number>, shift: number): Float64Array {
  const n = x.length;
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    let sr = 0;
    let si = 0;
    for (let j = 0; j < n; j++) {
      const ph = (-2 * Math.PI * k * j) / n;
      sr += x[j] * Math.cos(ph);
      si += x[j] * Math.sin(ph);
    }
    re[k] = sr;
    im[k] = si;
  }
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const kk = k <= n / 2 ? k : k - n;
    let ph = (-2 * Math.PI * kk * shift) / n;
    if (2 * k === n) ph = 0;
    const c = Math.cos(ph);
    const s = Math.sin(ph);
    const yr = re[k] * c - im[k] * s;
    const yi = re[k] * s + im[k] * c;
    for (let j = 0; j < n; j++) {
      const ph2 = (2 * Math.PI * k * j) / n;
      out[j] += (yr * Math.cos(ph2) - yi * Math.sin(ph2)) / n;
    }
  }
  return out;
}

export function rms(values: number[]): number {
  return Math.sqrt(values.reduce((s, v) => s + v * v, 0) / values.length);
}
