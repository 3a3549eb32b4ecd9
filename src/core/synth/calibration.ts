/**
 * Calibration of the stated site-class probabilities on a bank of forward-model surveys: every
 * survey's class stated with at least 90% probability is compared with the class of the model's own
 * Vs30. Calibrated means: stated >= 90% -> right in >= 90% of the statements.
 */
import type { TestKind } from '../model';
import { mulberry32 } from '../random';
import { runPipeline } from '../pipeline';
import { defaultSettings, emptyEdits } from '../settings';
import { SITE_STANDARDS, timeAveragedVs, vsSiteClass } from '../site/classes';
import { demoEarthModel, demoPlan } from './demo';
import type { EarthModel } from './earth';
import { synthesizeSurvey } from './synthesize';

export interface ClassCalibration {
  surveys: number;
  statedAtLeast90: number;
  rightWhenStatedAtLeast90: number;
}

/** The demo earth with every velocity scaled by f (moves Vs30 across the class boundaries). */
function scaledModel(f: number): EarthModel {
  const m = demoEarthModel();
  return { ...m, layers: m.layers.map((l) => ({ ...l, vsMps: l.vsMps * f, vpMps: l.vpMps * f })) };
}

/** One bank survey: a scaled earth, a probe turning or not, noise of SNR 8-30, random trigger delays. */
export function bankSurvey(seed: number, kind: TestKind = 'downhole') {
  const rng = mulberry32((seed * 2654435761) >>> 0);
  const f = 0.75 + 1.0 * rng.uniform();
  const plan = demoPlan(kind);
  const model = scaledModel(f);
  const res = synthesizeSurvey(model, plan.geometry, {
    ...plan.options,
    seed,
    snr: 8 + 22 * rng.uniform(),
    azimuthWalkSdRad: rng.uniform() < 0.5 ? 0.4 : null,
    maxTriggerDelayS: 2e-4,
  });
  return { res, model };
}

export function classCalibration(seeds: readonly number[], kind: TestKind = 'downhole'): ClassCalibration {
  let stated = 0;
  let right = 0;
  for (const seed of seeds) {
    const { res, model } = bankSurvey(seed, kind);
    const run = runPipeline({
      survey: res.survey,
      records: new Map(res.records.map((r) => [r.id, r])),
      settings: (() => {
        const st = defaultSettings();
        return { ...st, site: { ...st.site, monteCarloDraws: 4000 } };
      })(),
      edits: emptyEdits(),
    });
    const u = run.derived.site.uncertainty;
    const prof = run.derived.profile;
    if (!u || !prof.length) continue;
    const top = Math.min(...prof.map((p) => p.topM));
    const bottom = Math.max(...prof.map((p) => p.bottomM));
    const steps = model.layers
      .map((l) => ({ topM: Math.max(top, l.topM), bottomM: Math.min(bottom, l.topM + l.thicknessM), vsMps: l.vsMps }))
      .filter((s) => s.bottomM > s.topM);
    const trueVs30 = timeAveragedVs(steps, 30, 'no-extrapolation')?.vsMps;
    if (!trueVs30) continue;
    for (const std of SITE_STANDARDS) {
      const truth = vsSiteClass(std, trueVs30);
      for (const [cls, p] of Object.entries(u.classProbabilities[std])) {
        if (p < 0.9) continue;
        stated++;
        if (cls === truth) right++;
      }
    }
  }
  return {
    surveys: seeds.length,
    statedAtLeast90: stated,
    rightWhenStatedAtLeast90: stated ? right / stated : 1,
  };
}
