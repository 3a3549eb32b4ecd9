/**
 * Synthetic surveys: onsets at the true times, reversed-hit polarity, trigger delays, noise level,
 * determinism, crosshole distances between deviated holes and the survey description.
 */
import { describe, expect, it } from 'vitest';
import { BorewaveError } from '../../src/core/errors';
import type { WaveRecord } from '../../src/core/model';
import type { EarthModel } from '../../src/core/synth/earth';
import {
  downholePath,
  synthesizeSurvey,
  type CrossholeGeometry,
  type DownholeGeometry,
  type PairGeometry,
  type SynthOptions,
} from '../../src/core/synth/synthesize';

const MODEL: EarthModel = {
  name: 'test site',
  waterTableM: 2,
  layers: [
    {
      name: 'clay',
      topM: 0,
      thicknessM: 4,
      vsMps: 140,
      vpMps: 320,
      unitWeightKnM3: 17,
      qS: 20,
      qP: 30,
      behaviour: 'clay-like',
    },
    {
      name: 'sand',
      topM: 4,
      thicknessM: Infinity,
      vsMps: 260,
      vpMps: 520,
      unitWeightKnM3: 19.5,
      qS: 30,
      qP: 40,
      behaviour: 'sand-like',
    },
  ],
};

const DOWNHOLE: DownholeGeometry = { kind: 'downhole', holeId: 'DH', depthsM: [2, 5, 8], sourceOffsetM: 2 };

const CLEAN: SynthOptions = {
  seed: 7,
  sampleIntervalS: 5e-5,
  samplesPerTrace: 1600,
  sFrequencyHz: 100,
  pFrequencyHz: 400,
  attenuation: false,
  snr: null,
  maxTriggerDelayS: 0,
};

function trace(rec: WaveRecord, channel: number): Float32Array {
  return rec.traces.find((t) => t.channel === channel)!.samples;
}

function firstAbove(x: Float32Array, fraction: number): number {
  let peak = 0;
  for (const v of x) peak = Math.max(peak, Math.abs(v));
  return x.findIndex((v) => Math.abs(v) > fraction * peak);
}

describe('onset of the clean pulse (noise off, attenuation off) is at the true arrival time', () => {
  // The pulse rises as t^2 from its onset; it passes 1e-6 of its peak about 1.3e-6 s after the onset
  // (analytic, pulse.ts), so the first such sample lies in (truth, truth + dt + 2e-6 s].
  it('S on H1 (P switched off), every depth and hit, trigger delays on', () => {
    const { records, truth } = synthesizeSurvey(MODEL, DOWNHOLE, { ...CLEAN, pToSRatio: 0, maxTriggerDelayS: 1e-4 });
    records.forEach((rec, k) => {
      const ch = truth.records[k].channels.find((c) => c.component === 'H1')!;
      const t = rec.traces[0].delayS + firstAbove(trace(rec, ch.channel), 1e-6) * CLEAN.sampleIntervalS;
      expect(t).toBeGreaterThan(ch.sArrivalS);
      expect(t - ch.sArrivalS).toBeLessThanOrEqual(CLEAN.sampleIntervalS + 2e-6);
    });
  });

  it('P on V is the first arrival and starts at the true P time', () => {
    const { records, truth } = synthesizeSurvey(MODEL, DOWNHOLE, CLEAN);
    records.forEach((rec, k) => {
      const ch = truth.records[k].channels.find((c) => c.component === 'V')!;
      const t = firstAbove(trace(rec, ch.channel), 1e-6) * CLEAN.sampleIntervalS;
      expect(t).toBeGreaterThan(ch.pArrivalS);
      expect(t - ch.pArrivalS).toBeLessThanOrEqual(CLEAN.sampleIntervalS + 2e-6);
      expect(ch.pArrivalS).toBeLessThan(ch.sArrivalS);
    });
  });

  it('truth equals the refracted-ray time through the layers (not the slant line)', () => {
    const { truth } = synthesizeSurvey(MODEL, DOWNHOLE, CLEAN);
    const r8 = truth.records.find((r) => r.depthM === 8)!.channels[0];
    expect(r8.sTravelS).toBe(downholePath(MODEL, 'S', 0, 8, 2).timeS);
    const slantS = Math.hypot(2, 8) * (0.5 / 140 + 0.5 / 260); // half the slant line in each layer
    expect(r8.sTravelS).toBeLessThan(slantS);
  });
});

