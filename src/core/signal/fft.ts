/**
 * Thin wrapper over fft.js (radix-4 FFT). This is the only module that touches fft.js.
 *
 * Layout: a spectrum is interleaved complex, length 2*nfft: [re0, im0, re1, im1, ...], all nfft bins
 * (0 .. nfft-1; bin k is frequency k/(nfft*dt), bins above nfft/2 are the negative frequencies).
 * Sign convention: forward X_k = sum_n x_n e^{-i 2 pi k n / nfft}; inverse divides by nfft, so
 * inverseToReal(realSpectrum(x, n), n) returns x (zero-padded to n).
 *
 * Plans (fft.js objects with their twiddle tables) and work buffers are cached by size, so repeated
 * transforms of one size allocate only their output.
 */
import FFT from 'fft.js';
import { BorewaveError } from '../errors';

interface Plan {
  fft: FFT;
  /** Real input, zero-padded, length nfft. */
  realIn: Float64Array;
  /** Complex scratch, length 2*nfft. */
  complexOut: Float64Array;
}

const plans = new Map<number, Plan>();

/** Smallest power of two >= n (1 for n <= 1). */
export function nextPow2(n: number): number {
  if (!(n > 1)) return 1;
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

/** Cached plan for nfft (a power of two >= 2). */
export function fftPlan(nfft: number): Plan {
  let plan = plans.get(nfft);
  if (plan) return plan;
  if (!Number.isInteger(nfft) || nfft < 2 || nextPow2(nfft) !== nfft) {
    throw new BorewaveError('FFT_SIZE', `FFT size ${nfft} is not a power of two of at least 2.`, undefined, 'nfft');
  }
  plan = { fft: new FFT(nfft), realIn: new Float64Array(nfft), complexOut: new Float64Array(2 * nfft) };
  plans.set(nfft, plan);
  return plan;
}

/**
 * Spectrum of a real sequence into `out` (length 2*nfft), x zero-padded to nfft.
 * `out` must not be shared with the plan's buffers. Throws when x is longer than nfft.
 */
export function realSpectrumInto(x: ArrayLike<number>, nfft: number, out: Float64Array): Float64Array {
  const plan = fftPlan(nfft);
  if (x.length > nfft) {
    throw new BorewaveError(
      'FFT_SIZE',
      `Sequence of ${x.length} samples does not fit an FFT of ${nfft}.`,
      undefined,
      'nfft',
    );
  }
  if (out.length !== 2 * nfft) {
    throw new BorewaveError(
      'FFT_SIZE',
      `Spectrum buffer holds ${out.length} values, expected ${2 * nfft}.`,
      undefined,
      'spectrum',
    );
  }
  const input = plan.realIn;
  const n = x.length;
  for (let i = 0; i < n; i++) input[i] = x[i];
  input.fill(0, n);
  plan.fft.realTransform(out, input);
  plan.fft.completeSpectrum(out);
  return out;
}

/** Full complex spectrum (interleaved, length 2*nfft) of real x zero-padded to nfft. */
export function realSpectrum(x: ArrayLike<number>, nfft: number): Float64Array {
  return realSpectrumInto(x, nfft, new Float64Array(2 * nfft));
}

/**
 * Real part of the inverse transform of a full interleaved spectrum (length 2*nfft) into `out`
 * (length >= nfft). For the spectrum of a real sequence the imaginary part is zero up to rounding.
 */
export function inverseToRealInto(spectrum: Float64Array, nfft: number, out: Float64Array): Float64Array {
  const plan = fftPlan(nfft);
  if (spectrum.length !== 2 * nfft) {
    throw new BorewaveError(
      'FFT_SIZE',
      `Spectrum holds ${spectrum.length} values, expected ${2 * nfft}.`,
      undefined,
      'spectrum',
    );
  }
  if (spectrum === plan.complexOut) {
    throw new BorewaveError('FFT_SIZE', 'Spectrum buffer is the plan scratch buffer.', undefined, 'spectrum');
  }
  const tmp = plan.complexOut;
  plan.fft.inverseTransform(tmp, spectrum);
  for (let i = 0; i < nfft; i++) out[i] = tmp[2 * i];
  return out;
}

/** Real part of the inverse transform of a full interleaved spectrum (length 2*nfft). */
export function inverseToReal(spectrum: Float64Array, nfft: number): Float64Array {
  return inverseToRealInto(spectrum, nfft, new Float64Array(nfft));
}
