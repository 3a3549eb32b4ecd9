/** A profile from another test (e.g. surface waves) set beside ours: its Vs30 and the differences per interval. */
import type { Settings } from '../settings';
import type { VelocityInterval } from '../stiffness/profile';
import { timeAveragedVs, type TimeAveraged } from './classes';
import { compareProfiles, type ComparisonProfile } from './comparison';

export interface ComparisonResult {
  name: string;
  source: ComparisonProfile['source'];
  /** Time-averaged Vs of the comparison profile to 30 m (or its depth), same rule as ours. */
  vs30: TimeAveraged | null;
  /** Per interval of our profile: our Vs, the comparison's travel-time average over the interval, difference in %. */
  differences: { depthM: number; vsMps: number; comparisonVsMps: number; differencePct: number }[];
}

export function comparisonResult(
  cmp: ComparisonProfile,
  velocity: readonly VelocityInterval[],
  settings: Settings,
): ComparisonResult {
  const pts = [...cmp.points].sort((a, b) => a.depthM - b.depthM);
  // Points are step tops; the last step runs to our profile's bottom or 30 m, whichever is deeper.
  const bottomM = Math.max(30, ...velocity.map((v) => v.bottomM), pts.length ? pts[pts.length - 1].depthM + 1 : 0);
  const steps = pts
    .map((p, i) => ({ topM: p.depthM, bottomM: i + 1 < pts.length ? pts[i + 1].depthM : bottomM, vsMps: p.vsMps }))
    .filter((s) => s.bottomM > s.topM);
  return {
    name: cmp.name,
    source: cmp.source,
    vs30: steps.length ? timeAveragedVs(steps, 30, settings.site.vs30Rule) : null,
    differences: compareProfiles(
      velocity.map((v) => ({ topM: v.topM, bottomM: v.bottomM, vsMps: v.vsMps })),
      cmp,
    ),
  };
}
