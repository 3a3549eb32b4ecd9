import { describe, expect, it } from 'vitest';
import { cleanDownhole, runClean } from '../helpers/cleanSurvey';
import { profileTable } from '../../src/core/report/tables';

describe('profile CSV in US customary units (exact factors: 0.3048 m/ft, 1 ksi = 6.894757 MPa, 1 psf = 0.04788026 kPa; NIST SP 811)', () => {
  const res = cleanDownhole([2, 3, 4, 5, 6], { seed: 3 });
  const out = runClean(res);
  const si = profileTable(out.derived, 'SI');
  const us = profileTable(out.derived, 'US');
  const col = (t: typeof si, name: string) => t.rows.map((r) => r[t.columns.indexOf(name)] as number);
  it('column names carry the US unit', () => {
    expect(us.columns).toEqual(
      expect.arrayContaining(['depth_top_ft', 'vs_ftps', 'sigma_v_eff_psf', 'gmax_ksi', 'vs1_ftps']),
    );
    expect(si.columns).toEqual(
      expect.arrayContaining(['depth_top_m', 'vs_mps', 'density_mg_m3', 'sigma_v_eff_kpa', 'gmax_mpa', 'vs1_mps']),
    );
  });
  it('values convert with the exact factors, then round by the reporting rule (docs/significant-digits.md)', () => {
    const rows = out.derived.profile;
    // Each US cell is the SI value / factor, rounded to 3 significant digits (velocities, moduli, stresses)
    // or 0.1 ft (depths): within half a unit of the last kept digit.
    const halfUnit3 = (x: number) => 0.5 * 10 ** (Math.floor(Math.log10(Math.abs(x))) - 2) + 1e-9;
    rows.forEach((r, i) => {
      const vsFt = r.vsMps / 0.3048;
      expect(Math.abs(col(us, 'vs_ftps')[i] - vsFt)).toBeLessThanOrEqual(halfUnit3(vsFt));
      expect(Math.abs(col(us, 'depth_top_ft')[i] - r.topM / 0.3048)).toBeLessThanOrEqual(0.05 + 1e-9);
      const gKsi = r.gmaxKpa / 1000 / 6.894757;
      expect(Math.abs(col(us, 'gmax_ksi')[i] - gKsi)).toBeLessThanOrEqual(halfUnit3(gKsi) * 1.0001);
      const sPsf = r.sigmaVEffKpa / 0.04788026;
      expect(Math.abs(col(us, 'sigma_v_eff_psf')[i] - sPsf)).toBeLessThanOrEqual(halfUnit3(sPsf) * 1.0001);
      // SI cells: 3 significant digits of the full-precision value, depths to 0.01 m.
      expect(Math.abs(col(si, 'vs_mps')[i] - r.vsMps)).toBeLessThanOrEqual(halfUnit3(r.vsMps));
      expect(Math.abs(col(si, 'depth_top_m')[i] - r.topM)).toBeLessThanOrEqual(0.005 + 1e-9);
    });
  });
});
