import { describe, expect, it } from 'vitest';
import { BorewaveError } from '../../src/core/errors';
import {
  ATM_KPA,
  DARENDELI,
  type CurveLayerInput,
  dampingFromQ,
  darendeliDampingPct,
  darendeliDminPct,
  darendeliModulusRatio,
  darendeliParams,
  darendeliReferenceStrainPct,
  defaultK0,
  fieldDampingForLayer,
  ishibashiZhangDampingPct,
  ishibashiZhangModulusRatio,
  layerCurves,
  masingDampingPct,
  meanEffectiveStressKpa,
  resolveSoilFields,
  strainGridPct,
} from '../../src/core/stiffness/curves';

// Darendeli (2001) dissertation, University of Texas at Austin. phi1..phi5 are the values quoted in the
// issue (0.0352, 0.0010, 0.3246, 0.3483, 0.919); phi6..phi12 and the Masing correction polynomial are
// (from memory): check them against the dissertation's coefficient table before relying on them.
describe('Darendeli (2001) coefficients', () => {
  it('phi1..phi5 = 0.0352, 0.0010, 0.3246, 0.3483, 0.919 (Darendeli 2001, as quoted in the issue)', () => {
    expect([DARENDELI.phi1, DARENDELI.phi2, DARENDELI.phi3, DARENDELI.phi4, DARENDELI.phi5]).toEqual([
      0.0352, 0.001, 0.3246, 0.3483, 0.919,
    ]);
  });
  it('phi6..phi12 = 0.8005, 0.0129, -0.1069, -0.2889, 0.2919, 0.6329, -0.0057 (from memory)', () => {
    expect([
      DARENDELI.phi6,
      DARENDELI.phi7,
      DARENDELI.phi8,
      DARENDELI.phi9,
      DARENDELI.phi10,
      DARENDELI.phi11,
      DARENDELI.phi12,
    ]).toEqual([0.8005, 0.0129, -0.1069, -0.2889, 0.2919, 0.6329, -0.0057]);
  });
});

describe('Darendeli (2001) reference strain and modulus reduction', () => {
  it("gamma_r = 0.0352 % for PI = 0, OCR = 1 at sigma'_m = 1 atm (101.325 kPa)", () => {
    expect(darendeliReferenceStrainPct(0, 1, ATM_KPA)).toBeCloseTo(0.0352, 10);
  });
  it("gamma_r at PI = 20, OCR = 2, sigma'_m = 200 kPa: (0.0352 + 0.001*20*2^0.3246)(200/101.325)^0.3483 = 0.076346 % (hand calculation)", () => {
    // 2^0.3246 = 1.25233; 0.0352 + 0.025047 = 0.060247; (1.973846)^0.3483 = 1.26723 -> 0.076346
    expect(darendeliReferenceStrainPct(20, 2, 200)).toBeCloseTo(0.076346, 5);
  });
  it('G/Gmax = 0.5 exactly at gamma = gamma_r (definition of the reference strain)', () => {
    const p = darendeliParams({
      plasticityIndexPct: 35,
      ocr: 3,
      meanEffectiveStressKpa: 340,
      loadingFrequencyHz: 1,
      loadingCycles: 10,
    });
    expect(darendeliModulusRatio(p.referenceStrainPct, p)).toBeCloseTo(0.5, 12);
  });
  it('G/Gmax falls monotonically from 1 over 0.0001-1 %', () => {
    const p = darendeliParams({
      plasticityIndexPct: 0,
      ocr: 1,
      meanEffectiveStressKpa: 50,
      loadingFrequencyHz: 1,
      loadingCycles: 10,
    });
    const g = strainGridPct().map((s) => darendeliModulusRatio(s, p));
    expect(g[0]).toBeGreaterThan(0.99);
    for (let i = 1; i < g.length; i++) expect(g[i]).toBeLessThan(g[i - 1]);
  });
});

describe('Darendeli (2001) damping', () => {
  it('Dmin at PI = 0, OCR = 1, 1 atm, 1 Hz = phi6 = 0.8005 % (from memory)', () => {
    expect(darendeliDminPct(0, 1, ATM_KPA, 1)).toBeCloseTo(0.8005, 10);
  });
  it('Dmin rises with frequency by (1 + 0.2919 ln f): at 10 Hz x 1.672125 (hand calculation)', () => {
    expect(darendeliDminPct(0, 1, ATM_KPA, 10) / darendeliDminPct(0, 1, ATM_KPA, 1)).toBeCloseTo(1.672125, 5);
  });
  it('Masing damping of the a = 1 hyperbola at gamma = gamma_r: (100/pi)(4(1 - ln 2)/0.5 - 2) = 14.4775 % before the a-correction (hand calculation)', () => {
    // with a = 1, c1 = 1, c2 = 0, c3 = 0 exactly: -1.1143 + 1.8618 + 0.2523 = 0.9998 ~ 1 (coefficients from memory)
    const d1 = (100 / Math.PI) * ((4 * (1 - Math.log(2))) / 0.5 - 2);
    expect(d1).toBeCloseTo(14.4775, 3);
    expect(masingDampingPct(0.05, 0.05, 1)).toBeCloseTo(0.9998 * d1 + 0.0 * d1 * d1, 2);
  });
  it('Masing damping is continuous across the small-strain series switch (x = 1e-4)', () => {
    const a = masingDampingPct(0.99999e-4 * 0.05, 0.05, 0.919);
    const b = masingDampingPct(1.00001e-4 * 0.05, 0.05, 0.919);
    expect(Math.abs(a - b) / b).toBeLessThan(1e-3);
  });
});

