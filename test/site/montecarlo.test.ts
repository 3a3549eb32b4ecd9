import { describe, expect, it } from 'vitest';
import { quantileSorted, siteUncertainty } from '../../src/core/site/montecarlo';
import { mulberry32 } from '../../src/core/random';
import { timeAveragedVs } from '../../src/core/site/classes';

/**
 * Closed form: one layer 0-30 m with Vs ~ N(mu, sd) has Vs30 = Vs, so the 5 % and 95 % points are
 * mu -/+ 1.6449 sd and each class probability is Phi(upper) - Phi(lower) of the class's bounds.
 * Reference values from scipy 1.x (python3-scipy): scipy.stats.norm.cdf / ppf / pdf with mu = 300, sd = 40.
 * Sampling error with N = 10,000 draws: proportion SE = sqrt(p(1-p)/N); quantile SE = sqrt(p(1-p)/N) / f(x_p)
 * with f the normal density (asymptotic order-statistic variance, any statistics text). Tolerance 4 SE.
 */
const mu = 300;
const sd = 40;
const N = 10000;
const one = [{ topM: 0, bottomM: 30, vsMps: mu, vsSdMps: sd }];
const opts = { draws: N, seed: 20261201, toDepthM: 30, rule: 'no-extrapolation' as const, answers: {} };

const seProportion = (p: number) => Math.sqrt((p * (1 - p)) / N);
// f(x_p) = phi(z_p) / sd; phi(1.6449) = 0.1031356 and phi(0) = 0.3989423 (scipy.stats.norm.pdf)
const seQuantile = (p: number, phiZ: number) => Math.sqrt((p * (1 - p)) / N) / (phiZ / sd);

describe('Monte Carlo against the closed form (one layer)', () => {
  const u = siteUncertainty(one, opts);
  it('P05 = mu - 1.6449 sd = 234.206 m/s, P95 = 365.794 m/s, P50 = 300 m/s (scipy.stats.norm.ppf), within 4 SE', () => {
    expect(Math.abs(u.vs30P05Mps - 234.20585)).toBeLessThan(4 * seQuantile(0.05, 0.1031356));
    expect(Math.abs(u.vs30P95Mps - 365.79415)).toBeLessThan(4 * seQuantile(0.05, 0.1031356));
    expect(Math.abs(u.vs30P50Mps - 300)).toBeLessThan(4 * seQuantile(0.5, 0.3989423));
  });
  it('ASCE 7-16 (bounds 600 and 1200 ft/s = 182.88 and 365.76 m/s): P(D) = 0.948206, P(C) = 0.050088 (scipy.stats.norm.cdf)', () => {
    const p = u.classProbabilities.asce7_16;
    expect(Math.abs((p.D ?? 0) - 0.948206)).toBeLessThan(4 * seProportion(0.948206));
    expect(Math.abs((p.C ?? 0) - 0.050088)).toBeLessThan(4 * seProportion(0.050088));
  });
  it('ASCE 7-22: P(CD) = 0.452048, P(D) = 0.532603, P(DE) = 0.015043 (scipy.stats.norm.cdf)', () => {
    const p = u.classProbabilities.asce7_22;
    expect(Math.abs((p.CD ?? 0) - 0.452048)).toBeLessThan(4 * seProportion(0.452048));
    expect(Math.abs((p.D ?? 0) - 0.532603)).toBeLessThan(4 * seProportion(0.532603));
    expect(Math.abs((p.DE ?? 0) - 0.015043)).toBeLessThan(4 * seProportion(0.015043));
  });
  it('EN 1998-1 (180 and 360 m/s): P(B) = 0.066807, P(C) = 0.931843 (scipy.stats.norm.cdf)', () => {
    const p = u.classProbabilities.en1998_1_2004;
    expect(Math.abs((p.B ?? 0) - 0.066807)).toBeLessThan(4 * seProportion(0.066807));
    expect(Math.abs((p.C ?? 0) - 0.931843)).toBeLessThan(4 * seProportion(0.931843));
  });
  it('probabilities of each standard sum to 1', () => {
    for (const probs of Object.values(u.classProbabilities)) {
      expect(Object.values(probs).reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    }
  });
});

describe('reproducibility and special cases', () => {
  it('the same seed gives identical results; another seed gives different draws', () => {
    expect(siteUncertainty(one, opts)).toEqual(siteUncertainty(one, opts));
    expect(siteUncertainty(one, { ...opts, seed: 7 }).vs30P05Mps).not.toBe(siteUncertainty(one, opts).vs30P05Mps);
  });
  it('zero uncertainty: every percentile equals the deterministic Vs30 (270.68 m/s, docs/methods.md) and class probability 1', () => {
    const ivs = [
      { topM: 0, bottomM: 5, vsMps: 150, vsSdMps: 0 },
      { topM: 5, bottomM: 15, vsMps: 250, vsSdMps: 0 },
      { topM: 15, bottomM: 30, vsMps: 400, vsSdMps: 0 },
    ];
    const u = siteUncertainty(ivs, { ...opts, draws: 100 });
    const det = timeAveragedVs(ivs, 30, 'no-extrapolation')!.vsMps;
    expect(u.vs30P05Mps).toBeCloseTo(det, 10);
    expect(u.vs30P95Mps).toBeCloseTo(det, 10);
    expect(u.classProbabilities.asce7_16).toEqual({ D: 1 });
    expect(u.classProbabilities.en1998_1_2004).toEqual({ C: 1 });
  });
  it('a "yes" answer moves the whole probability to that class (liquefiable -> F)', () => {
    const u = siteUncertainty(one, { ...opts, draws: 500, answers: { asce_unstable: true } });
    expect(u.classProbabilities.asce7_16).toEqual({ F: 1 });
    expect(u.classProbabilities.en1998_1_2004.F).toBeUndefined();
  });
  it('generators: uniform mean 1/2 and variance 1/12; normal mean 0 and variance 1 (within 4 SE over 100,000 draws)', () => {
    const n = 100000;
    const uni = mulberry32(1).uniform;
    let s = 0,
      s2 = 0;
    for (let i = 0; i < n; i++) {
      const x = uni();
      expect(x >= 0 && x < 1).toBe(true);
      s += x;
      s2 += x * x;
    }
    expect(Math.abs(s / n - 0.5)).toBeLessThan(4 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(s2 / n - (s / n) ** 2 - 1 / 12)).toBeLessThan(4 * Math.sqrt(1 / 180 / n));
    const g = mulberry32(2).normal;
    let m = 0,
      m2 = 0;
    for (let i = 0; i < n; i++) {
      const z = g();
      m += z;
      m2 += z * z;
    }
    expect(Math.abs(m / n)).toBeLessThan(4 / Math.sqrt(n));
    expect(Math.abs(m2 / n - 1)).toBeLessThan(4 * Math.sqrt(2 / n));
  });
  it('quantile with linear interpolation (Hyndman & Fan 1996 type 7, numpy default): [1,2,3,4] at 0.5 -> 2.5, at 0.05 -> 1.15', () => {
    expect(quantileSorted([1, 2, 3, 4], 0.5)).toBe(2.5);
    expect(quantileSorted([1, 2, 3, 4], 0.05)).toBeCloseTo(1.15, 12);
  });
});
