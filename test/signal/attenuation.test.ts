/**
 * Spectral-ratio Q and the broadening correction (src/core/signal/attenuation.ts) against an analytic
 * constant-Q pulse pair: the same causal pulse after 20 ms and 30 ms of travel at Q = 20, built in the
 * frequency domain with Kjartansson's constant-Q operator (J. Geophys. Res. 84(B9), 1979, from memory;
 * src/core/synth/pulse.ts), so the true travel-time difference is exactly 10 ms at the reference
 * frequency (100 Hz) and the true Q is 20.
 */
import { describe, expect, it } from 'vitest';
import { renderArrival } from '../../src/core/synth/pulse';
import { broadeningCorrectedDelay, dampingFromQ, spectralRatioQ } from '../../src/core/signal/attenuation';
import { correlationDelay } from '../../src/core/picking/delay';

const DT_S = 1e-4;
const N = 2048;
const F_REF_HZ = 100;

function pulse(travelS: number, q: number): Float64Array {
  return renderArrival(N, DT_S, 0, {
    arrivalS: travelS,
    frequencyHz: F_REF_HZ,
    attenuation: { travelTimeS: travelS, q, referenceHz: F_REF_HZ },
  });
}

/** A window of `len` samples starting 5 ms before the arrival. */
function windowAt(x: Float64Array, arrivalS: number, len: number): Float64Array {
  const i0 = Math.round((arrivalS - 0.005) / DT_S);
  return x.slice(i0, i0 + len);
}

describe('spectral-ratio Q between two traces of one hit', () => {
  it('recovers Q = 20 from the analytic pair (20 and 30 ms of travel) within 5%', () => {
    const a = windowAt(pulse(0.02, 20), 0.02, 400);
    const b = windowAt(pulse(0.03, 20), 0.03, 400);
    const r = spectralRatioQ(a, b, DT_S, { delayS: 0.01 });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(Math.abs(r.q - 20) / 20).toBeLessThan(0.05);
    // D = 1/(2Q) (common practice): 0.025 for Q = 20
    expect(dampingFromQ(r.q, r.qSd).damping).toBeCloseTo(0.025, 2);
  });

  it('with spreading 1/r (rA/rB = 0.8) and the intercept held at ln 0.8: Q = 20 within 5%, noisy pair better than the free line', () => {
    // analytic: ln|B|/|A| = ln(0.8) - pi f (10 ms) / 20; additive white noise on both windows
    // (a fixed-seed sequence), the same for both fits
    const a = windowAt(pulse(0.02, 20), 0.02, 400);
    const b = windowAt(pulse(0.03, 20), 0.03, 400).map((x) => 0.8 * x);
    const exact = spectralRatioQ(a, b, DT_S, { delayS: 0.01, intercept: { value: Math.log(0.8), sd: 0.01 } });
    expect(exact.ok).toBe(true);
    if (!exact.ok) return;
    expect(Math.abs(exact.q - 20) / 20).toBeLessThan(0.05);
    expect(exact.interceptLn).toBeCloseTo(Math.log(0.8), 1);
    let seed = 7;
    const noise = () => {
      seed = (seed * 1103515245 + 12345) % 2147483648;
      return seed / 2147483648 - 0.5;
    };
    const peak = Math.max(...a.map(Math.abs));
    const errs = { free: 0, held: 0 };
    for (let k = 0; k < 20; k++) {
      const na = a.map((x) => x + 0.03 * peak * noise());
      const nb = b.map((x) => x + 0.03 * peak * noise());
      const free = spectralRatioQ(na, nb, DT_S, { delayS: 0.01, contiguous: true });
      const held = spectralRatioQ(na, nb, DT_S, {
        delayS: 0.01,
        contiguous: true,
        intercept: { value: Math.log(0.8), sd: 0.02 },
      });
      errs.free += free.tStarS === undefined ? 1 : Math.abs(free.tStarS / 0.0005 - 1);
      errs.held += held.tStarS === undefined ? 1 : Math.abs(held.tStarS / 0.0005 - 1);
    }
    expect(errs.held).toBeLessThan(errs.free);
  });

  it('says why when the farther pulse is not the more attenuated one', () => {
    const a = windowAt(pulse(0.03, 20), 0.03, 400);
    const b = windowAt(pulse(0.02, 20), 0.02, 400);
    const r = spectralRatioQ(a, b, DT_S, { delayS: 0.01 });
    expect(r.ok).toBe(false);
  });
});

describe('broadening correction of the cross-correlation delay', () => {
  it('removes the bias on a noise-free pair (20 and 50 ms of travel at Q = 10) to within 0.1 sample', () => {
    // both windows on the same clock, so the correlation lag is the delay (true: 30 ms)
    const a = pulse(0.02, 10);
    const b = pulse(0.05, 10);
    const i0 = Math.round(0.015 / DT_S);
    const wa = a.slice(i0, i0 + 800);
    const wb = b.slice(i0, i0 + 800);
    const d = correlationDelay(wa, wb, DT_S, { minDelayS: 0.005, maxDelayS: 0.05 });
    const biasSamples = (d.delayS - 0.03) / DT_S;
    // the broadened pulse does not line up with the reference-frequency travel time: biased by > 0.1 sample
    expect(Math.abs(biasSamples)).toBeGreaterThan(0.1);
    const q = spectralRatioQ(windowAt(a, 0.02, 500), windowAt(b, 0.05, 500), DT_S, { delayS: d.delayS });
    expect(q.ok).toBe(true);
    if (!q.ok) return;
    const c = broadeningCorrectedDelay(windowAt(a, 0.02, 500), DT_S, d.delayS, q.q, F_REF_HZ);
    expect(Math.abs(c.delayS - 0.03) / DT_S).toBeLessThan(0.1);
  });
});
