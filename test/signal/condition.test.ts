import { describe, expect, it } from 'vitest';
import { conditionTrace } from '../../src/core/signal/condition';
import { butterworthBandpassSos, cosineTaper, removeTrend, sosFiltFilt } from '../../src/core/signal/filter';
import { BorewaveError } from '../../src/core/errors';
import filtering from '../reference/sos-filtering.json';

describe('conditionTrace', () => {
  const x = filtering.input;
  const dt = 1 / 4000;

  it('detrend only equals removeTrend (checked against SciPy detrend in filter.test.ts); nothing set returns an equal copy', () => {
    expect(Array.from(conditionTrace(x, dt, { detrend: true, taperFraction: 0, bandpass: null }))).toEqual(
      Array.from(removeTrend(x)),
    );
    const copy = conditionTrace(x, dt, { detrend: false, taperFraction: 0, bandpass: null });
    expect(Array.from(copy)).toEqual(x);
  });

  it('runs detrend, then taper, then the zero-phase band-pass, in that order (composition of the checked parts)', () => {
    const got = conditionTrace(x, dt, {
      detrend: true,
      taperFraction: 0.05,
      bandpass: { lowHz: 30, highHz: 300, order: 4 },
    });
    const want = sosFiltFilt(butterworthBandpassSos(4, 30, 300, 4000), cosineTaper(removeTrend(x), 0.05));
    expect(Array.from(got)).toEqual(Array.from(want));
  });

  it('the band-pass alone equals SciPy sosfiltfilt on the reference input to 1e-9 relative', () => {
    const ref = filtering.cases.find((c) => c.order === 4 && c.lowHz === 30)!;
    const got = conditionTrace(x, dt, {
      detrend: false,
      taperFraction: 0,
      bandpass: { lowHz: 30, highHz: 300, order: 4 },
    });
    const scale = Math.max(...ref.sosfiltfilt.map(Math.abs));
    for (let i = 0; i < x.length; i++) expect(Math.abs(got[i] - ref.sosfiltfilt[i])).toBeLessThan(1e-9 * scale);
  });

  it('does not modify its input', () => {
    const input = Float64Array.from(x);
    conditionTrace(input, dt, { detrend: true, taperFraction: 0.1, bandpass: { lowHz: 30, highHz: 300, order: 2 } });
    expect(Array.from(input)).toEqual(x);
  });

  it('names the problem: corner above Nyquist, bad sample interval, trace too short', () => {
    expect(() =>
      conditionTrace(x, dt, { detrend: false, taperFraction: 0, bandpass: { lowHz: 30, highHz: 2500, order: 4 } }),
    ).toThrow(/Nyquist/);
    expect(() => conditionTrace(x, 0, { detrend: false, taperFraction: 0, bandpass: null })).toThrow(BorewaveError);
    expect(() =>
      conditionTrace(new Float64Array(20), dt, {
        detrend: false,
        taperFraction: 0,
        bandpass: { lowHz: 30, highHz: 300, order: 4 },
      }),
    ).toThrow(/too short/);
  });
});
