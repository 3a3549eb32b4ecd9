/**
 * Calibration machinery of interval sds (src/core/velocity/sdCalibration.ts) and the error-model terms
 * (src/core/velocity/errorModel.ts). The shares are checked on synthetic errors of KNOWN distribution,
 * so the machinery cannot pass by itself: the standard normal gives P(|Z| <= 1) = 0.6827 and
 * P(|Z| <= 2) = 0.9545 (any table of the normal distribution, e.g. Abramowitz & Stegun 1964, table 26.1);
 * a wrong sd (half or twice the true one) must fall outside the 60-80% / 90-99% band.
 */
import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../../src/core/random';
import type { PairDelay, Pick } from '../../src/core/model';
import type { Station } from '../../src/core/survey/stations';
import type { StationPair } from '../../src/core/velocity/intervals';
import { layerObservations } from '../../src/core/velocity/layerMethod';
import { hitCount, pathModelShare, triggerTermS } from '../../src/core/velocity/errorModel';
import { type LayeredFit, layerIntervalVs, localMisfitSlownessSd } from '../../src/core/velocity/layering';
import { calibrationScale, withinShare } from '../../src/core/velocity/sdCalibration';

const N = 20000;

function gaussianRows(trueSd: number, statedSd: number, seed: number) {
  const rng = mulberry32(seed);
  return Array.from({ length: N }, () => ({ errorMps: trueSd * rng.normal(), sdMps: statedSd }));
}

describe('coverage of stated sds', () => {
  it('Gaussian errors with the stated sd: 68.3% within 1 sd, 95.4% within 2 sd (+-1% at n = 20000)', () => {
    const rows = gaussianRows(5, 5, 7);
    expect(withinShare(rows, 1)!).toBeCloseTo(0.6827, 1);
    expect(Math.abs(withinShare(rows, 1)! - 0.6827)).toBeLessThan(0.01);
    expect(Math.abs(withinShare(rows, 2)! - 0.9545)).toBeLessThan(0.006);
  });

  it('an sd stated at half the true one fails the band (38.3% / 68.3%), twice the true one too (95.4% within 1 sd)', () => {
    const narrow = gaussianRows(5, 2.5, 8);
    expect(Math.abs(withinShare(narrow, 1)! - 0.3829)).toBeLessThan(0.012);
    expect(Math.abs(withinShare(narrow, 2)! - 0.6827)).toBeLessThan(0.012);
    const wide = gaussianRows(5, 10, 9);
    expect(withinShare(wide, 1)!).toBeGreaterThan(0.94);
  });

  it('rows without an sd are left out, never counted as covered', () => {
    expect(withinShare([{ errorMps: 1, sdMps: null }], 1)).toBeNull();
    expect(
      withinShare(
        [
          { errorMps: 3, sdMps: 1 },
          { errorMps: 0, sdMps: 0 },
        ],
        2,
      ),
    ).toBe(0);
  });
});