// A row for one set of inputs, computed by hand (calculator) from the formulas with the coefficients above:
// PI = 20, OCR = 2, sigma'_m = 200 kPa, f = 1 Hz, N = 10 ->
//   gamma_r = 0.076346 %, Dmin = (0.8005 + 0.0129*20*2^-0.1069)(1.973846)^-0.2889 = 0.85457 %,
//   b = 0.6329 - 0.0057 ln 10 = 0.61978; a = 0.919 -> c1 = 1.02220, c2 = -0.00676, c3 = 0.0000615
//   gamma %  | G/Gmax | D_M,a=1 % | D %
//   0.001    | 0.9817 |  0.27615  | 1.029
//   0.01     | 0.8662 |  2.61065  | 2.457
//   0.1      | 0.4383 | 17.3604   | 10.003
//   1        | 0.0860 | 45.6975   | 19.505
describe('Darendeli (2001): a row computed by hand', () => {
  const p = darendeliParams({
    plasticityIndexPct: 20,
    ocr: 2,
    meanEffectiveStressKpa: 200,
    loadingFrequencyHz: 1,
    loadingCycles: 10,
  });
  it('parameters: gamma_r 0.076346 %, Dmin 0.85457 %, b 0.61978', () => {
    expect(p.referenceStrainPct).toBeCloseTo(0.076346, 5);
    expect(p.dminPct).toBeCloseTo(0.85457, 4);
    expect(p.scalingB).toBeCloseTo(0.61978, 4);
  });
  const row: [number, number, number][] = [
    [0.001, 0.9817, 1.029],
    [0.01, 0.8662, 2.457],
    [0.1, 0.4383, 10.003],
    [1, 0.086, 19.505],
  ];
  for (const [s, gg, d] of row) {
    it(`gamma = ${s} %: G/Gmax = ${gg} (+-0.0001), D = ${d} % (+-0.002)`, () => {
      expect(Math.abs(darendeliModulusRatio(s, p) - gg)).toBeLessThan(1e-4);
      expect(Math.abs(darendeliDampingPct(s, p) - d)).toBeLessThan(2e-3);
    });
  }
});

// Ishibashi & Zhang (1993), Soils and Foundations 33(1): closed form (from memory: check against the paper).
describe('Ishibashi & Zhang (1993)', () => {
  it('PI = 0: K = 0.5 where gamma = 0.000102 (0.0102 %), and G/Gmax = K sigma_m^m there (hand calculation: 0.5 x 100^0.111404 = 0.83518)', () => {
    // m = 0.272 (1 - tanh(0.4 ln(0.000556/0.000102))) = 0.272 (1 - tanh(0.67832)) = 0.272 x 0.40958 = 0.111404
    // 100^0.111404 = 1.67036 -> 0.83518
    expect(ishibashiZhangModulusRatio(0.0102, 0, 100)).toBeCloseTo(0.8352, 3);
  });
  it('hand-calculated values at PI = 0, 100 kPa: 0.001 % -> 0.99986, 0.1 % -> 0.44691; D at 0.1 % = 14.175 %', () => {
    expect(ishibashiZhangModulusRatio(0.001, 0, 100)).toBeCloseTo(0.99986, 4);
    const r = ishibashiZhangModulusRatio(0.1, 0, 100);
    expect(r).toBeCloseTo(0.44691, 4);
    expect(ishibashiZhangDampingPct(r, 0)).toBeCloseTo(14.175, 2);
  });
  it('small-strain damping of a non-plastic soil: 100 x 0.333 x (0.586 - 1.547 + 1) = 1.2987 %', () => {
    expect(ishibashiZhangDampingPct(1, 0)).toBeCloseTo(1.2987, 3);
  });
  it('plastic soil keeps stiffness longer: PI 50 above PI 0 at 0.1 %', () => {
    expect(ishibashiZhangModulusRatio(0.1, 50, 100)).toBeGreaterThan(ishibashiZhangModulusRatio(0.1, 0, 100));
  });
  it('G/Gmax never exceeds 1 (the closed form can, slightly, at small strain for plastic soils)', () => {
    expect(ishibashiZhangModulusRatio(0.001, 20, 100)).toBe(1);
  });
});

