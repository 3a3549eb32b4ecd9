import { describe, expect, it } from 'vitest';
import { lobePeriodS } from '../../src/core/picking/autopick';

describe('dominant period from the main lobe (zero crossings around the largest |x|)', () => {
  it('a 125 Hz sine gives 8 ms (analytic: zero crossings half a period apart)', () => {
    const dt = 1e-5;
    const x = Float64Array.from(
      { length: 4000 },
      (_, i) => Math.sin(2 * Math.PI * 125 * i * dt + 0.3) * (1 + 0.2 * Math.sin(i / 900)),
    );
    expect(lobePeriodS(x, 0, 4000, dt)!).toBeCloseTo(0.008, 5);
  });
  it('a Ricker wavelet gives 4/(pi f sqrt 2): its main-lobe zero crossings sit at +-1/(pi f sqrt 2) (closed form)', () => {
    const f = 80;
    const dt = 2e-5;
    const t0 = 0.05;
    const x = Float64Array.from({ length: 5000 }, (_, i) => {
      const a = (Math.PI * f * (i * dt - t0)) ** 2;
      return (1 - 2 * a) * Math.exp(-a);
    });
    expect(lobePeriodS(x, 0, 5000, dt)!).toBeCloseTo(4 / (Math.PI * f * Math.SQRT2), 6);
  });
  it('no closed lobe (a ramp) gives null', () => {
    expect(
      lobePeriodS(
        Float64Array.from({ length: 100 }, (_, i) => i + 1),
        0,
        100,
        1e-4,
      ),
    ).toBeNull();
  });
});

import { pairDelays } from '../../src/core/picking/autopick';
import type { WorkingTrace } from '../../src/core/model';
import { intervalKey, stationKey, type StationKey } from '../../src/core/keys';

describe('pair delay with bounds narrower than one sample (very short path difference)', () => {
  it('still searches one sample either side instead of failing', () => {
    const dt = 5e-5;
    const A = stationKey('r0', 1, 'H1');
    const B = stationKey('r0', 2, 'H1');
    const pulse = (t0: number) =>
      Float64Array.from({ length: 2048 }, (_, i) => {
        const a = (Math.PI * 100 * (i * dt - t0)) ** 2;
        return (1 - 2 * a) * Math.exp(-a);
      });
    const mk = (key: StationKey, t0: number): WorkingTrace => ({
      stationKey: key,
      wave: 'S',
      samples: pulse(t0),
      sampleIntervalS: dt,
      delayS: 0,
      searchStartS: 0.005,
      searchEndS: 0.09,
    });
    const [d] = pairDelays(
      mk(A, 0.03),
      mk(B, 0.03001),
      { pairKey: intervalKey('S', A, B), wave: 'S', a: A, b: B, minDelayS: 0.000012, maxDelayS: 0.00003 },
      { onsetMethod: 'aic', staS: 0.001, ltaS: 0.01, staLtaThreshold: 4, phaseBandHz: null },
    );
    // true delay 0.01 ms = 0.2 sample (analytic shift)
    expect(Math.abs(d.delayS - 1e-5)).toBeLessThan(0.2 * dt);
  });
});
