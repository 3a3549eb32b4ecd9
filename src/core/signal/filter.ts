/**
 * Butterworth band-pass design in second-order sections, SOS filtering (one pass and zero-phase
 * forward-backward), linear detrend and cosine (Tukey) taper.
 *
 * SOS layout: Float64Array of 6 * nSections values, row s = [b0, b1, b2, a0, a1, a2] with a0 = 1;
 * the sections run in cascade, section 0 first. The design follows the usual analog-prototype route
 * (Butterworth poles, low-pass to band-pass transform, bilinear transform with pre-warped corners,
 * e.g. Oppenheim & Schafer, Discrete-Time Signal Processing, ch. 7) and groups poles and zeros into
 * sections the way SciPy's `butter(..., output='sos')` does (poles nearest the unit circle go last,
 * each paired with its nearest zeros, overall gain in the first section), so the coefficients can
 * be checked one for one against SciPy.
 */
import { BorewaveError } from '../errors';

// ---------------------------------------------------------------- design

interface Complex {
  re: number;
  im: number;
}

function cMul(a: Complex, b: Complex): Complex {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}

function cDiv(a: Complex, b: Complex): Complex {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}

/** Principal square root (branch cut on the negative real axis, imaginary part >= 0 there). */
function cSqrt(a: Complex): Complex {
  const r = Math.hypot(a.re, a.im);
  if (r === 0) return { re: 0, im: 0 };
  if (a.re >= 0) {
    const t = Math.sqrt(0.5 * (r + a.re));
    return { re: t, im: a.im / (2 * t) };
  }
  const t = Math.sqrt(0.5 * (r - a.re));
  const im = a.im < 0 || Object.is(a.im, -0) ? -t : t;
  return { re: Math.abs(a.im) / (2 * t), im };
}

/** Relative tolerance under which a root counts as real (as in SciPy's pairing: 100 machine epsilons). */
const REAL_TOL = 100 * Number.EPSILON;

interface Root {
  re: number;
  /** >= 0: one entry stands for a conjugate pair when im > 0. */
  im: number;
  real: boolean;
}

function checkDesign(order: number, lowHz: number, highHz: number, sampleRateHz: number): void {
  if (!Number.isInteger(order) || order < 1 || order > 24) {
    throw new BorewaveError(
      'FILTER_ORDER',
      `Band-pass order ${order} is not a whole number from 1 to 24.`,
      undefined,
      'order',
    );
  }
  if (!(sampleRateHz > 0) || !Number.isFinite(sampleRateHz)) {
    throw new BorewaveError(
      'FILTER_RATE',
      `Sample rate ${sampleRateHz} Hz is not a positive number.`,
      undefined,
      'sampleRateHz',
    );
  }
  const nyquistHz = sampleRateHz / 2;
  if (!(lowHz > 0) || !(highHz > lowHz) || !(highHz < nyquistHz)) {
    throw new BorewaveError(
      'FILTER_CORNERS',
      `Band-pass corners ${lowHz}-${highHz} Hz must satisfy 0 < low < high < Nyquist (${nyquistHz} Hz).`,
      undefined,
      'bandpass',
    );
  }
}

/**
 * Digital Butterworth band-pass of the given prototype order (2*order poles, `order` sections),
 * corners at lowHz and highHz (-3.01 dB, |H| = 1/sqrt 2), as SOS rows [b0,b1,b2,a0,a1,a2].
 * Matches scipy.signal.butter(order, [lowHz, highHz], 'bandpass', fs=sampleRateHz, output='sos').
 */
