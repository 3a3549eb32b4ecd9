/**
 * The seismic cone through the pipeline: records keep the TIP depth, every path uses the receiver
 * depth tip - coneOffsetM, and editing the offset keeps pick edits (keys use the logged tip depth,
 * docs/project-format.md "Keys"). Data: our forward-model cone sounding at 0.5 m steps (variants.ts).
 * Check against geometry: straight path = sqrt(offset^2 + (tip - coneOffset)^2) (analytic).
 */
import { describe, expect, it } from 'vitest';
import { readRecordLog } from '../../src/core/io/recordlog';
import type { WaveRecord } from '../../src/core/model';
import { runPipeline } from '../../src/core/pipeline';
import { emptyEdits, defaultSettings } from '../../src/core/settings';
import { pickEditKey, stationKey } from '../../src/core/keys';
import { inferSetup } from '../../src/core/setup/infer';
import { toLegacySurvey } from '../../src/core/setup/legacy';
import { defaultPlacementSettings } from '../../src/core/setup/types';
import { makeVariantSurvey } from '../../src/core/synth/variants';
import { readVariant, variantGeometry } from './helpers';

describe('seismic cone in the pipeline', () => {
  const v = makeVariantSurvey({
    kind: 'seismic-cone',
    seed: 55,
    componentOrder: ['H1', 'H2', 'V'],
    labels: 'receiver-words',
    locations: 'none',
    naming: 'instrument',
    notes: false,
    format: 'seg2',
    depthCount: 8,
    stepM: 0.5,
    coneOffsetM: 0.25,
  });
  const recs = readVariant(v);
  const records = new Map<string, WaveRecord>(recs.map((r) => [r.fileName, { ...r, id: r.fileName }]));
  const g = variantGeometry(v);
  const setup = inferSetup({
    records: recs,
    geometry: g,
    settings: defaultPlacementSettings(),
    log: readRecordLog(v.recordLogCsv, 'log.csv'),
  });
  const surveyAt = (coneOffsetM: number) =>
    toLegacySurvey({
      name: 'cone',
      geometry: { ...g, coneOffsetM },
      boreholes: [{ id: 'SC1', collarEastM: 0, collarNorthM: 0, deviation: [] }],
      mainHoleId: 'SC1',
      sourceOffsetM: v.geometry.sourceOffsetM,
      sourceDepthM: 0,
      soil: { layers: [], waterTableM: null, waterUnitWeightKnM3: 9.81 },
      records: setup.records,
    });

  it('records keep the tip depth; stations sit at tip - 0.25 m with the straight path from there', () => {
    const survey = surveyAt(0.25);
    expect(survey.coneOffsetM).toBe(0.25);
    expect([...new Set(survey.records.map((r) => r.depthM))].sort()).toEqual([1, 1.5, 2, 2.5, 3, 3.5, 4, 4.5]);
    const out = runPipeline({ survey, records, settings: defaultSettings(), edits: emptyEdits() });
    const st = out.prepared.stations.find((s) => s.key === stationKey('r0', 3, 'H1') && s.wave === 'S')!;
    expect(st.depthM).toBeCloseTo(2.75, 12);
    expect(st.straightPathM).toBeCloseTo(Math.hypot(1.0, 2.75), 12);
    expect(out.derived.profile[0].topM).toBeCloseTo(0.75, 12);
  });

  it('changing the cone offset keeps the pick edit (same key) and moves the receiver', () => {
    const sk = stationKey('r0', 3, 'H1');
    const key = pickEditKey(sk, 'S', 'onset');
    const edits = { ...emptyEdits(), picks: { [key]: 0.02 } };
    for (const off of [0.25, 0.3]) {
      const out = runPipeline({ survey: surveyAt(off), records, settings: defaultSettings(), edits });
      const pick = out.derived.picks.find((p) => p.stationKey === sk && p.wave === 'S' && p.origin === 'edited');
      expect(pick?.timeS).toBe(0.02);
      const st = out.prepared.stations.find((s) => s.key === sk)!;
      expect(st.depthM).toBeCloseTo(3 - off, 12);
    }
  });
});