describe('mean effective stress and defaults', () => {
  it("sigma'_m = sigma'_v (1 + 2 K0)/3: 90 kPa with K0 = 0.5 -> 60 kPa", () => {
    expect(meanEffectiveStressKpa(90, 0.5)).toBeCloseTo(60, 12);
  });
  it('default K0: Jaky (1944) 1 - sin 30 deg = 0.5; OCR 4 -> 0.5 x 4^0.5 = 1.0 (Mayne & Kulhawy 1982)', () => {
    expect(defaultK0(1)).toBeCloseTo(0.5, 12);
    expect(defaultK0(4)).toBeCloseTo(1.0, 12);
  });
  it("null fields take defaults and say so; given fields are the user's", () => {
    const r = resolveSoilFields({
      soilType: 'clay',
      plasticityIndexPct: null,
      ocr: null,
      finesContentPct: null,
      k0: 0.7,
      workingStrainPct: 0.01,
    });
    expect(r.plasticityIndexPct).toBe(25);
    expect(r.piSource).toBe('default');
    expect(r.ocr).toBe(1);
    expect(r.ocrSource).toBe('default');
    expect(r.k0).toBe(0.7);
    expect(r.k0Source).toBe('user');
  });
  it('strain grid: 0.0001 % to 1 %, 41 log-spaced points', () => {
    const g = strainGridPct();
    expect(g.length).toBe(41);
    expect(g[0]).toBeCloseTo(1e-4, 15);
    expect(g[40]).toBeCloseTo(1, 12);
    expect(g[10]).toBeCloseTo(1e-3, 14);
  });
});

function layer(over: Partial<CurveLayerInput> = {}): CurveLayerInput {
  return {
    topM: 0,
    bottomM: 10,
    name: 'sand',
    sigmaVEffKpa: 90,
    gmaxKpa: 76000,
    vsMps: 200,
    soilType: 'sand',
    plasticityIndexPct: 0,
    ocr: 1,
    finesContentPct: 5,
    k0: 0.5,
    workingStrainPct: 0.0352 * (60 / ATM_KPA) ** 0.3483,
    ...over,
  };
}

describe('layer curves', () => {
  const settings = { curveModel: 'darendeli' as const, loadingFrequencyHz: 1, loadingCycles: 10 };
  it("working strain at gamma_r gives G = Gmax/2 (sigma'_m = 60 kPa from sigma'_v 90, K0 0.5)", () => {
    const [c] = layerCurves([layer()], settings);
    expect(c.meanEffectiveStressKpa).toBeCloseTo(60, 12);
    expect(c.working?.modulusRatio).toBeCloseTo(0.5, 10);
    expect(c.working?.gKpa).toBeCloseTo(38000, 4);
    expect(c.curve.length).toBe(41);
    expect(c.alternative.model).toBe('ishibashi-zhang');
  });
  it('no working strain -> no working G; no Vs -> flagged, G null', () => {
    const [c] = layerCurves([layer({ workingStrainPct: null, gmaxKpa: null, vsMps: null })], settings);
    expect(c.working).toBeNull();
    expect(c.flags.join(' ')).toMatch(/no Vs/);
  });
  it("zero effective stress (a dry layer at the surface with zero weight is impossible; sigma'_v = 0) -> flagged, no curve, no NaN", () => {
    const [c] = layerCurves([layer({ sigmaVEffKpa: 0 })], settings);
    expect(c.curve).toEqual([]);
    expect(c.working).toBeNull();
    expect(c.flags.join(' ')).toMatch(/no curve/);
  });
  it('bad frequency throws a typed error', () => {
    expect(() => layerCurves([layer()], { ...settings, loadingFrequencyHz: 0 })).toThrow(BorewaveError);
  });
});

describe('field damping D = 1/(2Q)', () => {
  it('Q = 25 -> D = 2 %; sd(Q) = 5 -> sd(D) = 100 x 5/(2 x 625) = 0.4 % (first-order propagation)', () => {
    const d = dampingFromQ(25, 5);
    expect(d.dampingPct).toBeCloseTo(2, 12);
    expect(d.dampingSdPct).toBeCloseTo(0.4, 12);
  });
  it('matched to the layer it overlaps most; lab Dmin taken at the field frequency', () => {
    const [c] = layerCurves([layer()], { curveModel: 'darendeli', loadingFrequencyHz: 1, loadingCycles: 10 });
    const f = fieldDampingForLayer(c, [
      { topM: 8, bottomM: 20, q: 10, qSd: null, frequencyHz: 50 },
      { topM: 0, bottomM: 9, q: 20, qSd: 4, frequencyHz: 60 },
    ]);
    expect(f?.dampingPct).toBeCloseTo(2.5, 12);
    expect(f?.labDminPct).toBeCloseTo(darendeliDminPct(0, 1, 60, 60), 12);
    expect(fieldDampingForLayer(c, [{ topM: 30, bottomM: 40, q: 20, qSd: null, frequencyHz: 60 }])).toBeNull();
  });
});
