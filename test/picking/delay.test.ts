import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { correlationDelay, crossCorrelate, phaseSlopeDelay } from '../../src/core/picking/delay';
import { parabolicOffset } from '../../src/core/picking/parabola';
import { BorewaveError } from '../../src/core/errors';
import corr from '../reference/correlate.json';
import { dftShift, gaussianNoise, rickerTrace, rms } from './helpers';

/** Direct O(n^2) sum r(k) = sum_n a(n) b(n+k) (definition in the domain notes section 3). */
function directCorrelation(a: ArrayLike<number>, b: ArrayLike<number>, k: number): number {
  let s = 0;
  for (let n = 0; n < a.length; n++) {
    const j = n + k;
    if (j >= 0 && j < b.length) s += a[n] * b[j];
  }
  return s;
}

describe('parabolic refinement', () => {
  it('r = (0.8, 1.0, 0.9) -> +0.1667 samples (domain notes section 3, calculated check)', () => {
    expect(parabolicOffset(0.8, 1.0, 0.9)).toBeCloseTo(1 / 6, 4);
  });
  it('symmetric neighbours give 0; the offset is clamped to +-0.5', () => {
    expect(parabolicOffset(0.5, 1, 0.5)).toBe(0);
    expect(parabolicOffset(0, 1, 1)).toBe(0.5);
  });
});

describe('crossCorrelate', () => {
  it('equals the direct O(n^2) sum at every lag, to 1e-12 of the peak (definition)', () => {
    const a = gaussianNoise(37, 1, 1);
    const b = gaussianNoise(90, 1, 2);
    const { lags, r } = crossCorrelate(a, b);
    expect(lags.length).toBe(37 + 90 - 1);
    expect(lags[0]).toBe(-36);
    expect(lags[lags.length - 1]).toBe(89);
    const scale = Math.max(...r.map(Math.abs));
    for (let j = 0; j < r.length; j++)
      expect(Math.abs(r[j] - directCorrelation(a, b, lags[j]))).toBeLessThan(1e-12 * scale);
  });

  it('equals the direct sum for random lengths 1-40 and values (property, 200 cases)', () => {
    const arr = fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 1, maxLength: 40 });
    fc.assert(
      fc.property(arr, arr, (a, b) => {
        const { lags, r } = crossCorrelate(a, b);
        const scale =
          Math.max(1e-300, ...a.map(Math.abs)) * Math.max(1e-300, ...b.map(Math.abs)) * Math.min(a.length, b.length);
        for (let j = 0; j < r.length; j++) {
          if (Math.abs(r[j] - directCorrelation(a, b, lags[j])) > 1e-12 * scale) return false;
        }
        return true;
      }),
      { numRuns: 200, seed: 17 },
    );
  });

  for (const [i, c] of corr.cases.entries()) {
    it(`case ${i + 1} (${c.a.length} x ${c.b.length}) equals SciPy ${corr.source.scipy} correlate(b, a, 'full', method='fft') to 1e-9 relative`, () => {
      const { lags, r } = crossCorrelate(c.a, c.b);
      expect(Array.from(lags)).toEqual(c.lags);
      const scale = Math.max(...c.r.map(Math.abs));
      for (let j = 0; j < r.length; j++) expect(Math.abs(r[j] - c.r[j])).toBeLessThan(1e-9 * scale);
    });
  }
});

