import { describe, expect, it } from 'vitest';
import { snapTimeS } from '../../src/core/picking/snap';
import type { WorkingTrace } from '../../src/core/model';
import { stationKey } from '../../src/core/keys';

// A Ricker wavelet centred at t0 (closed form): peak at t0, zero crossings at t0 +- 1/(pi f sqrt 2),
// troughs at t0 +- sqrt(1.5)/(pi f).
const f = 100;
const dt = 2e-5;
const t0 = 0.04;
const samples = Float64Array.from({ length: 4000 }, (_, i) => {
  const a = (Math.PI * f * (i * dt - t0)) ** 2;
  return (1 - 2 * a) * Math.exp(-a);
});
const trace: WorkingTrace = {
  stationKey: stationKey('r0', 1, 'H1'),
  wave: 'S',
  samples,
  sampleIntervalS: dt,
  delayS: 0,
  searchStartS: 0,
  searchEndS: 0.08,
};

describe('snap to the nearest characteristic point (Ricker wavelet, closed-form feature times)', () => {
  it('peak: a pointer 0.4 ms off lands on t0 within 0.01 ms', () => {
    expect(Math.abs(snapTimeS(trace, 'peak', t0 + 0.0004) - t0)).toBeLessThan(1e-5);
  });
  it('zero crossing after the peak: lands on t0 + 1/(pi f sqrt 2)', () => {
    const zc = t0 + 1 / (Math.PI * f * Math.SQRT2);
    expect(Math.abs(snapTimeS(trace, 'zero-crossing', zc - 0.0003) - zc)).toBeLessThan(2e-5);
  });
  it('far from any feature the pointer time is kept', () => {
    expect(snapTimeS(trace, 'peak', 0.075)).toBe(0.075);
  });
});
