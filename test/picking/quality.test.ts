import { describe, expect, it } from 'vitest';
import { correlationDelay } from '../../src/core/picking/delay';
import { characteristicPoints } from '../../src/core/picking/features';
import { delayUncertaintyS, pickUncertaintyS, signalToNoise, SNR_CAP } from '../../src/core/picking/quality';
import { butterworthBandpassSos, cosineTaper, sosFiltFilt } from '../../src/core/signal/filter';
import { gaussianNoise, rickerTrace } from './helpers';

describe('signalToNoise', () => {
  it('is RMS after / RMS before the onset: +-1 noise then +-3 signal -> 3 (definition)', () => {
    const x = Array.from({ length: 200 }, (_, i) => (i % 2 ? 1 : -1) * (i < 100 ? 1 : 3));
    expect(signalToNoise(x, 100, 50)).toBeCloseTo(3, 12);
  });
  it('clips windows to the trace; no noise samples -> 0, exactly quiet noise -> SNR_CAP', () => {
    const x = Array.from({ length: 100 }, (_, i) => (i < 50 ? 0 : 1));
    expect(signalToNoise(x, 0, 20)).toBe(0);
    expect(signalToNoise(x, 50, 20)).toBe(SNR_CAP);
    expect(signalToNoise([1, 1, 2, 2], 2, 10)).toBeCloseTo(2, 12);
  });
});

describe('pickUncertaintyS', () => {
  it('worked value: SNR 10, dt 0.1 ms, T 10 ms -> sqrt((T/(2 pi 10))^2 + dt^2/12) = 0.16175 ms (the stated rule)', () => {
    expect(pickUncertaintyS(10, 1e-4, 0.01)).toBeCloseTo(1.6175e-4, 8);
  });
  it('is half a period for SNR <= 0 or a very weak pulse, and dt/sqrt(12) for a noise-free one', () => {
    expect(pickUncertaintyS(0, 1e-4, 0.01)).toBe(0.005);
    expect(pickUncertaintyS(0.01, 1e-4, 0.01)).toBe(0.005);
    expect(pickUncertaintyS(Infinity, 1e-4, 0.01)).toBeCloseTo(1e-4 / Math.sqrt(12), 15);
  });
  it('matches the scatter of zero-crossing picks in noise: observed std within 0.5-1.1 of T/(2 pi SNR) (first-order error propagation)', () => {
    // Sinusoid of amplitude 1 (50 samples a period) plus white noise sigma = 1/SNR, crossing placed at
    // random sub-sample positions. Linear interpolation between two noisy samples spreads the crossing by
    // between sqrt(0.5) and 1 times sigma / slope, so the observed std is 0.7-1.0 of the rule's noise term.
    const snr = 20;
    const periodSamples = 50;
    const times: number[] = [];
    for (let trial = 0; trial < 300; trial++) {
      const phase = (trial * 0.377) % 1; // sub-sample offset of the crossing
      const noise = gaussianNoise(200, 1 / snr, 500 + trial);
      const x = Array.from(
        { length: 200 },
        (_, i) => Math.sin((2 * Math.PI * (i - 50 - phase)) / periodSamples) + noise[i],
      );
      const cp = characteristicPoints(x, 50, 1, 0, { searchS: periodSamples });
      times.push(cp.zeroCrossingS! - (75 + phase)); // crossing after the first peak: half a period after the start
    }
    const mean = times.reduce((s, v) => s + v, 0) / times.length;
    const std = Math.sqrt(times.reduce((s, v) => s + (v - mean) ** 2, 0) / times.length);
    const rule = periodSamples / (2 * Math.PI * snr);
    expect(std / rule).toBeGreaterThan(0.5);
    expect(std / rule).toBeLessThan(1.1);
  });
});

