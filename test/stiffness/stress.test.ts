import { describe, expect, it } from 'vitest';
import { defaultSoilColumn, validateSoilColumn, verticalStressAt } from '../../src/core/stiffness/stress';
import type { SoilColumn } from '../../src/core/model';

const layer = (topM: number, bottomM: number, name: string, unitWeightKnM3: number) => ({
  topM,
  bottomM,
  name,
  unitWeightKnM3,
  stressExponent: 0.25,
  poissonRatio: 0.3,
});

// Two layers and a water table (hand calculation, Terzaghi effective stress; any soil mechanics text):
// 0-4 m: 18 kN/m3; 4-10 m: 20 kN/m3; water table 2 m; gamma_w 9.81 kN/m3.
const twoLayers: SoilColumn = {
  layers: [layer(0, 4, 'sand', 18), layer(4, 10, 'clay', 20)],
  waterTableM: 2,
  waterUnitWeightKnM3: 9.81,
};

describe('vertical stress (hand calculation)', () => {
  it("z = 7 m: sigma_v = 18 x 4 + 20 x 3 = 132 kPa; u = 9.81 x (7 - 2) = 49.05 kPa; sigma'_v = 82.95 kPa", () => {
    const s = verticalStressAt(twoLayers, 7);
    expect(s.totalKpa).toBeCloseTo(132, 10);
    expect(s.poreKpa).toBeCloseTo(49.05, 10);
    expect(s.effectiveKpa).toBeCloseTo(82.95, 10);
  });
  it('z = 1.5 m (above the water table): sigma_v = 18 x 1.5 = 27 kPa, u = 0', () => {
    const s = verticalStressAt(twoLayers, 1.5);
    expect(s.totalKpa).toBeCloseTo(27, 10);
    expect(s.poreKpa).toBe(0);
  });
  it('z = 12 m (below the column): deepest layer extends, sigma_v = 72 + 20 x 8 = 232 kPa, u = 98.1 kPa', () => {
    const s = verticalStressAt(twoLayers, 12);
    expect(s.totalKpa).toBeCloseTo(232, 10);
    expect(s.effectiveKpa).toBeCloseTo(232 - 98.1, 10);
  });
  it("ponded water 1 m above ground: sigma_v gains 9.81 kPa, sigma'_v unchanged (effective stress principle)", () => {
    const ponded: SoilColumn = { ...twoLayers, waterTableM: -1 };
    const s = verticalStressAt(ponded, 3);
    expect(s.totalKpa).toBeCloseTo(9.81 + 54, 10);
    expect(s.poreKpa).toBeCloseTo(9.81 * 4, 10);
    expect(s.effectiveKpa).toBeCloseTo(54 - 9.81 * 3, 10);
  });
  it('layer order in the array does not matter', () => {
    const swapped: SoilColumn = { ...twoLayers, layers: [twoLayers.layers[1], twoLayers.layers[0]] };
    expect(verticalStressAt(swapped, 7).totalKpa).toBeCloseTo(132, 10);
  });
});

describe('soil column checks', () => {
  it('a valid column has no problems', () => {
    expect(validateSoilColumn(twoLayers)).toEqual([]);
  });
  it('gap, overlap and non-positive unit weight are reported, naming the layers', () => {
    const bad: SoilColumn = {
      layers: [layer(0, 3, 'fill', 17), layer(4, 8, 'clay', 0), layer(7, 12, 'gravel', 21)],
      waterTableM: null,
      waterUnitWeightKnM3: 9.81,
    };
    const codes = validateSoilColumn(bad)
      .map((p) => p.code)
      .sort();
    expect(codes).toEqual(['SOIL_GAP', 'SOIL_OVERLAP', 'SOIL_UNIT_WEIGHT']);
    const uw = validateSoilColumn(bad).find((p) => p.code === 'SOIL_UNIT_WEIGHT')!;
    expect(uw.file).toContain('clay');
    expect(uw.field).toBe('unitWeightKnM3');
  });
  it('a column starting below the surface is a gap', () => {
    const c: SoilColumn = { layers: [layer(1, 5, 'sand', 18)], waterTableM: null, waterUnitWeightKnM3: 9.81 };
    expect(validateSoilColumn(c).map((p) => p.code)).toEqual(['SOIL_GAP']);
  });
  it('default column: one layer 0-bottom, 19 kN/m3, n = 0.25, nu = 0.3, no water table (common practice)', () => {
    const c = defaultSoilColumn(25);
    expect(c.layers).toHaveLength(1);
    expect(c.layers[0]).toMatchObject({
      topM: 0,
      bottomM: 25,
      unitWeightKnM3: 19,
      stressExponent: 0.25,
      poissonRatio: 0.3,
    });
    expect(c.waterTableM).toBeNull();
    expect(validateSoilColumn(c)).toEqual([]);
  });
});
