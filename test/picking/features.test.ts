import { describe, expect, it } from 'vitest';
import { characteristicPoints, dominantPeriodS, spectrumSummary } from '../../src/core/picking/features';
import { BorewaveError } from '../../src/core/errors';
import { rickerTrace } from './helpers';

// Ricker wavelet r(t) = (1 - 2 pi^2 f^2 t^2) exp(-pi^2 f^2 t^2), t from its centre (closed form):
// peak at 0, zero crossings at +-1/(pi f sqrt 2), side-lobe troughs at +-sqrt(1.5)/(pi f) of depth
// -2 exp(-1.5) = -0.446, amplitude spectrum peak at f.
const f = 120;
const dt = 1e-4;
const delayS = -0.005; // 5 ms pre-trigger: t_i = delayS + i dt
const centreS = 0.04321; // off the sample grid on purpose
const n = 2000;
const trace = rickerTrace(n, dt, f, centreS - delayS); // sample time i*dt + delayS, centre at centreS after trigger
const zeroOffsetS = 1 / (Math.PI * f * Math.SQRT2);
const lobeOffsetS = Math.sqrt(1.5) / (Math.PI * f);
const onsetIdx = Math.round((centreS - 1.5 / f - delayS) / dt); // well before the pulse

describe('characteristicPoints on a Ricker wavelet (closed form)', () => {
  it('default threshold 0.5 skips the side lobes: first peak at the centre, zero crossing at centre + 1/(pi f sqrt 2), no trough', () => {
    const cp = characteristicPoints(trace, onsetIdx, dt, delayS, { searchS: 3 / f });
    expect(cp.firstPolarity).toBe(1);
    // Tolerances: parabolic and linear interpolation errors at 83 samples a period are below 0.01 sample.
    expect(Math.abs(cp.peakS! - centreS)).toBeLessThan(0.01 * dt);
    expect(Math.abs(cp.zeroCrossingS! - (centreS + zeroOffsetS))).toBeLessThan(0.01 * dt);
    expect(cp.troughS).toBeNull();
  });

  it('threshold 0.4 takes the leading side lobe (-0.446) as the first extremum: trough first, polarity -1, zero crossing at centre - 1/(pi f sqrt 2)', () => {
    const cp = characteristicPoints(trace, onsetIdx, dt, delayS, { searchS: 3 / f, minFraction: 0.4 });
    expect(cp.firstPolarity).toBe(-1);
    // The side lobe is broad and lopsided, so the wide least-squares parabola (+-1/5 of its half-height
    // width) is biased by its cubic term: tolerance 0.3 sample (measured 0.25).
    expect(Math.abs(cp.troughS! - (centreS - lobeOffsetS))).toBeLessThan(0.3 * dt);
    expect(Math.abs(cp.zeroCrossingS! - (centreS - zeroOffsetS))).toBeLessThan(0.01 * dt);
    expect(Math.abs(cp.peakS! - centreS)).toBeLessThan(0.01 * dt);
  });

  it('an inverted Ricker gives trough first (polarity -1) and the zero crossing after that trough', () => {
    const inverted = trace.map((v) => -v);
    const cp = characteristicPoints(inverted, onsetIdx, dt, delayS, { searchS: 3 / f });
    expect(cp.firstPolarity).toBe(-1);
    expect(Math.abs(cp.troughS! - centreS)).toBeLessThan(0.01 * dt);
    expect(Math.abs(cp.zeroCrossingS! - (centreS + zeroOffsetS))).toBeLessThan(0.01 * dt);
  });

  it('at 10 samples a period the zero crossing is still within 0.05 sample (linear interpolation near an inflection)', () => {
    const dtCoarse = 1 / (10 * f);
    const coarse = rickerTrace(400, dtCoarse, f, centreS);
    const cp = characteristicPoints(coarse, Math.round((centreS - 1.5 / f) / dtCoarse), dtCoarse, 0, {
      searchS: 3 / f,
    });
    expect(Math.abs(cp.zeroCrossingS! - (centreS + zeroOffsetS))).toBeLessThan(0.05 * dtCoarse);
  });

  it('default search window (1.5 dominant periods) finds the same peak', () => {
    const cp = characteristicPoints(trace, Math.round((centreS - 0.5 / f - delayS) / dt), dt, delayS);
    expect(Math.abs(cp.peakS! - centreS)).toBeLessThan(0.01 * dt);
  });

  it('a quiet window gives no features; an onset index outside the trace throws BorewaveError', () => {
    const cp = characteristicPoints(new Float64Array(100), 10, dt, 0, { searchS: 0.002 });
    expect(cp).toEqual({ peakS: null, troughS: null, zeroCrossingS: null, firstPolarity: 1 });
    expect(() => characteristicPoints(trace, n + 5, dt, 0)).toThrow(BorewaveError);
  });
});

describe('dominant period', () => {
  it('of a Ricker is 1 / its peak frequency (spectral peak of f^2 exp(-f^2/fp^2) is at fp), within 2%', () => {
    const periodS = dominantPeriodS(trace, 0, n, dt)!;
    expect(Math.abs(periodS * f - 1)).toBeLessThan(0.02);
  });

  it('of a pure 250 Hz sinusoid is 4 ms within 1%, and its spectrum is narrow (rms width < 10% of the centroid)', () => {
    const x = Array.from({ length: 1024 }, (_, i) => Math.sin(2 * Math.PI * 250 * i * dt));
    expect(Math.abs(dominantPeriodS(x, 0, 1024, dt)! / 0.004 - 1)).toBeLessThan(0.01);
    const s = spectrumSummary(x, 0, 1024, dt)!;
    expect(s.rmsWidthHz / s.centroidHz).toBeLessThan(0.1);
  });

  it('is null for a quiet or too short segment', () => {
    expect(dominantPeriodS(new Float64Array(50), 0, 50, dt)).toBeNull();
    expect(dominantPeriodS(trace, 10, 12, dt)).toBeNull();
  });
});
