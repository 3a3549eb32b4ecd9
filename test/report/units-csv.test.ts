import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../src/core/pipeline';
import { profileTable } from '../../src/core/report/tables';
import { defaultSettings, emptyEdits } from '../../src/core/settings';
import { demoEarthModel, synthesizeSurvey } from '../../src/core/synth';

describe('profile CSV in US customary units (exact factors: 0.3048 m/ft, 1 ksi = 6.894757 MPa, 1 psf = 0.04788026 kPa; NIST SP 811)', () => {
  const res = synthesizeSurvey(
    demoEarthModel(),
    { kind: 'downhole', holeId: 'DH1', depthsM: [2, 3, 4, 5, 6], sourceOffsetM: 2 },
    {
      seed: 3,
      sampleIntervalS: 5e-5,
      samplesPerTrace: 3000,
      sFrequencyHz: 100,
      pFrequencyHz: 400,
      attenuation: false,
      snr: null,
      maxTriggerDelayS: 0,
    },
  );
  const out = runPipeline({
    survey: res.survey,
    records: new Map(res.records.map((r) => [r.id, r])),
    settings: defaultSettings(),
    edits: emptyEdits(),
  });
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
  it('values convert with the exact factors', () => {
    col(si, 'vs_mps').forEach((v, i) => expect(col(us, 'vs_ftps')[i]).toBeCloseTo(v / 0.3048, 1));
    col(si, 'depth_top_m').forEach((v, i) => expect(col(us, 'depth_top_ft')[i]).toBeCloseTo(v / 0.3048, 2));
    col(si, 'gmax_mpa').forEach((v, i) => expect(col(us, 'gmax_ksi')[i]).toBeCloseTo(v / 6.894757, 2));
    col(si, 'sigma_v_eff_kpa').forEach((v, i) => expect(col(us, 'sigma_v_eff_psf')[i]).toBeCloseTo(v / 0.04788026, 0));
  });
});
