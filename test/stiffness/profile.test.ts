import { describe, expect, it } from 'vitest';
import { STIFFNESS_FLAGS, stiffnessProfile, type VelocityInterval } from '../../src/core/stiffness/profile';
import type { SoilColumn } from '../../src/core/model';
import { BorewaveError } from '../../src/core/errors';

// One layer 0-20 m, 19 kN/m3, n = 0.25, nu = 0.3; water table at 5 m, gamma_w = 9.81 (hand calculations below).
const soil: SoilColumn = {
  layers: [{ topM: 0, bottomM: 20, name: 'sand', unitWeightKnM3: 19, stressExponent: 0.25, poissonRatio: 0.3 }],
  waterTableM: 5,
  waterUnitWeightKnM3: 9.81,
};
const iv = (topM: number, bottomM: number, vsMps: number, vpMps: number | null, vsSdMps = 10): VelocityInterval => ({
  topM,
  bottomM,
  vsMps,
  vsSdMps,
  vpMps,
  vpSdMps: null,
  flags: [],
});
const rho = 19 / 9.80665;

describe('stiffness rows (hand calculation; isotropic elasticity, any text)', () => {
  const rows = stiffnessProfile([iv(2, 4, 180, 400), iv(8, 10, 200, 1500), iv(10, 12, 250, 300)], soil, { paKpa: 100 });

  it('above the water table, Vp/Vs gives nu: r = 400/180, nu = (r^2 - 2)/(2(r^2 - 1))', () => {
    const r = rows[0];
    const r2 = (400 / 180) ** 2;
    const nu = (r2 - 2) / (2 * (r2 - 1));
    expect(r.midM).toBe(3);
    expect(r.sigmaVKpa).toBeCloseTo(57, 10); // 19 x 3
    expect(r.porePressureKpa).toBe(0);
    expect(r.gmaxKpa).toBeCloseTo(rho * 180 * 180, 8);
    expect(r.poissonSource).toBe('vp/vs');
    expect(r.poissonRatio).toBeCloseTo(nu, 14);
    expect(r.youngKpa).toBeCloseTo(2 * rho * 180 * 180 * (1 + nu), 6);
    expect(r.constrainedKpa).toBeCloseTo(rho * 400 * 400, 6);
    expect(r.bulkKpa).toBeCloseTo(rho * (400 * 400 - (4 / 3) * 180 * 180), 6);
    expect(r.vs1Mps).toBeCloseTo(180 * (100 / 57) ** 0.25, 10);
    expect(r.flags).toEqual([]);
  });
  it('gmaxSd = 2 rho Vs sd(Vs) (first-order propagation, common practice): 2 x 1.93746 x 180 x 10 = 6974.9 kPa', () => {
    expect(rows[0].gmaxSdKpa).toBeCloseTo(2 * rho * 180 * 10, 8);
    expect(rows[0].gmaxSdKpa).toBeCloseTo(6974.86, 1);
  });
  it('below the water table, Vp = 1500 m/s is pore water: nu from the layer, M and K null, flagged (ASTM D7400)', () => {
    const r = rows[1];
    expect(r.sigmaVKpa).toBeCloseTo(171, 10); // 19 x 9
    expect(r.porePressureKpa).toBeCloseTo(39.24, 10); // 9.81 x 4
    expect(r.sigmaVEffKpa).toBeCloseTo(131.76, 10);
    expect(r.poissonSource).toBe('user');
    expect(r.poissonRatio).toBe(0.3);
    expect(r.constrainedKpa).toBeNull();
    expect(r.flags).toContain(STIFFNESS_FLAGS.poreWater);
    expect(r.vs1Mps).toBeCloseTo(200 * (100 / 131.76) ** 0.25, 10);
  });
  it('Vp/Vs < sqrt 2 is flagged and nu falls back to the layer value', () => {
    expect(rows[2].flags).toContain(STIFFNESS_FLAGS.lowVpVs);
    expect(rows[2].poissonSource).toBe('user');
    expect(rows[2].youngKpa).toBeCloseTo(2 * rho * 250 * 250 * 1.3, 6);
  });
});

describe('flags and bad input', () => {
  it("sigma'_v <= 0 (water table above ground with light soil) gives no Vs1 and a flag", () => {
    const light: SoilColumn = {
      layers: [{ ...soil.layers[0], unitWeightKnM3: 9 }],
      waterTableM: 0,
      waterUnitWeightKnM3: 9.81,
    };
    const [r] = stiffnessProfile([iv(0, 2, 100, null)], light);
    expect(r.sigmaVEffKpa).toBeLessThan(0); // 9 x 1 - 9.81 x 1
    expect(r.vs1Mps).toBeNull();
    expect(r.flags).toContain(STIFFNESS_FLAGS.noEffectiveStress);
  });
  it('interval flags are kept; deeper than the soil column and across the water table are flagged', () => {
    const [a, b] = stiffnessProfile([{ ...iv(4, 6, 200, null), flags: ['slow?'] }, iv(20, 24, 300, null)], soil);
    expect(a.flags).toEqual(['slow?', STIFFNESS_FLAGS.spansWaterTable]);
    expect(b.flags).toContain(STIFFNESS_FLAGS.belowSoil);
  });
  it('an invalid soil column or interval throws a BorewaveError', () => {
    expect(() => stiffnessProfile([iv(0, 2, 100, null)], { ...soil, layers: [] })).toThrow(BorewaveError);
    expect(() => stiffnessProfile([iv(2, 2, 100, null)], soil)).toThrow(BorewaveError);
  });
});
