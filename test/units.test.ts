import { describe, expect, it } from 'vitest';
import {
  csvColumn,
  formatQuantity,
  fromDisplay,
  FT_PER_M,
  KNM3_PER_PCF,
  KPA_PER_KSI,
  KPA_PER_PSF,
  MGM3_PER_LBFT3,
  toDisplay,
  unitSpec,
  type QuantityKind,
  type UnitSystem,
} from '../src/core/units';

describe('unit factors from the exact definitions', () => {
  it('1 ft = 0.3048 m exactly (international foot, 1959; NIST SP 811 appendix B, from memory)', () => {
    expect(FT_PER_M * 0.3048).toBeCloseTo(1, 15);
    expect(toDisplay('depth', 'US', 0.3048)).toBeCloseTo(1, 14);
  });
  it('1 psf = 47.88026 Pa (NIST SP 811 appendix B, from memory), to 7 significant figures', () => {
    expect(KPA_PER_PSF * 1000).toBeCloseTo(47.88026, 5);
  });
  it('1 ksi = 6.894757 MPa (NIST SP 811 appendix B, from memory)', () => {
    expect(KPA_PER_KSI / 1000).toBeCloseTo(6.894757, 6);
  });
  it('1 lbf/ft3 = 157.0875 N/m3 (NIST SP 811 appendix B, from memory)', () => {
    expect(KNM3_PER_PCF * 1000).toBeCloseTo(157.0875, 4);
  });
  it('1 lb/ft3 = 16.01846 kg/m3 (NIST SP 811 appendix B, from memory)', () => {
    expect(MGM3_PER_LBFT3 * 1000).toBeCloseTo(16.01846, 5);
  });
  it('270.68 m/s = 888.0 ft/s (docs/methods.md section 4 [calc])', () => {
    expect(toDisplay('velocity', 'US', 270.68)).toBeCloseTo(888.06, 2);
    expect(formatQuantity('velocity', 'US', 270.6767, { decimals: 1 })).toBe('888.0 ft/s');
  });
});

describe('display and entry', () => {
  const kinds: QuantityKind[] = ['depth', 'velocity', 'stress', 'modulus', 'unitWeight', 'density'];
  const systems: UnitSystem[] = ['SI', 'US'];
  it('fromDisplay inverts toDisplay for every quantity and system (round trip, relative 1e-14)', () => {
    for (const k of kinds)
      for (const s of systems) {
        const si = 123.456;
        expect(fromDisplay(k, s, toDisplay(k, s, si)) / si).toBeCloseTo(1, 14);
      }
  });
  it('SI display: modulus kPa -> MPa (76,000 kPa = 76.0 MPa, docs/methods.md section 4)', () => {
    expect(formatQuantity('modulus', 'SI', 76000)).toBe('76.0 MPa');
    expect(formatQuantity('stress', 'SI', 82.94, { withUnit: false })).toBe('82.9');
  });
  it('US display: 100 kPa = 2088.5 psf (1 kPa = 20.88543 psf, NIST SP 811, from memory)', () => {
    expect(toDisplay('stress', 'US', 100)).toBeCloseTo(2088.543, 2);
  });
  it('non-finite values show a dash, not NaN', () => {
    expect(formatQuantity('velocity', 'SI', NaN)).toBe('–');
  });
  it('CSV column names carry the unit (docs/conventions.md: units in every column name)', () => {
    expect(csvColumn('vs', 'velocity', 'SI')).toBe('vs_mps');
    expect(csvColumn('vs', 'velocity', 'US')).toBe('vs_ftps');
    expect(csvColumn('gmax', 'modulus', 'SI')).toBe('gmax_mpa');
    expect(csvColumn('depth_top', 'depth', 'US')).toBe('depth_top_ft');
    expect(unitSpec('unitWeight', 'SI').label).toBe('kN/m³');
  });
});
