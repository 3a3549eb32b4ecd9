import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  bulkModulusKpa,
  constrainedModulusKpa,
  densityMgM3,
  gmaxKpa,
  isPoreFluidVp,
  poissonFromVelocityRatio,
  youngFromShear,
} from '../../src/core/stiffness/moduli';
import { BorewaveError } from '../../src/core/errors';

describe('density and Gmax (trade units)', () => {
  it('rho = 1.9 Mg/m3, Vs = 200 m/s -> Gmax = 76,000 kPa (docs/methods.md section 4 [calc]; Mg/m3 x m2/s2 = kPa, common practice)', () => {
    expect(gmaxKpa(1.9, 200)).toBeCloseTo(76000, 9);
  });
  it('rho = gamma / g: 19 kN/m3 / 9.80665 m/s2 = 1.937461 Mg/m3 (g standard gravity, CGPM 1901)', () => {
    expect(densityMgM3(19)).toBeCloseTo(1.937461, 6);
  });
  it('non-positive inputs throw a BorewaveError naming the field', () => {
    expect(() => gmaxKpa(1.9, 0)).toThrow(BorewaveError);
    try {
      densityMgM3(-1);
    } catch (e) {
      expect((e as BorewaveError).field).toBe('unitWeightKnM3');
    }
  });
});

describe("Poisson's ratio from Vp/Vs (isotropic elasticity; Jaeger, Cook & Zimmerman, Fundamentals of Rock Mechanics, 4th ed., ch. 5, from memory)", () => {
  it('r = sqrt(2) -> nu = 0 (docs/methods.md [calc]), to machine precision', () => {
    expect(poissonFromVelocityRatio(Math.SQRT2 * 200, 200)).toBeCloseTo(0, 14);
  });
  it('r = 7.5 -> nu = 54.25 / 110.5 = 0.4910 (docs/methods.md [calc])', () => {
    expect(poissonFromVelocityRatio(1500, 200)).toBeCloseTo(54.25 / 110.5, 15);
    expect(poissonFromVelocityRatio(1500, 200)).toBeCloseTo(0.491, 4);
  });
  it('r = 2 -> nu = 1/3 (2/6; textbook value)', () => {
    expect(poissonFromVelocityRatio(400, 200)).toBeCloseTo(1 / 3, 15);
  });
  it('r < sqrt(2) (nu would be negative) -> null', () => {
    expect(poissonFromVelocityRatio(1.4 * 200, 200)).toBeNull();
    expect(poissonFromVelocityRatio(150, 200)).toBeNull();
  });
});

describe('isotropic relations hold together (same text, from memory)', () => {
  it('for any rho, Vs and r > sqrt 2: K = M - 4G/3, E = 9KG/(3K+G), nu = (3K-2G)/(2(3K+G)), E = 2G(1+nu)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1.2, max: 2.6, noNaN: true }),
        fc.double({ min: 50, max: 1500, noNaN: true }),
        fc.double({ min: 1.5, max: 12, noNaN: true }),
        (rho, vs, r) => {
          const vp = r * vs;
          const g = gmaxKpa(rho, vs);
          const mMod = constrainedModulusKpa(rho, vp);
          const k = bulkModulusKpa(rho, vp, vs);
          const nu = poissonFromVelocityRatio(vp, vs)!;
          const e = youngFromShear(g, nu);
          const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
          expect(rel(k, mMod - (4 / 3) * g)).toBeLessThan(1e-12);
          expect(rel(e, (9 * k * g) / (3 * k + g))).toBeLessThan(1e-12);
          expect(Math.abs(nu - (3 * k - 2 * g) / (2 * (3 * k + g)))).toBeLessThan(1e-12);
          // Lame: M = lambda + 2G with lambda = E nu / ((1 + nu)(1 - 2 nu))
          expect(rel(mMod, (e * nu) / ((1 + nu) * (1 - 2 * nu)) + 2 * g)).toBeLessThan(1e-9);
        },
      ),
      { numRuns: 200 },
    );
  });
});

describe('pore-water Vp (ASTM D7400: saturated soft soil Vp ~ 1450 m/s; band >= 1350 m/s, common practice)', () => {
  it('1480 m/s below the water table is the pore water; above it, not', () => {
    expect(isPoreFluidVp(1480, true)).toBe(true);
    expect(isPoreFluidVp(1480, false)).toBe(false);
  });
  it('band edge: 1350 m/s is pore water, 1349 m/s is not', () => {
    expect(isPoreFluidVp(1350, true)).toBe(true);
    expect(isPoreFluidVp(1349, true)).toBe(false);
  });
});