export function butterworthBandpassSos(
  order: number,
  lowHz: number,
  highHz: number,
  sampleRateHz: number,
): Float64Array {
  checkDesign(order, lowHz, highHz, sampleRateHz);
  const n = order;
  // Pre-warp the corners for the bilinear transform with its constant 2*fs' = 4 (fs' = 2, corners normalised to Nyquist).
  const w1 = 4 * Math.tan((Math.PI * ((2 * lowHz) / sampleRateHz)) / 2);
  const w2 = 4 * Math.tan((Math.PI * ((2 * highHz) / sampleRateHz)) / 2);
  const bw = w2 - w1;
  const wo2 = w1 * w2;

  // Analog Butterworth prototype poles -exp(i pi m / 2n), m = -n+1, -n+3, ..., n-1; low-pass to band-pass:
  // each prototype pole q gives q*bw/2 +- sqrt((q*bw/2)^2 - wo^2).
  const analog: Complex[] = [];
  const minus: Complex[] = [];
  for (let m = -n + 1; m <= n - 1; m += 2) {
    const th = (Math.PI * m) / (2 * n);
    const q: Complex = { re: -Math.cos(th) * (bw / 2), im: -Math.sin(th) * (bw / 2) };
    const q2 = cMul(q, q);
    const s = cSqrt({ re: q2.re - wo2, im: q2.im });
    analog.push({ re: q.re + s.re, im: q.im + s.im });
    minus.push({ re: q.re - s.re, im: q.im - s.im });
  }
  analog.push(...minus);

  // Bilinear transform z = (4 + s)/(4 - s); the n zeros at s = 0 go to z = 1, the n at infinity to z = -1.
  // Gain: k = bw^n * 4^n / prod(4 - p).
  let prod: Complex = { re: 1, im: 0 };
  const digital: Complex[] = [];
  for (const p of analog) {
    const den: Complex = { re: 4 - p.re, im: -p.im };
    prod = cMul(prod, den);
    digital.push(cDiv({ re: 4 + p.re, im: p.im }, den));
  }
  const gain = cDiv({ re: Math.pow(bw, n) * Math.pow(4, n), im: 0 }, prod).re;

  // One entry per conjugate pair (positive imaginary part) then the real poles; sorted as SciPy does
  // (complex by real part then |imag|, reals ascending), which fixes the tie-breaking below.
  const cplx: Root[] = [];
  const reals: Root[] = [];
  for (const p of digital) {
    const mag = Math.hypot(p.re, p.im);
    if (Math.abs(p.im) <= REAL_TOL * mag) reals.push({ re: p.re, im: 0, real: true });
    else if (p.im > 0) cplx.push({ re: p.re, im: p.im, real: false });
  }
  cplx.sort((a, b) => a.re - b.re || Math.abs(a.im) - Math.abs(b.im));
  reals.sort((a, b) => a.re - b.re);
  const poles: Root[] = [...cplx, ...reals];
  // Zeros: n at -1, n at +1 (all real, ascending).
  const zeros: number[] = [];
  for (let i = 0; i < n; i++) zeros.push(-1);
  for (let i = 0; i < n; i++) zeros.push(1);

  const sos = new Float64Array(6 * n);
  const worstIndex = (list: Root[], onlyReal: boolean): number => {
    let best = -1;
    let bestD = Infinity;
    for (let i = 0; i < list.length; i++) {
      if (onlyReal && !list[i].real) continue;
      const d = Math.abs(1 - Math.hypot(list[i].re, list[i].im));
      if (d < bestD) {
        bestD = d;
        best = i;
      }
    }
    return best;
  };
  const nearestZeroIndex = (p: Root): number => {
    let best = -1;
    let bestD = Infinity;
    for (let i = 0; i < zeros.length; i++) {
      const d = Math.hypot(zeros[i] - p.re, p.im);
      if (d < bestD) {
        bestD = d;
        best = i;
      }
    }
    return best;
  };

  // Sections from last to first: the pole closest to the unit circle goes last.
  for (let si = n - 1; si >= 0; si--) {
    const p1 = poles.splice(worstIndex(poles, false), 1)[0];
    const row = 6 * si;
    const remainingReal = poles.some((p) => p.real);
    if (p1.real && !remainingReal) {
      // Lone real pole: first-order section with its nearest zero (not reached for band-pass designs).
      const z1 = zeros.splice(nearestZeroIndex(p1), 1)[0];
      sos.set([1, -z1, 0, 1, -p1.re, 0], row);
      continue;
    }
    let a1: number;
    let a2: number;
    if (p1.real) {
      const p2 = poles.splice(worstIndex(poles, true), 1)[0];
      a1 = -(p1.re + p2.re);
      a2 = p1.re * p2.re;
    } else {
      a1 = -(p1.re + p1.re);
      a2 = p1.re * p1.re + p1.im * p1.im;
    }
    const z1 = zeros.splice(nearestZeroIndex(p1), 1)[0];
    const z2 = zeros.splice(nearestZeroIndex(p1), 1)[0];
    sos.set([1, -(z1 + z2), z1 * z2, 1, a1, a2], row);
  }
  sos[0] *= gain;
  sos[1] *= gain;
  sos[2] *= gain;
  return sos;
}

