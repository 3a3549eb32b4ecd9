/**
 * `npx tsx scripts/measure-setup.ts [train|held-out]`: hit-detection rate, interval Vs error with a
 * fixed and a turning probe, careless set-ups, on training or held-out forward-model seeds.
 */
import { runOn, hitRate, intervalError, trueVs30 } from '../src/core/synth/evaluate';
import { carelessSetup, stripHitLabels, variantSurvey } from '../src/core/synth/orientationVariants';
import { makeDemoProject } from '../src/core/synth/demo';
import type { TestKind } from '../src/core/model';

const which = process.argv[2] ?? 'train';
const seeds = which === 'train' ? [101, 102, 103] : [9001, 9002, 9003, 9004];
const kinds: TestKind[] = (process.argv[3]?.split(',') as TestKind[]) ?? ['downhole-pair', 'downhole', 'crosshole'];
for (const kind of kinds) {
  for (const seed of seeds) {
    const walk = kind === 'crosshole' ? 0 : 0.35;
    const fixed = variantSurvey({ kind, seed, azimuthWalkSdRad: 0 });
    const turning = variantSurvey({ kind, seed, azimuthWalkSdRad: walk });
    const unl = stripHitLabels(
      variantSurvey({ kind, seed, azimuthWalkSdRad: walk, repeatShare: 0.15, missingShare: 0.1 }),
      seed,
    );
    const rf = runOn(fixed);
    const rt = runOn(turning);
    const ru = runOn(unl);
    const ef = intervalError(fixed, rf);
    const et = intervalError(turning, rt);
    const eu = intervalError(unl, ru);
    const hr = hitRate(unl, ru);
    const blocking = (r: typeof rf) =>
      (r.derived as { setupProblems?: { blocking: boolean; code: string }[] }).setupProblems
        ?.filter((p) => p.blocking)
        .map((p) => p.code)
        .join(',') ?? '-';
    console.log(
      `${kind} seed ${seed}: fixed med ${ef.medianPct.toFixed(2)}% p90 ${ef.p90Pct.toFixed(1)} | turning med ${et.medianPct.toFixed(2)}% p90 ${et.p90Pct.toFixed(1)} | unlabelled med ${eu.medianPct.toFixed(2)}% hits ${hr.right}/${hr.depths} | blocking f:${blocking(rf)} t:${blocking(rt)} u:${blocking(ru)}`,
    );
    for (const dir of ['right', 'left'] as const) {
      const c = carelessSetup(variantSurvey({ kind, seed, azimuthWalkSdRad: 0 }), dir);
      const rc = runOn(c);
      const v = rc.derived.site.vs30?.vsMps ?? null;
      const tv = trueVs30(rc);
      console.log(
        `   careless ${dir}: vs30 ${v?.toFixed(0) ?? 'null'} true ${tv?.toFixed(0)} blocking ${blocking(rc)}`,
      );
    }
  }
  const demo = makeDemoProject(kind).result;
  const rd = runOn(demo);
  console.log(`demo ${kind}: ${intervalError(demo, rd).medianPct.toFixed(2)}% hits ${hitRate(demo, rd).rate}`);
}