describe('reversed hits (common practice: (L - R)/2 keeps S, (L + R)/2 keeps P)', () => {
  it('S flips sign between left and right, P is identical: the difference cancels P to < 1e-6 of its amplitude', () => {
    const full = synthesizeSurvey(MODEL, DOWNHOLE, CLEAN);
    const sOnly = synthesizeSurvey(MODEL, DOWNHOLE, { ...CLEAN, pToSRatio: 0 });
    for (let k = 0; k < full.records.length; k += 2) {
      for (const ch of [1, 2, 3]) {
        const L = trace(full.records[k], ch);
        const R = trace(full.records[k + 1], ch);
        const Ls = trace(sOnly.records[k], ch);
        const Rs = trace(sOnly.records[k + 1], ch);
        // Samples are stored as float32: each carries a rounding error of up to 2^-24 of its value,
        // so after the S onset the comparison allows that on top of 1e-6 of the P amplitude.
        const f32 = 2 ** -23;
        let pPeak = 0;
        let sPeak = 0;
        let preOnsetResidual = 0;
        const tS = full.truth.records[k].channels[ch - 1].sArrivalS;
        for (let i = 0; i < L.length; i++) {
          const pL = L[i] - Ls[i];
          const pR = R[i] - Rs[i];
          pPeak = Math.max(pPeak, Math.abs(pL));
          sPeak = Math.max(sPeak, Math.abs(Ls[i]));
          // P in (L - R): before the S onset exactly the P residual, later up to float32 rounding.
          if (i * CLEAN.sampleIntervalS <= tS) preOnsetResidual = Math.max(preOnsetResidual, Math.abs(L[i] - R[i]));
          expect(Math.abs(pL - pR)).toBeLessThanOrEqual(
            1e-6 * pPeak + f32 * (Math.abs(L[i]) + Math.abs(R[i]) + Math.abs(Ls[i]) + Math.abs(Rs[i])),
          );
          // S in (L + R): the S-only hits are exact mirror images.
          expect(Math.abs(Ls[i] + Rs[i])).toBeLessThanOrEqual(1e-6 * Math.abs(Ls[i]));
        }
        expect(pPeak).toBeGreaterThan(0);
        if (ch === 1) expect(sPeak).toBeGreaterThan(pPeak); // H1 along the beam carries S
        if (ch === 3) expect(pPeak).toBeGreaterThan(sPeak); // V carries P
        expect(preOnsetResidual).toBeLessThan(1e-6 * pPeak);
      }
    }
  });

  it('crosshole up/down hits flip S on V as well', () => {
    const g: CrossholeGeometry = {
      kind: 'crosshole',
      depthsM: [6],
      holes: [
        { id: 'S1', collarEastM: 0, collarNorthM: 0, deviation: [] },
        { id: 'R1', collarEastM: 3, collarNorthM: 0, deviation: [] },
        { id: 'R2', collarEastM: 6, collarNorthM: 0, deviation: [] },
      ],
    };
    const { records, truth } = synthesizeSurvey(MODEL, g, {
      ...CLEAN,
      sampleIntervalS: 2e-5,
      sFrequencyHz: 300,
      pFrequencyHz: 1200,
      pToSRatio: 0,
    });
    expect(truth.records.map((r) => r.hit)).toEqual(['up', 'down']);
    const up = trace(records[0], 1);
    const down = trace(records[1], 1);
    let peak = 0;
    for (let i = 0; i < up.length; i++) {
      peak = Math.max(peak, Math.abs(up[i]));
      expect(Math.abs(up[i] + down[i])).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(up[i])));
    }
    expect(peak).toBeGreaterThan(0);
  });
});

