/**
 * The layer model's interval Vs over several automatic layerings (velocity/layerMethod.ts
 * ensembleIntervalVs): the mean of the slownesses (a travel-time average: the harmonic mean of the
 * velocities, any statistics text) and their spread carried to velocity by the first-order rule
 * sd(1/s) = sd(s) / s^2 (the delta method, any statistics text).
 */
import { describe, expect, it } from 'vitest';
import { ensembleIntervalVs } from '../../src/core/velocity/layerMethod';
import type { LayeredFit } from '../../src/core/velocity/layering';

function layering(layers: { topM: number; vsMps: number }[], deepestM = 20): LayeredFit {
  const m = layers.length;
  return {
    layers: layers.map((l, j) => ({
      topM: l.topM,
      bottomM: j + 1 < m ? layers[j + 1].topM : deepestM,
      vsMps: l.vsMps,
      vsSdMps: 0,
      receivers: 1,
    })),
    slownessCovariance: new Array(m * m).fill(0),
    boundarySdM: new Array(Math.max(0, m - 1)).fill(0),
    interceptS: null,
    chi2: 0,
    dof: 1,
    rmsMisfitS: 0,
    residualsS: [],
    bic: 0,
    notes: [],
  };
}

describe('an interval over several layerings', () => {
  it('200 and 250 m/s: harmonic mean 222.2 m/s, spread 0.0005 / 0.0045^2 = 24.69 m/s', () => {
    const r = ensembleIntervalVs([layering([{ topM: 0, vsMps: 200 }]), layering([{ topM: 0, vsMps: 250 }])], 5, 6);
    expect(r.vsMps).toBeCloseTo(2 / (1 / 200 + 1 / 250), 6);
    expect(r.vsMps).toBeCloseTo(222.22, 2);
    expect(r.spreadMps).toBeCloseTo(24.69, 2);
  });

  it('layerings that agree give their own Vs and no spread', () => {
    const a = layering([
      { topM: 0, vsMps: 180 },
      { topM: 7.3, vsMps: 320 },
    ]);
    const r = ensembleIntervalVs([a, a, a], 8, 9);
    expect(r.vsMps).toBeCloseTo(320, 9);
    expect(r.spreadMps).toBeLessThan(1e-9);
  });

  it('a boundary kept by one layering and dropped by the other: only the intervals it touches differ', () => {
    // kept: 180 m/s above 7.5 m, 320 m/s below; dropped: 230 m/s throughout
    const kept = layering([
      { topM: 0, vsMps: 180 },
      { topM: 7.5, vsMps: 320 },
    ]);
    const dropped = layering([{ topM: 0, vsMps: 230 }]);
    // 7-8 m straddles the boundary: kept gives 1 / (0.5/180 + 0.5/320) = 230.4 m/s
    const straddling = ensembleIntervalVs([kept, dropped], 7, 8);
    const keptValue = 1 / (0.5 / 180 + 0.5 / 320);
    expect(keptValue).toBeCloseTo(230.4, 1);
    expect(straddling.vsMps).toBeCloseTo(2 / (1 / keptValue + 1 / 230), 6);
    expect(straddling.spreadMps).toBeLessThan(0.5);
    const deep = ensembleIntervalVs([kept, dropped], 12, 13);
    expect(deep.vsMps).toBeCloseTo(2 / (1 / 320 + 1 / 230), 6);
    expect(deep.spreadMps).toBeGreaterThan(30);
  });

  it('no layering gives no value, never a number from nothing', () => {
    expect(Number.isNaN(ensembleIntervalVs([], 1, 2).vsMps)).toBe(true);
  });
});
