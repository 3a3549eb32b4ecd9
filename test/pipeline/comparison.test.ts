import { describe, expect, it } from 'vitest';
import { cleanDownhole, runClean } from '../helpers/cleanSurvey';
import { derive, runPipeline, siteSpread } from '../../src/core/pipeline';
import { demoCrossholeGeometry, demoCrossholeOptions, demoEarthModel, synthesizeSurvey } from '../../src/core/synth';
import type { ComparisonProfile } from '../../src/core/site/comparison';
import { defaultSettings, emptyEdits, patchSettings } from '../../src/core/settings';

describe('comparison profile from another test', () => {
  it("the forward model's own layers as the comparison: Vs30 = 30 / sum(d/Vs) = 237.99 m/s by hand, and small differences", () => {
    // 1.6/165 + 5.4/115 + 6.5/215 + 7.5/330 + 4/440 + 5/680 = 0.126057 s -> 30 / 0.126057 = 237.99 m/s
    // (EN 1998-1:2004 eq. 3.1; ASCE 7 ch. 20).
    const model = demoEarthModel();
    const cmp: ComparisonProfile = {
      name: 'model',
      source: 'vs',
      points: model.layers.map((l) => ({ depthM: l.topM, vsMps: l.vsMps })),
    };
    const res = synthesizeSurvey(model, demoCrossholeGeometry(), demoCrossholeOptions());
    const out = runPipeline({
      survey: res.survey,
      records: new Map(res.records.map((r) => [r.id, r])),
      settings: defaultSettings(),
      edits: emptyEdits(),
      comparison: cmp,
    });
    expect(out.derived.comparison!.vs30!.vsMps).toBeCloseTo(237.99, 2);
    const diffs = out.derived.comparison!.differences.map((d) => Math.abs(d.differencePct)).sort((a, b) => a - b);
    expect(diffs[Math.floor(diffs.length / 2)]).toBeLessThan(3);
  });
});

describe('site spread computed later equals the one derive() computes at once', () => {
  it('siteSpread(derive(..., {monteCarlo:false})) === derive(...).site.uncertainty (same seed, same draws)', () => {
    const res = synthesizeSurvey(demoEarthModel(), demoCrossholeGeometry(), demoCrossholeOptions());
    const s = defaultSettings();
    const first = runPipeline({
      survey: res.survey,
      records: new Map(res.records.map((r) => [r.id, r])),
      settings: s,
      edits: emptyEdits(),
    });
    const fast = derive(res.survey, first.prepared, first.auto, emptyEdits(), s, { monteCarlo: false });
    expect(fast.site.uncertainty).toBeNull();
    expect(siteSpread(fast, s)).toEqual(first.derived.site.uncertainty);
  });
});

describe('user layer boundaries are closed by the surface and the deepest station', () => {
  it('"5, 10" gives straight-line fits 0-5, 5-10 and 10-bottom, and a refracted-ray model of the same three layers', () => {
    const model = demoEarthModel();
    const res = cleanDownhole([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14], { seed: 4, model });
    const out = runClean(res, patchSettings(defaultSettings(), { layering: { mode: 'user', boundariesM: [5, 10] } }));
    const s = out.derived.layerFits.filter((f) => f.wave === 'S').map((f) => [f.topM, f.bottomM]);
    expect(s).toEqual([
      [0, 5],
      [5, 10],
      [10, 14],
    ]);
    expect(out.derived.layerModel!.layers.map((l) => [l.topM, l.bottomM])).toEqual([
      [0, 5],
      [5, 10],
      [10, 14],
    ]);
  });
});
