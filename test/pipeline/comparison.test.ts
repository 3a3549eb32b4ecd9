import { describe, expect, it } from 'vitest';
import { derive, runPipeline, siteSpread } from '../../src/core/pipeline';
import { demoCrossholeGeometry, demoCrossholeOptions, demoEarthModel, synthesizeSurvey } from '../../src/core/synth';
import type { ComparisonProfile } from '../../src/core/stiffness/comparison';
import { defaultSettings, emptyEdits } from '../../src/core/settings';

describe('comparison profile from another test', () => {
  it("the forward model's own layers as the comparison: Vs30 = 30 / sum(d/Vs) = 237.99 m/s by hand, and small differences", () => {
    // 1.6/165 + 5.4/115 + 6.5/215 + 7.5/330 + 4/440 + 5/680 = 0.126057 s -> 30 / 0.126057 = 237.99 m/s
    // (EN 1998-1:2004 eq. 3.1; ASCE 7 ch. 20).
    const model = demoEarthModel();
    const cmp: ComparisonProfile = { name: 'model', source: 'vs', points: model.layers.map((l) => ({ depthM: l.topM, vsMps: l.vsMps })) };
    const res = synthesizeSurvey(model, demoCrossholeGeometry(), demoCrossholeOptions());
    const out = runPipeline({ survey: res.survey, records: new Map(res.records.map((r) => [r.id, r])), settings: defaultSettings(), edits: emptyEdits(), comparison: cmp });
    expect(out.derived.comparison!.vs30!.vsMps).toBeCloseTo(237.99, 2);
    const diffs = out.derived.comparison!.differences.map((d) => Math.abs(d.differencePct)).sort((a, b) => a - b);
    expect(diffs[Math.floor(diffs.length / 2)]).toBeLessThan(3);
  });
});


describe('site spread computed later equals the one derive() computes at once', () => {
  it('siteSpread(derive(..., {monteCarlo:false})) === derive(...).site.uncertainty (same seed, same draws)', () => {
    const res = synthesizeSurvey(demoEarthModel(), demoCrossholeGeometry(), demoCrossholeOptions());
    const s = defaultSettings();
    const first = runPipeline({ survey: res.survey, records: new Map(res.records.map((r) => [r.id, r])), settings: s, edits: emptyEdits() });
    const fast = derive(res.survey, first.prepared, first.auto, emptyEdits(), s, { monteCarlo: false });
    expect(fast.site.uncertainty).toBeNull();
    expect(siteSpread(fast, s)).toEqual(first.derived.site.uncertainty);
  });
});
