/**
 * Trace board display helpers: the window fitted to the arrivals, and the display gains.
 * AGC and t-power gain checked against analytic results (RMS of a sine of amplitude A is A/sqrt 2).
 */
import { describe, expect, it } from 'vitest';
import { MIN_MARGIN_S, agc, drawnRange, fittedWindow, pulseWindow, timeVariantGain } from '../../src/ui/traceDisplay';

const rec = (searchStartS: number, searchEndS: number) => ({ startS: 0, endS: 0.2, searchStartS, searchEndS });

describe('time window fitted to the arrivals', () => {
  it('P arrivals at 5–25 ms in a 200 ms record: the window starts at the trigger and ends 20 ms after the last pick', () => {
    const w = fittedWindow([rec(0, 0.2), rec(0, 0.2)], [0.005, 0.012, 0.025]);
    expect(w).not.toBeNull();
    expect(w!.t0S).toBe(0);
    // spread 20 ms -> 20 ms after the last arrival
    expect(w!.t1S).toBeCloseTo(0.045, 9);
    expect(w!.t1S).toBeLessThan(0.25 * 0.2 + 0.001);
  });

  it('deep arrivals at 80–100 ms: a margin before the first arrival (quarter of the spread, at least 4 ms)', () => {
    const w = fittedWindow([rec(0, 0.2)], [0.08, 0.1])!;
    expect(w.t0S).toBeCloseTo(0.08 - Math.max(MIN_MARGIN_S, 0.005), 9);
    expect(w.t1S).toBeCloseTo(0.1 + 0.02, 9);
  });

  it('without picks, the plausible-velocity search windows bound the window', () => {
    const w = fittedWindow([rec(0.01, 0.05), rec(0.02, 0.06)], [])!;
    expect(w.t0S).toBe(0);
    expect(w.t1S).toBeCloseTo(0.06 + 0.05, 9);
  });

  it('never leaves the records: late picks are clipped to the record end', () => {
    const w = fittedWindow([rec(0, 0.2)], [0.15, 0.19])!;
    expect(w.t1S).toBe(0.2);
    expect(w.t0S).toBeGreaterThanOrEqual(0);
  });

  it('no traces gives no window', () => {
    expect(fittedWindow([], [0.01])).toBeNull();
  });
});

describe('automatic gain control (RMS, centred window)', () => {
  it('brings a weak and a strong sine to the same RMS of 1 (analytic: A sin -> RMS A/sqrt 2)', () => {
    const dt = 1e-4;
    const n = 4000;
    const f = 100; // Hz, 10 ms period; window 40 ms = 4 periods
    const x = Float64Array.from({ length: n }, (_, i) => (i < n / 2 ? 0.01 : 5) * Math.sin(2 * Math.PI * f * i * dt));
    const y = agc(x, dt, 0.04);
    const rms = (a: number, b: number) => {
      let s = 0;
      for (let i = a; i < b; i++) s += y[i] * y[i];
      return Math.sqrt(s / (b - a));
    };
    expect(rms(500, 1500)).toBeCloseTo(1, 2);
    expect(rms(2500, 3500)).toBeCloseTo(1, 2);
  });

  it('a silent trace stays silent', () => {
    expect([...agc(new Float64Array(50), 1e-3, 0.01)].every((v) => v === 0)).toBe(true);
  });
});

describe('time-variant gain t^n', () => {
  it('n = 1 multiplies each sample by its time; samples at or before the trigger get 0', () => {
    const y = timeVariantGain([1, 1, 1, 2], -0.001, 0.001, 1);
    expect([...y]).toEqual([0, 0, 0.001, 0.004]);
  });
});

describe('drawn range', () => {
  it('spans the finite x of every trace, ignoring NaN gaps', () => {
    expect(drawnRange([{ x: [NaN, 3, 4] }, { x: [1, NaN, 9] }])).toEqual([1, 9]);
    expect(drawnRange([{ x: [NaN] }])).toBeNull();
  });
});

describe('window fitted to one pulse', () => {
  it('a one-cycle 50 Hz sine starting at 100 ms in a 200 ms record: peak 5 ms after the onset (analytic: quarter period)', () => {
    const dt = 1e-4;
    const x = Float64Array.from({ length: 2001 }, (_, i) => {
      const t = i * dt - 0.1;
      return t >= 0 && t <= 0.02 ? Math.sin(2 * Math.PI * 50 * t) : 0;
    });
    const w = pulseWindow(x, 0, dt, 0.1, 0.02);
    // rise = 5 ms: from 100 - 7.5 ms to 105 + 25 ms
    expect(w.t0S).toBeCloseTo(0.0925, 6);
    expect(w.t1S).toBeCloseTo(0.13, 6);
    // a 40 ms window, not the whole 0–200 ms record
    expect(w.t1S - w.t0S).toBeLessThan(0.05);
  });

  it('is clipped to the trace', () => {
    const w = pulseWindow([0, 1, 0, 0], 0, 0.001, 0.0, 0.003);
    expect(w.t0S).toBe(0);
    expect(w.t1S).toBe(0.003);
  });
});