describe('the tuning rule (half the 95% quantile of |error| / sd, kept between its 68% and 75% quantiles, never below half its 90% quantile)', () => {
  it('a light tail (|z| uniform on 0-1, analytic quantiles q = p): half the 95% point (0.475) is below the 68% point, so the scale is 0.68 and 1 sd holds 68%, as a Gaussian (normal table: 68.3%)', () => {
    const z = Array.from({ length: 10001 }, (_, i) => i / 10000);
    const s = calibrationScale(z)!;
    expect(Math.abs(s - 0.68)).toBeLessThan(1e-9);
    const rows = z.map((e) => ({ errorMps: e, sdMps: s }));
    expect(Math.abs(withinShare(rows, 1)! - 0.68)).toBeLessThan(0.001);
    expect(withinShare(rows, 2)).toBe(1);
  });

  it('Gaussian errors twice the stated sd ask for a scale of 1.96 (the normal 97.5% point) and then cover 67.3% / 95.0%', () => {
    const rows = gaussianRows(2, 1, 11);
    const s = calibrationScale(rows.map((r) => Math.abs(r.errorMps) / r.sdMps))!;
    expect(Math.abs(s - 1.96)).toBeLessThan(0.05);
    const scaled = gaussianRows(2, s, 12);
    // scaled sd 1.96 against a true 2: P(|Z| <= 0.98) = 0.6729, P(|Z| <= 1.96) = 0.9500 (normal table)
    expect(Math.abs(withinShare(scaled, 1)! - 0.6729)).toBeLessThan(0.015);
    expect(Math.abs(withinShare(scaled, 2)! - 0.95)).toBeLessThan(0.01);
  });

  it('heavy tails (Student t, 3 degrees of freedom): the 1-sd share is held at 75%, 2 sd then covers over 92%', () => {
    // t3 = Z / sqrt(chi2_3 / 3); closed-form cdf F(t) = 1/2 + (u / (1 + u^2) + atan u) / pi, u = t / sqrt 3
    // (Student t with 3 degrees of freedom, e.g. Johnson, Kotz & Balakrishnan, Continuous Univariate
    // Distributions 2, ch. 28, from memory); the 75% point of |t3| solves F(t) = 0.875
    const rng = mulberry32(21);
    const z = Array.from({ length: N }, () => {
      const chi = rng.normal() ** 2 + rng.normal() ** 2 + rng.normal() ** 2;
      return Math.abs(rng.normal() / Math.sqrt(chi / 3));
    });
    const s = calibrationScale(z)!;
    const cdf = (t: number) => {
      const u = t / Math.sqrt(3);
      return 0.5 + (u / (1 + u * u) + Math.atan(u)) / Math.PI;
    };
    let lo = 0;
    let hi = 10;
    for (let i = 0; i < 60; i++) [lo, hi] = cdf((lo + hi) / 2) < 0.875 ? [(lo + hi) / 2, hi] : [lo, (lo + hi) / 2];
    expect(Math.abs(s - lo)).toBeLessThan(0.04);
    // and 2 sd then covers 2 F(2 s) - 1 of the t3 errors
    expect(
      Math.abs(
        withinShare(
          z.map((e) => ({ errorMps: e, sdMps: s })),
          2,
        )! -
          (2 * cdf(2 * lo) - 1),
      ),
    ).toBeLessThan(0.01);
    const rows = z.map((e) => ({ errorMps: e, sdMps: s }));
    expect(Math.abs(withinShare(rows, 1)! - 0.75)).toBeLessThan(0.005);
    expect(withinShare(rows, 2)!).toBeGreaterThan(0.92);
  });

  it('a tail no single scale can fit (80% of |z| uniform on 0-0.1, 20% uniform on 1-11): 90% within 2 sd wins over the 1-sd band', () => {
    // analytic quantiles of the mixture: q75 = 0.75 / 0.8 x 0.1 = 0.094; q90 = 1 + (0.90 - 0.8) / 0.2 x 10 = 6,
    // so half of q90 (3) is above q75 and the scale is 3: 2 sd = 6 covers exactly 90%, 1 sd (3) 0.8 + 0.2 x 2/10 = 84%
    const z = Array.from({ length: 100000 }, (_, i) =>
      i < 80000 ? (0.1 * (i + 0.5)) / 80000 : 1 + (10 * (i - 80000 + 0.5)) / 20000,
    );
    const s = calibrationScale(z)!;
    expect(Math.abs(s - 3)).toBeLessThan(0.01);
    const rows = z.map((e) => ({ errorMps: e, sdMps: s }));
    expect(Math.abs(withinShare(rows, 2)! - 0.9)).toBeLessThan(0.001);
    expect(Math.abs(withinShare(rows, 1)! - 0.84)).toBeLessThan(0.001);
  });

  it('too few errors give no scale', () => {
    expect(calibrationScale([1, 2, 3])).toBeNull();
  });
});

function station(depthM: number, offsetM: number, records: string[]): Station {
  return {
    receiverPos: [0, 0, depthM],
    sourcePos: [offsetM, 0, 0],
    straightPathM: Math.hypot(offsetM, depthM),
    hits: records.map((recordId) => ({ recordId, channel: 1, hit: 'left' as const })),
  } as unknown as Station;
}

describe('error-model terms', () => {
  it('trigger offsets: sd_trig sqrt(1/nA + 1/nB) for one receiver per hit, none within one hit', () => {
    const a = station(3, 2, ['a1', 'a2']);
    const b = station(4, 2, ['b1']);
    expect(hitCount(a)).toBe(2);
    expect(triggerTermS('pseudo', a, b, 1.4e-4)).toBeCloseTo(1.4e-4 * Math.sqrt(1.5), 12);
    expect(triggerTermS('true', a, b, 1.4e-4)).toBe(0);
    expect(triggerTermS('crosshole', a, b, 1.4e-4)).toBe(0);
  });

  it('straight-path model: |1 - dL/dz| (offset 2.25 m, 3 -> 4 m: 1 - (4.5895 - 3.75) = 0.1605; analytic)', () => {
    const a = station(3, 2.25, ['a']);
    const b = station(4, 2.25, ['b']);
    expect(pathModelShare('pseudo', a, b)).toBeCloseTo(1 - (Math.hypot(2.25, 4) - 3.75), 12);
    expect(pathModelShare('pseudo', a, b)).toBeCloseTo(0.1605, 3);
    // deep intervals tend to the vertical path: the term vanishes
    expect(pathModelShare('pseudo', station(30, 2.25, ['a']), station(31, 2.25, ['b']))).toBeLessThan(0.003);
    expect(pathModelShare('crosshole', a, b)).toBe(0);
  });
});