describe('correlationDelay', () => {
  // Band-limited pulse: Ricker 400 Hz at dt = 0.1 ms (25 samples a period), shifted by a direct-DFT
  // phase ramp (exact fractional delay for a band-limited signal).
  const dt = 1e-4;
  const a = rickerTrace(512, dt, 400, 150 * dt);
  const shifts = [0, 1, 7, -3, 0.25, 0.5, 3.3, -2.7, 10.75, 20.1];

  it('recovers integer and fractional shifts to better than 0.05 sample RMS on a clean pulse (analytic shift)', () => {
    const errors: number[] = [];
    for (const sh of shifts) {
      const r = correlationDelay(a, dftShift(a, sh), dt, { minDelayS: -40 * dt, maxDelayS: 40 * dt });
      errors.push(r.delayS / dt - sh);
      expect(r.coefficient).toBeGreaterThan(0.999);
      expect(r.atBound).toBe(false);
    }
    expect(rms(errors)).toBeLessThan(0.05);
  });

  it('at 10 samples a period (parabolic bias largest) still within 0.05 sample RMS', () => {
    const dtCoarse = 2.5e-4;
    const c = rickerTrace(512, dtCoarse, 400, 150 * dtCoarse);
    const errors = shifts.map(
      (sh) =>
        correlationDelay(c, dftShift(c, sh), dtCoarse, { minDelayS: -0.01, maxDelayS: 0.01 }).delayS / dtCoarse - sh,
    );
    expect(rms(errors)).toBeLessThan(0.05);
  });

  it('with noise (SNR 10 on b) the error stays within a tenth of a period over 20 realisations (common practice bound)', () => {
    const errors: number[] = [];
    for (let seed = 1; seed <= 20; seed++) {
      const noise = gaussianNoise(512, 0.1, seed);
      const b = dftShift(a, 4.4).map((v, i) => v + noise[i]);
      errors.push(correlationDelay(a, b, dt, { minDelayS: -0.004, maxDelayS: 0.004 }).delayS / dt - 4.4);
    }
    expect(Math.max(...errors.map(Math.abs))).toBeLessThan(2.5);
  });

  it('coefficient is 1 for identical windows; for a polarity flip it is the largest positive normalised sum (direct check)', () => {
    expect(correlationDelay(a, a, dt, { minDelayS: -0.001, maxDelayS: 0.001 }).coefficient).toBeCloseTo(1, 9);
    const flipped = a.map((v) => -v);
    const r = correlationDelay(a, flipped, dt, { minDelayS: -0.001, maxDelayS: 0.001 });
    let energy = 0;
    for (const v of a) energy += v * v;
    let best = -Infinity;
    for (let k = -10; k <= 10; k++) best = Math.max(best, directCorrelation(a, flipped, k) / energy);
    // Parabolic vertex may exceed the best sample slightly: 1e-2 tolerance.
    expect(Math.abs(r.coefficient - best)).toBeLessThan(1e-2);
    expect(r.coefficient).toBeLessThan(0.7);
    expect(r.delayS).not.toBe(0);
  });

  it('bounds the lag search (cycle-skip guard) and reports a peak on the bound', () => {
    const b = dftShift(a, 7);
    const r = correlationDelay(a, b, dt, { minDelayS: -5 * dt, maxDelayS: 5 * dt });
    expect(r.atBound).toBe(true);
    expect(r.delayS).toBeCloseTo(5 * dt, 12);
  });

  it('throws BorewaveError on an all-zero window or bounds that leave no lag', () => {
    expect(() => correlationDelay(new Float64Array(10), a, dt, { minDelayS: -1, maxDelayS: 1 })).toThrow(BorewaveError);
    expect(() => correlationDelay(a, a, dt, { minDelayS: 1, maxDelayS: 2 })).toThrow(/no lag/);
  });
});

describe('phaseSlopeDelay', () => {
  const dt = 1e-4;
  const a = rickerTrace(512, dt, 400, 150 * dt);

  it('recovers fractional shifts of a band-limited pulse to 1e-6 sample over 160-800 Hz (analytic: phase = -2 pi f tau)', () => {
    for (const sh of [0.3, 2.5, -6.2, 11.9]) {
      const r = phaseSlopeDelay(a, dftShift(a, sh), dt, { minHz: 160, maxHz: 800 });
      expect(r).not.toBeNull();
      expect(Math.abs(r!.delayS / dt - sh)).toBeLessThan(1e-6);
      expect(r!.coherence).toBeGreaterThan(0.99);
      expect(r!.usedHz[0]).toBeGreaterThanOrEqual(160);
      expect(r!.usedHz[1]).toBeLessThanOrEqual(800);
    }
  });

  it('a starting delay (nearDelayS) within a sample gives the same answer', () => {
    const b = dftShift(a, 5.6);
    const r = phaseSlopeDelay(a, b, dt, { minHz: 160, maxHz: 800, nearDelayS: 5.2 * dt });
    expect(Math.abs(r!.delayS / dt - 5.6)).toBeLessThan(1e-6);
  });

  it('with noise the delay stays within 0.2 sample and coherence drops below 1 (SNR 10)', () => {
    const noise = gaussianNoise(512, 0.1, 9);
    const b = dftShift(a, 3.7).map((v, i) => v + noise[i]);
    const r = phaseSlopeDelay(a, b, dt, { minHz: 200, maxHz: 700 })!;
    expect(Math.abs(r.delayS / dt - 3.7)).toBeLessThan(0.2);
    expect(r.coherence).toBeLessThan(1);
  });

  it('returns null when fewer than three bins fall in the band', () => {
    expect(phaseSlopeDelay(a, a, dt, { minHz: 400, maxHz: 405 })).toBeNull();
  });
});
