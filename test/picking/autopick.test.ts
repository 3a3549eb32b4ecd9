import { describe, expect, it } from 'vitest';
import { autoPickStation, autoPickSurvey, pairDelays, type PickingSettings } from '../../src/core/picking/autopick';
import type { DelayRequest, WorkingTrace } from '../../src/core/model';
import { intervalKey, stationKey } from '../../src/core/keys';
import { pickUncertaintyS } from '../../src/core/picking/quality';
import { gaussianNoise, onsetPulse } from './helpers';

// Synthetic downhole survey (analytic travel times, straight rays): source 2 m from the hole at the
// surface, receivers every 1 m from 2 to 20 m, Vs = 200 m/s, so t = R / V with R = sqrt(2^2 + z^2).
// The shear pulse is A sin(2 pi f tau) exp(-f tau) from the onset (f = 100 Hz), whose first peak is at
// tau = atan(2 pi) / (2 pi f), zero crossing at 1 / (2 f) and trough at (atan(2 pi) + pi) / (2 pi f)
// (closed form; the trough is 0.606 of the peak, above the 0.5 feature threshold).
const dt = 1e-4;
const n = 2048;
const f = 100;
const vs = 200;
const offsetM = 2;
const depths = Array.from({ length: 19 }, (_, i) => 2 + i);
const onsetS = (z: number): number => Math.hypot(offsetM, z) / vs;
const peakTau = Math.atan(2 * Math.PI) / (2 * Math.PI * f);
const zeroTau = 1 / (2 * f);
const troughTau = (Math.atan(2 * Math.PI) + Math.PI) / (2 * Math.PI * f);
const delayS = -0.002; // 2 ms pre-trigger

function station(z: number, snr: number, seed: number, amplitude = 1): WorkingTrace {
  const x = onsetPulse(n, dt, f, onsetS(z) - delayS, amplitude);
  const noise = gaussianNoise(n, amplitude / snr, seed);
  for (let i = 0; i < n; i++) x[i] += noise[i];
  const t = onsetS(z);
  return {
    stationKey: stationKey('r0', z, 'H1'),
    wave: 'S',
    samples: x,
    sampleIntervalS: dt,
    delayS,
    // Search window from plausible velocities 120-400 m/s along the straight ray.
    searchStartS: Math.hypot(offsetM, z) / 400,
    searchEndS: Math.max(Math.hypot(offsetM, z) / 120, t + 0.01),
  };
}

const aic: PickingSettings = { onsetMethod: 'aic', staS: 0.003, ltaS: 0.03, staLtaThreshold: 3, phaseBandHz: null };

/** Depths of each pair, by its key. */
const depthsOfPair = new Map<string, [number, number]>();

function pairsFor(zs: number[]): DelayRequest[] {
  const out: DelayRequest[] = [];
  for (let i = 0; i + 1 < zs.length; i++) {
    const dr = Math.hypot(offsetM, zs[i + 1]) - Math.hypot(offsetM, zs[i]);
    depthsOfPair.set(intervalKey('S', stationKey('r0', zs[i], 'H1'), stationKey('r0', zs[i + 1], 'H1')), [
      zs[i],
      zs[i + 1],
    ]);
    out.push({
      pairKey: intervalKey('S', stationKey('r0', zs[i], 'H1'), stationKey('r0', zs[i + 1], 'H1')),
      wave: 'S',
      a: stationKey('r0', zs[i], 'H1'),
      b: stationKey('r0', zs[i + 1], 'H1'),
      minDelayS: dr / 1500,
      maxDelayS: dr / 50,
    });
  }
  return out;
}

describe('autoPickStation', () => {
  it('SNR 20: onset within 4 T/(2 pi SNR) + 2 samples (late bias allowed); zero crossing, peak, trough near the closed form', () => {
    for (const [k, z] of [3, 8, 15].entries()) {
      const t = station(z, 20, 40 + k);
      const picks = autoPickStation(t, aic);
      const by = (m: string) => picks.find((p) => p.method === m)!;
      const onset = by('aic');
      expect(onset.origin).toBe('auto');
      expect(onset.wave).toBe('S');
      const errSamples = (onset.timeS - onsetS(z)) / dt;
      expect(errSamples).toBeGreaterThan(-3);
      expect(errSamples).toBeLessThan((4 * (1 / f)) / (2 * Math.PI * 20) / dt + 2);
      // Zero crossing: noise sigma over the slope there, 2 pi f e^-0.5 (closed form), 3 sigma = 3.9 samples.
      const zcSigmaSamples = 1 / 20 / (2 * Math.PI * f * Math.exp(-0.5)) / dt;
      expect(Math.abs(by('zero-crossing').timeS - (onsetS(z) + zeroTau)) / dt).toBeLessThan(3 * zcSigmaSamples);
      // Peak and trough are flat on top, so noise moves them much more: within a tenth of a period for
      // the peak, 0.15 period for the trough (0.61 of the peak amplitude) (common practice for apex picks).
      expect(Math.abs(by('peak').timeS - (onsetS(z) + peakTau)) / dt).toBeLessThan(0.1 / f / dt);
      expect(Math.abs(by('trough').timeS - (onsetS(z) + troughTau)) / dt).toBeLessThan(0.15 / f / dt);
      expect(by('peak').polarity).toBe(1);
      expect(by('trough').polarity).toBe(-1);
      expect(onset.polarity).toBe(1);
      // SNR is an RMS ratio over one period: the pulse's RMS over its first period is
      // sqrt(int_0^1 sin^2(2 pi u) e^-2u du) = 0.459 (closed form), noise RMS 1/20 -> 9.18. Tolerance 15%:
      // noise RMS estimated from 100 samples varies by about 7% (one sigma).
      expect(Math.abs(onset.snr / 9.18 - 1)).toBeLessThan(0.15);
      expect(onset.uncertaintyS).toBeCloseTo(pickUncertaintyS(onset.snr, dt, 1 / f), 4);
      expect(onset.flags).toEqual([]);
    }
  });

  it('STA/LTA mode labels the onset pick stalta and finds it within 8 T/(2 pi SNR) + 2 samples', () => {
    const z = 10;
    const picks = autoPickStation(station(z, 20, 7), {
      ...aic,
      onsetMethod: 'stalta',
      staS: 0.003,
      ltaS: 0.03,
      staLtaThreshold: 3,
    });
    const onset = picks.find((p) => p.method === 'stalta')!;
    const errSamples = (onset.timeS - onsetS(z)) / dt;
    expect(errSamples).toBeGreaterThan(-3);
    expect(errSamples).toBeLessThan((8 * (1 / f)) / (2 * Math.PI * 20) / dt + 2);
  });

  it("pure noise: STA/LTA gives no onset pick and the features carry 'no onset' and 'low snr'", () => {
    const t = station(10, 20, 3);
    t.samples = gaussianNoise(n, 1, 99);
    const picks = autoPickStation(t, { ...aic, onsetMethod: 'stalta', staLtaThreshold: 6 });
    expect(picks.some((p) => p.method === 'stalta')).toBe(false);
    for (const p of picks) {
      expect(p.flags).toContain('no onset');
      expect(p.flags).toContain('low snr');
    }
  });

  it('throws a BorewaveError naming the station when the search window misses the trace', () => {
    const t = { ...station(5, 20, 1), searchStartS: 1, searchEndS: 2 };
    expect(() => autoPickStation(t, aic)).toThrow(/r0@5000/);
  });
});