describe('trigger delay, noise and determinism', () => {
  const noisy: SynthOptions = { ...CLEAN, attenuation: true, snr: 20, maxTriggerDelayS: 1e-4 };

  it('each hit gets its own delay in [0, 0.1 ms); arrival after trigger = travel time + delay', () => {
    const { truth } = synthesizeSurvey(MODEL, DOWNHOLE, noisy);
    const delays = truth.records.map((r) => r.triggerDelayS);
    for (const d of delays) {
      expect(d).toBeGreaterThanOrEqual(0);
      expect(d).toBeLessThan(1e-4);
    }
    expect(new Set(delays).size).toBe(delays.length);
    for (const r of truth.records)
      for (const c of r.channels) expect(c.sArrivalS - c.sTravelS).toBeCloseTo(r.triggerDelayS, 15);
  });

  it('noise standard deviation = peak |S| / SNR; measured before the P arrival within 10% (1000+ samples)', () => {
    const { records, truth } = synthesizeSurvey(MODEL, { ...DOWNHOLE, depthsM: [8] }, noisy);
    const r = truth.records[0];
    const tP = Math.min(...r.channels.map((c) => c.pArrivalS));
    const nQuiet = Math.floor(tP / noisy.sampleIntervalS) - 5;
    expect(nQuiet).toBeGreaterThan(200);
    let sum2 = 0;
    let count = 0;
    for (const t of records[0].traces)
      for (let i = 0; i < nQuiet; i++) {
        sum2 += t.samples[i] ** 2;
        count++;
      }
    expect(Math.sqrt(sum2 / count) / r.noiseStd).toBeGreaterThan(0.9);
    expect(Math.sqrt(sum2 / count) / r.noiseStd).toBeLessThan(1.1);
  });

  it('the same seed gives identical records; another seed gives different noise', () => {
    const a = synthesizeSurvey(MODEL, DOWNHOLE, noisy);
    const b = synthesizeSurvey(MODEL, DOWNHOLE, noisy);
    const c = synthesizeSurvey(MODEL, DOWNHOLE, { ...noisy, seed: 8 });
    a.records.forEach((rec, k) =>
      rec.traces.forEach((t, j) => expect(Array.from(t.samples)).toEqual(Array.from(b.records[k].traces[j].samples))),
    );
    expect(Array.from(a.records[0].traces[0].samples)).not.toEqual(Array.from(c.records[0].traces[0].samples));
    expect(a.truth).toEqual(b.truth);
  });
});

describe('crosshole through deviated holes (straight ray at the layer velocity of the test depth)', () => {
  // Hand geometry: source hole vertical at (0, 0); near hole collar (3, 0) drifting to (+0.3 E, +0.4 N)
  // at 10 m along hole; far hole collar (6, 0) drifting to (-0.2 E, 0) at 10 m. Test depth 10 m, Vs 260 m/s.
  // Distances (python3, math.sqrt): near D = sqrt(3.3^2 + 0.4^2 + (10 - sqrt(99.75))^2) = 3.3241775592796197 m;
  // far D = sqrt(5.8^2 + (10 - sqrt(99.96))^2) = 5.800000344896559 m.
  const g: CrossholeGeometry = {
    kind: 'crosshole',
    depthsM: [10],
    holes: [
      {
        id: 'B1',
        collarEastM: 0,
        collarNorthM: 0,
        deviation: [
          { depthAlongM: 0, eastM: 0, northM: 0 },
          { depthAlongM: 10, eastM: 0, northM: 0 },
        ],
      },
      {
        id: 'B2',
        collarEastM: 3,
        collarNorthM: 0,
        deviation: [
          { depthAlongM: 0, eastM: 0, northM: 0 },
          { depthAlongM: 10, eastM: 0.3, northM: 0.4 },
        ],
      },
      {
        id: 'B3',
        collarEastM: 6,
        collarNorthM: 0,
        deviation: [
          { depthAlongM: 0, eastM: 0, northM: 0 },
          { depthAlongM: 10, eastM: -0.2, northM: 0 },
        ],
      },
    ],
  };

  it('S and P times = 3-D distance / layer velocity (Vp below the water table = 1500 m/s)', () => {
    const { truth, survey } = synthesizeSurvey(MODEL, g, {
      ...CLEAN,
      sampleIntervalS: 2e-5,
      samplesPerTrace: 2048,
      sFrequencyHz: 300,
      pFrequencyHz: 1200,
    });
    const near = truth.records[0].channels.filter((c) => c.receiver === 'B2');
    const far = truth.records[0].channels.filter((c) => c.receiver === 'B3');
    expect(near.map((c) => c.component)).toEqual(['V', 'H1']);
    expect(near[0].sPathM).toBeCloseTo(3.3241775592796197, 12);
    expect(near[0].sTravelS).toBeCloseTo(3.3241775592796197 / 260, 14);
    expect(near[0].pTravelS).toBeCloseTo(3.3241775592796197 / 1500, 14);
    expect(far[0].sTravelS).toBeCloseTo(5.800000344896559 / 260, 14);
    expect(survey.mainHoleId).toBe('B1');
    expect(survey.receiverHoleIds).toEqual(['B2', 'B3']);
    expect(survey.records[0].channels.map((c) => `${c.channel}:${c.receiver}:${c.component}`)).toEqual([
      '1:r0:V',
      '2:r0:H1',
      '3:r1:V',
      '4:r1:H1',
    ]);
  });
});