describe('delayUncertaintyS', () => {
  it('worked value: rho 0.99, dt 0.1 ms, T 5 ms, B 200 Hz, window 12.5 ms -> 0.04898 ms (the stated bound)', () => {
    // beta^2 = (2 pi)^2 (200^2 + 200^2/12); n = 2 * 200 * 0.0125 = 5; snr = 0.9801/0.0199.
    const beta2 = (2 * Math.PI) ** 2 * (200 ** 2 + 200 ** 2 / 12);
    const want = Math.sqrt(1 / (beta2 * 5 * (0.9801 / 0.0199)) + 0.05e-4 ** 2);
    expect(delayUncertaintyS(0.99, 1e-4, 0.005, 200, 0.0125)).toBeCloseTo(want, 12);
    expect(want).toBeCloseTo(4.898e-5, 8);
  });
  it('falls as rho rises, is half a period for rho <= 0 and 0.05 sample for rho = 1', () => {
    const u = [0.5, 0.8, 0.95, 0.999].map((r) => delayUncertaintyS(r, 1e-4, 0.005, 200));
    for (let i = 1; i < u.length; i++) expect(u[i]).toBeLessThan(u[i - 1]);
    expect(delayUncertaintyS(-0.2, 1e-4, 0.005, 200)).toBe(0.0025);
    expect(delayUncertaintyS(1, 1e-4, 0.005, 200)).toBeCloseTo(0.05e-4, 15);
  });
  it('agrees with Monte-Carlo scatter of correlation delays in band-limited noise (observed / bound within 0.8-1.5)', () => {
    // Ricker 200 Hz (T = 5 ms), dt 0.1 ms, windows of 2.5 T tapered 20% as in the auto-picker, noise
    // band-passed 100-400 Hz and independent on a and b, 150 trials per level. A Cramer-Rao bound is a
    // lower bound for an unbiased estimator; the correlation peak comes close to it at high SNR.
    const dt = 1e-4;
    const f = 200;
    const periodS = 1 / f;
    const len = Math.round((2.5 * periodS) / dt);
    const n = 1024;
    const sos = butterworthBandpassSos(4, 100, 400, 1 / dt);
    // Ricker centred at sample 400; its onset is about one period (50 samples) earlier, and the window
    // starts half a period before the onset: sample 325.
    const start = 325;
    for (const sigma of [0.05, 0.2]) {
      const delays: number[] = [];
      const rhos: number[] = [];
      for (let s = 1; s <= 150; s++) {
        const shift = 3 + (s % 10) / 10;
        const na = sosFiltFilt(sos, gaussianNoise(n, 1, 7000 + 2 * s));
        const nb = sosFiltFilt(sos, gaussianNoise(n, 1, 7001 + 2 * s));
        const rmsA = Math.sqrt(na.reduce((acc, v) => acc + v * v, 0) / n);
        const rmsB = Math.sqrt(nb.reduce((acc, v) => acc + v * v, 0) / n);
        const a0 = rickerTrace(n, dt, f, 400 * dt);
        const b0 = rickerTrace(n, dt, f, (400 + shift) * dt);
        const a = cosineTaper(
          Float64Array.from({ length: len }, (_, i) => a0[start + i] + (sigma * na[start + i]) / rmsA),
          0.2,
        );
        const b = cosineTaper(
          Float64Array.from({ length: len }, (_, i) => b0[start + i] + (sigma * nb[start + i]) / rmsB),
          0.2,
        );
        const r = correlationDelay(a, b, dt, { minDelayS: -0.002, maxDelayS: 0.002 });
        delays.push(r.delayS - shift * dt);
        rhos.push(r.coefficient);
      }
      const mean = delays.reduce((acc, v) => acc + v, 0) / delays.length;
      const std = Math.sqrt(delays.reduce((acc, v) => acc + (v - mean) ** 2, 0) / delays.length);
      const rho = rhos.reduce((acc, v) => acc + v, 0) / rhos.length;
      const bound = delayUncertaintyS(rho, dt, periodS, f, len * dt);
      expect(std / bound).toBeGreaterThan(0.8);
      expect(std / bound).toBeLessThan(1.5);
    }
  });
});