describe('pairDelays and autoPickSurvey', () => {
  const traces = depths.map((z, i) => station(z, 30, 100 + i));
  const pairs = pairsFor(depths);

  it('correlation delays equal the analytic (R2 - R1)/V within 4 reported sigma and 1 sample, coefficient > 0.9', () => {
    const res = autoPickSurvey(traces, pairs, aic);
    expect(res.problems).toEqual([]);
    expect(res.delays.length).toBe(pairs.length);
    for (const d of res.delays) {
      const [z1, z2] = depthsOfPair.get(d.pairKey)!;
      const want = onsetS(z2) - onsetS(z1);
      expect(d.method).toBe('xcorr');
      expect(Math.abs(d.delayS - want)).toBeLessThan(4 * d.uncertaintyS);
      expect(Math.abs(d.delayS - want) / dt).toBeLessThan(1);
      expect(d.coefficient).toBeGreaterThan(0.9);
      expect(d.flags).toEqual([]);
    }
    expect(res.picks.length).toBe(4 * depths.length);
  });

  it('phase-slope delays (band 50-200 Hz) agree with the analytic delays within 4 reported sigma and 2 samples', () => {
    // The band holds 8 bins of which about 4 are independent, so the phase slope scatters more than
    // the correlation peak; its reported sigma includes the scatter of the phases about the line.
    const res = autoPickSurvey(traces, pairs, { ...aic, phaseBandHz: [50, 200] });
    const phase = res.delays.filter((d) => d.method === 'phase');
    expect(phase.length).toBe(pairs.length);
    for (const d of phase) {
      const [z1, z2] = depthsOfPair.get(d.pairKey)!;
      const err = Math.abs(d.delayS - (onsetS(z2) - onsetS(z1)));
      expect(err).toBeLessThan(4 * d.uncertaintyS);
      expect(err / dt).toBeLessThan(2);
      expect(d.coefficient).toBeGreaterThan(0.8);
    }
  });

  it('pairDelays on two traces gives the same delay as the survey run', () => {
    const survey = autoPickSurvey(traces.slice(0, 2), pairs.slice(0, 1), aic);
    const single = pairDelays(traces[0], traces[1], pairs[0], aic);
    expect(single[0].delayS).toBe(survey.delays[0].delayS);
  });

  it("a lag bound below the true delay gives a delay on the bound flagged 'at lag bound'", () => {
    const req = { ...pairs[10], maxDelayS: 0.5 * (onsetS(depths[11]) - onsetS(depths[10])) };
    const [d] = pairDelays(traces[10], traces[11], req, aic);
    expect(d.flags).toContain('at lag bound');
    expect(d.delayS).toBeLessThanOrEqual(req.maxDelayS + dt);
  });

  it('reports a bad trace and a pair with a missing station in problems and goes on with the rest', () => {
    const broken = stationKey('r0', 99, 'H1');
    const nowhere = stationKey('r0', 98, 'H1');
    const x = intervalKey('S', nowhere, broken);
    const bad = { ...traces[0], stationKey: broken, searchStartS: 5, searchEndS: 6 };
    const reqs = [...pairs.slice(0, 2), { ...pairs[0], pairKey: x, a: nowhere }];
    const calls: [number, number][] = [];
    const res = autoPickSurvey([bad, ...traces.slice(0, 3)], reqs, aic, (done, total) => calls.push([done, total]));
    expect(res.problems.map((p) => p.file)).toEqual([broken, x]);
    expect(res.problems[1].code).toBe('PAIR_MISSING_STATION');
    expect(res.delays.length).toBe(2);
    expect(calls[calls.length - 1]).toEqual([7, 7]);
  });
});
