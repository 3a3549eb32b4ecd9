/**
 * Joint travel-time inversion (src/core/velocity/joint.ts) against analytic results:
 * - noise-free times traced by Snell's law through a known layered model (T(p), X(p) of any seismology
 *   text, e.g. Shearer, Introduction to Seismology, ch. 4) must give the model back exactly;
 * - with straight vertical rays the problem is linear and Gaussian, so the posterior covariance must
 *   equal (G^T W G)^-1 (any regression text; Tarantola 2005, Inverse Problem Theory, ch. 3, from memory),
 *   computed here independently by Gauss-Jordan elimination; and for one cell seen by times t_i = h_i s
 *   of sd sigma, var(s) = sigma^2 / sum h_i^2 [calc].
 */
import { describe, expect, it } from 'vitest';
import { layeredRay, type VelocityLayer } from '../../src/core/survey/rays';
import { pathsPerLayer } from '../../src/core/velocity/layering';
import { cellWeights, type JointCell, type JointDatum, linearTime, solveJoint } from '../../src/core/velocity/joint';
import { choleskyLower, siteUncertainty } from '../../src/core/site/montecarlo';
import { jointMethod } from '../../src/core/velocity/joint';
import { isOnsetPick } from '../../src/core/catalogue/methods';
import { autoPick, derive, prepare } from '../../src/core/pipeline';
import { defaultSettings, emptyEdits } from '../../src/core/settings';
import { demoCrossholeHoles, synthesizeSurvey, type EarthModel, type SynthGeometry } from '../../src/core/synth';

const OFFSET_M = 2;

/** Gauss-Jordan inverse of a small dense matrix (independent of the solver's Cholesky). */
function inverse(a: number[][]): number[][] {
  const n = a.length;
  const m = a.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
    [m[c], m[p]] = [m[p], m[c]];
    const d = m[c][c];
    for (let j = 0; j < 2 * n; j++) m[c][j] /= d;
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = m[r][c];
      for (let j = 0; j < 2 * n; j++) m[r][j] -= f * m[c][j];
    }
  }
  return m.map((row) => row.slice(n));
}