describe('two-receiver downhole and the survey description', () => {
  const pair: PairGeometry = {
    kind: 'downhole-pair',
    holeId: 'SC',
    upperDepthsM: [3, 6],
    receiverSpacingM: 1,
    sourceOffsetM: 1.5,
  };

  it('one hit on both receivers: same trigger delay; lower receiver times at depth + spacing', () => {
    const { truth, survey } = synthesizeSurvey(MODEL, pair, { ...CLEAN, maxTriggerDelayS: 1e-4 });
    for (const r of truth.records) {
      const upper = r.channels.find((c) => c.receiver === 'upper' && c.component === 'H1')!;
      const lower = r.channels.find((c) => c.receiver === 'lower' && c.component === 'H1')!;
      expect(upper.sTravelS).toBe(downholePath(MODEL, 'S', 0, r.depthM, 1.5).timeS);
      expect(lower.sTravelS).toBe(downholePath(MODEL, 'S', 0, r.depthM + 1, 1.5).timeS);
      expect(lower.sArrivalS - lower.sTravelS).toBeCloseTo(upper.sArrivalS - upper.sTravelS, 15);
    }
    expect(survey.kind).toBe('downhole-pair');
    expect(survey.receiverSpacingM).toBe(1);
    expect(survey.sourceOffsetM).toBe(1.5);
    expect(survey.records.map((a) => a.recordId)).toEqual([
      'dhp_d3.0_L.sg2',
      'dhp_d3.0_R.sg2',
      'dhp_d6.0_L.sg2',
      'dhp_d6.0_R.sg2',
    ]);
    expect(survey.records[0].channels.map((c) => c.receiver)).toEqual(['r0', 'r0', 'r0', 'r1', 'r1', 'r1']);
  });

  it('survey soil column: layers from the model, stress exponent 0.5 clay / 0.25 sand (docs/methods.md section 4), Poisson 0.3', () => {
    const { survey, records } = synthesizeSurvey(MODEL, DOWNHOLE, CLEAN);
    expect(survey.mainHoleId).toBe('DH');
    expect(survey.soil.waterTableM).toBe(2);
    expect(
      survey.soil.layers.map((l) => [l.name, l.topM, l.bottomM, l.unitWeightKnM3, l.stressExponent, l.poissonRatio]),
    ).toEqual([
      ['clay', 0, 4, 17, 0.5, 0.3],
      ['sand', 4, 8, 19.5, 0.25, 0.3],
    ]);
    const rec = records[0];
    expect(rec.id).toBe('dh_d2.0_L.sg2');
    expect(rec.notes).toContain('HIT left');
    expect(rec.traces[0].receiverLocation).toEqual([0, 0, 2]);
    expect(rec.traces[0].sourceLocation).toEqual([2, 0, 0]);
    expect(rec.fileStrings.UNITS).toBe('METERS');
  });

  it('rejects a sample interval of zero, naming the field', () => {
    expect(() => synthesizeSurvey(MODEL, DOWNHOLE, { ...CLEAN, sampleIntervalS: 0 })).toThrowError(BorewaveError);
    expect(() => synthesizeSurvey(MODEL, DOWNHOLE, { ...CLEAN, sampleIntervalS: 0 })).toThrowError(/sampleIntervalS/);
  });
});