/** Complex frequency response of an SOS cascade at fHz for sample rate fsHz (H(e^{i w}), w = 2 pi f / fs). */
export function sosResponse(sos: Float64Array, fHz: number, sampleRateHz: number): { re: number; im: number } {
  const w = (2 * Math.PI * fHz) / sampleRateHz;
  // z^-1 and z^-2 on the unit circle.
  const c1 = Math.cos(w);
  const s1 = -Math.sin(w);
  const c2 = Math.cos(2 * w);
  const s2 = -Math.sin(2 * w);
  let h: Complex = { re: 1, im: 0 };
  for (let r = 0; r < sos.length; r += 6) {
    const num: Complex = { re: sos[r] + sos[r + 1] * c1 + sos[r + 2] * c2, im: sos[r + 1] * s1 + sos[r + 2] * s2 };
    const den: Complex = { re: sos[r + 3] + sos[r + 4] * c1 + sos[r + 5] * c2, im: sos[r + 4] * s1 + sos[r + 5] * s2 };
    h = cMul(h, cDiv(num, den));
  }
  return h;
}

/** |H| of an SOS cascade at fHz. */
export function sosGain(sos: Float64Array, fHz: number, sampleRateHz: number): number {
  const h = sosResponse(sos, fHz, sampleRateHz);
  return Math.hypot(h.re, h.im);
}

// ---------------------------------------------------------------- filtering

function sectionCount(sos: Float64Array): number {
  if (sos.length === 0 || sos.length % 6 !== 0) {
    throw new BorewaveError(
      'FILTER_SOS',
      `SOS array holds ${sos.length} values, not a positive multiple of 6.`,
      undefined,
      'sos',
    );
  }
  for (let r = 0; r < sos.length; r += 6) {
    if (sos[r + 3] !== 1) {
      throw new BorewaveError(
        'FILTER_SOS',
        `SOS section ${r / 6} has a0 = ${sos[r + 3]}; sections must be normalised to a0 = 1.`,
        undefined,
        'sos',
      );
    }
  }
  return sos.length / 6;
}

/**
 * Run the cascade in place over buf[from..to) (forward) or buf[to-1..from] (backward), direct form II
 * transposed, with initial state zi * scale (zi: 2 values a section; null = zero state).
 */
function cascadeInPlace(
  sos: Float64Array,
  buf: Float64Array,
  zi: Float64Array | null,
  scale: number,
  backward: boolean,
): void {
  const nSec = sos.length / 6;
  const state = new Float64Array(2 * nSec);
  if (zi) for (let i = 0; i < state.length; i++) state[i] = zi[i] * scale;
  const n = buf.length;
  const step = backward ? -1 : 1;
  let i = backward ? n - 1 : 0;
  for (let c = 0; c < n; c++, i += step) {
    let v = buf[i];
    for (let s = 0, r = 0; s < nSec; s++, r += 6) {
      const y = sos[r] * v + state[2 * s];
      state[2 * s] = sos[r + 1] * v - sos[r + 4] * y + state[2 * s + 1];
      state[2 * s + 1] = sos[r + 2] * v - sos[r + 5] * y;
      v = y;
    }
    buf[i] = v;
  }
}

/** One forward pass of the cascade with zero initial state (as scipy.signal.sosfilt). */
export function sosFilter(sos: Float64Array, x: ArrayLike<number>): Float64Array {
  sectionCount(sos);
  const y = Float64Array.from(x);
  cascadeInPlace(sos, y, null, 1, false);
  return y;
}

/**
 * Initial state of each section for a steady unit-step input (as scipy.signal.sosfilt_zi): the state
 * of a DF-II-transposed section in steady state is z1 = b1 + b2 - (a1 + a2) G, z2 = b2 - a2 G with
 * G = sum(b)/sum(a) its DC gain; each section sees the DC gain of the sections before it.
 */
export function sosSteadyState(sos: Float64Array): Float64Array {
  const nSec = sectionCount(sos);
  const zi = new Float64Array(2 * nSec);
  let scale = 1;
  for (let s = 0, r = 0; s < nSec; s++, r += 6) {
    const [b0, b1, b2, a0, a1, a2] = [sos[r], sos[r + 1], sos[r + 2], sos[r + 3], sos[r + 4], sos[r + 5]];
    const g = (b0 + b1 + b2) / (a0 + a1 + a2);
    zi[2 * s] = scale * (b1 + b2 - (a1 + a2) * g);
    zi[2 * s + 1] = scale * (b2 - a2 * g);
    scale *= g;
  }
  return zi;
}

