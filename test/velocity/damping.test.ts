import { describe, expect, it } from 'vitest';
import { autoPick, derive, prepare } from '../../src/core/pipeline';
import { defaultSettings, emptyEdits } from '../../src/core/settings';
import { demoCrossholeHoles, synthesizeSurvey, type EarthModel, type SynthGeometry } from '../../src/core/synth';
import { layerDamping, localInvQ, pooledLayerInvQ, type IntervalDamping } from '../../src/core/velocity/damping';

// One soil with constant Q (Kjartansson 1979 constant-Q model in the forward model): the spectral ratio
// between two receivers of one hit gives t* = dt / Q (Bath 1974), so every interval should give Q back.
const Q = 20;
const uniform: EarthModel = {
  name: 'uniform constant-Q soil',
  layers: [
    {
      name: 'soil',
      topM: 0,
      thicknessM: Infinity,
      vsMps: 250,
      vpMps: 500,
      unitWeightKnM3: 18,
      qS: Q,
      qP: 2 * Q,
      behaviour: 'sand-like',
    },
  ],
  waterTableM: null,
};

function run(geometry: SynthGeometry, crosshole: boolean) {
  const res = synthesizeSurvey(uniform, geometry, {
    seed: 3,
    attenuation: true,
    snr: 40,
    maxTriggerDelayS: 0,
    pToSRatio: 0.2,
    ...(crosshole
      ? { sampleIntervalS: 2.5e-5, samplesPerTrace: 3072, firstSampleS: -0.001, sFrequencyHz: 300, pFrequencyHz: 1500 }
      : { sampleIntervalS: 1e-4, samplesPerTrace: 4096, sFrequencyHz: 100, pFrequencyHz: 400 }),
  });
  const settings = defaultSettings();
  const prep = prepare(res.survey, new Map(res.records.map((r) => [r.id, r])), settings);
  return derive(res.survey, prep, autoPick(prep, settings), emptyEdits(), settings, { monteCarlo: false });
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

describe('field damping from the spectral ratio of one hit (Bath 1974; D = 1/(2Q))', () => {
  it('crosshole near/far receivers in a Q = 20 soil: median Q within 25%, D about 2.5%', () => {
    const d = run({ kind: 'crosshole', holes: demoCrossholeHoles(), depthsM: [2, 4, 6, 8, 10, 12, 14, 16] }, true);
    const qs = d.damping.intervals.flatMap((x) => (x.qS === null ? [] : [x.qS]));
    expect(qs.length).toBeGreaterThanOrEqual(6);
    expect(Math.abs(median(qs) - Q) / Q).toBeLessThan(0.25);
    const ds = d.damping.intervals.flatMap((x) => (x.damping === null ? [] : [x.damping]));
    expect(median(ds)).toBeGreaterThan(0.025 / 1.25);
    expect(median(ds)).toBeLessThan(0.025 / 0.75);
    expect(d.damping.caution).toMatch(/upper bound on material damping/);
  });

  it('one receiver per hit: no Q per interval, and the reason says why', () => {
    const d = run({ kind: 'downhole', holeId: 'DH1', depthsM: [1, 2, 3, 4, 5, 6], sourceOffsetM: 2 }, false);
    expect(d.damping.intervals).toEqual([]);
    expect(d.damping.reason).toMatch(/source spectrum changes from hit to hit/);
  });
});

describe('per-layer damping: inverse-variance weighted 1/Q (common practice)', () => {
  const iv = (topM: number, tStarS: number, tStarSdS: number, delayS: number): IntervalDamping => ({
    intervalKey: `S|${topM}` as IntervalDamping['intervalKey'],
    topM,
    bottomM: topM + 1,
    qS: null,
    qSdS: null,
    damping: null,
    dampingSd: null,
    bandHz: null,
    tStarS,
    tStarSdS,
    delayS,
    reason: null,
  });
  it('two equal-weight intervals of 1/Q = 0.04 and 0.06 give D = 2.5% (Q = 20); a negative t-star counts signed', () => {
    const [l] = layerDamping(
      [iv(0, 0.2e-3, 0.05e-3, 5e-3), iv(1, 0.3e-3, 0.05e-3, 5e-3)],
      [{ topM: 0, bottomM: 2, vsMps: 200, vsSdMps: 5, receivers: 2 }],
    );
    expect(l.damping).toBeCloseTo(0.025, 10);
    expect(l.qS).toBeCloseTo(20, 8);
    // sd of the mean of two with sd(1/Q) = 0.01 each is 0.00707; scatter chi2 = 2 on 1 dof inflates it by sqrt(2) to 0.01
    expect(l.dampingSd).toBeCloseTo(0.01 / 2, 8);
    const [m] = layerDamping(
      [iv(0, -0.1e-3, 0.05e-3, 5e-3), iv(1, 0.3e-3, 0.05e-3, 5e-3)],
      [{ topM: 0, bottomM: 2, vsMps: 200, vsSdMps: 5, receivers: 2 }],
    );
    // mean 1/Q = 0.02 -> D = 1%; chi2 = 32 on 1 dof inflates the sd 0.00707 by sqrt(32) to 0.04
    expect(m.damping).toBeCloseTo(0.01, 10);
    expect(m.dampingSd).toBeCloseTo(0.04 / 2, 8);
  });
});

describe('random-effects pooling of layer 1/Q (DerSimonian & Laird 1986, moment estimator, from memory)', () => {
  // three layers of one interval each (sum dt = 1 s for round numbers), 1/Q = 0.02, 0.04, 0.06;
  // residuals with 1.4826 MAD = 0.01, so every layer's sampling variance v = 1e-4.
  // Hand computation: w = 1e4, mu = 0.04, Q = 1e4 (4e-4 + 0 + 4e-4) = 8, c = 3e4 - 3e8 / 3e4 = 2e4,
  // tau^2 = (8 - 2) / 2e4 = 3e-4; shrink factor tau^2 / (tau^2 + v) = 0.75; sd sqrt(v tau^2 / (v + tau^2)).
  const res = [0.01 / 1.4826, -0.01 / 1.4826, 0.01 / 1.4826];
  const stacks = [0.02, 0.04, 0.06].map((invQ) => ({ invQ, n: 1, sumDtS: 1 }));
  it('moves each layer a quarter of the way to the mean: 0.025, 0.04, 0.055, sd 0.00866', () => {
    const p = pooledLayerInvQ(stacks, res)!;
    expect(p.map((x) => x.invQ)).toEqual([
      expect.closeTo(0.025, 10),
      expect.closeTo(0.04, 10),
      expect.closeTo(0.055, 10),
    ]);
    expect(p[0].sd).toBeCloseTo(Math.sqrt(0.75e-4), 10);
  });
  it('layers that scatter less than their sampling error all take the mean (tau^2 = 0), sd 1 / sqrt(sum w)', () => {
    const p = pooledLayerInvQ(
      [0.039, 0.04, 0.041].map((invQ) => ({ invQ, n: 1, sumDtS: 1 })),
      res,
    )!;
    for (const x of p) {
      expect(x.invQ).toBeCloseTo(0.04, 10);
      expect(x.sd).toBeCloseTo(Math.sqrt(1e-4 / 3), 10);
    }
  });
  it('gives no pooling for fewer than three layers', () => {
    expect(pooledLayerInvQ(stacks.slice(0, 2), res)).toBeNull();
  });
});

describe('local 1/Q for the broadening correction (inverse-variance weighted, common practice)', () => {
  const iv = (topM: number, tStarS: number): IntervalDamping => ({
    intervalKey: `S|${topM}` as IntervalDamping['intervalKey'],
    topM,
    bottomM: topM + 1,
    qS: null,
    qSdS: null,
    damping: null,
    dampingSd: null,
    bandHz: null,
    tStarS,
    tStarSdS: 0.05e-3,
    delayS: 5e-3,
    reason: null,
  });
  const ivs = [iv(0, 0.1e-3), iv(1, 0.2e-3), iv(2, 0.3e-3), iv(3, 1e-3)];
  it('averages the neighbours within the half-width: 1/Q = (0.02 + 0.04 + 0.06) / 3 = 0.04 around 1.5 m', () => {
    expect(localInvQ(ivs, 1, 1)).toBeCloseTo(0.04, 10);
  });
  it('gives none where the local mean is not positive', () => {
    expect(localInvQ([iv(0, -0.1e-3), iv(1, 0.05e-3)], 0, 2)).toBeNull();
  });
});
