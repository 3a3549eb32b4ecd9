/**
 * Test fixture: a one-receiver downhole survey of the demo earth (or a given one) from the forward model,
 * unattenuated, with no trigger delay and (by default) no noise, and its run through the whole pipeline.
 * Invented data for tests of the pipeline and the exports only.
 */
import { runPipeline } from '../../src/core/pipeline';
import { defaultSettings, emptyEdits, type Settings, type UserEdits } from '../../src/core/settings';
import { demoEarthModel, synthesizeSurvey, type SynthResult } from '../../src/core/synth';
import type { EarthModel } from '../../src/core/synth/earth';

export function cleanDownhole(
  depthsM: number[],
  o: { seed: number; holeId?: string; model?: EarthModel; snr?: number | null; sourceOffsetM?: number },
): SynthResult {
  return synthesizeSurvey(
    o.model ?? demoEarthModel(),
    { kind: 'downhole', holeId: o.holeId ?? 'DH1', depthsM, sourceOffsetM: o.sourceOffsetM ?? 2 },
    {
      seed: o.seed,
      sampleIntervalS: 5e-5,
      samplesPerTrace: 3000,
      sFrequencyHz: 100,
      pFrequencyHz: 400,
      attenuation: false,
      snr: o.snr ?? null,
      maxTriggerDelayS: 0,
    },
  );
}

export function runClean(res: SynthResult, settings: Settings = defaultSettings(), edits: UserEdits = emptyEdits()) {
  return runPipeline({ survey: res.survey, records: new Map(res.records.map((r) => [r.id, r])), settings, edits });
}