describe('joint inversion: noise-free refracted rays', () => {
  it('recovers a three-layer model (170 / 130 / 330 m/s, boundaries 5.4 and 11.7 m) and a 0.3 ms intercept exactly', () => {
    const model: VelocityLayer[] = [
      { topM: 0, velocityMps: 170 },
      { topM: 5.4, velocityMps: 130 },
      { topM: 11.7, velocityMps: 330 },
    ];
    const depths = Array.from({ length: 18 }, (_, i) => i + 1);
    // cells between receiver depths, split at the layer boundaries, each tied to its layer
    const tops = [...new Set([0, ...depths.slice(0, -1), 5.4, 11.7])].sort((a, b) => a - b);
    const cells: JointCell[] = tops.map((t, k) => {
      const bottom = k + 1 < tops.length ? tops[k + 1] : 18;
      const mid = (t + bottom) / 2;
      return { topM: t, bottomM: bottom, layer: mid < 5.4 ? 0 : mid < 11.7 ? 1 : 2 };
    });
    const paths = (z: number) => (s: Float64Array) =>
      pathsPerLayer(
        tops.map((t, k) => ({ topM: t, velocityMps: 1 / s[k] })),
        0,
        z,
        OFFSET_M,
      );
    const data: JointDatum[] = [];
    depths.forEach((z, h) => {
      data.push({
        paths: paths(z),
        hitPlus: h,
        hitMinus: null,
        intercept: true,
        timeS: layeredRay(model, 0, z, OFFSET_M).timeS + 3e-4,
        sdS: 2e-4,
      });
      if (h > 0)
        data.push({
          paths: (s) => {
            const b = paths(z)(s);
            const a = paths(depths[h - 1])(s);
            return b.map((x, i) => x - a[i]);
          },
          hitPlus: h,
          hitMinus: h - 1,
          intercept: false,
          timeS: layeredRay(model, 0, z, OFFSET_M).timeS - layeredRay(model, 0, depths[h - 1], OFFSET_M).timeS,
          sdS: 5e-5,
        });
    });
    const r = solveJoint({
      cells,
      layerCount: 3,
      hitCount: depths.length,
      data,
      triggerOffsetSdS: 1.4e-4,
      cellSdShare: 0.05,
      startSlownessSpM: 1 / 200,
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const sol = r.solution;
    const vOf = (mid: number) => (mid < 5.4 ? 170 : mid < 11.7 ? 130 : 330);
    cells.forEach((c, k) => {
      expect(1 / sol.params[k]).toBeCloseTo(vOf((c.topM + c.bottomM) / 2), 6);
    });
    [170, 130, 330].forEach((v, j) => {
      expect(1 / sol.params[sol.layerAt + j]).toBeCloseTo(v, 6);
    });
    expect(sol.params[sol.interceptAt] * 1000).toBeCloseTo(0.3, 8);
    for (let h = 0; h < depths.length; h++) expect(Math.abs(sol.params[sol.hitAt + h])).toBeLessThan(1e-11);
    expect(sol.chi2).toBeLessThan(1e-12);
    // the interval 5-6 m holds the 5.4 m boundary: its Vs is 1 m over the vertical time 0.4/170 + 0.6/130
    const w = cellWeights(cells, 5, 6);
    const t = linearTime(sol, w).t;
    expect(1 / t).toBeCloseTo(1 / (0.4 / 170 + 0.6 / 130), 6);
  });
});

describe('joint inversion: linear-Gaussian covariance', () => {
  it('equals (G^T W G)^-1 for vertical rays with trigger-offset priors (onsets and delays)', () => {
    // three free cells 0-1, 1-2, 2-3 m; onsets at 1, 2, 3 m (sd 0.2 ms) and delays 1-2, 2-3 m (sd 0.05 ms)
    const cells: JointCell[] = [
      { topM: 0, bottomM: 1, layer: null },
      { topM: 1, bottomM: 2, layer: null },
      { topM: 2, bottomM: 3, layer: null },
    ];
    const s = [1 / 150, 1 / 200, 1 / 260];
    const cum = (z: number) => [Math.min(z, 1), Math.max(0, Math.min(z, 2) - 1), Math.max(0, Math.min(z, 3) - 2)];
    const data: JointDatum[] = [];
    const g: number[][] = [];
    const w: number[] = [];
    const trig = 1.4e-4;
    // parameters: s0 s1 s2 e0 e1 e2 (no intercept: with vertical rays it could not be told from the first cell)
    [1, 2, 3].forEach((z, h) => {
      const p = cum(z);
      data.push({
        paths: () => p,
        hitPlus: h,
        hitMinus: null,
        intercept: false,
        timeS: p[0] * s[0] + p[1] * s[1] + p[2] * s[2],
        sdS: 2e-4,
      });
      g.push([...p, ...[0, 1, 2].map((k) => (k === h ? 1 : 0))]);
      w.push(1 / 2e-4 ** 2);
    });
    [2, 3].forEach((z, i) => {
      const p = cum(z).map((x, k) => x - cum(z - 1)[k]);
      data.push({
        paths: () => p,
        hitPlus: i + 1,
        hitMinus: i,
        intercept: false,
        timeS: p[0] * s[0] + p[1] * s[1] + p[2] * s[2],
        sdS: 5e-5,
      });
      g.push([...p, ...[0, 1, 2].map((k) => (k === i + 1 ? 1 : k === i ? -1 : 0))]);
      w.push(1 / 5e-5 ** 2);
    });
    for (let h = 0; h < 3; h++) {
      g.push([0, 0, 0, ...[0, 1, 2].map((k) => (k === h ? 1 : 0))]);
      w.push(1 / trig ** 2);
    }
    const n = 6;
    const gtwg = Array.from({ length: n }, (_, a) =>
      Array.from({ length: n }, (_, b) => g.reduce((acc, row, i) => acc + w[i] * row[a] * row[b], 0)),
    );
    const expected = inverse(gtwg);
    const r = solveJoint({
      cells,
      layerCount: 0,
      hitCount: 3,
      data,
      triggerOffsetSdS: trig,
      cellSdShare: 0,
      startSlownessSpM: 1 / 200,
      birge: false,
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    for (let a = 0; a < n; a++)
      for (let b = 0; b < n; b++) {
        const got = r.solution.covariance[a * n + b];
        const want = expected[a][b];
        expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-6 * Math.sqrt(expected[a][a] * expected[b][b]));
      }
    s.forEach((x, k) => expect(r.solution.params[k]).toBeCloseTo(x, 10));
  });

  it('one cell seen by t_i = h_i s with sd 0.1 ms at h = 1, 2, 3 m: var(s) = sigma^2 / 14 [calc]', () => {
    const data: JointDatum[] = [1, 2, 3].map((h) => ({
      paths: () => [h],
      hitPlus: null,
      hitMinus: null,
      intercept: false,
      timeS: h / 250,
      sdS: 1e-4,
    }));
    const r = solveJoint({
      cells: [{ topM: 0, bottomM: 3, layer: null }],
      layerCount: 0,
      hitCount: 0,
      data,
      triggerOffsetSdS: 0,
      cellSdShare: 0,
      startSlownessSpM: 1 / 100,
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(1 / r.solution.params[0]).toBeCloseTo(250, 8);
    expect(r.solution.covariance[0]).toBeCloseTo(1e-8 / 14, 20);
  });

  it('says why when a cell is crossed by no ray and tied to no layer', () => {
    const r = solveJoint({
      cells: [
        { topM: 0, bottomM: 1, layer: null },
        { topM: 1, bottomM: 2, layer: null },
      ],
      layerCount: 0,
      hitCount: 0,
      data: [1, 2].map(() => ({
        paths: () => [1, 0],
        hitPlus: null,
        hitMinus: null,
        intercept: false,
        timeS: 0.005,
        sdS: 1e-4,
      })),
      triggerOffsetSdS: 0,
      cellSdShare: 0,
      startSlownessSpM: 1 / 200,
    });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/not constrained/);
  });
});

describe('Vs30 Monte Carlo with correlated intervals', () => {
  it('Cholesky factor of [[4, 2], [2, 3]] is [[2, 0], [1, sqrt 2]] [calc]', () => {
    const l = choleskyLower([4, 2, 2, 3], 2);
    expect([...l].map((x) => Math.round(x * 1e12) / 1e12)).toEqual([2, 0, 1, Math.round(Math.SQRT2 * 1e12) / 1e12]);
  });

  it('two 15 m intervals at 200 +- 10 m/s: P95 - P05 of Vs30 is 2 x 1.645 x 7.07 independent, x 10 fully correlated [calc, first order]', () => {
    const ivs = [
      { topM: 0, bottomM: 15, vsMps: 200, vsSdMps: 10 },
      { topM: 15, bottomM: 30, vsMps: 200, vsSdMps: 10 },
    ];
    const base = { draws: 40000, seed: 3, toDepthM: 30, rule: 'extend-deepest' as const, answers: {} };
    const ind = siteUncertainty(ivs, base);
    const cor = siteUncertainty(ivs, {
      ...base,
      correlation: { spans: ivs.map(({ topM, bottomM }) => ({ topM, bottomM })), matrix: [1, 1, 1, 1] },
    });
    // dVs30/dv_i = 0.5 at equal velocities: sd 0.5 x 10 x sqrt 2 = 7.07 (independent), 10 (correlated)
    expect(ind.vs30P95Mps - ind.vs30P05Mps).toBeCloseTo(2 * 1.645 * 7.071, -0.2);
    expect(cor.vs30P95Mps - cor.vs30P05Mps).toBeCloseTo(2 * 1.645 * 10, -0.2);
  });
});

describe('joint inversion on forward-model surveys with missing measures', () => {
  // A uniform 250 m/s soil (invented; the forward model of src/core/synth): every interval of the joint
  // fit must come back near 250 m/s, and a pair with neither a delay nor an onset must be left out
  // rather than stop the fit.
  const soil: EarthModel = {
    name: 'uniform soil',
    layers: [
      {
        name: 'soil',
        topM: 0,
        thicknessM: Infinity,
        vsMps: 250,
        vpMps: 500,
        unitWeightKnM3: 18,
        qS: 30,
        qP: 60,
        behaviour: 'sand-like',
      },
    ],
    waterTableM: null,
  };
  const run = (geometry: SynthGeometry, crosshole: boolean) => {
    const res = synthesizeSurvey(soil, geometry, {
      seed: 5,
      attenuation: true,
      snr: 40,
      maxTriggerDelayS: 3e-4,
      pToSRatio: 0.2,
      ...(crosshole
        ? {
            sampleIntervalS: 2.5e-5,
            samplesPerTrace: 3072,
            firstSampleS: -0.001,
            sFrequencyHz: 300,
            pFrequencyHz: 1500,
          }
        : { sampleIntervalS: 1e-4, samplesPerTrace: 4096, sFrequencyHz: 100, pFrequencyHz: 400 }),
    });
    const settings = defaultSettings();
    const prep = prepare(res.survey, new Map(res.records.map((r) => [r.id, r])), settings);
    const d = derive(res.survey, prep, autoPick(prep, settings), emptyEdits(), settings, { monteCarlo: false });
    return { res, prep, d, settings };
  };

  for (const crosshole of [true, false])
    it(`${crosshole ? 'crosshole' : 'one-receiver downhole'}: one station's measures removed, the other intervals within 2.5 sd of 250 m/s, median within 3%`, () => {
      const { res, prep, d, settings } = run(
        crosshole
          ? { kind: 'crosshole', holes: demoCrossholeHoles(), depthsM: [2, 3, 4, 5, 6, 7, 8] }
          : { kind: 'downhole', holeId: 'DH1', depthsM: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10], sourceOffsetM: 2 },
        crosshole,
      );
      const sPairs = prep.pairs.filter((p) => p.wave === 'S');
      // the deepest pair loses its delay and the onsets of its far station (and the near one for crosshole)
      const lost = sPairs[sPairs.length - 1];
      const gone = new Set([lost.b.key, ...(crosshole ? [lost.a.key] : [])]);
      const picks = d.picks.filter((p) => !gone.has(p.stationKey));
      const delays = d.delays.filter((x) => x.pairKey !== lost.key);
      const j = jointMethod(
        res.survey.kind,
        res.survey.sourceDepthM,
        prep.pairs,
        picks,
        delays,
        d.layering.fit,
        { triggerOffsetSdS: settings.intervals.triggerOffsetSdS },
        isOnsetPick,
      );
      expect(j.reason).toBeNull();
      expect(j.byPair.has(lost.key)).toBe(false);
      expect(j.byPair.size).toBe(sPairs.length - 1);
      const errs: number[] = [];
      for (const v of j.byPair.values()) {
        expect(v.sdMps).toBeGreaterThan(0);
        // every interval within 2.5 of its own sd (the sd is calibrated: bench, 93-97% within 2 sd)
        expect(Math.abs(v.velocityMps - 250)).toBeLessThan(2.5 * v.sdMps);
        errs.push(Math.abs(v.velocityMps - 250) / 250);
      }
      errs.sort((a, b) => a - b);
      expect(errs[Math.floor(errs.length / 2)]).toBeLessThan(0.03);
    });
});

describe('joint layers on the calibrated sd scale (docs/project-format.md: site.json jointInversion)', () => {
  // contract: a layer's sd and an interval's sd of the joint method carry one calibration, the kind's
  // scale for method 'joint' (src/core/velocity/sdCalibration.ts, tuned on the bank's training seeds)
  it('multiplies every layer sd by the kind scale and leaves Vs alone', async () => {
    const { calibratedJointLayers } = await import('../../src/core/pipeline');
    const { sdScale } = await import('../../src/core/velocity/sdCalibration');
    const layers = [
      { topM: 0, bottomM: 5, vsMps: 180, vsSdMps: 4 },
      { topM: 5, bottomM: 12, vsMps: 260, vsSdMps: 6 },
    ];
    for (const kind of ['downhole', 'downhole-pair', 'seismic-cone'] as const) {
      const out = calibratedJointLayers(kind, layers);
      expect(out.map((l) => l.vsMps)).toEqual([180, 260]);
      expect(out[0].vsSdMps).toBeCloseTo(4 * sdScale(kind, 'joint'), 12);
      expect(out[1].vsSdMps).toBeCloseTo(6 * sdScale(kind, 'joint'), 12);
    }
    // the cone's joint scale is not 1, so the layer sd does change there
    expect(calibratedJointLayers('seismic-cone', layers)[0].vsSdMps).not.toBeCloseTo(4, 3);
  });
});
