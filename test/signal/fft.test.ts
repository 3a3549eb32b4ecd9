import { describe, expect, it } from 'vitest';
import { inverseToReal, nextPow2, realSpectrum } from '../../src/core/signal/fft';
import { BorewaveError } from '../../src/core/errors';
import { gaussianNoise } from '../picking/helpers';

/** Direct DFT from its definition X_k = sum_n x_n e^{-i 2 pi k n / N} (any DSP text). */
function directDft(x: ArrayLike<number>, n: number): Float64Array {
  const out = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    for (let j = 0; j < x.length; j++) {
      const ph = (-2 * Math.PI * k * j) / n;
      out[2 * k] += x[j] * Math.cos(ph);
      out[2 * k + 1] += x[j] * Math.sin(ph);
    }
  }
  return out;
}

describe('nextPow2', () => {
  it('gives the smallest power of two not below n', () => {
    expect([1, 2, 3, 4, 5, 1000, 1024, 1025, 4097].map(nextPow2)).toEqual([1, 2, 4, 4, 8, 1024, 1024, 2048, 8192]);
  });
});

describe('realSpectrum / inverseToReal', () => {
  it('equals the DFT definition (zero-padded input, all nfft bins, interleaved), to 1e-12 of the largest bin', () => {
    // Source: definition of the DFT with the e^{-i...} forward sign.
    const x = gaussianNoise(45, 1, 11);
    for (const nfft of [64, 128]) {
      const got = realSpectrum(x, nfft);
      const want = directDft(x, nfft);
      const scale = Math.max(...want.map(Math.abs));
      for (let i = 0; i < want.length; i++) expect(Math.abs(got[i] - want[i])).toBeLessThan(1e-12 * scale);
    }
  });

  it('puts a unit cosine of 3 cycles in bins 3 and nfft-3 with value nfft/2 (analytic)', () => {
    const n = 32;
    const x = Array.from({ length: n }, (_, i) => Math.cos((2 * Math.PI * 3 * i) / n));
    const s = realSpectrum(x, n);
    expect(s[2 * 3]).toBeCloseTo(16, 12);
    expect(s[2 * (n - 3)]).toBeCloseTo(16, 12);
    expect(s[2 * 4]).toBeCloseTo(0, 12);
  });

  it('round-trips: inverseToReal(realSpectrum(x)) = x zero-padded, to 1e-12', () => {
    const x = gaussianNoise(100, 2, 5);
    const y = inverseToReal(realSpectrum(x, 256), 256);
    for (let i = 0; i < 256; i++) expect(Math.abs(y[i] - (i < 100 ? x[i] : 0))).toBeLessThan(1e-12);
  });

  it('rejects a size that is not a power of two, and input longer than the size', () => {
    expect(() => realSpectrum([1, 2, 3], 3)).toThrow(BorewaveError);
    expect(() => realSpectrum(new Float64Array(10), 8)).toThrow(/does not fit/);
  });
});