describe('local misfit of the layered fit (layering.ts localMisfitSlownessSd)', () => {
  const depths = [1, 2, 3, 4, 5, 6, 7, 8];
  const abs = depths.map((z) => ({ depthAM: null, depthBM: z, offsetM: 2, timeS: 0, sdS: 1e-6 }));
  it('residuals drifting by 0.2 ms/m about an interval give a slowness sd of 2e-4 s/m (least-squares slope, analytic)', () => {
    const res = depths.map((z) => 2e-4 * z);
    expect(localMisfitSlownessSd(abs, res, 4, 5, 1)).toBeCloseTo(2e-4, 6);
  });
  it('flat residuals, or a drift within what the times sds explain, give 0', () => {
    expect(
      localMisfitSlownessSd(
        abs,
        depths.map(() => 3e-4),
        4,
        5,
        1,
      ),
    ).toBe(0);
    const noisy = abs.map((o) => ({ ...o, sdS: 1e-3 }));
    expect(
      localMisfitSlownessSd(
        noisy,
        depths.map((z) => 1e-5 * z),
        4,
        5,
        1,
      ),
    ).toBe(0);
  });
  it('two-receiver differences: summed residual over summed length (0.1 ms on each 1 m -> 1e-4 s/m)', () => {
    const diff = depths.map((z) => ({ depthAM: z, depthBM: z + 1, offsetM: 2, timeS: 0, sdS: 1e-6 }));
    expect(
      localMisfitSlownessSd(
        diff,
        depths.map(() => 1e-4),
        4,
        5,
        1,
      ),
    ).toBeCloseTo(1e-4, 6);
  });
});

describe('one-receiver travel times for the layered fit (layerMethod.ts layerObservations)', () => {
  // three stations 1, 2, 3 m, offset 2 m; onsets 10.0, 14.0, 18.5 ms; delay 1->2 missing, 2->3 4.4 ms
  const st = (z: number) =>
    ({
      key: `r0@${z}`,
      receiverPos: [0, 0, z],
      sourcePos: [2, 0, 0],
      straightPathM: Math.hypot(2, z),
    }) as unknown as Station;
  const s1 = st(1);
  const s2 = st(2);
  const s3 = st(3);
  const pair = (a: Station, b: Station) =>
    ({ key: `S|${a.key}|${b.key}`, wave: 'S', kind: 'pseudo', a, b, topM: 0, bottomM: 0 }) as unknown as StationPair;
  const onset = (timeS: number) => ({ timeS }) as unknown as Pick;
  const onsets = new Map([
    [s1.key as string, onset(0.01)],
    [s2.key as string, onset(0.014)],
    [s3.key as string, onset(0.0185)],
  ]);
  const p12 = pair(s1, s2);
  const p23 = pair(s2, s3);
  it('a missing delay restarts the chain from the next onset instead of dropping every deeper time', () => {
    const delays = new Map([[p23.key, { delayS: 0.0044, uncertaintyS: 1e-5 } as unknown as PairDelay]]);
    const obs = layerObservations('downhole', [p12, p23], onsets, delays, 1.4e-4);
    expect(obs.map((o) => o.depthBM)).toEqual([1, 2, 3]);
    expect(obs[1].timeS).toBeCloseTo(0.014, 12);
    expect(obs[2].timeS).toBeCloseTo(0.0184, 12);
  });
});

describe("a fitted boundary's position in the layer-model sd (layering.ts layerIntervalVs)", () => {
  // two layers 200 / 400 m/s, boundary at 5 m with sd 0.1 m, no slowness covariance: the sd is the
  // boundary term alone, ds * rms(length that changes sides), ds = 1/200 - 1/400 = 2.5 ms/m (analytic)
  const fit = {
    layers: [
      { topM: 0, bottomM: 5, vsMps: 200, vsSdMps: 0, receivers: 5 },
      { topM: 5, bottomM: 10, vsMps: 400, vsSdMps: 0, receivers: 5 },
    ],
    slownessCovariance: [0, 0, 0, 0],
    boundarySdM: [0.1],
  } as unknown as LayeredFit;
  it('an interval that holds the boundary: sd_T = ds * 0.1 m; 4.5-5.5 m, T = 3.75 ms -> 17.8 m/s', () => {
    const r = layerIntervalVs(fit, 4.5, 5.5);
    expect(r.vsMps).toBeCloseTo(1 / 0.00375, 9);
    expect(r.vsSdMps).toBeCloseTo((0.0025 * 0.1) / 0.00375 ** 2, 1);
  });
  it('the interval just above it (4-5 m): half the boundary spread falls inside, sd_T = ds * 0.1 / sqrt 2 -> 7.07 m/s', () => {
    const r = layerIntervalVs(fit, 4, 5);
    expect(Math.abs(r.vsSdMps - (0.0025 * 0.1) / Math.SQRT2 / 0.005 ** 2)).toBeLessThan(0.15);
  });
  it('far from the boundary nothing is added, and a wider boundary sd (scale 2) widens the neighbour', () => {
    expect(layerIntervalVs(fit, 2, 3).vsSdMps).toBe(0);
    expect(layerIntervalVs(fit, 4, 5, 2).vsSdMps).toBeCloseTo(2 * layerIntervalVs(fit, 4, 5).vsSdMps, 1);
  });
});