/**
 * Edge length of the odd extension used by the zero-phase filter, as SciPy's default:
 * 3 * (2 * nSections + 1 - min(#sections with b2 = 0, #sections with a2 = 0)).
 */
export function filtFiltPadLength(sos: Float64Array): number {
  const nSec = sectionCount(sos);
  let b2Zero = 0;
  let a2Zero = 0;
  for (let r = 0; r < sos.length; r += 6) {
    if (sos[r + 2] === 0) b2Zero++;
    if (sos[r + 5] === 0) a2Zero++;
  }
  return 3 * (2 * nSec + 1 - Math.min(b2Zero, a2Zero));
}

/**
 * Zero-phase forward-backward filtering (as scipy.signal.sosfiltfilt with its defaults): odd
 * extension of padLength samples at each end (2 x[0] - x[pad..1], ...), forward pass started from the
 * steady state for the first extended sample, backward pass started from the steady state for the
 * last forward output, extension removed. The magnitude response is |H|^2, the phase zero.
 * Throws BorewaveError when the trace is not longer than the extension.
 */
export function sosFiltFilt(sos: Float64Array, x: ArrayLike<number>): Float64Array {
  const edge = filtFiltPadLength(sos);
  const n = x.length;
  if (n <= edge) {
    throw new BorewaveError(
      'SIGNAL_TOO_SHORT',
      `Trace of ${n} samples is too short for zero-phase filtering with this band-pass (needs more than ${edge}).`,
      undefined,
      'samples',
    );
  }
  const ext = new Float64Array(n + 2 * edge);
  const x0 = x[0];
  const xl = x[n - 1];
  for (let i = 0; i < edge; i++) ext[i] = 2 * x0 - x[edge - i];
  for (let i = 0; i < n; i++) ext[edge + i] = x[i];
  for (let i = 0; i < edge; i++) ext[edge + n + i] = 2 * xl - x[n - 2 - i];
  const zi = sosSteadyState(sos);
  cascadeInPlace(sos, ext, zi, ext[0], false);
  cascadeInPlace(sos, ext, zi, ext[ext.length - 1], true);
  return ext.slice(edge, edge + n);
}

// ---------------------------------------------------------------- trend and taper

/** x minus its least-squares straight line (as scipy.signal.detrend(type='linear')). */
export function removeTrend(x: ArrayLike<number>): Float64Array {
  const n = x.length;
  const out = new Float64Array(n);
  if (n === 0) return out;
  const tMean = (n - 1) / 2;
  let xMean = 0;
  for (let i = 0; i < n; i++) xMean += x[i];
  xMean /= n;
  let stx = 0;
  let stt = 0;
  for (let i = 0; i < n; i++) {
    const t = i - tMean;
    stx += t * (x[i] - xMean);
    stt += t * t;
  }
  const slope = stt > 0 ? stx / stt : 0;
  for (let i = 0; i < n; i++) out[i] = x[i] - xMean - slope * (i - tMean);
  return out;
}

/**
 * Cosine (Tukey) taper: the first and last `fraction` of the trace (fraction of (n-1) sample
 * intervals at EACH end, 0..0.5) are weighted by 0.5 (1 - cos(pi j / m)), j samples from the end,
 * m = fraction (n-1); the middle is left as it is. fraction 0.5 is a Hann window. Equal to
 * x * scipy.signal.windows.tukey(n, alpha = 2 * fraction). Returns a new array.
 */
export function cosineTaper(x: Float64Array, fraction: number): Float64Array {
  if (!(fraction >= 0 && fraction <= 0.5)) {
    throw new BorewaveError(
      'TAPER_FRACTION',
      `Taper fraction ${fraction} must be between 0 and 0.5 (share of each end).`,
      undefined,
      'taperFraction',
    );
  }
  const out = Float64Array.from(x);
  const n = out.length;
  const m = fraction * (n - 1);
  if (m <= 0) return out;
  const last = Math.floor(m);
  for (let j = 0; j <= last; j++) {
    const w = 0.5 * (1 - Math.cos((Math.PI * j) / m));
    out[j] = x[j] * w;
    out[n - 1 - j] = x[n - 1 - j] * w;
  }
  return out;
}
