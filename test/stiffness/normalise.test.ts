import { describe, expect, it } from 'vitest';
import {
  ATMOSPHERIC_PRESSURE_KPA,
  STRESS_EXPONENT_CHOICES,
  stressNormalisedVs,
} from '../../src/core/stiffness/normalise';
import { BorewaveError } from '../../src/core/errors';

describe("Vs1 = Vs (Pa / sigma'_v)^n", () => {
  it("Vs = 180 m/s, sigma'_v = 50 kPa, Pa = 100 kPa, n = 0.25 -> 214.06 m/s (docs/methods.md section 4 [calc])", () => {
    expect(stressNormalisedVs(180, 50, 0.25, 100)).toBeCloseTo(214.06, 2);
  });
  it('same with Pa = 101.325 kPa (default): 180 x 2.0265^0.25 = 180 x 1.193127 = 214.76 m/s (hand calculation)', () => {
    expect(ATMOSPHERIC_PRESSURE_KPA).toBe(101.325);
    expect(stressNormalisedVs(180, 50, 0.25)).toBeCloseTo(214.76, 2);
  });
  it('n = 0.5 (clay, common practice): 150 m/s at 25 kPa, Pa = 100 -> 150 x 2 = 300 m/s', () => {
    expect(stressNormalisedVs(150, 25, 0.5, 100)).toBeCloseTo(300, 10);
  });
  it("at sigma'_v = Pa, Vs1 = Vs for any n (identity)", () => {
    expect(stressNormalisedVs(222, 101.325, 0.37)).toBeCloseTo(222, 12);
  });
  it("sigma'_v <= 0 throws", () => {
    expect(() => stressNormalisedVs(180, 0, 0.25)).toThrow(BorewaveError);
  });
  it('exponent choices carry a source each, sands 0.25 (Robertson et al. 1992; Andrus & Stokoe 2000)', () => {
    expect(STRESS_EXPONENT_CHOICES.find((c) => c.n === 0.25)?.source).toMatch(/Andrus/);
    for (const c of STRESS_EXPONENT_CHOICES) expect(c.source.length).toBeGreaterThan(0);
  });
});
