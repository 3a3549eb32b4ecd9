/**
 * The causal source pulse and the constant-Q propagation operator.
 */
import { describe, expect, it } from 'vitest';
import { constantQResponse, pulseAt, pulseScale, pulseSpectrum, renderArrival } from '../../src/core/synth/pulse';

/** Plain O(N) DFT at one frequency of samples x_i at t_i = t0 + i dt: sum x_i exp(-i 2 pi f t_i) dt (Riemann sum of the Fourier integral). */
function dftAt(x: ArrayLike<number>, dtS: number, t0S: number, fHz: number): [number, number] {
  let re = 0;
  let im = 0;
  for (let i = 0; i < x.length; i++) {
    const ph = -2 * Math.PI * fHz * (t0S + i * dtS);
    re += x[i] * Math.cos(ph) * dtS;
    im += x[i] * Math.sin(ph) * dtS;
  }
  return [re, im];
}

describe('Berlage pulse of order 1 (t exp(-a t) sin(2 pi f0 t), causal)', () => {
  const f0 = 100;
  const sc = pulseScale(f0);

  it('is zero at and before the onset and its peak magnitude is 1 (fine-grid search, 1e-6)', () => {
    expect(pulseAt(0, f0)).toBe(0);
    expect(pulseAt(-1e-3, f0)).toBe(0);
    let peak = 0;
    for (let i = 1; i < 30000; i++) peak = Math.max(peak, Math.abs(pulseAt((i * 0.01) / 30000, f0, sc)));
    expect(Math.abs(peak - 1)).toBeLessThan(1e-6);
  });

  it('rises as t^2 after the onset: Taylor series gives w(2 tau)/w(tau) = 4 (1 - a tau + ...), a = pi f0', () => {
    const tau = 1e-8;
    expect(pulseAt(2 * tau, f0) / pulseAt(tau, f0)).toBeCloseTo(4 * (1 - Math.PI * f0 * tau), 6);
  });

  it('first lobe positive and the largest; the second lobe negative', () => {
    expect(pulseAt(0.25 / f0, f0)).toBeGreaterThan(0.9);
    expect(pulseAt(0.75 / f0, f0)).toBeLessThan(-0.3);
  });

  it('closed-form spectrum 1/(2i)[(a+i(w-w0))^-2 - (a+i(w+w0))^-2] matches a numerical Fourier integral to 1e-5 relative', () => {
    const dt = 2e-6;
    const n = 50000; // 0.1 s: the envelope has decayed to exp(-pi f0 0.1) ~ 2e-14
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = pulseAt(i * dt, f0, sc);
    for (const f of [10, 60, 100, 250]) {
      const [re, im] = dftAt(x, dt, 0, f);
      const [cre, cim] = pulseSpectrum(f, f0, sc);
      const mag = Math.hypot(cre, cim);
      expect(Math.hypot(re - cre, im - cim) / mag).toBeLessThan(1e-5);
    }
  });
});

describe('rendering an arrival on a sample grid', () => {
  const dt = 5e-5;
  const n = 4096;
  const f0 = 100;

  it('time-domain rendering (attenuation off) is the pulse shifted to the arrival time, exactly', () => {
    const arrival = 0.0501234;
    const x = renderArrival(n, dt, 0, { arrivalS: arrival, frequencyHz: f0, attenuation: null });
    const scale = pulseScale(f0);
    for (const i of [1002, 1003, 1010, 1100]) expect(x[i]).toBe(pulseAt(i * dt - arrival, f0, scale));
    expect(x[1002]).toBe(0); // 1002 * dt = 0.0501 s, before the arrival
  });

  it('the frequency-domain path with Q = 1e12 reproduces the time-domain pulse to 1e-4 of its peak (checks spectrum, delay sign and FFT scaling)', () => {
    const arrival = 0.0501234;
    const a = renderArrival(n, dt, 0, { arrivalS: arrival, frequencyHz: f0, attenuation: null });
    const b = renderArrival(n, dt, 0, {
      arrivalS: arrival,
      frequencyHz: f0,
      attenuation: { travelTimeS: arrival, q: 1e12, referenceHz: f0 },
    });
    let worst = 0;
    for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]));
    expect(worst).toBeLessThan(1e-4);
  });

  it('constant Q: spectral ratio attenuated/unattenuated = exp(-pi f tF / Q) (Q = 20, t = 0.05 s) within 0.5% of the exponent, 40-250 Hz', () => {
    // Constant-Q amplitude decay exp(-pi f t / Q) (Kjartansson 1979, from memory; any seismology
    // text), with t the travel time at that frequency, tF = t (f/fR)^-gamma, gamma = atan(1/Q)/pi
    // (the dispersion of the same model). The exact form 2 pi f tF tan(pi gamma / 2) differs by O(1/Q^2).
    const t = 0.05;
    const q = 20;
    const a = renderArrival(n, dt, 0, { arrivalS: t, frequencyHz: f0, attenuation: null });
    const b = renderArrival(n, dt, 0, {
      arrivalS: t,
      frequencyHz: f0,
      attenuation: { travelTimeS: t, q, referenceHz: f0 },
    });
    for (const f of [40, 100, 160, 250]) {
      const A = Math.hypot(...dftAt(a, dt, 0, f));
      const B = Math.hypot(...dftAt(b, dt, 0, f));
      const tF = t * Math.pow(f / f0, -Math.atan(1 / q) / Math.PI);
      const expected = (-Math.PI * f * tF) / q;
      expect(Math.abs(Math.log(B / A) - expected) / Math.abs(expected)).toBeLessThan(0.005);
    }
  });

  it('dispersion: phase delay at the reference frequency is the travel time; higher frequencies arrive earlier (causal constant Q)', () => {
    const cq = { travelTimeS: 0.1, q: 20, referenceHz: 100 };
    expect(constantQResponse(100, cq).extraDelayS).toBeCloseTo(0, 15);
    expect(constantQResponse(400, cq).extraDelayS).toBeLessThan(0);
    expect(constantQResponse(25, cq).extraDelayS).toBeGreaterThan(0);
    // gamma = atan(1/20)/pi = 0.0159022; tF(400) = 0.1 * 4^-gamma = 0.0978192 s (hand calculation).
    expect(0.1 + constantQResponse(400, cq).extraDelayS).toBeCloseTo(0.0978192, 6);
  });
});
